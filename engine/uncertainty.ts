/**
 * Monte Carlo on the technical coefficients: how uncertain each multiplier and each scenario
 * impact is when the coefficients are estimates.
 *
 * Error model (stated with every result): each nonzero coefficient is multiplied by independent
 * log-normal noise with mean 1,
 *   a′ᵢⱼ = aᵢⱼ · exp(σᵢⱼ Zᵢⱼ − σᵢⱼ²/2),  Zᵢⱼ ~ N(0, 1) independent,  σᵢⱼ² = ln(1 + cvᵢⱼ²),
 * so that E[a′ᵢⱼ] = aᵢⱼ and the coefficient of variation of a′ᵢⱼ is cvᵢⱼ exactly; zero cells stay
 * zero and no coefficient changes sign. cv is given for the whole table (a number), per column
 * (n numbers: one per buying sector) or per cell (an n × n matrix).
 *
 * Draws that break productivity are counted, reported and excluded, never kept: under the
 * default rule 'column-sums' a draw is rejected when a column of A′ sums to 1 or more (the rule
 * of `checks`, which makes the Perron root below 1 certain); under 'perron' only when the
 * Perron root of A′ is not proven below 1 (for tables with a column sum of 1 or more that are
 * still productive). A draw whose I − A′ has a zero pivot is rejected as 'singular'. The
 * percentiles therefore describe the distribution conditional on productivity.
 *
 * Reproducibility: draw k uses its own generator `drawStream(seed, k)` (see random.ts); its
 * normals are taken in row-major order of the cells with aᵢⱼ ≠ 0 and cvᵢⱼ > 0. A draw depends
 * only on the seed and its index, so any split of the draws among workers (`runDraws` on
 * ranges, then `mergeDrawBlocks`) gives exactly the single-thread result.
 *
 * For each accepted draw: the multipliers c′L′ of every measure (one transposed solve each) and,
 * for every scenario, x′ = L′d (one solve), the impact cᵢ x′ᵢ on each measure by sector and its
 * total c′x′. Percentiles are type 7 (linear interpolation between order statistics, h = (N − 1)p;
 * common practice).
 */
import { CancelledError, InputError } from './errors';
import type { Finding } from './findings';
import { LU } from './linalg/lu';
import type { Matrix } from './linalg/matrix';
import { perronRoot } from './linalg/perron';
import { drawStream } from './random';

export const UNCERTAINTY_ABOUT =
  'How much each multiplier and scenario impact could vary if the technical coefficients were off by the stated coefficient of variation.';

export const UNCERTAINTY_CAUTIONS = [
  'The spread comes only from the stated noise on the technical coefficients; errors in final demand, in the measures and in the model itself are not included.',
  'Noise is independent from cell to cell; correlated revisions would give a different spread.',
  'Draws that made the economy unproductive were excluded, so the percentiles are conditional on productivity.',
  'Percentiles are for each number on its own; they are not joint bounds.',
  'The model keeps fixed coefficients and has no capacity limits; results are gross effects, not net, and not a forecast.',
  'Have the results reviewed by a qualified economist and follow local guidance before using them in a decision.',
];

/** The coefficient of variation: one for the whole table, one per column (n values), or one per cell (n × n). */
export type CoefficientCv = number | ArrayLike<number> | Matrix;

export type ProductivityRule = 'column-sums' | 'perron';

export type RejectReason = 'column-sum' | 'perron' | 'singular';

/** A measure as a coefficient row per unit of output (output itself is c = 1). */
export interface MonteCarloMeasure {
  code: string;
  label?: string;
  unit?: string;
  c: ArrayLike<number>;
}

/** A scenario as a final-demand change vector by sector. */
export interface MonteCarloScenario {
  code: string;
  label?: string;
  d: ArrayLike<number>;
}

