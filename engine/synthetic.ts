/**
 * A seeded synthetic multi-regional table, for tests and benchmarks only (invented data: it
 * proves nothing about any economy, and `meta.invented` says so).
 *
 * Shape: `regions × sectors` sectors, ordered region by region. Each column j (a sector in
 * region r) buys intermediate inputs worth a share αⱼ of its output (drawn from
 * `coefficientSum`): most from its own region, where the block is dense (`withinDensity` of
 * the cells are nonzero), and a share τⱼ (about `tradeShare`) from other regions, where the
 * cells are few (so that the whole table has about `density` nonzero cells) and weaker, with
 * the same sector elsewhere favoured. Final demand f > 0 is drawn by sector size, output
 * solves x = (I − A)⁻¹ f (power series with its error bound, or GMRES when
 * the column sums come near 1), then Z = A x̂, final demand is
 * set to x − Z i (rows balance to rounding) and value added to x − i′Z (columns balance to
 * rounding), split into named columns and rows. A jobs satellite is drawn per unit of output.
 *
 * @example
 * const t = syntheticTable({ regions: 3, sectors: 10, seed: 7 }); // 30 sectors, balanced
 */
import { InputError } from './errors';
import { csrOperator, gmres, powerSeries } from './linalg/iterative';
import type { CSR } from './linalg/sparse';
import { csrTranspose } from './linalg/sparse';
import type { Table } from './table';
import { validateTable } from './table';

export interface SyntheticOptions {
  regions: number;
  sectors: number;
  /** Seed of the generator (default 1): the same options give the same table. */
  seed?: number;
  /** Target share of nonzero cells in Z over the whole table (default 0.06). */
  density?: number;
  /** Share of nonzero cells inside each region's own block (default 0.6). */
  withinDensity?: number;
  /** Mean share of a column's intermediate inputs bought from other regions (default 0.15). */
  tradeShare?: number;
  /** Range of the column sums of A, each below 1 (default [0.25, 0.65]). */
  coefficientSum?: [number, number];
}

