/**
 * The two-region model: the region R and the rest of the nation S (national minus regional),
 * with interregional trade (Miller & Blair 2009, ch. 3), from the same quotient estimates.
 *
 * Rᴿᴿ is the region's own coefficients by the chosen method; Rˢˢ the same method applied to the
 * rest of the nation (basis eᴺ − eᴿ); trade is what each buys from the other, Rˢᴿ = A − Rᴿᴿ and
 * Rᴿˢ = A − Rˢˢ (a domestic national table; imports from abroad are outside A already). With
 *
 *     A₂ = [ Rᴿᴿ  Rᴿˢ ]        x₂ = (I − A₂)⁻¹ [ Δfᴿ ]
 *          [ Rˢᴿ  Rˢˢ ]                          [ Δfˢ ]
 *
 * the blocks of each column sum to A, so xᴿ + xˢ = L (Δfᴿ + Δfˢ): the two regions' total output
 * is the national model's. For a demand change in R only, the region's output splits into the
 * intraregional effect (I − Rᴿᴿ)⁻¹ Δfᴿ (the single-region model) and the interregional feedback
 * xᴿ − (I − Rᴿᴿ)⁻¹ Δfᴿ (R's sales to S that come back as S's purchases from R); the output of S is
 * the spillover.
 */
import { InputError } from '../errors';
import { LeontiefModel } from '../leontief';
import type { Matrix } from '../linalg/matrix';
import { zeros } from '../linalg/matrix';
import type { Axis, Table } from '../table';
import type { RegionalBasis } from './basis';
import { total } from './basis';
import type { RegionaliseOptions, RegionalCoefficients } from './regionalise';
import { regionalCoefficients } from './regionalise';

export const TWO_REGION_ABOUT =
  "The region and the rest of the nation with trade between them: a demand change in the region raises the region's output directly and indirectly (intraregional), raises the rest of the nation's output through the region's purchases from it (spillover), and comes back as the rest of the nation buys from the region (feedback).";

export interface TwoRegionSplit {
  sectors: Axis;
  /** (I − Rᴿᴿ)⁻¹ Δfᴿ by sector of the region. */
  intraregional: Float64Array;
  /** xᴿ − intraregional, by sector of the region. */
  feedback: Float64Array;
  /** xˢ, by sector of the rest of the nation. */
  spillover: Float64Array;
  /** xᴿ (intraregional + feedback). */
  region: Float64Array;
  totals: { intraregional: number; feedback: number; spillover: number; region: number; nation: number };
}

export class TwoRegionModel {
  readonly n: number;
  readonly sectors: Axis;
  /** The 2n × 2n coefficients, region first. */
  readonly A: Matrix;
  readonly region: RegionalCoefficients;
  readonly rest: RegionalCoefficients;
  private readonly model: LeontiefModel;
  private readonly single: LeontiefModel;

  constructor(t: Table, b: RegionalBasis, o: RegionaliseOptions) {
    const n = t.sectors.codes.length;
    const restBasis: RegionalBasis = { kind: b.kind, unit: b.unit, name: 'rest of the nation', region: new Float64Array(n), nation: Float64Array.from(b.nation) };
    for (let i = 0; i < n; i++) restBasis.region[i] = Math.max(0, b.nation[i]! - b.region[i]!);
    if (!(total(restBasis.region) > 0)) {
      throw new InputError('region-is-nation', 'the region is the whole nation, so there is no rest of the nation for a two-region model', {}, 'Use the single-region table');
    }
    this.n = n;
    this.sectors = { codes: [...t.sectors.codes], labels: [...t.sectors.labels] };
    this.region = regionalCoefficients(t, b, o);
    this.rest = regionalCoefficients(t, restBasis, o);
    const N = 2 * n;
    const A2 = zeros(N, N);
    const nat = this.region.national.data;
    const rr = this.region.A.data;
    const ss = this.rest.A.data;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const a = nat[i * n + j]!;
        A2.data[i * N + j] = rr[i * n + j]!;
        A2.data[(n + i) * N + j] = a - rr[i * n + j]!;
        A2.data[(n + i) * N + n + j] = ss[i * n + j]!;
        A2.data[i * N + n + j] = a - ss[i * n + j]!;
      }
    }
    this.A = A2;
    this.model = new LeontiefModel(A2);
    this.single = new LeontiefModel(this.region.A);
  }

  /** Outputs of both regions for final demand in each (region first, then the rest). */
  solve(dR: ArrayLike<number>, dS?: ArrayLike<number>): { region: Float64Array; rest: Float64Array } {
    const n = this.n;
    const d = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) {
      d[i] = dR[i]!;
      d[n + i] = dS ? dS[i]! : 0;
    }
    const x = this.model.solve(d);
    return { region: x.slice(0, n), rest: x.slice(n) };
  }

  /** A demand change in the region split into intraregional, feedback and spillover effects. */
  split(dR: ArrayLike<number>): TwoRegionSplit {
    const { region, rest } = this.solve(dR);
    const intra = this.single.solve(dR);
    const feedback = new Float64Array(this.n);
    for (let i = 0; i < this.n; i++) feedback[i] = region[i]! - intra[i]!;
    const totals = { intraregional: total(intra), feedback: total(feedback), spillover: total(rest), region: total(region), nation: total(region) + total(rest) };
    return { sectors: this.sectors, intraregional: intra, feedback, spillover: rest, region, totals };
  }
}
