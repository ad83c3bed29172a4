/**
 * Multipliers per measure. For a measure with coefficients c (per unit of output):
 *
 *   direct   = c                       the first-round effect of one unit of final demand
 *   simple   = c′L                     direct + indirect (open model); one transposed solve
 *   indirect = c′L − c
 *   total    = c′L̄                     direct + indirect + induced (closed for households)
 *   induced  = c′L̄ − c′L
 *   Type I   = simple ÷ direct,  Type II = total ÷ direct
 *
 * L̄ is the n × n block of the closed model's inverse (see household.ts); the household row is
 * not counted in any total. For the output measure c = 1, so direct = 1 and the simple
 * multipliers are the column sums of L. Type I and Type II are not defined where the direct
 * coefficient is 0: there they are NaN and a note names the sectors. A sector with no output
 * (xⱼ = 0) has no coefficients to multiply: all its multipliers are NaN (blank) and a note
 * (`no-output`) names it.
 *
 * The rounds of the indirect effect (`rounds: true`; paragraphs 20-25 of the Australian Bureau
 * of Statistics' information paper 5246.0 name them):
 *
 *   first round   = c′A                the purchases the first unit of demand sets off, weighted
 *                                       by the measure (for output, the column sums of A)
 *   later rounds  = indirect − c′A     industrial support: every round after the first
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import type { ClosedModel, Models } from './household';
import type { LeontiefModel } from './leontief';
import type { Matrix } from './linalg/matrix';
import type { Measure, MeasureInfo } from './measures';
import { axisCopy, CAUTIONS, checkMeasure, measureInfo, multiplierUnit } from './measures';
import type { Axis } from './table';

export const MULTIPLIERS_ABOUT =
  'Multipliers: the effect on the measure, across the whole economy, of one more unit of final demand for each sector (simple = direct + indirect; total adds the induced household spending).';

export interface Multipliers {
  about: string;
  measure: MeasureInfo;
  /** The sectors whose final demand rises by one unit (one value per sector in each array). */
  sectors: Axis;
  /** The unit of every multiplier: the measure's unit per money unit of final demand. */
  unit: string;
  direct: Float64Array;
  indirect: Float64Array;
  /** Direct + indirect (open model). */
  simple: Float64Array;
  /** Induced (closed model); absent without a household closure. */
  induced?: Float64Array;
  /** Direct + indirect + induced; absent without a household closure. */
  total?: Float64Array;
  /** c′A: the first round of the indirect effect (with `rounds: true`). */
  firstRound?: Float64Array;
  /** indirect − c′A: the later rounds (industrial support; with `rounds: true`). */
  laterRounds?: Float64Array;
  /** simple ÷ direct (NaN where direct is 0, named in `findings`). */
  typeI: Float64Array;
  /** total ÷ direct; absent without a household closure. */
  typeII?: Float64Array;
  findings: Finding[];
  cautions: readonly string[];
}

export interface MultiplierOptions {
  /** Split the indirect effect into the first round and the later rounds. */
  rounds?: boolean;
  /** Total output by sector: sectors with none get blank multipliers and a note. */
  output?: ArrayLike<number>;
}

/** The indices of the sectors with no output (xⱼ = 0). */
export function noOutputSectors(x: ArrayLike<number> | undefined): number[] {
  const out: number[] = [];
  if (x) for (let j = 0; j < x.length; j++) if (x[j] === 0) out.push(j);
  return out;
}

