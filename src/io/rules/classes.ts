/**
 * The trade's classes of primary-input rows and final-demand columns, set from their labels and
 * codes (the 2008 SNA transaction codes, an open standard, and the usual English wording of
 * agency tables). Each rule is small and named; the first that matches sets the class, and its
 * name and reason go into the mapping (`why`) so the user sees why a row was or was not counted
 * as value added. Order matters: imports and their duties, product taxes and sales by final
 * buyers are tried before the value-added components, so that 'Taxes less subsidies on
 * products' is a product tax and 'Taxes less subsidies on production' a production tax.
 *
 * Fixtures that made them: the Scottish IxI sheet (RUKImp, RoWImp, TlSPrds, TlSPrdn, CoE, GOS,
 * GVA; final consumption over households, NPISHs and government; exports to the rest of the UK
 * and the world) and the ABS 5246.0 worked example (wages, salaries and supplements; commodity
 * taxes; indirect taxes nec; sales by final buyers; competing and complementary imports and
 * their duties).
 */
import type { DemandClass, InputClass } from '../../../engine/table';

interface ClassRule<C> {
  name: string;
  cls: C;
  code?: RegExp;
  label?: RegExp;
  reason: string;
}

const INPUT_RULES: ClassRule<InputClass>[] = [
  { name: 'imports', cls: 'imports', code: /^(P7|IMP|D2121)/i, label: /\bimports?\b|\bimported\b/i, reason: 'imports and duties on them are not value added' },
  { name: 'product-taxes', cls: 'product-taxes', code: /^(D21|D31)/i, label: /\b(taxes|subsidies)\b.*\bon products?\b|\bcommodity taxes\b|\bproduct taxes\b|\btaxes on (goods|commodities)\b/i, reason: 'taxes less subsidies on products are not value added at basic prices' },
  { name: 'final-buyers', cls: 'final-buyers', label: /\bsales by final buyers\b|\bpurchases adjustment|\bfinal buyers\b/i, reason: 'sales by final buyers are not value added' },
  { name: 'compensation', cls: 'compensation', code: /^D1(\b|[0-9_])/i, label: /\bcompensation\b|\bwages\b|\bsalaries\b|\blabou?r (income|costs?)\b|\bemployee (compensation|income)\b/i, reason: 'compensation of employees: value added, and the labour income of households' },
  { name: 'operating-surplus', cls: 'operating-surplus', code: /^(B2|B3)/i, label: /\boperating surplus\b|\bmixed income\b|\bprofits?\b|\bproprietors\b|\bproperty[- ]type income\b/i, reason: 'operating surplus and mixed income: value added' },
  { name: 'production-taxes', cls: 'production-taxes', code: /^(D29|D39)/i, label: /\b(taxes|subsidies)\b|\bindirect business tax/i, reason: 'other taxes less subsidies on production: value added at basic prices' },
  { name: 'value-added', cls: 'value-added', code: /^(B1|K1|P51C)/i, label: /\bvalue added\b|\bconsumption of fixed capital\b|\bdepreciation\b|\bprimary inputs?\b/i, reason: 'value added (or a part of it)' },
];

const DEMAND_RULES: ClassRule<DemandClass>[] = [
  { name: 'exports', cls: 'exports', code: /^P6/i, label: /\bexports?\b|\bnon-?resident\b|\brest of (the )?(world|uk|country)\b/i, reason: 'exports (sales to non-residents)' },
  { name: 'npish', cls: 'npish', code: /^P3_?S15/i, label: /\bnpish|\bnon-?profit/i, reason: 'final consumption of non-profit institutions serving households' },
  { name: 'government', cls: 'government', code: /^P3_?S13/i, label: /\bgovernment\b|\bpublic (authorit|consumption)/i, reason: 'government final consumption' },
  { name: 'inventories', cls: 'inventories', code: /^P5[23]/i, label: /\binventor|\bstocks?\b|\bvaluables\b/i, reason: 'changes in inventories and valuables' },
  { name: 'investment', cls: 'investment', code: /^P51/i, label: /\bcapital formation\b|\binvestment\b|\bfixed capital\b|\bcapital expenditure\b/i, reason: 'gross fixed capital formation' },
  { name: 'households', cls: 'households', code: /^P3_?S14/i, label: /\bhouseholds?\b|\bpersonal consumption\b|\bprivate consumption\b/i, reason: 'household final consumption (the spending that closes a Type II model)' },
];

export interface ClassFound<C> {
  cls: C;
  why: string;
}

function apply<C>(rules: ClassRule<C>[], code: string, texts: string[]): ClassFound<C> | undefined {
  for (const r of rules) {
    if (r.code && r.code.test(code)) return { cls: r.cls, why: `class ${r.cls} (rule ${r.name}: code ${code}; ${r.reason})` };
    for (const t of texts) if (r.label && t && r.label.test(t)) return { cls: r.cls, why: `class ${r.cls} (rule ${r.name}: '${t}'; ${r.reason})` };
  }
  return undefined;
}

/** The class of a primary-input row from its code and label, or undefined when no rule knows it. */
export function inputClassOf(code: string, label: string): ClassFound<InputClass> | undefined {
  return apply(INPUT_RULES, code, [label, code]);
}

/**
 * The class of a final-demand column from its code and label, else from the group header above
 * it ('Total' under 'Exports'). Exports come first, so 'Non-resident households' is exports.
 */
export function demandClassOf(code: string, label: string, group?: string): ClassFound<DemandClass> | undefined {
  return apply(DEMAND_RULES, code, [label, code]) ?? (group ? apply(DEMAND_RULES, '', [group]) : undefined);
}
