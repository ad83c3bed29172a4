/**
 * Horizontal stacked bars, one bar per category (sector), one segment per series (direct,
 * indirect, induced). Negative values stack to the left of zero, so a closure reads as clearly
 * as an opening. Bars are sorted by their total (largest effect first) and the top `limit` kept.
 */
import { scaleLinear } from 'd3';
import type { Chart } from './svg';
import { clip, el, escapeXml, labelWidth, svgRoot, text } from './svg';
import type { Formatter } from './format';
import { groupOf } from './format';
import { INK, SERIES_COLOURS } from './palette';
import { AXIS_ROOM, TITLE_ROOM, axisTitle, legend, valueAxis, verticalTitle } from './parts';

export interface StackedSeries {
  key: string;
  label: string;
  values: ArrayLike<number>;
  colour?: string;
}

export interface StackedBarsInput {
  title: string;
  /** The unit of every value, shown on the axis: `EUR millions`, `FTE jobs`. */
  unit: string;
  categories: string[];
  series: StackedSeries[];
  /** Keep the `limit` categories with the largest absolute total (default 20). */
  limit?: number;
  width?: number;
  format?: Formatter;
  /** The value axis's title, before the unit (default `Impact`). */
  valueTitle?: string;
  /** The category axis's title (default `Sector`). */
  categoryTitle?: string;
}

export function stackedBars(input: StackedBarsInput): Chart {
  const { title, unit, categories, series } = input;
  const width = input.width ?? 720;
  const limit = input.limit ?? 20;
  const totals = categories.map((_, i) => series.reduce((s, se) => s + (se.values[i] ?? 0), 0));
  const order = categories
    .map((_, i) => i)
    .sort((a, b) => Math.abs(totals[b]!) - Math.abs(totals[a]!))
    .slice(0, limit);
  const labelW = TITLE_ROOM + labelWidth(order.map((i) => categories[i]!), 30);
  const right = 70;
  const top = 46;
  const barH = 18;
  const gap = 6;
  const height = top + order.length * (barH + gap) + AXIS_ROOM;
  let lo = 0;
  let hi = 0;
  for (const i of order) {
    let pos = 0;
    let neg = 0;
    for (const s of series) {
      const v = s.values[i] ?? 0;
      if (v >= 0) pos += v;
      else neg += v;
    }
    hi = Math.max(hi, pos);
    lo = Math.min(lo, neg);
  }
  if (lo === 0 && hi === 0) hi = 1;
  // Room left of the bars for the value labels of negative bars.
  const x = scaleLinear().domain([lo, hi]).nice().range([labelW + (lo < 0 ? 48 : 0), width - right]);
  const parts: string[] = [];
  parts.push(legend(series, labelW));
  // One format for the bars' values (their totals and segments), one rule for every chart.
  const fmt = groupOf(input.format, [...order.map((i) => totals[i]!), ...series.flatMap((s) => order.map((i) => s.values[i] ?? 0))]);
  parts.push(valueAxis(x, top, height, axisTitle(input.valueTitle ?? 'Impact', unit), input.format));
  parts.push(verticalTitle(input.categoryTitle ?? 'Sector', top, height - AXIS_ROOM));
  order.forEach((i, r) => {
    const y = top + r * (barH + gap);
    parts.push(text({ x: labelW - 8, y: y + barH - 5, 'text-anchor': 'end', fill: INK }, clip(categories[i]!, 30)));
    let pos = 0;
    let neg = 0;
    series.forEach((s, k) => {
      const v = s.values[i] ?? 0;
      if (v === 0) return;
      const a = v >= 0 ? pos : neg + v;
      const b = v >= 0 ? pos + v : neg;
      if (v >= 0) pos += v;
      else neg += v;
      const c = s.colour ?? SERIES_COLOURS[k % SERIES_COLOURS.length]!;
      parts.push(
        el('rect', { x: x(a), y, width: Math.max(0.5, x(b) - x(a)), height: barH, fill: c, class: `rw-seg rw-${s.key}` }, el('title', {}, escapeXml(`${categories[i]}: ${s.label} ${fmt(v)} ${unit}`))),
      );
    });
    const t = totals[i]!;
    parts.push(text({ x: (t >= 0 ? x(pos) + 4 : x(neg) - 4), y: y + barH - 5, 'text-anchor': t >= 0 ? 'start' : 'end', fill: INK, 'font-size': 11 }, fmt(t)));
  });
  const shown = order.length < categories.length ? ` The ${order.length} largest of ${categories.length} are shown.` : '';
  const desc = `Stacked bars by ${series.map((s) => s.label).join(', ')}, in ${unit}.${shown}`;
  return svgRoot(width, height, title, desc, parts.join(''));
}

