/**
 * Measures: what an impact is counted in. Each measure is a row of coefficients per unit of
 * output, c (length n), so that for any output vector x the measure is c ⊙ x by sector and c′x
 * in total.
 *
 * - `output`: c = 1 (money per money of output).
 * - `value-added`: the sum of chosen value-added rows (by default all of them) ÷ output.
 * - `labour-income`: chosen value-added rows (such as compensation of employees) ÷ output.
 * - `jobs` and `satellite`: a satellite row ÷ output, in the satellite's own unit per money unit.
 *
 * Money measures take their unit from `moneyUnit(table.meta)`; satellites keep their own unit.
 * A sector with zero output has coefficient 0 (see `perUnit`).
 *
 * This file also holds the cautions that every user-facing result carries (`CAUTIONS`).
 */
import { InputError } from './errors';
import type { Axis, ClassedAxis, Table } from './table';
import { isValueAddedRow, moneyUnit, perUnit } from './table';

export type MeasureKind = 'output' | 'value-added' | 'labour-income' | 'jobs' | 'satellite';

/** A measure without its coefficients: what results carry to say what their numbers count. */
export interface MeasureInfo {
  /** `output`, `value-added`, `labour-income`, or the satellite's code. */
  code: string;
  label: string;
  kind: MeasureKind;
  /** The unit an impact is counted in, such as `USD millions` or `FTE jobs`. */
  unit: string;
  /** The unit of a coefficient or multiplier: `FTE jobs per EUR millions`. */
  perUnit: string;
  /** True for measures counted in money (output, value added, labour income). */
  money: boolean;
}

/** The unit of a measure's multipliers: `EUR millions per EUR millions of final demand`, `FTE jobs per EUR millions of final demand`. */
export function multiplierUnit(m: MeasureInfo): string {
  return m.money ? `${m.unit} per ${m.unit} of final demand` : `${m.perUnit.replace(/ of output$/, '')} of final demand`;
}

export interface Measure extends MeasureInfo {
  /** Per unit of output, by sector (length n). */
  coefficients: Float64Array;
  /** The value-added rows or the satellite the measure is built from. */
  from: string[];
  /** One line: what the measure counts. */
  about: string;
}

/** The usual cautions that every user-facing result of an input-output analysis carries. */
export const CAUTIONS: readonly string[] = [
  'Fixed coefficients: every sector is assumed to buy its inputs in fixed proportions, with constant returns to scale and no substitution as prices change.',
  'No capacity limits: supply is assumed to expand without constraint, without crowding out other activity or drawing on idle resources.',
  'Gross, not net: effects are gross; displacement, leakages beyond those in the table and the use of the money elsewhere are not counted.',
  'Not a forecast: results are what-if arithmetic on a table of one year, not a prediction of what will happen.',
  'Review: results that inform decisions about jobs or public money should be reviewed by a qualified economist, following local guidance on appraisal first.',
];

export const MEASURE_ABOUT = 'What an impact is counted in: output, value added, labour income, jobs or a satellite, each as a coefficient per unit of output.';

/** A plain copy of the descriptor of a measure (no coefficients). */
export function measureInfo(m: MeasureInfo): MeasureInfo {
  return { code: m.code, label: m.label, kind: m.kind, unit: m.unit, perUnit: m.perUnit, money: m.money };
}

/** A plain copy of an axis (codes and labels). */
export function axisCopy(a: Axis): Axis {
  return { codes: [...a.codes], labels: [...a.labels] };
}

/** A copy of an axis with its classes, when it has them. */
export function classedAxisCopy<C extends string>(a: ClassedAxis<C>): ClassedAxis<C> {
  const out: ClassedAxis<C> = { codes: [...a.codes], labels: [...a.labels] };
  if (a.classes) out.classes = [...a.classes];
  return out;
}

/** Output itself: coefficient 1 for every sector. */
export function outputMeasure(t: Table): Measure {
  const money = moneyUnit(t.meta);
  return {
    code: 'output',
    label: 'Output',
    kind: 'output',
    unit: money,
    perUnit: `${money} per ${money} of output`,
    money: true,
    coefficients: new Float64Array(t.x.length).fill(1),
    from: [],
    about: 'Gross output: the value of everything the sectors produce, intermediate sales included.',
  };
}

