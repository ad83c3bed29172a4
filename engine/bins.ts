/**
 * Distribution bins for a histogram: equal-width bins over [min, max] of the values (or a given
 * domain), each counting the values x with x0 ≤ x < x1, the last bin also counting x = x1.
 * The default number of bins is Sturges' rule, ⌈log₂ N⌉ + 1 (common practice).
 *
 * @example distributionBins([1, 2, 2, 3], { count: 2 }) // [{ x0: 1, x1: 2, count: 1 }, { x0: 2, x1: 3, count: 3 }]
 */
import { InputError } from './errors';

export interface Bin {
  x0: number;
  x1: number;
  count: number;
}

export function distributionBins(values: ArrayLike<number>, options: { count?: number; domain?: [number, number] } = {}): Bin[] {
  const N = values.length;
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < N; k++) {
    const v = values[k]!;
    if (!Number.isFinite(v)) {
      throw new InputError('non-finite', `value ${k + 1} of the sample is ${v}, not a finite number`, { row: k + 1 });
    }
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (N === 0) return [];
  if (options.domain) {
    const [a, b] = options.domain;
    if (!Number.isFinite(a) || !Number.isFinite(b) || !(b >= a)) {
      throw new InputError('bad-domain', `the domain of the bins must be two finite numbers, low then high; got [${a}, ${b}]`);
    }
    lo = a;
    hi = b;
  }
  const count = options.count ?? Math.ceil(Math.log2(N)) + 1;
  if (!Number.isInteger(count) || count < 1) {
    throw new InputError('bad-bins', `the number of bins must be a whole number of at least 1; got ${count}`, { text: String(count) });
  }
  if (hi === lo) {
    let c = 0;
    for (let k = 0; k < N; k++) if (values[k] === lo) c++;
    return [{ x0: lo, x1: hi, count: c }];
  }
  const width = (hi - lo) / count;
  const bins: Bin[] = [];
  for (let b = 0; b < count; b++) bins.push({ x0: lo + b * width, x1: b === count - 1 ? hi : lo + (b + 1) * width, count: 0 });
  for (let k = 0; k < N; k++) {
    const v = values[k]!;
    if (v < lo || v > hi) continue;
    let b = Math.min(count - 1, Math.floor((v - lo) / width));
    // Guard the edges against rounding in (v − lo) / width.
    while (b > 0 && v < bins[b]!.x0) b--;
    while (b < count - 1 && v >= bins[b]!.x1) b++;
    bins[b]!.count++;
  }
  return bins;
}
