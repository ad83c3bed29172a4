/**
 * The conventions behind every multiplier, impact and linkage, stated as plain data so that the
 * command line, the JSON, the reports and the workbench say the same thing: what "total" sums,
 * how "induced" is defined, the first-round split, the linkage bases and their normalisation,
 * the key-sector rule, the coefficient-of-variation denominator, the closure basis and its
 * spending share (or why there is no Type II), which rows made value added and labour income,
 * and which sectors have no output.
 *
 *   const c = conventions(models, list, { typeII: 'closed' });
 *   conventionLines(c);   // one sentence each, for text output and reports
 */
import type { ClosureBasis, Models } from './household';
import { CLOSURE_BASIS_ABOUT } from './household';
import type { Measure } from './measures';
import type { Table } from './table';
import { isValueAddedRow } from './table';
import { noOutputSectors } from './multipliers';

export const CONVENTIONS_ABOUT = 'The conventions behind the numbers: what each figure sums, how the model is closed for households, and how linkages are normalised.';

/** Fixed definitions (common practice), one sentence each. */
export const DEFINITIONS = {
  simple: 'Simple = direct + indirect: the effect of one unit of final demand in the open model, c′L.',
  total: 'Total = direct + indirect + induced, c′L̄ over the n sectors of the closed model: the household row (labour income paid to households) is not counted in any total.',
  induced: 'Induced = total − simple: the effect of households spending the labour income the demand generates (L̄ − L, weighted by the measure).',
  typeI: 'Type I = simple ÷ direct; Type II = total ÷ direct; blank where the direct coefficient is 0.',
  rounds: 'First round = c′A (the purchases the first unit of demand sets off, weighted by the measure); later rounds (industrial support) = indirect − first round.',
  linkageBases: 'Direct backward linkages are column sums of A; direct forward, row sums of B = x̂⁻¹Z; total backward, column sums of the Leontief inverse L; total forward, row sums of the Ghosh inverse G = (I − B)⁻¹.',
  normalisation: 'Indices (power and sensitivity of dispersion) are each sum ÷ its mean over the sectors with output, so they average 1 over those sectors; sectors with no output are left out of the means and have no index.',
  keySectorRule: 'Key sector: both total indices above 1; backward-oriented: only the backward index above 1; forward-oriented: only the forward index above 1; weak: neither.',
  variation: 'Coefficient of variation: the standard deviation of a column of L (or a row of G) with the n − 1 denominator, ÷ its mean.',
} as const;

export interface ClosureConvention {
  /** `closed`, `off` (the user chose the open model) or `not-found` (nothing to close with could be told apart). */
  state: 'closed' | 'off' | 'not-found';
  basis?: ClosureBasis;
  /** What household spending is divided by, in words. */
  about: string;
  /** D, the household income spending is divided by (money units). */
  denominator?: number;
  /** The share of household income spent on the table's products. */
  share?: number;
  incomeRows?: string[];
  consumptionColumn?: string;
  ownPurchases?: number;
  /** Why Type II is null, when it is. */
  whyNoTypeII?: string;
}

export interface Conventions {
  about: string;
  definitions: typeof DEFINITIONS;
  closure: ClosureConvention;
  /** The rows summed as value added, and the primary-input rows left out of it. */
  valueAdded: { rows: string[]; notValueAdded: string[] };
  /** The rows counted as labour income, when the measure is there. */
  labourIncome?: { rows: string[] };
  /** Sectors with no output: no multipliers, no linkage index. */
  noOutput: string[];
}

/** The conventions of results from these models and measures. */
export function conventions(models: Pick<Models, 'table' | 'closure'>, measures: readonly Measure[] = [], options: { typeII?: 'closed' | 'off' | 'not-found' } = {}): Conventions {
  const t = models.table;
  const c = models.closure;
  let closure: ClosureConvention;
  if (c) {
    closure = {
      state: 'closed',
      basis: c.basis,
      about: CLOSURE_BASIS_ABOUT[c.basis],
      denominator: c.denominator,
      share: c.share,
      incomeRows: [...c.incomeRows],
      consumptionColumn: c.consumptionColumn,
      ownPurchases: c.ownPurchases,
    };
  } else if (options.typeII === 'not-found') {
    closure = {
      state: 'not-found',
      about: 'no closure',
      whyNoTypeII: 'Type II, induced and total are blank (null): no household consumption column and labour-income row could be told apart with confidence. Choose them (and the basis) to close the model.',
    };
  } else {
    closure = { state: 'off', about: 'no closure', whyNoTypeII: 'Type II, induced and total are blank (null): the open model was chosen (no household closure), so there are no induced effects.' };
  }
  const va = measures.find((m) => m.kind === 'value-added');
  const rows = va ? [...va.from] : t.valueAdded.codes.filter((_, i) => isValueAddedRow(t, i));
  const li = measures.find((m) => m.kind === 'labour-income');
  const out: Conventions = {
    about: CONVENTIONS_ABOUT,
    definitions: DEFINITIONS,
    closure,
    valueAdded: { rows, notValueAdded: t.valueAdded.codes.filter((code) => !rows.includes(code)) },
    noOutput: noOutputSectors(t.x).map((j) => t.sectors.codes[j]!),
  };
  if (li) out.labourIncome = { rows: [...li.from] };
  return out;
}

/** The closure in one sentence (or why there is none). */
export function closureLine(c: ClosureConvention): string {
  if (c.state !== 'closed') return c.whyNoTypeII!;
  const own = c.ownPurchases ? `, households' purchases from households ${c.ownPurchases}` : '';
  return `Closure basis: ${c.basis} (${c.about}); labour income ${c.incomeRows!.map((r) => `'${r}'`).join(', ')}, consumption '${c.consumptionColumn}'${own}; divided by ${c.denominator!.toPrecision(6)}, households spend ${c.share!.toPrecision(4)} of their income on the table's products.`;
}

/** One sentence per convention, for text output and reports. */
export function conventionLines(c: Conventions, options: { linkages?: boolean; multipliers?: boolean; rounds?: boolean; closure?: boolean } = {}): string[] {
  const d = c.definitions;
  const out: string[] = [];
  if (options.multipliers !== false) out.push(d.simple, d.total, d.induced, d.typeI);
  if (options.rounds) out.push(d.rounds);
  if (options.closure !== false) out.push(closureLine(c.closure));
  out.push(
    `Value added sums the rows ${c.valueAdded.rows.map((r) => `'${r}'`).join(', ') || '(none)'}${c.valueAdded.notValueAdded.length ? `; ${c.valueAdded.notValueAdded.map((r) => `'${r}'`).join(', ')} ${c.valueAdded.notValueAdded.length > 1 ? 'are' : 'is'} not value added` : ''}.`,
  );
  if (c.labourIncome) out.push(`Labour income is the row${c.labourIncome.rows.length > 1 ? 's' : ''} ${c.labourIncome.rows.map((r) => `'${r}'`).join(', ')}.`);
  if (options.linkages) out.push(d.linkageBases, d.normalisation, d.keySectorRule, d.variation);
  if (c.noOutput.length) out.push(`No output: ${c.noOutput.map((s) => `'${s}'`).join(', ')}; their multipliers and linkage indices are blank.`);
  return out;
}

/** The conventions of a table alone (linkages, price): no measures, no closure. */
export function tableConventions(t: Table): Conventions {
  return conventions({ table: t }, [], { typeII: 'off' });
}
