/**
 * Writers: write → read gives the identical table (codes, labels, every number to the last bit,
 * units, metadata), as CSV, XLSX and JSON, for random tables (fast-check); matrices likewise;
 * and formula neutralisation of text cells (common practice: OWASP's advice on CSV injection,
 * a leading single quote), with numbers, negative ones included, left as numbers.
 */
import ExcelJS from 'exceljs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { makeTable, VALUE_ADDED_CLASSES, type Table } from '../../engine/table';
import { inputClassOf } from '../../src/io/rules/classes';
import { readCsv } from '../../src/io/csv';
import { neutraliseText, protectText, restoreText } from '../../src/io/escape';
import { readMatrixJson, readTableJson } from '../../src/io/json';
import { readMatrix, readTable } from '../../src/io/tables';
import { writeMatrixCsv, writeMatrixJson, writeMatrixXlsx, writeTableCsv, writeTableJson, writeTableXlsx, writeWorkbook } from '../../src/io/write';
import { readXlsx } from '../../src/io/xlsx';

/** FUZZ_SCALE=10 runs ten times as many cases (for a longer search; the default keeps the file fast). */
const SCALE = Number(process.env.FUZZ_SCALE ?? 1);

const tricky = ['=SUM(A1)', '+1', '-Other', '@cmd', "'quoted", "'=already", 'a,b', 'say "hi"', '0110', '1.50', ',0', '1,5', '1.234', "'7", '2 000', 'Total (adjusted)', 'Émigré'];

const code = fc.oneof(fc.constantFrom(...tricky.map((t) => t.trim()).filter(Boolean)), fc.stringMatching(/^[A-Z][A-Z0-9]{0,4}$/));
const label = fc.oneof(fc.constantFrom(...tricky), fc.string({ minLength: 1, maxLength: 12 }).filter((s) => s.trim() === s && s.length > 0 && !/[\r\n]/.test(s)));
const num = fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 }), fc.integer({ min: -1000, max: 1000 }), fc.constantFrom(0, 0.1 + 0.2, 1e-7, 1e21, -5));

