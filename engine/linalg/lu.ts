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
import type { DenseKernel, Workspace } from './kernel';
import { WASM_MIN_N, kernelFor, workspaceOf } from './kernel';
import type { Matrix } from './matrix';
import { norm1 } from './matrix';

export interface LUOptions {
  /** Panel width of the blocked algorithm. */
  blockSize?: number;
  /** Factor this array in place instead of copying it (the caller gives it up). */
  overwrite?: boolean;
  /**
   * The dense kernel (default: `kernelFor(n)`, see kernel.ts). Every kernel gives the same
   * bits; the choice changes speed only.
   */
  kernel?: DenseKernel;
}

/**
 * C ← C − A B on blocks (the signature of `gemmSub`), carrying the workspace whose fast paths
 * the narrow pieces may use when their arrays are its own.
 */
type Gemm = typeof gemmSub & { ws?: Workspace };

/** A kernel call when all three blocks live in the workspace, the JS kernel otherwise. */
function gemmOn(ws: Workspace): Gemm {
  const f = ws.f64;
  const g: Gemm = (m, nc, kc, a, aOff, lda, b, bOff, ldb, c, cOff, ldc) => {
    if (a === f && b === f && c === f) ws.gemmSub(m, nc, kc, aOff, lda, bOff, ldb, cOff, ldc);
    else gemmSub(m, nc, kc, a, aOff, lda, b, bOff, ldb, c, cOff, ldc);
  };
  g.ws = ws;
  return g;
}

/** Right-hand sides below this count are solved in place in JavaScript (no copy into a workspace). */
const MANY_MIN = 8;

/**
 * Panel width of the outer blocked loop. Inside a panel the factorisation recurses on halves
 * (so that nearly all the work, panel included, goes through the kernel) down to `BASE`
 * columns, which are done one column at a time.
 */
export const DEFAULT_BLOCK = 256;
/** Width below which panels, triangular solves and triangular inverses stop recursing. */
const BASE = 16;

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
  /** The kernel that factored the matrix (and that the many-column solves use). */
  readonly kernel: DenseKernel;

  constructor(a: Matrix, options: LUOptions = {}) {
    if (a.rows !== a.cols) {
      throw new InputError('not-square', `LU needs a square matrix; got ${a.rows} × ${a.cols}`);
    }
    const n = a.rows;
    this.n = n;
    this.norm1 = norm1(a);
    this.pivots = new Int32Array(n);
    const nb = Math.max(1, Math.floor(options.blockSize ?? DEFAULT_BLOCK));
    const kernel = options.kernel ?? kernelFor(n);
    this.kernel = kernel;
    if (kernel.adopt) {
      this.lu = options.overwrite ? a.data : a.data.slice();
      this.singularColumn = factor(this.lu, n, this.pivots, nb, gemmOn(kernel.adopt(this.lu)));
    } else {
      const own = options.overwrite ? workspaceOf(a.data) : undefined;
      if (own && own.kernel === kernel && !own.ws.shared && a.data.length === n * n) {
        // The matrix already lives in this kernel's memory: factor it there.
        this.lu = a.data;
        this.singularColumn = factor(a.data, n, this.pivots, nb, gemmOn(own.ws));
        return;
      }
      // Copy into the kernel's memory, factor there, and keep (or copy back) the result.
      const ws = kernel.workspace(n * n);
      ws.f64.set(a.data);
      this.singularColumn = factor(ws.f64, n, this.pivots, nb, gemmOn(ws));
      if (options.overwrite) {
        a.data.set(ws.f64);
        this.lu = a.data;
      } else {
        this.lu = ws.shared ? ws.f64.slice() : ws.f64;
      }
      ws.release();
    }
  }

  /**
   * Run `f` on L U and a copy of `x` (n × r) in one array through the kernel, and return the
   * new `x`. Few columns, or a kernel that computes on any array, go straight to JavaScript.
   */
  private withKernel(
    x: Float64Array,
    r: number,
    f: (lu: Float64Array, lo: number, x: Float64Array, xo: number, g: Gemm) => void,
    factor: Float64Array = this.lu,
  ): Float64Array {
    const { n, kernel } = this;
    if (kernel.adopt || r < MANY_MIN || n < WASM_MIN_N) {
      f(factor, 0, x, 0, gemmSub);
      return x;
    }
    const ws = kernel.workspace(n * n + n * r);
    ws.f64.set(factor, 0);
    ws.f64.set(x, n * n);
    f(ws.f64, 0, ws.f64, n * n, gemmOn(ws));
    x.set(ws.f64.subarray(n * n, n * n + n * r));
    ws.release();
    return x;
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
    this.withKernel(x, r, (lu, lo, y, yo, g) => {
      lowerSolve(lu, lo, n, y, yo, r, n, r, g);
      upperSolve(lu, lo, n, y, yo, r, n, r, g);
    });
    return { rows: n, cols: r, data: x };
  }

  /**
   * Y with A′ Y = C for many right-hand sides (C is `n × r`). A′ = U′ L′ P, so U′ Z = C, then
   * L′ W = Z, then Y = P′ W; for many columns on the transposed factor, blocked like `solveMany`.
   */
  solveTransposeMany(c: Matrix): Matrix {
    this.ensureRegular();
    const { n } = this;
    if (c.rows !== n) throw new InputError('bad-size', `the right-hand sides have ${c.rows} rows; the matrix has ${n}`);
    const r = c.cols;
    if (r < MANY_MIN) {
      const out = new Float64Array(n * r);
      const col = new Float64Array(n);
      for (let j = 0; j < r; j++) {
        for (let i = 0; i < n; i++) col[i] = c.data[i * r + j]!;
        const y = this.solveTranspose(col);
        for (let i = 0; i < n; i++) out[i * r + j] = y[i]!;
      }
      return { rows: n, cols: r, data: out };
    }
    const t = transposeSquare(this.lu, n);
    const x = c.data.slice();
    this.withKernel(
      x,
      r,
      (f, fo, y, yo, g) => {
        lowerSolve(f, fo, n, y, yo, r, n, r, g, false);
        upperSolve(f, fo, n, y, yo, r, n, r, g, true);
      },
      t,
    );
    for (let k = n - 1; k >= 0; k--) {
      const p = this.pivots[k]!;
      if (p === k) continue;
      const a = k * r;
      const b = p * r;
      for (let j = 0; j < r; j++) {
        const tmp = x[a + j]!;
        x[a + j] = x[b + j]!;
        x[b + j] = tmp;
      }
    }
    return { rows: n, cols: r, data: x };
  }

  /**
   * A⁻¹, formed only when it is itself the result wanted. A⁻¹ = U⁻¹ L⁻¹ P: L⁻¹ is computed
   * by recursion on halves, L⁻¹ = [[L₁₁⁻¹, 0], [−L₂₂⁻¹ L₂₁ L₁₁⁻¹, L₂₂⁻¹]], then U is solved
   * against it, then the columns are put back in order.
   */
  inverse(): Matrix {
    this.ensureRegular();
    const { n } = this;
    const y = new Float64Array(n * n);
    this.withKernel(y, n, (lu, lo, x, xo, g) => {
      lowerInverse(lu, lo, n, x, xo, n, n, g);
      upperSolve(lu, lo, n, x, xo, n, n, n, g);
    });
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
}

