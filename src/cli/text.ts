/** Plain-text tables and findings for a terminal. */
import type { Finding } from '../../engine/findings';
import { sortFindings } from '../../engine/findings';
import { describeWhere } from '../../engine/errors';
import { styles } from './context';

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
 * Text bound for a terminal with the control characters of the data made visible (`\x1b`, `\x0d`):
 * a label read from a file can then neither move the cursor, rewrite a line nor set a title. Our
 * own colour codes (ESC [ digits m) are kept; line feeds and tabs too.
 */
export function terminalSafe(s: string): string {
  return s.replace(/\u001b\[[0-9;]*m|[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/g, (m) => (m.length > 1 ? m : `\\x${m.charCodeAt(0).toString(16).padStart(2, '0')}`));
}
