/**
 * Simple location quotient (Miller & Blair 2009, ch. 8):
 *
 *     SLQᵢ = (eᵢᴿ / eᴿ) / (eᵢᴺ / eᴺ)
 *
 * the sector's share of the region's employment (or output, or earnings) over its share of the
 * nation's. A sector with SLQᵢ ≥ 1 is taken to meet the region's needs for its product; below 1,
 * the region buys the rest from outside: rᵢⱼ = aᵢⱼ · min(1, SLQᵢ), one quotient per row.
 * A sector the nation does not have gets 0 (the region has none either; `checkBasis`).
 *
 * @example
 * // region 20 of 100 jobs in sector 1 and 80 in sector 2; nation 300 and 700
 * slq(basis) // [0.2 / 0.3, 0.8 / 0.7] ≈ [0.667, 1.143]
 */
import type { RegionalBasis } from './basis';
import { total } from './basis';

export const SLQ_ABOUT = "Simple location quotient: a sector's share of regional activity over its share of national activity; below 1 the region is taken to import the rest of that input.";

/** SLQᵢ for every sector. */
export function slq(b: Pick<RegionalBasis, 'region' | 'nation'>): Float64Array {
  const n = b.region.length;
  const er = total(b.region);
  const en = total(b.nation);
  const q = new Float64Array(n);
  for (let i = 0; i < n; i++) q[i] = b.nation[i]! > 0 ? (b.region[i]! / er) / (b.nation[i]! / en) : 0;
  return q;
}