/**
 * The index of a value-added row by code (or label, case-insensitive), or an `InputError`
 * `unknown-value-added-row` that names the row and lists those that exist.
 */
export function valueAddedIndex(t: Table, code: string): number {
  return indexOn(t.valueAdded, code, 'value-added row', 'unknown-value-added-row');
}

/** The index of a final-demand column by code (or label), or an `InputError` `unknown-final-demand-column`. */
export function finalDemandIndex(t: Table, code: string): number {
  return indexOn(t.finalDemand, code, 'final-demand column', 'unknown-final-demand-column');
}

/** The index of a satellite by code (or label), or an `InputError` `unknown-satellite`. */
export function satelliteIndex(t: Table, code: string): number {
  const axis = { codes: t.satellites.map((s) => s.code), labels: t.satellites.map((s) => s.label) };
  return indexOn(axis, code, 'satellite row', 'unknown-satellite');
}

function indexOn(axis: Axis, code: string, what: string, errorCode: string): number {
  if (typeof code !== 'string' || code.trim() === '') {
    throw new InputError(errorCode, `no ${what} was named (got ${JSON.stringify(code)})`, {}, listOf(axis, what));
  }
  let i = axis.codes.indexOf(code);
  if (i < 0) i = axis.codes.findIndex((c) => c.trim() === code.trim());
  if (i < 0) i = axis.labels.findIndex((l) => l.trim().toLowerCase() === code.trim().toLowerCase());
  if (i >= 0) return i;
  const where = what.startsWith('final-demand') ? { columnLabel: code } : { rowLabel: code };
  throw new InputError(errorCode, `the table has no ${what} '${code}'`, { ...where, text: code }, listOf(axis, what));
}

function listOf(axis: Axis, what: string): string {
  if (!axis.codes.length) return `The table has no ${what}s at all`;
  const shown = axis.codes.slice(0, 15).map((c, i) => `'${c}' (${axis.labels[i]})`);
  return `Choose one of: ${shown.join(', ')}${axis.codes.length > 15 ? ', …' : ''}`;
}

function sumRows(t: Table, rows: number[]): Float64Array {
  const n = t.x.length;
  const s = new Float64Array(n);
  for (const r of rows) for (let j = 0; j < n; j++) s[j] += t.V.data[r * n + j]!;
  return s;
}

function rowList(rows: string | string[] | undefined): string[] | undefined {
  if (rows === undefined) return undefined;
  return Array.isArray(rows) ? rows : [rows];
}

/** Value added: the sum of the chosen value-added rows (all rows when none are named) per unit of output. */
export function valueAddedMeasure(t: Table, rows?: string | string[]): Measure {
  const list = rowList(rows);
  if (!t.valueAdded.codes.length) {
    throw new InputError('no-value-added', 'the table has no value-added rows, so value added cannot be measured', {}, 'Add value-added rows (such as compensation of employees) to the table');
  }
  const idx = list ? list.map((r) => valueAddedIndex(t, r)) : t.valueAdded.codes.map((_, i) => i).filter((i) => isValueAddedRow(t, i));
  if (!idx.length && !list) {
    throw new InputError('no-value-added', 'none of the primary-input rows of the table is value added (they are imports, product taxes or the like)', {}, 'Name the value-added rows (--value-added-rows), or class a row as value added in the mapping');
  }
  if (!idx.length) throw new InputError('no-value-added', 'an empty list of value-added rows was given', {}, 'Name at least one value-added row, or none for all of them');
  const left = list ? [] : t.valueAdded.codes.filter((_, i) => !isValueAddedRow(t, i));
  const money = moneyUnit(t.meta);
  const codes = idx.map((i) => t.valueAdded.codes[i]!);
  return {
    code: 'value-added',
    label: 'Value added',
    kind: 'value-added',
    unit: money,
    perUnit: `${money} per ${money} of output`,
    money: true,
    coefficients: perUnit(sumRows(t, idx), t.x),
    from: codes,
    about: list
      ? `Value added counted as the rows ${codes.map((c) => `'${c}'`).join(', ')}, per unit of output.`
      : left.length
        ? `Value added (the rows ${codes.map((c) => `'${c}'`).join(', ')}; ${left.map((c) => `'${c}'`).join(', ')} ${left.length > 1 ? 'are' : 'is'} not value added): the income the sectors generate, per unit of output.`
        : 'Value added (all value-added rows of the table): the income the sectors generate, per unit of output.',
  };
}

