/**
 * A stress test of the wide-table readers: many sheet layouts, generated here, of four small
 * known tables, each of which readTableFile must give back exactly (codes, labels where the
 * sheet has them, Z, F, V and x), with no warning or error among its findings (notes are fine),
 * and again when the mapping it reported is passed back in.
 *
 * The tables are invented data: 3, 4, 5 and 8 sectors, balanced by construction (every row of Z
 * plus F sums to x, every column of Z plus V sums to x), whole numbers in three of them and one
 * decimal in the other, values into the millions in one and in the thousands (every sum below
 * a million) in another, a negative change in inventories, zero cells, numeric sector codes
 * ('01') and codes that look like other things (F, D35, T beside totals coded TINT). A variant
 * combines, drawn by a seeded generator (and a fixed list first):
 *
 * - codes and labels: a code and a label column (either order), labels only, codes only, or
 *   code and label in one cell ('A01 Crops', in the rows and in the header);
 * - the header: a code row and a label row (either order), a 'Code' / 'Description' heading
 *   over the leading columns, a units row ('EUR million') under it, a group-header row over the
 *   blocks ('Intermediate use', 'Final uses': merged in workbooks, written once or repeated in
 *   text files);
 * - title rows above, blank rows between blocks, a blank column, section headings inside
 *   ('Primary inputs'), notes and a 'Source:' line below, footnote marks in labels ('Exports (a)', 'Exports 1)', 'Exports *');
 * - totals: total intermediate, total final demand and total output columns, total intermediate
 *   and total output rows, a 'Gross value added' subtotal row and a 'Final consumption
 *   expenditure' subtotal column before or after their parts, with T-prefixed codes,
 *   national-accounts codes (P1, P2, B1G, P3) or none; total rows filled under the final-demand
 *   columns or not;
 * - final-demand and value-added codes: letters (F1, V1), national-accounts codes (P3_S14, P51G,
 *   P6, D1, D29X39, B2A3G) or none;
 * - numbers: plain, with thousands separators ('1,234.5' quoted in comma files, '1.234,5' in
 *   semicolon files, '1 234,5' with a space or a non-breaking space), in comma, semicolon and
 *   tab files and in XLSX workbooks (zeros as empty cells or written; numbers as number cells,
 *   or as text with separators).
 *
 * Whole numbers written with one thousands separator ('1.234') and nothing else in the file
 * to show the decimal mark are truly ambiguous: those variants must fail with an error that
 * names the cell and the option to give, and read right with it.
 *
 * Then a few malformed sheets, each with an InputError naming the file and the cell.
 * The layouts are common practice in published tables. FUZZ_SCALE=10 runs ten times as many.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors';
import type { Table } from '../../engine/table';
import { readTableFile } from '../../src/io/open';
import { ambiguous, BASES, build, bytesOf, DEFAULT, describeVariant, FIXED, randomVariant, settle, toCsv, toXlsx, type Variant } from './layout-variants';

/** FUZZ_SCALE=10 runs ten times as many random variants. */
const SCALE = Number(process.env.FUZZ_SCALE ?? 1);

function expectTable(t: Table, e: Table, what: string): void {
  expect(t.sectors, what).toEqual(e.sectors);
  expect(Array.from(t.Z.data), what).toEqual(Array.from(e.Z.data));
  expect(t.finalDemand, what).toEqual(e.finalDemand);
  expect(Array.from(t.F.data), what).toEqual(Array.from(e.F.data));
  expect(t.valueAdded, what).toEqual(e.valueAdded);
  expect(Array.from(t.V.data), what).toEqual(Array.from(e.V.data));
  expect(Array.from(t.x), what).toEqual(Array.from(e.x));
  expect(t.satellites, what).toEqual([]);
}

