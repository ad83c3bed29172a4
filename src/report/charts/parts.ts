/** Pieces that several charts share: the legend row, the value axis with its grid and title, and the category axis's title. */
import type { ScaleLinear } from 'd3';
import { el, round, text } from './svg';
import type { Formatter } from './format';
import { ticksOf } from './format';
import { AXIS, GRID, INK, SERIES_COLOURS } from './palette';

/** Room below the last bar for the tick values and the axis title. */
export const AXIS_ROOM = 46;
/** Room left of the category labels for the category axis's title. */
export const TITLE_ROOM = 20;

export interface LegendItem {
  label: string;
  colour?: string;
  /** How the key is drawn: a square (bars, default), a dot (points) or a line (markers). */
  shape?: 'square' | 'dot' | 'line';
}

/** A row of colour keys starting at x0, on the line at y (every colour of a chart has one). */
export function legend(items: LegendItem[], x0: number, y = 8): string {
  const parts: string[] = [];
  let lx = x0;
  items.forEach((s, k) => {
    const c = s.colour ?? SERIES_COLOURS[k % SERIES_COLOURS.length]!;
    if (s.shape === 'dot') parts.push(el('circle', { cx: lx + 6, cy: y + 6, r: 5, fill: c, class: 'rw-key' }));
    else if (s.shape === 'line') parts.push(el('line', { x1: lx, x2: lx + 12, y1: y + 6, y2: y + 6, stroke: c, 'stroke-width': 2, class: 'rw-key' }));
    else parts.push(el('rect', { x: lx, y, width: 12, height: 12, fill: c, class: 'rw-key' }));
    parts.push(text({ x: lx + 16, y: y + 10, fill: INK }, s.label));
    lx += 24 + s.label.length * 7;
  });
  return el('g', { class: 'rw-legend' }, ...parts);
}

/** An axis title with its unit: `Impact (EUR millions)`; the unit alone when the title is empty. */
export function axisTitle(title: string | undefined, unit: string): string {
  if (!title) return unit;
  return unit ? `${title} (${unit})` : title;
}

/**
 * The horizontal value axis of a chart `height` pixels high: vertical grid lines at the scale's
 * ticks from `top`, their values below the plot (digits from the step between ticks), and the
 * axis title (with its unit) centred under them, at the axis. The zero line is drawn darker.
 */
export function valueAxis(x: ScaleLinear<number, number>, top: number, height: number, title: string, fmt: Formatter | undefined): string {
  const parts: string[] = [];
  const ticks = x.ticks(6);
  const tf = ticksOf(fmt, ticks);
  const base = height - AXIS_ROOM + 4;
  for (const t of ticks) {
    parts.push(el('line', { x1: x(t), x2: x(t), y1: top - 6, y2: base, stroke: t === 0 ? AXIS : GRID }));
    parts.push(text({ x: x(t), y: base + 14, 'text-anchor': 'middle', fill: AXIS, 'font-size': 11 }, tf(t)));
  }
  const [a, b] = x.range() as [number, number];
  parts.push(text({ x: (a + b) / 2, y: height - 8, 'text-anchor': 'middle', fill: INK, 'font-size': 11, class: 'rw-axis-title rw-x-title' }, title));
  return parts.join('');
}

/** The vertical axis's title, rotated along the axis at the chart's left edge, centred between `top` and `bottom`. */
export function verticalTitle(title: string, top: number, bottom: number, x = 12): string {
  const mid = (top + bottom) / 2;
  return text({ x, y: mid, 'text-anchor': 'middle', fill: INK, 'font-size': 11, transform: `rotate(-90 ${round(x)} ${round(mid)})`, class: 'rw-axis-title rw-y-title' }, title);
}
