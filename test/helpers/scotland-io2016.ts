/**
 * The Scottish Government's 2016 industry-by-industry table (Input-Output Tables 1998-2016,
 * IO2016.xlsx, sheets `IxI` and `Type II multipliers`; Open Government Licence v3.0), read by a
 * small independent exceljs reader with the sheet's rows and columns named explicitly, and the
 * agency's published Type II multipliers. Shared by the reference test and the workbench's
 * browser test. Absent data skips (fails under CI=true).
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import type { InputClass, PlainTable, Table } from '../../engine/table';
import { makeTable } from '../../engine/table';
import { REFERENCE_DIR } from './reference';

const DIR = join(REFERENCE_DIR, 'scotland-2016-io');
const FILE = join(DIR, 'IO2016.xlsx');
const WHERE = 'published by the Scottish Government (gov.scot, Input-Output Tables 1998-2016, IO2016.xlsx); set RIPPLEWISE_REFERENCE to a folder holding scotland-2016-io/';
export const SOURCE = 'Scottish Government, Input-Output Tables 1998-2016 (2016, industry by industry), published Type II multipliers';

export function scotlandAvailable(): boolean {
  const ok = existsSync(FILE);
  if (!ok) {
    if (process.env.CI === 'true') throw new Error(`reference data missing under CI: ${FILE} (${WHERE})`);
    console.warn(`skipping Scottish reference tests: ${FILE} not found; the data is ${WHERE}`);
  }
  return ok;
}

/** The household income the agency divides household spending by (README of the reference folder). */
export const HOUSEHOLD_INCOME = 143398;

// The IxI sheet as published: industries in rows 8..105 and columns D.. (4..101), the Households
// column 103, the other final-demand columns, and the rows below the industries.
const SECTOR_ROWS = [8, 105] as const;
const SECTOR_COL0 = 4;
export const N = 98;
const HOUSEHOLDS_COL = 103;
const OTHER_FD = [104, 105, 106, 108, 109, 110, 112, 113, 114];
const PRIMARY: [number, string, InputClass][] = [
  [107, 'RUKImp', 'imports'],
  [108, 'RoWImp', 'imports'],
  [110, 'TlSPrds', 'product-taxes'],
  [111, 'TlSPrdn', 'production-taxes'],
  [112, 'CoE', 'compensation'],
  [113, 'GOS', 'operating-surplus'],
];
const OUTPUT_ROW = 115;

function value(c: ExcelJS.CellValue): number {
  const v = c && typeof c === 'object' && 'result' in c ? (c as { result: unknown }).result : c;
  if (v === null || v === undefined || v === '') return 0;
  if (typeof v !== 'number') throw new Error(`not a number: ${JSON.stringify(v)}`);
  return v;
}
function text(c: ExcelJS.CellValue): string {
  const v = c && typeof c === 'object' && 'result' in c ? (c as { result: unknown }).result : c;
  return String(v ?? '').trim();
}

export interface ScotlandPublished {
  code: string;
  output: number;
  incomeEffect: number;
  gvaEffect: number;
  incomeMultiplier: number;
  gvaMultiplier: number;
}


/** The IxI table and the published Type II multipliers, read with the sheet's rows and columns named explicitly. */
export async function loadScotland(): Promise<{ table: Table; published: ScotlandPublished[] }> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(FILE);
  const ws = wb.getWorksheet('IxI')!;
  const codes: string[] = [];
  const labels: string[] = [];
  const Z: number[][] = [];
  const F: number[][] = [];
  for (let r = SECTOR_ROWS[0]; r <= SECTOR_ROWS[1]; r++) {
    const row = ws.getRow(r);
    codes.push(text(row.getCell(2).value));
    labels.push(text(row.getCell(3).value));
    Z.push(Array.from({ length: N }, (_, j) => value(row.getCell(SECTOR_COL0 + j).value)));
    F.push([HOUSEHOLDS_COL, ...OTHER_FD].map((c) => value(row.getCell(c).value)));
  }
  const V = PRIMARY.map(([r]) => Array.from({ length: N }, (_, j) => value(ws.getRow(r).getCell(SECTOR_COL0 + j).value)));
  const x = Array.from({ length: N }, (_, j) => value(ws.getRow(OUTPUT_ROW).getCell(SECTOR_COL0 + j).value));
  const plain: PlainTable = {
    sectors: { codes, labels },
    Z,
    finalDemand: { codes: ['HH', ...OTHER_FD.map((c) => `FD${c}`)], labels: ['Households', ...OTHER_FD.map((c) => `final demand column ${c}`)], values: F },
    valueAdded: { codes: PRIMARY.map((p) => p[1]), labels: PRIMARY.map((p) => p[1]), classes: PRIMARY.map((p) => p[2]), values: V },
    x,
    meta: { title: 'Scotland 2016 IxI', currency: 'GBP', scale: 1e6, scaleLabel: 'millions', year: 2016 },
  };
  const table = makeTable(plain);
  const m = wb.getWorksheet('Type II multipliers')!;
  const published: ScotlandPublished[] = [];
  for (let r = 8; r <= 105; r++) {
    const row = m.getRow(r);
    published.push({
      code: text(row.getCell(2).value),
      output: value(row.getCell(4).value),
      incomeEffect: value(row.getCell(6).value),
      gvaEffect: value(row.getCell(10).value),
      incomeMultiplier: value(row.getCell(12).value),
      gvaMultiplier: value(row.getCell(16).value),
    });
  }
  return { table, published };
}

