/**
 * RAS (Stone; Bacharach 1970; Miller & Blair 2009, ch. 7): a non-negative matrix scaled by rows
 * and columns, X = r̂ A ŝ, to given row and column totals, keeping its pattern of zeros. The
 * iteration and its reports are in `scaling.ts`; a negative entry is an `InputError` that points
 * to GRAS.
 *
 * @example
 * ras(fromRows([[1, 1], [1, 1]]), [3, 1], [2, 2]).X // ≈ [[1.5, 1.5], [0.5, 0.5]]
 */
import type { Matrix } from '../linalg/matrix';
import type { BalanceOptions, BalanceResult } from './scaling';
import { scale } from './scaling';

export const RAS_ABOUT = 'RAS: the table scaled by rows and columns to new row and column totals, each cell keeping its zero or its sign; a first estimate for a year or region without a survey.';

export function ras(A: Matrix, rowTotals: ArrayLike<number>, columnTotals: ArrayLike<number>, options: BalanceOptions = {}): BalanceResult {
  return scale('ras', A, rowTotals, columnTotals, options);
}
