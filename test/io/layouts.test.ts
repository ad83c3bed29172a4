/**
 * Layout detection on synthetic files in many layouts, generated here: separators and locales,
 * title rows, code and label columns in either order, header rows, totals and subtotals,
 * notes, units, coefficients with and without outputs, long files in either orientation,
 * supply-use tables, satellites, mappings passed back in, and patterns of other agencies'
 * codes. Each file is built from a small known table; the reader must give that table back.
 * The layouts themselves are common practice in published input-output tables.
 */
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors';
import { readCsv } from '../../src/io/csv';
import { gridFromRows, type Cell } from '../../src/io/grid';
import { readLongCsv, readLongGrid } from '../../src/io/long';
import { parseMapping } from '../../src/io/mapping';
import { attachSatellites, readSatellites } from '../../src/io/satellites';
import { readSupplyUse } from '../../src/io/supply-use';
import { detectLayout, readTable } from '../../src/io/tables';
import { readXlsx } from '../../src/io/xlsx';
import { readTableFile } from '../../src/io/open';

// A small table: three sectors, two final-demand columns, two value-added rows, balanced.
const S = ['AGR', 'MAN', 'SRV'];
const SL = ['Agriculture', 'Manufacturing', 'Services'];
const Z = [
  [10, 20, 5],
  [15, 40, 25],
  [5, 30, 50],
];
const FD = ['HH', 'EXP'];
const FDL = ['Household consumption', 'Exports'];
const F = [
  [50, 15],
  [80, 40],
  [100, 15],
];
const VA = ['W', 'GOS'];
const VAL = ['Wages and salaries', 'Gross operating surplus'];
const V = [
  [40, 60, 80],
  [30, 50, 60],
];
const X = [100, 200, 200];
const colSum = (j: number) => Z.reduce((a, r) => a + r[j]!, 0) + V.reduce((a, r) => a + r[j]!, 0);
const fdSum = (k: number) => F.reduce((a, r) => a + r[k]!, 0);

interface LayoutOpts {
  titles?: string[];
  labelFirst?: boolean;
  noCodes?: boolean;
  totalCol?: boolean;
  totalRow?: boolean;
  notes?: string[];
  satellite?: 'brackets' | 'unit-column';
}

/** Rows of cells for the small table in a chosen layout. */
function layout(o: LayoutOpts = {}): Cell[][] {
  const rows: Cell[][] = [];
  for (const t of o.titles ?? []) rows.push([t]);
  const lead = (code: Cell, label: Cell, unit: Cell = null): Cell[] => {
    const a: Cell[] = o.noCodes ? [label] : o.labelFirst ? [label, code] : [code, label];
    if (o.satellite === 'unit-column') a.push(unit);
    return a;
  };
  const codesRow = [...S, ...FD, ...(o.totalCol ? ['TOT'] : [])];
  const labelsRow = [...SL, ...FDL, ...(o.totalCol ? ['Total output'] : [])];
  if (!o.noCodes) rows.push([...lead('code', 'label', 'unit'), ...codesRow]);
  rows.push([...lead(null, null, null), ...labelsRow]);
  S.forEach((c, i) => rows.push([...lead(c, SL[i]!), ...Z[i]!, ...F[i]!, ...(o.totalCol ? [X[i]!] : [])]));
  VA.forEach((c, a) => rows.push([...lead(c, VAL[a]!), ...V[a]!]));
  if (o.totalRow) rows.push([...lead('T', 'Total inputs'), ...S.map((_, j) => colSum(j)), ...FD.map((_, k) => fdSum(k))]);
  if (o.satellite === 'brackets') rows.push([...lead('EMP', 'Employment (jobs)'), 12, 20, 40]);
  if (o.satellite === 'unit-column') rows.push([...lead('EMP', 'Employment', 'jobs'), 12, 20, 40]);
  if (o.notes) {
    rows.push([]);
    for (const n of o.notes) rows.push([n]);
  }
  return rows;
}

