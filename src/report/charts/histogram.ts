/**
 * A distribution as bins, with markers (for example the 5th, 50th and 95th percentiles and the
 * point result) drawn as vertical lines.
 */
import { scaleLinear } from 'd3';
import type { Chart } from './svg';
import { el, escapeXml, svgRoot, text } from './svg';
import type { Formatter } from './format';
import { groupOf, tickFormat, ticksOf } from './format';
import { axisTitle, legend, verticalTitle } from './parts';
import { AXIS, GRID, INK, SERIES_COLOURS } from './palette';

export interface Bin {
  x0: number;
  x1: number;
  count: number;
}

export interface HistogramInput {
  title: string;
  unit: string;
  bins: Bin[];
  markers?: { label: string; value: number }[];
  width?: number;
  height?: number;
  format?: Formatter;
  /** The x axis's title, before the unit (default: the unit alone). */
  valueTitle?: string;
}

export function histogram(input: HistogramInput): Chart {
  const width = input.width ?? 640;
  const height = input.height ?? 260;
  const m = { left: 50, right: 20, top: 52, bottom: 40 };
  const bins = input.bins;
  const lo = bins.length ? Math.min(...bins.map((b) => b.x0), ...(input.markers ?? []).map((k) => k.value)) : 0;
  const hi = bins.length ? Math.max(...bins.map((b) => b.x1), ...(input.markers ?? []).map((k) => k.value)) : 1;
  const x = scaleLinear().domain([lo, hi === lo ? lo + 1 : hi]).nice().range([m.left, width - m.right]);
  const cmax = Math.max(1, ...bins.map((b) => b.count));
  const y = scaleLinear().domain([0, cmax]).nice().range([height - m.bottom, m.top]);
  const parts: string[] = [];
  const fmt = groupOf(input.format, [...bins.flatMap((b) => [b.x0, b.x1]), ...(input.markers ?? []).map((k) => k.value)]);
  const yt = tickFormat(y.ticks(4));
  const xt = ticksOf(input.format, x.ticks(6));
  parts.push(legend([{ label: 'Draws in each bin', colour: SERIES_COLOURS[4] }, ...(input.markers ?? []).slice(0, 2).map((k, i) => ({ label: i === 0 ? `${k.label} (solid line)` : 'other markers (dashed)', colour: i === 0 ? INK : SERIES_COLOURS[5], shape: 'line' as const }))], m.left));
  for (const t of y.ticks(4)) {
    parts.push(el('line', { x1: m.left, x2: width - m.right, y1: y(t), y2: y(t), stroke: GRID }));
    parts.push(text({ x: m.left - 6, y: y(t) + 4, 'text-anchor': 'end', fill: AXIS, 'font-size': 11 }, yt(t)));
  }
  for (const t of x.ticks(6)) parts.push(text({ x: x(t), y: height - m.bottom + 16, 'text-anchor': 'middle', fill: AXIS, 'font-size': 11 }, xt(t)));
  for (const b of bins) {
    parts.push(
      el('rect', { x: x(b.x0) + 0.5, y: y(b.count), width: Math.max(0.5, x(b.x1) - x(b.x0) - 1), height: y(0) - y(b.count), fill: SERIES_COLOURS[4] }, el('title', {}, escapeXml(`${fmt(b.x0)} to ${fmt(b.x1)}: ${b.count}`))),
    );
  }
  (input.markers ?? []).forEach((k, i) => {
    parts.push(el('line', { x1: x(k.value), x2: x(k.value), y1: m.top - 4, y2: height - m.bottom, stroke: i === 0 ? INK : SERIES_COLOURS[5], 'stroke-dasharray': i === 0 ? undefined : '4 3' }));
    parts.push(text({ x: x(k.value), y: m.top - 8 - (i % 2) * 11, 'text-anchor': 'middle', fill: INK, 'font-size': 10 }, `${k.label} ${fmt(k.value)}`));
  });
  parts.push(text({ x: (m.left + width - m.right) / 2, y: height - 6, 'text-anchor': 'middle', fill: INK, 'font-size': 11, class: 'rw-axis-title rw-x-title' }, axisTitle(input.valueTitle, input.unit)));
  // The y axis's title, along the axis: what the bar heights count.
  parts.push(verticalTitle('Draws (count)', m.top, height - m.bottom));
  const total = bins.reduce((s, b) => s + b.count, 0);
  return svgRoot(width, height, input.title, `Distribution of ${total} draws in ${bins.length} bins, in ${input.unit}.`, parts.join(''));
}
