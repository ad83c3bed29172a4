/**
 * Analytic sensitivity of the Leontief model to its technical coefficients.
 *
 * A result here is always r = c′ L d, for a coefficient row c of a measure (c = 1 for output)
 * and a column d:
 * - the multiplier of that measure for sector j is r = (c′L)ⱼ, that is d = eⱼ;
 * - a scenario's total impact on that measure is r = c′ L d for its demand vector d.
 *
 * Formulas (common practice; e.g. Miller & Blair, Input-Output Analysis, 2009, on the
 * sensitivity of the inverse, from memory):
 * - ∂L/∂aᵢⱼ = L eᵢ eⱼ′ L: column i of L times row j of L.
 * - ∂r/∂aᵢⱼ = (c′L)ᵢ (L d)ⱼ: the weights u′ = c′L (one transposed solve) times the output
 *   v = L d (one solve). Every derivative and elasticity εᵢⱼ = aᵢⱼ uᵢ vⱼ / r then costs O(1), so
 *   the whole ranking is O(n²) after one factorisation.
 * - Exact change (Sherman–Morrison): with aᵢⱼ → aᵢⱼ + δ, L′ = L + δ L eᵢ eⱼ′ L / (1 − δ Lⱼᵢ), so
 *   r(δ) = r + δ uᵢ vⱼ / (1 − δ Lⱼᵢ). The tolerable limit of aᵢⱼ for p % is the δ with
 *   |r(δ) − r| = p % of |r|: δ = T / (uᵢvⱼ + T Lⱼᵢ) for T = ±p|r|/100. A change is admissible while
 *   1 − δ Lⱼᵢ > 0 (the path from the table to the changed table crosses no singular I − A; for a
 *   nonnegative productive A this is exactly "stays productive") and the coefficient keeps its
 *   sign (a nonnegative coefficient stays at or above zero). When no admissible finite change
 *   moves the result that far, the limit is 'none'.
 */
import { InputError } from './errors';
import type { LeontiefModel } from './leontief';
import type { Matrix } from './linalg/matrix';
import { zeros } from './linalg/matrix';

/** What a sensitivity analysis is about, in one line. */
export const SENSITIVITY_ABOUT =
  'How much a chosen multiplier or impact moves when one technical coefficient changes, all others held fixed.';

/** Cautions that travel with every sensitivity result shown to a reader. */
export const SENSITIVITY_CAUTIONS = [
  'Each coefficient is changed alone, with all others held fixed; real revisions move many coefficients together.',
  'The model keeps fixed coefficients and has no capacity limits; results are gross effects, not net, and not a forecast.',
  'Derivatives and elasticities are local (small changes); the tolerable limits and what-if values are exact for a change to one coefficient.',
  'Have the results reviewed by a qualified economist and follow local guidance before using them in a decision.',
];

/**
 * The result to study: a multiplier of a measure for one sector, or a scenario's total impact
 * on a measure. `c` is the measure's coefficient row per unit of output (absent: output, c = 1).
 */
export type ResultTarget =
  | { kind: 'multiplier'; sector: number; c?: ArrayLike<number>; label?: string }
  | { kind: 'impact'; d: ArrayLike<number>; c?: ArrayLike<number>; label?: string };

/** A target resolved on a model: r = c′Ld with u = c′L and v = Ld. */
export interface ResolvedTarget {
  /** r = c′ L d. */
  value: number;
  /** u′ = c′L (one transposed solve). */
  weights: Float64Array;
  /** v = L d (one solve). */
  output: Float64Array;
}

export interface Sensitivity extends ResolvedTarget {
  about: string;
  /** ∂r/∂aᵢⱼ = uᵢ vⱼ, n × n (row i supplies, column j buys). */
  derivatives: Matrix;
  /** aᵢⱼ uᵢ vⱼ / r, n × n: the % change of r for a 1 % change of aᵢⱼ. Null when r = 0. */
  elasticities: Matrix | null;
}

/** A cell of A, 0-based: row i (the supplying sector), column j (the buying sector). */
export interface Cell {
  row: number;
  col: number;
}

/** A change to one coefficient that moves the result by exactly the chosen percentage. */
export interface LimitChange {
  /** δ, the change to aᵢⱼ. */
  change: number;
  /** aᵢⱼ + δ. */
  coefficient: number;
  /** δ / |aᵢⱼ|; null when aᵢⱼ = 0. */
  relative: number | null;
  /** The result after the change, r(δ) = r ± p % of |r|. */
  result: number;
}

