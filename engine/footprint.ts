/**
 * Consumption-based footprints of a measure (usually a satellite: emissions, water, energy,
 * jobs). With e the measure's coefficients per unit of output and F the final demand (n × k):
 *
 *   intensity   m′ = e′L                 what one unit of final demand for each product carries,
 *                                        along its whole supply chain (one transposed solve)
 *   by category     m′F_{:,c}            the footprint of each final-demand category
 *   by sector of final demand  mⱼ Σ_c Fⱼ꜀ the footprint of final demand for each product
 *   by sector and category     mⱼ Fⱼ꜀
 *   by origin       e ⊙ L f              where the footprint arises (f = F i; one solve)
 *   total           e′L f
 *
 * The production-based total e′x is given beside it; the two agree when L f = x (a balanced
 * table with no other final uses). Imports are not followed abroad: the model is of one
 * economy, so what imported goods carry is not counted.
 */
import { InputError } from './errors';
import type { Models } from './household';
import type { LeontiefModel } from './leontief';
import type { Matrix } from './linalg/matrix';
import { zeros } from './linalg/matrix';
import type { Measure, MeasureInfo } from './measures';
import { axisCopy, CAUTIONS, checkMeasure, measureInfo } from './measures';
import type { Axis, Table } from './table';

export const FOOTPRINT_ABOUT =
  'Footprint: the measure (such as emissions) carried along the whole supply chain by final demand, counted where the demand is (by category and by product bought) rather than where production happens.';

export const FOOTPRINT_CAUTION = 'Single-economy footprint: what imported goods and services carry abroad is not counted.';

export interface Footprint {
  about: string;
  measure: MeasureInfo;
  /** The unit of every total: the measure's unit. */
  unit: string;
  sectors: Axis;
  categories: Axis;
  /** e′L, in the measure's unit per money unit of final demand. */
  intensity: Float64Array;
  /** By final-demand category (length k). */
  byCategory: Float64Array;
  /** By sector of final demand (length n). */
  bySector: Float64Array;
  /** By sector (rows) and category (columns), n × k. */
  bySectorAndCategory: Matrix;
  /** By sector of origin (length n): e ⊙ L f. */
  byOrigin: Float64Array;
  /** e′L f. */
  total: number;
  /** e′x, the production-based total. */
  production: number;
  cautions: readonly string[];
}

function footprintWith(t: Table, model: LeontiefModel, measure: Measure, lf: Float64Array): Footprint {
  const n = t.x.length;
  const k = t.F.cols;
  checkMeasure(measure, n);
  const e = measure.coefficients;
  const m = model.weighted(e);
  const byCategory = new Float64Array(k);
  const bySector = new Float64Array(n);
  const both = zeros(n, k);
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < k; c++) {
      const v = m[i]! * t.F.data[i * k + c]!;
      both.data[i * k + c] = v;
      byCategory[c] += v;
      bySector[i] += v;
    }
  }
  const byOrigin = new Float64Array(n);
  let total = 0;
  let production = 0;
  for (let i = 0; i < n; i++) {
    byOrigin[i] = e[i]! * lf[i]!;
    total += bySector[i]!;
    production += e[i]! * t.x[i]!;
  }
  return {
    about: FOOTPRINT_ABOUT,
    measure: measureInfo(measure),
    unit: measure.unit,
    sectors: axisCopy(t.sectors),
    categories: axisCopy(t.finalDemand),
    intensity: m,
    byCategory,
    bySector,
    bySectorAndCategory: both,
    byOrigin,
    total,
    production,
    cautions: [FOOTPRINT_CAUTION, ...CAUTIONS],
  };
}

function totalDemand(t: Table): Float64Array {
  const n = t.x.length;
  const k = t.F.cols;
  const f = new Float64Array(n);
  for (let i = 0; i < n; i++) for (let c = 0; c < k; c++) f[i] += t.F.data[i * k + c]!;
  return f;
}

/** The footprint of one measure. */
export function footprint(t: Table, model: LeontiefModel, measure: Measure): Footprint {
  if (model.n !== t.x.length) throw new InputError('bad-size', `the model has ${model.n} sectors but the table has ${t.x.length}`);
  if (!t.F.cols) throw new InputError('no-final-demand', 'the table has no final-demand columns, so there is no consumption to attribute a footprint to');
  return footprintWith(t, model, measure, model.solve(totalDemand(t)));
}

/** Footprints of several measures, sharing one solve for the output of final demand. */
export function footprints(models: Models, measures: readonly Measure[]): Footprint[] {
  const { table: t, open } = models;
  if (!t.F.cols) throw new InputError('no-final-demand', 'the table has no final-demand columns, so there is no consumption to attribute a footprint to');
  const lf = open.solve(totalDemand(t));
  return measures.map((m) => footprintWith(t, open, m, lf));
}