function toCsv(rows: Cell[][], d = ',', decimal = '.'): string {
  return rows
    .map((r) =>
      r
        .map((c) => {
          if (c === null || c === undefined) return '';
          if (typeof c === 'number') return decimal === ',' ? String(c).replace('.', ',') : String(c);
          return /[",;\t\n]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c;
        })
        .join(d),
    )
    .join('\n');
}

function expectSmallTable(t: ReturnType<typeof readTable>['table'], codes: string[] = S) {
  expect(t.sectors.codes).toEqual(codes);
  expect(Array.from(t.Z.data)).toEqual(Z.flat());
  expect(t.finalDemand.codes.length).toBe(2);
  expect(Array.from(t.F.data)).toEqual(F.flat());
  expect(t.valueAdded.codes.length).toBe(2);
  expect(Array.from(t.V.data)).toEqual(V.flat());
  expect(Array.from(t.x)).toEqual(X);
}

describe('wide tables', () => {
  it('title rows, code and label columns, a code row and a label row, a total column, notes and a source', () => {
    const text = toCsv(layout({ titles: ['Input-output table of Testland, 2019', 'Millions of euros, basic prices', 'Table 1'], totalCol: true, notes: ['Note: detail may not add up.', 'Source: the test.'] }));
    const r = readTable(readCsv(text, { file: 't.csv' }).grid);
    expectSmallTable(r.table);
    expect(r.table.sectors.labels).toEqual(SL);
    expect(r.table.finalDemand.labels).toEqual(FDL);
    expect(r.table.meta).toMatchObject({ title: 'Input-output table of Testland, 2019', year: 2019, scale: 1e6, scaleLabel: 'millions', priceBasis: 'basic prices', source: 'the test.', notes: ['Note: detail may not add up.'] });
    expect(r.mapping).toMatchObject({ codeColumn: 1, labelColumn: 2, codeRow: 4, labelRow: 5, titleRows: [1, 2, 3], noteRows: [12, 13], output: { from: 'column', code: 'TOT' } });
    expect(r.findings.filter((f) => f.severity !== 'note')).toEqual([]);
  });

  it('label column before the code column; a semicolon file with decimal commas', () => {
    const rows = layout({ labelFirst: true, totalCol: true });
    rows[2]![2] = 10.5; // AGR→AGR 10.5: a decimal comma in the file
    rows[2]![7] = 100.5;
    const csv = readCsv(toCsv(rows, ';', ','), { file: 'eu.csv' });
    const r = readTable(csv.grid);
    expect(r.mapping.codeColumn).toBe(2);
    expect(r.mapping.labelColumn).toBe(1);
    expect(r.table.sectors.codes).toEqual(S);
    expect(r.table.Z.data[0]).toBe(10.5);
    expect(r.table.x[0]).toBe(100.5);
    expect(r.mapping.conventions).toMatchObject({ delimiter: ';', decimal: ',' });
  });

  it('labels alone as codes, with a total row checked against the data and never read as data', () => {
    const r = readTable(readCsv(toCsv(layout({ noCodes: true, totalRow: true, totalCol: true })), { file: 'l.csv' }).grid);
    expectSmallTable(r.table, SL);
    const t = r.mapping.totals!.find((x) => x.code === 'Total inputs')!;
    expect(t.sumOf).toBe('all sector, value-added and imports rows');
    expect(t.matched).toBe(5);
    expect(r.table.valueAdded.codes).toEqual(VAL);
  });

  it('a total that disagrees with its parts is a finding naming the cell, and the table is still read', () => {
    const rows = layout({ totalRow: true, totalCol: true });
    rows.find((x) => x[0] === 'T')![3] = 999; // MAN's column total
    const r = readTable(readCsv(toCsv(rows), { file: 'bad-total.csv' }).grid);
    expectSmallTable(r.table);
    const f = r.findings.find((x) => x.code === 'total-mismatch')!;
    expect(f.where).toMatchObject({ file: 'bad-total.csv', cell: 'D8', columnLabel: 'MAN Manufacturing' });
    expect(f.message).toMatch(/row T .* 999 found, 200 summed/);
  });

  it('interleaved subtotals: one after its parts, one before them, and a grand total', () => {
    const rows: Cell[][] = [
      ['code', 'label', ...S, 'T1', 'HH', 'G1', 'GOV1', 'GOV2', 'T2', 'T3'],
      [null, null, ...SL, 'Total intermediate', 'Households', 'Government', 'Central', 'Local', 'Total final uses', 'Total output'],
    ];
    S.forEach((c, i) => rows.push([c, SL[i]!, ...Z[i]!, Z[i]!.reduce((a, b) => a + b), F[i]![0]!, F[i]![1]!, 5, F[i]![1]! - 5, F[i]![0]! + F[i]![1]!, X[i]!]));
    VA.forEach((c, a) => rows.push([c, VAL[a]!, ...V[a]!]));
    const r = readTable(gridFromRows(rows, 'sub.csv'), { patterns: { totals: { codes: ['T*', 'G1'] } } });
    expect(Array.from(r.table.Z.data)).toEqual(Z.flat());
    expect(r.table.finalDemand.codes).toEqual(['HH', 'GOV1', 'GOV2']);
    expect(Array.from(r.table.x)).toEqual(X);
    const sumOf = Object.fromEntries(r.mapping.totals!.map((t) => [t.code, t.sumOf]));
    expect(sumOf).toEqual({ T1: 'the sector columns', G1: 'GOV1..GOV2', T2: 'the final-demand columns', T3: 'all sector and final-demand columns' });
  });

  it('satellite rows with units in brackets or in a unit column', () => {
    for (const satellite of ['brackets', 'unit-column'] as const) {
      const r = readTable(readCsv(toCsv(layout({ totalCol: true, satellite })), { file: 's.csv' }).grid);
      expect(r.table.satellites).toHaveLength(1);
      expect(r.table.satellites[0]).toMatchObject({ code: 'EMP', unit: 'jobs' });
      expect(Array.from(r.table.satellites[0]!.values)).toEqual([12, 20, 40]);
    }
  });

  it('columns in another order than the rows are matched by code', () => {
    const rows: Cell[][] = [
      ['code', 'SRV', 'AGR', 'MAN', 'HH'],
      ['AGR', 5, 10, 20, 65],
      ['MAN', 25, 15, 40, 120],
      ['SRV', 50, 5, 30, 115],
    ];
    const r = readTable(gridFromRows(rows, 'o.csv'));
    expect(Array.from(r.table.Z.data)).toEqual(Z.flat());
    expect(r.findings.some((f) => f.code === 'columns-reordered')).toBe(true);
  });

  it("another agency's codes through patterns: final demand P3*, P5*, P6; value added D1, B2A3G; totals TOTAL", () => {
    const rows: Cell[][] = [
      ['', 'A', 'C', 'P3_S14', 'P51G', 'P6', 'TOTAL'],
      ['A', 1, 2, 3, 4, 5, 15],
      ['C', 2, 3, 4, 5, 6, 20],
      ['D1', 5, 6],
      ['B2A3G', 7, 9],
      ['TOTAL', 15, 20],
    ];
    const patterns = { finalDemand: { codes: ['P3*', 'P5*', 'P6'], labels: [] }, valueAdded: { codes: ['D*', 'B2*'], labels: [] }, totals: { codes: ['TOTAL'], labels: [] } };
    const r = readTable(gridFromRows(rows, 'eu.csv'), { patterns });
    expect(r.table.finalDemand.codes).toEqual(['P3_S14', 'P51G', 'P6']);
    expect(r.table.valueAdded.codes).toEqual(['D1', 'B2A3G']);
    expect(Array.from(r.table.x)).toEqual([15, 20]);
    expect(r.mapping.output).toEqual({ from: 'column', code: 'TOTAL' });
  });

  it('a sector whose code matches a final-demand pattern stays a sector when it names a row and a column', () => {
    // 'F' is construction in some classifications; 'F*' is the default final-demand pattern.
    const rows: Cell[][] = [
      ['code', 'A', 'F', 'FC'],
      ['A', 1, 2, 10],
      ['F', 3, 4, 20],
    ];
    const r = readTable(gridFromRows(rows, 'f.csv'));
    expect(r.table.sectors.codes).toEqual(['A', 'F']);
    expect(r.table.finalDemand.codes).toEqual(['FC']);
  });

  it('the detected mapping passed back in reads the same table; a role changed in it changes the table', () => {
    const grid = readCsv(toCsv(layout({ totalCol: true, satellite: 'brackets' })), { file: 'm.csv' }).grid;
    const first = readTable(grid);
    const json = JSON.stringify(first.mapping);
    const again = readTable(grid, { mapping: parseMapping(json) });
    expect(again.table).toEqual(first.table);
    const edited = readTable(grid, { mapping: { rows: { GOS: 'ignore' }, columns: [{ code: 'EXP', role: 'ignore' }] } });
    expect(edited.table.valueAdded.codes).toEqual(['W']);
    expect(edited.table.finalDemand.codes).toEqual(['HH']);
    expect(() => readTable(grid, { mapping: { rows: { NOPE: 'ignore' } } })).toThrow(/the mapping sets rows 'NOPE'/);
    const d = detectLayout(grid);
    expect(d.mapping.rows.map((x) => x.role)).toEqual(['sector', 'sector', 'sector', 'value-added', 'value-added', 'satellite']);
  });

  it('a heading row inside the table is passed over; blank cells read as zero only where allowed', () => {
    const rows = layout({ totalCol: true });
    rows.splice(5, 0, [null, 'Primary inputs']);
    rows[2]![4] = null; // AGR→SRV blank
    const grid = gridFromRows(rows, 'h.csv');
    expect(() => readTable(grid)).toThrow(/file h\.csv, cell E3 \(row 'AGR Agriculture', column 'SRV Services'\) is empty, in the intermediate block.*blanks: 'zero'/);
    const r = readTable(grid, { blanks: 'zero' });
    expect(r.table.Z.data[2]).toBe(0);
    expect(r.table.valueAdded.codes).toEqual(VA);
  });

  it("texts that mean zero ('-', '..') are read as zero only when listed", () => {
    const rows = layout({ totalCol: true });
    rows[2]![4] = '-';
    rows[3]![4] = '..';
    const grid = gridFromRows(rows, 'z.csv');
    expect(() => readTable(grid)).toThrow(/text '-' where a number belongs .*2 cells like it.*zeroTexts/);
    const r = readTable(grid, { zeroTexts: ['-', '..'] });
    expect(r.table.Z.data[2]).toBe(0);
    expect(r.table.Z.data[5]).toBe(0);
  });
});

describe('coefficients', () => {
  const A = Z.map((r) => r.map((z, j) => z / X[j]!));
  it('technical coefficients with total output in a row give back the flows', () => {
    const rows: Cell[][] = [['code', ...S], ...S.map((c, i) => [c, ...A[i]!]), ['W', ...V[0]!.map((v, j) => v / X[j]!)], ['x', ...X]];
    const r = readTable(gridFromRows(rows, 'a.csv'), { kind: 'coefficients' });
    expect(r.mapping.output).toEqual({ from: 'row', code: 'x' });
    r.table.Z.data.forEach((z, k) => expect(z).toBeCloseTo(Z.flat()[k]!, 12));
    expect(r.table.meta.outputAssumed).toBeUndefined();
  });

  it('without total output, x = 1 and meta.outputAssumed is set', () => {
    const rows: Cell[][] = [['code', ...S], ...S.map((c, i) => [c, ...A[i]!])];
    const r = readTable(gridFromRows(rows, 'a.csv'), { kind: 'coefficients' });
    expect(Array.from(r.table.x)).toEqual([1, 1, 1]);
    expect(r.table.meta.outputAssumed).toBe(true);
    expect(Array.from(r.table.Z.data)).toEqual(A.flat());
    expect(r.mapping.output).toEqual({ from: 'assumed' });
  });
});

describe('XLSX sheets', () => {
  async function workbook(build: (ws: ExcelJS.Worksheet, wb: ExcelJS.Workbook) => void): Promise<Uint8Array> {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Notes');
    ws.getCell('A1').value = 'About this workbook';
    build(wb.addWorksheet('Flows 2019'), wb);
    return new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer);
  }

  it('merged header cells, numbers stored as text, codes with non-breaking spaces, formulas with saved values', async () => {
    const bytes = await workbook((ws) => {
      ws.getCell('A1').value = 'Flows, 2019 (thousands)';
      ws.mergeCells('C2:D2');
      ws.getCell('C2').value = 'Industries';
      ws.getCell('A3').value = 'Code';
      ws.getCell('B3').value = 'Name';
      ['AGR\u00a0', ' MAN', 'HH'].forEach((c, j) => (ws.getCell(3, 3 + j).value = c));
      [
        ['AGR  ', 'Agriculture', '10', 20, 70],
        ['MAN\u00a0', 'Manufacturing', 15, { formula: '20*2', result: 40 }, 145],
      ].forEach((r, i) => r.forEach((v, j) => (ws.getCell(4 + i, 1 + j).value = v as ExcelJS.CellValue)));
    });
    const x = await readXlsx(bytes, { file: 'w.xlsx', sheet: 'flows 2019' });
    expect(x.sheets).toEqual(['Notes', 'Flows 2019']);
    const r = readTable(x.grid);
    expect(r.table.sectors.codes).toEqual(['AGR', 'MAN']);
    expect(Array.from(r.table.Z.data)).toEqual([10, 20, 15, 40]);
    expect(r.table.meta.scale).toBe(1e3);
    expect(r.mapping.headerRows).toEqual([2]);
    expect(r.mapping.sheet).toBe('Flows 2019');
    expect((await readXlsx(bytes, { file: 'w.xlsx', sheet: 2 })).sheet).toBe('Flows 2019');
  });

  it('a formula with no saved value is reported where a number belongs', async () => {
    const bytes = await workbook((ws) => {
      ws.addRow(['code', 'A', 'B']);
      ws.addRow(['A', 1, { formula: 'B3+1' }]);
      ws.addRow(['B', 3, 4]);
    });
    const x = await readXlsx(bytes, { file: 'f.xlsx', sheet: 'Flows 2019' });
    expect(() => readTable(x.grid)).toThrow(/sheet 'Flows 2019', cell C2 .*text '=B3\+1' where a number belongs.*formula with no saved value/);
  });
});

