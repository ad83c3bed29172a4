/** Number formats for charts and reports, in the reader's locale. */

export type Formatter = (v: number) => string;

/** A formatter with a sensible number of significant digits for the size of the numbers. */
export function numberFormat(locale?: string, maxFractionDigits?: number): Formatter {
  const cache = new Map<number, Intl.NumberFormat>();
  const get = (digits: number) => {
    let f = cache.get(digits);
    if (!f) {
      f = new Intl.NumberFormat(locale, { maximumFractionDigits: digits, minimumFractionDigits: 0 });
      cache.set(digits, f);
    }
    return f;
  };
  return (v: number) => {
    if (!Number.isFinite(v)) return String(v);
    const a = Math.abs(v);
    const digits = maxFractionDigits ?? (a >= 1000 ? 0 : a >= 100 ? 1 : a >= 1 ? 2 : a >= 0.01 ? 3 : 4);
    return get(digits).format(v);
  };
}
