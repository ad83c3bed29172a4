/**
 * LU factorisation with partial pivoting, P A = L U, blocked for speed: factor once in the
 * constructor, then ask many questions (solve, transposed solve, inverse, determinant,
 * condition estimate).
 *
 * Storage: one row-major `n × n` array holds L below the diagonal (unit diagonal implied) and U
 * on and above it. `pivots[k]` is the row swapped with row k at step k (LAPACK's `ipiv`, but
 * 0-based). A zero pivot does not stop the factorisation: as LAPACK's `getrf` does, the first
 * one is recorded in `singularColumn` (1-based; 0 when there is none) and the solves refuse.
 *
 * @example
 * const lu = new LU(fromRows([[4, 3], [6, 3]]));
 * lu.solve(Float64Array.of(10, 12)); // [1, 2]
 */
import { InputError, SingularMatrixError } from '../errors';
import { gemmSub } from './gemm';
import type { Matrix } from './matrix';
import { norm1 } from './matrix';

export interface LUOptions {
  /** Panel width of the blocked algorithm. */
  blockSize?: number;
  /** Factor this array in place instead of copying it (the caller gives it up). */
  overwrite?: boolean;
}

export const DEFAULT_BLOCK = 64;

export class LU {
  readonly n: number;
  /** L and U packed, row-major. */
  readonly lu: Float64Array;
  /** Row interchanges, 0-based, LAPACK order. */
  readonly pivots: Int32Array;
  /** 1-based column of the first exactly zero pivot, or 0. */
  readonly singularColumn: number;
  /** The 1-norm of the matrix that was factored (for the condition estimate). */
  readonly norm1: number;

  constructor(a: Matrix, options: LUOptions = {}) {
    if (a.rows !== a.cols) {
      throw new InputError('not-square', `LU needs a square matrix; got ${a.rows} × ${a.cols}`);
    }
    const n = a.rows;
    this.n = n;
    this.norm1 = norm1(a);
    this.lu = options.overwrite ? a.data : a.data.slice();
    this.pivots = new Int32Array(n);
    this.singularColumn = factor(this.lu, n, this.pivots, options.blockSize ?? DEFAULT_BLOCK);
  }

  get isSingular(): boolean {
    return this.singularColumn !== 0;
  }

  private ensureRegular(): void {
    if (this.singularColumn !== 0) throw new SingularMatrixError(this.singularColumn);
  }

  /** Sign (−1, 0 or 1) and natural log of the absolute value of the determinant. */
  determinant(): { sign: number; logAbs: number } {
    const { n, lu, pivots } = this;
    let sign = 1;
    let logAbs = 0;
    for (let k = 0; k < n; k++) {
      const d = lu[k * n + k]!;
      if (d === 0) return { sign: 0, logAbs: -Infinity };
      if (d < 0) sign = -sign;
      if (pivots[k] !== k) sign = -sign;
      logAbs += Math.log(Math.abs(d));
    }
    return { sign, logAbs };
  }

  /** x with A x = b, for one right-hand side. */
  solve(b: ArrayLike<number>): Float64Array {
    this.ensureRegular();
    const { n, lu, pivots } = this;
    if (b.length !== n) throw new InputError('bad-size', `the right-hand side has ${b.length} values; the matrix has ${n} rows`);
    const x = Float64Array.from(b);
    for (let k = 0; k < n; k++) {
      const p = pivots[k]!;
      if (p !== k) {
        const t = x[k]!;
        x[k] = x[p]!;
        x[p] = t;
      }
    }
    for (let i = 1; i < n; i++) {
      const o = i * n;
      let s = x[i]!;
      for (let k = 0; k < i; k++) s -= lu[o + k]! * x[k]!;
      x[i] = s;
    }
    for (let i = n - 1; i >= 0; i--) {
      const o = i * n;
      let s = x[i]!;
      for (let k = i + 1; k < n; k++) s -= lu[o + k]! * x[k]!;
      x[i] = s / lu[o + i]!;
    }
    return x;
  }

