/**
 * Cross-industry location quotient (Miller & Blair 2009, ch. 8):
 *
 *     CILQᵢⱼ = SLQᵢ / SLQⱼ   (i ≠ j),   CILQᵢᵢ = SLQᵢ
 *
 * the selling sector i's relative size against the buying sector j's: a seller relatively larger
 * than its buyer is taken to meet the buyer's needs. On the diagonal the quotient is SLQᵢ, as
 * Smith & Morrison (1974) proposed and Flegg's FLQ keeps (the ratio would always be 1).
 * Regional coefficients rᵢⱼ = aᵢⱼ · min(1, CILQᵢⱼ). Where the buyer is absent from the region
 * (SLQⱼ = 0) the quotient is +∞ (capped to 1; that column has no regional output anyway); where
 * the seller is absent (SLQᵢ = 0) it is 0.
 */
import type { Matrix } from '../linalg/matrix';
import { zeros } from '../linalg/matrix';
import type { RegionalBasis } from './basis';
import { slq } from './slq';

export const CILQ_ABOUT = "Cross-industry location quotient: the selling sector's location quotient over the buying sector's (the simple quotient on the diagonal).";

/** The n × n matrix of CILQᵢⱼ (row i sells, column j buys). */
export function cilq(b: Pick<RegionalBasis, 'region' | 'nation'>): Matrix {
  return crossQuotients(slq(b));
}

/** SLQᵢ / SLQⱼ off the diagonal, SLQᵢ on it. */
export function crossQuotients(s: Float64Array): Matrix {
  const n = s.length;
  const Q = zeros(n, n);
  for (let i = 0; i < n; i++) {
    const o = i * n;
    const si = s[i]!;
    for (let j = 0; j < n; j++) Q.data[o + j] = i === j ? si : si === 0 ? 0 : s[j]! === 0 ? Infinity : si / s[j]!;
  }
  return Q;
}
