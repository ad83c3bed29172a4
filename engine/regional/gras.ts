/**
 * GRAS (Junius & Oosterhaven 2003, with the correction of Lenzen, Wood & Gallego 2007): RAS for
 * matrices with negative entries (taxes less subsidies, changes in inventories), scaling the
 * positive entries by rᵢsⱼ and the negative ones by 1/(rᵢsⱼ), so every entry keeps its sign.
 * The iteration and its reports are in `scaling.ts`; on a non-negative matrix it is RAS.
 */
import type { Matrix } from '../linalg/matrix';
import type { BalanceOptions, BalanceResult } from './scaling';
import { scale } from './scaling';

export const GRAS_ABOUT = 'GRAS: RAS for tables with negative entries; positive entries scale by rᵢsⱼ and negative ones by 1/(rᵢsⱼ), so every entry keeps its sign.';

export function gras(A: Matrix, rowTotals: ArrayLike<number>, columnTotals: ArrayLike<number>, options: BalanceOptions = {}): BalanceResult {
  return scale('gras', A, rowTotals, columnTotals, options);
}
