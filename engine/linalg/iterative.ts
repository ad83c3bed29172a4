/**
 * Iterative solves of the Leontief system (I − A) x = d for tables too large to factor, where A
 * is reached only through products A v and A′ v (dense, sparse CSR, or Z x̂⁻¹ without forming
 * A). Two methods:
 *
 * - `powerSeries`: x = Σₖ Aᵏ d = d + A d + A² d + …, the classic round-by-round expansion. When
 *   a norm of A is below 1 (q = max column sum ‖A‖₁ or max row sum ‖A‖∞ of |A|), the
 *   a-posteriori bound ‖x* − xₖ‖ ≤ q / (1 − q) · ‖xₖ − xₖ₋₁‖ holds in that norm, and the series
 *   stops when the bound falls below the tolerance relative to ‖xₖ‖∞ (source: the Banach
 *   fixed-point theorem's a-posteriori estimate; common practice for the Leontief series).
 *   It converges like ρ(A)ᵏ: slowly when the Perron root is near 1.
 * - `gmres`: restarted GMRES(m) with modified Gram–Schmidt and Givens rotations (source: Saad
 *   & Schultz, SIAM J. Sci. Stat. Comput. 7 (1986)); it stops when ‖d − (I − A)x‖₂ ≤ tol ‖d‖₂.
 *
 * Every result reports the method, the products spent (`iterations`), the relative residual
 * reached ‖d − (I − A)x‖∞ / ‖d‖∞ (computed afresh at the end), and whether the target was met.
 * A solve that misses it throws `ConvergenceError` (or, with `onFailure: 'report'`, returns the
 * result with `converged: false` and a finding): never a silent wrong answer.
 *
 * @example
 * const op = denseOperator(fromRows([[0.2, 0.3], [0.1, 0.4]]));
 * powerSeries(op, Float64Array.of(1, 1)).x; // ≈ (I − A)⁻¹ [1, 1]
 */
import { InputError } from '../errors';
import type { Finding } from '../findings';
import type { Matrix } from './matrix';
import type { CSR } from './sparse';
import { csrMatVec, csrTranspose } from './sparse';

/** A square matrix known by its products. */
export interface LinearOperator {
  readonly n: number;
  /** out ← A v. */
  apply(v: Float64Array, out: Float64Array): void;
  /** out ← A′ v. */
  applyTranspose(v: Float64Array, out: Float64Array): void;
  /** ‖A‖₁ and ‖A‖∞ (largest absolute column and row sums), for the series' error bound. */
  norms(): { one: number; inf: number };
  /** What stores A, for reports: 'dense', 'sparse' or 'scaled-flows'. */
  readonly storage: string;
}

export function denseOperator(a: Matrix): LinearOperator {
  const n = a.rows;
  if (a.cols !== n) throw new InputError('not-square', `an operator needs a square matrix; got ${a.rows} × ${a.cols}`);
  const d = a.data;
  return {
    n,
    storage: 'dense',
    apply: (v, out) => denseTimes(d, n, v, out),
    applyTranspose: (v, out) => denseTransposeTimes(d, n, v, out),
    norms: () => denseNorms(n, d, null),
  };
}

/** out ← M v for a row-major n × n M, two rows at a time (each v[j] loaded once per pair). */
function denseTimes(d: Float64Array, n: number, v: Float64Array, out: Float64Array): void {
  let i = 0;
  for (; i + 1 < n; i += 2) {
    const o0 = i * n;
    const o1 = o0 + n;
    let s0 = 0;
    let s1 = 0;
    for (let j = 0; j < n; j++) {
      const vj = v[j]!;
      s0 += d[o0 + j]! * vj;
      s1 += d[o1 + j]! * vj;
    }
    out[i] = s0;
    out[i + 1] = s1;
  }
  if (i < n) {
    const o = i * n;
    let s = 0;
    for (let j = 0; j < n; j++) s += d[o + j]! * v[j]!;
    out[i] = s;
  }
}

