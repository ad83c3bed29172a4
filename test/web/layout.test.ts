/**
 * The preview grid's blocks and the cell a finding points at, from src/io's mapping of real
 * layouts: the agency's use spreadsheet (source: U.S. Bureau of Economic Analysis, Benchmark
 * Input-Output Accounts of the United States, 1997, Table 4 as use.xlsx, read in place; its
 * README lists the layout: title rows, a code and a title column, header rows, value-added rows
 * V001-V003, total rows and columns, F columns of final uses) and a symmetric table as src/io's
 * writer lays it out (the demo CSV: invented numbers, used only for where its cells are).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { render } from 'svelte/server';
import { checks } from '../../engine/index';
import { detectLayout, readLongCsv, readTableFile, readXlsx } from '../../src/io/index';
import type { LayoutMapping } from '../../src/io/index';
import { describeCell, findingCell, parseA1, parseRowList, regionIndex, regionOf, rowListText } from '../../web/lib/layout';
import PreviewGrid from '../../web/components/PreviewGrid.svelte';
import { REPO } from '../e2e/helpers';
import { BEA_DIR, BEA_SOURCE, beaAvailable } from '../helpers/reference';

describe('cell references and row lists', () => {
  it('parses A1 references and row lists, and writes lists back as ranges (common practice: A1 notation)', () => {
    expect(parseA1('E14')).toEqual({ row: 14, column: 5 });
    expect(parseA1('$AA$3')).toEqual({ row: 3, column: 27 });
    expect(parseA1('14E')).toBeUndefined();
    expect(parseRowList('1, 2, 5-7')).toEqual([1, 2, 5, 6, 7]);
    expect(parseRowList('3;1 2')).toEqual([1, 2, 3]);
    expect(parseRowList('a-b')).toBeUndefined();
    expect(parseRowList('7-5')).toBeUndefined();
    expect(rowListText([1, 2, 3, 5, 7, 8])).toBe('1-3, 5, 7-8');
    expect(rowListText(parseRowList(rowListText([4, 9, 10, 11]))!)).toBe('4, 9-11');
  });
});

describe.skipIf(!beaAvailable())(`blocks of the agency's use spreadsheet (source: ${BEA_SOURCE})`, () => {
  it('highlights titles, codes, labels, the intermediate square, final uses, value added and totals where the agency put them', async () => {
    const x = await readXlsx(new Uint8Array(readFileSync(join(BEA_DIR, 'use.xlsx'))), { file: 'use.xlsx' });
    const m = detectLayout(x.grid, { kind: 'use' as 'flows' }).mapping;
    const ix = regionIndex(m);
    const rowOf = (code: string) => m.rows.find((r) => r.code === code)!.row;
    const colOf = (code: string) => m.columns.find((c) => c.code === code)!.column;
    const title = m.titleRows![0]!;
    expect(regionOf(ix, title, 1)).toBe('title');
    expect(regionOf(ix, rowOf('1110'), m.codeColumn!)).toBe('code');
    expect(regionOf(ix, rowOf('1110'), m.labelColumn!)).toBe('label');
    expect(regionOf(ix, m.codeRow!, colOf('1110'))).toBe('code');
    expect(regionOf(ix, rowOf('1110'), colOf('1120'))).toBe('intermediate');
    expect(regionOf(ix, rowOf('1110'), colOf('F010'))).toBe('final-demand');
    for (const v of ['V001', 'V002', 'V003']) expect(regionOf(ix, rowOf(v), colOf('1110'))).toBe('value-added');
    expect(regionOf(ix, rowOf('1110'), colOf('T001'))).toBe('total');
    expect(regionOf(ix, rowOf('T008'), colOf('1110'))).toBe('total');
    // Value added under final uses is no block of the table.
    expect(regionOf(ix, rowOf('V001'), colOf('F010'))).toBe('');
  });

  it('a long file (make.txt: industry, commodity, table number, value) shows its code fields and its value field', () => {
    const long = readLongCsv(new Uint8Array(readFileSync(join(BEA_DIR, 'make.txt'))), { file: 'make.txt' });
    const ix = regionIndex({ ...long.mapping, rows: [], columns: [], output: { from: 'none' }, format: 'ripplewise-layout', version: 1, kind: 'make', blanks: 'error' } as LayoutMapping);
    expect([1, 2, 3, 4].map((c) => regionOf(ix, 5, c))).toEqual(['code', 'code', '', 'value']);
  });
});

describe('the cell of a finding', () => {
  const demo = () => readFileSync(join(REPO, 'data-demo/vellan-coast.csv'), 'utf8').split('\n');

  it("maps the reader's own cell, and an engine check on a block cell, to the same cell of the file", async () => {
    const lines = demo();
    const at = lines.findIndex((l) => l.startsWith('FISH,'));
    const c = lines[at]!.split(',');
    c[5] = String(Number(c[5]) + 40);
    lines[at] = c.join(',');
    const r = await readTableFile(new TextEncoder().encode(lines.join('\n')), { file: 'edited.csv' });
    const m = r.mapping as LayoutMapping;
    const mismatch = r.findings.find((f) => f.code === 'total-mismatch')!;
    const imbalance = checks(r.table).find((f) => f.code === 'row-imbalance')!;
    const a = findingCell(mismatch, m, r.table)!;
    const b = findingCell(imbalance, m, r.table)!;
    expect(a.cell).toBe(mismatch.where!.cell);
    expect(b).toEqual(a);
    expect(describeCell(a)).toBe(`file edited.csv, cell ${a.cell}`);
    // The row is FISH's, the column the output column 'x'.
    expect(a.row).toBe(at + 1);
    expect(lines[9]!.split(',')[a.column - 1]).toBe('x');
  });

  it('a sector-only finding points at its code cell; a finding of another file or without a place points nowhere', async () => {
    const r = await readTableFile(new TextEncoder().encode(demo().join('\n')), { file: 'v.csv' });
    const m = r.mapping as LayoutMapping;
    const at = findingCell({ code: 'x', severity: 'note', message: 'm', where: { sector: 'FOOD' } }, m, r.table)!;
    expect(at.column).toBe(m.codeColumn);
    expect(at.row).toBe(m.rows.find((x) => x.code === 'FOOD')!.row);
    expect(findingCell({ code: 'x', severity: 'note', message: 'm', where: { file: 'other.csv', cell: 'B2' } }, m, r.table)).toBeUndefined();
    expect(findingCell({ code: 'x', severity: 'note', message: 'm' }, m, r.table)).toBeUndefined();
  });

  it('the preview grid marks the blocks, the chosen cell and the legend, with labels from the file escaped', async () => {
    const r = await readTableFile(new TextEncoder().encode(demo().join('\n')), { file: 'v.csv' });
    const m = r.mapping as LayoutMapping;
    const food = m.rows.find((x) => x.code === 'FOOD')!.row;
    const texts = Array.from({ length: 20 }, (_, i) => Array.from({ length: 8 }, (_, j) => (i === 0 && j === 1 ? '<img src=x onerror=alert(1)>' : `${i},${j}`)));
    const kinds = texts.map((row) => row.map(() => 2));
    const { body } = render(PreviewGrid, { props: { window: { top: 0, left: 0, texts, kinds, rowCount: 36, colCount: 26 }, mapping: m, focus: { row: food, column: 5 } } });
    expect(body).toMatch(/class="r-title/);
    expect(body).toMatch(/class="r-intermediate/);
    expect(body).toMatch(new RegExp(`aria-current="true"[^>]*data-cell="E${food}"`));
    expect(body).toContain('intermediate square');
    expect(body).not.toContain('<img src=x');
    expect(body).toMatch(/Rows 1–20 of 36, columns A–H of Z/);
    expect((body.match(/<button type="button"/g) ?? []).length).toBeGreaterThanOrEqual(4);
  });
});
