/**
 * The streaming XLSX reader (src/io/xlsx.ts) against exceljs, an independent general-purpose
 * reader, cell by cell: on a published agency workbook (Scottish Government, Input-Output Tables
 * 2016, IO2016.xlsx, every sheet) and on random workbooks written by exceljs (fast-check).
 * Also: the formula note, dates, shared and inline strings, and reading a sheet's first rows only.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { EMPTY, NUMBER, type Grid } from '../../src/io/grid';
import { openWorkbook, readXlsx, xlsxSheets } from '../../src/io/xlsx';
import { restoreText } from '../../src/io/escape';
import { REFERENCE_DIR } from '../helpers/reference';

const SCALE = Number(process.env.FUZZ_SCALE ?? 1);
const IO2016 = join(REFERENCE_DIR, 'scotland-2016-io', 'IO2016.xlsx');
const IO2016_WHERE = 'published by the Scottish Government (gov.scot, Input-Output Tables 1998-2016, IO2016.xlsx); set RIPPLEWISE_REFERENCE to a folder holding scotland-2016-io/';

function io2016Available(): boolean {
  const ok = existsSync(IO2016);
  if (!ok) {
    if (process.env.CI === 'true') throw new Error(`reference data missing under CI: ${IO2016} (${IO2016_WHERE})`);
    console.warn(`skipping: ${IO2016} not found; the workbook is ${IO2016_WHERE}`);
  }
  return ok;
}

/** exceljs's value of a cell as a number, a text or null (formulas give their saved result). */
function excelValue(v: unknown): number | string | null {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string') return v;
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  if (v instanceof Date) return v.toISOString().slice(0, 10);
  const o = v as Record<string, unknown>;
  if ('formula' in o || 'sharedFormula' in o) return o.result === undefined || o.result === null ? `=${String(o.formula ?? o.sharedFormula ?? '')}` : excelValue(o.result);
  if ('error' in o) return String(o.error);
  if ('richText' in o) return (o.richText as { text: string }[]).map((t) => t.text).join('');
  if ('text' in o) return excelValue(o.text);
  return String(v);
}

/** Every cell exceljs sees equals the grid's; returns the number of cells compared. */
function sameAsExcel(ws: import('exceljs').Worksheet, grid: Grid): number {
  let n = 0;
  ws.eachRow({ includeEmpty: false }, (row, r) => {
    row.eachCell({ includeEmpty: false }, (cell, c) => {
      if (cell.type === ExcelJS.ValueType.Merge) {
        expect(grid.kind(r - 1, c - 1), `${cell.address} is inside a merge`).toBe(EMPTY);
        return;
      }
      const v = excelValue(cell.value);
      n++;
      if (v === null || (typeof v === 'string' && v.trim() === '')) expect(grid.kind(r - 1, c - 1), cell.address).toBe(EMPTY);
      else if (typeof v === 'number') expect(grid.num(r - 1, c - 1), cell.address).toBe(v);
      else if (grid.kind(r - 1, c - 1) === NUMBER) expect(Number(v.trim().replace(/,/g, '')), `${cell.address} '${v}'`).toBeCloseTo(grid.num(r - 1, c - 1), 9);
      // A leading quote before a number or a formula is the writers' protection (src/io/escape.ts), taken off on reading.
      else expect(grid.text(r - 1, c - 1).trim(), cell.address).toBe(restoreText(v).trim());
    });
  });
  return n;
}

describe('the streaming XLSX reader against exceljs', () => {
  it.runIf(io2016Available())('reads every sheet of IO2016.xlsx cell for cell as exceljs does', async () => {
    const bytes = new Uint8Array(readFileSync(IO2016));
    const wb = await openWorkbook(bytes, 'IO2016.xlsx');
    const sheets = xlsxSheets(bytes, 'IO2016.xlsx');
    expect(sheets.map((s) => s.name)).toEqual(wb.worksheets.map((w) => w.name));
    let cells = 0;
    for (const s of sheets) {
      const x = await readXlsx(bytes, { file: 'IO2016.xlsx', sheet: s.name });
      cells += sameAsExcel(wb.getWorksheet(s.name)!, x.grid);
      expect(x.grid.merges.length).toBe(((wb.getWorksheet(s.name)!.model as { merges?: string[] }).merges ?? []).length);
    }
    expect(cells).toBeGreaterThan(50_000);
    // The first rows of a sheet only: the same cells, no more rows.
    const head = await readXlsx(bytes, { file: 'IO2016.xlsx', sheet: 'IxI', maxRows: 10 });
    const whole = await readXlsx(bytes, { file: 'IO2016.xlsx', sheet: 'IxI' });
    expect(head.grid.rowCount).toBeLessThanOrEqual(10);
    expect(head.grid.toRows()).toEqual(whole.grid.toRows().slice(0, head.grid.rowCount));
  }, 60_000);

  it('reads random workbooks written by exceljs as exceljs reads them', async () => {
    const cell = fc.oneof(fc.constant(null), fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 }), fc.integer({ min: -1e6, max: 1e6 }), fc.string({ maxLength: 12 }), fc.constantFrom('A01', '0110', '  x  ', '<&>"\'', 'Ünïcödé €', '_x0041_'));
    await fc.assert(
      fc.asyncProperty(fc.array(fc.array(cell, { maxLength: 8 }), { minLength: 1, maxLength: 12 }), fc.boolean(), async (rows, merge) => {
        const wb = new ExcelJS.Workbook();
        const ws = wb.addWorksheet('S');
        rows.forEach((r, i) => ws.getRow(i + 1).values = [undefined, ...r.map((v) => (v === null ? undefined : v))]);
        if (merge && rows.length > 1) ws.mergeCells('A1:B2');
        const bytes = new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer);
        const back = await new ExcelJS.Workbook().xlsx.load(bytes as unknown as ArrayBuffer);
        const mine = await readXlsx(bytes, { file: 'r.xlsx', sheet: 'S', decimal: '.' }).catch((e: Error) => e);
        if (mine instanceof Error) {
          expect(mine.message).toMatch(/has no cells/);
          return;
        }
        sameAsExcel(back.worksheets[0]!, mine.grid);
      }),
      { numRuns: 40 * SCALE },
    );
  }, 60_000);

  it('notes formula cells with their count, and reads dates, booleans, errors and inline strings', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('T');
    ws.addRow(['code', 'A', 'B']);
    ws.addRow(['A', 1, { formula: 'B2*2', result: 4 }]);
    ws.addRow(['B', { formula: 'B2+1', result: 3 }, 2]);
    ws.addRow(['when', new Date(Date.UTC(2019, 11, 31)), true]);
    const bytes = new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer);
    const x = await readXlsx(bytes, { file: 'f.xlsx' });
    const note = x.findings.find((f) => f.code === 'formula-cells');
    expect(note?.severity).toBe('note');
    expect(note?.message).toMatch(/file f\.xlsx, sheet 'T': 2 cells hold formulas; their values were read as the spreadsheet program last saved them/);
    expect(x.formulas).toBe(2);
    expect(x.grid.toRows()).toEqual([['code', 'A', 'B'], ['A', 1, 4], ['B', 3, 2], ['when', '2019-12-31', 'TRUE']]);
  });
});