export interface TolerableLimit extends Cell {
  coefficient: number;
  percent: number;
  /** The smallest increase of aᵢⱼ that moves the result by `percent` %, or 'none'. */
  up: LimitChange | 'none';
  /** The smallest decrease of aᵢⱼ that moves the result by `percent` %, or 'none'. */
  down: LimitChange | 'none';
}

export interface Influence extends Cell {
  coefficient: number;
  /** ∂r/∂aᵢⱼ. */
  derivative: number;
  /** aᵢⱼ ∂r/∂aᵢⱼ / r; null when r = 0. */
  elasticity: number | null;
  /** Present when `percent` was given. */
  limit?: TolerableLimit;
}

export interface Ranking {
  about: string;
  value: number;
  by: 'elasticity' | 'derivative';
  /** The most influential coefficients, largest |score| first (ties: lower row, then column). */
  entries: Influence[];
}

function checkVector(v: ArrayLike<number>, n: number, what: string): void {
  if (v.length !== n) {
    throw new InputError('bad-size', `${what} has ${v.length} values; the model has ${n} sectors`, {}, `Give one value per sector (${n})`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(v[i]!)) {
      throw new InputError('non-finite', `${what}: value ${i + 1} is ${v[i]}, not a finite number`, { column: i + 1 });
    }
  }
}

/** Check a 0-based sector index. */
export function checkIndex(k: number, n: number, what: string): void {
  if (!Number.isInteger(k) || k < 0 || k >= n) {
    throw new InputError(
      'index-out-of-range',
      `${what} index ${k} is out of range: the model has ${n} sectors, indexed 0 to ${n - 1}`,
      Number.isInteger(k) ? { row: k + 1 } : { text: String(k) },
      'Use a 0-based sector index, or look the code up with sectorIndex',
    );
  }
}

/** Check a 0-based coefficient cell (row i, column j). */
export function checkCell(i: number, j: number, n: number): void {
  checkIndex(i, n, 'coefficient row');
  checkIndex(j, n, 'coefficient column');
}

/** u = c′L, v = Ld and r = c′Ld for a target: one transposed solve and one solve. */
export function resolveTarget(model: LeontiefModel, target: ResultTarget): ResolvedTarget {
  const n = model.n;
  let c: ArrayLike<number>;
  if (target.c === undefined) c = new Float64Array(n).fill(1);
  else {
    checkVector(target.c, n, 'the measure coefficients c');
    c = target.c;
  }
  let d: Float64Array;
  if (target.kind === 'multiplier') {
    checkIndex(target.sector, n, 'multiplier sector');
    d = new Float64Array(n);
    d[target.sector] = 1;
  } else if (target.kind === 'impact') {
    checkVector(target.d, n, 'the demand vector d');
    d = Float64Array.from(target.d);
  } else {
    throw new InputError('bad-target', `unknown result kind '${(target as { kind: unknown }).kind}'`, {}, "Use kind 'multiplier' or 'impact'");
  }
  const weights = model.weighted(c);
  const output = model.solve(d);
  let value = 0;
  for (let i = 0; i < n; i++) value += c[i]! * output[i]!;
  return { value, weights, output };
}

/**
 * ∂L/∂aᵢⱼ = L eᵢ eⱼ′ L (n × n): one solve for column i of L, one transposed solve for row j.
 *
 * @example leontiefDerivative(model, 0, 1) // how every element of L moves per unit of a₀₁
 */
export function leontiefDerivative(model: LeontiefModel, i: number, j: number): Matrix {
  const n = model.n;
  checkCell(i, j, n);
  const ei = new Float64Array(n);
  ei[i] = 1;
  const ej = new Float64Array(n);
  ej[j] = 1;
  const col = model.solve(ei);
  const row = model.weighted(ej);
  const out = zeros(n, n);
  for (let r = 0; r < n; r++) {
    const a = col[r]!;
    const o = r * n;
    for (let s = 0; s < n; s++) out.data[o + s] = a * row[s]!;
  }
  return out;
}

/** The derivative and elasticity of a result to every coefficient, as two n × n matrices. */
export function sensitivity(model: LeontiefModel, target: ResultTarget): Sensitivity {
  const t = resolveTarget(model, target);
  const n = model.n;
  const A = model.A.data;
  const derivatives = zeros(n, n);
  const elasticities = t.value !== 0 ? zeros(n, n) : null;
  for (let i = 0; i < n; i++) {
    const ui = t.weights[i]!;
    const o = i * n;
    for (let j = 0; j < n; j++) {
      const g = ui * t.output[j]!;
      derivatives.data[o + j] = g;
      if (elasticities) elasticities.data[o + j] = (A[o + j]! * g) / t.value;
    }
  }
  return { about: SENSITIVITY_ABOUT, ...t, derivatives, elasticities };
}