/** out ← M′ v for a row-major n × n M, four rows at a time (out updated once per four rows). */
function denseTransposeTimes(d: Float64Array, n: number, v: Float64Array, out: Float64Array): void {
  out.fill(0);
  let i = 0;
  for (; i + 3 < n; i += 4) {
    const v0 = v[i]!, v1 = v[i + 1]!, v2 = v[i + 2]!, v3 = v[i + 3]!;
    if (v0 === 0 && v1 === 0 && v2 === 0 && v3 === 0) continue;
    const o0 = i * n;
    const o1 = o0 + n;
    const o2 = o1 + n;
    const o3 = o2 + n;
    for (let j = 0; j < n; j++) out[j] = out[j]! + (d[o0 + j]! * v0 + d[o1 + j]! * v1 + d[o2 + j]! * v2 + d[o3 + j]! * v3);
  }
  for (; i < n; i++) {
    const vi = v[i]!;
    if (vi === 0) continue;
    const o = i * n;
    for (let j = 0; j < n; j++) out[j] = out[j]! + d[o + j]! * vi;
  }
}

/**
 * A = Z x̂⁻¹ without forming it: A v = Z (v ÷ x) and A′ v = (Z′ v) ÷ x, where a zero output
 * gives a zero column (as `coefficients` does).
 */
export function scaledFlowsOperator(z: Matrix, x: ArrayLike<number>): LinearOperator {
  const n = z.rows;
  if (z.cols !== n || x.length !== n) throw new InputError('bad-size', `flows ${z.rows} × ${z.cols} and ${x.length} outputs do not match`);
  const inv = new Float64Array(n);
  for (let j = 0; j < n; j++) inv[j] = x[j]! > 0 ? 1 / x[j]! : 0;
  const d = z.data;
  const tmp = new Float64Array(n);
  return {
    n,
    storage: 'scaled-flows',
    apply(v, out) {
      for (let j = 0; j < n; j++) tmp[j] = v[j]! * inv[j]!;
      denseTimes(d, n, tmp, out);
    },
    applyTranspose(v, out) {
      denseTransposeTimes(d, n, v, out);
      for (let j = 0; j < n; j++) out[j] = out[j]! * inv[j]!;
    },
    norms: () => denseNorms(n, d, inv),
  };
}

/**
 * A in CSR. The transposed product uses the CSR of A′ (built on first use: the same memory
 * again, for a product that reads instead of scattering).
 */
export function csrOperator(s: CSR): LinearOperator {
  const n = s.rows;
  if (s.cols !== n) throw new InputError('not-square', `an operator needs a square matrix; got ${s.rows} × ${s.cols}`);
  let t: CSR | undefined;
  return {
    n,
    storage: 'sparse',
    apply: (v, out) => void csrMatVec(s, v, out),
    applyTranspose: (v, out) => {
      if (!t) t = csrTranspose(s);
      csrMatVec(t, v, out);
    },
    norms: () => absNorms(n, (f) => {
      for (let i = 0; i < n; i++) for (let q = s.rowPtr[i]!; q < s.rowPtr[i + 1]!; q++) f(i, s.colIdx[q]!, s.values[q]!);
    }),
  };
}

/** The operator of A′ (to solve (I − A′) y = c, that is y′ = c′ (I − A)⁻¹). */
export function transposed(op: LinearOperator): LinearOperator {
  return {
    n: op.n,
    storage: op.storage,
    apply: (v, out) => op.applyTranspose(v, out),
    applyTranspose: (v, out) => op.apply(v, out),
    norms: () => {
      const { one, inf } = op.norms();
      return { one: inf, inf: one };
    },
  };
}

function denseNorms(n: number, d: Float64Array, scale: Float64Array | null): { one: number; inf: number } {
  const col = new Float64Array(n);
  let inf = 0;
  for (let i = 0; i < n; i++) {
    const o = i * n;
    let row = 0;
    for (let j = 0; j < n; j++) {
      const a = Math.abs(scale ? d[o + j]! * scale[j]! : d[o + j]!);
      row += a;
      col[j] = col[j]! + a;
    }
    if (row > inf) inf = row;
  }
  let one = 0;
  for (let j = 0; j < n; j++) if (col[j]! > one) one = col[j]!;
  return { one, inf };
}

