/**
 * Exact fast what-if: change one coefficient, one row or one column of A (a new technology in
 * sector j) and read the updated outputs and multipliers without refactoring I − A.
 *
 * Method (Woodbury's identity; Sherman–Morrison for one term). Every edit is kept as part of a
 * low-rank correction A′ = A + Σₖ uₖ vₖ′, so M′ = I − A′ = M − U V′ with M = I − A, and
 *   M′⁻¹ = M⁻¹ + W K⁻¹ Y′,  W = M⁻¹U,  Y′ = V′M⁻¹,  K = I − V′W  (r × r).
 * A column edit of sector j is one term (uₖ = the change of column j, vₖ = eⱼ), a row edit of
 * sector i is one term (uₖ = eᵢ, vₖ = the change of row i), and a single coefficient joins the
 * term of its column (or of its row) when one exists, so the rank r counts the distinct
 * columns and rows edited. Each new or changed term costs one solve and one transposed solve
 * with the base factors, O(n²); each answer costs one base solve plus O(n r + r³). Every
 * answer is recomputed from the base factors and the current terms (nothing is updated on
 * top of an earlier update), so a long sequence of edits stays exact. When the rank would pass
 * `maxRank`, or K becomes ill-conditioned, the model is refactored once from the current
 * coefficients and the correction starts again from zero.
 *
 * Indices are 0-based: row i is the supplying sector, column j the buying sector.
 *
 * @example
 * const w = new WhatIf(model);
 * w.setCoefficient(2, 5, 0.12).outputMultipliers(); // i′(I − A′)⁻¹ without a new factorisation
 */
import { InputError } from './errors';
import { LeontiefModel } from './leontief';
import { conditionEstimate } from './linalg/condition';
import { LU } from './linalg/lu';
import type { Matrix } from './linalg/matrix';
import { matrix } from './linalg/matrix';
import { checkCell, checkIndex } from './sensitivity';

/** What a what-if result is about, in one line. */
export const WHATIF_ABOUT =
  'Outputs and multipliers after a change to the technical coefficients (one cell, a row, or a new technology in a column), all else held fixed.';

export interface WhatIfOptions {
  /** Refactor when the low-rank correction would grow past this many terms (default min(32, max(1, ⌊n/4⌋))). */
  maxRank?: number;
}

interface Term {
  kind: 'row' | 'col';
  /** The sector of the row or column. */
  at: number;
  u: Float64Array;
  v: Float64Array;
  /** M⁻¹u. */
  w: Float64Array;
  /** M⁻′v (so that y′ = v′M⁻¹). */
  y: Float64Array;
  /** Σ w (for the output multipliers). */
  wSum: number;
}

/** Condition estimates of K above this trigger a refactor instead of a Woodbury answer. */
const K_CONDITION_LIMIT = 1e10;

export class WhatIf {
  readonly n: number;
  readonly maxRank: number;
  /** The model this what-if started from (what `reset` returns to). */
  readonly origin: LeontiefModel;
  private base: LeontiefModel;
  private baseMultipliers: Float64Array;
  private readonly current: Float64Array;
  private terms: Term[] = [];
  private kLU: LU | null = null;
  private kDirty = false;
  private refactored = 0;

  constructor(model: LeontiefModel, options: WhatIfOptions = {}) {
    this.n = model.n;
    const mr = options.maxRank ?? Math.min(32, Math.max(1, Math.floor(model.n / 4)));
    if (!Number.isInteger(mr) || mr < 0) {
      throw new InputError('bad-option', `maxRank must be a whole number of 0 or more; got ${mr}`, { text: String(mr) });
    }
    this.maxRank = mr;
    this.origin = model;
    this.base = model;
    this.baseMultipliers = model.outputMultipliers();
    this.current = model.A.data.slice();
  }

  /** The number of low-rank terms now held (distinct rows and columns edited since the last factorisation). */
  get rank(): number {
    return this.terms.length;
  }

  /** How many times the edits forced a new factorisation. */
  get refactorCount(): number {
    return this.refactored;
  }

  /** The current value of aᵢⱼ. */
  coefficient(i: number, j: number): number {
    checkCell(i, j, this.n);
    return this.current[i * this.n + j]!;
  }

