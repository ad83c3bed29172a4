/**
 * Supply and use tables laid out as the System of National Accounts lays them out (common
 * practice in published tables): the supply table lists products down and industries across,
 * with a column of total domestic output, a column of imports and a column of total supply;
 * headers that give a code and a name in one cell ('I01 Agriculture'); products and industries
 * in different classifications, so that no code names both a row and a column. The numbers are
 * invented. The total requirements derived from them are checked against a plain computation
 * written here with ml-matrix (source: ml-matrix 6.15.1; the formula B = U ĝ⁻¹, D = V q̂⁻¹,
 * (I − DB)⁻¹ is the industry-technology derivation of the U.S. agency's method, see
 * ../shared/reference/us-bea-1997-summary/README.md).
 */
import { Matrix as MlMatrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { supplyUse } from '../../engine/supply-use';
import { type Cell, gridFromRows } from '../../src/io/grid';
import { readSupplyUse } from '../../src/io/supply-use';

const inds = ['I01 Agriculture', 'I02 Food industry', 'I03 Construction'];
const prods = [
  ['P01', 'Crops'],
  ['P02', 'Food products'],
  ['P03', 'Construction work'],
];
// Supply of products (rows) by industries (columns), at basic prices.
const S = [
  [1049.2, 0, 0],
  [12.5, 1168.9, 18.6],
  [0, 0, 845.3],
];
const imports = [141.6, 126.6, 66.0];
const U = [
  [120.5, 610.2, 15.0],
  [30.1, 140.7, 22.4],
  [25.0, 18.3, 60.2],
];
const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
const r1 = (x: number) => Math.round(x * 10) / 10;

function supplyRows(): Cell[][] {
  const rows: Cell[][] = [['Supply table at basic prices (invented figures)'], [], ['Code', 'Product', ...inds, 'Total domestic output', 'Imports', 'Total supply at basic prices']];
  prods.forEach(([c, l], i) => {
    const q = r1(sum(S[i]!));
    rows.push([c!, l!, ...S[i]!, q, imports[i]!, r1(q + imports[i]!)]);
  });
  rows.push(['TOTAL', 'Total', ...[0, 1, 2].map((j) => r1(sum(S.map((r) => r[j]!))))]);
  return rows;
}

function useRows(): Cell[][] {
  const g = [0, 1, 2].map((j) => r1(sum(S.map((r) => r[j]!))));
  const rows: Cell[][] = [['Use table at basic prices (invented figures)'], ['Code', 'Product', ...inds, 'Households', 'Exports']];
  prods.forEach(([c, l], i) => {
    const supply = sum(S[i]!) + imports[i]!;
    const rest = supply - sum(U[i]!);
    rows.push([c!, l!, ...U[i]!, r1(rest * 0.7), r1(rest - r1(rest * 0.7))]);
  });
  const inputs = [0, 1, 2].map((j) => sum(U.map((r) => r[j]!)));
  rows.push(['D1', 'Compensation of employees', ...inputs.map((x, j) => r1((g[j]! - x) * 0.6))]);
  rows.push(['B2A3G', 'Operating surplus and mixed income', ...inputs.map((x, j) => r1(g[j]! - x - r1((g[j]! - x) * 0.6)))]);
  rows.push(['P1', 'Output', ...g]);
  return rows;
}

describe('a supply table of products by industries, with imports and total supply', () => {
  it('is read transposed, its imports and total supply left out, and gives the plain computation', () => {
    const r = readSupplyUse(gridFromRows(supplyRows(), 'supply.csv'), gridFromRows(useRows(), 'use.csv'));
    expect(r.input.industries.codes).toEqual(inds);
    expect(r.input.commodities.codes).toEqual(['P01', 'P02', 'P03']);
    expect(r.findings.some((f) => f.code === 'make-transposed')).toBe(true);
    const cols = r.mappings.make.columns;
    expect(cols.find((c) => c.label === 'Imports')!.role).toBe('ignore');
    expect(cols.find((c) => c.label === 'Total supply at basic prices')!.role).toBe('ignore');
    // Chosen by position, as is usual here: a note, not a warning.
    const pos = r.findings.filter((f) => f.code === 'layout-by-position');
    expect(pos.length).toBe(2);
    expect(pos.every((f) => f.severity === 'note')).toBe(true);
    expect(r.findings.filter((f) => f.severity === 'warning')).toEqual([]);
    expect(r.valueAdded.axis.codes).toEqual(['D1', 'B2A3G']);

    const model = supplyUse(r.input);
    const II = model.requirements('industry-by-industry');
    // Independent path: V (industries × commodities) is the supply block transposed.
    const V = new MlMatrix(S).transpose();
    const g = V.to2DArray().map((row) => sum(row));
    const q = [0, 1, 2].map((c) => sum(V.to2DArray().map((row) => row[c]!)));
    const B = new MlMatrix(U.map((row) => row.map((v, j) => v / g[j]!)));
    const D = new MlMatrix(V.to2DArray().map((row) => row.map((v, c) => v / q[c]!)));
    const ref = inverse(MlMatrix.eye(3).sub(D.mmul(B)));
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(Math.abs(II.data[i * 3 + j]! - ref.get(i, j))).toBeLessThan(1e-12);
  });
});
