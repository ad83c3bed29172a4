/**
 * Lines that look like one thing and are another, in synthetic sheets generated here:
 * - a value-added row that is the sum of the rows above it ('Gross value added' under its
 *   parts) and a final-demand column that is the sum of its neighbours ('Final consumption
 *   expenditure' beside households, non-profit institutions and government) are subtotals, not
 *   data counted twice;
 * - in a sheet with labels and no codes, a sector whose name starts with T ('Transport and
 *   storage') or a value-added row named 'Taxes' is not taken for a total by the code pattern T*;
 * - in a sheet with codes and no labels, a row whose code starts with T but which is the sum of
 *   nothing (taxes less subsidies, coded TXS here) is value added when, and only when, total
 *   output adds up with it.
 * The layouts are common practice in published input-output tables; the numbers are invented
 * and each sheet is built from a known table that the reader must give back.
 */
import { describe, expect, it } from 'vitest';
import { gridFromRows, type Cell } from '../../src/io/grid';
import { detectLayout, readTable } from '../../src/io/tables';

const Z = [
  [10, 20, 5],
  [15, 40, 25],
  [5, 30, 50],
];
// Final demand: households, NPISH, government, exports.
const F = [
  [40, 2, 8, 15],
  [60, 5, 15, 40],
  [70, 10, 20, 15],
];
// Value added: taxes less subsidies, compensation, operating surplus.
const V = [
  [4, 6, 10],
  [36, 54, 60],
  [30, 50, 50],
];
const X = [100, 200, 200];
const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
const col = (m: number[][], j: number) => m.map((r) => r[j]!);

function flat(m: { data: Float64Array }): number[] {
  return Array.from(m.data);
}

describe('subtotals that do not say so', () => {
  const sectors = ['Agriculture', 'Manufacturing', 'Transport and storage'];
  const fdNames = ['Households', 'Non-profit institutions serving households', 'General government', 'Final consumption expenditure', 'Exports'];
  const vaNames = ['Taxes', 'Compensation of employees', 'Gross operating surplus'];
  const rows: Cell[][] = [['Input-output table, invented figures'], ['', ...sectors, ...fdNames, 'Total use']];
  sectors.forEach((s, i) => {
    const fc = F[i]![0]! + F[i]![1]! + F[i]![2]!;
    rows.push([s, ...Z[i]!, F[i]![0]!, F[i]![1]!, F[i]![2]!, fc, F[i]![3]!, X[i]!]);
  });
  vaNames.forEach((n, a) => rows.push([n, ...V[a]!]));
  rows.push(['Gross value added', ...[0, 1, 2].map((j) => sum(col(V, j)))]);
  rows.push(['Total output', ...X]);

  it('reads the value-added subtotal and the final-consumption column as totals, and the rest as data', () => {
    const r = readTable(gridFromRows(rows, 'labels.csv'));
    const t = r.table;
    expect(t.sectors.codes).toHaveLength(3);
    expect(t.sectors.labels).toEqual(sectors);
    expect(flat(t.Z)).toEqual(Z.flat());
    expect(t.finalDemand.labels).toEqual(['Households', 'Non-profit institutions serving households', 'General government', 'Exports']);
    expect(flat(t.F)).toEqual(F.flat());
    expect(t.valueAdded.labels).toEqual(vaNames);
    expect(flat(t.V)).toEqual(V.flat());
    expect(Array.from(t.x)).toEqual(X);
    const m = detectLayout(gridFromRows(rows, 'labels.csv')).mapping;
    const gva = m.rows!.find((x) => x.label === 'Gross value added')!;
    expect(gva.role).toBe('total');
    expect(gva.why).toMatch(/sum of rows .* so it is read as a subtotal/);
    const fce = m.columns!.find((x) => x.label === 'Final consumption expenditure')!;
    expect(fce.role).toBe('total');
    expect(fce.why).toMatch(/sum of columns .* so it is read as a subtotal/);
    expect(m.rows!.find((x) => x.label === 'Transport and storage')!.role).toBe('sector');
    expect(m.rows!.find((x) => x.label === 'Taxes')!.role).toBe('value-added');
    expect(r.findings.filter((f) => f.severity !== 'note')).toEqual([]);
  });

  it('keeps a value-added row that is the sum of nothing as data', () => {
    // Without the subtotal, and with a row that only nearly equals the sum above it.
    const near = rows.filter((r) => r[0] !== 'Gross value added').map((r) => [...r]);
    const last = near.findIndex((r) => r[0] === 'Gross operating surplus');
    near.splice(last + 1, 0, ['Consumption of fixed capital', 66, 104, 125]); // 36+30 = 66 and 54+50 = 104, but 60+50 = 110, not 125
    near[near.length - 1] = ['Total output', 166, 304, 325];
    const r = readTable(gridFromRows(near, 'near.csv'));
    expect(r.table.valueAdded.labels).toEqual([...vaNames, 'Consumption of fixed capital']);
  });
});

