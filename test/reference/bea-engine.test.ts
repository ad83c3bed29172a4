/**
 * The engine's supply-use derivation against the published 1997 U.S. tables.
 * source: U.S. Bureau of Economic Analysis, Benchmark Input-Output Accounts of the United States,
 * 1997, summary tables after redefinitions (Tables 3, 4, 5, 7 and 8, and the spreadsheet of
 * Table 7 with its T010 row), files in ../shared/reference/us-bea-1997-summary/.
 *
 * The make and use tables are read here by the small test reader in test/helpers/reference.ts,
 * independent of the product's readers in src/io.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { supplyUse } from '../../engine/supply-use';
import type { SupplyUseModel } from '../../engine/supply-use';
import { colSums } from '../../engine/linalg/matrix';
import { BEA_DIR, BEA_SOURCE, beaAvailable, dense, readTriplets, uniq } from '../helpers/reference';

const have = beaAvailable();

describe.skipIf(!have)(`published total requirements (source: ${BEA_SOURCE})`, () => {
  let model: SupplyUseModel;
  let g: Float64Array;
  let valueAdded: { codes: string[]; data: Float64Array };

  beforeAll(() => {
    const make = readTriplets('make.txt', 4);
    const use = readTriplets('use.txt', 5); // field 5: the use-table cell at producers' prices
    const industries = uniq(make.map((t) => t.row));
    const commodities = uniq([...make.map((t) => t.col), ...use.filter((t) => !/^[VT]/.test(t.row)).map((t) => t.row)]);
    model = supplyUse({
      industries: { codes: industries, labels: industries },
      commodities: { codes: commodities, labels: commodities },
      make: dense(make, industries, commodities),
      use: dense(use, commodities, industries), // final-use columns (F...) fall outside the industry columns
      scrap: 'S004',
    });
    g = model.g;
    const vaCodes = uniq(use.filter((t) => /^V/.test(t.row)).map((t) => t.row));
    valueAdded = { codes: vaCodes, data: dense(use, vaCodes, industries).data };
  });

  function compare(file: string, R: { cols: number; data: Float64Array }, rows: string[], cols: string[], keep: (row: string) => boolean = () => true) {
    const ri = new Map(rows.map((c, i) => [c, i]));
    const ci = new Map(cols.map((c, i) => [c, i]));
    let worst = 0;
    let cells = 0;
    for (const t of readTriplets(file, 4)) {
      if (!keep(t.row)) continue;
      const i = ri.get(t.row);
      const j = ci.get(t.col);
      expect(i, `row code ${t.row} of ${file}`).toBeDefined();
      expect(j, `column code ${t.col} of ${file}`).toBeDefined();
      worst = Math.max(worst, Math.abs(R.data[i! * R.cols + j!]! - t.value));
      cells++;
    }
    return { worst, cells };
  }

  it('industry-by-commodity total requirements (Table 7) within 1e-6 in every published cell', () => {
    const ax = model.axes('industry-by-commodity');
    const { worst, cells } = compare('total-requirements-industry-by-commodity.txt', model.requirements('industry-by-commodity'), ax.rows.codes, ax.cols.codes);
    expect(cells).toBe(17554);
    expect(worst).toBeLessThan(1e-6);
  });

  it('industry-by-industry total requirements (Table 8) within 1e-6 in every published cell', () => {
    const ax = model.axes('industry-by-industry');
    const { worst, cells } = compare('total-requirements-industry-by-industry.txt', model.requirements('industry-by-industry'), ax.rows.codes, ax.cols.codes);
    expect(cells).toBe(17161);
    expect(worst).toBeLessThan(1e-6);
  });

  it('direct requirements (Table 5): B = U ĝ⁻¹ within 2e-5 in every commodity row (published rounded to 5 decimals)', () => {
    const ax = model.axes('direct');
    const { worst, cells } = compare(
      'direct-requirements.txt',
      model.requirements('direct'),
      ax.rows.codes,
      ax.cols.codes,
      (row) => !/^V/.test(row),
    );
    expect(cells).toBe(12045 - 3 * 128);
    expect(worst).toBeLessThan(2e-5);
  });

  it('the value-added rows the agency prints under Table 5 agree with V ĝ⁻¹ within 1e-4 (they are not part of B; the agency\'s rounding differs there by up to 6.5e-5)', () => {
    const ni = model.industries.codes.length;
    const data = new Float64Array(valueAdded.codes.length * ni);
    for (let v = 0; v < valueAdded.codes.length; v++) {
      for (let i = 0; i < ni; i++) data[v * ni + i] = valueAdded.data[v * ni + i]! / g[i]!;
    }
    const { worst, cells } = compare('direct-requirements.txt', { cols: ni, data }, valueAdded.codes, model.industries.codes, (row) => /^V/.test(row));
    expect(cells).toBe(3 * 128);
    expect(worst).toBeLessThan(1e-4);
  });

  it('the T010 "total industry output multiplier" row of the Table 7 spreadsheet within 1e-5 (published to 5 decimals)', async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(join(BEA_DIR, 'total-requirements-industry-by-commodity.xlsx'));
    const ws = wb.worksheets[0]!;
    let codeRow = 0;
    let totalRow = 0;
    ws.eachRow((row, r) => {
      const first = String(row.getCell(1).value ?? '').trim();
      if (first === 'PubCode') codeRow = r;
      if (first === 'T010') totalRow = r;
    });
    expect(codeRow).toBeGreaterThan(0);
    expect(totalRow).toBeGreaterThan(codeRow);
    const ax = model.axes('industry-by-commodity');
    const sums = colSums(model.requirements('industry-by-commodity'));
    let compared = 0;
    for (let c = 3; c <= ws.columnCount; c++) {
      const code = String(ws.getRow(codeRow).getCell(c).value ?? '').trim();
      if (!code) continue;
      const published = Number(ws.getRow(totalRow).getCell(c).value);
      const j = ax.cols.codes.indexOf(code);
      expect(j, `commodity ${code}`).toBeGreaterThanOrEqual(0);
      expect(Math.abs(sums[j]! - published)).toBeLessThan(1e-5);
      compared++;
    }
    expect(compared).toBe(134);
  });

  it('reports the commodities made by no industry as a note', () => {
    const f = model.findings.find((x) => x.code === 'commodity-not-made');
    expect(f?.data?.commodities).toEqual(['S003', 'S006']);
  });
});
