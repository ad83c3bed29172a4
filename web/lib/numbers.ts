/**
 * Numbers for people: formatted in the reader's locale (Intl.NumberFormat through the shared
 * charts' `numberFormat`), a value that is not defined shown as blank, never as "NaN". The
 * locale is the browser's unless the settings choose one (`setNumberLocale`).
 */
import { formatFixed, groupFormat, numberFormat } from '../../src/report/charts/format';
import type { Formatter } from '../../src/report/charts/format';

let locale: string | undefined;
let auto = numberFormat();

/** Use this locale (a BCP 47 tag such as 'de-DE') for every number; undefined or '' for the browser's. */
export function setNumberLocale(tag: string | undefined): void {
  const next = tag ? Intl.NumberFormat.supportedLocalesOf([tag])[0] : undefined;
  if (next === locale) return;
  locale = next;
  auto = numberFormat(locale);
}

/** The locale numbers are shown in (the browser's when none is chosen). */
export function numberLocale(): string {
  return locale ?? new Intl.NumberFormat().resolvedOptions().locale;
}

/**
 * A number in the reader's locale by the one rule of src/report/charts/format.ts (a number alone:
 * four significant digits, the whole part never rounded); '' when it is not a finite number
 * (undefined, NaN). `digits` fixes the decimals, for the controls' own readouts (a zoom factor),
 * never for results.
 */
export function fmt(v: number | null | undefined, digits?: number): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '';
  return digits === undefined ? auto(v) : formatFixed(v, digits, locale);
}

/** A formatter for numbers shown together (a table column): one number of decimals for all (blanks ignored). */
export function columnFormat(values: readonly unknown[]): (v: number) => string {
  return groupFormat(values.filter((v): v is number => typeof v === 'number' && Number.isFinite(v)), locale);
}

/** A percentage of a ratio (0.1 → "10 %" in the reader's locale). */
export function pct(ratio: number | null | undefined, digits = 1): string {
  if (ratio === null || ratio === undefined || !Number.isFinite(ratio)) return '';
  return new Intl.NumberFormat(locale, { style: 'percent', maximumFractionDigits: digits }).format(ratio);
}

/** A formatter for the charts (the same rule and locale; a chart derives its labels' and ticks' formats from it). */
export function chartFormat(): Formatter {
  return numberFormat(locale);
}
