/**
 * Checks of a table before any model is built from it. `checks(table)` returns findings; it
 * never throws for bad numbers (only `validateTable`'s structural errors throw).
 *
 * Codes (ours):
 * - `non-finite` (error): NaN or ±Infinity in a block.
 * - `negative-flow` (warning): negative intermediate flows; negative final demand, value added,
 *   imports or satellites (legal in some rows, such as changes in inventories or taxes less
 *   subsidies, so these say so).
 * - `row-imbalance`, `column-imbalance` (warning): Σⱼ zᵢⱼ + Σ fᵢ ≠ xᵢ, or Σᵢ zᵢⱼ + Σ vⱼ ≠ xⱼ,
 *   beyond a relative tolerance; the worst sectors are listed. When the figures are rounded (to
 *   u = `meta.rounding`, or else 10⁻ᵈ where d ≤ 6 is the most decimals among them), a gap within the rounding of the line's k
 *   non-zero parts and its total, u · min((k + 1)/2, 6·√(k/12) + ½) (the worst case, capped at
 *   six standard deviations of k independent uniform rounding errors), is not flagged; such
 *   lines are counted in `balance-within-rounding` (note).
 * - `zero-output` (warning), `negative-output` (error).
 * - `coefficient-sum` (error): a column of A that sums to 1 or more.
 * - `perron-root` (note), `not-productive` (error, naming each closed group whose own Perron
 *   root is 1 or more).
 * - `singular` (error, with the sectors of a null vector), `condition` (note),
 *   `ill-conditioned` (warning above 1e10).
 */
import { stronglyConnected } from './linalg/graph';
import { roundingBound } from './rounding';
import { conditionEstimate } from './linalg/condition';
import { LU } from './linalg/lu';
import type { Matrix } from './linalg/matrix';
import { identityMinus, submatrix } from './linalg/matrix';
import { perronRoot } from './linalg/perron';
import type { CellAt, Finding } from './findings';
import type { Table } from './table';
import { coefficients } from './table';

export interface CheckOptions {
  /** Relative tolerance of the row and column balances (default 1e-4, that is 0.01%). */
  balanceTolerance?: number;
  /** Condition estimates above this give a warning (default 1e10). */
  conditionLimit?: number;
  /** How many cells or sectors a finding lists by name (default 10). */
  listLimit?: number;
}

