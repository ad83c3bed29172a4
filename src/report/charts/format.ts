/**
 * One rule for every number shown, on charts and in tables, in the reader's locale:
 *
 * - a group of numbers that are read together (a table column, the value labels of a chart)
 *   shares one number of fraction digits, the one that gives the group's largest absolute value
 *   `SIGNIFICANT_DIGITS` (4) significant digits, between 0 and `MAX_FRACTION_DIGITS` (6); trailing
 *   zeros are kept, so 2.290 stands beside 2.208 and the decimal marks line up;
 * - the whole part is never rounded (12,345.6 shows as 12,346);
 * - an axis's ticks get the digits their step needs (0, 0.5, 1.0, 1.5 → one digit), so that
 *   neighbouring ticks always differ;
 * - a number shown alone (in a sentence, a tooltip) is a group of one, with its trailing zeros
 *   dropped, since there is nothing to line up with: 12, 9.6, 400, 1.235.
 *
 * Files keep every digit; only the display is rounded. `numberFormat` and `groupFormat` are the
 * functions the report, the charts and the workbench call (web/lib/numbers.ts wraps them).
 */

/** Formats one number. Those made here carry their locale (and fixed digits, if any), so a chart can derive its group and tick formats. */
export interface Formatter {
  (v: number): string;
  /** Set on the formatters of this module: the locale ('' for the platform's). */
  locale?: string;
  /** Fixed fraction digits, when the caller asked for them. */
  digits?: number;
}

/** Significant digits shown for the largest number of a group. */
export const SIGNIFICANT_DIGITS = 4;
/** The most fraction digits ever shown. */
export const MAX_FRACTION_DIGITS = 6;

/** Fraction digits giving `sig` significant digits to the largest finite |v| of `values` (0 when none is non-zero). */
export function fractionDigits(values: Iterable<number> | ArrayLike<number>, sig = SIGNIFICANT_DIGITS): number {
  let max = 0;
  const list: Iterable<number> = Symbol.iterator in Object(values) ? (values as Iterable<number>) : Array.from(values as ArrayLike<number>);
  for (const v of list) if (Number.isFinite(v)) max = Math.max(max, Math.abs(v));
  if (max === 0) return 0;
  // Digits before the decimal mark; a value that rounds up to the next power (9.9996) counts as one.
  let whole = Math.floor(Math.log10(max)) + 1;
  if (Number((max / 10 ** whole).toFixed(sig)) >= 1) whole++;
  return Math.max(0, Math.min(MAX_FRACTION_DIGITS, sig - whole));
}

/** Fraction digits for ticks `step` apart: enough that neighbours differ (0.25 → 2, 5 → 0). */
export function tickDigits(step: number): number {
  if (!(step > 0) || !Number.isFinite(step)) return 0;
  for (let d = 0; d < MAX_FRACTION_DIGITS; d++) {
    const scaled = step * 10 ** d;
    if (Math.abs(scaled - Math.round(scaled)) < 1e-9 * Math.max(1, scaled)) return d;
  }
  return MAX_FRACTION_DIGITS;
}

const formats = new Map<string, Intl.NumberFormat>();

/** A number with `digits` fraction digits in a locale (`trim`: trailing zeros dropped); '' when it is not a finite number. */
export function formatFixed(v: number, digits: number, locale?: string, trim = false): string {
  if (!Number.isFinite(v)) return '';
  const key = `${locale ?? ''}|${digits}|${trim}`;
  let f = formats.get(key);
  if (!f) {
    f = new Intl.NumberFormat(locale, { minimumFractionDigits: trim ? 0 : digits, maximumFractionDigits: digits });
    formats.set(key, f);
  }
  // No "-0.00" for a tiny negative number.
  return f.format(Math.abs(v) < 0.5 * 10 ** -digits ? 0 : v);
}

function mark(f: (v: number) => string, locale: string | undefined, digits?: number): Formatter {
  const g = f as Formatter;
  g.locale = locale ?? '';
  if (digits !== undefined) g.digits = digits;
  return g;
}

/**
 * A formatter for single numbers (each a group of one), or with `digits` for exactly that many
 * fraction digits. Not a finite number: '' (blank, never "NaN").
 */
export function numberFormat(locale?: string, digits?: number): Formatter {
  return mark((v: number) => (digits === undefined ? formatFixed(v, fractionDigits([v]), locale, true) : formatFixed(v, digits, locale)), locale, digits);
}

/** A formatter for numbers read together: one number of fraction digits for all of `values`. */
export function groupFormat(values: Iterable<number> | ArrayLike<number>, locale?: string): Formatter {
  const d = fractionDigits(values);
  return mark((v: number) => formatFixed(v, d, locale), locale, d);
}

/** A formatter for the ticks of a linear scale: the digits the step between them needs. */
export function tickFormat(ticks: readonly number[], locale?: string): Formatter {
  const step = ticks.length > 1 ? Math.abs(ticks[1]! - ticks[0]!) : Math.abs(ticks[0] ?? 1) || 1;
  const d = tickDigits(step);
  return mark((v: number) => formatFixed(v, d, locale), locale, d);
}

/**
 * The format of a chart's group of values from the formatter it was given: the rule's group format
 * in the same locale, unless the caller fixed the digits or passed a formatter of its own.
 */
export function groupOf(f: Formatter | undefined, values: Iterable<number> | ArrayLike<number>): Formatter {
  if (f && (f.locale === undefined || f.digits !== undefined)) return f;
  return groupFormat(values, f?.locale || undefined);
}

/** The format of an axis's ticks from the formatter a chart was given (as `groupOf`). */
export function ticksOf(f: Formatter | undefined, ticks: readonly number[]): Formatter {
  if (f && (f.locale === undefined || f.digits !== undefined)) return f;
  return tickFormat(ticks, f?.locale || undefined);
}
