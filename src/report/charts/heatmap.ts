/**
 * A matrix as a heat map: one square per cell (row i, column j), its colour by the value on a
 * square-root scale (so that the many small coefficients stay visible beside the few large
 * ones), zero cells left empty, negative values in a second hue. Codes label the rows and columns
 * when the cells are large enough; the legend shows the scale. `heatColour` is exported so that a
 * canvas drawing of a large matrix uses exactly the same colours.
 */
import { interpolateOranges, interpolateYlGnBu } from 'd3';
import { InputError } from '../../../engine/errors';
import type { Chart } from './svg';
import { clip, el, escapeXml, round, svgRoot, text } from './svg';
import type { Formatter } from './format';
import { groupOf, numberFormat } from './format';
import { AXIS, INK } from './palette';

export interface HeatMapInput {
  title: string;
  /** What a value is, with its unit: `input per unit of the buying sector's output`. */
  unit: string;
  rows: number;
  cols: number;
  /** Row-major values, rows × cols. */
  values: ArrayLike<number>;
  /** Short labels (codes) for the axes, and full labels for the tooltips. */
  rowCodes: string[];
  colCodes: string[];
  rowLabels?: string[];
  colLabels?: string[];
  /** Words for the axes, such as `Supplying sector (row)`. */
  rowTitle?: string;
  colTitle?: string;
  /** Pixels per cell (default: fit about 560 pixels, between 2 and 28). */
  cell?: number;
  /** A tooltip (SVG title) on each cell when there are at most 3600 cells (default true). */
  titles?: boolean;
  format?: Formatter;
  /** Draw the colour legend under the grid (default true; the workbench draws it outside its zoomed view with `heatLegend`). */
  legend?: boolean;
}

export interface HeatLegendInput {
  /** The top of the scale (the largest absolute value). */
  max: number;
  unit: string;
  negatives?: boolean;
  /** Width of the colour ramp (default 240). */
  width?: number;
  format?: Formatter;
}

/** The note under the ramp: what the colours mean. */
export function heatNote(unit: string, negatives: boolean): string {
  return `${unit}; square-root colour scale; empty cells are zero${negatives ? '; negative values in orange' : ''}`;
}

/** The colour legend's parts at (x, y): the ramp from 0 to max with values at 0, a quarter and the top, and the note. */
function legendParts(x: number, y: number, input: HeatLegendInput, id: string): string[] {
  const { max } = input;
  const fmt = groupOf(input.format, [max]);
  const lw = input.width ?? 240;
  const stops: string[] = [];
  for (let k = 0; k <= 10; k++) stops.push(el('stop', { offset: `${k * 10}%`, 'stop-color': heatColour(Math.max(1e-12, (k / 10) ** 2 * max), max) || '#ffffff' }));
  const parts: string[] = [];
  parts.push(el('defs', {}, el('linearGradient', { id, x1: 0, x2: 1, y1: 0, y2: 0 }, ...stops)));
  parts.push(el('rect', { x, y, width: lw, height: 10, fill: `url(#${id})`, stroke: AXIS, 'stroke-width': 0.5 }));
  for (const f of [0, 0.25, 1]) {
    parts.push(text({ x: x + Math.sqrt(f) * lw, y: y + 24, 'text-anchor': f === 0 ? 'start' : f === 1 ? 'end' : 'middle', fill: AXIS, 'font-size': 10 }, fmt(f * max)));
  }
  if (input.negatives) {
    parts.push(el('rect', { x: x + lw + 12, y, width: 10, height: 10, fill: heatColour(-max, max), stroke: AXIS, 'stroke-width': 0.5 }));
    parts.push(text({ x: x + lw + 26, y: y + 9, fill: AXIS, 'font-size': 10 }, 'negative'));
  }
  parts.push(text({ x, y: y + 40, fill: AXIS, 'font-size': 10 }, heatNote(input.unit, !!input.negatives)));
  return parts;
}

/** The heat map's colour legend as an SVG of its own (the same scale and words as the chart's). */
export function heatLegend(input: HeatLegendInput): Chart {
  const note = heatNote(input.unit, !!input.negatives);
  const width = Math.max((input.width ?? 240) + (input.negatives ? 90 : 8), note.length * 5.6 + 8);
  const id = `hl${Math.round(input.max * 1e6).toString(36)}`;
  return svgRoot(width, 48, 'Colour scale', `Colours from 0 to ${(input.format ?? numberFormat())(input.max)} ${input.unit} on a square-root scale.`, legendParts(2, 2, input, id).join(''), 'rw-chart rw-heat-legend');
}

export interface HeatMapChart extends Chart {
  /** Where the cells are: the grid's top-left corner and the size of one cell, in chart pixels. */
  grid: { x: number; y: number; cell: number; rows: number; cols: number };
  /** The largest absolute value (the top of the colour scale). */
  max: number;
}

/** The colour of a value on a scale topped by `max`; '' for zero (the cell is left empty). */
export function heatColour(v: number, max: number): string {
  if (!Number.isFinite(v) || v === 0 || !(max > 0)) return '';
  const t = Math.sqrt(Math.min(1, Math.abs(v) / max));
  return v > 0 ? interpolateYlGnBu(0.12 + 0.88 * t) : interpolateOranges(0.25 + 0.75 * t);
}