export function checks(t: Table, options: CheckOptions = {}): Finding[] {
  const tol = options.balanceTolerance ?? 1e-4;
  const condLimit = options.conditionLimit ?? 1e10;
  const limit = options.listLimit ?? 10;
  const out: Finding[] = [];
  const n = t.sectors.codes.length;
  const S = t.sectors;

  // Non-finite values, block by block.
  const blocks: BlockView[] = [
    { block: 'Z', m: t.Z, rowName: (i) => S.labels[i]!, colName: (j) => S.labels[j]!, what: 'intermediate flows' },
    { block: 'F', m: t.F, rowName: (i) => S.labels[i]!, colName: (j) => t.finalDemand.labels[j]!, what: 'final demand' },
    { block: 'V', m: t.V, rowName: (i) => t.valueAdded.labels[i]!, colName: (j) => S.labels[j]!, what: 'value added' },
    { block: 'x', m: { rows: n, cols: 1, data: t.x }, rowName: (i) => S.labels[i]!, colName: () => 'total output', what: 'total output' },
  ];
  if (t.imports) {
    blocks.push({ block: 'imports', m: { rows: 1, cols: n, data: t.imports }, rowName: () => 'imports', colName: (j) => S.labels[j]!, what: 'imports' });
  }
  for (const s of t.satellites) {
    blocks.push({ block: 'satellite', name: s.code, m: { rows: 1, cols: n, data: s.values }, rowName: () => s.label, colName: (j) => S.labels[j]!, what: `satellite '${s.label}'` });
  }
  let finite = true;
  for (const b of blocks) {
    const bad = scan(b, (v) => !Number.isFinite(v), limit, (i, j, v) => `row '${b.rowName(i)}', column '${b.colName(j)}': ${v}`);
    if (!bad) continue;
    finite = false;
    out.push({
      code: 'non-finite',
      severity: 'error',
      message: `${b.what}: ${bad.count} value${bad.count > 1 ? 's are' : ' is'} not a finite number (${bad.list})`,
      where: bad.where,
      cells: bad.cells,
      data: { count: bad.count },
    });
  }

  // Negative values.
  for (const b of blocks) {
    if (b.block === 'x') continue;
    const neg = scan(b, (v) => v < 0, limit, (i, j, v) => `'${b.rowName(i)}' → '${b.colName(j)}' ${v}`);
    if (!neg) continue;
    const legal =
      b.block === 'Z'
        ? 'negative intermediate flows are unusual; check the source'
        : 'negatives are legal in some rows and columns, such as changes in inventories or taxes less subsidies';
    out.push({
      code: 'negative-flow',
      severity: b.block === 'Z' ? 'warning' : 'note',
      message: `${b.what}: ${neg.count} negative value${neg.count > 1 ? 's' : ''} (${neg.list}); ${legal}`,
      where: neg.where,
      cells: neg.cells,
      data: { count: neg.count },
    });
  }

  // Output.
  const zeroOut: number[] = [];
  const negOut: number[] = [];
  for (let i = 0; i < n; i++) {
    const v = t.x[i]!;
    if (v === 0) zeroOut.push(i);
    else if (v < 0) negOut.push(i);
  }
  if (negOut.length) {
    out.push({
      code: 'negative-output',
      severity: 'error',
      message: `total output is negative for ${negOut.length} sector${negOut.length > 1 ? 's' : ''}: ${negOut.slice(0, limit).map((i) => `'${S.labels[i]}' (${t.x[i]})`).join(', ')}`,
      where: { sector: S.codes[negOut[0]!]!, sectors: negOut.map((i) => S.codes[i]!) },
      cells: negOut.slice(0, limit).map((i) => ({ block: 'x', row: i, col: 0 })),
    });
  }
  if (zeroOut.length) {
    out.push({
      code: 'zero-output',
      severity: 'warning',
      message: `total output is zero for ${zeroOut.length} sector${zeroOut.length > 1 ? 's' : ''}: ${zeroOut.slice(0, limit).map((i) => `'${S.labels[i]}'`).join(', ')}; their coefficients are set to zero and they cannot carry a multiplier. Remove them or aggregate them with a neighbour`,
      where: { sector: S.codes[zeroOut[0]!]!, sectors: zeroOut.map((i) => S.codes[i]!) },
      cells: zeroOut.slice(0, limit).map((i) => ({ block: 'x', row: i, col: 0 })),
    });
  }

  // Balances.
  const rounding = t.meta.rounding !== undefined && Number.isFinite(t.meta.rounding) && t.meta.rounding > 0 ? t.meta.rounding : roundingOf(t);
  const withinRounding: { kind: string; gaps: Gap[] }[] = [];
  const overTolerance = (kind: string, gaps: Gap[]): Gap[] => {
    const over = gaps.filter((g) => g.rel > tol);
    if (!rounding) return over;
    const bound = (g: Gap) => roundingBound(rounding, g.parts);
    const soft = over.filter((g) => Math.abs(g.total - g.x) <= bound(g));
    if (soft.length) withinRounding.push({ kind, gaps: soft });
    return over.filter((g) => Math.abs(g.total - g.x) > bound(g));
  };
  if (finite && !t.meta.outputAssumed) {
    if (t.F.cols > 0) {
      const gaps = balanceGaps(n, (i, add) => {
        for (let j = 0; j < n; j++) add(t.Z.data[i * n + j]!);
        for (let j = 0; j < t.F.cols; j++) add(t.F.data[i * t.F.cols + j]!);
      }, t.x);
      const bad = overTolerance('row', gaps);
      if (bad.length) {
        out.push(imbalance('row-imbalance', 'row', bad, tol, t, limit, 'Σ intermediate sales + Σ final demand'));
      }
    } else {
      out.push({ code: 'row-balance-unchecked', severity: 'note', message: 'the table has no final-demand columns, so the row balance cannot be checked' });
    }
    if (t.V.rows > 0 || t.imports) {
      const gaps = balanceGaps(n, (j, add) => {
        for (let i = 0; i < n; i++) add(t.Z.data[i * n + j]!);
        for (let i = 0; i < t.V.rows; i++) add(t.V.data[i * n + j]!);
        if (t.imports) add(t.imports[j]!);
      }, t.x);
      const bad = overTolerance('column', gaps);
      if (bad.length) {
        out.push(imbalance('column-imbalance', 'column', bad, tol, t, limit, 'Σ intermediate purchases + Σ value added' + (t.imports ? ' + imports' : '')));
      }
    } else {
      out.push({ code: 'column-balance-unchecked', severity: 'note', message: 'the table has no value-added rows, so the column balance cannot be checked' });
    }
    for (const w of withinRounding) {
      const worst = [...w.gaps].sort((a, b) => b.rel - a.rel)[0]!;
      out.push({
        code: 'balance-within-rounding',
        severity: 'note',
        message: `${w.gaps.length} ${w.kind}${w.gaps.length > 1 ? 's' : ''} miss their total output by more than ${(tol * 100).toPrecision(2)}%, but by no more than the rounding of the figures (to ${rounding}) allows; the largest: '${S.labels[worst.i]}' ${worst.total.toPrecision(6)} against ${worst.x.toPrecision(6)}`,
        where: { sector: S.codes[worst.i]!, sectors: w.gaps.map((g) => S.codes[g.i]!) },
        data: { count: w.gaps.length, rounding },
      });
    }
  }

  if (!finite || negOut.length) return out; // no model questions on non-finite or negative output

  // Coefficients.
  const A = coefficients(t);
  const cs = new Float64Array(n);
  let negA = false;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const v = A.data[i * n + j]!;
      cs[j] += v;
      if (v < 0) negA = true;
    }
  }
  const over: number[] = [];
  for (let j = 0; j < n; j++) if (cs[j]! >= 1) over.push(j);
  if (over.length) {
    over.sort((a, b) => cs[b]! - cs[a]!);
    out.push({
      code: 'coefficient-sum',
      severity: 'error',
      message: `the technical coefficients of ${over.length} sector${over.length > 1 ? 's' : ''} sum to 1 or more, so ${over.length > 1 ? 'they buy' : 'it buys'} at least as much in intermediate inputs as ${over.length > 1 ? 'they produce' : 'it produces'}: ${over.slice(0, limit).map((j) => `'${S.labels[j]}' (${cs[j]!.toFixed(4)})`).join(', ')}`,
      where: { sector: S.codes[over[0]!]!, sectors: over.map((j) => S.codes[j]!) },
      cells: over.slice(0, limit).map((j) => ({ block: 'x', row: j, col: 0 })),
      data: { sums: over.map((j) => cs[j]!) },
    });
  }

  // Productivity.
  if (!negA) out.push(...productivity(A, t, limit));
  else {
    out.push({
      code: 'perron-root-skipped',
      severity: 'note',
      message: 'the coefficients include negative values, so the Perron-root test of productivity does not apply; the Leontief inverse is checked for negative entries instead',
    });
  }

  // Singularity and conditioning of I − A.
  const lu = new LU(identityMinus(A), { overwrite: true });
  if (lu.isSingular) {
    const z = nullVector(lu);
    const idx: number[] = [];
    let zmax = 0;
    for (let i = 0; i < n; i++) zmax = Math.max(zmax, Math.abs(z[i]!));
    for (let i = 0; i < n; i++) if (Math.abs(z[i]!) > 1e-8 * zmax) idx.push(i);
    out.push({
      code: 'singular',
      severity: 'error',
      message: `I − A is singular (zero pivot in column ${lu.singularColumn}): no Leontief inverse exists. The sectors of its null vector are ${idx.slice(0, limit).map((i) => `'${S.labels[i]}'`).join(', ')}${idx.length > limit ? ', …' : ''}`,
      where: { sectors: idx.map((i) => S.codes[i]!) },
      data: { column: lu.singularColumn },
    });
  } else {
    const kappa = conditionEstimate(lu);
    out.push({
      code: 'condition',
      severity: 'note',
      message: `the 1-norm condition estimate of I − A is ${kappa.toPrecision(3)}`,
      data: { condition: kappa },
    });
    if (kappa > condLimit) {
      out.push({
        code: 'ill-conditioned',
        severity: 'warning',
        message: `I − A is ill-conditioned (condition estimate ${kappa.toPrecision(3)} above ${condLimit.toPrecision(2)}): results may lose up to ${Math.round(Math.log10(kappa))} of their 16 significant digits`,
        data: { condition: kappa },
      });
    }
    if (negA) {
      const L = lu.inverse();
      let negL = 0;
      for (let k = 0; k < L.data.length; k++) if (L.data[k]! < -1e-12) negL++;
      if (negL) {
        out.push({
          code: 'negative-inverse',
          severity: 'warning',
          message: `the Leontief inverse has ${negL} negative entr${negL > 1 ? 'ies' : 'y'}: some demand would lower some output, which is implausible`,
          data: { count: negL },
        });
      }
    }
  }
  return out;
}

