/**
 * Flegg's location quotient (Flegg, Webber & Elliott 1995; Flegg & Webber 1997):
 *
 *     FLQᵢⱼ = CILQᵢⱼ · λ  (i ≠ j),   FLQᵢᵢ = SLQᵢ · λ,   λ = [log₂(1 + eᴿ / eᴺ)]^δ
 *
 * λ ≤ 1 shrinks the quotients more the smaller the region (eᴿ / eᴺ its share of the nation's
 * employment, or of the basis used); δ in [0, 1) sets how much (0.3 is the common default;
 * δ = 0 gives the CILQ with SLQ on the diagonal, and a region that is the whole nation has λ = 1).
 * Regional coefficients rᵢⱼ = aᵢⱼ · min(1, FLQᵢⱼ).
 *
 * @example
 * // a region with a tenth of the nation's jobs, δ = 0.3 (by hand)
 * flqLambda(0.1, 0.3) // log2(1.1)^0.3 = 0.137503^0.3 ≈ 0.5513
 */
import { InputError } from '../errors';
import type { Matrix } from '../linalg/matrix';
import type { RegionalBasis } from './basis';
import { total } from './basis';
import { crossQuotients } from './cilq';
import { slq } from './slq';

export const FLQ_ABOUT = "Flegg's location quotient: the cross-industry quotient scaled down by λ = [log2(1 + regional/national size)]^δ, more for smaller regions.";

/** The common default of δ (Flegg & Webber 1997 and later studies). */
export const DEFAULT_DELTA = 0.3;

/** Check δ: a finite number in [0, 1]. */
export function checkDelta(delta: number): void {
  if (!Number.isFinite(delta) || delta < 0 || delta > 1) {
    throw new InputError('bad-delta', `δ is ${delta}; it must be a number from 0 to 1`, { text: String(delta) }, 'The common default is 0.3');
  }
}

/** λ = [log₂(1 + share)]^δ for the region's share of the nation. */
export function flqLambda(share: number, delta: number): number {
  checkDelta(delta);
  return Math.pow(Math.log2(1 + share), delta);
}

/** The region's share of the nation in the basis, eᴿ / eᴺ. */
export function regionShare(b: Pick<RegionalBasis, 'region' | 'nation'>): number {
  return total(b.region) / total(b.nation);
}

/** The n × n matrix of FLQᵢⱼ and its λ. */
export function flq(b: Pick<RegionalBasis, 'region' | 'nation'>, delta = DEFAULT_DELTA): { Q: Matrix; lambda: number } {
  const lambda = flqLambda(regionShare(b), delta);
  const Q = crossQuotients(slq(b));
  for (let k = 0; k < Q.data.length; k++) Q.data[k] = Q.data[k]! * lambda;
  return { Q, lambda };
}
