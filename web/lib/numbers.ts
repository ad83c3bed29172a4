/**
 * Numbers for people: formatted in the reader's locale (Intl.NumberFormat through the shared
 * charts' `numberFormat`), a value that is not defined shown as blank, never as "NaN". The
 * locale is the browser's unless the settings choose one (`setNumberLocale`).
 */
import { numberFormat } from '../../src/report/charts/format';
import type { Formatter } from '../../src/report/charts/format';

let locale: string | undefined;
let auto = numberFormat();
const fixed = new Map<number, Intl.NumberFormat>();

/** Use this locale (a BCP 47 tag such as 'de-DE') for every number; undefined or '' for the browser's. */
export function setNumberLocale(tag: string | undefined): void {
  const next = tag ? Intl.NumberFormat.supportedLocalesOf([tag])[0] : undefined;
  if (next === locale) return;
  locale = next;
  auto = numberFormat(locale);
  fixed.clear();
}

/** The locale numbers are shown in (the browser's when none is chosen). */
export function numberLocale(): string {
  return locale ?? new Intl.NumberFormat().resolvedOptions().locale;
}

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
    f = new Intl.NumberFormat(locale, { minimumFractionDigits: digits, maximumFractionDigits: digits });
    fixed.set(digits, f);
  }
  return f.format(v);
}

/** A percentage of a ratio (0.1 → "10 %" in the reader's locale). */
export function pct(ratio: number | null | undefined, digits = 1): string {
  if (ratio === null || ratio === undefined || !Number.isFinite(ratio)) return '';
  return new Intl.NumberFormat(locale, { style: 'percent', maximumFractionDigits: digits }).format(ratio);
}

/** A formatter for the charts (the same locale rules). */
export function chartFormat(digits?: number): Formatter {
  return numberFormat(locale, digits);
}
