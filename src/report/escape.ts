/**
 * Text cells bound for a spreadsheet (CSV or XLSX) that begin with `=`, `+`, `-`, `@`, a tab or
 * a carriage return could be taken as a formula by the program that opens the file (common
 * practice: the OWASP advice on CSV injection). Every text cell of a report (labels, codes,
 * notes; never numbers) goes through `neutraliseCell`, which forwards to src/io's
 * `neutraliseText`, the one function every writer of cells uses. Numbers are written as numbers,
 * so a negative impact stays a number.
 */
import { neutraliseText } from '../io/escape';

/** True when a text cell would be read as a formula (or as a control) by a spreadsheet. */
export function isRiskyText(s: string): boolean {
  return neutraliseText(s) !== s;
}

/** The text made inert for a spreadsheet: a leading single quote. */
export function neutraliseCell(s: string): string {
  return neutraliseText(s);
}
