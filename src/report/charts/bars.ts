/**
 * Horizontal grouped bars: one group per category (sector), one bar per series (for example
 * Type I and Type II multipliers). Sorted by the first series, largest first; a reference line
 * can mark a value such as 1 (a multiplier of 1 means no ripple at all).
 */
import { scaleLinear } from 'd3';
import type { Chart } from './svg';
import { clip, el, escapeXml, labelWidth, svgRoot, text } from './svg';
import type { Formatter } from './format';
import { groupOf } from './format';
import { AXIS, INK, SERIES_COLOURS } from './palette';
import { AXIS_ROOM, TITLE_ROOM, axisTitle, legend, valueAxis, verticalTitle } from './parts';

export interface BarSeries {
  label: string;
  values: ArrayLike<number>;
  colour?: string;
}

export interface GroupedBarsInput {
  title: string;
  unit: string;
  categories: string[];
  series: BarSeries[];
  limit?: number;
  reference?: number;
  /** Keep the input order instead of sorting by the first series. */
  keepOrder?: boolean;
  width?: number;
  format?: Formatter;
  /** The value axis's title, before the unit (default `Value`). */
  valueTitle?: string;
  /** The category axis's title (default `Sector`). */
  categoryTitle?: string;
}

export function groupedBars(input: GroupedBarsInput): Chart {
  const { title, unit, categories, series } = input;
  const width = input.width ?? 720;
  const limit = input.limit ?? 30;
  const first = series[0]?.values ?? [];
  let order = categories.map((_, i) => i);
  if (!input.keepOrder) order.sort((a, b) => (first[b] ?? 0) - (first[a] ?? 0));
  order = order.slice(0, limit);
  const labelW = TITLE_ROOM + labelWidth(order.map((i) => categories[i]!), 30);
  const right = 60;
  const top = 46;
  const barH = 12;
  const groupH = series.length * barH + 8;
  const height = top + order.length * groupH + AXIS_ROOM;
  let lo = Math.min(0, input.reference ?? 0);
  let hi = input.reference ?? 0;
  for (const s of series) {
    for (const i of order) {
      const v = s.values[i] ?? 0;
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
  }
  if (lo === hi) hi = lo + 1;
  // Room left of the bars for the value labels of negative bars.
  const x = scaleLinear().domain([lo, hi]).nice().range([labelW + (lo < 0 ? 48 : 0), width - right]);
  const parts: string[] = [];
  parts.push(legend(series, labelW));
  const fmt = groupOf(input.format, series.flatMap((s) => order.map((i) => s.values[i] ?? 0)));
  parts.push(valueAxis(x, top, height, axisTitle(input.valueTitle ?? 'Value', unit), input.format));
  parts.push(verticalTitle(input.categoryTitle ?? 'Sector', top, height - AXIS_ROOM));
  order.forEach((i, r) => {
    const y0 = top + r * groupH;
    parts.push(text({ x: labelW - 8, y: y0 + (series.length * barH) / 2 + 4, 'text-anchor': 'end', fill: INK }, clip(categories[i]!, 30)));
    series.forEach((s, k) => {
      const v = s.values[i] ?? 0;
      if (!Number.isFinite(v)) return;
      const c = s.colour ?? SERIES_COLOURS[k % SERIES_COLOURS.length]!;
      const a = Math.min(x(0), x(v));
      const b = Math.max(x(0), x(v));
      const y = y0 + k * barH;
      parts.push(el('rect', { x: a, y, width: Math.max(0.5, b - a), height: barH - 2, fill: c }, el('title', {}, escapeXml(`${categories[i]}: ${s.label} ${fmt(v)} ${unit}`))));
      parts.push(text({ x: v >= 0 ? b + 3 : a - 3, y: y + barH - 3, 'text-anchor': v >= 0 ? 'start' : 'end', fill: INK, 'font-size': 10 }, fmt(v)));
    });
  });
  if (input.reference !== undefined) {
    const rx = x(input.reference);
    parts.push(el('line', { x1: rx, x2: rx, y1: top - 6, y2: height - AXIS_ROOM + 4, stroke: AXIS, 'stroke-dasharray': '4 3' }));
  }
  const shown = order.length < categories.length ? ` The top ${order.length} of ${categories.length} are shown.` : '';
  return svgRoot(width, height, title, `Bars of ${series.map((s) => s.label).join(' and ')} by category, in ${unit}.${shown}`, parts.join(''));
}