/** Labour income: the chosen value-added row or rows (such as compensation of employees) per unit of output. */
export function labourIncomeMeasure(t: Table, rows: string | string[]): Measure {
  const list = rowList(rows)!;
  if (!list.length) throw new InputError('no-labour-income', 'no value-added row was named as labour income', {}, 'Name the row of compensation of employees (or wages and salaries)');
  const idx = list.map((r) => valueAddedIndex(t, r));
  const money = moneyUnit(t.meta);
  const codes = idx.map((i) => t.valueAdded.codes[i]!);
  return {
    code: 'labour-income',
    label: 'Labour income',
    kind: 'labour-income',
    unit: money,
    perUnit: `${money} per ${money} of output`,
    money: true,
    coefficients: perUnit(sumRows(t, idx), t.x),
    from: codes,
    about: `Labour income (the value-added row${codes.length > 1 ? 's' : ''} ${codes.map((c) => `'${c}'`).join(', ')}): pay to workers per unit of output.`,
  };
}

/** A satellite row per unit of output, in the satellite's unit per money unit; `kind` `jobs` marks employment. */
export function satelliteMeasure(t: Table, code: string, kind: 'jobs' | 'satellite' = 'satellite'): Measure {
  const s = t.satellites[satelliteIndex(t, code)]!;
  const money = moneyUnit(t.meta);
  return {
    code: s.code,
    label: s.label,
    kind,
    unit: s.unit,
    perUnit: `${s.unit} per ${money} of output`,
    money: false,
    coefficients: perUnit(s.values, t.x),
    from: [s.code],
    about:
      kind === 'jobs'
        ? `Employment ('${s.label}', in ${s.unit}) per unit of output.`
        : `'${s.label}' (in ${s.unit}) per unit of output.`,
  };
}

export function jobsMeasure(t: Table, code: string): Measure {
  return satelliteMeasure(t, code, 'jobs');
}

/** The satellite that counts jobs, guessed from its code, label or unit; undefined when none or more than one fits. */
export function guessJobs(t: Table): string | undefined {
  const re = /\b(jobs?|employment|employees|employed|fte|full[- ]time equivalents?|workers|persons engaged)\b/i;
  const hits = t.satellites.filter((s) => re.test(s.code) || re.test(s.label) || re.test(s.unit));
  return hits.length === 1 ? hits[0]!.code : undefined;
}

export interface MeasureOptions {
  /** Value-added rows summed for the value-added measure (default: all). */
  valueAdded?: string | string[];
  /** Value-added row or rows counted as labour income. */
  labourIncome?: string | string[];
  /** The satellite that counts jobs. */
  jobs?: string;
  /** Satellites to include (default: all). */
  satellites?: string[];
  /**
   * Guess the labour-income row and the jobs satellite from labels when they are not given
   * (default true). A guess is used only when exactly one row fits.
   */
  guess?: boolean;
}

/**
 * The usual list of measures: output; value added (when the table has value-added rows);
 * labour income (when named, or guessed with confidence); jobs (likewise); every other
 * satellite (or those named).
 */
export function measures(t: Table, options: MeasureOptions = {}): Measure[] {
  const guess = options.guess ?? true;
  const out: Measure[] = [outputMeasure(t)];
  if (t.valueAdded.codes.length) out.push(valueAddedMeasure(t, options.valueAdded));
  const li = options.labourIncome ?? (guess ? guessLabourIncomeRowIn(t) : undefined);
  if (li !== undefined) out.push(labourIncomeMeasure(t, li));
  const jobs = options.jobs ?? (guess ? guessJobs(t) : undefined);
  const jobsIdx = jobs !== undefined ? satelliteIndex(t, jobs) : -1;
  if (jobsIdx >= 0) out.push(jobsMeasure(t, t.satellites[jobsIdx]!.code));
  const sats = options.satellites ? options.satellites.map((c) => satelliteIndex(t, c)) : t.satellites.map((_, i) => i);
  for (const i of sats) if (i !== jobsIdx) out.push(satelliteMeasure(t, t.satellites[i]!.code));
  return out;
}