/** Everything a run needs; plain data, so it can be posted to a worker as it is. */
export interface MonteCarloSpec {
  A: Matrix;
  cv: CoefficientCv;
  /** N, the number of draws (at least 1). */
  draws: number;
  /** A whole number from 0 to 2⁵³ − 1. */
  seed: number;
  /** Sector codes (length n), for results and messages; default '1' … 'n'. */
  sectors?: string[];
  /** Default: output only, `{ code: 'output', c: 1 }`. */
  measures?: MonteCarloMeasure[];
  scenarios?: MonteCarloScenario[];
  /** Default 'column-sums'. */
  productivity?: ProductivityRule;
}

/** Minimal cancellation signal: an AbortSignal fits. */
export interface CancelSignal {
  readonly aborted: boolean;
}

export interface RunOptions {
  /** Called after each draw with the draws done and the draws asked for (of this range). */
  onProgress?: (done: number, total: number) => void;
  /** Checked before each draw; when aborted, the run stops with `CancelledError`. */
  signal?: CancelSignal;
}

export interface RejectedDraw {
  draw: number;
  reason: RejectReason;
  /** The first column that summed to 1 or more ('column-sum'), 0-based. */
  sector?: number;
  /** That column sum, or the Perron root's lower bound. */
  value?: number;
}

/** The outcome of draws [start, end): plain data that a worker can post back. */
export interface DrawBlock {
  start: number;
  end: number;
  /** Values per accepted draw. */
  quantities: number;
  /** Indices of the accepted draws, in order. */
  accepted: Int32Array;
  /** accepted.length × quantities, row-major. */
  samples: Float64Array;
  rejectedCount: Record<RejectReason, number>;
  /** Column-sum rejections by the first offending column. */
  rejectedByColumn: Float64Array;
  /** The first few rejected draws (at most 20 per block). */
  rejected: RejectedDraw[];
}

export interface Summary {
  /** The value with the table's own coefficients. */
  point: number;
  mean: number;
  /** Sample standard deviation (N − 1). */
  sd: number;
  p5: number;
  p50: number;
  p95: number;
  min: number;
  max: number;
}

export interface MonteCarloResult {
  about: string;
  /** The error model in words, with the cv used. */
  errorModel: string;
  seed: number;
  productivity: ProductivityRule;
  draws: number;
  accepted: number;
  rejected: {
    total: number;
    byReason: Record<RejectReason, number>;
    /** Column-sum rejections by sector code (only sectors with at least one). */
    bySector: { sector: string; count: number }[];
    /** The first rejected draws (at most 20). */
    first: RejectedDraw[];
  };
  sectors: string[];
  measures: { code: string; label: string; unit?: string }[];
  /** Multipliers c′L per measure and sector. */
  multipliers: { measure: string; bySector: Summary[] }[];
  /** Impacts per scenario, measure and sector, and their totals. */
  scenarios: { scenario: string; label: string; measures: { measure: string; total: Summary; bySector: Summary[] }[] }[];
  /** Accepted draws × quantities, row-major, in draw order (see `sampleColumn`). */
  samples: { rows: number; cols: number; data: Float64Array; draws: Int32Array };
  findings: Finding[];
  cautions: string[];
}

/** A spec checked and put in the form the draws use. */
export interface PreparedMonteCarlo {
  n: number;
  draws: number;
  seed: number;
  rule: ProductivityRule;
  A: Float64Array;
  sectors: string[];
  measures: { code: string; label: string; unit?: string; c: Float64Array }[];
  scenarios: { code: string; label: string; d: Float64Array }[];
  /** Cells drawn (aᵢⱼ ≠ 0 and cv > 0), row-major order. */
  cells: Int32Array;
  sigma: Float64Array;
  /** −σ²/2 per drawn cell. */
  shift: Float64Array;
  quantities: number;
  errorModel: string;
}

const MAX_SAMPLE_VALUES = 2 ** 28;
const KEEP_REJECTED = 20;

function isMatrix(x: unknown): x is Matrix {
  return typeof x === 'object' && x !== null && 'rows' in x && 'cols' in x && 'data' in x;
}

