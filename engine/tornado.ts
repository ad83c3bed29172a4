/**
 * Tornado data: the chosen result at a low and a high value of each of its most influential
 * coefficients, one coefficient at a time, the others held fixed.
 *
 * Candidates are the 2k coefficients of largest |elasticity| (O(n²) after one factorisation,
 * see `influentialCoefficients`); for each, the result at aᵢⱼ(1 − s) and aᵢⱼ(1 + s), s = percent
 * / 100, is exact by Sherman–Morrison, r(δ) = r + δ uᵢvⱼ / (1 − δ Lⱼᵢ); the k with the widest
 * exact range are kept, widest first. A value past the productivity boundary (1 − δ Lⱼᵢ ≤ 0) is 'none'.
 *
 * @example tornado(model, { kind: 'multiplier', sector: 3 }, { top: 8, percent: 20 })
 */
import { InputError } from './errors';
import type { LeontiefModel } from './leontief';
import type { Cell, ResultTarget } from './sensitivity';
import { SENSITIVITY_ABOUT, exactChange, influentialCoefficients, inverseEntries } from './sensitivity';

export interface TornadoEnd {
  /** The coefficient's value at this end. */
  coefficient: number;
  /** The result with the coefficient at that value, or 'none' past the productivity boundary. */
  result: number | 'none';
}

export interface TornadoBar extends Cell {
  /** aᵢⱼ in the table. */
  coefficient: number;
  low: TornadoEnd;
  high: TornadoEnd;
  /** |high − low|, or 'none' when an end is 'none' (such bars come first). */
  range: number | 'none';
}

export interface TornadoData {
  about: string;
  /** The result with every coefficient at its table value (the bars' centre line). */
  value: number;
  /** The swing applied to each coefficient, in percent (10 = ±10 %). */
  percent: number;
  bars: TornadoBar[];
}

export function tornado(model: LeontiefModel, target: ResultTarget, options: { top?: number; percent?: number } = {}): TornadoData {
  const top = options.top ?? 10;
  const percent = options.percent ?? 10;
  if (!Number.isFinite(percent) || percent <= 0 || percent > 100) {
    throw new InputError('bad-percent', `the swing must be a percentage above 0 and at most 100 (10 for ±10 %); got ${percent}`, { text: String(percent) });
  }
  const swing = percent / 100;
  if (!Number.isInteger(top) || top < 1) {
    throw new InputError('bad-top', `the number of bars must be a whole number of at least 1; got ${top}`, { text: String(top) });
  }
  const ranking = influentialCoefficients(model, target, { top: 2 * top, by: 'elasticity' });
  const entries = ranking.entries.filter((e) => e.coefficient !== 0);
  const g = inverseEntries(model, entries);
  const r = ranking.value;
  const bars: TornadoBar[] = entries.map((e, k) => {
    const delta = e.coefficient * swing;
    const end = (d: number): TornadoEnd => {
      const ch = exactChange(e.derivative, g[k]!, d);
      return { coefficient: e.coefficient + d, result: ch === 'none' ? 'none' : r + ch };
    };
    const low = end(-delta);
    const high = end(delta);
    const range = low.result === 'none' || high.result === 'none' ? 'none' : Math.abs(high.result - low.result);
    return { row: e.row, col: e.col, coefficient: e.coefficient, low, high, range };
  });
  bars.sort((a, b) => {
    if (a.range === 'none' || b.range === 'none') return a.range === b.range ? 0 : a.range === 'none' ? -1 : 1;
    return b.range - a.range;
  });
  return { about: `${SENSITIVITY_ABOUT} Each bar moves one coefficient by ±${percent} %.`, value: r, percent, bars: bars.slice(0, top) };
}
