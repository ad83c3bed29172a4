/**
 * Leontief answers for large tables (multi-regional tables of thousands of sectors) without the
 * Leontief inverse: output multipliers i′L by one transposed solve (I − A)′ y = i, and one
 * scenario's output x = L d by one solve (I − A) x = d.
 *
 * The method is chosen by size, density and the contraction of A, and always reported:
 * - `direct` (n ≤ `directMax`, default 2500): LU of I − A with partial pivoting, built straight
 *   from Z and x into the kernel's memory (Z and the factor are the only n × n arrays).
 * - otherwise iterative on A = Z x̂⁻¹ known by its products: in CSR when fewer than
 *   `sparseBelow` (10%) of the cells are nonzero, else read from Z on the fly (no copy). The
 *   power series with its a-posteriori error bound when the bound predicts at most
 *   `seriesMaxPredicted` (150) terms, GMRES otherwise (and when the series misses its target).
 * Every answer carries the method, the storage, the products spent, the relative residual
 * reached ‖d − (I − A)x‖∞ / ‖d‖∞ and whether the target was met; a missed target throws
 * `ConvergenceError` (or, with `onFailure: 'report'`, returns the answer with a finding).
 *
 * What it means: the same numbers as the Leontief inverse would give (to the reported
 * residual), under the same cautions: fixed coefficients, no capacity limits, gross effects, not
 * a forecast.
 *
 * @example
 * const m = new LargeLeontief(table);
 * m.outputMultipliers().values; // i′L
 * m.impact(d);                  // { values: L d, method: 'gmres', iterations: 31, residual: 4e-13, ... }
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import type { IterativeMethod, IterativeResult, LinearOperator } from './linalg/iterative';
import { ConvergenceError, csrOperator, gmres, leontiefResidualOf, powerSeries, scaledFlowsOperator, transposed } from './linalg/iterative';
import { kernelFor } from './linalg/kernel';
import { LU } from './linalg/lu';
import type { Matrix } from './linalg/matrix';
import type { CSR } from './linalg/sparse';
import { SPARSE_BELOW, toCSR } from './linalg/sparse';
import type { Table } from './table';

export interface LargeOptions {
  /** 'auto' (default), or force one method. */
  method?: 'auto' | 'direct' | IterativeMethod;
  /** Target of the iterative solves (default 1e-12; see iterative.ts). */
  tolerance?: number;
  /** Most products A v per iterative solve (default 2000). */
  maxIterations?: number;
  /** Largest n solved directly under 'auto' (default 2500). */
  directMax?: number;
  /** Density below which A is stored as CSR (default 0.1). */
  sparseBelow?: number;
  /** Largest number of series terms the error bound may predict before GMRES is used (default 150). */
  seriesMaxPredicted?: number;
  /** GMRES restart length (default 40). */
  restart?: number;
  /** 'throw' (default) or 'report' a missed target. */
  onFailure?: 'throw' | 'report';
}

export type LargeMethod = 'direct' | IterativeMethod;

export interface LargeSolution {
  values: Float64Array;
  method: LargeMethod;
  /** 'dense-lu', 'sparse' (CSR), or 'scaled-flows' (A read from Z on the fly). */
  storage: string;
  /** Products with A spent (0 for the direct solve, which reports its residual by one product). */
  iterations: number;
  /** ‖d − (I − A)x‖∞ / ‖d‖∞ for the values returned. */
  residual: number;
  converged: boolean;
  /** The power series' bound on the largest absolute error, where it applies. */
  errorBound?: number;
  /** Why this method: size, density, contraction. */
  reason: string;
  /** Present when the target was missed. */
  finding?: Finding;
}

export const LARGE_ABOUT =
  'Output multipliers and scenario output for a large table, by solves with I − A instead of the Leontief inverse; each answer reports its method and residual.';

