/**
 * The linkage quadrant: backward linkage (power of dispersion) across, forward linkage
 * (sensitivity of dispersion) up, both normalised to a mean of 1, with lines at 1 dividing the
 * four groups of the usual key-sector classification (common practice, after Rasmussen 1956 and
 * Hirschman 1958): key sectors (both above 1), backward-oriented, forward-oriented, and weakly
 * linked.
 */
import { scaleLinear } from 'd3';
import type { Chart } from './svg';
import { clip, el, escapeXml, svgRoot, text } from './svg';
import type { Formatter } from './format';
import { numberFormat } from './format';
import { AXIS, GRID, INK, SERIES_COLOURS } from './palette';

export interface QuadrantInput {
  title: string;
  codes: string[];
  labels: string[];
  backward: ArrayLike<number>;
  forward: ArrayLike<number>;
  /** Label the points with codes (default when there are at most 40 sectors). */
  labelPoints?: boolean;
  width?: number;
  height?: number;
  format?: Formatter;
  /** Words for the four quadrants. */
  names?: { key: string; backward: string; forward: string; weak: string };
}

export function linkageQuadrant(input: QuadrantInput): Chart {
  const fmt = input.format ?? numberFormat(undefined, 2);
  const width = input.width ?? 640;
  const height = input.height ?? 480;
  const names = input.names ?? { key: 'Key sectors', backward: 'Strong backward linkage', forward: 'Strong forward linkage', weak: 'Weak linkages' };
  const n = input.codes.length;
  const m = { left: 56, right: 20, top: 20, bottom: 44 };
  let xmin = 1;
  let xmax = 1;
  let ymin = 1;
  let ymax = 1;
  for (let i = 0; i < n; i++) {
    const bx = input.backward[i]!;
    const fy = input.forward[i]!;
    if (!Number.isFinite(bx) || !Number.isFinite(fy)) continue;
    xmin = Math.min(xmin, bx);
    xmax = Math.max(xmax, bx);
    ymin = Math.min(ymin, fy);
    ymax = Math.max(ymax, fy);
  }
  const pad = (a: number, b: number) => Math.max(0.05, (b - a) * 0.08);
  const x = scaleLinear().domain([xmin - pad(xmin, xmax), xmax + pad(xmin, xmax)]).nice().range([m.left, width - m.right]);
  const y = scaleLinear().domain([ymin - pad(ymin, ymax), ymax + pad(ymin, ymax)]).nice().range([height - m.bottom, m.top]);
  const parts: string[] = [];
  for (const t of x.ticks(6)) {
    parts.push(el('line', { x1: x(t), x2: x(t), y1: m.top, y2: height - m.bottom, stroke: GRID }));
    parts.push(text({ x: x(t), y: height - m.bottom + 16, 'text-anchor': 'middle', fill: AXIS, 'font-size': 11 }, fmt(t)));
  }
  for (const t of y.ticks(6)) {
    parts.push(el('line', { x1: m.left, x2: width - m.right, y1: y(t), y2: y(t), stroke: GRID }));
    parts.push(text({ x: m.left - 6, y: y(t) + 4, 'text-anchor': 'end', fill: AXIS, 'font-size': 11 }, fmt(t)));
  }
  parts.push(el('line', { x1: x(1), x2: x(1), y1: m.top, y2: height - m.bottom, stroke: AXIS, 'stroke-dasharray': '5 3' }));
  parts.push(el('line', { x1: m.left, x2: width - m.right, y1: y(1), y2: y(1), stroke: AXIS, 'stroke-dasharray': '5 3' }));
  const q = (label: string, qx: number, qy: number, anchor: string) =>
    parts.push(text({ x: qx, y: qy, 'text-anchor': anchor, fill: AXIS, 'font-size': 11, 'font-style': 'italic' }, label));
  q(names.key, width - m.right - 4, m.top + 14, 'end');
  q(names.forward, m.left + 4, m.top + 14, 'start');
  q(names.backward, width - m.right - 4, height - m.bottom - 6, 'end');
  q(names.weak, m.left + 4, height - m.bottom - 6, 'start');
  parts.push(text({ x: (m.left + width - m.right) / 2, y: height - 8, 'text-anchor': 'middle', fill: INK }, 'Backward linkage (power of dispersion)'));
  parts.push(text({ x: 14, y: (m.top + height - m.bottom) / 2, 'text-anchor': 'middle', fill: INK, transform: `rotate(-90 14 ${(m.top + height - m.bottom) / 2})` }, 'Forward linkage (sensitivity of dispersion)'));
  const showLabels = input.labelPoints ?? n <= 40;
  for (let i = 0; i < n; i++) {
    const bx = input.backward[i]!;
    const fy = input.forward[i]!;
    if (!Number.isFinite(bx) || !Number.isFinite(fy)) continue;
    const key = bx > 1 && fy > 1;
    parts.push(
      el(
        'circle',
        { cx: x(bx), cy: y(fy), r: key ? 5 : 4, fill: key ? SERIES_COLOURS[5] : SERIES_COLOURS[0], 'fill-opacity': 0.85 },
        el('title', {}, escapeXml(`${input.labels[i]} (${input.codes[i]}): backward ${fmt(bx)}, forward ${fmt(fy)}`)),
      ),
    );
    if (showLabels) parts.push(text({ x: x(bx) + 6, y: y(fy) - 5, fill: INK, 'font-size': 10 }, clip(input.codes[i]!, 10)));
  }
  const keys = Array.from({ length: n }, (_, i) => i).filter((i) => input.backward[i]! > 1 && input.forward[i]! > 1);
  const desc = `Scatter of backward against forward linkage for ${n} sectors; lines at 1 (the average). ${keys.length} key sector${keys.length === 1 ? '' : 's'}${keys.length ? `: ${keys.slice(0, 10).map((i) => input.labels[i]).join(', ')}` : ''}.`;
  return svgRoot(width, height, input.title, desc, parts.join(''));
}