/**
 * Entries Lⱼᵢ of L for a list of cells (i, j), without forming L: one solve per distinct column
 * i, or one transposed solve per distinct row j, whichever is fewer (or read from L when the
 * model has formed it).
 */
export function inverseEntries(model: LeontiefModel, cells: readonly Cell[]): Float64Array {
  const n = model.n;
  const out = new Float64Array(cells.length);
  for (const c of cells) checkCell(c.row, c.col, n);
  if (model.hasInverse) {
    const L = model.inverse().data;
    cells.forEach((c, k) => (out[k] = L[c.col * n + c.row]!));
    return out;
  }
  const byI = new Set(cells.map((c) => c.row));
  const byJ = new Set(cells.map((c) => c.col));
  const e = new Float64Array(n);
  if (byI.size <= byJ.size) {
    const cols = new Map<number, Float64Array>();
    for (const i of byI) {
      e.fill(0);
      e[i] = 1;
      cols.set(i, model.solve(e)); // column i of L
    }
    cells.forEach((c, k) => (out[k] = cols.get(c.row)![c.col]!));
  } else {
    const rows = new Map<number, Float64Array>();
    for (const j of byJ) {
      e.fill(0);
      e[j] = 1;
      rows.set(j, model.weighted(e)); // row j of L
    }
    cells.forEach((c, k) => (out[k] = rows.get(c.col)![c.row]!));
  }
  return out;
}

function checkPercent(percent: number): void {
  if (!Number.isFinite(percent) || percent <= 0) {
    throw new InputError('bad-percent', `the percentage must be a positive number; got ${percent}`, { text: String(percent) }, 'Give, for example, 1 for 1 %');
  }
}

function zeroResult(what: string): InputError {
  return new InputError(
    'zero-result',
    `the result is 0, so ${what} (a relative change of it) is undefined`,
    {},
    'Choose a measure and sector or scenario with a nonzero result, or rank by derivative',
  );
}

/**
 * The exact change of the result when aᵢⱼ changes by δ (Sherman–Morrison):
 * r(δ) − r = δ s / (1 − δ g), with s = uᵢvⱼ and g = Lⱼᵢ. 'none' when 1 − δg ≤ 0 (the changed
 * I − A is singular or past singular on the way from the table).
 */
export function exactChange(s: number, g: number, delta: number): number | 'none' {
  const den = 1 - delta * g;
  if (!(den > 0)) return 'none';
  return (delta * s) / den;
}

/** The tolerable limit of one coefficient, from s = uᵢvⱼ, g = Lⱼᵢ, a = aᵢⱼ and the result r. */
export function limitFor(cell: Cell, a: number, s: number, g: number, r: number, percent: number): TolerableLimit {
  const p = (percent / 100) * Math.abs(r);
  const one = (dir: 1 | -1): LimitChange | 'none' => {
    if (s === 0 || p === 0) return 'none';
    const T = dir * Math.sign(s) * p; // the result moves by T
    const den = s + T * g;
    if (den === 0) return 'none';
    const delta = T / den;
    if (!Number.isFinite(delta) || Math.sign(delta) !== dir) return 'none';
    if (!(1 - delta * g > 0)) return 'none';
    const next = a + delta;
    if ((a >= 0 && next < 0) || (a < 0 && next > 0)) return 'none';
    return { change: delta, coefficient: next, relative: a !== 0 ? delta / Math.abs(a) : null, result: r + T };
  };
  return { row: cell.row, col: cell.col, coefficient: a, percent, up: one(1), down: one(-1) };
}

/**
 * Tolerable limits of coefficients for one result: for each cell, the smallest increase and the
 * smallest decrease of aᵢⱼ that move the result by `percent` %, exact by Sherman–Morrison.
 * With `cells`, the cost is one factorisation (already made) plus a few solves; without, every
 * cell of A is treated and L is formed (O(n³)).
 */
export function tolerableLimits(
  model: LeontiefModel,
  target: ResultTarget,
  options: { percent: number; cells?: readonly Cell[] },
): TolerableLimit[] {
  checkPercent(options.percent);
  const n = model.n;
  const t = resolveTarget(model, target);
  if (t.value === 0) throw zeroResult('a percentage limit');
  let cells: readonly Cell[];
  if (options.cells) cells = options.cells;
  else {
    model.inverse();
    const all: Cell[] = [];
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) all.push({ row: i, col: j });
    cells = all;
  }
  const g = inverseEntries(model, cells);
  const A = model.A.data;
  return cells.map((c, k) =>
    limitFor(c, A[c.row * n + c.col]!, t.weights[c.row]! * t.output[c.col]!, g[k]!, t.value, options.percent),
  );
}