async function check(v: Variant): Promise<void> {
  const what = describeVariant(v);
  const { bytes, file, sheet } = await bytesOf(v);
  if (ambiguous(v)) {
    const err = await readTableFile(bytes, { file }).then(
      () => undefined,
      (e: unknown) => e,
    );
    expect(err, what).toBeInstanceOf(InputError);
    const ie = err as InputError;
    expect(ie.code, what).toBe('ambiguous-number');
    expect(ie.message, what).toMatch(new RegExp(`^file ${file.replace('.', '\\.')}(, sheet 'Table 1')?, cell [A-Z]+\\d+: '[\\d.,-]+' could be `));
    expect(ie.where.cell, what).toMatch(/^[A-Z]+\d+$/);
    // The option to give (the command line turns it into --decimal).
    expect(ie.hint, what).toBe("Choose the decimal mark: decimal: '.' or decimal: ','");
    const decimal = v.format === 'semicolon' ? ',' : '.';
    const r = await readTableFile(bytes, { file, decimal });
    expectTable(r.table, sheet.expected, what);
    return;
  }
  const r = await readTableFile(bytes, { file });
  expect(r.shape, what).toBe('wide');
  expect(
    r.findings.filter((f) => f.severity !== 'note').map((f) => `${f.code}: ${f.message}`),
    what,
  ).toEqual([]);
  expectTable(r.table, sheet.expected, what);
  if (v.titles) expect(r.table.meta.year, what).toBe(2019);
  if (v.notes) expect(r.table.meta.source, what).toBe('invented for this test.');
  // Codes and labels in one cell are reported as split; the mapping passed back in reads the same table.
  expect(r.mapping.splitCodes === true, what).toBe(v.lead === 'combined');
  const again = await readTableFile(bytes, { file, mapping: JSON.parse(JSON.stringify(r.mapping)) });
  expectTable(again.table, sheet.expected, `${what} (with its mapping)`);
}

// ---------------------------------------------------------------------------------------------

const RANDOM = Math.round(400 * SCALE);
const variants: Variant[] = [];
for (const b of BASES) for (const f of FIXED) variants.push(settle({ ...DEFAULT, base: b, ...f }));
for (let s = 1; s <= RANDOM; s++) variants.push(randomVariant(1000 + s));

describe(`${variants.length} wide layouts of four known tables (invented data)`, () => {
  it('the known tables balance: rows of Z and F and columns of Z and V sum to x', () => {
    for (const b of BASES) {
      const n = b.sectors.length;
      for (let j = 0; j < n; j++) {
        const row = b.Z[j]!.reduce((a, z) => a + z, 0) + b.F[j]!.reduce((a, f) => a + f, 0);
        const col = b.Z.reduce((a, r) => a + r[j]!, 0) + b.V.reduce((a, r) => a + r[j]!, 0);
        expect(col, `${b.name} column ${j}`).toBe(row);
        for (const r of b.V) expect(r[j]!, `${b.name} value added`).toBeGreaterThan(0);
      }
    }
  });

  it('the sample holds workbooks, every lead, and variants whose decimal mark is undecided', () => {
    expect(variants.filter((v) => v.format === 'xlsx').length).toBeGreaterThan(20);
    for (const lead of ['code-label', 'label-code', 'labels', 'codes', 'combined']) expect(variants.filter((v) => v.lead === lead).length).toBeGreaterThan(20);
    expect(variants.filter(ambiguous).length).toBeGreaterThan(5);
  });

  for (const v of variants) {
    it(describeVariant(v), async () => {
      await check(v);
    });
  }
});

// ---------------------------------------------------------------------------------------------
// Malformed sheets: each an InputError that names the file and the cell, and says what to do.

/** The smallest layout of the 3-sector table: a code row, a label row, a code and a label column, a total output column. */
function plain(format: Variant['format'] = 'comma'): { v: Variant; rows: (string | number | null)[][] } {
  const v = settle({ ...DEFAULT, base: BASES[0]!, format });
  return { v, rows: build(v).rows.map((r) => [...r]) };
}

async function failure(v: Variant, rows: (string | number | null)[][]): Promise<InputError> {
  const sheet = { ...build(v), rows };
  const file = v.format === 'xlsx' ? 'bad.xlsx' : 'bad.csv';
  const bytes = v.format === 'xlsx' ? await toXlsx(sheet, v) : new TextEncoder().encode(toCsv(rows, v));
  const e = await readTableFile(bytes, { file }).then(
    () => undefined,
    (x: unknown) => x,
  );
  expect(e).toBeInstanceOf(InputError);
  return e as InputError;
}

