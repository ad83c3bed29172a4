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
import { groupOf, ticksOf } from './format';
import { placeLabels, textWidth } from './labels';
import { legend, verticalTitle } from './parts';
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
  const width = input.width ?? 640;
  const height = input.height ?? 480;
  const names = input.names ?? { key: 'Key sectors', backward: 'Strong backward linkage', forward: 'Strong forward linkage', weak: 'Weak linkages' };
  const n = input.codes.length;
  const m = { left: 62, right: 20, top: 40, bottom: 46 };
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
  const fmt = groupOf(input.format, [...Array.from(input.backward), ...Array.from(input.forward)]);
  const xt = ticksOf(input.format, x.ticks(6));
  const yt = ticksOf(input.format, y.ticks(6));
  // Every colour has a key: the key sectors and the others.
  parts.push(legend([{ label: `${names.key} (both above 1)`, colour: SERIES_COLOURS[5], shape: 'dot' }, { label: 'Other sectors', colour: SERIES_COLOURS[0], shape: 'dot' }], m.left, 10));
  for (const t of x.ticks(6)) {
    parts.push(el('line', { x1: x(t), x2: x(t), y1: m.top, y2: height - m.bottom, stroke: GRID }));
    parts.push(text({ x: x(t), y: height - m.bottom + 16, 'text-anchor': 'middle', fill: AXIS, 'font-size': 11 }, xt(t)));
  }
  for (const t of y.ticks(6)) {
    parts.push(el('line', { x1: m.left, x2: width - m.right, y1: y(t), y2: y(t), stroke: GRID }));
    parts.push(text({ x: m.left - 6, y: y(t) + 4, 'text-anchor': 'end', fill: AXIS, 'font-size': 11 }, yt(t)));
  }
  parts.push(el('line', { x1: x(1), x2: x(1), y1: m.top, y2: height - m.bottom, stroke: AXIS, 'stroke-dasharray': '5 3' }));
  parts.push(el('line', { x1: m.left, x2: width - m.right, y1: y(1), y2: y(1), stroke: AXIS, 'stroke-dasharray': '5 3' }));
  const q = (label: string, qx: number, qy: number, anchor: string) =>
    parts.push(text({ x: qx, y: qy, 'text-anchor': anchor, fill: AXIS, 'font-size': 11, 'font-style': 'italic' }, label));
  q(names.key, width - m.right - 4, m.top + 14, 'end');
  q(names.forward, m.left + 4, m.top + 14, 'start');
  q(names.backward, width - m.right - 4, height - m.bottom - 6, 'end');
  q(names.weak, m.left + 4, height - m.bottom - 6, 'start');
  parts.push(text({ x: (m.left + width - m.right) / 2, y: height - 8, 'text-anchor': 'middle', fill: INK, 'font-size': 11, class: 'rw-axis-title rw-x-title' }, 'Backward linkage (power of dispersion; index, average = 1)'));
  parts.push(verticalTitle('Forward linkage (sensitivity of dispersion; index, average = 1)', m.top, height - m.bottom, 14));
  const showLabels = input.labelPoints ?? n <= 40;
  const drawn = Array.from({ length: n }, (_, i) => i).filter((i) => Number.isFinite(input.backward[i]!) && Number.isFinite(input.forward[i]!));
  // Labels placed so that none overlaps another or a point (src/report/charts/labels.ts).
  const codes = drawn.map((i) => clip(input.codes[i]!, 10));
  const placed = showLabels
    ? placeLabels(
        drawn.map((i, k) => ({ x: x(input.backward[i]!), y: y(input.forward[i]!), width: textWidth(codes[k]!.length), height: 11 })),
        { x: m.left, y: m.top, width: width - m.left - m.right, height: height - m.top - m.bottom },
      )
    : [];
  const labelParts: string[] = [];
  let hidden = 0;
  placed.forEach((p, k) => {
    const i = drawn[k]!;
    if (!p.box) {
      hidden++;
      return;
    }
    const px = x(input.backward[i]!);
    const py = y(input.forward[i]!);
    if (p.leader) {
      const cx = Math.max(p.box.x, Math.min(px, p.box.x + p.box.width));
      const cy = Math.max(p.box.y, Math.min(py, p.box.y + p.box.height));
      labelParts.push(el('line', { x1: px, y1: py, x2: cx, y2: cy, stroke: AXIS, 'stroke-width': 0.6 }));
    }
    labelParts.push(text({ x: p.box.x + 1, y: p.box.y + p.box.height - 2, fill: INK, 'font-size': 10, class: 'rw-point-label' }, codes[k]!));
  });
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
  }
  parts.push(...labelParts);
  const keys = Array.from({ length: n }, (_, i) => i).filter((i) => input.backward[i]! > 1 && input.forward[i]! > 1);
  const desc = `Scatter of backward against forward linkage for ${n} sectors; lines at 1 (the average). ${keys.length} key sector${keys.length === 1 ? '' : 's'}${keys.length ? `: ${keys.slice(0, 10).map((i) => input.labels[i]).join(', ')}` : ''}.${hidden ? ` ${hidden} point label${hidden === 1 ? '' : 's'} left out for want of room (each point's tooltip names it).` : ''}`;
  return svgRoot(width, height, input.title, desc, parts.join(''));
}