/**
 * X ← L⁻¹ X, L the m × m lower triangle at `lo` of `l` (leading dimension ldl; unit diagonal
 * unless `unit` is false), X the m × r block at `xo` of `x` (leading dimension ldx). Recursion
 * on halves: solve the top, subtract L₂₁ X₁ from the bottom through the kernel, solve the
 * bottom.
 */
function lowerSolve(l: Float64Array, lo: number, ldl: number, x: Float64Array, xo: number, ldx: number, m: number, r: number, g: Gemm, unit = true): void {
  if (m <= BASE) {
    const ws = g.ws;
    if (ws?.lowerBase && l === ws.f64 && x === ws.f64) {
      ws.lowerBase(m, r, lo, ldl, xo, ldx, unit);
      return;
    }
    for (let i = 0; i < m; i++) {
      const xi = xo + i * ldx;
      const li = lo + i * ldl;
      for (let k = 0; k < i; k++) {
        const v = l[li + k]!;
        if (v === 0) continue;
        const xk = xo + k * ldx;
        for (let j = 0; j < r; j++) x[xi + j] = x[xi + j]! - v * x[xk + j]!;
      }
      if (!unit) {
        const d = 1 / l[li + i]!;
        for (let j = 0; j < r; j++) x[xi + j] = x[xi + j]! * d;
      }
    }
    return;
  }
  const m1 = half(m);
  lowerSolve(l, lo, ldl, x, xo, ldx, m1, r, g, unit);
  g(m - m1, r, m1, l, lo + m1 * ldl, ldl, x, xo, ldx, x, xo + m1 * ldx, ldx);
  lowerSolve(l, lo + m1 * ldl + m1, ldl, x, xo + m1 * ldx, ldx, m - m1, r, g, unit);
}