describe('long files', () => {
  const triplets = S.flatMap((r, i) => S.map((c, j) => [r, c, Z[i]![j]!] as const)).filter((t) => t[2] !== 0);
  it('with a header naming the fields, or with none; extra constant fields are passed over', () => {
    const withHeader = 'from,to,year,value\n' + triplets.map(([r, c, v]) => `${r},${c},2019,${v}`).join('\n');
    const a = readLongCsv(withHeader, { file: 'h.csv' });
    expect(a.mapping).toMatchObject({ rowCodeField: 1, columnCodeField: 2, valueField: 4, headerLine: 1 });
    const b = readLongCsv(triplets.map(([r, c, v]) => `${r};${c};2019;${String(v).replace('.', ',')}`).join('\n'), { file: 'n.csv' });
    expect(b.mapping).toMatchObject({ valueField: 4, headerLine: null });
    for (const t of [a, b]) {
      const r = readTable(t);
      expect(r.table.sectors.codes).toEqual(S);
      expect(Array.from(r.table.Z.data)).toEqual(Z.flat());
    }
  });

  it('transposed: a header that names the column first, the transposed option, and a file sorted by column', () => {
    const named = 'to,from,value\n' + triplets.map(([r, c, v]) => `${c},${r},${v}`).join('\n');
    const byOption = triplets.map(([r, c, v]) => `${c},${r},${v}`).join('\n');
    const byColumn = [...triplets].sort((p, q) => S.indexOf(p[1]) - S.indexOf(q[1])).map(([r, c, v]) => `${r},${c},${v}`).join('\n');
    for (const [text, o] of [
      [named, {}],
      [byOption, { transposed: true }],
      [byColumn, {}],
    ] as const) {
      const t = readLongCsv(text, { file: 'tr.csv', ...o });
      const r = readTable(t);
      expect(r.table.sectors.codes).toEqual(S);
      expect(Array.from(r.table.Z.data)).toEqual(Z.flat());
    }
  });

  it('a long sheet of a workbook, and a long file found by its shape when opened', async () => {
    const rows: Cell[][] = [['row', 'column', 'value'], ...triplets.map((t) => [...t] as Cell[])];
    const t = readLongGrid(gridFromRows(rows, 'g.xlsx', 'Long'), {});
    expect(Array.from(readTable(t).table.Z.data)).toEqual(Z.flat());
    const opened = await readTableFile(new TextEncoder().encode(triplets.map((x) => x.join(',')).join('\n')), { file: 'l.csv' });
    expect(opened.shape).toBe('long');
    expect(Array.from(opened.table.Z.data)).toEqual(Z.flat());
  });

  it('labels from a label field beside the code', () => {
    const text = triplets.map(([r, c, v]) => `${r},${SL[S.indexOf(r)]} and more words,${c},${v}`).join('\n');
    const t = readLongCsv(text, { file: 'lab.csv', columnCodeField: 3 });
    expect(t.rows.labels[0]).toBe('Agriculture and more words');
  });
});

