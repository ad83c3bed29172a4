/**
 * Long files in either orientation, with the transaction codes of the System of National
 * Accounts (2008 SNA; ESA 2010 uses the same codes: P3 final consumption, P51G gross fixed
 * capital formation, P6 exports, D1 compensation of employees, B2A3G operating surplus and mixed
 * income, D29X39 other taxes less subsidies on production, B1G value added, P1 output): the
 * codes are an open standard, the numbers invented. A file that lists the using industry first
 * and the product second, with no header to say so, is read the right way round because its
 * codes say so, and the note says why; a header that names the fields (prod_na, induse, as in
 * SDMX-CSV downloads) decides; a mapping that says "transposed" decides over both. The decimal
 * mark of a file whose every number is ambiguous is chosen on the command line.
 */
import { Matrix as MlMatrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { readLongCsv, readLongGrid } from '../../src/io/long';
import { gridFromRows } from '../../src/io/grid';
import { readTable } from '../../src/io/tables';
import { readTableFile } from '../../src/io/open';
import { run, tempDir } from '../cli/harness';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';

const S = ['CPA_A01', 'CPA_C10', 'CPA_F'];
const FD = ['P3_S14', 'P3_S13', 'P51G', 'P6'];
const VA = ['D1', 'B2A3G', 'D29X39'];
const Z = [
  [10, 20, 5],
  [15, 40, 25],
  [5, 30, 50],
];
const F = [
  [40, 5, 5, 15],
  [60, 10, 10, 40],
  [70, 20, 10, 15],
];
const V = [
  [40, 60, 65],
  [25, 48, 51],
  [5, 2, 4],
];
const X = [100, 200, 200];

/** Lines of (using column, product row, value), in the order a download might list them. */
function triplets(): [string, string, number][] {
  const out: [string, string, number][] = [];
  S.forEach((p, i) => {
    S.forEach((u, j) => out.push([u, p, Z[i]![j]!]));
    FD.forEach((u, k) => out.push([u, p, F[i]![k]!]));
  });
  VA.forEach((v, a) => S.forEach((u, j) => out.push([u, v, V[a]![j]!])));
  S.forEach((u, j) => out.push([u, 'P1', X[j]!]));
  return out;
}

function expectTable(t: ReturnType<typeof readTable>['table']) {
  expect(t.sectors.codes).toEqual(S);
  expect(Array.from(t.Z.data)).toEqual(Z.flat());
  expect(t.finalDemand.codes).toEqual(FD);
  expect(Array.from(t.F.data)).toEqual(F.flat());
  expect(t.valueAdded.codes).toEqual(VA);
  expect(Array.from(t.V.data)).toEqual(V.flat());
  expect(Array.from(t.x)).toEqual(X);
}

describe('long files with national-accounts codes', () => {
  it('reads a file that lists the user first, with no header, the right way round, and says why', () => {
    const text = triplets().map(([u, p, v]) => `${u},${p},${v}`).join('\n');
    const r = readTable(readLongCsv(text, { file: 'user-first.csv' }));
    expectTable(r.table);
    const note = r.findings.find((f) => f.code === 'long-transposed')!;
    expect(note.message).toMatch(/row codes look like final demand \('P3_S14'/);
    expect(note.message).toMatch(/column codes look like value added \('D1'/);
    expect(r.mapping.transposed).toBe(true);
    // The mapping it reports reads the file the same way again, without the guess.
    const again = readTable(readLongCsv(text, { file: 'user-first.csv', mapping: r.mapping }), { mapping: r.mapping });
    expectTable(again.table);
    expect(again.findings.some((f) => f.code === 'long-transposed')).toBe(false);
  });

  it('reads a file in the product-first order as it stands', () => {
    const text = triplets().map(([u, p, v]) => `${p},${u},${v}`).join('\n');
    const r = readTable(readLongCsv(text, { file: 'product-first.csv' }));
    expectTable(r.table);
    expect(r.findings.some((f) => f.code === 'long-transposed')).toBe(false);
  });

  it('takes the orientation from a header that names the fields, among constant fields', () => {
    const head = 'DATAFLOW,freq,unit,induse,prod_na,geo,TIME_PERIOD,OBS_VALUE,OBS_FLAG';
    const text = [head, ...triplets().map(([u, p, v]) => `NAIO,A,MIO_EUR,${u},${p},XX,2020,${v},`)].join('\n');
    const lt = readLongCsv(text, { file: 'sdmx.csv' });
    expect(lt.orientation).toBe('named');
    const r = readTable(lt);
    expectTable(r.table);
    expect(r.findings.find((f) => f.code === 'long-fields')!.message).toMatch(/field 5 'prod_na' the row and field 4 'induse' the column/);
  });

  it('keeps the orientation a mapping gives, even against the codes', () => {
    const text = triplets().map(([u, p, v]) => `${u},${p},${v}`).join('\n');
    const lt = readLongCsv(text, { file: 'given.csv', transposed: false });
    expect(lt.orientation).toBe('given');
    const r = readTable(lt);
    expect(r.table.sectors.codes).toEqual(S);
    expect(r.findings.some((f) => f.code === 'long-transposed')).toBe(false);
    // Read as given, the final-demand codes are rows: the table is not the one above.
    expect(Array.from(r.table.Z.data)).not.toEqual(Z.flat());
  });
});

describe('long files with label fields', () => {
  it('take the labels from fields the header names so, and never read them as codes', () => {
    // Invented numbers; single-word labels, so only the header tells them from codes.
    const sectors = [['A01', 'Crops'], ['C10', 'Food'], ['F41', 'Building']] as const;
    const Zs = [[10, 20, 5], [15, 40, 25], [5, 30, 50]];
    for (const head of ['row_code,row_label,col_code,col_label,value', 'sector,sector name,buyer,buyer name,amount']) {
      const lines = [head];
      sectors.forEach(([c, l], i) => {
        sectors.forEach(([c2, l2], j) => lines.push(`${c},${l},${c2},${l2},${Zs[i]![j]}`));
        lines.push(`${c},${l},HH,Households,${[65, 120, 115][i]}`);
      });
      sectors.forEach(([c2, l2], j) => lines.push(`W,Wages,${c2},${l2},${[70, 110, 120][j]}`));
      const r = readTable(readLongCsv(lines.join('\n'), { file: 'labelled.csv' }));
      expect(r.table.sectors.codes).toEqual(['A01', 'C10', 'F41']);
      expect(r.table.sectors.labels).toEqual(['Crops', 'Food', 'Building']);
      expect(Array.from(r.table.Z.data)).toEqual(Zs.flat());
      expect(r.table.finalDemand.labels).toEqual(['Households']);
    }
  });
});

describe('a download of several years', () => {
  const head = 'DATAFLOW,freq,unit,induse,prod_na,geo,TIME_PERIOD,OBS_VALUE,OBS_FLAG';
  const lines = [head];
  for (const [year, f] of [['2019', 2], ['2020', 1]] as const) for (const [u, p, v] of triplets()) lines.push(`NAIO,A,MIO_EUR,${u},${p},XX,${year},${v * f},`);
  const text = lines.join('\n');

  it('says which field tells the repeated lines apart, and reads the year selected', () => {
    let err: unknown;
    try {
      readLongCsv(text, { file: 'years.csv' });
    } catch (e) {
      err = e;
    }
    expect((err as Error).message).toMatch(/row 'CPA_A01', column 'CPA_A01' is given a second time/);
    expect((err as Error).message).toMatch(/differ in TIME_PERIOD \('2019', '2020'\).*--select TIME_PERIOD=2020/);
    const r = readTable(readLongCsv(text, { file: 'years.csv', select: { TIME_PERIOD: '2020' } }));
    expectTable(r.table);
    expect(r.mapping.select).toEqual({ TIME_PERIOD: '2020' });
    // By field number, through a mapping.
    const again = readTable(readLongCsv(text, { file: 'years.csv', mapping: { select: { '7': '2019' } } as never }));
    expect(Array.from(again.table.Z.data)).toEqual(Z.flat().map((v) => 2 * v));
    expect(() => readLongCsv(text, { file: 'years.csv', select: { TIME_PERIOD: '2031' } })).toThrow(/no line has TIME_PERIOD = '2031'. TIME_PERIOD holds '2019', '2020'/);
    expect(() => readLongCsv(text, { file: 'years.csv', select: { YEAR: '2020' } })).toThrow(/names field 'YEAR', which is not in its header line/);
  });

  it('reads a year that the file lists only after the lines the fields are decided from', () => {
    // 46 × 46 pairs of 2019 first (2,116 lines, more than the 2,000 sampled), then 2020.
    const out = ['row,col,year,value'];
    for (const y of ['2019', '2020']) for (let i = 0; i < 46; i++) for (let j = 0; j < 46; j++) out.push(`S${i},S${j},${y},${y === '2019' ? i + j : 1000 + i - j}`);
    const late = out.join('\n');
    const a = readLongCsv(late, { file: 'late.csv', select: { year: '2020' } });
    expect(a.rows.codes).toHaveLength(46);
    expect(a.matrix.data[1]).toBe(999);
    const g = gridFromRows(out.map((l) => l.split(',').map((x, k) => (k === 3 ? Number(x) : x))), 'late.csv');
    const b = readLongGrid(g, { select: { year: '2020' } });
    expect(Array.from(b.matrix.data)).toEqual(Array.from(a.matrix.data));
  });

  it('takes --select on the command line', async () => {
    const dir = tempDir();
    const file = join(dir, 'years.csv');
    writeFileSync(file, text);
    const bad = await run(['check', file]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--select TIME_PERIOD=2020/);
    const good = await run(['multipliers', file, '--select', 'TIME_PERIOD=2020', '--json']);
    expect(good.code).toBe(0);
    // Output multipliers are the column sums of L = (I − A)⁻¹, here by ml-matrix (source: ml-matrix 6.15.1).
    const A = new MlMatrix(Z.map((r) => r.map((v, j) => v / X[j]!)));
    const L = inverse(MlMatrix.eye(3).sub(A));
    const got = (JSON.parse(good.stdout) as { measures: { code: string; sectors: { code: string; simple: number }[] }[] }).measures.find((m) => m.code === 'output')!;
    expect(got.sectors.map((x) => x.code)).toEqual(S);
    got.sectors.forEach((x, j) => expect(Math.abs(x.simple - (L.get(0, j) + L.get(1, j) + L.get(2, j)))).toBeLessThan(1e-12));
    const wrong = await run(['check', file, '--select', 'TIME_PERIOD']);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/--select takes FIELD=VALUE/);
  });
});

describe('a keyed sheet: codes packed in the first column, one column per period', () => {
  // The layout of statistical bulk downloads: 'unit,induse,prod_na,geo\\TIME_PERIOD' heads the
  // packed codes; values may carry a flag after a space, and ':' is a value not available.
  const lines = ['unit,induse,prod_na,geo\\TIME_PERIOD\t2019 \t2020 '];
  triplets().forEach(([u, p, v], k) => lines.push(`MIO_EUR,${u},${p},XX\t${k === 0 ? ':' : `${2 * v} e`}\t${v}${k % 3 ? '' : ' p'} `));
  const bytes = new TextEncoder().encode(lines.join('\n'));

  it('is read as a long file, a period at a time, flags set apart', async () => {
    const r = await readTableFile(bytes, { file: 'bulk.tsv', long: { select: { TIME_PERIOD: '2020' } } });
    expect(r.shape).toBe('long');
    expectTable(r.table);
    const note = r.findings.find((f) => f.code === 'keyed-sheet')!;
    expect(note.message).toMatch(/packs the codes unit, induse, prod_na, geo and each further column is a TIME_PERIOD \(2019, 2020\)/);
    // 2019 has a value not available (':') in its first line: an empty cell, named, under the text-file rule.
    await expect(readTableFile(bytes, { file: 'bulk.tsv', long: { select: { TIME_PERIOD: '2019' } } })).rejects.toThrow(/empty/i);
    const zero = await readTableFile(bytes, { file: 'bulk.tsv', long: { select: { TIME_PERIOD: '2019' }, blanks: 'zero' } });
    expect(Array.from(zero.table.Z.data)).toEqual([0, ...Z.flat().slice(1).map((v) => 2 * v)]);
    // Without a period chosen, the latest is read, and a note says so.
    const latest = await readTableFile(bytes, { file: 'bulk.tsv' });
    expectTable(latest.table);
    expect(latest.findings.find((f) => f.code === 'latest-period')!.message).toMatch(/the latest TIME_PERIOD, 2020, is read; .*--select TIME_PERIOD=/);
  });
});

describe('a table in another language', () => {
  // Invented figures, French labels, Windows-1252 with semicolons and a decimal comma: the total
  // 'Production' names a row and a column like a sector, but the data show it is the sum of all.
  const text = [
    'Tableau entrées-sorties 2020 (données inventées);;;;;',
    ';Agriculture;Industrie agro-alimentaire;Bâtiment;Ménages;Production',
    'Agriculture;10,5;20;5;64,5;100',
    'Industrie agro-alimentaire;15;40;25;120;200',
    'Bâtiment;5;30;50;115;200',
    'Rémunération des salariés;69,5;110;120;;',
    'Production;100;200;200;;',
  ].join('\n');
  const latin = new Uint8Array([...text].map((ch) => ch.charCodeAt(0))); // these letters are the same bytes in Windows-1252

  it('takes a total named like a sector for a total, and reads its letters with --encoding', async () => {
    const dir = tempDir();
    const file = join(dir, 'fr.csv');
    writeFileSync(file, latin);
    const guessed = await run(['multipliers', file, '--no-household', '--json']);
    expect(guessed.code, guessed.stderr).toBe(0);
    const g = JSON.parse(guessed.stdout) as { measures: { sectors: { label: string; simple: number }[] }[]; findings: { code: string }[] };
    expect(g.measures[0]!.sectors.map((x) => x.label)).toEqual(['Agriculture', 'Industrie agro-alimentaire', 'Bâtiment']);
    expect(g.findings.some((f) => f.code === 'encoding-guessed')).toBe(true);
    const given = await run(['multipliers', file, '--no-household', '--encoding', 'latin-1', '--json']);
    expect((JSON.parse(given.stdout) as { findings: { code: string }[] }).findings.some((f) => f.code === 'encoding-guessed')).toBe(false);
    const wrong = await run(['check', file, '--encoding', 'utf-8']);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/is not valid utf-8\. Give the file's encoding \(--encoding windows-1252, for example\)/);
    // Output multipliers: column sums of (I − A)⁻¹ with x = 100, 200, 200 (source: ml-matrix 6.15.1).
    const Zs = [[10.5, 20, 5], [15, 40, 25], [5, 30, 50]];
    const X = [100, 200, 200];
    const L = inverse(MlMatrix.eye(3).sub(new MlMatrix(Zs.map((r) => r.map((v, j) => v / X[j]!)))));
    g.measures[0]!.sectors.forEach((x, j) => expect(Math.abs(x.simple - (L.get(0, j) + L.get(1, j) + L.get(2, j)))).toBeLessThan(1e-12));
  });
});

describe('number conventions on the command line', () => {
  it('is asked for when every number is ambiguous, and --decimal settles it; a comma-separated file takes the point, with a warning', async () => {
    const dir = tempDir();
    const file = join(dir, 'ambiguous.csv');
    // Every value has three decimals and lies between 1 and 1000: '11,250' may be 11.25 or 11250.
    const lines = triplets().map(([u, p, v]) => `${p};${u};${(v * 1.125).toFixed(3).replace('.', ',')}`);
    writeFileSync(file, lines.join('\n'));
    const bad = await run(['check', file]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/could be .* \(',' as a thousands separator\) or .* \(',' as the decimal mark\)/);
    expect(bad.stderr).toMatch(/--decimal \. or --decimal ,/);
    const good = await run(['check', file, '--decimal', ',', '--json']);
    expect(good.code).toBe(0);
    const out = JSON.parse(good.stdout) as { findings: { code: string; message: string }[] };
    expect(out.findings.find((f) => f.code === 'csv-conventions')?.message ?? '').toMatch(/decimal mark ',' \(as given\)/);
    // In a comma-separated file a decimal comma would need quotes: '11.250' is read as 11.25, and a warning says so.
    const commas = join(dir, 'commas.csv');
    writeFileSync(commas, triplets().map(([u, p, v]) => `${p},${u},${(v * 1.125).toFixed(3)}`).join('\n'));
    const taken = await run(['multipliers', commas, '--json']);
    expect(taken.code).toBe(0);
    const w = (JSON.parse(taken.stdout) as { findings: { code: string; severity: string; message: string }[] }).findings.find((f) => f.code === 'decimal-from-delimiter')!;
    expect(w.severity).toBe('warning');
    expect(w.message).toMatch(/cells such as cell C1 '11\.250' could be read with '\.' as a thousands separator or as the decimal mark; they were read with '\.' as the decimal mark/);
    // A dash for zero: an error naming the cell and the option, then read as zero when given.
    const dashed = join(dir, 'dashed.csv');
    writeFileSync(dashed, triplets().map(([u, p, v], k) => `${p},${u},${k === 1 ? '-' : v}`).join('\n'));
    const d1 = await run(['check', dashed]);
    expect(d1.code).toBe(2);
    expect(d1.stderr).toMatch(/text '-' .*If '-' means zero here, give --zero-text/);
    const d2 = await run(['coefficients', dashed, '--zero-text', '-', '--json']);
    expect(d2.code).toBe(0);
    const wrong = await run(['check', file, '--decimal', 'x']);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/--decimal must be '\.' or ','; got 'x'/);
  });
});
