/**
 * Text cells that a spreadsheet program could take for a formula (they begin with `=`, `+`, `-`,
 * `@`, a tab or a carriage return) are neutralised before they are written to CSV or XLSX: a
 * single quote goes in front and the text is kept otherwise. Numbers, negative ones included,
 * are never passed through here: they stay numbers. Every writer of cells (tables, matrices,
 * reports) uses this one function.
 *
 * A text that already begins with quotes before such a character gets one more, so that
 * `restoreText` (used by the readers) gives back exactly what was written.
 */
const RISKY = /^'*[=+\-@\t\r]/;
const NEUTRALISED = /^'+[=+\-@\t\r]/;

/** The text to write in a cell: a leading single quote when the text could be read as a formula. */
export function neutraliseText(text: string): string {
  return RISKY.test(text) ? `'${text}` : text;
}

/** The text a neutralised cell stood for (the readers' side of `neutraliseText`). */
export function restoreText(text: string): string {
  return NEUTRALISED.test(text) ? text.slice(1) : text;
}