/** Check a spec and prepare it. Every problem is an `InputError` that names what and where. */
export function prepareMonteCarlo(spec: MonteCarloSpec): PreparedMonteCarlo {
  const A = spec.A;
  if (!isMatrix(A) || A.rows !== A.cols || A.data.length !== A.rows * A.cols) {
    throw new InputError('not-square', 'the technical coefficients must be a square matrix { rows, cols, data }');
  }
  const n = A.rows;
  if (n === 0) throw new InputError('empty', 'the model has no sectors');
  const sectors = spec.sectors ? [...spec.sectors] : Array.from({ length: n }, (_, i) => String(i + 1));
  if (sectors.length !== n) throw new InputError('bad-size', `there are ${sectors.length} sector codes for ${n} sectors`);
  const label = (i: number) => `sector ${i + 1} ('${sectors[i]}')`;
  for (let k = 0; k < n * n; k++) {
    if (!Number.isFinite(A.data[k]!)) {
      const i = Math.floor(k / n);
      const j = k % n;
      throw new InputError('non-finite', `technical coefficient (row ${i + 1}, column ${j + 1}) is ${A.data[k]}, not a finite number`, {
        row: i + 1,
        column: j + 1,
        rowLabel: sectors[i],
        columnLabel: sectors[j],
      });
    }
  }
  const draws = spec.draws;
  if (!Number.isInteger(draws) || draws < 1 || draws > 1e9) {
    throw new InputError('bad-draws', `the number of draws must be a whole number from 1 to 10⁹; got ${draws}`, { text: String(draws) }, 'Ask for at least 1 draw; 1000 or more gives stable 5th and 95th percentiles');
  }
  const seed = spec.seed;
  if (!Number.isSafeInteger(seed) || seed < 0) {
    throw new InputError('bad-seed', `the seed must be a whole number from 0 to 2^53 − 1; got ${seed}`, { text: String(seed) });
  }
  const rule = spec.productivity ?? 'column-sums';
  if (rule !== 'column-sums' && rule !== 'perron') {
    throw new InputError('bad-option', `the productivity rule must be 'column-sums' or 'perron'; got '${String(rule)}'`, { text: String(rule) });
  }

  // The coefficient of variation per cell.
  const cv = new Float64Array(n * n);
  let errorCv: string;
  const cvOk = (v: number, where: string, w: Record<string, unknown>) => {
    if (!Number.isFinite(v) || v < 0) {
      throw new InputError(v < 0 ? 'negative-cv' : 'non-finite', `the coefficient of variation ${where} is ${v}; it must be a finite number of 0 or more`, w, 'Give 0.1 for a 10 % coefficient of variation');
    }
  };
  const c0 = spec.cv;
  if (typeof c0 === 'number') {
    cvOk(c0, 'for the whole table', { text: String(c0) });
    cv.fill(c0);
    errorCv = `cv = ${c0} for every coefficient`;
  } else if (isMatrix(c0)) {
    if (c0.rows !== n || c0.cols !== n) throw new InputError('bad-size', `the per-cell coefficients of variation are ${c0.rows} × ${c0.cols}; the table is ${n} × ${n}`);
    for (let k = 0; k < n * n; k++) {
      const i = Math.floor(k / n);
      const j = k % n;
      cvOk(c0.data[k]!, `of cell (row ${i + 1}, column ${j + 1})`, { row: i + 1, column: j + 1, rowLabel: sectors[i], columnLabel: sectors[j] });
      cv[k] = c0.data[k]!;
    }
    errorCv = 'cv given per cell';
  } else if (c0 && typeof (c0 as ArrayLike<number>).length === 'number') {
    const v = c0 as ArrayLike<number>;
    if (v.length !== n) throw new InputError('bad-size', `there are ${v.length} per-column coefficients of variation for ${n} sectors`, {}, 'Give one per column (buying sector), a single number, or an n × n matrix');
    for (let j = 0; j < n; j++) {
      cvOk(v[j]!, `of column ${j + 1} (${sectors[j]})`, { column: j + 1, columnLabel: sectors[j], sector: sectors[j] });
      for (let i = 0; i < n; i++) cv[i * n + j] = v[j]!;
    }
    errorCv = 'cv given per column';
  } else {
    throw new InputError('bad-cv', 'the coefficient of variation must be a number, one number per column, or an n × n matrix');
  }

  if (rule === 'perron') {
    for (let k = 0; k < n * n; k++) {
      if (A.data[k]! < 0) {
        const i = Math.floor(k / n);
        const j = k % n;
        throw new InputError('negative', `the Perron rule needs nonnegative coefficients; cell (row ${i + 1}, column ${j + 1}) is ${A.data[k]}`, { row: i + 1, column: j + 1, rowLabel: sectors[i], columnLabel: sectors[j] }, "Use productivity: 'column-sums'");
      }
    }
  }
  // The table itself must pass the rule.
  const base = A.data;
  const colSum = columnSums(base, n);
  if (rule === 'column-sums') {
    for (let j = 0; j < n; j++) {
      if (!(colSum[j]! < 1)) {
        throw new InputError('not-productive', `the coefficients of ${label(j)} sum to ${colSum[j]}, 1 or more, so the table itself fails the column-sum rule`, { column: j + 1, sector: sectors[j] }, "Check the table (checks), or use productivity: 'perron' if it is productive all the same");
      }
    }
  } else if (!(perronRoot(A, { threshold: 1 }).upper < 1)) {
    throw new InputError('not-productive', 'the Perron root of the table itself is not below 1, so the table is not productive', {}, 'Check the table (checks) before a Monte Carlo run');
  }

  const measures = (spec.measures ?? [{ code: 'output', label: 'output', c: new Float64Array(n).fill(1) }]).map((m, q) => {
    if (!m || typeof m.code !== 'string' || !m.code.trim()) throw new InputError('empty-code', `measure ${q + 1} has no code`);
    const c = vectorOf(m.c, n, `measure '${m.code}'`, sectors);
    const out: { code: string; label: string; unit?: string; c: Float64Array } = { code: m.code, label: m.label ?? m.code, c };
    if (m.unit !== undefined) out.unit = m.unit;
    return out;
  });
  if (measures.length === 0) throw new InputError('no-measures', 'give at least one measure (output is c = 1 for every sector)');
  unique(measures.map((m) => m.code), 'measure');
  const scenarios = (spec.scenarios ?? []).map((s, q) => {
    if (!s || typeof s.code !== 'string' || !s.code.trim()) throw new InputError('empty-code', `scenario ${q + 1} has no code`);
    return { code: s.code, label: s.label ?? s.code, d: vectorOf(s.d, n, `scenario '${s.code}'`, sectors) };
  });
  unique(scenarios.map((s) => s.code), 'scenario');

  const active: number[] = [];
  for (let k = 0; k < n * n; k++) if (base[k] !== 0 && cv[k]! > 0) active.push(k);
  const cells = Int32Array.from(active);
  const sigma = new Float64Array(cells.length);
  const shift = new Float64Array(cells.length);
  for (let q = 0; q < cells.length; q++) {
    const c = cv[cells[q]!]!;
    const s2 = Math.log1p(c * c);
    sigma[q] = Math.sqrt(s2);
    shift[q] = -s2 / 2;
  }
  const M = measures.length;
  const quantities = M * n + scenarios.length * M * (n + 1);
  if (quantities * draws > MAX_SAMPLE_VALUES) {
    throw new InputError('too-large', `${draws} draws of ${quantities} values each would keep ${quantities * draws} numbers, more than ${MAX_SAMPLE_VALUES}`, {}, 'Ask for fewer draws, measures or scenarios per run');
  }
  const errorModel =
    `Each nonzero coefficient a is multiplied by exp(σZ − σ²/2), Z standard normal and independent between cells, σ² = ln(1 + cv²), ` +
    `so its mean stays a and its coefficient of variation is cv; ${errorCv}. Draws breaking productivity ` +
    `(${rule === 'column-sums' ? 'a column sum of 1 or more' : 'a Perron root not below 1'}, or a singular I − A) are excluded.`;
  return { n, draws, seed, rule, A: base, sectors, measures, scenarios, cells, sigma, shift, quantities, errorModel };
}

