/** Plain-text tables and findings for a terminal. */
import type { Finding } from '../../engine/findings';
import { sortFindings } from '../../engine/findings';
import { describeWhere } from '../../engine/errors';
import { COLOUR_MARK, styles } from './context';

export interface TextColumn {
  label: string;
  align?: 'left' | 'right';
}

/** Columns padded to their widest cell; numbers right-aligned. */
export function textTable(columns: TextColumn[], rows: string[][]): string {
  const w = columns.map((c, j) => Math.max(c.label.length, ...rows.map((r) => (r[j] ?? '').length)));
  const line = (cells: string[]) =>
    cells
      .map((s, j) => (columns[j]!.align === 'right' ? s.padStart(w[j]!) : s.padEnd(w[j]!)))
      .join('  ')
      .trimEnd();
  return [line(columns.map((c) => c.label)), line(w.map((n) => '-'.repeat(n))), ...rows.map(line)].join('\n') + '\n';
}

/** A number for a terminal: fixed digits, blank for NaN. */
export function fixed(v: number | null | undefined, digits: number): string {
  return typeof v === 'number' && Number.isFinite(v) ? v.toFixed(digits) : '';
}

export function findingsText(findings: readonly Finding[], colour: boolean): string {
  const s = styles(colour);
  const paint = (sev: string) => (sev === 'error' ? s.red(sev) : sev === 'warning' ? s.yellow(sev) : s.dim(sev));
  return sortFindings(findings)
    .map((f) => {
      const where = f.where ? describeWhere(f.where) : '';
      return `  ${paint(f.severity.padEnd(7))} ${f.code}: ${f.message}${where ? ` (${where})` : ''}`;
    })
    .join('\n');
}

export const CAUTION_LINE =
  'Cautions: fixed coefficients, no capacity limits, gross not net effects, not a forecast; have a qualified economist review results and follow local guidance first.';

/**
 * Text bound for a terminal or a pipe, with what the data could use to take over the screen
 * shown as escapes instead: C0 and C1 control characters (`\x1b`, `\x0d`, `\x9b`) and the
 * Unicode bidirectional controls (`\u202e`, which would show a label backwards), so that a
 * label read from a file can neither move the cursor, rewrite a line, set a title, colour the
 * text nor reorder it. Line feeds and tabs are kept. The program's own colours (marked by
 * `styles`, see COLOUR_MARK) become escape sequences only after that, so colour comes from the
 * program alone.
 */
export function terminalSafe(s: string): string {
  const safe = s.replace(/[\u0000-\u0008\u000b-\u001f\u007f-\u009f]|[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, (m) => {
    const c = m.charCodeAt(0);
    return c < 0x100 ? `\\x${c.toString(16).padStart(2, '0')}` : `\\u${c.toString(16).padStart(4, '0')}`;
  });
  return safe.indexOf(COLOUR_MARK) < 0 ? safe : safe.split(COLOUR_MARK).join('\u001b[');
}

/** JSON with NaN and infinities as null and typed arrays as lists. */
export function jsonText(v: unknown): string {
  return (
    JSON.stringify(
      v,
      (_k, x) => {
        if (typeof x === 'number' && !Number.isFinite(x)) return null;
        if (ArrayBuffer.isView(x) && !(x instanceof DataView)) return Array.from(x as unknown as ArrayLike<number>, (y) => (Number.isFinite(y) ? y : null));
        return x;
      },
      2,
    ) + '\n'
  );
}
