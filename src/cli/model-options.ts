/**
 * Options shared by the analysis commands: the household closure for Type II (the engine's
 * guesses from labels are the defaults, and the report says which were guessed), and the
 * measures (jobs satellite, other satellites, value-added rows).
 */
import { InputError } from '../../engine/errors';
import type { HouseholdOptions, Models } from '../../engine/household';
import { buildModels, householdClosure, CLOSURE_BASES, closureBasis, guessHouseholdColumn, guessLabourIncomeRow } from '../../engine/household';
import type { ClosureBasis } from '../../engine/household';
import type { Conventions } from '../../engine/conventions';
import { conventionLines, conventions } from '../../engine/conventions';
import { LeontiefModel } from '../../engine/leontief';
import type { Measure } from '../../engine/measures';
import { findMeasure, guessJobs, measures } from '../../engine/measures';
import type { Table } from '../../engine/table';
import type { ReportSetting } from '../report/model';
import { modelAssumptions, setting } from '../report/model';
import { closureSettings, roundsSetting } from '../report/closure-settings';
import { ChecksFailed, UsageError } from './errors';

// Declared in ./options (loaded at start-up without the engine's models).
export { modelOptions } from './options';

export interface ModelFlags {
  household?: boolean;
  householdColumn?: string;
  labourIncomeRow?: string;
  propensity?: string;
  householdBasis?: string;
  householdIncome?: string;
  householdOwnPurchases?: string;
  split?: string;
  jobs?: string;
  satellites?: string;
  valueAddedRows?: string;
  measure?: string;
}

export function list(v: string | undefined): string[] | undefined {
  if (v === undefined) return undefined;
  const items = v
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  return items;
}

export interface PreparedModels {
  models: Models;
  measures: Measure[];
  settings: ReportSetting[];
  assumptions: string[];
  /** Whether Type II is available, and why not. */
  closure: 'closed' | 'not-found' | 'off';
  /** The conventions behind the results (also in `assumptions`). */
  conventions: Conventions;
  /** Split the indirect effect into rounds (--split rounds). */
  rounds: boolean;
}