function vectorOf(v: ArrayLike<number> | undefined, n: number, what: string, sectors: string[]): Float64Array {
  if (!v || v.length !== n) throw new InputError('bad-size', `${what} has ${v ? v.length : 0} values; the model has ${n} sectors`, {}, `Give one value per sector (${n})`);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(v[i]!)) throw new InputError('non-finite', `${what}: the value for sector ${i + 1} ('${sectors[i]}') is ${v[i]}, not a finite number`, { column: i + 1, sector: sectors[i] });
    out[i] = v[i]!;
  }
  return out;
}

function unique(codes: string[], what: string): void {
  const seen = new Set<string>();
  for (const c of codes) {
    if (seen.has(c)) throw new InputError('duplicate-code', `${what} code '${c}' appears twice`, { text: c }, 'Give each one its own code');
    seen.add(c);
  }
}

function columnSums(a: Float64Array, n: number): Float64Array {
  const s = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const o = i * n;
    for (let j = 0; j < n; j++) s[j] += a[o + j]!;
  }
  return s;
}

function checkRange(p: PreparedMonteCarlo, start: number, end: number): void {
  if (!Number.isInteger(start) || !Number.isInteger(end) || start < 0 || end > p.draws || start > end) {
    throw new InputError('bad-range', `draw range [${start}, ${end}) is not within [0, ${p.draws})`);
  }
}