/** One block of the table as the scans see it: its matrix and how to name its rows and columns. */
interface BlockView {
  block: CellAt['block'];
  m: Matrix;
  rowName: (i: number) => string;
  colName: (j: number) => string;
  what: string;
  name?: string;
}

/** The cells of a block whose value fails `bad`: a count, the first `limit` cells and their descriptions. */
function scan(b: BlockView, bad: (v: number) => boolean, limit: number, describe: (i: number, j: number, v: number) => string) {
  const cells: CellAt[] = [];
  const texts: string[] = [];
  let count = 0;
  for (let i = 0; i < b.m.rows; i++) {
    for (let j = 0; j < b.m.cols; j++) {
      const v = b.m.data[i * b.m.cols + j]!;
      if (!bad(v)) continue;
      count++;
      if (cells.length < limit) {
        const c: CellAt = { block: b.block, row: i, col: j };
        if (b.name) c.name = b.name;
        cells.push(c);
        texts.push(describe(i, j, v));
      }
    }
  }
  if (!count) return undefined;
  const first = cells[0]!;
  return {
    count,
    cells,
    list: `${texts.join('; ')}${count > texts.length ? '; …' : ''}`,
    where: { rowLabel: b.rowName(first.row), columnLabel: b.colName(first.col) },
  };
}

