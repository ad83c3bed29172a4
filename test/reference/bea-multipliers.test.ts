/**
 * Output multipliers against the published 1997 U.S. tables.
 * source: U.S. Bureau of Economic Analysis, Benchmark Input-Output Accounts of the United States,
 * 1997, summary tables after redefinitions: make (Table 3) and use (Table 4) read from
 * ../shared/reference/us-bea-1997-summary/, and the row T010 "Total industry output multiplier"
 * of the Table 7 spreadsheet (total-requirements-industry-by-commodity.xlsx).
 *
 * The published T010 values are rounded to 5 decimals (for example 2.01893), so agreement
 * within 1e-5 is as close as the published figures allow.
 *
 * Two routes through the analyses, both from the requirements the engine derives with
 * engine/supply-use.ts (industry technology, scrap S004 adjusted):
 * - `requirementsMultipliers` on the industry-by-commodity matrix W(I − BW)⁻¹ (column sums);
 * - `multipliersOf` on the commodity-by-commodity model I − BW, factored once, with the weights
 *   i′W: one transposed solve gives i′W(I − BW)⁻¹ without forming any inverse.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { LeontiefModel } from '../../engine/leontief';
import { colSums } from '../../engine/linalg/matrix';
import type { Measure } from '../../engine/measures';
import { multipliersOf, requirementsMultipliers } from '../../engine/multipliers';
import { supplyUse } from '../../engine/supply-use';
import type { SupplyUseModel } from '../../engine/supply-use';
import { BEA_DIR, BEA_SOURCE, beaAvailable, dense, readTriplets, uniq } from '../helpers/reference';

const have = beaAvailable();

/** The T010 row of the spreadsheet: commodity code (trailing spaces removed) → published multiplier. */
async function publishedT010(): Promise<Map<string, number>> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(join(BEA_DIR, 'total-requirements-industry-by-commodity.xlsx'));
  const ws = wb.worksheets.find((w) => w.rowCount > 0)!;
  // The sheet opens with title rows; find the row of T010 and the header row of commodity
  // codes above it (the row whose cells hold the most code-like texts), wherever they are.
  const text = (v: unknown) => (v === null || v === undefined ? '' : String(typeof v === 'object' && v && 'result' in v ? (v as { result: unknown }).result : v).trim());
  let totalRow = 0;
  let codeCol = 0;
  ws.eachRow((row, r) => {
    row.eachCell((cell, c) => {
      if (text(cell.value) === 'T010') {
        totalRow = r;
        codeCol = c;
      }
    });
  });
  if (!totalRow) throw new Error('no T010 row in the Table 7 spreadsheet');
  let headerRow = 0;
  let best = 0;
  for (let r = 1; r < totalRow; r++) {
    let codes = 0;
    ws.getRow(r).eachCell((cell, c) => {
      if (c > codeCol && /^[0-9A-Z]{4}$/.test(text(cell.value))) codes++;
    });
    if (codes > best) {
      best = codes;
      headerRow = r;
    }
  }
  const out = new Map<string, number>();
  ws.getRow(headerRow).eachCell((cell, c) => {
    const code = text(cell.value);
    if (c <= codeCol || !/^[0-9A-Z]{4}$/.test(code)) return;
    const v = ws.getRow(totalRow).getCell(c).value;
    out.set(code, typeof v === 'number' ? v : Number(text(v)));
  });
  return out;
}

describe.skipIf(!have)(`output multipliers (source: ${BEA_SOURCE}, Table 7 spreadsheet row T010)`, () => {
  let model: SupplyUseModel;
  let published: Map<string, number>;

  beforeAll(async () => {
    const make = readTriplets('make.txt', 4);
    const use = readTriplets('use.txt', 5); // producers' prices
    const industries = uniq(make.map((t) => t.row));
    const commodities = uniq([...make.map((t) => t.col), ...use.filter((t) => !/^[VT]/.test(t.row)).map((t) => t.row)]);
    model = supplyUse({
      industries: { codes: industries, labels: industries },
      commodities: { codes: commodities, labels: commodities },
      make: dense(make, industries, commodities),
      use: dense(use, commodities, industries), // final-use columns fall outside the industry columns
      scrap: 'S004',
    });
    published = await publishedT010();
  });

  it('from the industry-by-commodity requirements equal the published T010 row within 1e-5 (published to 5 decimals)', () => {
    expect(published.size).toBe(134);
    const ax = model.axes('industry-by-commodity');
    const m = requirementsMultipliers(model.requirements('industry-by-commodity'), ax.cols);
    let worst = 0;
    for (const [code, value] of published) {
      const j = m.sectors.codes.indexOf(code);
      expect(j, `commodity ${code}`).toBeGreaterThanOrEqual(0);
      worst = Math.max(worst, Math.abs(m.simple[j]! - value));
    }
    expect(worst).toBeLessThan(1e-5);
    // Not trivially zero: the published multipliers run from 1 to about 3.
    expect(Math.max(...published.values())).toBeGreaterThan(2.5);
  });

  it('by one transposed solve of the commodity model with weights i′W equal the same row within 1e-5', () => {
    const A = model.coefficients('commodity-by-commodity');
    const open = new LeontiefModel(A);
    const commodities = model.commodities;
    const weights = colSums(model.W); // i′W: industry output per unit of each commodity
    const measure: Measure = {
      code: 'output',
      label: 'Industry output',
      kind: 'output',
      unit: 'USD millions',
      perUnit: 'USD millions per USD millions of commodity output',
      money: true,
      coefficients: weights,
      from: [],
      about: 'Industry output per unit of commodity output (market shares, scrap adjusted).',
    };
    const m = multipliersOf(commodities, open, measure);
    let worst = 0;
    for (const [code, value] of published) {
      const j = commodities.codes.indexOf(code);
      worst = Math.max(worst, Math.abs(m.simple[j]! - value));
    }
    expect(worst).toBeLessThan(1e-5);
  });
});
