/**
 * Text cells that a spreadsheet program could take for a formula (they begin with `=`, `+`, `-`,
 * `@`, a tab or a carriage return) are neutralised before they are written to CSV or XLSX: a
 * single quote goes in front and the text is kept otherwise. Numbers, negative ones included,
 * are never passed through here: they stay numbers. Every writer of cells (tables, matrices,
 * reports) uses `neutraliseText`.
 *
 * The table writers also protect texts that a reader would take for a number under another
 * decimal convention (a label `1,5` in a file written with decimal points), the same way; and
 * `restoreText` (used by the readers) undoes both exactly, so that what was written reads back
 * the same. A text written with a leading quote by a spreadsheet program (`'0110`) reads as its
 * text (`0110`).
 */
import { analyseNumber } from './numbers';

const RISKY = /^'*[=+\-@\t\r]/;
const NEUTRALISED = /^'+[=+\-@\t\r]/;

/** The text to write in a cell: a leading single quote when the text could be read as a formula. */
export function neutraliseText(text: string): string {
  return RISKY.test(text) ? `'${text}` : text;
}

function numeric(s: string): boolean {
  return analyseNumber(s.trim()) !== undefined;
}

/**
 * `neutraliseText`, and a leading quote also for a text that would read as a number written
 * under another convention than `decimal` (or as an ambiguous one), and for a quoted number.
 */
export function protectText(text: string, decimal: '.' | ','): string {
  if (RISKY.test(text)) return `'${text}`;
  if (/^'+/.test(text) && numeric(text.replace(/^'+/, ''))) return `'${text}`;
  const a = analyseNumber(text.trim());
  if (!a) return text;
  const consistent = a.k === 'plain' || (a.k === 'decimal' && a.mark === decimal && a.sep === undefined);
  return consistent ? text : `'${text}`;
}

/** The text a neutralised or protected cell stood for (the readers' side of both). */
export function restoreText(text: string): string {
  if (NEUTRALISED.test(text)) return text.slice(1);
  if (text.startsWith("'") && numeric(text.replace(/^'+/, ''))) return text.slice(1);
  return text;
}