describe('supply-use tables', () => {
  const ind = ['I1', 'I2'];
  const com = ['C1', 'C2', 'C3'];
  const make = [
    [90, 10, 0],
    [5, 95, 20],
  ];
  const use = [
    [10, 20],
    [30, 5],
    [1, 2],
  ];

  it('a make table written commodities × industries is recognised and transposed; codes are aligned', () => {
    const makeRows: Cell[][] = [['', ...ind], ...com.map((c, k) => [c, ...ind.map((_, i) => make[i]![k]!)])];
    const useRows: Cell[][] = [['', ...ind, 'F1'], ...com.map((c, k) => [c, ...use[k]!, 50]), ['V1', 60, 80]];
    const r = readSupplyUse(gridFromRows(makeRows, 'make.csv'), gridFromRows(useRows, 'use.csv'));
    expect(r.mappings.make.makeOrientation).toBe('commodities-by-industries');
    expect(r.input.industries.codes).toEqual(ind);
    expect(r.input.commodities.codes).toEqual(com);
    expect(Array.from(r.input.make.data)).toEqual(make.flat());
    expect(Array.from(r.input.use.data)).toEqual(use.flat());
    expect(r.finalDemand.axis.codes).toEqual(['F1']);
    expect(r.valueAdded.axis.codes).toEqual(['V1']);
  });

  it('product and industry codes from different classifications: the layout falls back on position and says so', () => {
    const useRows: Cell[][] = [['code', ...ind, 'F1'], ...com.map((c, k) => [`P_${c}`, ...use[k]!, 50]), ['V1', 60, 80]];
    const makeRows: Cell[][] = [['code', ...com.map((c) => `P_${c}`)], ...ind.map((c, i) => [c, ...make[i]!])];
    const r = readSupplyUse(gridFromRows(makeRows, 'make.csv'), gridFromRows(useRows, 'use.csv'));
    expect(r.input.commodities.codes).toEqual(com.map((c) => `P_${c}`));
    expect(Array.from(r.input.use.data)).toEqual(use.flat());
    expect(r.findings.some((f) => f.code === 'layout-by-position')).toBe(true);
  });
});