function absNorms(n: number, each: (f: (i: number, j: number, v: number) => void) => void): { one: number; inf: number } {
  const col = new Float64Array(n);
  const row = new Float64Array(n);
  each((i, j, v) => {
    const a = Math.abs(v);
    row[i] = row[i]! + a;
    col[j] = col[j]! + a;
  });
  let one = 0;
  let inf = 0;
  for (let k = 0; k < n; k++) {
    if (col[k]! > one) one = col[k]!;
    if (row[k]! > inf) inf = row[k]!;
  }
  return { one, inf };
}

export type IterativeMethod = 'power-series' | 'gmres';

export interface IterativeOptions {
  /** Target: the series' error bound relative to ‖x‖∞, or GMRES's ‖r‖₂ / ‖d‖₂ (default 1e-12). */
  tolerance?: number;
  /** Most products A v to spend (default 2000 for the series, 1000 for GMRES). */
  maxIterations?: number;
  /** GMRES restart length (default 40). */
  restart?: number;
  /** 'throw' (default) a `ConvergenceError` when the target is missed, or 'report' it in the result. */
  onFailure?: 'throw' | 'report';
  /** A starting guess for GMRES (default zero). */
  x0?: ArrayLike<number>;
}

export interface IterativeResult {
  x: Float64Array;
  method: IterativeMethod;
  /** Products with A spent (including the final residual check). */
  iterations: number;
  /** ‖d − (I − A)x‖∞ / ‖d‖∞ for the x returned, computed afresh. */
  residual: number;
  /** The target the solve was asked to meet. */
  tolerance: number;
  /** Whether the target was met. */
  converged: boolean;
  /** The power series' a-posteriori bound on ‖x* − x‖∞, when a norm of A is below 1. */
  errorBound?: number;
  /** The contraction factor q behind the bound (the smaller of ‖A‖₁, ‖A‖∞). */
  contraction?: number;
  /** Present when the target was missed: what happened and what to do. */
  finding?: Finding;
}

/** An iterative solve that missed its target; `result` holds what it reached. */
export class ConvergenceError extends Error {
  override name = 'ConvergenceError';
  readonly code = 'not-converged';
  constructor(readonly result: IterativeResult) {
    super(result.finding?.message ?? 'the iterative solve did not converge');
  }
}

function checkRhs(op: LinearOperator, d: ArrayLike<number>): void {
  if (d.length !== op.n) throw new InputError('bad-size', `the right-hand side has ${d.length} values; the matrix has ${op.n} rows`);
  for (let i = 0; i < d.length; i++) {
    if (!Number.isFinite(d[i]!)) throw new InputError('non-finite', `value ${i + 1} of the right-hand side is ${d[i]}, not a finite number`, { row: i + 1 });
  }
}

function normInf(v: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) {
    const a = Math.abs(v[i]!);
    if (a > m || Number.isNaN(a)) m = a;
  }
  return m;
}

/** ‖d − (I − A)x‖∞ / ‖d‖∞ (one product). */
export function leontiefResidualOf(op: LinearOperator, x: Float64Array, d: ArrayLike<number>): number {
  const ax = new Float64Array(op.n);
  op.apply(x, ax);
  let r = 0;
  for (let i = 0; i < op.n; i++) {
    const e = Math.abs(d[i]! - x[i]! + ax[i]!);
    if (e > r || Number.isNaN(e)) r = e;
  }
  const dn = normInf(d);
  return dn > 0 ? r / dn : r;
}

function finish(res: IterativeResult, onFailure: 'throw' | 'report', why: string, advice: string): IterativeResult {
  if (res.converged) return res;
  res.finding = {
    code: 'not-converged',
    severity: 'error',
    message: `${why}: after ${res.iterations} products the relative residual is ${res.residual.toExponential(2)} where ${res.tolerance.toExponential(0)} was asked; the result is not reliable`,
    data: { method: res.method, iterations: res.iterations, residual: res.residual, tolerance: res.tolerance },
    where: {},
  };
  res.finding.message += `. ${advice}`;
  if (onFailure === 'throw') throw new ConvergenceError(res);
  return res;
}

