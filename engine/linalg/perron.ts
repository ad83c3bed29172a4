/**
 * The Perron root (spectral radius) of a nonnegative square matrix, bracketed from below and
 * above.
 *
 * Bounds used, each valid for any nonnegative A:
 * - the smallest and largest column sums (and row sums) bracket ρ(A);
 * - for any positive vector x, min (Ax)ᵢ/xᵢ ≤ ρ(A) ≤ max (Ax)ᵢ/xᵢ (Collatz–Wielandt).
 * The power iteration runs on A + I, which is primitive when A is irreducible, so that the
 * Collatz–Wielandt bounds close in on ρ(A) for each irreducible block.
 *
 * @example perronRoot(fromRows([[0.5, 0.4], [0.2, 0.3]])) // ≈ { lower: 0.7, upper: 0.7, ... }
 */
import { InputError } from '../errors';
import { stronglyConnected } from './graph';
import type { Matrix } from './matrix';
import { submatrix } from './matrix';

export interface PerronRoot {
  /** A lower bound on ρ(A). */
  lower: number;
  /** An upper bound on ρ(A). */
  upper: number;
  /** The midpoint, the best single estimate. */
  estimate: number;
  /** Power iterations spent (0 when the sum bounds settled it). */
  iterations: number;
}

export interface PerronOptions {
  /** Stop when upper − lower falls below this. */
  tolerance?: number;
  maxIterations?: number;
  /** Stop early as soon as the bounds fall on one side of this value (for a yes/no question). */
  threshold?: number;
}

export function perronRoot(a: Matrix, options: PerronOptions = {}): PerronRoot {
  const n = a.rows;
  if (a.cols !== n) throw new InputError('not-square', `the Perron root needs a square matrix; got ${a.rows} × ${a.cols}`);
  if (n === 0) return { lower: 0, upper: 0, estimate: 0, iterations: 0 };
  const tol = options.tolerance ?? 1e-10;
  const maxIt = options.maxIterations ?? 10_000;
  const threshold = options.threshold;
  const { data } = a;
  const col = new Float64Array(n);
  let rowMin = Infinity;
  let rowMax = 0;
  for (let i = 0; i < n; i++) {
    let s = 0;
    const o = i * n;
    for (let j = 0; j < n; j++) {
      const v = data[o + j]!;
      if (v < 0) throw new InputError('negative', `the Perron root needs a nonnegative matrix; entry (${i + 1}, ${j + 1}) is ${v}`);
      s += v;
      col[j] += v;
    }
    rowMin = Math.min(rowMin, s);
    rowMax = Math.max(rowMax, s);
  }
  let colMin = Infinity;
  let colMax = 0;
  for (let j = 0; j < n; j++) {
    colMin = Math.min(colMin, col[j]!);
    colMax = Math.max(colMax, col[j]!);
  }
  let lower = Math.max(rowMin, colMin);
  let upper = Math.min(rowMax, colMax);
  const settled = () =>
    upper - lower <= tol * Math.max(1, upper) || (threshold !== undefined && (upper < threshold || lower >= threshold));
  if (settled()) return { lower, upper, estimate: (lower + upper) / 2, iterations: 0 };
  const comps = stronglyConnected(a);
  if (comps.length === 1) return iterate(a, lower, upper, tol, maxIt, threshold);
  // A reducible matrix: ρ(A) is the largest root of its irreducible diagonal blocks, and the
  // Collatz–Wielandt bounds only close in on each block separately.
  let lo = 0;
  let hi = 0;
  let its = 0;
  for (const comp of comps) {
    if (comp.length === 1) {
      const v = data[comp[0]! * n + comp[0]!]!;
      lo = Math.max(lo, v);
      hi = Math.max(hi, v);
      continue;
    }
    const r = iterate(submatrix(a, comp, comp), 0, Infinity, tol, maxIt, threshold);
    its += r.iterations;
    lo = Math.max(lo, r.lower);
    hi = Math.max(hi, r.upper);
    if (threshold !== undefined && lo >= threshold) break;
  }
  lower = Math.max(lower, lo);
  upper = Math.min(upper, hi);
  if (lower > upper) lower = upper;
  return { lower, upper, estimate: (lower + upper) / 2, iterations: its };
}

/** Power iteration on A + I with Collatz–Wielandt bounds, starting from the given bounds. */
function iterate(a: Matrix, lower: number, upper: number, tol: number, maxIt: number, threshold: number | undefined): PerronRoot {
  const n = a.rows;
  const { data } = a;
  if (upper === Infinity) {
    let cmax = 0;
    let cmin = Infinity;
    const col = new Float64Array(n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) col[j] += data[i * n + j]!;
    for (let j = 0; j < n; j++) {
      cmax = Math.max(cmax, col[j]!);
      cmin = Math.min(cmin, col[j]!);
    }
    upper = cmax;
    lower = Math.max(lower, cmin);
  }
  const settled = () =>
    upper - lower <= tol * Math.max(1, upper) || (threshold !== undefined && (upper < threshold || lower >= threshold));
  let x = new Float64Array(n).fill(1);
  const y = new Float64Array(n);
  let it = 0;
  while (it < maxIt) {
    it++;
    // y = A x
    let lo = Infinity;
    let hi = 0;
    for (let i = 0; i < n; i++) {
      let s = 0;
      const o = i * n;
      for (let j = 0; j < n; j++) s += data[o + j]! * x[j]!;
      y[i] = s;
      const r = s / x[i]!;
      if (r < lo) lo = r;
      if (r > hi) hi = r;
    }
    if (lo > lower) lower = lo;
    if (hi < upper) upper = hi;
    if (settled()) break;
    // x ← (A + I) x, normalised; stays positive.
    let m = 0;
    for (let i = 0; i < n; i++) {
      const v = y[i]! + x[i]!;
      x[i] = v;
      if (v > m) m = v;
    }
    let tiny = false;
    for (let i = 0; i < n; i++) {
      const v = x[i]! / m;
      x[i] = v;
      if (v < 1e-280) tiny = true;
    }
    if (tiny) {
      // Part of the vector has vanished (a reducible matrix): keep it positive so the bounds stay valid.
      for (let i = 0; i < n; i++) if (x[i]! < 1e-280) x[i] = 1e-280;
    }
  }
  if (lower > upper) lower = upper;
  return { lower, upper, estimate: (lower + upper) / 2, iterations: it };
}
