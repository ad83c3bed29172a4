/**
 * The sensitivity tornado: for each of the most influential coefficients, the result when that
 * coefficient is at its low and at its high value, as a bar either side of the base result.
 * Widest bar on top.
 */
import { scaleLinear } from 'd3';
import type { Chart } from './svg';
import { clip, el, escapeXml, labelWidth, svgRoot, text } from './svg';
import type { Formatter } from './format';
import { groupOf } from './format';
import { INK, SERIES_COLOURS } from './palette';
import { AXIS_ROOM, TITLE_ROOM, axisTitle, legend, valueAxis, verticalTitle } from './parts';

export interface TornadoItem {
  label: string;
  /** The result with the input at its low value, and at its high value. */
  low: number;
  high: number;
}

export interface TornadoInput {
  title: string;
  unit: string;
  base: number;
  items: TornadoItem[];
  lowLabel?: string;
  highLabel?: string;
  width?: number;
  format?: Formatter;
  /** The value axis's title, before the unit (default `Result`). */
  valueTitle?: string;
  /** The category axis's title (default `Coefficient moved`). */
  categoryTitle?: string;
}

export function tornado(input: TornadoInput): Chart {
  const width = input.width ?? 720;
  const items = [...input.items].sort((a, b) => Math.abs(b.high - b.low) - Math.abs(a.high - a.low));
  const labelW = TITLE_ROOM + labelWidth(items.map((it) => it.label), 36);
  const right = 70;
  const top = 46;
  const barH = 18;
  const gap = 6;
  const height = top + items.length * (barH + gap) + AXIS_ROOM;
  let lo = input.base;
  let hi = input.base;
  for (const it of items) {
    lo = Math.min(lo, it.low, it.high);
    hi = Math.max(hi, it.low, it.high);
  }
  if (lo === hi) {
    lo -= 1;
    hi += 1;
  }
  const x = scaleLinear().domain([lo, hi]).nice().range([labelW, width - right]);
  const cLow = SERIES_COLOURS[0]!;
  const cHigh = SERIES_COLOURS[5]!;
  const parts: string[] = [];
  const fmt = groupOf(input.format, [input.base, ...items.flatMap((it) => [it.low, it.high])]);
  parts.push(legend([{ label: input.lowLabel ?? 'Input at its low value', colour: cLow }, { label: input.highLabel ?? 'Input at its high value', colour: cHigh }, { label: `Base result ${fmt(input.base)}`, colour: INK, shape: 'line' }], labelW));
  parts.push(valueAxis(x, top, height, axisTitle(input.valueTitle ?? 'Result', input.unit), input.format));
  parts.push(verticalTitle(input.categoryTitle ?? 'Coefficient moved', top, height - AXIS_ROOM));
  items.forEach((it, r) => {
    const y = top + r * (barH + gap);
    parts.push(text({ x: labelW - 8, y: y + barH - 5, 'text-anchor': 'end', fill: INK }, clip(it.label, 36)));
    for (const [v, c, w] of [[it.low, cLow, 'low'], [it.high, cHigh, 'high']] as const) {
      const a = Math.min(x(input.base), x(v));
      const b = Math.max(x(input.base), x(v));
      parts.push(el('rect', { x: a, y, width: Math.max(0.5, b - a), height: barH, fill: c }, el('title', {}, escapeXml(`${it.label}: ${w} ${fmt(v)} ${input.unit}`))));
    }
  });
  parts.push(el('line', { x1: x(input.base), x2: x(input.base), y1: top - 6, y2: height - AXIS_ROOM + 4, stroke: INK }));
  return svgRoot(width, height, input.title, `Tornado of ${items.length} inputs around the base result ${fmt(input.base)} ${input.unit}.`, parts.join(''));
}
