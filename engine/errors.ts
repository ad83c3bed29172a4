/**
 * Typed errors. Every failure says what went wrong, where, and (where it helps) what to do.
 * A caller that catches one can read `code` (a stable word of our own) and `where`.
 */

/** Where a problem is: as much of this as is known. Rows and columns are counted from 1. */
export interface Where {
  file?: string;
  sheet?: string;
  /** An A1-style cell reference, such as `C14`. */
  cell?: string;
  row?: number;
  column?: number;
  rowLabel?: string;
  columnLabel?: string;
  /** A sector code. */
  sector?: string;
  /** Several sector codes (a group). */
  sectors?: string[];
  /** The text found in the cell. */
  text?: string;
}

/** Bad input: data, options or arguments that cannot be used as given. */
export class InputError extends Error {
  override name = 'InputError';
  constructor(
    readonly code: string,
    message: string,
    readonly where: Where = {},
    readonly hint?: string,
  ) {
    super(hint ? `${message}. ${hint}` : message);
  }
}

/**
 * A matrix that cannot be factored: as LAPACK's `getrf` reports it, `column` is the 1-based
 * index of the first exactly zero pivot.
 */
export class SingularMatrixError extends Error {
  override name = 'SingularMatrixError';
  readonly code = 'singular';
  constructor(
    readonly column: number,
    message = `the matrix is singular: the pivot in column ${column} is exactly zero`,
  ) {
    super(message);
  }
}

/** Work stopped because the caller asked it to. */
export class CancelledError extends Error {
  override name = 'CancelledError';
  readonly code = 'cancelled';
  constructor(message = 'the work was cancelled') {
    super(message);
  }
}

/** A-style column letters for a 1-based column number: 1 → A, 27 → AA. */
export function columnLetters(column: number): string {
  let s = '';
  let c = column;
  while (c > 0) {
    const r = (c - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    c = Math.floor((c - 1) / 26);
  }
  return s;
}

/** An A1 reference for a 1-based row and column. */
export function cellRef(row: number, column: number): string {
  return `${columnLetters(column)}${row}`;
}

/** One readable line for a location, such as `file use.csv, sheet 'Use', cell C14 (row 'Fishing', column 'Exports')`. */
export function describeWhere(w: Where): string {
  const parts: string[] = [];
  if (w.file) parts.push(`file ${w.file}`);
  if (w.sheet) parts.push(`sheet '${w.sheet}'`);
  if (w.cell) parts.push(`cell ${w.cell}`);
  else {
    if (w.row !== undefined) parts.push(`row ${w.row}`);
    if (w.column !== undefined) parts.push(`column ${w.column}`);
  }
  const labels: string[] = [];
  if (w.rowLabel) labels.push(`row '${w.rowLabel}'`);
  if (w.columnLabel) labels.push(`column '${w.columnLabel}'`);
  if (labels.length) parts.push(`(${labels.join(', ')})`);
  if (w.sector && !w.rowLabel) parts.push(`sector ${w.sector}`);
  return parts.join(', ');
}