export class LargeLeontief {
  readonly n: number;
  /** Share of nonzero cells of Z. */
  readonly density: number;
  /** ‖A‖₁ (largest column sum of |A|). */
  readonly norm1: number;
  /** ‖A‖∞ (largest row sum of |A|). */
  readonly normInf: number;
  private readonly Z: Matrix;
  private readonly x: Float64Array;
  private readonly options: LargeOptions;
  private op?: LinearOperator;
  private csr?: CSR;
  private lu?: LU;
  private readonly flowsOp: LinearOperator;

  constructor(t: Pick<Table, 'Z' | 'x'>, options: LargeOptions = {}) {
    const n = t.x.length;
    if (t.Z.rows !== n || t.Z.cols !== n) throw new InputError('bad-size', `Z is ${t.Z.rows} × ${t.Z.cols} for ${n} outputs`);
    if (n === 0) throw new InputError('empty', 'the table has no sectors');
    const z = t.Z.data;
    const inv = invert(t.x);
    for (let j = 0; j < n; j++) {
      if (!Number.isFinite(t.x[j]!)) throw new InputError('non-finite', `total output of sector ${j + 1} is ${t.x[j]}`, { row: j + 1 });
    }
    // One pass over Z: finiteness, the count of nonzero cells, the norms of A = Z x̂⁻¹, and A
    // in CSR while it stays sparse enough to be worth it.
    const sparseBelow = options.sparseBelow ?? SPARSE_BELOW;
    const cap = Math.floor(sparseBelow * n * n);
    let recording = cap > 0;
    let colIdx: Int32Array = new Int32Array(recording ? Math.min(cap, 4 * n) : 0);
    let values: Float64Array = new Float64Array(colIdx.length);
    const rowPtr = new Int32Array(n + 1);
    let count = 0;
    let normInf = 0;
    const col = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const o = i * n;
      let row = 0;
      for (let j = 0; j < n; j++) {
        const v = z[o + j]!;
        if (v === 0) continue;
        if (!Number.isFinite(v)) {
          throw new InputError('non-finite', `intermediate flow (${i + 1}, ${j + 1}) is ${v}, not a finite number`, { row: i + 1, column: j + 1 });
        }
        const a = v * inv[j]!;
        if (recording) {
          if (count === colIdx.length) {
            if (count >= cap) {
              recording = false;
              colIdx = new Int32Array(0);
              values = new Float64Array(0);
            } else {
              const len = Math.min(cap, colIdx.length * 2);
              const ci = new Int32Array(len);
              ci.set(colIdx);
              colIdx = ci;
              const vv = new Float64Array(len);
              vv.set(values);
              values = vv;
            }
          }
          if (recording) {
            colIdx[count] = j;
            values[count] = a;
          }
        }
        count++;
        const abs = Math.abs(a);
        row += abs;
        col[j] = col[j]! + abs;
      }
      rowPtr[i + 1] = count;
      if (row > normInf) normInf = row;
    }
    if (recording && count < cap) {
      this.csr = { rows: n, cols: n, rowPtr, colIdx: colIdx.slice(0, count), values: values.slice(0, count) };
    }
    let norm1 = 0;
    for (let j = 0; j < n; j++) if (col[j]! > norm1) norm1 = col[j]!;
    this.n = n;
    this.Z = t.Z;
    this.x = t.x;
    this.options = options;
    this.density = count / (n * n);
    this.norm1 = norm1;
    this.normInf = normInf;
    this.flowsOp = withNorms(scaledFlowsOperator(t.Z, t.x), norm1, normInf);
  }

  /** The method the next solve uses, and why. */
  plan(): { method: LargeMethod; storage: string; reason: string } {
    const o = this.options;
    const directMax = o.directMax ?? 2500;
    const sparseBelow = o.sparseBelow ?? SPARSE_BELOW;
    const storage = this.density < sparseBelow ? 'sparse' : 'scaled-flows';
    const q = Math.min(this.norm1, this.normInf);
    const tol = o.tolerance ?? 1e-12;
    const predicted = q < 1 ? Math.ceil(Math.log((tol * (1 - q)) / Math.max(q, 1e-300)) / Math.log(q)) : Infinity;
    const dens = `${(100 * this.density).toFixed(1)}% nonzero`;
    if (o.method === 'direct' || (o.method === undefined || o.method === 'auto') && this.n <= directMax) {
      return { method: 'direct', storage: 'dense-lu', reason: `n = ${this.n}${o.method === 'direct' ? ' (direct asked)' : ` ≤ ${directMax}`}: LU of I − A` };
    }
    if (o.method === 'power-series' || o.method === 'gmres') {
      return { method: o.method, storage, reason: `${o.method} asked; n = ${this.n}, ${dens}` };
    }
    const maxPred = o.seriesMaxPredicted ?? 150;
    if (predicted <= maxPred) {
      return { method: 'power-series', storage, reason: `n = ${this.n} > ${directMax}, ${dens}; contraction ${q.toFixed(3)} bounds the series to about ${predicted} terms` };
    }
    return {
      method: 'gmres',
      storage,
      reason: `n = ${this.n} > ${directMax}, ${dens}; ${q < 1 ? `contraction ${q.toFixed(4)} would need about ${predicted} series terms` : 'no norm of A below 1 bounds the series'}`,
    };
  }

  private operator(storage: string): LinearOperator {
    if (!this.op) {
      this.op = storage === 'sparse' ? withNorms(csrOperator(this.csr ?? toCSR(this.Z, invert(this.x))), this.norm1, this.normInf) : this.flowsOp;
      this.csr = undefined;
    }
    return this.op;
  }

  private factor(): LU {
    if (!this.lu) {
      const n = this.n;
      // I − A straight from Z and x, in the kernel's memory when it has one.
      const kernel = kernelFor(n);
      // (A shared workspace is reused by the next call, so the factor cannot live there.)
      const ws = kernel.adopt ? undefined : kernel.workspace(n * n);
      const data = ws && !ws.shared ? ws.f64 : new Float64Array(n * n);
      if (ws?.shared) ws.release();
      const z = this.Z.data;
      const inv = invert(this.x);
      for (let i = 0; i < n; i++) {
        const o = i * n;
        for (let j = 0; j < n; j++) data[o + j] = -z[o + j]! * inv[j]!;
        data[o + i] = data[o + i]! + 1;
      }
      this.lu = new LU({ rows: n, cols: n, data }, { overwrite: true, kernel });
    }
    return this.lu;
  }

  private run(rhs: ArrayLike<number>, transpose: boolean): LargeSolution {
    const n = this.n;
    if (rhs.length !== n) throw new InputError('bad-size', `the vector has ${rhs.length} values for ${n} sectors`);
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(rhs[i]!)) throw new InputError('non-finite', `value ${i + 1} of the vector is ${rhs[i]}, not a finite number`, { row: i + 1 });
    }
    const plan = this.plan();
    const o = this.options;
    const onFailure = o.onFailure ?? 'throw';
    if (plan.method === 'direct') {
      const lu = this.factor();
      const values = transpose ? lu.solveTranspose(rhs) : lu.solve(rhs);
      const op = transpose ? transposed(this.flowsOp) : this.flowsOp;
      const residual = leontiefResidualOf(op, values, rhs);
      return { values, method: 'direct', storage: plan.storage, iterations: 0, residual, converged: Number.isFinite(residual), reason: plan.reason };
    }
    const base = this.operator(plan.storage);
    const op = transpose ? transposed(base) : base;
    const common = { tolerance: o.tolerance ?? 1e-12, maxIterations: o.maxIterations ?? 2000, restart: o.restart ?? 40 };
    let r: IterativeResult;
    let reason = plan.reason;
    if (plan.method === 'power-series') {
      r = powerSeries(op, rhs, { ...common, onFailure: 'report' });
      if (!r.converged && (o.method === undefined || o.method === 'auto')) {
        reason += `; the series missed its target after ${r.iterations} products (residual ${r.residual.toExponential(2)}), so GMRES took over`;
        const g = gmres(op, rhs, { ...common, onFailure: 'report', x0: r.x });
        g.iterations += r.iterations;
        r = g;
      }
    } else {
      r = gmres(op, rhs, { ...common, onFailure: 'report' });
    }
    const out: LargeSolution = {
      values: r.x,
      method: r.method,
      storage: plan.storage,
      iterations: r.iterations,
      residual: r.residual,
      converged: r.converged,
      reason,
    };
    if (r.errorBound !== undefined) out.errorBound = r.errorBound;
    if (r.finding) out.finding = r.finding;
    if (!r.converged && onFailure === 'throw') throw new ConvergenceError(r);
    return out;
  }

  /** Output multipliers i′L (column sums of the Leontief inverse), by one transposed solve. */
  outputMultipliers(): LargeSolution {
    return this.run(new Float64Array(this.n).fill(1), true);
  }

  /** The row vector c′L (multipliers of any per-unit measure c), by one transposed solve. */
  weighted(c: ArrayLike<number>): LargeSolution {
    return this.run(c, true);
  }

  /** Output x = L d for one scenario's final-demand change d. */
  impact(d: ArrayLike<number>): LargeSolution {
    return this.run(d, false);
  }

  /**
   * Output for several scenarios at once: D is n × k (one column per scenario). The direct
   * path solves all columns with one blocked solve; the iterative path solves them one by one.
   */
  impactMany(D: Matrix): LargeSolution[] {
    return this.many(D, false);
  }

  /** Row vectors c′L for several measures: C is n × k (one column per measure). */
  weightedMany(C: Matrix): LargeSolution[] {
    return this.many(C, true);
  }

  private many(B: Matrix, transpose: boolean): LargeSolution[] {
    const n = this.n;
    if (B.rows !== n) throw new InputError('bad-size', `the columns have ${B.rows} rows for ${n} sectors`);
    const k = B.cols;
    const plan = this.plan();
    if (plan.method !== 'direct' || k < 2) {
      const out: LargeSolution[] = [];
      for (let j = 0; j < k; j++) {
        const col = new Float64Array(n);
        for (let i = 0; i < n; i++) col[i] = B.data[i * k + j]!;
        out.push(this.run(col, transpose));
      }
      return out;
    }
    for (let q = 0; q < B.data.length; q++) {
      if (!Number.isFinite(B.data[q]!)) {
        const i = Math.floor(q / k);
        throw new InputError('non-finite', `row ${i + 1}, column ${(q % k) + 1} of the vectors is ${B.data[q]}, not a finite number`, { row: i + 1, column: (q % k) + 1 });
      }
    }
    const lu = this.factor();
    const X = transpose ? lu.solveTransposeMany(B) : lu.solveMany(B);
    const op = transpose ? transposed(this.flowsOp) : this.flowsOp;
    const out: LargeSolution[] = [];
    for (let j = 0; j < k; j++) {
      const values = new Float64Array(n);
      const rhs = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        values[i] = X.data[i * k + j]!;
        rhs[i] = B.data[i * k + j]!;
      }
      const residual = leontiefResidualOf(op, values, rhs);
      out.push({ values, method: 'direct', storage: plan.storage, iterations: 0, residual, converged: Number.isFinite(residual), reason: plan.reason });
    }
    return out;
  }
}

/** The operator with its norms known already (they cost a pass over the matrix). */
function withNorms(op: LinearOperator, one: number, inf: number): LinearOperator {
  return { n: op.n, storage: op.storage, apply: op.apply, applyTranspose: op.applyTranspose, norms: () => ({ one, inf }) };
}

function invert(x: ArrayLike<number>): Float64Array {
  const inv = new Float64Array(x.length);
  for (let j = 0; j < x.length; j++) inv[j] = x[j]! > 0 ? 1 / x[j]! : 0;
  return inv;
}

/** Output multipliers of a large table (see `LargeLeontief`). */
export function largeOutputMultipliers(t: Pick<Table, 'Z' | 'x'>, options: LargeOptions = {}): LargeSolution {
  return new LargeLeontief(t, options).outputMultipliers();
}

/** One scenario's output x = L d for a large table (see `LargeLeontief`). */
export function largeImpact(t: Pick<Table, 'Z' | 'x'>, d: ArrayLike<number>, options: LargeOptions = {}): LargeSolution {
  return new LargeLeontief(t, options).impact(d);
}