describe('satellites', () => {
  it('satellites down or across, attached to a table by code', () => {
    const t = readTable(readCsv(toCsv(layout({ totalCol: true })), { file: 't.csv' }).grid).table;
    const down = readSatellites(gridFromRows([['code', 'unit', 'MAN', 'AGR', 'SRV'], ['CO2', 't', 2, 1, 3], ['EMP', 'jobs', 20, 12, 40]], 'sat.csv'), { sectors: t.sectors });
    const across = readSatellites(gridFromRows([['code', 'CO2', 'EMP'], ['unit', 't', 'jobs'], ['MAN', 2, 20], ['AGR', 1, 12], ['SRV', 3, 40]], 'sat2.csv'), { sectors: t.sectors });
    expect(down.orientation).toBe('sectors-across');
    expect(across.orientation).toBe('sectors-down');
    for (const s of [down, across]) {
      const withSat = attachSatellites(t, s);
      expect(withSat.satellites.map((x) => [x.code, x.unit, Array.from(x.values)])).toEqual([
        ['CO2', 't', [1, 2, 3]],
        ['EMP', 'jobs', [12, 20, 40]],
      ]);
    }
    expect(() => attachSatellites(t, { satellites: down.satellites, sectors: { codes: ['AGR', 'MAN', 'XXX'], labels: [] } })).toThrow(InputError);
  });
});
