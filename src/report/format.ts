/**
 * How report numbers are shown: fixed fraction digits per column (from its style), in the
 * report's locale for HTML, and as spreadsheet number formats for XLSX. Files keep every digit;
 * only the display is rounded.
 */
import type { Cell, Column, ReportTable } from './model';
import { STYLE_DIGITS } from './model';
import { fractionDigits } from './charts/format';

/**
 * Fraction digits shown for a number column: its own `digits` if set, none for counts, else the
 * one rule of src/report/charts/format.ts over the column's `values` (four significant digits of
 * the largest, the same for every row); the style's digits only when no values are given.
 */
export function columnDigits(c: Column, values?: readonly Cell[]): number {
  if (c.digits !== undefined) return c.digits;
  if (c.style === 'count') return 0;
  if (values) return fractionDigits(values.filter((v): v is number => typeof v === 'number'));
  return STYLE_DIGITS[c.style ?? 'amount'];
}

/** A table's columns with the digits of each number column fixed from its rows and totals. */
export function shownColumns(t: ReportTable): Column[] {
  return t.columns.map((c, i) => (c.type === 'number' ? { ...c, digits: columnDigits(c, [...t.rows.map((r) => r[i] ?? null), ...(t.totals ? [t.totals[i] ?? null] : [])]) } : c));
}

/** The column of a single number (a headline): the rule over that number alone. */
export function singleColumn(style: Column['style'], v: number | null): Column {
  const c: Column = { key: 'v', label: '', type: 'number', style: style ?? 'amount' };
  return { ...c, digits: columnDigits(c, [v]) };
}

/** A formatter for a column's numbers in a locale; blank for null. */
export function cellFormatter(locale: string | undefined): (v: number | null, c: Column) => string {
  const cache = new Map<number, Intl.NumberFormat>();
  return (v, c) => {
    if (v === null || !Number.isFinite(v)) return '';
    const d = columnDigits(c);
    let f = cache.get(d);
    if (!f) {
      f = new Intl.NumberFormat(locale, { minimumFractionDigits: d, maximumFractionDigits: d });
      cache.set(d, f);
    }
    return f.format(v);
  };
}

/** The spreadsheet number format for a column: `#,##0.00` for two digits. */
export function xlsxNumberFormat(c: Column): string {
  const d = columnDigits(c);
  return d > 0 ? `#,##0.${'0'.repeat(d)}` : '#,##0';
}

/** A header with its unit: `Direct (EUR millions)`. */
export function headerWithUnit(c: Column): string {
  return c.type === 'number' && c.unit ? `${c.label} (${c.unit})` : c.label;
}

/** Check that a locale is one the platform knows; throws a RangeError otherwise. */
export function checkLocale(locale: string): string {
  const [canonical] = Intl.getCanonicalLocales(locale);
  return canonical!;
}