describe('malformed sheets of the known table (invented data)', () => {
  // Rows 1-2 hold the codes and labels; AGR, MAN, SRV are rows 3-5 and columns C-E.
  it('a text cell in the intermediate block names the file, the cell with its row and column, and the text', async () => {
    const { v, rows } = plain();
    rows[3]![4] = 'n.a.';
    const e = await failure(v, rows);
    expect(e.code).toBe('not-a-number');
    expect(e.message).toMatch(/^file bad\.csv, cell E4 \(row 'MAN Manufacturing', column 'SRV Services'\): text 'n\.a\.' where a number belongs in the intermediate block/);
    expect(e.where).toMatchObject({ file: 'bad.csv', cell: 'E4', row: 4, column: 5, text: 'n.a.' });
  });

  it('the same in a workbook names the sheet', async () => {
    const { v, rows } = plain('xlsx');
    rows[2]![3] = 'x';
    const e = await failure(v, rows);
    expect(e.code).toBe('not-a-number');
    expect(e.message).toMatch(/^file bad\.xlsx, sheet 'Table 1', cell D3 \(row 'AGR Agriculture', column 'MAN Manufacturing'\): text 'x'/);
    expect(e.where).toMatchObject({ sheet: 'Table 1', cell: 'D3' });
  });

  it('a sector code given twice names both cells', async () => {
    const { v, rows } = plain();
    rows[3]![0] = 'AGR';
    const e = await failure(v, rows);
    expect(e.code).toBe('duplicate-code');
    expect(e.message).toMatch(/file bad\.csv: sector row code 'AGR' appears twice, in cell A3 and in cell A4/);
    expect(e.where).toMatchObject({ file: 'bad.csv', cell: 'A4', sector: 'AGR' });
  });

  it('a sector column code given twice names both cells', async () => {
    const { v, rows } = plain();
    rows[0]![4] = 'AGR';
    const e = await failure(v, rows);
    expect(e.code).toBe('duplicate-code');
    expect(e.message).toMatch(/file bad\.csv: sector column code 'AGR' appears twice, in cell C1 and in cell E1/);
  });

  it('an empty cell of a text file names the cell and the option that reads it as zero', async () => {
    const { v, rows } = plain();
    rows[4]![2] = null;
    const e = await failure(v, rows);
    expect(e.code).toBe('blank-cell');
    expect(e.message).toMatch(/^file bad\.csv, cell C5 \(row 'SRV Services', column 'AGR Agriculture'\) is empty, in the intermediate block.*blanks: 'zero'/);
  });

  it('a sector whose row and column codes differ names both cells, not read as value added and final demand', async () => {
    const { v, rows } = plain();
    rows[4]![0] = 'SRX';
    const e = await failure(v, rows);
    expect(e.code).toBe('code-mismatch');
    expect(e.message).toMatch(/^file bad\.csv: row 'SRX' \(in cell A5\) and column 'SRV' \(in cell E1\) are both labelled 'Services' but have different codes/);
    expect(e.message).toMatch(/same code, or set their roles in the mapping/);
    expect(e.where).toMatchObject({ file: 'bad.csv', cell: 'A5' });
  });

  it('a sector row with no column of its code, before the other sectors, names the cell', async () => {
    const { v, rows } = plain();
    rows[2]![0] = 'AGX';
    const e = await failure(v, rows);
    expect(e.code).toBe('row-without-column');
    expect(e.message).toMatch(/file bad\.csv: sector row 'AGX' \('Agriculture'\) in cell A3 has no column with the same code/);
  });

  it('decimal marks that disagree name both cells', async () => {
    const { v, rows } = plain('semicolon');
    rows[2]![2] = 12.5; // written '12,5'
    const text = toCsv(rows, v).replace(';31;', ';31.25;');
    const e = await readTableFile(new TextEncoder().encode(text), { file: 'mixed.csv' }).then(
      () => undefined,
      (x: unknown) => x as InputError,
    );
    expect(e).toBeInstanceOf(InputError);
    expect(e!.code).toBe('mixed-decimal');
    expect(e!.message).toMatch(/decimal marks disagree in file mixed\.csv: cell C3 has '12,5' \(decimal ','\) but cell D3 has '31\.25' \(decimal '\.'\)/);
  });

  it('codes and labels kept whole when the mapping says so', async () => {
    const v = settle({ ...DEFAULT, base: BASES[0]!, lead: 'combined' });
    const { bytes, file, sheet } = await bytesOf(v);
    const split = await readTableFile(bytes, { file });
    expect(split.table.sectors).toEqual(sheet.expected.sectors);
    const whole = await readTableFile(bytes, { file, mapping: { splitCodes: false } });
    expect(whole.table.sectors.codes).toEqual(['AGR Agriculture', 'MAN Manufacturing', 'SRV Services']);
    expect(whole.table.sectors.labels).toEqual(whole.table.sectors.codes);
    expect(Array.from(whole.table.Z.data)).toEqual(Array.from(sheet.expected.Z.data));
  });
});
