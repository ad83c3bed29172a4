/**
 * The view of a zoomable picture (the heat map): content pixels map to viewport pixels as
 * screen = content × s + t. Pure functions, so that the pointer, the keys and the buttons all move
 * the same view, and tests can check the arithmetic.
 */

/** Above this many rows or columns the heat map is drawn on a canvas instead of as SVG. */
export const CANVAS_ABOVE = 200;

export interface View {
  s: number;
  tx: number;
  ty: number;
}

/** Zoom by `factor` about the point (px, py) of the viewport, keeping that point still. */
export function zoomAt(v: View, factor: number, px: number, py: number, min = 1, max = 64): View {
  const s = Math.min(max, Math.max(min, v.s * factor));
  const k = s / v.s;
  return { s, tx: px - (px - v.tx) * k, ty: py - (py - v.ty) * k };
}

/** Keep the content (w × h at scale 1) covering the viewport (vw × vh) where it can. */
export function clampView(v: View, w: number, h: number, vw: number, vh: number): View {
  const lim = (t: number, size: number, port: number) => (size * v.s <= port ? 0 : Math.min(0, Math.max(port - size * v.s, t)));
  return { s: v.s, tx: lim(v.tx, w, vw), ty: lim(v.ty, h, vh) };
}

/** The cell under a viewport point, or null outside the grid. */
export function cellAt(v: View, grid: { x: number; y: number; cell: number; rows: number; cols: number }, px: number, py: number): { i: number; j: number } | null {
  const x = (px - v.tx) / v.s;
  const y = (py - v.ty) / v.s;
  const j = Math.floor((x - grid.x) / grid.cell);
  const i = Math.floor((y - grid.y) / grid.cell);
  if (i < 0 || j < 0 || i >= grid.rows || j >= grid.cols) return null;
  return { i, j };
}