/** The colour as [r, g, b] bytes (for canvas image data); null for an empty cell. */
export function heatRgb(v: number, max: number): [number, number, number] | null {
  const c = heatColour(v, max);
  if (!c) return null;
  const m = /^rgb\((\d+), ?(\d+), ?(\d+)\)$/.exec(c);
  if (m) return [Number(m[1]), Number(m[2]), Number(m[3])];
  const h = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(c);
  if (h) return [parseInt(h[1]!, 16), parseInt(h[2]!, 16), parseInt(h[3]!, 16)];
  return null;
}

export function heatMap(input: HeatMapInput): HeatMapChart {
  const { rows, cols, values } = input;
  const fmt = input.format ?? numberFormat();
  if (values.length !== rows * cols) throw new InputError('bad-size', `a heat map of ${rows} × ${cols} cells needs ${rows * cols} values; it was given ${values.length}`);
  const cell = input.cell ?? Math.max(2, Math.min(28, Math.floor(560 / Math.max(rows, cols))));
  const labels = cell >= 10;
  const codeW = labels ? Math.min(80, 10 + 6.6 * Math.max(...input.rowCodes.map((c) => Math.min(10, c.length)))) : 12;
  const codeH = labels ? Math.min(80, 10 + 5 * Math.max(...input.colCodes.map((c) => Math.min(10, c.length)))) : 12;
  const gx = 24 + codeW;
  const gy = 28 + codeH;
  const gridW = cols * cell;
  const gridH = rows * cell;
  let max = 0;
  let negatives = 0;
  let zeros = 0;
  for (let k = 0; k < values.length; k++) {
    const v = values[k]!;
    if (!Number.isFinite(v)) continue;
    if (v < 0) negatives++;
    if (v === 0) zeros++;
    max = Math.max(max, Math.abs(v));
  }
  const showLegend = input.legend ?? true;
  const note = showLegend ? heatNote(input.unit, negatives > 0) : '';
  // Room for the grid and for the legend's note (about 5.6 pixels a character at 10 pixels).
  const width = Math.max(gx + gridW + 16, gx + note.length * 5.6 + 16, 320);
  const height = gy + gridH + (showLegend ? 70 : 8);
  const parts: string[] = [];
  parts.push(el('rect', { x: gx, y: gy, width: gridW, height: gridH, fill: 'none', stroke: AXIS, 'stroke-width': 0.5, class: 'rw-grid' }));
  const titles = (input.titles ?? true) && rows * cols <= 3600;
  const rl = input.rowLabels ?? input.rowCodes;
  const cl = input.colLabels ?? input.colCodes;
  const cells: string[] = [];
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < cols; j++) {
      const v = values[i * cols + j]!;
      const c = heatColour(v, max);
      if (!c) continue;
      const attrs = { x: gx + j * cell, y: gy + i * cell, width: cell, height: cell, fill: c };
      cells.push(titles ? el('rect', attrs, el('title', {}, escapeXml(`${rl[i]} → ${cl[j]}: ${fmt(v)}`))) : el('rect', attrs));
    }
  }
  parts.push(el('g', { class: 'rw-cells' }, ...cells));
  if (labels) {
    for (let i = 0; i < rows; i++) parts.push(text({ x: gx - 4, y: gy + i * cell + cell / 2 + 4, 'text-anchor': 'end', fill: INK, 'font-size': 10 }, clip(input.rowCodes[i]!, 10)));
    for (let j = 0; j < cols; j++) {
      const x = gx + j * cell + cell / 2 + 3;
      parts.push(text({ x, y: gy - 4, 'text-anchor': 'start', fill: INK, 'font-size': 10, transform: `rotate(-60 ${round(x)} ${round(gy - 4)})` }, clip(input.colCodes[j]!, 10)));
    }
  }
  parts.push(text({ x: 12, y: gy + gridH / 2, 'text-anchor': 'middle', fill: INK, 'font-size': 11, transform: `rotate(-90 12 ${round(gy + gridH / 2)})` }, input.rowTitle ?? 'Row'));
  parts.push(text({ x: gx + gridW / 2, y: 14, 'text-anchor': 'middle', fill: INK, 'font-size': 11 }, input.colTitle ?? 'Column'));
  // Legend: the colour ramp from 0 to max.
  const ly = gy + gridH + 24;
  const lw = Math.min(240, Math.max(120, gridW));
  const id = `hm${Math.round(max * 1e6).toString(36)}${rows}x${cols}`;
  if (showLegend) parts.push(...legendParts(gx, ly, { max, unit: input.unit, negatives: negatives > 0, width: lw, format: input.format }, id));
  const desc =
    `Heat map of ${rows} × ${cols} values (${input.unit}), largest ${fmt(max)}; ${zeros} cell${zeros === 1 ? ' is' : 's are'} zero` +
    (negatives ? `, ${negatives} negative` : '') +
    '.';
  const chart = svgRoot(width, height, input.title, desc, parts.join(''));
  return { ...chart, grid: { x: gx, y: gy, cell, rows, cols }, max };
}