/** The measure with this code in a list, or an `InputError` `unknown-measure` listing those there are. */
export function findMeasure(list: readonly Measure[], code: string): Measure {
  const m = list.find((x) => x.code === code) ?? list.find((x) => x.label.toLowerCase() === code.toLowerCase());
  if (m) return m;
  throw new InputError('unknown-measure', `there is no measure '${code}'`, { text: code }, `Choose one of: ${list.map((x) => `'${x.code}'`).join(', ')}`);
}

/** Check that a measure fits a table of n sectors. */
export function checkMeasure(m: Measure, n: number): void {
  if (m.coefficients.length !== n) {
    throw new InputError('bad-size', `measure '${m.code}' has ${m.coefficients.length} coefficients for ${n} sectors`);
  }
  for (let j = 0; j < n; j++) {
    if (!Number.isFinite(m.coefficients[j]!)) {
      throw new InputError('non-finite', `measure '${m.code}': the coefficient of sector ${j + 1} is ${m.coefficients[j]}, not a finite number`, { column: j + 1 });
    }
  }
}

/**
 * The labour-income row guessed from the value-added labels (the same rule as
 * `guessLabourIncomeRow` in household.ts, kept here so that measures do not depend on the
 * household closure).
 */
export function guessLabourIncomeRowIn(t: Table): string | undefined {
  return onlyClassed(t.valueAdded, 'compensation') ?? bestMatch(t.valueAdded, LABOUR_INCOME_WORDS, []);
}

/**
 * The one entry of an axis carrying a class, whatever file it came from (the readers class rows
 * and columns from their labels, codes or a mapping); undefined when none or several do. The
 * classes are the first rule of the household guesses, the words the second.
 */
export function onlyClassed<C extends string>(axis: ClassedAxis<C>, c: C): string | undefined {
  const hits = axis.codes.filter((_, i) => axis.classes?.[i] === c);
  return hits.length === 1 ? hits[0] : undefined;
}

/** Word patterns, strongest first; each tier is tried in turn and a tier with one match wins. */
export const LABOUR_INCOME_WORDS: readonly RegExp[][] = [
  [/\bcompensation of employees\b/, /\bemployee compensation\b/, /\blabou?r income\b/, /\bcompensation of labou?r\b/],
  [/\bwages and salaries\b/, /\bwages\b/, /\bsalaries\b/, /\bcompensation\b/, /\bearnings\b/, /\bpayroll\b/],
  // The national-accounts code of compensation of employees (2008 SNA), for tables with codes alone.
  [/(^|\| )d1$/],
];

export const HOUSEHOLD_WORDS: readonly RegExp[][] = [
  [
    /\bhouseholds? (final )?consumption\b/,
    /\bfinal consumption (expenditure )?(of|by) households\b/,
    /\bhouseholds final consumption\b/,
    /\bpersonal consumption\b/,
    /\bprivate (final )?consumption\b/,
  ],
  [/\bhouseholds?\b/, /\bconsumers?\b/],
  // National-accounts codes (2008 SNA: P3 final consumption by S14 households) and the common
  // abbreviation HFCE, for tables with codes alone.
  [/\bp31? s14\b/, /\bhfce\b/],
];

/** Words that exclude a final-demand column from being the household column. */
export const NOT_HOUSEHOLD: readonly RegExp[] = [/\bnon[- ]?profit\b/, /\bnpish\b/, /\bserving households\b/, /\bgovernment\b/];

/**
 * The code on an axis whose label (or code) matches the strongest tier of `tiers` uniquely;
 * undefined when no tier has exactly one match before a tier with several.
 */
export function bestMatch(axis: Axis, tiers: readonly RegExp[][], exclude: readonly RegExp[]): string | undefined {
  const texts = axis.codes.map((c, i) => ({ code: c, text: normalise(`${axis.labels[i] ?? ''} | ${c}`) }));
  const ok = texts.filter((t) => !exclude.some((r) => r.test(t.text)));
  for (const tier of tiers) {
    const hits = ok.filter((t) => tier.some((r) => r.test(t.text)));
    if (hits.length === 1) return hits[0]!.code;
    if (hits.length > 1) return undefined;
  }
  return undefined;
}

function normalise(s: string): string {
  return s
    .toLowerCase()
    .replace(/[’'`]/g, '')
    .replace(/[^a-z0-9|]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
}
