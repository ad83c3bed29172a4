/**
 * Findings: the results of checks. Each has a severity, a code of our own, a plain message, and
 * where it is (sector codes, row and column labels, and the cells within the table's blocks so
 * that a reader can map them back to cells of the file).
 */
import type { Where } from './errors';

export type Severity = 'error' | 'warning' | 'note';

/** A block of the table: intermediate flows, final demand, value added, output, imports, or a satellite. */
export type Block = 'Z' | 'F' | 'V' | 'x' | 'imports' | 'satellite' | 'A' | 'make' | 'use' | 'closed';

/** One cell inside a block, 0-based (`col` is 0 for vectors). */
export interface CellAt {
  block: Block;
  row: number;
  col: number;
  /** For satellites: which one. */
  name?: string;
}

export interface Finding {
  code: string;
  severity: Severity;
  message: string;
  where?: Where;
  /** Cells involved, for a view that highlights them (at most a few dozen). */
  cells?: CellAt[];
  /** Numbers behind the message (the worst gap, the Perron root...). */
  data?: Record<string, number | string | number[] | string[]>;
}

export function hasErrors(findings: readonly Finding[]): boolean {
  return findings.some((f) => f.severity === 'error');
}

const ORDER: Record<Severity, number> = { error: 0, warning: 1, note: 2 };

/** Errors first, then warnings, then notes; stable within a severity. */
export function sortFindings(findings: readonly Finding[]): Finding[] {
  return findings
    .map((f, i) => [f, i] as const)
    .sort((a, b) => ORDER[a[0].severity] - ORDER[b[0].severity] || a[1] - b[1])
    .map(([f]) => f);
}
