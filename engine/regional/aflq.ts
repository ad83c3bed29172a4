/**
 * Augmented FLQ (Flegg & Webber 2000): the FLQ with a regional specialisation term for the buyer,
 *
 *     AFLQᵢⱼ = FLQᵢⱼ · log₂(1 + SLQⱼ)   where SLQⱼ > 1,   AFLQᵢⱼ = FLQᵢⱼ otherwise,
 *
 * so a buying sector concentrated in the region is taken to buy more of its inputs locally.
 * Regional coefficients rᵢⱼ = aᵢⱼ · min(1, AFLQᵢⱼ).
 */
import type { Matrix } from '../linalg/matrix';
import type { RegionalBasis } from './basis';
import { DEFAULT_DELTA, flq } from './flq';
import { slq } from './slq';

export const AFLQ_ABOUT = "Augmented FLQ: Flegg's quotient raised by log2(1 + SLQ) of the buying sector where that sector is more concentrated in the region than in the nation.";

/** The n × n matrix of AFLQᵢⱼ and the FLQ's λ. */
export function aflq(b: Pick<RegionalBasis, 'region' | 'nation'>, delta = DEFAULT_DELTA): { Q: Matrix; lambda: number } {
  const { Q, lambda } = flq(b, delta);
  const s = slq(b);
  const n = s.length;
  for (let j = 0; j < n; j++) {
    if (!(s[j]! > 1)) continue;
    const f = Math.log2(1 + s[j]!);
    for (let i = 0; i < n; i++) Q.data[i * n + j] = Q.data[i * n + j]! * f;
  }
  return { Q, lambda };
}