/** Multipliers of one measure from the open model and, when given, the closed one. */
export function multipliersOf(sectors: Axis, open: LeontiefModel, measure: Measure, closed?: ClosedModel, options: MultiplierOptions = {}): Multipliers {
  const n = open.n;
  if (sectors.codes.length !== n) throw new InputError('bad-size', `there are ${sectors.codes.length} sector codes for a model of ${n} sectors`);
  checkMeasure(measure, n);
  if (closed && closed.open !== open) throw new InputError('bad-model', 'the closed model was built on a different open model');
  const c = measure.coefficients;
  const simple = open.weighted(c);
  const direct = Float64Array.from(c);
  const indirect = new Float64Array(n);
  const typeI = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    indirect[j] = simple[j]! - direct[j]!;
    typeI[j] = direct[j] !== 0 ? simple[j]! / direct[j]! : NaN;
  }
  const out: Multipliers = {
    about: MULTIPLIERS_ABOUT,
    measure: measureInfo(measure),
    sectors: axisCopy(sectors),
    unit: multiplierUnit(measure),
    direct,
    indirect,
    simple,
    typeI,
    findings: [],
    cautions: CAUTIONS,
  };
  if (closed) {
    const total = closed.extendWeighted(simple).sectors;
    const induced = new Float64Array(n);
    const typeII = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      induced[j] = total[j]! - simple[j]!;
      typeII[j] = direct[j] !== 0 ? total[j]! / direct[j]! : NaN;
    }
    out.total = total;
    out.induced = induced;
    out.typeII = typeII;
  }
  if (options.rounds) {
    const A = open.A;
    const first = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const ci = c[i]!;
      if (ci === 0) continue;
      const o = i * n;
      for (let j = 0; j < n; j++) first[j] += ci * A.data[o + j]!;
    }
    const later = new Float64Array(n);
    for (let j = 0; j < n; j++) later[j] = indirect[j]! - first[j]!;
    out.firstRound = first;
    out.laterRounds = later;
  }
  const none = noOutputSectors(options.output);
  if (none.length) {
    for (const arr of [out.direct, out.indirect, out.simple, out.typeI, out.total, out.induced, out.typeII, out.firstRound, out.laterRounds]) if (arr) for (const j of none) arr[j] = NaN;
    out.findings.push({
      code: 'no-output',
      severity: 'note',
      message: `${none.length} sector${none.length > 1 ? 's have' : ' has'} no output (${none
        .slice(0, 10)
        .map((j) => `'${sectors.codes[j]}'`)
        .join(', ')}${none.length > 10 ? ', …' : ''}): no coefficients, so no multipliers; they are left blank (NaN)`,
      where: { sectors: none.map((j) => sectors.codes[j]!) },
      data: { sectors: none.map((j) => sectors.codes[j]!) },
    });
  }
  const noneSet = new Set(none);
  const zero = [...direct.keys()].filter((j) => direct[j] === 0 && !noneSet.has(j));
  if (zero.length) {
    out.findings.push({
      code: 'no-direct-effect',
      severity: 'note',
      message: `Type I${closed ? ' and Type II' : ''} ${measure.label.toLowerCase()} multipliers are not defined for ${zero.length} sector${zero.length > 1 ? 's' : ''} with no direct ${measure.label.toLowerCase()}: ${zero
        .slice(0, 10)
        .map((j) => `'${sectors.codes[j]}'`)
        .join(', ')}${zero.length > 10 ? ', …' : ''}; they are left blank (NaN)`,
      where: { sectors: zero.map((j) => sectors.codes[j]!) },
      data: { sectors: zero.map((j) => sectors.codes[j]!) },
    });
  }
  return out;
}

/** Multipliers for every measure, on the models built once by `buildModels`. */
export function multipliers(models: Models, measures: readonly Measure[], options: Omit<MultiplierOptions, 'output'> = {}): Multipliers[] {
  return measures.map((m) => multipliersOf(models.table.sectors, models.open, m, models.closed, { ...options, output: models.table.x }));
}

export const REQUIREMENTS_MULTIPLIERS_ABOUT =
  'Multipliers read from a total-requirements matrix: the weighted column sums, the effect on the measure of one unit of final demand for each column product (with unit weights, the output multipliers).';

export interface RequirementsMultipliers {
  about: string;
  /** The columns of the requirements matrix (the products whose final demand changes). */
  sectors: Axis;
  measure: { code: string; label: string; unit: string };
  /** w′R, one value per column. */
  simple: Float64Array;
}

/**
 * Multipliers from any total-requirements matrix R (rows: the producing industries or
 * commodities; columns: the products delivered to final demand), such as the
 * industry-by-commodity requirements W(I − BW)⁻¹ of supply-use tables: w′R, where w weights
 * the rows (by default 1, so the result is the column sums: output multipliers).
 */
export function requirementsMultipliers(
  R: Matrix,
  columns: Axis,
  options: { weights?: ArrayLike<number>; measure?: { code: string; label: string; unit: string } } = {},
): RequirementsMultipliers {
  if (columns.codes.length !== R.cols) throw new InputError('bad-size', `there are ${columns.codes.length} column codes for a requirements matrix with ${R.cols} columns`);
  const w = options.weights;
  if (w && w.length !== R.rows) throw new InputError('bad-size', `there are ${w.length} weights for a requirements matrix with ${R.rows} rows`);
  const simple = new Float64Array(R.cols);
  for (let i = 0; i < R.rows; i++) {
    const wi = w ? w[i]! : 1;
    if (!Number.isFinite(wi)) throw new InputError('non-finite', `weight ${i + 1} is ${wi}, not a finite number`, { row: i + 1 });
    if (wi === 0) continue;
    const o = i * R.cols;
    for (let j = 0; j < R.cols; j++) simple[j] += wi * R.data[o + j]!;
  }
  return {
    about: REQUIREMENTS_MULTIPLIERS_ABOUT,
    sectors: axisCopy(columns),
    measure: options.measure ?? { code: 'output', label: 'Output', unit: 'per unit of final demand' },
    simple,
  };
}