  /** A copy of the current coefficients A′. */
  coefficients(): Matrix {
    return matrix(this.n, this.n, this.current.slice());
  }

  /** Column sums of the current coefficients (a sum of 1 or more means the table is not productive). */
  columnSums(): Float64Array {
    const n = this.n;
    const s = new Float64Array(n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s[j] += this.current[i * n + j]!;
    return s;
  }

  /** Set aᵢⱼ to a new value. */
  setCoefficient(i: number, j: number, value: number): this {
    checkCell(i, j, this.n);
    finite(value, `the new value of coefficient (row ${i + 1}, column ${j + 1})`);
    return this.addToCoefficient(i, j, value - this.current[i * this.n + j]!);
  }

  /** Change aᵢⱼ by δ. */
  addToCoefficient(i: number, j: number, delta: number): this {
    const n = this.n;
    checkCell(i, j, n);
    finite(delta, `the change to coefficient (row ${i + 1}, column ${j + 1})`);
    if (delta === 0) return this;
    this.current[i * n + j]! += delta;
    const col = this.terms.find((t) => t.kind === 'col' && t.at === j);
    if (col) {
      col.u[i]! += delta;
      this.refreshU(col);
      return this;
    }
    const row = this.terms.find((t) => t.kind === 'row' && t.at === i);
    if (row) {
      row.v[j]! += delta;
      this.refreshV(row);
      return this;
    }
    const u = new Float64Array(n);
    u[i] = delta;
    const v = new Float64Array(n);
    v[j] = 1;
    this.addTerm('col', j, u, v);
    return this;
  }

  /** Replace column j (the inputs of sector j per unit of its output: a new technology). */
  setColumn(j: number, values: ArrayLike<number>): this {
    const n = this.n;
    checkIndex(j, n, 'column');
    vector(values, n, `the new column ${j + 1}`);
    const du = new Float64Array(n);
    let any = false;
    for (let i = 0; i < n; i++) {
      du[i] = values[i]! - this.current[i * n + j]!;
      if (du[i] !== 0) any = true;
      this.current[i * n + j] = values[i]!;
    }
    if (!any) return this;
    const col = this.terms.find((t) => t.kind === 'col' && t.at === j);
    if (col) {
      for (let i = 0; i < n; i++) col.u[i]! += du[i]!;
      this.refreshU(col);
      return this;
    }
    const v = new Float64Array(n);
    v[j] = 1;
    this.addTerm('col', j, du, v);
    return this;
  }

  /** Replace row i (what every sector buys from sector i per unit of its output). */
  setRow(i: number, values: ArrayLike<number>): this {
    const n = this.n;
    checkIndex(i, n, 'row');
    vector(values, n, `the new row ${i + 1}`);
    const dv = new Float64Array(n);
    let any = false;
    for (let j = 0; j < n; j++) {
      dv[j] = values[j]! - this.current[i * n + j]!;
      if (dv[j] !== 0) any = true;
      this.current[i * n + j] = values[j]!;
    }
    if (!any) return this;
    const row = this.terms.find((t) => t.kind === 'row' && t.at === i);
    if (row) {
      for (let j = 0; j < n; j++) row.v[j]! += dv[j]!;
      this.refreshV(row);
      return this;
    }
    const u = new Float64Array(n);
    u[i] = 1;
    this.addTerm('row', i, u, dv);
    return this;
  }

  /** Undo every edit: back to the model this what-if was built from. */
  reset(): this {
    if (this.base !== this.origin) {
      this.base = this.origin;
      this.baseMultipliers = this.origin.outputMultipliers();
    }
    this.current.set(this.origin.A.data);
    this.terms = [];
    this.kLU = null;
    this.kDirty = false;
    return this;
  }

  /** Output x = (I − A′)⁻¹ d. */
  solve(d: ArrayLike<number>): Float64Array {
    vector(d, this.n, 'the demand vector');
    const K = this.capacitance();
    const x = this.base.solve(d);
    if (!K) return x;
    const r = this.terms.length;
    const t = new Float64Array(r);
    for (let k = 0; k < r; k++) t[k] = dot(this.terms[k]!.v, x);
    const s = K.solve(t);
    for (let k = 0; k < r; k++) axpy(s[k]!, this.terms[k]!.w, x);
    return x;
  }

  /** The row vector c′(I − A′)⁻¹ (multipliers of the measure with coefficient row c). */
  weighted(c: ArrayLike<number>): Float64Array {
    vector(c, this.n, 'the measure coefficients');
    const K = this.capacitance();
    const z = this.base.weighted(c);
    if (!K) return z;
    const r = this.terms.length;
    const t = new Float64Array(r);
    for (let k = 0; k < r; k++) t[k] = dot(c, this.terms[k]!.w);
    const q = K.solveTranspose(t);
    for (let k = 0; k < r; k++) axpy(q[k]!, this.terms[k]!.y, z);
    return z;
  }

  /** Output multipliers i′(I − A′)⁻¹: O(n r + r³) from the kept base multipliers. */
  outputMultipliers(): Float64Array {
    const K = this.capacitance();
    const z = this.baseMultipliers.slice();
    if (!K) return z;
    const r = this.terms.length;
    const t = new Float64Array(r);
    for (let k = 0; k < r; k++) t[k] = this.terms[k]!.wSum;
    const q = K.solveTranspose(t);
    for (let k = 0; k < r; k++) axpy(q[k]!, this.terms[k]!.y, z);
    return z;
  }

  /** A new, fully factored model of the current coefficients (the independent recompute). */
  model(): LeontiefModel {
    return new LeontiefModel(this.coefficients());
  }

  private addTerm(kind: 'row' | 'col', at: number, u: Float64Array, v: Float64Array): void {
    if (this.terms.length >= this.maxRank) {
      this.refactor();
      return;
    }
    const t: Term = { kind, at, u, v, w: new Float64Array(0), y: new Float64Array(0), wSum: 0 };
    this.terms.push(t);
    this.refreshU(t);
    t.y = this.base.weighted(v);
  }

  private refreshU(t: Term): void {
    t.w = this.base.solve(t.u);
    let s = 0;
    for (let i = 0; i < t.w.length; i++) s += t.w[i]!;
    t.wSum = s;
    this.kDirty = true;
  }

  private refreshV(t: Term): void {
    t.y = this.base.weighted(t.v);
    this.kDirty = true;
  }

  private refactor(): void {
    this.base = new LeontiefModel(this.coefficients());
    this.baseMultipliers = this.base.outputMultipliers();
    this.terms = [];
    this.kLU = null;
    this.kDirty = false;
    this.refactored++;
  }

  /** The factored K = I − V′W, or null when there are no terms. Refactors when K is unusable. */
  private capacitance(): LU | null {
    if (this.terms.length === 0) return null;
    if (!this.kDirty && this.kLU) return this.kLU;
    const r = this.terms.length;
    const K = new Float64Array(r * r);
    for (let a = 0; a < r; a++) {
      const va = this.terms[a]!.v;
      for (let b = 0; b < r; b++) K[a * r + b] = (a === b ? 1 : 0) - dot(va, this.terms[b]!.w);
    }
    const lu = new LU({ rows: r, cols: r, data: K }, { overwrite: true });
    if (lu.isSingular || !(conditionEstimate(lu) < K_CONDITION_LIMIT)) {
      // Near a singular update the correction loses accuracy: factor the current table instead.
      // If that table is itself singular, its solves report it (SingularMatrixError).
      this.refactor();
      return null;
    }
    this.kLU = lu;
    this.kDirty = false;
    return lu;
  }
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}

function axpy(alpha: number, x: Float64Array, y: Float64Array): void {
  if (alpha === 0) return;
  for (let i = 0; i < y.length; i++) y[i]! += alpha * x[i]!;
}

function finite(v: number, what: string): void {
  if (!Number.isFinite(v)) throw new InputError('non-finite', `${what} is ${v}, not a finite number`, { text: String(v) });
}

function vector(v: ArrayLike<number>, n: number, what: string): void {
  if (!v || v.length !== n) {
    throw new InputError('bad-size', `${what} has ${v ? v.length : 0} values; the model has ${n} sectors`, {}, `Give one value per sector (${n})`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(v[i]!)) throw new InputError('non-finite', `${what}: value ${i + 1} is ${v[i]}, not a finite number`, { column: i + 1 });
  }
}