/**
 * The perturbed coefficients of draw `index` (row-major n × n, written into `out`). Exposed for
 * tests and for callers who want the draws themselves.
 */
export function drawCoefficients(p: PreparedMonteCarlo, index: number, out = new Float64Array(p.n * p.n)): Float64Array {
  out.set(p.A);
  const rng = drawStream(p.seed, index);
  const { cells, sigma, shift } = p;
  for (let q = 0; q < cells.length; q++) {
    const k = cells[q]!;
    out[k] = p.A[k]! * Math.exp(sigma[q]! * rng.normal() + shift[q]!);
  }
  return out;
}

/**
 * Why the drawn coefficients `a` (row-major n × n) are left out under the run's productivity
 * rule, or undefined when they are kept: a column summing to 1 or more ('column-sums'), or a
 * Perron root of 1 or more ('perron', checked only when a column sum reaches 1).
 */
export function productivityRejection(p: Pick<PreparedMonteCarlo, 'n' | 'rule'>, a: Float64Array, draw: number): RejectedDraw | undefined {
  const n = p.n;
  const cs = columnSums(a, n);
  let bad = -1;
  for (let j = 0; j < n; j++) {
    if (!(cs[j]! < 1)) {
      bad = j;
      break;
    }
  }
  if (bad < 0) return undefined;
  if (p.rule === 'column-sums') return { draw, reason: 'column-sum', sector: bad, value: cs[bad]! };
  const pr = perronRoot({ rows: n, cols: n, data: a }, { threshold: 1 });
  return pr.upper < 1 ? undefined : { draw, reason: 'perron', value: pr.lower };
}

/** The quantities of one model I − A′ (factored) into `row`; false when a value is not finite. */
function evaluate(p: PreparedMonteCarlo, lu: LU, row: Float64Array): boolean {
  const { n, measures, scenarios } = p;
  let o = 0;
  for (const m of measures) {
    const y = lu.solveTranspose(m.c);
    row.set(y, o);
    o += n;
  }
  for (const s of scenarios) {
    const x = lu.solve(s.d);
    for (const m of measures) {
      let t = 0;
      for (let i = 0; i < n; i++) {
        const v = m.c[i]! * x[i]!;
        row[o + i] = v;
        t += v;
      }
      row[o + n] = t;
      o += n + 1;
    }
  }
  for (let q = 0; q < row.length; q++) if (!Number.isFinite(row[q]!)) return false;
  return true;
}

/**
 * Draws [start, end) of a run: the pure engine part that any worker can run. The same draw
 * always gives the same numbers, whichever range it is part of.
 */