describe('codes without labels', () => {
  const codes = ['D01T03', 'D10T33', 'D49T53'];
  const fd = ['HFCE', 'NPISH', 'GGFC', 'EXPO'];
  const head: Cell[] = ['V1', ...codes, ...fd, 'TOTAL'];
  const body = (taxRow: number[]): Cell[][] => [
    head,
    ...codes.map((c, i) => [c, ...Z[i]!, ...F[i]!, X[i]!] as Cell[]),
    ['TTL_INT_FNL', ...[0, 1, 2].map((j) => sum(col(Z, j)))],
    ['TXS_INT_FNL', ...taxRow],
    ['VALU', ...[0, 1, 2].map((j) => V[1]![j]! + V[2]![j]!)],
    ['OUTPUT', ...X],
  ];

  it('reads a T-coded row that is the sum of nothing as value added when total output needs it', () => {
    const r = readTable(gridFromRows(body(V[0]!), 'codes.csv'));
    expect(r.table.sectors.codes).toEqual(codes);
    expect(r.table.valueAdded.codes).toEqual(['TXS_INT_FNL', 'VALU']);
    expect(flat(r.table.V)).toEqual([...V[0]!, ...[0, 1, 2].map((j) => V[1]![j]! + V[2]![j]!)]);
    expect(flat(r.table.F)).toEqual(F.flat());
    const m = detectLayout(gridFromRows(body(V[0]!), 'codes.csv')).mapping;
    expect(m.rows!.find((x) => x.code === 'TTL_INT_FNL')!.role).toBe('total');
    expect(m.rows!.find((x) => x.code === 'TXS_INT_FNL')!.why).toMatch(/adds up only with it, so it is read as value added/);
    expect(r.findings.filter((f) => f.severity !== 'note')).toEqual([]);
  });

  it('reads an output code that names a row and a column (OUT) as total output, not as a sector, when the data say so', () => {
    // Inter-country tables close with a row and a column both coded OUT (common practice).
    const icio: Cell[][] = [
      ['V1', ...codes, ...fd, 'OUT'],
      ...codes.map((c, i) => [c, ...Z[i]!, ...F[i]!, X[i]!] as Cell[]),
      ['TLS', ...V[0]!],
      ['VA', ...[0, 1, 2].map((j) => V[1]![j]! + V[2]![j]!)],
      ['OUT', ...X],
    ];
    const r = readTable(gridFromRows(icio, 'icio.csv'));
    expect(r.table.sectors.codes).toEqual(codes);
    expect(r.table.valueAdded.codes).toEqual(['TLS', 'VA']);
    expect(Array.from(r.table.x)).toEqual(X);
    expect(r.findings.filter((f) => f.severity !== 'note')).toEqual([]);
    // An OUT that is not the sum it should be stays a sector (here it names a row and a column).
    const odd = icio.map((row) => [...row]);
    odd[odd.length - 1] = ['OUT', 1, 2, 3, 4];
    for (let i = 1; i <= 3; i++) odd[i]![odd[i]!.length - 1] = 7 * i;
    expect(() => readTable(gridFromRows(odd, 'odd.csv'))).toThrow(/cell I7 \(row 'OUT', column 'OUT'\) is empty, in the intermediate block/);
  });

  it('leaves it an unexplained total, and says so, when total output does not add up with it either', () => {
    const r = readTable(gridFromRows(body([1, 2, 3]), 'broken.csv'));
    expect(r.table.valueAdded.codes).toEqual(['VALU']);
    expect(r.findings.some((f) => f.code === 'total-unexplained' && /TXS_INT_FNL/.test(f.message))).toBe(true);
  });
});

describe('a row and a column of one label at the ends of their blocks', () => {
  it("are value added and final demand ('Statistical discrepancy'), not a sector with two codes", () => {
    // Common practice: some tables close both the final-demand and the value-added blocks with a
    // statistical discrepancy. The numbers are invented; the discrepancies are zero-sum per line.
    const rows: Cell[][] = [
      ['code', 'label', 'A', 'B', 'HH', 'SDF'],
      ['', '', 'Alpha', 'Beta', 'Households', 'Statistical discrepancy'],
      ['A', 'Alpha', 10, 20, 71, -1],
      ['B', 'Beta', 30, 40, 129, 1],
      ['W', 'Wages', 55, 142, '', ''],
      ['SDV', 'Statistical discrepancy', 5, -2, '', ''],
    ];
    const r = readTable(gridFromRows(rows, 'sd.csv'), { blanks: 'zero' });
    expect(r.table.sectors.codes).toEqual(['A', 'B']);
    expect(r.table.finalDemand.codes).toEqual(['HH', 'SDF']);
    expect(r.table.valueAdded.codes).toEqual(['W', 'SDV']);
    expect(Array.from(r.table.x)).toEqual([100, 200]);
  });
});

