/**
 * The analyses' share of the worker session: the models (open, and closed for households when
 * asked) and the measures, built once per table and household choice and kept in the session's
 * cache until the table changes. Also the helpers every analysis operation uses: resolving
 * sector codes, and collecting the typed arrays of a result so they are transferred, not copied.
 */
import {
  CLOSURE_BASIS_ABOUT,
  ClosedModel,
  HOUSEHOLD_ABOUT,
  InputError,
  guessHousehold,
  householdClosure,
  inducedPlausibility,
  measureInfo,
  measures,
  moneyUnit,
  sectorIndex,
} from '../../../engine/index';
import type { Finding, HouseholdOptions, LeontiefModel, Measure, MeasureInfo, Models, Table } from '../../../engine/index';
import type { HandlerContext } from '../context';
import { cached, current, openModel } from './session';

/**
 * Which household closure to use: `'guess'` (from the table's labels, when exactly one
 * value-added row and one final-demand column fit), `'none'` (the open model only), or the rows
 * and column to use.
 */
export type HouseholdChoice = 'guess' | 'none' | HouseholdOptions;

/** What the page is told about the closure behind Type II numbers. */
export interface HouseholdInfo {
  about: string;
  /** True when the closed model is in use (Type II, total and induced numbers exist). */
  used: boolean;
  /** How the closure was chosen. */
  choice: 'guess' | 'none' | 'custom';
  /** The rows and column in use (or guessed), when any. */
  options?: HouseholdOptions;
  /** Σ h꜀: household spending in the economy per unit of income. */
  spendingRate?: number;
  /** The share of household income spent on the table's products, and the closure basis behind it. */
  share?: number;
  basis?: string;
  /** What the basis divides household spending by, in words (the engine's CLOSURE_BASIS_ABOUT). */
  basisAbout?: string;
  /** D: the household income spending is divided by (money units). */
  denominator?: number;
  /** Households' purchases from households (money units), when given. */
  ownPurchases?: number;
  /** s = 1 − hᵣ′L h꜀ (the closed model is productive when s > 0). */
  schur?: number;
  /** Why there is no closed model, in words (no guess possible, or the closure failed). */
  problem?: string;
  findings: Finding[];
}

export interface AnalysisModels {
  models: Models;
  measures: Measure[];
  household: HouseholdInfo;
}

function choiceKey(h: HouseholdChoice | undefined): string {
  return typeof h === 'string' || h === undefined ? (h ?? 'guess') : JSON.stringify({ i: h.income, c: h.consumption, p: h.propensity ?? null, hi: h.householdIncome ?? null, b: h.basis ?? null, o: h.ownPurchases ?? null });
}

/**
 * The models and measures for a household choice, built on first use from the session's open
 * model (factored once per table) and cached. A closure that cannot be used (a row that does not
 * exist, no income, not productive) leaves the open model in use and says why in
 * `household.problem`; it never fails the whole request.
 */
export function analysisModels(choice: HouseholdChoice | undefined): AnalysisModels {
  return cached(`analysis:${choiceKey(choice)}`, (s) => analysisFor(s.table, choice ?? 'guess', openModel()));
}

/** The models and measures of any table (another project's, for a comparison) from its open model, not cached. */
export function analysisFor(table: Table, choice: HouseholdChoice, open: LeontiefModel): AnalysisModels {
  const models: Models = { table, open };
  const info: HouseholdInfo = { about: HOUSEHOLD_ABOUT, used: false, choice: typeof choice === 'string' ? choice : 'custom', findings: [] };
  let options: HouseholdOptions | undefined;
  if (choice === 'guess') {
    options = guessHousehold(table);
    if (!options) info.problem = 'No household closure was found from the labels: name the row of compensation of employees and the column of household consumption to see Type II multipliers.';
  } else if (choice !== 'none') options = choice;
  if (options) {
    info.options = { ...options, income: Array.isArray(options.income) ? [...options.income] : [options.income] };
    try {
      const closure = householdClosure(table, open, options);
      info.spendingRate = closure.spendingRate;
      info.share = closure.share;
      info.basis = closure.basis;
      info.basisAbout = CLOSURE_BASIS_ABOUT[closure.basis];
      info.denominator = closure.denominator;
      if (closure.ownPurchases) info.ownPurchases = closure.ownPurchases;
      info.schur = closure.schur;
      info.findings = closure.findings;
      models.closure = closure;
      models.closed = new ClosedModel(open, closure);
      // The same plausibility check as the command line's buildModels.
      const f = inducedPlausibility(table, open, models.closed);
      if (f) closure.findings.push(f);
      info.findings = [...closure.findings];
      info.used = true;
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      delete models.closure;
      delete models.closed;
      info.problem = `The household closure cannot be used, so Type II, total and induced numbers are not shown: ${e.message}`;
    }
  }
  // Labour income is counted in the rows the closure uses, when they are given; otherwise guessed.
  const rows = info.options?.income;
  let list: Measure[];
  try {
    list = measures(table, rows ? { labourIncome: rows } : {});
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    list = measures(table);
  }
  return { models, measures: list, household: info };
}

/** The measure with this code (default: output), or an `InputError` listing those there are. */
export function measureFor(list: readonly Measure[], code: string | undefined): Measure {
  const m = list.find((x) => x.code === (code ?? 'output'));
  if (m) return m;
  throw new InputError('unknown-measure', `there is no measure '${code}' for this table`, { text: String(code) }, `Choose one of: ${list.map((x) => `'${x.code}'`).join(', ')}`);
}

/** The index of a sector given by code or label, as the engine resolves it. */
export function sectorAt(code: string): number {
  return sectorIndex(current().table, code);
}

/** The descriptors of the measures (plain data, no coefficients). */
export function measureInfos(list: readonly Measure[]): (MeasureInfo & { about: string; from: string[] })[] {
  return list.map((m) => ({ ...measureInfo(m), about: m.about, from: [...m.from] }));
}

export function tableMoneyUnit(): string {
  return moneyUnit(current().table.meta);
}

/**
 * Mark every typed array in a result for transfer (each buffer once: a buffer listed twice makes
 * postMessage fail). Only arrays made for this result may be in it: a transferred buffer is
 * emptied in the worker, so nothing cached may be returned as it is.
 */
export function transferArrays(ctx: HandlerContext, value: unknown): void {
  const seen = new Set<ArrayBuffer>();
  const walk = (v: unknown, depth: number) => {
    if (v === null || typeof v !== 'object' || depth > 8) return;
    if (ArrayBuffer.isView(v)) {
      const b = v.buffer;
      if (b instanceof ArrayBuffer && !seen.has(b)) seen.add(b);
      return;
    }
    if (Array.isArray(v)) {
      // Arrays of numbers or strings hold no buffers; skip them quickly.
      if (v.length && typeof v[0] !== 'object') return;
      for (const x of v) walk(x, depth + 1);
      return;
    }
    for (const x of Object.values(v)) walk(x, depth + 1);
  };
  walk(value, 0);
  if (seen.size) ctx.transfer(...seen);
}
