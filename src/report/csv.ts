/**
 * The report as one CSV file: the sheets of `reportSheets` one after another (the summary, every
 * table with its title, a header row whose labels carry their units, the rows, totals and notes,
 * then the inputs with their SHA-256, the settings, assumptions and cautions), separated by blank
 * lines. Written by src/io's `cellsToCsv`: text cells neutralised against formulas and quoted
 * where needed, numbers in their shortest exact form (never in a locale).
 */
import { cellsToCsv } from '../io/write';
import type { Cell } from '../io/grid';
import type { Report } from './model';
import { reportSheets } from './sheets';

/** The report as CSV text. */
export function writeCsv(report: Report): string {
  const rows: Cell[][] = [];
  // A failed table: the very first line says so, before any sheet.
  if (report.failed) rows.push([report.failed.message], []);
  for (const sheet of reportSheets(report)) {
    rows.push([`[${sheet.name}]`]);
    for (const r of sheet.rows) rows.push(r.cells.map((c) => c.value));
    rows.push([]);
  }
  return cellsToCsv(rows);
}
