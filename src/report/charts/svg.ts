/**
 * A very small SVG writer: every text and attribute value is escaped, so that labels from a
 * file (which may hold markup or script) can never become markup. Charts use presentation
 * attributes (fill, stroke) and class names, never inline `style`, so that they pass a strict
 * Content-Security-Policy.
 */

const ESC: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Escape text for XML and HTML content and attribute values. */
export function escapeXml(s: unknown): string {
  return String(s).replace(/[&<>"']/g, (c) => ESC[c]!);
}

export type Attrs = Record<string, string | number | undefined | null | false>;

/** One element: `el('rect', { x: 1 })`, or with children (already-escaped strings). */
export function el(tag: string, attrs: Attrs = {}, ...children: string[]): string {
  const a = Object.entries(attrs)
    .filter(([, v]) => v !== undefined && v !== null && v !== false)
    .map(([k, v]) => ` ${k}="${escapeXml(typeof v === 'number' ? round(v) : v)}"`)
    .join('');
  return children.length ? `<${tag}${a}>${children.join('')}</${tag}>` : `<${tag}${a}/>`;
}

/** A text element whose content is escaped. */
export function text(attrs: Attrs, content: string): string {
  return el('text', attrs, escapeXml(content));
}

/** Coordinates to two decimals: shorter files, no visible difference. */
export function round(v: number): string {
  return Number.isFinite(v) ? String(Math.round(v * 100) / 100) : '0';
}

export interface Chart {
  /** The whole `<svg>` element. */
  svg: string;
  width: number;
  height: number;
  title: string;
}

/** Wrap chart content in an accessible `<svg>` with a title and a description. */
export function svgRoot(width: number, height: number, title: string, desc: string, body: string, className = 'rw-chart'): Chart {
  const id = `c${hash(title + desc)}`;
  const svg = el(
    'svg',
    {
      xmlns: 'http://www.w3.org/2000/svg',
      viewBox: `0 0 ${round(width)} ${round(height)}`,
      width: round(width),
      height: round(height),
      role: 'img',
      'aria-labelledby': `${id}-t ${id}-d`,
      class: className,
      'font-family': 'system-ui, sans-serif',
      'font-size': 12,
    },
    el('title', { id: `${id}-t` }, escapeXml(title)),
    el('desc', { id: `${id}-d` }, escapeXml(desc)),
    body,
  );
  return { svg, width, height, title };
}

function hash(s: string): string {
  let h = 2166136261;
  for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 16777619);
  return (h >>> 0).toString(36);
}

/** Shorten a label to about `max` characters with an ellipsis. */
export function clip(label: string, max: number): string {
  return label.length <= max ? label : `${label.slice(0, Math.max(1, max - 1))}…`;
}

/** Room for the longest label (clipped to `max` characters) at the default font size. */
export function labelWidth(labels: readonly string[], max: number): number {
  let longest = 0;
  for (const l of labels) longest = Math.max(longest, Math.min(max, l.length));
  // About 7.2 pixels a character at 12 pixels of a system sans-serif (6.6 clipped long labels).
  return Math.round(Math.min(16 + 7.2 * max, Math.max(60, 16 + 7.2 * longest)));
}
