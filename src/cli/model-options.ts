/**
 * Options shared by the analysis commands: the household closure for Type II (the engine's
 * guesses from labels are the defaults, and the report says which were guessed), and the
 * measures (jobs satellite, other satellites, value-added rows).
 */
import type { Command } from 'commander';
import { InputError } from '../../engine/errors';
import type { HouseholdOptions, Models } from '../../engine/household';
import { buildModels, guessHouseholdColumn, guessLabourIncomeRow } from '../../engine/household';
import type { Measure } from '../../engine/measures';
import { findMeasure, guessJobs, measures } from '../../engine/measures';
import type { Table } from '../../engine/table';
import type { ReportSetting } from '../report/model';
import { modelAssumptions, setting } from '../report/model';
import { UsageError } from './errors';

export interface ModelFlags {
  household?: boolean;
  householdColumn?: string;
  labourIncomeRow?: string;
  propensity?: string;
  jobs?: string;
  satellites?: string;
  valueAddedRows?: string;
  measure?: string;
}

/** Add the household and measure options to a command. */
export function modelOptions(cmd: Command): Command {
  return cmd
    .option('--household-column <code>', 'final-demand column of household consumption for the Type II closure (default: guessed from the labels)')
    .option('--labour-income-row <codes>', 'value-added row(s) of labour income, comma-separated (default: guessed from the labels)')
    .option('--propensity <share>', 'share of labour income households spend in the economy, 0 to 1 (default: from the table)')
    .option('--no-household', 'open model only: no induced effects, no Type II')
    .option('--jobs <code>', 'the satellite row that counts jobs (default: guessed from its label or unit)')
    .option('--satellites <codes>', 'satellite rows to count as measures, comma-separated (default: all)')
    .option('--value-added-rows <codes>', 'value-added rows summed as value added, comma-separated (default: all)')
    .option('--measure <codes>', 'only these measures, comma-separated codes such as output,value-added,JOBS');
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
}

/** Build the open model, the household closure (given, guessed or off) and the measures. */
export function prepareModels(t: Table, f: ModelFlags): PreparedModels {
  const settings: ReportSetting[] = [];
  let household: HouseholdOptions | undefined;
  let state: PreparedModels['closure'] = 'off';
  const rows = list(f.labourIncomeRow);
  if (f.household === false) {
    if (f.householdColumn || f.labourIncomeRow) throw new UsageError('--no-household cannot be combined with --household-column or --labour-income-row', 'conflict');
    settings.push(setting('household', 'Household closure (Type II)', 'off', 'given', 'Open model only'));
  } else {
    const column = f.householdColumn ?? guessHouseholdColumn(t);
    const income = rows ?? (guessLabourIncomeRow(t) !== undefined ? [guessLabourIncomeRow(t)!] : undefined);
    if (column !== undefined && income !== undefined && income.length) {
      household = { income, consumption: column };
      if (f.propensity !== undefined) {
        const p = Number(f.propensity);
        if (!Number.isFinite(p) || p < 0 || p > 1) throw new UsageError(`--propensity must be a share from 0 to 1; got '${f.propensity}'`, 'bad-propensity');
        household.propensity = p;
      }
      state = 'closed';
      settings.push(setting('householdColumn', 'Household consumption column', column, f.householdColumn ? 'given' : 'guessed'));
      settings.push(setting('labourIncomeRow', 'Labour-income row(s)', income.join(', '), rows ? 'given' : 'guessed'));
      settings.push(setting('propensity', 'Share of income spent in the economy', household.propensity ?? null, household.propensity !== undefined ? 'given' : 'default', household.propensity === undefined ? 'From the consumption column ÷ total labour income' : undefined));
    } else {
      if (f.householdColumn !== undefined || rows !== undefined) {
        const missing = column === undefined ? '--household-column' : '--labour-income-row';
        throw new UsageError(`the Type II closure needs both a household column and a labour-income row; ${missing} could not be guessed from the labels`, 'closure-incomplete', `Give ${missing}, or --no-household for the open model`);
      }
      state = 'not-found';
      settings.push(setting('household', 'Household closure (Type II)', 'not found', 'guessed', 'No household column and labour-income row could be identified from the labels; give --household-column and --labour-income-row'));
    }
  }
  let models: Models;
  try {
    models = buildModels(t, household ? { household } : {});
  } catch (e) {
    if (e instanceof InputError && e.code === 'household-not-productive') throw new InputError(e.code, `${e.message}`, e.where, 'Give --propensity below the current share, choose another --labour-income-row, or use --no-household');
    throw e;
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
  return { models, measures: chosen, settings, assumptions: modelAssumptions(t, models.closure, { typeII: state }), closure: state };
}