/** x = Σₖ Aᵏ d for (I − A) x = d, with the a-posteriori error bound (see the file comment). */
export function powerSeries(op: LinearOperator, d: ArrayLike<number>, options: IterativeOptions = {}): IterativeResult {
  checkRhs(op, d);
  const n = op.n;
  const tol = options.tolerance ?? 1e-12;
  const maxIt = options.maxIterations ?? 2000;
  const onFailure = options.onFailure ?? 'throw';
  const { one, inf } = op.norms();
  const q1 = one < 1 ? one : Infinity;
  const qi = inf < 1 ? inf : Infinity;
  const q = Math.min(q1, qi);
  const x = Float64Array.from(d);
  let t: Float64Array = Float64Array.from(d);
  let next: Float64Array = new Float64Array(n);
  let it = 0;
  let bound = Infinity;
  let diverged = false;
  const dn = normInf(d);
  let converged = dn === 0;
  while (!converged && it < maxIt) {
    op.apply(t, next);
    it++;
    [t, next] = [next, t];
    let tinf = 0;
    let t1 = 0;
    for (let i = 0; i < n; i++) {
      x[i] = x[i]! + t[i]!;
      const a = Math.abs(t[i]!);
      t1 += a;
      if (a > tinf || Number.isNaN(a)) tinf = a;
    }
    const xn = normInf(x);
    if (!Number.isFinite(tinf) || !Number.isFinite(xn) || tinf > 1e12 * (dn || 1)) {
      diverged = true;
      break;
    }
    // ‖x* − xₖ‖∞ ≤ ‖x* − xₖ‖₁ ≤ q₁/(1−q₁) ‖tₖ‖₁, and ‖x* − xₖ‖∞ ≤ q∞/(1−q∞) ‖tₖ‖∞.
    bound = Math.min(q1 < 1 ? (q1 / (1 - q1)) * t1 : Infinity, qi < 1 ? (qi / (1 - qi)) * tinf : Infinity);
    if (q < 1) converged = bound <= tol * xn;
    else converged = tinf <= tol * xn; // no norm below 1: the residual check below decides
  }
  const residual = leontiefResidualOf(op, x, d);
  it++;
  // Without a norm below 1 there is no bound: accept only a residual as small as the target.
  if (q >= 1 && converged) converged = residual * dn <= tol * normInf(x);
  if (diverged) converged = false;
  const res: IterativeResult = { x, method: 'power-series', iterations: it, residual, tolerance: tol, converged };
  if (q < 1 && Number.isFinite(bound)) {
    res.errorBound = bound;
    res.contraction = q;
  }
  return finish(
    res,
    onFailure,
    diverged ? 'the power series diverges (the Perron root of A is 1 or more, so the table is not productive)' : 'the power series did not reach its target',
    diverged
      ? 'Check the table for a closed group of sectors (engine checks report it)'
      : 'The Perron root of A is probably close to 1: use GMRES, allow more iterations, or use the direct solve',
  );
}