/** X ← U⁻¹ X, U the m × m upper triangle at `lo` of `l` (non-unit unless `unit`); as `lowerSolve`, bottom first. */
function upperSolve(l: Float64Array, lo: number, ldl: number, x: Float64Array, xo: number, ldx: number, m: number, r: number, g: Gemm, unit = false): void {
  if (m <= BASE) {
    const ws = g.ws;
    if (ws?.upperBase && l === ws.f64 && x === ws.f64) {
      ws.upperBase(m, r, lo, ldl, xo, ldx, unit);
      return;
    }
    for (let i = m - 1; i >= 0; i--) {
      const xi = xo + i * ldx;
      const li = lo + i * ldl;
      for (let k = i + 1; k < m; k++) {
        const u = l[li + k]!;
        if (u === 0) continue;
        const xk = xo + k * ldx;
        for (let j = 0; j < r; j++) x[xi + j] = x[xi + j]! - u * x[xk + j]!;
      }
      if (!unit) {
        const d = 1 / l[li + i]!;
        for (let j = 0; j < r; j++) x[xi + j] = x[xi + j]! * d;
      }
    }
    return;
  }
  const m1 = half(m);
  upperSolve(l, lo + m1 * ldl + m1, ldl, x, xo + m1 * ldx, ldx, m - m1, r, g, unit);
  g(m1, r, m - m1, l, lo + m1, ldl, x, xo + m1 * ldx, ldx, x, xo, ldx);
  upperSolve(l, lo, ldl, x, xo, ldx, m1, r, g, unit);
}

/**
 * Y ← L⁻¹ for the m × m unit lower triangle L at `lo` of `l`, into the zeroed m × m block at
 * `yo` of `y`: Y₁₁ = L₁₁⁻¹, Y₂₂ = L₂₂⁻¹, Y₂₁ = −L₂₂⁻¹ (L₂₁ Y₁₁).
 */
function lowerInverse(l: Float64Array, lo: number, ldl: number, y: Float64Array, yo: number, ldy: number, m: number, g: Gemm): void {
  if (m <= BASE) {
    for (let i = 0; i < m; i++) {
      const yi = yo + i * ldy;
      const li = lo + i * ldl;
      y[yi + i] = 1;
      for (let k = 0; k < i; k++) {
        const v = l[li + k]!;
        if (v === 0) continue;
        const yk = yo + k * ldy;
        for (let j = 0; j <= k; j++) y[yi + j] = y[yi + j]! - v * y[yk + j]!;
      }
    }
    return;
  }
  const m1 = half(m);
  lowerInverse(l, lo, ldl, y, yo, ldy, m1, g);
  lowerInverse(l, lo + m1 * ldl + m1, ldl, y, yo + m1 * ldy + m1, ldy, m - m1, g);
  g(m - m1, m1, m1, l, lo + m1 * ldl, ldl, y, yo, ldy, y, yo + m1 * ldy, ldy);
  lowerSolve(l, lo + m1 * ldl + m1, ldl, y, yo + m1 * ldy, ldy, m - m1, m1, g);
}

/** The transpose of a row-major n × n array, by tiles. */
function transposeSquare(a: Float64Array, n: number): Float64Array {
  const t = new Float64Array(n * n);
  const B = 32;
  for (let i0 = 0; i0 < n; i0 += B) {
    const ie = Math.min(i0 + B, n);
    for (let j0 = 0; j0 < n; j0 += B) {
      const je = Math.min(j0 + B, n);
      for (let i = i0; i < ie; i++) for (let j = j0; j < je; j++) t[j * n + i] = a[i * n + j]!;
    }
  }
  return t;
}

