/**
 * Regional purchase coefficients by the supply-demand pool (Miller & Blair 2009, ch. 8):
 *
 *     dᵢᴿ = Σⱼ aᵢⱼ xⱼᴿ + fᵢᴿ,     RPCᵢ = min(1, xᵢᴿ / dᵢᴿ)   (1 where dᵢᴿ = 0)
 *
 * the region's supply of each product (its estimated output xᴿ) against the region's own demand
 * for it (intermediate demand at national coefficients, plus final demand). Where supply falls
 * short, the shortfall is imported: rᵢⱼ = RPCᵢ · aᵢⱼ, one coefficient per row. The region's final
 * demand is, by default, the national final demand without the columns classed as exports, in
 * proportion to the region's share of the basis (its size in employment, output or earnings).
 */
import type { Table } from '../table';
import { coefficients } from '../table';

export const SDP_ABOUT = "Supply-demand pool: each product's regional purchase coefficient is the region's output of it over the region's demand for it, at most 1.";

export interface SdpOptions {
  /** The region's final demand by sector; default: national non-export final demand × `share`. */
  finalDemand?: Float64Array;
  /** The region's share of the nation, for the default final demand. */
  share: number;
}

/** The region's final demand by the default rule: non-export final demand of the nation × share. */
export function regionalFinalDemand(t: Table, share: number): Float64Array {
  const n = t.sectors.codes.length;
  const k = t.finalDemand.codes.length;
  const f = new Float64Array(n);
  for (let c = 0; c < k; c++) {
    if (t.finalDemand.classes?.[c] === 'exports') continue;
    for (let i = 0; i < n; i++) f[i] = f[i]! + t.F.data[i * k + c]!;
  }
  for (let i = 0; i < n; i++) f[i] = f[i]! * share;
  return f;
}

/** RPCᵢ by the supply-demand pool, and the regional demand dᴿ behind it. */
export function sdp(t: Table, xR: Float64Array, options: SdpOptions): { rpc: Float64Array; demand: Float64Array; raw: Float64Array } {
  const n = t.sectors.codes.length;
  const A = coefficients(t);
  const f = options.finalDemand ?? regionalFinalDemand(t, options.share);
  const demand = new Float64Array(n);
  const raw = new Float64Array(n);
  const rpc = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let d = f[i]!;
    const o = i * n;
    for (let j = 0; j < n; j++) d += A.data[o + j]! * xR[j]!;
    demand[i] = d;
    raw[i] = d > 0 ? xR[i]! / d : Infinity;
    // Supply within round-off of its demand meets it (a whole nation's table is balanced only to round-off).
    if (Math.abs(raw[i]! - 1) <= 1e-12) raw[i] = 1;
    rpc[i] = Math.min(1, raw[i]!);
  }
  return { rpc, demand, raw };
}