export function runDraws(spec: MonteCarloSpec | PreparedMonteCarlo, start: number, end: number, options: RunOptions = {}): DrawBlock {
  const p = 'quantities' in spec && 'cells' in spec ? spec : prepareMonteCarlo(spec);
  checkRange(p, start, end);
  const { n, quantities: Q } = p;
  const total = end - start;
  const samples = new Float64Array(total * Q);
  const accepted: number[] = [];
  const rejectedCount: Record<RejectReason, number> = { 'column-sum': 0, perron: 0, singular: 0 };
  const rejectedByColumn = new Float64Array(n);
  const rejected: RejectedDraw[] = [];
  const a = new Float64Array(n * n);
  const row = new Float64Array(Q);
  const reject = (r: RejectedDraw) => {
    rejectedCount[r.reason]++;
    if (rejected.length < KEEP_REJECTED) rejected.push(r);
  };
  for (let k = start; k < end; k++) {
    if (options.signal?.aborted) throw new CancelledError(`the Monte Carlo run was cancelled after ${k - start} of ${total} draws`);
    drawCoefficients(p, k, a);
    const why = productivityRejection(p, a, k);
    if (why) {
      if (why.reason === 'column-sum') rejectedByColumn[why.sector!]!++;
      reject(why);
    } else {
      // I − A′ in place, then factor in place.
      for (let q = 0; q < n * n; q++) a[q] = -a[q]!;
      for (let i = 0; i < n; i++) a[i * n + i]! += 1;
      const lu = new LU({ rows: n, cols: n, data: a }, { overwrite: true });
      if (lu.isSingular || !evaluate(p, lu, row)) {
        reject({ draw: k, reason: 'singular' });
      } else {
        samples.set(row, accepted.length * Q);
        accepted.push(k);
      }
    }
    options.onProgress?.(k - start + 1, total);
  }
  return {
    start,
    end,
    quantities: Q,
    accepted: Int32Array.from(accepted),
    samples: samples.slice(0, accepted.length * Q),
    rejectedCount,
    rejectedByColumn,
    rejected,
  };
}