/** Build the open model, the household closure (given, guessed or off) and the measures. */
export function prepareModels(t: Table, f: ModelFlags, file?: string): PreparedModels {
  const settings: ReportSetting[] = [];
  let household: HouseholdOptions | undefined;
  let state: PreparedModels['closure'] = 'off';
  const rows = list(f.labourIncomeRow);
  const closureFlags = ['householdColumn', 'labourIncomeRow', 'propensity', 'householdIncome', 'householdBasis', 'householdOwnPurchases'] as const;
  if (f.household === false) {
    const given = closureFlags.filter((k) => f[k] !== undefined);
    if (given.length) throw new UsageError(`--no-household cannot be combined with ${given.map((k) => `--${k.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`).join(', ')}`, 'conflict');
    settings.push(setting('household', 'Household closure (Type II)', 'off', 'given', 'Open model only: no induced effects, so every total, induced and Type II figure is blank (null)'));
  } else {
    const column = f.householdColumn ?? guessHouseholdColumn(t);
    const income = rows ?? (guessLabourIncomeRow(t) !== undefined ? [guessLabourIncomeRow(t)!] : undefined);
    if (column !== undefined && income !== undefined && income.length) {
      household = { income, consumption: column, ...closureFigures(f) };
      state = 'closed';
      settings.push(setting('householdColumn', 'Household consumption column', column, f.householdColumn ? 'given' : 'guessed'));
      settings.push(setting('labourIncomeRow', 'Labour-income row(s)', income.join(', '), rows ? 'given' : 'guessed'));
    } else {
      if (closureFlags.some((k) => f[k] !== undefined)) {
        const missing = column === undefined ? '--household-column' : '--labour-income-row';
        throw new UsageError(`the Type II closure needs both a household column and a labour-income row; ${missing} could not be guessed from the labels`, 'closure-incomplete', `Give ${missing}, or --no-household for the open model`);
      }
      state = 'not-found';
      settings.push(setting('household', 'Household closure (Type II)', 'not found', 'guessed', `No household column and labour-income row could be told apart with confidence (${column === undefined ? 'no single household column' : 'no single labour-income row'}), so there is no closure and no Type II: choose them with --household-column and --labour-income-row, and the basis with --household-basis, --household-income or --propensity`));
    }
  }
  let models: Models;
  try {
    models = buildModels(t, household ? { household } : {});
  } catch (e) {
    if (e instanceof InputError && e.code === 'household-not-productive') {
      // Not an input error: the closed model fails its checks (exit 1), with the finding that names the sectors.
      const finding = householdClosureFinding(t, LeontiefModel.fromTable(t), household!);
      throw new ChecksFailed(file ?? t.meta.title ?? 'the table', [finding]);
    }
    throw e;
  }
  if (models.closure) {
    settings.push(...closureSettings(models.closure, { basisGiven: !!f.householdBasis || f.propensity !== undefined || f.householdIncome !== undefined, propensity: household!.propensity }));
  }
  const jobs = f.jobs ?? guessJobs(t);
  const all = measures(t, {
    ...(f.valueAddedRows ? { valueAdded: list(f.valueAddedRows)! } : {}),
    ...(household ? { labourIncome: household.income } : rows ? { labourIncome: rows } : {}),
    ...(jobs !== undefined ? { jobs } : {}),
    ...(f.satellites !== undefined ? { satellites: list(f.satellites)! } : {}),
    guess: true,
  });
  settings.push(setting('jobs', 'Jobs satellite', jobs ?? null, f.jobs ? 'given' : jobs !== undefined ? 'guessed' : 'default', jobs === undefined ? 'No satellite could be identified as jobs' : undefined));
  settings.push(setting('valueAddedRows', 'Value-added rows counted as value added', f.valueAddedRows ?? (t.valueAdded.codes.length ? 'all' : 'none in the table'), f.valueAddedRows ? 'given' : 'default'));
  settings.push(setting('satellites', 'Satellites counted', f.satellites ?? (t.satellites.length ? t.satellites.map((s) => s.code).join(', ') : 'none in the table'), f.satellites ? 'given' : 'default'));
  let chosen = all;
  if (f.measure !== undefined) {
    const codes = list(f.measure)!;
    if (!codes.length) throw new UsageError('--measure needs at least one measure code', 'bad-measure');
    chosen = codes.map((c) => findMeasure(all, c));
  }
  settings.push(setting('measures', 'Measures', chosen.map((m) => m.code).join(', '), f.measure ? 'given' : 'default'));
  const conv = conventions(models, chosen, { typeII: state });
  const rounds = splitRounds(f.split);
  if (rounds) settings.push(roundsSetting());
  const assumptions = [...modelAssumptions(t, models.closure, { typeII: state }), ...conventionLines(conv, { closure: false, rounds })];
  return { models, measures: chosen, settings, assumptions, closure: state, conventions: conv, rounds };
}

/** --split: only `rounds` is known. */
export function splitRounds(v: string | undefined): boolean {
  if (v === undefined) return false;
  if (v.trim() !== 'rounds') throw new UsageError(`--split must be 'rounds'; got '${v}'`, 'bad-split', 'Give --split rounds to show the first round and the later rounds of the indirect effect');
  return true;
}

/** The closure basis and its figures from the flags, checked (a bad number is a usage error). */
function closureFigures(f: ModelFlags): Pick<HouseholdOptions, 'basis' | 'propensity' | 'householdIncome' | 'ownPurchases'> {
  const out: Pick<HouseholdOptions, 'basis' | 'propensity' | 'householdIncome' | 'ownPurchases'> = {};
  if (f.propensity !== undefined) {
    const p = Number(f.propensity);
    if (f.propensity.trim() === '' || !Number.isFinite(p) || p < 0 || p > 1) throw new UsageError(`--propensity must be a share from 0 to 1; got '${f.propensity}'`, 'bad-propensity');
    out.propensity = p;
  }
  if (f.householdIncome !== undefined) {
    const v = Number(f.householdIncome);
    if (f.householdIncome.trim() === '' || !Number.isFinite(v) || v <= 0) throw new UsageError(`--household-income must be a positive amount in the table's money units; got '${f.householdIncome}'`, 'bad-household-income');
    out.householdIncome = v;
  }
  if (f.householdOwnPurchases !== undefined) {
    const v = Number(f.householdOwnPurchases);
    if (f.householdOwnPurchases.trim() === '' || !Number.isFinite(v) || v < 0) throw new UsageError(`--household-own-purchases must be an amount of 0 or more; got '${f.householdOwnPurchases}'`, 'bad-own-purchases');
    out.ownPurchases = v;
  }
  if (f.householdBasis !== undefined) {
    if (!(CLOSURE_BASES as readonly string[]).includes(f.householdBasis)) throw new UsageError(`--household-basis must be one of ${CLOSURE_BASES.join(', ')}; got '${f.householdBasis}'`, 'bad-closure-basis');
    out.basis = f.householdBasis as ClosureBasis;
  }
  if (out.propensity !== undefined && out.householdIncome !== undefined) throw new UsageError('give --propensity or --household-income, not both', 'conflict');
  const basis = closureBasis(out);
  if (basis === 'propensity' && out.propensity === undefined) throw new UsageError('--household-basis propensity needs --propensity', 'closure-incomplete');
  if (basis === 'household-income' && out.householdIncome === undefined) throw new UsageError('--household-basis household-income needs --household-income', 'closure-incomplete');
  if ((out.propensity !== undefined && basis !== 'propensity') || (out.householdIncome !== undefined && basis !== 'household-income')) {
    throw new UsageError(`--household-basis ${basis} does not use ${out.propensity !== undefined ? '--propensity' : '--household-income'}`, 'conflict');
  }
  return out;
}

/** The error finding of a closure that is not productive (the engine names the sectors and the remedy). */
function householdClosureFinding(t: Table, open: LeontiefModel, h: HouseholdOptions) {
  const c = householdClosure(t, open, h);
  const f = c.findings.find((x) => x.code === 'household-not-productive')!;
  return { ...f, message: `${f.message} On the command line: --propensity below ${c.share.toPrecision(3)}, --household-income above ${(c.denominator * (1 - c.schur)).toPrecision(6)}, another --labour-income-row, or --no-household.` };
}
