/**
 * Percentile bands: one row per category (sector), a bar from a low to a high percentile (such
 * as the 5th and 95th of a Monte Carlo run), a tick at the median and a dot at the point value
 * (the table's own result). Sorted by the median, largest first, unless asked to keep the order.
 */
import { scaleLinear } from 'd3';
import type { Chart } from './svg';
import { clip, el, escapeXml, labelWidth, svgRoot, text } from './svg';
import type { Formatter } from './format';
import { groupOf } from './format';
import type { LegendItem } from './parts';
import { AXIS_ROOM, TITLE_ROOM, axisTitle, legend, valueAxis, verticalTitle } from './parts';
import { INK, SERIES_COLOURS } from './palette';

export interface BandsInput {
  title: string;
  unit: string;
  categories: string[];
  low: ArrayLike<number>;
  mid: ArrayLike<number>;
  high: ArrayLike<number>;
  /** The value with no noise, drawn as a dot. */
  point?: ArrayLike<number>;
  lowLabel?: string;
  midLabel?: string;
  highLabel?: string;
  pointLabel?: string;
  /** Keep the `limit` categories with the largest median (default 30). */
  limit?: number;
  keepOrder?: boolean;
  width?: number;
  format?: Formatter;
  /** The value axis's title, before the unit (default `Value`). */
  valueTitle?: string;
  /** The category axis's title (default `Sector`). */
  categoryTitle?: string;
}

export function percentileBands(input: BandsInput): Chart {
  const { categories, low, mid, high } = input;
  const width = input.width ?? 720;
  const limit = input.limit ?? 30;
  const lowL = input.lowLabel ?? '5th percentile';
  const midL = input.midLabel ?? 'median';
  const highL = input.highLabel ?? '95th percentile';
  const pointL = input.pointLabel ?? 'table value';
  let order = categories.map((_, i) => i).filter((i) => Number.isFinite(low[i]!) && Number.isFinite(high[i]!));
  if (!input.keepOrder) order.sort((a, b) => (mid[b] ?? 0) - (mid[a] ?? 0));
  order = order.slice(0, limit);
  const labelW = TITLE_ROOM + labelWidth(order.map((i) => categories[i]!), 30);
  const right = 90;
  const top = 46;
  const rowH = 20;
  const height = top + order.length * rowH + AXIS_ROOM;
  let lo = Infinity;
  let hi = -Infinity;
  for (const i of order) {
    for (const v of [low[i]!, high[i]!, mid[i]!, input.point?.[i] ?? NaN]) {
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
  }
  if (!Number.isFinite(lo)) {
    lo = 0;
    hi = 1;
  }
  if (lo === hi) {
    lo -= Math.abs(lo) * 0.1 || 1;
    hi += Math.abs(hi) * 0.1 || 1;
  }
  const x = scaleLinear().domain([lo, hi]).nice().range([labelW, width - right]);
  const cBand = SERIES_COLOURS[4]!;
  const cMid = SERIES_COLOURS[0]!;
  const cPoint = SERIES_COLOURS[5]!;
  const parts: string[] = [];
  const fmt = groupOf(input.format, order.flatMap((i) => [low[i]!, mid[i]!, high[i]!, input.point?.[i] ?? 0]));
  const keys: LegendItem[] = [{ label: `${lowL} to ${highL}`, colour: cBand }, { label: midL, colour: cMid, shape: 'line' }];
  if (input.point) keys.push({ label: pointL, colour: cPoint, shape: 'dot' });
  parts.push(legend(keys, labelW));
  parts.push(valueAxis(x, top, height, axisTitle(input.valueTitle ?? 'Value', input.unit), input.format));
  parts.push(verticalTitle(input.categoryTitle ?? 'Sector', top, height - AXIS_ROOM));
  order.forEach((i, r) => {
    const y = top + r * rowH;
    const name = categories[i]!;
    parts.push(text({ x: labelW - 8, y: y + 12, 'text-anchor': 'end', fill: INK }, clip(name, 30)));
    const a = x(low[i]!);
    const b = x(high[i]!);
    const tip = `${name}: ${lowL} ${fmt(low[i]!)}, ${midL} ${fmt(mid[i]!)}, ${highL} ${fmt(high[i]!)}${input.point ? `, ${pointL} ${fmt(input.point[i]!)}` : ''} ${input.unit}`;
    parts.push(el('rect', { x: Math.min(a, b), y: y + 4, width: Math.max(1, Math.abs(b - a)), height: 8, fill: cBand }, el('title', {}, escapeXml(tip))));
    if (Number.isFinite(mid[i]!)) parts.push(el('rect', { x: x(mid[i]!) - 1.5, y: y + 1, width: 3, height: 14, fill: cMid }));
    const p = input.point?.[i];
    if (p !== undefined && Number.isFinite(p)) parts.push(el('circle', { cx: x(p), cy: y + 8, r: 3.5, fill: cPoint }));
    parts.push(text({ x: Math.max(a, b) + 6, y: y + 12, fill: INK, 'font-size': 10 }, `${fmt(low[i]!)} – ${fmt(high[i]!)}`));
  });
  const shown = order.length < categories.length ? ` The ${order.length} largest of ${categories.length} are shown.` : '';
  return svgRoot(width, height, input.title, `Bands from the ${lowL} to the ${highL} with the ${midL} and the ${pointL}, by category, in ${input.unit}.${shown}`, parts.join(''));
}