interface Gap {
  i: number;
  total: number;
  x: number;
  rel: number;
  /** Non-zero parts of the line. */
  parts: number;
}

/**
 * The unit the table's figures are rounded to, from the figures: 10⁻ᵈ for the most decimals d
 * among up to about 4,000 non-zero values of Z, F, V, imports and x, or 0 when some have more
 * than six (figures computed, not published).
 */
export function roundingOf(t: Table): number {
  const blocks = [t.Z.data, t.F.data, t.V.data, t.x, ...(t.imports ? [t.imports] : [])];
  const total = blocks.reduce((a, b) => a + b.length, 0);
  const step = Math.max(1, Math.floor(total / 4000));
  let most = -1;
  let k = 0;
  for (const b of blocks) {
    for (; k < b.length; k += step) {
      const v = Math.abs(b[k]!);
      if (v === 0 || !Number.isFinite(v)) continue;
      let d = 0;
      while (d <= 6 && Math.abs(v * 10 ** d - Math.round(v * 10 ** d)) > 1e-9 * Math.max(1, v * 10 ** d)) d++;
      if (d > 6) return 0;
      if (d > most) most = d;
    }
    k -= b.length;
  }
  return most < 0 ? 0 : Number((10 ** -most).toPrecision(1));
}

/** Per line i, the sum of its parts (given one by one to `add`), its gap to x and the number of non-zero parts. */
function balanceGaps(n: number, parts: (i: number, add: (v: number) => void) => void, x: Float64Array): Gap[] {
  const out: Gap[] = [];
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(x[i]!));
  let total = 0;
  let count = 0;
  const add = (v: number) => {
    total += v;
    if (v !== 0) count++;
  };
  for (let i = 0; i < n; i++) {
    total = 0;
    count = 0;
    parts(i, add);
    const d = Math.abs(total - x[i]!);
    // Relative to the sector's output; a zero-output sector is compared with the largest output.
    const den = Math.abs(x[i]!) > 0 ? Math.abs(x[i]!) : scale || 1;
    out.push({ i, total, x: x[i]!, rel: d / den, parts: count });
  }
  return out;
}