  /** y with A′ y = c, for one right-hand side (equivalently y′ = c′ A⁻¹). */
  solveTranspose(c: ArrayLike<number>): Float64Array {
    this.ensureRegular();
    const { n, lu, pivots } = this;
    if (c.length !== n) throw new InputError('bad-size', `the right-hand side has ${c.length} values; the matrix has ${n} rows`);
    const z = Float64Array.from(c);
    // U′ w = c: forward, using rows of U.
    for (let k = 0; k < n; k++) {
      const o = k * n;
      const zk = z[k]! / lu[o + k]!;
      z[k] = zk;
      if (zk !== 0) for (let j = k + 1; j < n; j++) z[j] = z[j]! - lu[o + j]! * zk;
    }
    // L′ v = w: backward, using rows of L.
    for (let k = n - 1; k > 0; k--) {
      const o = k * n;
      const zk = z[k]!;
      if (zk !== 0) for (let j = 0; j < k; j++) z[j] = z[j]! - lu[o + j]! * zk;
    }
    for (let k = n - 1; k >= 0; k--) {
      const p = pivots[k]!;
      if (p !== k) {
        const t = z[k]!;
        z[k] = z[p]!;
        z[p] = t;
      }
    }
    return z;
  }

  /**
   * X with A X = B for many right-hand sides at once (B is `n × r`, row-major). Blocked: the
   * bulk of the work goes through the same kernel as the factorisation.
   */
  solveMany(b: Matrix, options: { overwrite?: boolean } = {}): Matrix {
    this.ensureRegular();
    const { n } = this;
    if (b.rows !== n) throw new InputError('bad-size', `the right-hand sides have ${b.rows} rows; the matrix has ${n}`);
    const r = b.cols;
    const x = options.overwrite ? b.data : b.data.slice();
    permuteRows(x, r, this.pivots);
    this.forwardMany(x, r);
    this.backwardMany(x, r);
    return { rows: n, cols: r, data: x };
  }

  /** Y with A′ Y = C for many right-hand sides (C is `n × r`). */
  solveTransposeMany(c: Matrix): Matrix {
    this.ensureRegular();
    const { n } = this;
    if (c.rows !== n) throw new InputError('bad-size', `the right-hand sides have ${c.rows} rows; the matrix has ${n}`);
    const r = c.cols;
    const out = new Float64Array(n * r);
    const col = new Float64Array(n);
    for (let j = 0; j < r; j++) {
      for (let i = 0; i < n; i++) col[i] = c.data[i * r + j]!;
      const y = this.solveTranspose(col);
      for (let i = 0; i < n; i++) out[i * r + j] = y[i]!;
    }
    return { rows: n, cols: r, data: out };
  }

  /**
   * A⁻¹, formed only when it is itself the result wanted. A⁻¹ = U⁻¹ L⁻¹ P: L⁻¹ is computed with
   * its lower-triangular shape exploited (n³/3 multiply-adds), then U is solved against it (n³),
   * then the columns are put back in order.
   */
  inverse(): Matrix {
    this.ensureRegular();
    const { n, lu } = this;
    const y = new Float64Array(n * n);
    for (let i = 0; i < n; i++) y[i * n + i] = 1;
    // Y = L⁻¹, block row by block row; Y[i, j] = 0 for j > i.
    const nb = DEFAULT_BLOCK;
    for (let i0 = 0; i0 < n; i0 += nb) {
      const ie = Math.min(i0 + nb, n);
      gemmSub(ie - i0, i0, i0, lu, i0 * n, n, y, 0, n, y, i0 * n, n);
      for (let i = i0 + 1; i < ie; i++) {
        const yi = i * n;
        const li = i * n;
        for (let k = i0; k < i; k++) {
          const l = lu[li + k]!;
          if (l === 0) continue;
          const yk = k * n;
          for (let j = 0; j <= k; j++) y[yi + j] = y[yi + j]! - l * y[yk + j]!;
        }
      }
    }
    this.backwardMany(y, n);
    // Column k of U⁻¹L⁻¹ is column perm(k) of A⁻¹, where perm applies the interchanges in order.
    const perm = new Int32Array(n);
    for (let i = 0; i < n; i++) perm[i] = i;
    for (let k = 0; k < n; k++) {
      const p = this.pivots[k]!;
      if (p !== k) {
        const t = perm[k]!;
        perm[k] = perm[p]!;
        perm[p] = t;
      }
    }
    const tmp = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const o = i * n;
      tmp.set(y.subarray(o, o + n));
      for (let k = 0; k < n; k++) y[o + perm[k]!] = tmp[k]!;
    }
    return { rows: n, cols: n, data: y };
  }

  /** Solve L Y = X in place (L unit lower), X `n × r`. */
  private forwardMany(x: Float64Array, r: number): void {
    const { n, lu } = this;
    const nb = DEFAULT_BLOCK;
    for (let i0 = 0; i0 < n; i0 += nb) {
      const ie = Math.min(i0 + nb, n);
      gemmSub(ie - i0, r, i0, lu, i0 * n, n, x, 0, r, x, i0 * r, r);
      for (let i = i0 + 1; i < ie; i++) {
        const xi = i * r;
        const li = i * n;
        for (let k = i0; k < i; k++) {
          const l = lu[li + k]!;
          if (l === 0) continue;
          const xk = k * r;
          for (let j = 0; j < r; j++) x[xi + j] = x[xi + j]! - l * x[xk + j]!;
        }
      }
    }
  }

  /** Solve U Y = X in place (U upper, non-unit), X `n × r`. */
  private backwardMany(x: Float64Array, r: number): void {
    const { n, lu } = this;
    const nb = DEFAULT_BLOCK;
    const last = Math.floor((n - 1) / nb) * nb;
    for (let i0 = last; i0 >= 0; i0 -= nb) {
      const ie = Math.min(i0 + nb, n);
      gemmSub(ie - i0, r, n - ie, lu, i0 * n + ie, n, x, ie * r, r, x, i0 * r, r);
      for (let i = ie - 1; i >= i0; i--) {
        const xi = i * r;
        const li = i * n;
        for (let k = i + 1; k < ie; k++) {
          const u = lu[li + k]!;
          if (u === 0) continue;
          const xk = k * r;
          for (let j = 0; j < r; j++) x[xi + j] = x[xi + j]! - u * x[xk + j]!;
        }
        const d = 1 / lu[li + i]!;
        for (let j = 0; j < r; j++) x[xi + j] = x[xi + j]! * d;
      }
    }
  }
}