/**
 * The most influential coefficients for one result, in O(n² log k) after the factorisation:
 * one transposed solve, one solve, then a scan of every cell with a heap of the k best.
 * `by: 'elasticity'` (default) ranks by |aᵢⱼ uᵢ vⱼ / r|, `'derivative'` by |uᵢ vⱼ| (which also
 * ranks cells that are zero today). With `percent`, each entry carries its tolerable limit
 * (a few more solves, for the k entries only).
 */
export function influentialCoefficients(
  model: LeontiefModel,
  target: ResultTarget,
  options: { top?: number; by?: 'elasticity' | 'derivative'; percent?: number } = {},
): Ranking {
  const n = model.n;
  const top = options.top ?? 10;
  const by = options.by ?? 'elasticity';
  if (!Number.isInteger(top) || top < 1) {
    throw new InputError('bad-top', `the number of coefficients to rank must be a whole number of at least 1; got ${top}`, { text: String(top) });
  }
  if (by !== 'elasticity' && by !== 'derivative') {
    throw new InputError('bad-option', `rank by 'elasticity' or 'derivative'; got '${String(by)}'`, { text: String(by) });
  }
  if (options.percent !== undefined) checkPercent(options.percent);
  const t = resolveTarget(model, target);
  if (by === 'elasticity' && t.value === 0) throw zeroResult('an elasticity');
  if (options.percent !== undefined && t.value === 0) throw zeroResult('a percentage limit');
  const A = model.A.data;
  const k = Math.min(top, n * n);
  const heap = new TopK(k);
  const u = t.weights;
  const v = t.output;
  for (let i = 0; i < n; i++) {
    const ui = u[i]!;
    const o = i * n;
    for (let j = 0; j < n; j++) {
      const g = ui * v[j]!;
      const score = Math.abs(by === 'elasticity' ? A[o + j]! * g : g);
      heap.offer(score, o + j);
    }
  }
  const idx = heap.sorted();
  const entries: Influence[] = idx.map((cell) => {
    const row = Math.floor(cell / n);
    const col = cell % n;
    const a = A[cell]!;
    const derivative = u[row]! * v[col]!;
    return { row, col, coefficient: a, derivative, elasticity: t.value !== 0 ? (a * derivative) / t.value : null };
  });
  if (options.percent !== undefined) {
    const g = inverseEntries(model, entries);
    entries.forEach((e, q) => (e.limit = limitFor(e, e.coefficient, e.derivative, g[q]!, t.value, options.percent!)));
  }
  return { about: SENSITIVITY_ABOUT, value: t.value, by, entries };
}

/**
 * A bounded min-heap keeping the k largest scores; ties go to the smaller index, so that the
 * ranking is deterministic.
 */
class TopK {
  private readonly score: Float64Array;
  private readonly index: Int32Array;
  private size = 0;
  constructor(private readonly k: number) {
    this.score = new Float64Array(k);
    this.index = new Int32Array(k);
  }

  /** True when (s1, i1) ranks below (s2, i2). */
  private below(s1: number, i1: number, s2: number, i2: number): boolean {
    return s1 < s2 || (s1 === s2 && i1 > i2);
  }

  offer(s: number, i: number): void {
    const { score, index } = this;
    if (this.size < this.k) {
      let c = this.size++;
      while (c > 0) {
        const p = (c - 1) >> 1;
        if (!this.below(s, i, score[p]!, index[p]!)) break;
        score[c] = score[p]!;
        index[c] = index[p]!;
        c = p;
      }
      score[c] = s;
      index[c] = i;
      return;
    }
    if (!this.below(score[0]!, index[0]!, s, i)) return;
    let c = 0;
    const m = this.size;
    for (;;) {
      const l = 2 * c + 1;
      if (l >= m) break;
      let b = l;
      const r = l + 1;
      if (r < m && this.below(score[r]!, index[r]!, score[l]!, index[l]!)) b = r;
      if (!this.below(score[b]!, index[b]!, s, i)) break;
      score[c] = score[b]!;
      index[c] = index[b]!;
      c = b;
    }
    score[c] = s;
    index[c] = i;
  }

  /** Indices, best first. */
  sorted(): number[] {
    const items: [number, number][] = [];
    for (let q = 0; q < this.size; q++) items.push([this.score[q]!, this.index[q]!]);
    items.sort((a, b) => b[0] - a[0] || a[1] - b[1]);
    return items.map((x) => x[1]);
  }
}