/** A small seeded generator (mulberry32; common practice for reproducible test data). */
function generator(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function positiveInteger(v: unknown, what: string): number {
  if (typeof v !== 'number' || !Number.isInteger(v) || v < 1) {
    throw new InputError('bad-option', `${what} must be a whole number of at least 1; got ${String(v)}`);
  }
  return v;
}

function share(v: number, what: string, lo = 0, hi = 1): number {
  if (!(v >= lo && v <= hi)) throw new InputError('bad-option', `${what} must lie between ${lo} and ${hi}; got ${v}`);
  return v;
}

/** The coefficients A of the synthetic table as CSR (the part `syntheticTable` builds on). */
export function syntheticCoefficients(options: SyntheticOptions): CSR {
  const R = positiveInteger(options.regions, 'regions');
  const S = positiveInteger(options.sectors, 'sectors');
  const n = R * S;
  const rand = generator(options.seed ?? 1);
  const [aLo, aHi] = options.coefficientSum ?? [0.25, 0.65];
  share(aLo, 'the lowest column sum', 0, 0.9999999);
  share(aHi, 'the highest column sum', aLo, 0.9999999);
  const pw = share(options.withinDensity ?? 0.6, 'withinDensity');
  const target = share(options.density ?? 0.06, 'density');
  const tau = share(options.tradeShare ?? 0.15, 'tradeShare', 0, 0.95);
  // density ≈ (pw S² R + pt S² R (R − 1)) / n² = pw / R + pt (R − 1) / R.
  const within = Math.min(pw, target * R);
  const pt = R > 1 ? Math.min(1, Math.max(0, (target * R - within) / (R - 1))) : 0;

  // Columns of A (CSC), grown as needed.
  let cap = Math.max(16, Math.ceil(n * n * Math.min(1, target * 1.3)) + n * 4);
  let rowIdx = new Int32Array(cap);
  let vals = new Float64Array(cap);
  const colPtr = new Int32Array(n + 1);
  let q = 0;
  const push = (i: number, v: number) => {
    if (q === cap) {
      cap *= 2;
      const ri = new Int32Array(cap);
      ri.set(rowIdx);
      rowIdx = ri;
      const vv = new Float64Array(cap);
      vv.set(vals);
      vals = vv;
    }
    rowIdx[q] = i;
    vals[q] = v;
    q++;
  };
  const weight = () => {
    const u = rand();
    return 0.02 + u * u * u; // skewed: a few large suppliers, many small ones
  };
  let tradeRow: Int32Array = new Int32Array(64);
  let tradeVal: Float64Array = new Float64Array(64);
  const logSkip = pt > 0 && pt < 1 ? Math.log(1 - pt) : 0;
  for (let j = 0; j < n; j++) {
    const r = Math.floor(j / S);
    const s = j % S;
    const alpha = aLo + (aHi - aLo) * rand();
    const t0 = R > 1 ? Math.min(0.95, tau * (0.5 + rand())) : 0;
    const start = q;
    // Other regions: the rows outside region r, each with probability pt (geometric skips),
    // staged so that the column comes out in increasing rows (trade before, own, trade after).
    let tc = 0;
    let tsum = 0;
    if (pt > 0) {
      const others = n - S;
      let k = pt >= 1 ? 0 : Math.floor(Math.log(1 - rand()) / logSkip);
      while (k < others) {
        const i = k < r * S ? k : k + S;
        const w = weight() * (i % S === s ? 5 : 0.5);
        if (tc === tradeRow.length) {
          tradeRow = grow32(tradeRow);
          tradeVal = grow64(tradeVal);
        }
        tradeRow[tc] = i;
        tradeVal[tc] = w;
        tc++;
        tsum += w;
        k += pt >= 1 ? 1 : 1 + Math.floor(Math.log(1 - rand()) / logSkip);
      }
    }
    let tp = 0;
    while (tp < tc && tradeRow[tp]! < r * S) {
      push(tradeRow[tp]!, tradeVal[tp]!);
      tp++;
    }
    // Own region: rows r·S … r·S + S − 1, each with probability `within`, the diagonal always.
    const ownStart = q;
    let wsum = 0;
    for (let k = 0; k < S; k++) {
      const i = r * S + k;
      if (i === j || rand() < within) {
        const w = weight() * (i === j ? 3 : 1);
        push(i, w);
        wsum += w;
      }
    }
    const ownEnd = q;
    for (; tp < tc; tp++) push(tradeRow[tp]!, tradeVal[tp]!);
    const tShare = tsum > 0 ? t0 : 0;
    const fOwn = (alpha * (1 - tShare)) / wsum;
    const fTrade = tsum > 0 ? (alpha * tShare) / tsum : 0;
    for (let p = start; p < q; p++) vals[p] = vals[p]! * (p >= ownStart && p < ownEnd ? fOwn : fTrade);
    colPtr[j + 1] = q;
  }
  // The CSC of A is the CSR of A′; transpose it to get the CSR of A.
  const at: CSR = { rows: n, cols: n, rowPtr: colPtr, colIdx: rowIdx.subarray(0, q), values: vals.subarray(0, q) };
  return csrTranspose(at);
}

function grow32(a: Int32Array): Int32Array {
  const b = new Int32Array(a.length * 2);
  b.set(a);
  return b;
}

function grow64(a: Float64Array): Float64Array {
  const b = new Float64Array(a.length * 2);
  b.set(a);
  return b;
}

const FINAL = [
  ['HH', 'Household consumption', 0.55],
  ['GOV', 'Government consumption', 0.15],
  ['GFCF', 'Gross fixed capital formation', 0.15],
  ['EXP', 'Exports outside the regions', 0.15],
] as const;
const ADDED = [
  ['COMP', 'Compensation of employees', 0.5],
  ['TAX', 'Taxes less subsidies on production', 0.05],
  ['GOS', 'Gross operating surplus', 0.45],
] as const;

/** A balanced synthetic multi-regional `Table` (see the file comment). */
export function syntheticTable(options: SyntheticOptions): Table {
  const A = syntheticCoefficients(options);
  const R = options.regions;
  const S = options.sectors;
  const n = R * S;
  const rand = generator(((options.seed ?? 1) * 2654435761) >>> 0);
  // Sector sizes: lognormal by sector, varied by region.
  const sectorSize = new Float64Array(S);
  for (let s = 0; s < S; s++) sectorSize[s] = Math.exp(1.2 * normal(rand));
  const f = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const r = Math.floor(j / S);
    f[j] = 100 * sectorSize[j % S]! * (0.5 + rand()) * (1 + 0.5 * Math.sin(r + 1));
  }
  // The series while it is quick (column sums well below 1), GMRES otherwise.
  const hi = (options.coefficientSum ?? [0.25, 0.65])[1];
  const op = csrOperator(A);
  const sol =
    Math.log(1e-15) / Math.log(hi) <= 200
      ? powerSeries(op, f, { tolerance: 1e-15, maxIterations: 20_000, onFailure: 'report' })
      : gmres(op, f, { tolerance: 1e-14, maxIterations: 5000, onFailure: 'report' });
  if (!sol.converged && sol.residual > 1e-12) {
    throw new InputError('bad-option', `the synthetic coefficients are too close to non-productive (residual ${sol.residual.toExponential(2)}); lower coefficientSum`);
  }
  const x = sol.x;
  const Z = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let p = A.rowPtr[i]!; p < A.rowPtr[i + 1]!; p++) {
      const j = A.colIdx[p]!;
      Z[i * n + j] = A.values[p]! * x[j]!;
    }
  }
  // Final demand from the row balance, value added from the column balance.
  const k = FINAL.length;
  const F = new Float64Array(n * k);
  const colIn = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let rowIn = 0;
    for (let p = A.rowPtr[i]!; p < A.rowPtr[i + 1]!; p++) {
      const j = A.colIdx[p]!;
      const z = Z[i * n + j]!;
      rowIn += z;
      colIn[j] = colIn[j]! + z;
    }
    const fi = x[i]! - rowIn;
    splitInto(F, i * k, fi, FINAL.map((c) => c[2]), rand);
  }
  const m = ADDED.length;
  const V = new Float64Array(m * n);
  const tmp = new Float64Array(m);
  for (let j = 0; j < n; j++) {
    splitInto(tmp, 0, x[j]! - colIn[j]!, ADDED.map((c) => c[2]), rand);
    for (let r = 0; r < m; r++) V[r * n + j] = tmp[r]!;
  }
  const jobs = new Float64Array(n);
  const intensity = new Float64Array(S);
  for (let s = 0; s < S; s++) intensity[s] = 2 + 13 * rand();
  for (let j = 0; j < n; j++) jobs[j] = x[j]! * intensity[j % S]! * (0.7 + 0.6 * rand());
  const width = String(S).length;
  const rw = String(R).length;
  const codes: string[] = [];
  const labels: string[] = [];
  for (let r = 0; r < R; r++) {
    for (let s = 0; s < S; s++) {
      codes.push(`R${String(r + 1).padStart(rw, '0')}-S${String(s + 1).padStart(width, '0')}`);
      labels.push(`Region ${r + 1} · Sector ${s + 1}`);
    }
  }
  const t: Table = {
    sectors: { codes, labels },
    Z: { rows: n, cols: n, data: Z },
    finalDemand: { codes: FINAL.map((c) => c[0]), labels: FINAL.map((c) => c[1]) },
    F: { rows: n, cols: k, data: F },
    valueAdded: { codes: ADDED.map((c) => c[0]), labels: ADDED.map((c) => c[1]) },
    V: { rows: m, cols: n, data: V },
    x,
    satellites: [{ code: 'JOBS', label: 'Employment', unit: 'jobs', values: jobs }],
    meta: {
      title: `Synthetic multi-regional table, ${R} regions × ${S} sectors (invented)`,
      currency: 'XXX',
      scale: 1e6,
      scaleLabel: 'millions',
      invented: true,
      source: `engine/synthetic.ts, seed ${options.seed ?? 1}`,
      notes: ['Invented data for tests and benchmarks; it describes no real economy.'],
    },
  };
  validateTable(t);
  return t;
}

/** Write `total` split by shares around `base` (each ±50%, renormalised) into out[o …]. */
function splitInto(out: Float64Array, o: number, total: number, base: readonly number[], rand: () => number): void {
  let s = 0;
  for (let c = 0; c < base.length; c++) {
    const w = base[c]! * (0.5 + rand());
    out[o + c] = w;
    s += w;
  }
  let used = 0;
  for (let c = 0; c < base.length - 1; c++) {
    const v = (total * out[o + c]!) / s;
    out[o + c] = v;
    used += v;
  }
  out[o + base.length - 1] = total - used;
}

function normal(rand: () => number): number {
  const u = 1 - rand();
  const v = rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}