function imbalance(code: string, kind: 'row' | 'column', bad: Gap[], tol: number, t: Table, limit: number, what: string): Finding {
  bad.sort((a, b) => b.rel - a.rel);
  const S = t.sectors;
  const worst = bad.slice(0, limit);
  return {
    code,
    severity: 'warning',
    message: `${bad.length} ${kind}${bad.length > 1 ? 's do' : ' does'} not balance within ${(tol * 100).toPrecision(2)}% (${what} against total output); worst: ${worst
      .map((g) => `'${S.labels[g.i]}' ${g.total.toPrecision(6)} against ${g.x.toPrecision(6)} (${(g.rel * 100).toPrecision(3)}%)`)
      .join('; ')}`,
    where: { sector: S.codes[worst[0]!.i]!, sectors: bad.map((g) => S.codes[g.i]!) },
    cells: worst.map((g) => ({ block: 'x', row: g.i, col: 0 })),
    data: { worst: worst[0]!.rel, count: bad.length },
  };
}

/**
 * The Perron root of A and, when it is 1 or more, each closed group: a strongly connected block
 * of sectors whose own Perron root is 1 or more. ρ(A) is the largest of the blocks' roots.
 */
function productivity(A: Matrix, t: Table, limit: number): Finding[] {
  const S = t.sectors;
  const out: Finding[] = [];
  const whole = perronRoot(A, { threshold: 1, maxIterations: 2000 });
  if (whole.upper < 1) {
    const r = perronRoot(A, { tolerance: 1e-9, maxIterations: 500 });
    out.push({
      code: 'perron-root',
      severity: 'note',
      message: `the Perron root of A is ${fmtRoot(r.lower, r.upper)}, below 1: the economy is productive (Hawkins–Simon holds)`,
      data: { lower: r.lower, upper: r.upper },
    });
    return out;
  }
  const groups: { idx: number[]; lower: number; upper: number }[] = [];
  let rhoLo = 0;
  let rhoHi = 0;
  for (const comp of stronglyConnected(A)) {
    if (comp.length === 1 && A.data[comp[0]! * A.cols + comp[0]!] === 0) continue;
    const r = perronRoot(submatrix(A, comp, comp), { tolerance: 1e-12, maxIterations: 5000 });
    rhoLo = Math.max(rhoLo, r.lower);
    rhoHi = Math.max(rhoHi, r.upper);
    if (r.upper >= 1 - 1e-12) groups.push({ idx: comp, lower: r.lower, upper: r.upper });
  }
  if (!groups.length) {
    out.push({
      code: 'perron-root',
      severity: 'note',
      message: `the Perron root of A is ${fmtRoot(rhoLo, rhoHi)}, below 1: the economy is productive (Hawkins–Simon holds)`,
      data: { lower: rhoLo, upper: rhoHi },
    });
    return out;
  }
  for (const g of groups) {
    out.push({
      code: 'not-productive',
      severity: 'error',
      message: `the economy is not productive: the closed group of ${g.idx.length} sector${g.idx.length > 1 ? 's' : ''} ${g.idx
        .slice(0, limit)
        .map((i) => `'${S.labels[i]}'`)
        .join(', ')}${g.idx.length > limit ? ', …' : ''} needs at least one unit of its own output per unit it makes (its Perron root is ${fmtRoot(g.lower, g.upper)}), so no positive output can meet a positive final demand`,
      where: { sector: S.codes[g.idx[0]!]!, sectors: g.idx.map((i) => S.codes[i]!) },
      data: { lower: g.lower, upper: g.upper, sectors: g.idx.map((i) => S.codes[i]!) },
    });
  }
  return out;
}

function fmtRoot(lo: number, hi: number): string {
  return hi - lo < 1e-6 ? ((lo + hi) / 2).toFixed(6) : `between ${lo.toFixed(6)} and ${hi.toFixed(6)}`;
}

/** A vector z with (I − A) z = 0 from a factorisation whose first zero pivot is in column c. */
function nullVector(lu: LU): Float64Array {
  const n = lu.n;
  const c = lu.singularColumn - 1;
  const z = new Float64Array(n);
  z[c] = 1;
  // U[0:c, 0:c] z = −U[0:c, c]; U z = 0 implies P A z = L U z = 0.
  for (let i = c - 1; i >= 0; i--) {
    let s = -lu.lu[i * n + c]!;
    for (let k = i + 1; k < c; k++) s -= lu.lu[i * n + k]! * z[k]!;
    const d = lu.lu[i * n + i]!;
    z[i] = d === 0 ? 0 : s / d;
  }
  return z;
}
