/**
 * Workbooks that open with a contents sheet, and a national-style layout: title rows, a merged
 * header over the final-demand columns, rows of totals, imports and value added labelled only by
 * words, notes below (common practice in agency workbooks).
 */
import { describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { readTable, readXlsx } from '../../src/io';

async function workbook(): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  wb.addWorksheet('Contents').addRow(['This workbook holds table 2']);
  const ws = wb.addWorksheet('Table 2');
  ws.addRow(['Table 2. Input-output table at basic prices, 2019 (£ million)']);
  ws.addRow([]);
  ws.addRow(['', '', 'Industries', '', '', 'Final demand', '', '']);
  ws.mergeCells('C3:E3');
  ws.mergeCells('F3:G3');
  ws.addRow(['SIC', 'Product', 'Agriculture', 'Manufacturing', 'Services', 'Households', 'Exports', 'Total demand']);
  ws.addRow(['A', 'Agriculture', 10, 40, 5, 30, 20, 105]);
  ws.addRow(['C', 'Manufacturing', 25, 120, 60, 90, 200, 495]);
  ws.addRow(['S', 'Services', 15, 80, 150, 300, 50, 595]);
  ws.addRow(['', 'Total intermediate consumption', 50, 240, 215]);
  ws.addRow(['', 'Imports of goods and services', 5, 60, 30]);
  ws.addRow(['', 'Compensation of employees', 30, 115, 210]);
  ws.addRow(['', 'Gross operating surplus', 20, 80, 140]);
  ws.addRow(['', 'Total output at basic prices', 105, 495, 595]);
  ws.addRow([]);
  ws.addRow(['Notes: invented figures.']);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe('agency-style workbooks', () => {
  it('skip a contents sheet, say which sheet was read, and read the table', async () => {
    const x = await readXlsx(await workbook(), { file: 'n.xlsx' });
    expect(x.sheet).toBe('Table 2');
    expect(x.findings.find((f) => f.code === 'sheet-chosen')?.message).toMatch(/read sheet 'Table 2': its header row and lead column share \d+ codes, the largest such block; other candidates: none; the workbook also has 'Contents'/);
    const r = readTable(x.grid);
    const t = r.table;
    expect(t.sectors.labels).toEqual(['Agriculture', 'Manufacturing', 'Services']);
    expect(t.finalDemand.labels).toEqual(['Households', 'Exports']);
    expect(t.valueAdded.labels).toEqual(['Compensation of employees', 'Gross operating surplus']);
    expect(Array.from(t.imports!)).toEqual([5, 60, 30]);
    expect(Array.from(t.x)).toEqual([105, 495, 595]);
    expect(t.meta.scale).toBe(1e6);
    expect(t.meta.currency).toBe('£');
    expect(t.meta.year).toBe(2019);
    // The totals row and column are checks, not data.
    expect(t.valueAdded.labels.some((l) => /total/i.test(l))).toBe(false);
  });

  it('read the sheet asked for, even one without numbers (and say there is no table)', async () => {
    const bytes = await workbook();
    const x = await readXlsx(bytes, { file: 'n.xlsx', sheet: 'Contents' });
    expect(x.sheet).toBe('Contents');
    expect(() => readTable(x.grid)).toThrow(/sheet 'Contents' has no rows of numbers/);
  });
});