describe('labels in capitals', () => {
  it("are not split into a code and a label ('FOOD PRODUCTS' is not code FOOD), while 'A01 Crops' is", () => {
    // Older tables write labels in capitals (common practice); the numbers are invented.
    const caps = (names: string[]): Cell[][] => [
      ['', ...names, 'HOUSEHOLDS', 'TOTAL OUTPUT'],
      [names[0]!, 10, 20, 5, 65, 100],
      [names[1]!, 15, 40, 25, 120, 200],
      [names[2]!, 5, 30, 50, 115, 200],
      ['WAGES AND SALARIES', 70, 110, 120],
      ['TOTAL OUTPUT', 100, 200, 200],
    ];
    const a = readTable(gridFromRows(caps(['FOOD PRODUCTS', 'WOOD AND PAPER', 'IRON AND STEEL']), 'caps.csv'), { blanks: 'zero' });
    expect(a.table.sectors.codes).toEqual(['FOOD PRODUCTS', 'WOOD AND PAPER', 'IRON AND STEEL']);
    const b = readTable(gridFromRows(caps(['A01 Crops', 'C10 Food', 'F41 Building']), 'coded.csv'), { blanks: 'zero' });
    expect(b.table.sectors.codes).toEqual(['A01', 'C10', 'F41']);
    expect(b.table.sectors.labels).toEqual(['Crops', 'Food', 'Building']);
  });
});

describe('code and label joined across, apart down', () => {
  it("reads a header of 'A01 Crops' over a code column and a label column, and takes no data values for codes", () => {
    // Common practice in some workbooks; the numbers are invented. The data hold values (10, 5)
    // that appear in a row and in a column: they are not codes.
    const rows: Cell[][] = [
      ['Code', 'Description', 'A01 Crops', 'C10 Food', 'F41 Building', 'HH Households', 'TOT Total output'],
      ['A01', 'Crops', 10, 20, 5, 65, 100],
      ['C10', 'Food', 15, 40, 25, 120, 200],
      ['F41', 'Building', 5, 30, 50, 115, 200],
      ['W', 'Wages', 70, 110, 120],
    ];
    const r = readTable(gridFromRows(rows, 'mixed.csv'), { blanks: 'zero' });
    expect(r.table.sectors.codes).toEqual(['A01', 'C10', 'F41']);
    expect(r.table.sectors.labels).toEqual(['Crops', 'Food', 'Building']);
    expect(r.table.finalDemand.codes).toEqual(['HH']);
    expect(Array.from(r.table.x)).toEqual([100, 200, 200]);
    expect(r.findings.filter((f) => f.severity === 'warning' || f.severity === 'error')).toEqual([]);
    expect(r.findings.find((f) => f.code === 'layout-by-position')!.message).toMatch(/once the codes are split from the labels written with them, 3 codes name both a row and a column/);
  });
});

describe('imports named alike as a row and a column', () => {
  it('are the imports row and a final-demand column of imports, not a sector (common practice)', () => {
    // Invented numbers: imported inputs by industry in a row, imports taken off final demand in a column.
    const rows: Cell[][] = [
      ['code', 'label', 'A', 'B', 'HH', 'EXP', 'IMP', 'X'],
      ['A', 'Alpha', 10, 20, 60, 30, -20, 100],
      ['B', 'Beta', 30, 40, 110, 50, -30, 200],
      ['IMP', 'Imports', 5, 15],
      ['W', 'Wages', 55, 125],
      ['X', 'Output', 100, 200],
    ];
    const r = readTable(gridFromRows(rows, 'imports.csv'), { blanks: 'zero' });
    expect(r.table.sectors.codes).toEqual(['A', 'B']);
    expect(r.table.finalDemand.codes).toEqual(['HH', 'EXP', 'IMP']);
    expect(Array.from(r.table.imports!)).toEqual([5, 15]);
    expect(Array.from(r.table.x)).toEqual([100, 200]);
    expect(r.findings.filter((f) => f.severity === 'warning' || f.severity === 'error')).toEqual([]);
  });
});
