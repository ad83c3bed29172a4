/**
 * How report numbers are shown: fixed fraction digits per column (from its style), in the
 * report's locale for HTML, and as spreadsheet number formats for XLSX. Files keep every digit;
 * only the display is rounded.
 */
import type { Column } from './model';
import { STYLE_DIGITS } from './model';

/** Fraction digits shown for a number column. */
export function columnDigits(c: Column): number {
  return c.digits ?? STYLE_DIGITS[c.style ?? 'amount'];
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