/** A random table: unique codes, values of every kind, satellites with units, metadata. */
const tableArb = fc
  .record({
    n: fc.integer({ min: 1, max: 5 }),
    k: fc.integer({ min: 0, max: 3 }),
    m: fc.integer({ min: 0, max: 2 }),
    s: fc.integer({ min: 0, max: 2 }),
    imports: fc.boolean(),
  })
  .chain(({ n, k, m, s, imports }) =>
    fc.record({
      codes: fc.uniqueArray(code, { minLength: n + k + m + s, maxLength: n + k + m + s }),
      labels: fc.array(label, { minLength: n + k + m + s, maxLength: n + k + m + s }),
      Z: fc.array(fc.array(num, { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
      F: fc.array(fc.array(num, { minLength: k, maxLength: k }), { minLength: n, maxLength: n }),
      V: fc.array(fc.array(num, { minLength: n, maxLength: n }), { minLength: m, maxLength: m }),
      S: fc.array(fc.array(num, { minLength: n, maxLength: n }), { minLength: s, maxLength: s }),
      x: fc.array(fc.double({ min: 1, max: 1e9, noNaN: true }), { minLength: n, maxLength: n }),
      imp: imports ? fc.array(num, { minLength: n, maxLength: n }) : fc.constant(undefined),
      title: fc.option(label, { nil: undefined }),
      year: fc.option(fc.integer({ min: 1950, max: 2040 }), { nil: undefined }),
      notes: fc.option(fc.array(label, { minLength: 1, maxLength: 2 }), { nil: undefined }),
    }).map((r) => ({ ...r, n, k, m, s })),
  )
  .map((r): Table => {
    const { n, k, m } = r;
    const c = r.codes;
    const l = r.labels;
    const meta: Table['meta'] = { currency: 'EUR', scale: 1e6, scaleLabel: 'millions' };
    if (r.title !== undefined) meta.title = r.title;
    if (r.year !== undefined) meta.year = r.year;
    if (r.notes) meta.notes = r.notes;
    const p: Parameters<typeof makeTable>[0] = {
      sectors: { codes: c.slice(0, n), labels: l.slice(0, n) },
      Z: r.Z,
      finalDemand: { codes: c.slice(n, n + k), labels: l.slice(n, n + k), values: r.F },
      valueAdded: { codes: c.slice(n + k, n + k + m), labels: l.slice(n + k, n + k + m), values: r.V },
      x: r.x,
      satellites: r.S.map((values, i) => ({ code: c[n + k + m + i]!, label: l[n + k + m + i]!, unit: i ? 't CO2e' : 'jobs', values })),
      meta,
    };
    if (r.imp) p.imports = r.imp;
    return makeTable(p);
  });

/** Numbers as compared: -0 is written as 0 (a spreadsheet cannot tell them apart). */
const nums = (a: ArrayLike<number>) => Array.from(a, (v) => v + 0);
/**
 * The primary-input axis as read back: a written file carries codes and labels, not classes, so a
 * reader classes rows coded or titled as imports or product taxes (SNA P7, D21) again, as it would
 * on any agency file; classes are kept only when some row is then not value added. JSON keeps them.
 */
const readBack = (axis: Table['valueAdded']) => {
  if (axis.classes) return axis;
  const classes = axis.codes.map((c, i) => inputClassOf(c, axis.labels[i]!)?.cls);
  return classes.some((x) => x !== undefined && !VALUE_ADDED_CLASSES.includes(x)) ? { ...axis, classes } : axis;
};
const same = (a: Table, b: Table, exact = false) => {
  expect(b.sectors).toEqual(a.sectors);
  expect(b.finalDemand).toEqual(a.finalDemand);
  expect(b.valueAdded).toEqual(exact ? a.valueAdded : readBack(a.valueAdded));
  expect(nums(b.Z.data)).toEqual(nums(a.Z.data));
  expect(nums(b.F.data)).toEqual(nums(a.F.data));
  expect(nums(b.V.data)).toEqual(nums(a.V.data));
  expect(nums(b.x)).toEqual(nums(a.x));
  expect(b.imports && nums(b.imports)).toEqual(a.imports && nums(a.imports));
  expect(b.satellites.map((s) => ({ ...s, values: nums(s.values) }))).toEqual(a.satellites.map((s) => ({ ...s, values: nums(s.values) })));
  expect(b.meta).toEqual(a.meta);
};

describe('formula neutralisation (common practice: a leading single quote)', () => {
  it('text that begins with =, +, -, @, a tab or a carriage return gets a single quote; other text is kept', () => {
    for (const t of ['=1+1', '+A', '-B', '@C', '\tD', '\rE']) expect(neutraliseText(t)).toBe(`'${t}`);
    for (const t of ['A=1', 'Total', '', "'", "it's"]) expect(neutraliseText(t)).toBe(t);
    expect(neutraliseText("'=x")).toBe("''=x");
    for (const t of ['=1', '+2', '-x', '@y', '\tTab', '\rCR', "'=x", "''=x"]) expect(restoreText(neutraliseText(t))).toBe(t);
    // The table writers also protect texts that would read as numbers under another decimal mark; both undo exactly.
    for (const t of [...tricky, '\tTab', '\rCR', "''=x", "'", "'7", "''7", '1,5', '7']) expect(restoreText(protectText(t, '.'))).toBe(t);
    expect(protectText('1,5', '.')).toBe("'1,5");
    expect(protectText('1.5', '.')).toBe('1.5');
    expect(protectText('1.5', ',')).toBe("'1.5");
  });

  it('in CSV and XLSX, text cells are neutralised and numbers (negative ones too) stay numbers', async () => {
    const t = makeTable({ sectors: { codes: ['=A', 'B'], labels: ['-Mining', '@Services'] }, Z: [[-5, 1], [2, -0.5]], x: [10, 10] });
    const csv = writeTableCsv(t);
    expect(csv).toContain("'=A,'-Mining,sector,-5,1,10");
    expect(csv).not.toMatch(/(^|,)=A/m);
    const bytes = await writeTableXlsx(t);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(bytes as unknown as ArrayBuffer);
    const ws = wb.getWorksheet('Table')!;
    const row = ws.getRow(4);
    expect(row.getCell(1).value).toBe("'=A");
    expect(row.getCell(2).value).toBe("'-Mining");
    expect(row.getCell(4).value).toBe(-5);
    expect(row.getCell(4).type).toBe(ExcelJS.ValueType.Number);
    const generic = await writeWorkbook([{ name: 'Report', rows: [['=HYPERLINK("x")', -3]] }]);
    const wb2 = new ExcelJS.Workbook();
    await wb2.xlsx.load(generic as unknown as ArrayBuffer);
    expect(wb2.getWorksheet('Report')!.getCell('A1').value).toBe('\'=HYPERLINK("x")');
    expect(wb2.getWorksheet('Report')!.getCell('B1').value).toBe(-3);
  });
});

describe('round trips: write, read back, the identical table', () => {
  it('CSV, for random tables', () => {
    fc.assert(
      fc.property(tableArb, (t) => {
        same(t, readTable(readCsv(writeTableCsv(t), { file: 'rt.csv' }).grid).table);
      }),
      { numRuns: 300 * SCALE },
    );
  });

  it('CSV with semicolons and a decimal comma, with a byte-order mark and CRLF', () => {
    fc.assert(
      fc.property(tableArb, (t) => {
        const text = writeTableCsv(t, { delimiter: ';', decimal: ',', bom: true, lineEnding: '\r\n' });
        same(t, readTable(readCsv(new TextEncoder().encode(text), { file: 'rt.csv', decimal: ',' }).grid).table);
      }),
      { numRuns: 150 * SCALE },
    );
  });

  it('the byte scanner reads what the writer wrote', () => {
    fc.assert(
      fc.property(tableArb, (t) => {
        same(t, readTable(readCsv(new TextEncoder().encode(writeTableCsv(t)), { file: 'rt.csv', parser: 'scanner' }).grid).table);
      }),
      { numRuns: 150 * SCALE },
    );
  });

  it('JSON, for random tables', () => {
    fc.assert(
      fc.property(tableArb, (t) => same(t, readTableJson(writeTableJson(t)), true)),
      { numRuns: 300 * SCALE },
    );
  });

  it('XLSX (named sheets, number formats), for random tables', async () => {
    await fc.assert(
      fc.asyncProperty(tableArb, async (t) => {
        const bytes = await writeTableXlsx(t, { coefficients: true });
        const x = await readXlsx(bytes, { file: 'rt.xlsx' });
        expect(x.sheets).toEqual(['Table', 'Coefficients']);
        same(t, readTable(x.grid).table);
      }),
      { numRuns: 25 * SCALE },
    );
  });

  it('a plain matrix with row and column codes, as CSV, XLSX and JSON', async () => {
    const m = {
      rows: { codes: ['1110', 'S004', '=X'], labels: ['Crops', 'Scrap', 'Odd'] },
      cols: { codes: ['1110', 'S004', '=X', 'F010'], labels: ['Crops', 'Scrap', 'Odd', 'Consumption'] },
      matrix: { rows: 3, cols: 4, data: Float64Array.from([1.0727339, 0.3, -0, 1e-9, 0.1 + 0.2, 1, 2, 3, 4, 5, 6, 7]) },
      title: 'Total requirements',
      description: 'Output needed from each row per unit of final demand for each column',
    };
    const fromCsv = readMatrix(readCsv(writeMatrixCsv(m), { file: 'm.csv' }).grid);
    const fromXlsx = readMatrix((await readXlsx(await writeMatrixXlsx(m), { file: 'm.xlsx' })).grid);
    const fromJson = readMatrixJson(writeMatrixJson(m));
    for (const r of [fromCsv, fromXlsx, fromJson]) {
      expect(r.rows).toEqual(m.rows);
      expect(r.cols).toEqual(m.cols);
      expect(nums(r.matrix.data)).toEqual(nums(m.matrix.data));
      expect(r.title).toBe(m.title);
      expect(r.description).toBe(m.description);
    }
  });

  it('a non-finite value is refused with the cell named, never written as text', () => {
    const t = makeTable({ sectors: { codes: ['A'] }, Z: [[1]], x: [1] });
    t.Z.data[0] = NaN;
    expect(() => writeTableCsv(t)).toThrow(/intermediate flows: row 'A', column 'A' is NaN/);
    expect(() => writeTableJson(t)).toThrow(/is NaN/);
  });
});
