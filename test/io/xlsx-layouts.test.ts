/**
 * A workbook laid out as agencies often lay them out (common practice): a notes sheet first;
 * title and unit rows; a group header merged over the intermediate and the final-use columns;
 * a header row of names ('A Agriculture'), headed 'Code' over the leading columns, above a row of
 * codes; footnote marks in labels; a subtotal row without a code; national-accounts codes for
 * value added and output; footnotes and a source line below. The numbers are invented; the reader
 * must give back the table the workbook was built from.
 */
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { readTableFile } from '../../src/io/open';

const S = ['Agriculture', 'Manufacturing', 'Services'];
const codes = ['A', 'C', 'G-U'];
const Z = [
  [10, 20, 5],
  [15, 40, 25],
  [5, 30, 50],
];
const F = [
  [50, 15],
  [80, 40],
  [100, 15],
];
const V = [
  [40, 60, 70],
  [30, 50, 50],
];
const X = [100, 200, 200];

async function workbook(): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  const notes = wb.addWorksheet('Notes');
  notes.addRow(['About this workbook']);
  notes.addRow(['Invented figures for testing.']);
  const ws = wb.addWorksheet('Table 1');
  ws.addRow(['Table 1. Symmetric input-output table, 2022 (invented data)']);
  ws.addRow(['EUR million']);
  ws.addRow([]);
  ws.addRow(['', '', 'Intermediate use', '', '', 'Final uses', '', '']);
  ws.mergeCells('C4:E4');
  ws.mergeCells('F4:G4');
  ws.addRow(['Code', 'Products', 'A Agriculture', 'C Manufacturing', 'G-U Services', 'Final consumption', 'Exports (a)', 'Total use']);
  ws.addRow(['', '', 'A', 'C', 'G-U', 'P3', 'P6', 'TU']);
  S.forEach((s, i) => ws.addRow([codes[i], s, ...Z[i]!, ...F[i]!, X[i]]));
  ws.addRow(['', 'Total intermediate consumption', ...[0, 1, 2].map((j) => Z.reduce((a, r) => a + r[j]!, 0))]);
  ws.addRow(['D1', 'Compensation of employees (b)', ...V[0]!]);
  ws.addRow(['B2A3G', 'Operating surplus, gross', ...V[1]!]);
  ws.addRow(['P1', 'Output at basic prices', ...X]);
  ws.addRow([]);
  ws.addRow(['(a) Including re-exports.']);
  ws.addRow(["(b) Wages and salaries with employers' social contributions."]);
  ws.addRow(['Source: invented.']);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe('an agency-style workbook', () => {
  it('is read from its second sheet, codes from the row below the names, with every block in place', async () => {
    const r = await readTableFile(await workbook(), { file: 'book.xlsx' });
    const t = r.table;
    expect(t.sectors.codes).toEqual(codes);
    expect(t.sectors.labels).toEqual(S);
    expect(Array.from(t.Z.data)).toEqual(Z.flat());
    expect(t.finalDemand.codes).toEqual(['P3', 'P6']);
    expect(Array.from(t.F.data)).toEqual(F.flat());
    expect(t.valueAdded.codes).toEqual(['D1', 'B2A3G']);
    expect(Array.from(t.V.data)).toEqual(V.flat());
    expect(Array.from(t.x)).toEqual(X);
    expect(t.meta.year).toBe(2022);
    expect(t.meta.scale).toBe(1e6);
    expect(r.findings.find((f) => f.code === 'sheet-chosen')!.message).toMatch(/read sheet 'Table 1'/);
    expect(r.findings.filter((f) => f.severity === 'warning' || f.severity === 'error')).toEqual([]);
  });
});