/** Restarted GMRES(m) for (I − A) x = d. */
export function gmres(op: LinearOperator, d: ArrayLike<number>, options: IterativeOptions = {}): IterativeResult {
  checkRhs(op, d);
  const n = op.n;
  const tol = options.tolerance ?? 1e-12;
  const maxIt = options.maxIterations ?? 1000;
  const m = Math.max(1, Math.min(options.restart ?? 40, n));
  const onFailure = options.onFailure ?? 'throw';
  const x = options.x0 ? Float64Array.from(options.x0) : new Float64Array(n);
  if (x.length !== n) throw new InputError('bad-size', `the starting guess has ${x.length} values; the matrix has ${n} rows`);
  let d2 = 0;
  for (let i = 0; i < n; i++) d2 += d[i]! * d[i]!;
  d2 = Math.sqrt(d2);
  const V: Float64Array[] = Array.from({ length: m + 1 }, () => new Float64Array(n));
  const H = new Float64Array((m + 1) * m);
  const cs = new Float64Array(m);
  const sn = new Float64Array(m);
  const g = new Float64Array(m + 1);
  const w = new Float64Array(n);
  const y = new Float64Array(m);
  let it = 0;
  let converged = d2 === 0;
  let stalled = false;
  let lastRestartNorm = Infinity;
  while (!converged && it < maxIt) {
    // r = d − (I − A) x
    const r = V[0]!;
    op.apply(x, w);
    it++;
    let beta = 0;
    for (let i = 0; i < n; i++) {
      const v = d[i]! - x[i]! + w[i]!;
      r[i] = v;
      beta += v * v;
    }
    beta = Math.sqrt(beta);
    if (!Number.isFinite(beta)) break;
    if (beta <= tol * d2) {
      converged = true;
      break;
    }
    if (beta >= lastRestartNorm * (1 - 1e-3)) {
      // A whole cycle gained almost nothing: more of the same will not help.
      stalled = true;
      break;
    }
    lastRestartNorm = beta;
    for (let i = 0; i < n; i++) r[i] = r[i]! / beta;
    g.fill(0);
    g[0] = beta;
    let j = 0;
    for (; j < m && it < maxIt; j++) {
      // w = (I − A) vⱼ
      const vj = V[j]!;
      op.apply(vj, w);
      it++;
      for (let i = 0; i < n; i++) w[i] = vj[i]! - w[i]!;
      for (let k = 0; k <= j; k++) {
        const vk = V[k]!;
        let h = 0;
        for (let i = 0; i < n; i++) h += w[i]! * vk[i]!;
        H[k * m + j] = h;
        for (let i = 0; i < n; i++) w[i] = w[i]! - h * vk[i]!;
      }
      let hn = 0;
      for (let i = 0; i < n; i++) hn += w[i]! * w[i]!;
      hn = Math.sqrt(hn);
      H[(j + 1) * m + j] = hn;
      if (hn > 0) {
        const vn = V[j + 1]!;
        for (let i = 0; i < n; i++) vn[i] = w[i]! / hn;
      }
      for (let k = 0; k < j; k++) {
        const a = H[k * m + j]!;
        const b = H[(k + 1) * m + j]!;
        H[k * m + j] = cs[k]! * a + sn[k]! * b;
        H[(k + 1) * m + j] = -sn[k]! * a + cs[k]! * b;
      }
      const a = H[j * m + j]!;
      const b = H[(j + 1) * m + j]!;
      const rr = Math.hypot(a, b);
      cs[j] = rr > 0 ? a / rr : 1;
      sn[j] = rr > 0 ? b / rr : 0;
      H[j * m + j] = rr;
      H[(j + 1) * m + j] = 0;
      g[j + 1] = -sn[j]! * g[j]!;
      g[j] = cs[j]! * g[j]!;
      if (Math.abs(g[j + 1]!) <= tol * d2 * 0.5 || hn === 0) {
        j++;
        break;
      }
    }
    // Solve the triangular system and update x.
    for (let k = j - 1; k >= 0; k--) {
      let s = g[k]!;
      for (let l = k + 1; l < j; l++) s -= H[k * m + l]! * y[l]!;
      y[k] = H[k * m + k]! !== 0 ? s / H[k * m + k]! : 0;
    }
    for (let k = 0; k < j; k++) {
      const vk = V[k]!;
      const yk = y[k]!;
      for (let i = 0; i < n; i++) x[i] = x[i]! + yk * vk[i]!;
    }
  }
  // The final check of convergence is the true residual, not the recurrence.
  op.apply(x, w);
  it++;
  let r2 = 0;
  for (let i = 0; i < n; i++) {
    const v = d[i]! - x[i]! + w[i]!;
    r2 += v * v;
  }
  converged = Math.sqrt(r2) <= tol * d2 * (1 + 1e-9) || d2 === 0;
  const residual = leontiefResidualOf(op, x, d);
  it++;
  const res: IterativeResult = { x, method: 'gmres', iterations: it, residual, tolerance: tol, converged: converged && Number.isFinite(residual) };
  return finish(
    res,
    onFailure,
    stalled ? 'GMRES stagnated' : 'GMRES did not reach its target',
    'I − A may be singular or nearly so (a Perron root at or near 1): check the table, allow more iterations, or use the direct solve',
  );
}
