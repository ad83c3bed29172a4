/**
 * Relative residuals: how well a computed solution satisfies its system.
 *
 * For A x = b the relative (normwise backward) residual is
 *   ‖b − A x‖∞ / (‖A‖∞ ‖x‖∞ + ‖b‖∞),
 * which is of the order of the unit round-off (about 1e-16) for a backward-stable solve.
 *
 * @example relativeResidual(fromRows([[2, 0], [0, 4]]), Float64Array.of(1, 1), Float64Array.of(2, 4)) // 0
 */
import { InputError } from '../errors';
import type { Matrix } from './matrix';
import { normInf } from './matrix';

export function relativeResidual(a: Matrix, x: ArrayLike<number>, b: ArrayLike<number>, aNormInf = normInf(a)): number {
  const { rows, cols, data } = a;
  if (x.length !== cols || b.length !== rows) {
    throw new InputError('bad-size', `residual of a ${rows} × ${cols} system needs x of ${cols} and b of ${rows} values`);
  }
  let r = 0;
  let xn = 0;
  let bn = 0;
  for (let j = 0; j < cols; j++) xn = Math.max(xn, Math.abs(x[j]!));
  for (let i = 0; i < rows; i++) {
    let s = b[i]!;
    const o = i * cols;
    for (let j = 0; j < cols; j++) s -= data[o + j]! * x[j]!;
    r = Math.max(r, Math.abs(s));
    bn = Math.max(bn, Math.abs(b[i]!));
  }
  const den = aNormInf * xn + bn;
  return den === 0 ? 0 : r / den;
}

/**
 * The relative residual of (I − A) x = d without forming I − A:
 *   ‖d − x + A x‖∞ / (‖I − A‖∞ ‖x‖∞ + ‖d‖∞).
 */
export function leontiefResidual(a: Matrix, x: ArrayLike<number>, d: ArrayLike<number>): number {
  const n = a.rows;
  if (a.cols !== n || x.length !== n || d.length !== n) {
    throw new InputError('bad-size', `residual of an ${n}-sector system needs x and d of ${n} values`);
  }
  const { data } = a;
  let r = 0;
  let xn = 0;
  let dn = 0;
  let norm = 0;
  for (let i = 0; i < n; i++) {
    const o = i * n;
    let s = d[i]! - x[i]!;
    let rowAbs = 0;
    for (let j = 0; j < n; j++) {
      const aij = data[o + j]!;
      s += aij * x[j]!;
      rowAbs += Math.abs(j === i ? 1 - aij : aij);
    }
    r = Math.max(r, Math.abs(s));
    xn = Math.max(xn, Math.abs(x[i]!));
    dn = Math.max(dn, Math.abs(d[i]!));
    norm = Math.max(norm, rowAbs);
  }
  const den = norm * xn + dn;
  return den === 0 ? 0 : r / den;
}
