/**
 * The product's readers against the published 1997 U.S. tables.
 * source: U.S. Bureau of Economic Analysis, Benchmark Input-Output Accounts of the United States,
 * 1997, summary tables after redefinitions: make.txt (Table 3), use.txt and use.xlsx (Table 4),
 * Tables 7 and 8 (total requirements) and the spreadsheet of Table 7 with its T010 row; files in
 * ../shared/reference/us-bea-1997-summary/, read in place.
 *
 * The published requirements are read by the small independent reader of
 * test/helpers/reference.ts; the make and use tables go through src/io, then the engine's
 * supply-use derivation (industry technology, scrap S004).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { supplyUse } from '../../engine/supply-use';
import { colSums } from '../../engine/linalg/matrix';
import { readLongCsv, type LongTable } from '../../src/io/long';
import { readSupplyUse, type SupplyUseRead } from '../../src/io/supply-use';
import { readMatrix } from '../../src/io/tables';
import { readXlsx } from '../../src/io/xlsx';
import { readLongFile } from '../../src/io/node';
import { BEA_DIR, BEA_SOURCE, beaAvailable, readTriplets } from '../helpers/reference';

const have = beaAvailable();
const bytes = (f: string) => new Uint8Array(readFileSync(join(BEA_DIR, f)));

const models = new WeakMap<SupplyUseRead, ReturnType<typeof supplyUse>>();
function modelOf(su: SupplyUseRead): ReturnType<typeof supplyUse> {
  let m = models.get(su);
  if (!m) models.set(su, (m = supplyUse(su.input)));
  return m;
}

function worstAgainst(file: string, su: SupplyUseRead, kind: 'industry-by-commodity' | 'industry-by-industry'): { worst: number; cells: number } {
  const model = modelOf(su);
  const R = model.requirements(kind);
  const ax = model.axes(kind);
  const ri = new Map(ax.rows.codes.map((c, i) => [c, i]));
  const ci = new Map(ax.cols.codes.map((c, i) => [c, i]));
  let worst = 0;
  let cells = 0;
  for (const t of readTriplets(file, 4)) {
    const i = ri.get(t.row);
    const j = ci.get(t.col);
    expect(i, `row ${t.row} of ${file}`).toBeDefined();
    expect(j, `column ${t.col} of ${file}`).toBeDefined();
    worst = Math.max(worst, Math.abs(R.data[i! * R.cols + j!]! - t.value));
    cells++;
  }
  return { worst, cells };
}

describe.skipIf(!have)(`src/io reads the published tables (source: ${BEA_SOURCE})`, () => {
  let make: LongTable;
  let use: LongTable;
  let fromText: SupplyUseRead;
  let fromXlsx: SupplyUseRead;
  let xlsxGrid: Awaited<ReturnType<typeof readXlsx>>['grid'];

  beforeAll(async () => {
    make = readLongCsv(bytes('make.txt'), { file: 'make.txt' });
    use = readLongCsv(bytes('use.txt'), { file: 'use.txt' });
    fromText = readSupplyUse(make, use, { scrap: 'S004' });
    const x = await readXlsx(bytes('use.xlsx'), { file: 'use.xlsx' });
    xlsxGrid = x.grid;
    // No blanks option: the spreadsheet's empty cells are zeros by default, and a note says so.
    fromXlsx = readSupplyUse(make, x.grid, { scrap: 'S004' });
  });

  it('reads the empty cells of the spreadsheet as zero by default, says so, and refuses them when told to', () => {
    const note = fromXlsx.findings.find((f) => f.code === 'blanks-as-zero');
    expect(note?.severity).toBe('note');
    expect(note?.message).toMatch(/file use.xlsx, sheet 'Sheet1': empty cells inside the table are read as zero/);
    expect(fromText.findings.some((f) => f.code === 'blanks-as-zero')).toBe(false);
    expect(() => readSupplyUse(make, xlsxGrid, { scrap: 'S004', blanks: 'error' })).toThrow(/file use.xlsx, sheet 'Sheet1', cell [A-Z]+\d+ .* is empty/);
  });

  it('finds the value fields of the long files, passing over the constant year and table-number fields', () => {
    expect(make.mapping.valueField).toBe(4);
    expect(use.mapping.valueField).toBe(5); // the use-table cell at producers' prices (FIOUseSummary.txt, field 5)
    expect(use.mapping.rowCodeField).toBe(1);
    expect(use.mapping.columnCodeField).toBe(2);
    const note = use.findings.find((f) => f.code === 'long-fields')!.message;
    expect(note).toMatch(/fields 3, 4, 6 hold the same value on every line/);
    expect(make.entries).toBe(860);
    expect(use.entries).toBe(13061);
  });

  it('reads another value field when told to (field 15, purchasers\' prices), matching an independent reader', () => {
    const p = readLongCsv(bytes('use.txt'), { file: 'use.txt', valueField: 15 });
    const ri = new Map(p.rows.codes.map((c, i) => [c, i]));
    const ci = new Map(p.cols.codes.map((c, i) => [c, i]));
    let worst = 0;
    for (const t of readTriplets('use.txt', 15)) worst = Math.max(worst, Math.abs(p.matrix.data[ri.get(t.row)! * p.matrix.cols + ci.get(t.col)!]! - t.value));
    expect(worst).toBe(0);
  });

  it('classifies the long use table: F columns are final demand, V rows value added, S003 and S006 commodities no industry makes', () => {
    const i = fromText.input;
    expect(i.industries.codes.length).toBe(131);
    expect(i.commodities.codes.length).toBe(134);
    expect(i.commodities.codes).toContain('S003');
    expect(i.commodities.codes).toContain('S006');
    expect(fromText.finalDemand.axis.codes).toHaveLength(13);
    expect(fromText.finalDemand.axis.codes.every((c) => c.startsWith('F'))).toBe(true);
    expect(fromText.valueAdded.axis.codes).toEqual(['V001', 'V002', 'V003']);
  });

  it('make.txt + use.txt: industry-by-commodity total requirements match Table 7 within 1e-6 in every cell', () => {
    const { worst, cells } = worstAgainst('total-requirements-industry-by-commodity.txt', fromText, 'industry-by-commodity');
    expect(cells).toBe(17554);
    expect(worst).toBeLessThan(1e-6);
  });

  it('make.txt + use.txt: industry-by-industry total requirements match Table 8 within 1e-6 in every cell', () => {
    const { worst, cells } = worstAgainst('total-requirements-industry-by-industry.txt', fromText, 'industry-by-industry');
    expect(cells).toBe(17161);
    expect(worst).toBeLessThan(1e-6);
  });

  it('with no scrap given, proposes S004 from the make table (made by many industries, the main product of none), and Table 8 still matches within 1e-6', () => {
    const proposed = readSupplyUse(make, use, {});
    expect(proposed.input.scrap).toBe('S004');
    expect(proposed.findings.find((f) => f.code === 'scrap-commodity')?.message).toMatch(/'S004' is taken for scrap \(rule scrap-proposal, by structure/);
    const { worst, cells } = worstAgainst('total-requirements-industry-by-industry.txt', proposed, 'industry-by-industry');
    expect(cells).toBe(17161);
    expect(worst).toBeLessThan(1e-6);
    // scrap: none leaves it in the market shares, and Table 8 (derived with the adjustment) then differs.
    const none = readSupplyUse(make, use, { scrap: 'none' });
    expect(none.input.scrap).toBeUndefined();
    expect(worstAgainst('total-requirements-industry-by-industry.txt', none, 'industry-by-industry').worst).toBeGreaterThan(1e-4);
  });

  it('make.txt + use.xlsx: Table 7 within 1e-6 in every cell', () => {
    const { worst, cells } = worstAgainst('total-requirements-industry-by-commodity.txt', fromXlsx, 'industry-by-commodity');
    expect(cells).toBe(17554);
    expect(worst).toBeLessThan(1e-6);
  });

  it('make.txt + use.xlsx: Table 8 within 1e-6 in every cell', () => {
    const { worst, cells } = worstAgainst('total-requirements-industry-by-industry.txt', fromXlsx, 'industry-by-industry');
    expect(cells).toBe(17161);
    expect(worst).toBeLessThan(1e-6);
  });

  it('reads the spreadsheet layout of use.xlsx: title, label and code rows, merged headers, codes with trailing spaces', () => {
    const m = fromXlsx.mappings.use;
    expect(m.codeColumn).toBe(1);
    expect(m.labelColumn).toBe(2);
    expect(m.codeRow).toBe(7);
    expect(m.labelRow).toBe(6);
    expect(m.titleRows).toEqual([3]);
    expect(m.headerRows).toEqual([5]); // the merged group headers over the government columns
    expect(m.meta?.year).toBe(1997);
    expect(fromXlsx.input.commodities.codes[0]).toBe('1110'); // '1110   ' in the sheet
    expect(fromXlsx.input.commodities.labels[0]).toBe('Crop products');
    expect(fromXlsx.input.industries.labels[fromXlsx.input.industries.codes.indexOf('1110')]).toBe('Crop production');
  });

  it('recognises the interleaved totals of use.xlsx, checks them against the data, and never reads them as data', () => {
    const m = fromXlsx.mappings.use;
    const role = (code: string) => m.columns.find((c) => c.code === code)?.role ?? m.rows.find((r) => r.code === code)?.role;
    for (const t of ['T001', 'T002', 'T003', 'T004', 'T005', 'T006']) expect(role(t)).toBe('total');
    expect(role('T007')).toBe('output');
    expect(role('T008')).toBe('output');
    for (const v of ['V001', 'V002', 'V003']) expect(role(v)).toBe('value-added');
    const sumOf = Object.fromEntries(m.totals!.map((t) => [t.code, t.sumOf]));
    expect(sumOf).toMatchObject({
      T001: 'the sector columns',
      T002: 'F06C..F07I', // the federal government columns after it
      T003: 'F08C..F09I', // state and local
      T004: 'the final-demand columns',
      T007: 'all sector and final-demand columns',
      T005: 'the sector rows',
      T006: 'the value-added rows',
      T008: 'all sector, value-added and imports rows',
    });
    const codes = [...fromXlsx.input.industries.codes, ...fromXlsx.input.commodities.codes, ...fromXlsx.finalDemand.axis.codes, ...fromXlsx.valueAdded.axis.codes];
    expect(codes.some((c) => c.startsWith('T'))).toBe(false);
    // Industry output (T008) agrees with the make table's row sums.
    expect(fromXlsx.findings.find((f) => f.code === 'industry-output-differs')).toBeUndefined();
    expect(fromXlsx.industryOutput).toBeDefined();
  });

  it('reports the one published total that differs from its parts by more than rounding, naming the cell', () => {
    // Row V003 of column T001 (cell ED146) is 3,043,282.7; the industries' V003 cells add to 3,043,276.1.
    const f = fromXlsx.findings.filter((x) => x.code === 'total-mismatch');
    expect(f).toHaveLength(1);
    expect(f[0]!.where?.cell).toBe('ED146');
    expect(f[0]!.message).toMatch(/column T001 .*1 it differs by more than rounding, the most at cell ED146: 3043282\.7 found, 3043276\.1 summed/);
  });

  it('the T010 row of the Table 7 spreadsheet is checked as the column sums, and matches the derived requirements', async () => {
    const x = await readXlsx(bytes('total-requirements-industry-by-commodity.xlsx'), { file: 'total-requirements-industry-by-commodity.xlsx' });
    const m = readMatrix(x.grid);
    const t010 = m.mapping.totals!.find((t) => t.code === 'T010')!;
    expect(t010.sumOf).toBe('the sector rows');
    expect(t010.matched).toBe(t010.checked);
    expect(m.rows.codes).not.toContain('T010');
    expect(m.rows.codes).toHaveLength(131);
    expect(m.cols.codes).toHaveLength(134);
    // Derived column sums against the published row (rounded to 5 decimals in the sheet).
    const model = modelOf(fromXlsx);
    const R = model.requirements('industry-by-commodity');
    const ax = model.axes('industry-by-commodity');
    const sums = colSums(R);
    const row = x.grid.rows.findIndex((_, r) => x.grid.text(r, 0).trim() === 'T010');
    let worst = 0;
    m.cols.codes.forEach((code) => {
      const col = m.mapping.columns.find((c) => c.code === code)!.column - 1;
      worst = Math.max(worst, Math.abs(x.grid.num(row, col) - sums[ax.cols.codes.indexOf(code)]!));
    });
    expect(worst).toBeLessThan(1e-5);
    // The sheet's own matrix equals the text file of Table 7.
    let worstCell = 0;
    for (const t of readTriplets('total-requirements-industry-by-commodity.txt', 4)) {
      worstCell = Math.max(worstCell, Math.abs(m.matrix.data[m.rows.codes.indexOf(t.row) * m.matrix.cols + m.cols.codes.indexOf(t.col)]! - t.value));
    }
    expect(worstCell).toBeLessThan(1e-9);
  });

  it('streams the long file from disk to the same matrix', async () => {
    const s = await readLongFile(join(BEA_DIR, 'use.txt'));
    expect(s.rows.codes).toEqual(use.rows.codes);
    expect(s.cols.codes).toEqual(use.cols.codes);
    expect(Array.from(s.matrix.data)).toEqual(Array.from(use.matrix.data));
  });
});