/** Apply the interchanges in LAPACK order to the rows of a row-major `n × r` array. */
function permuteRows(x: Float64Array, r: number, pivots: Int32Array): void {
  for (let k = 0; k < pivots.length; k++) {
    const p = pivots[k]!;
    if (p === k) continue;
    const a = k * r;
    const b = p * r;
    for (let j = 0; j < r; j++) {
      const t = x[a + j]!;
      x[a + j] = x[b + j]!;
      x[b + j] = t;
    }
  }
}

/**
 * Right-looking blocked LU on a row-major array, in place. Returns LAPACK's `info`: the 1-based
 * column of the first zero pivot, or 0.
 */
function factor(a: Float64Array, n: number, piv: Int32Array, nb: number): number {
  let info = 0;
  for (let k0 = 0; k0 < n; k0 += nb) {
    const ke = Math.min(k0 + nb, n);
    // Panel: columns k0..ke−1, rows k0..n−1, with whole-row interchanges.
    for (let k = k0; k < ke; k++) {
      let p = k;
      let best = Math.abs(a[k * n + k]!);
      for (let i = k + 1; i < n; i++) {
        const v = Math.abs(a[i * n + k]!);
        if (v > best) {
          best = v;
          p = i;
        }
      }
      piv[k] = p;
      if (p !== k) {
        const rk = k * n;
        const rp = p * n;
        for (let j = 0; j < n; j++) {
          const t = a[rk + j]!;
          a[rk + j] = a[rp + j]!;
          a[rp + j] = t;
        }
      }
      const rk = k * n;
      const d = a[rk + k]!;
      if (d === 0) {
        if (info === 0) info = k + 1;
        continue;
      }
      const inv = 1 / d;
      for (let i = k + 1; i < n; i++) {
        const ri = i * n;
        const l = a[ri + k]! * inv;
        a[ri + k] = l;
        if (l !== 0) for (let j = k + 1; j < ke; j++) a[ri + j] = a[ri + j]! - l * a[rk + j]!;
      }
    }
    if (ke >= n) break;
    // U12 ← L11⁻¹ A12 (rows k0..ke−1, columns ke..n−1).
    for (let i = k0 + 1; i < ke; i++) {
      const ri = i * n;
      for (let k = k0; k < i; k++) {
        const l = a[ri + k]!;
        if (l === 0) continue;
        const rk = k * n;
        for (let j = ke; j < n; j++) a[ri + j] = a[ri + j]! - l * a[rk + j]!;
      }
    }
    // A22 ← A22 − L21 U12.
    gemmSub(n - ke, n - ke, ke - k0, a, ke * n + k0, n, a, k0 * n + ke, n, a, ke * n + ke, n);
  }
  return info;
}
