/**
 * Numbers for people: formatted in the reader's locale (Intl.NumberFormat through the shared
 * charts' `numberFormat`), a value that is not defined shown as blank, never as "NaN".
 */
import { numberFormat } from '../../src/report/charts/format';
import type { Formatter } from '../../src/report/charts/format';

const auto = numberFormat();
const fixed = new Map<number, Intl.NumberFormat>();

/**
 * A number in the reader's locale; '' when it is not a finite number (undefined, NaN). With
 * `digits`, exactly that many decimals (so that a column of a table lines up); without, as many
 * as the size of the number calls for.
 */
export function fmt(v: number | null | undefined, digits?: number): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '';
  if (digits === undefined) return auto(v);
  let f = fixed.get(digits);
  if (!f) {
    f = new Intl.NumberFormat(undefined, { minimumFractionDigits: digits, maximumFractionDigits: digits });
    fixed.set(digits, f);
  }
  return f.format(v);
}

/** A percentage of a ratio (0.1 → "10 %" in the reader's locale). */
export function pct(ratio: number | null | undefined, digits = 1): string {
  if (ratio === null || ratio === undefined || !Number.isFinite(ratio)) return '';
  return new Intl.NumberFormat(undefined, { style: 'percent', maximumFractionDigits: digits }).format(ratio);
}

/** A formatter for the charts (the same locale rules). */
export function chartFormat(digits?: number): Formatter {
  return numberFormat(undefined, digits);
}
