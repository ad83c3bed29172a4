/** Pieces that several horizontal charts share: the legend row and the value axis with its grid. */
import type { ScaleLinear } from 'd3';
import { el, text } from './svg';
import type { Formatter } from './format';
import { AXIS, GRID, INK, SERIES_COLOURS } from './palette';

/** A row of colour keys starting at x0, on the line at y. */
export function legend(items: { label: string; colour?: string }[], x0: number, y = 8): string {
  const parts: string[] = [];
  let lx = x0;
  items.forEach((s, k) => {
    const c = s.colour ?? SERIES_COLOURS[k % SERIES_COLOURS.length]!;
    parts.push(el('rect', { x: lx, y, width: 12, height: 12, fill: c }));
    parts.push(text({ x: lx + 16, y: y + 10, fill: INK }, s.label));
    lx += 24 + s.label.length * 7;
  });
  return parts.join('');
}

/**
 * Vertical grid lines at the scale's ticks between y `top` and `bottom`, their values below, and
 * the unit at the top right. The zero line is drawn darker.
 */
export function valueAxis(x: ScaleLinear<number, number>, top: number, bottom: number, unit: string, fmt: Formatter): string {
  const parts: string[] = [];
  for (const t of x.ticks(6)) {
    parts.push(el('line', { x1: x(t), x2: x(t), y1: top - 6, y2: bottom - 26, stroke: t === 0 ? AXIS : GRID }));
    parts.push(text({ x: x(t), y: bottom - 12, 'text-anchor': 'middle', fill: AXIS, 'font-size': 11 }, fmt(t)));
  }
  parts.push(text({ x: x.range()[1]!, y: 34, 'text-anchor': 'end', fill: AXIS, 'font-size': 11 }, unit));
  return parts.join('');
}