/** Percentile by linear interpolation between order statistics (type 7) of sorted values. */
export function percentileSorted(sorted: ArrayLike<number>, p: number): number {
  const N = sorted.length;
  if (N === 0) throw new InputError('empty', 'a percentile of no values is undefined');
  if (!(p >= 0 && p <= 1)) throw new InputError('bad-percentile', `a percentile must be a share from 0 to 1; got ${p}`);
  const h = (N - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(N - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

function summarise(values: Float64Array, point: number): Summary {
  const N = values.length;
  let mean = 0;
  for (let k = 0; k < N; k++) mean += values[k]!;
  mean /= N;
  let ss = 0;
  for (let k = 0; k < N; k++) ss += (values[k]! - mean) ** 2;
  let sd = N > 1 ? Math.sqrt(ss / (N - 1)) : 0;
  values.sort();
  if (values[0] === values[N - 1]) {
    // All draws equal (cv = 0, or a quantity the noise does not reach): say so exactly.
    mean = values[0]!;
    sd = 0;
  }
  return {
    point,
    mean,
    sd,
    p5: percentileSorted(values, 0.05),
    p50: percentileSorted(values, 0.5),
    p95: percentileSorted(values, 0.95),
    min: values[0]!,
    max: values[N - 1]!,
  };
}

/** The quantities with the table's own coefficients. */
function pointValues(p: PreparedMonteCarlo): Float64Array {
  const n = p.n;
  const m = new Float64Array(n * n);
  for (let q = 0; q < n * n; q++) m[q] = -p.A[q]!;
  for (let i = 0; i < n; i++) m[i * n + i]! += 1;
  const lu = new LU({ rows: n, cols: n, data: m }, { overwrite: true });
  const row = new Float64Array(p.quantities);
  if (lu.isSingular || !evaluate(p, lu, row)) {
    throw new InputError('singular', 'I − A of the table itself is singular, so it has no point result', {}, 'Check the table (checks) before a Monte Carlo run');
  }
  return row;
}

/**
 * Merge the blocks of a run (in any order; together they must cover draws 0 … N − 1 once) and
 * summarise. The result does not depend on how the draws were split.
 */
export function mergeDrawBlocks(spec: MonteCarloSpec | PreparedMonteCarlo, blocks: readonly DrawBlock[]): MonteCarloResult {
  const p = 'quantities' in spec && 'cells' in spec ? spec : prepareMonteCarlo(spec);
  const { n, quantities: Q } = p;
  const sorted = [...blocks].sort((a, b) => a.start - b.start);
  let at = 0;
  for (const b of sorted) {
    if (b.start !== at || b.quantities !== Q) {
      throw new InputError('bad-blocks', `the draw blocks do not cover draws 0 to ${p.draws - 1} exactly once (a gap or overlap at draw ${at})`);
    }
    at = b.end;
  }
  if (at !== p.draws) throw new InputError('bad-blocks', `the draw blocks stop at draw ${at}; the run has ${p.draws}`);
  const acceptedCount = sorted.reduce((s, b) => s + b.accepted.length, 0);
  const byReason: Record<RejectReason, number> = { 'column-sum': 0, perron: 0, singular: 0 };
  const byColumn = new Float64Array(n);
  const first: RejectedDraw[] = [];
  const data = new Float64Array(acceptedCount * Q);
  const draws = new Int32Array(acceptedCount);
  let r = 0;
  for (const b of sorted) {
    data.set(b.samples, r * Q);
    draws.set(b.accepted, r);
    r += b.accepted.length;
    for (const k of Object.keys(byReason) as RejectReason[]) byReason[k] += b.rejectedCount[k];
    for (let j = 0; j < n; j++) byColumn[j] += b.rejectedByColumn[j]!;
    for (const x of b.rejected) if (first.length < KEEP_REJECTED) first.push(x);
  }
  const rejectedTotal = byReason['column-sum'] + byReason.perron + byReason.singular;
  if (acceptedCount === 0) {
    throw new InputError(
      'no-accepted-draws',
      `all ${p.draws} draws broke productivity (column sum ${byReason['column-sum']}, Perron root ${byReason.perron}, singular ${byReason.singular}), so there is nothing to summarise`,
      {},
      'Lower the coefficient of variation, or check the table with checks',
    );
  }
  const point = pointValues(p);
  const col = new Float64Array(acceptedCount);
  const summary = (q: number): Summary => {
    for (let k = 0; k < acceptedCount; k++) col[k] = data[k * Q + q]!;
    return summarise(col.slice(), point[q]!);
  };
  const M = p.measures.length;
  const multipliers = p.measures.map((m, mi) => ({
    measure: m.code,
    bySector: Array.from({ length: n }, (_, i) => summary(mi * n + i)),
  }));
  const scenarios = p.scenarios.map((s, si) => ({
    scenario: s.code,
    label: s.label,
    measures: p.measures.map((m, mi) => {
      const o = M * n + (si * M + mi) * (n + 1);
      return { measure: m.code, total: summary(o + n), bySector: Array.from({ length: n }, (_, i) => summary(o + i)) };
    }),
  }));
  const bySector: { sector: string; count: number }[] = [];
  for (let j = 0; j < n; j++) if (byColumn[j]! > 0) bySector.push({ sector: p.sectors[j]!, count: byColumn[j]! });
  bySector.sort((a, b) => b.count - a.count);
  const findings: Finding[] = [];
  if (rejectedTotal > 0) {
    const share = rejectedTotal / p.draws;
    const parts: string[] = [];
    if (byReason['column-sum']) parts.push(`${byReason['column-sum']} with a column sum of 1 or more`);
    if (byReason.perron) parts.push(`${byReason.perron} with a Perron root not below 1`);
    if (byReason.singular) parts.push(`${byReason.singular} with a singular I − A`);
    const top = bySector.slice(0, 5).map((s) => `${s.sector} (${s.count})`);
    const f: Finding = {
      code: 'draws-rejected',
      severity: share >= 0.01 ? 'warning' : 'note',
      message:
        `${rejectedTotal} of ${p.draws} draws (${(100 * share).toPrecision(3)} %) broke productivity and were excluded: ${parts.join(', ')}. ` +
        `The percentiles describe the ${acceptedCount} accepted draws only` +
        (top.length ? `; columns most often at fault: ${top.join(', ')}` : '') +
        (share >= 0.05 ? '. So many exclusions bias the spread downwards: consider a smaller coefficient of variation for those columns.' : '.'),
      data: { rejected: rejectedTotal, draws: p.draws, share },
    };
    if (top.length) f.where = { sectors: bySector.slice(0, 5).map((s) => s.sector) };
    findings.push(f);
  }
  if (acceptedCount < 200) {
    findings.push({
      code: 'few-draws',
      severity: 'note',
      message: `only ${acceptedCount} accepted draws: the 5th and 95th percentiles are rough; 1000 or more draws give steadier tails`,
      data: { accepted: acceptedCount },
    });
  }
  return {
    about: UNCERTAINTY_ABOUT,
    errorModel: p.errorModel,
    seed: p.seed,
    productivity: p.rule,
    draws: p.draws,
    accepted: acceptedCount,
    rejected: { total: rejectedTotal, byReason, bySector, first },
    sectors: [...p.sectors],
    measures: p.measures.map((m) => (m.unit !== undefined ? { code: m.code, label: m.label, unit: m.unit } : { code: m.code, label: m.label })),
    multipliers,
    scenarios,
    samples: { rows: acceptedCount, cols: Q, data, draws },
    findings,
    cautions: [...UNCERTAINTY_CAUTIONS],
  };
}

/** A Monte Carlo run in this thread: `runDraws` over all draws, then `mergeDrawBlocks`. */
export function monteCarlo(spec: MonteCarloSpec, options: RunOptions = {}): MonteCarloResult {
  const p = prepareMonteCarlo(spec);
  return mergeDrawBlocks(p, [runDraws(p, 0, p.draws, options)]);
}

/** Which number of a draw: a measure's multiplier for a sector, or (with a scenario) its impact in a sector or its total. */
export interface QuantityRef {
  measure: string;
  /** A 0-based index or a sector code; absent with a scenario means the scenario's total. */
  sector?: number | string;
  scenario?: string;
}

/** The column of `result.samples` that holds a quantity. */
export function quantityIndex(result: Pick<MonteCarloResult, 'sectors' | 'measures' | 'scenarios'>, ref: QuantityRef): number {
  const n = result.sectors.length;
  const M = result.measures.length;
  const mi = result.measures.findIndex((m) => m.code === ref.measure);
  if (mi < 0) throw new InputError('unknown-measure', `there is no measure '${ref.measure}' in this run`, { text: ref.measure }, `The run has: ${result.measures.map((m) => m.code).join(', ')}`);
  let i = -1;
  if (ref.sector !== undefined) {
    i = typeof ref.sector === 'number' ? ref.sector : result.sectors.indexOf(ref.sector);
    if (!Number.isInteger(i) || i < 0 || i >= n) {
      throw new InputError('unknown-sector', `there is no sector ${typeof ref.sector === 'number' ? `index ${ref.sector}` : `'${ref.sector}'`} in this run (${n} sectors)`, { sector: String(ref.sector) });
    }
  }
  if (ref.scenario === undefined) {
    if (i < 0) throw new InputError('no-sector', `a multiplier of '${ref.measure}' needs a sector`);
    return mi * n + i;
  }
  const si = result.scenarios.findIndex((s) => s.scenario === ref.scenario);
  if (si < 0) throw new InputError('unknown-scenario', `there is no scenario '${ref.scenario}' in this run`, { text: ref.scenario });
  const o = M * n + (si * M + mi) * (n + 1);
  return i < 0 ? o + n : o + i;
}

/** The accepted draws of one quantity, in draw order (for distribution bins). */
export function sampleColumn(result: MonteCarloResult, ref: QuantityRef): Float64Array {
  const q = quantityIndex(result, ref);
  const { rows, cols, data } = result.samples;
  const out = new Float64Array(rows);
  for (let k = 0; k < rows; k++) out[k] = data[k * cols + q]!;
  return out;
}