/** The split of a recursion: about half, rounded to a multiple of 8 when that is possible. */
function half(m: number): number {
  const h = (m >> 1) & ~7;
  return h > 0 ? h : m >> 1;
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
 * Right-looking blocked LU on a row-major array, in place: for each panel of `nb` columns,
 * factor the panel (recursively), solve for the block row of U, and update the trailing matrix
 * through the kernel. Returns LAPACK's `info`: the 1-based column of the first zero pivot, or 0.
 */
function factor(a: Float64Array, n: number, piv: Int32Array, nb: number, g: Gemm): number {
  let info = 0;
  for (let k0 = 0; k0 < n; k0 += nb) {
    const ke = Math.min(k0 + nb, n);
    info = panel(a, n, k0, ke, piv, g, info);
    if (ke >= n) break;
    // U12 ← L11⁻¹ A12 (rows k0..ke−1, columns ke..n−1).
    lowerSolve(a, k0 * n + k0, n, a, k0 * n + ke, n, ke - k0, n - ke, g);
    // A22 ← A22 − L21 U12.
    g(n - ke, n - ke, ke - k0, a, ke * n + k0, n, a, k0 * n + ke, n, a, ke * n + ke, n);
  }
  return info;
}

/**
 * Factor columns c0..c1−1 on rows c0..n−1 with partial pivoting and whole-row interchanges:
 * recursion on halves (left half, its block row of U, the update of the right half through
 * the kernel, right half), one column at a time below `BASE` columns.
 */
function panel(a: Float64Array, n: number, c0: number, c1: number, piv: Int32Array, g: Gemm, info: number): number {
  const w = c1 - c0;
  if (w > BASE) {
    const cm = c0 + half(w);
    info = panel(a, n, c0, cm, piv, g, info);
    lowerSolve(a, c0 * n + c0, n, a, c0 * n + cm, n, cm - c0, c1 - cm, g);
    g(n - cm, c1 - cm, cm - c0, a, cm * n + c0, n, a, c0 * n + cm, n, a, cm * n + cm, n);
    return panel(a, n, cm, c1, piv, g, info);
  }
  const ws = g.ws;
  if (ws?.panel && a === ws.f64) {
    const r = ws.panel(n, c0, c1, piv, info);
    if (r !== null) return r;
  }
  return panelBase(a, n, c0, c1, piv, info);
}

let panelBuffer: Float64Array = new Float64Array(0);

/**
 * One narrow panel (columns c0..c1−1, rows c0..n−1), one column at a time. The panel is copied
 * into a contiguous buffer first (its rows are far apart in the matrix, so that each visit to
 * a row would cost a page-table walk), factored there with its rows interchanged, written
 * back, and then the same interchanges are applied to the rest of each row. The arithmetic is
 * that of factoring in place.
 */
function panelBase(a: Float64Array, n: number, c0: number, c1: number, piv: Int32Array, info: number): number {
  const w = c1 - c0;
  const rows = n - c0;
  if (panelBuffer.length < rows * w) panelBuffer = new Float64Array(Math.max(rows * w, 16 * 1024));
  const b = panelBuffer;
  for (let i = 0; i < rows; i++) {
    const src = (c0 + i) * n + c0;
    const dst = i * w;
    for (let j = 0; j < w; j++) b[dst + j] = a[src + j]!;
  }
  // The pivot search of column k + 1 rides along the update of column k (same rows, same
  // order, the first largest wins as in a separate scan); -1 when it has to be done apart.
  let next = -1;
  for (let k = 0; k < w; k++) {
    let p = next;
    if (p < 0) {
      p = k;
      let best = Math.abs(b[k * w + k]!);
      for (let i = k + 1; i < rows; i++) {
        const v = Math.abs(b[i * w + k]!);
        if (v > best) {
          best = v;
          p = i;
        }
      }
    }
    next = -1;
    piv[c0 + k] = c0 + p;
    const rk = k * w;
    if (p !== k) {
      const rp = p * w;
      for (let j = 0; j < w; j++) {
        const t = b[rk + j]!;
        b[rk + j] = b[rp + j]!;
        b[rp + j] = t;
      }
    }
    const d = b[rk + k]!;
    if (d === 0) {
      if (info === 0) info = c0 + k + 1;
      continue;
    }
    const inv = 1 / d;
    const k1 = k + 1;
    if (k1 < w) {
      let np = k1;
      let best = -1;
      for (let i = k1; i < rows; i++) {
        const ri = i * w;
        const l = b[ri + k]! * inv;
        b[ri + k] = l;
        if (l !== 0) for (let j = k1; j < w; j++) b[ri + j] = b[ri + j]! - l * b[rk + j]!;
        const v = Math.abs(b[ri + k1]!);
        if (i === k1) best = v;
        else if (v > best) {
          best = v;
          np = i;
        }
      }
      next = np;
    } else {
      for (let i = k1; i < rows; i++) b[i * w + k] = b[i * w + k]! * inv;
    }
  }
  for (let i = 0; i < rows; i++) {
    const dst = (c0 + i) * n + c0;
    const src = i * w;
    for (let j = 0; j < w; j++) a[dst + j] = b[src + j]!;
  }
  // The same interchanges, in order, on the columns left and right of the panel.
  for (let k = c0; k < c1; k++) {
    const p = piv[k]!;
    if (p === k) continue;
    const rk = k * n;
    const rp = p * n;
    for (let j = 0; j < c0; j++) {
      const t = a[rk + j]!;
      a[rk + j] = a[rp + j]!;
      a[rp + j] = t;
    }
    for (let j = c1; j < n; j++) {
      const t = a[rk + j]!;
      a[rk + j] = a[rp + j]!;
      a[rp + j] = t;
    }
  }
  return info;
}
