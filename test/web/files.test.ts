/**
 * The workbench's file and report operations as the worker runs them (called here in Node with
 * the worker's own context): open a sheet, detect and confirm its layout, read the table; make
 * and use tables to a symmetric table; a project file; malformed files with their message; the
 * four report formats.
 *
 * Sources: the U.S. Bureau of Economic Analysis, Benchmark Input-Output Accounts of the United
 * States, 1997, Tables 3, 4 and 8 (make.txt, use.txt, total-requirements-industry-by-industry.txt,
 * read in place): the industry-by-industry table derived from make + use has the agency's total
 * requirements as its Leontief inverse. ml-matrix 6.15.1 (a general-purpose library that shares
 * no code with the engine) inverts I − A independently for the report's multipliers. The demo
 * economy is invented; it is used only where the check is that two paths agree.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { makeTable } from '../../engine/index';
import type { PlainTable } from '../../engine/index';
import { readTableFile } from '../../src/io/index';
import { writeProject } from '../../src/project/project';
import { handlers } from '../../web/worker/handlers';
import { makeContext } from '../../web/worker/context';
import type { CellWindow, DetectResult, Opened, ReadResult, SheetInfo, SupplyUseResult } from '../../web/worker/ops/files';
import type { ReportFile } from '../../web/worker/ops/report';
import { REPO } from '../e2e/helpers';
import { BEA_DIR, BEA_SOURCE, beaAvailable, readTriplets } from '../helpers/reference';

async function call<T>(op: string, args: unknown = {}): Promise<T> {
  const ctx = makeContext(() => {}, () => false, []);
  return (await handlers[op]!(args, ctx)) as T;
}

async function fails(op: string, args: unknown): Promise<{ message: string; where?: Record<string, unknown> }> {
  try {
    await call(op, args);
  } catch (e) {
    return e as { message: string; where?: Record<string, unknown> };
  }
  throw new Error(`${op} did not fail`);
}

const demoCsv = () => new Uint8Array(readFileSync(join(REPO, 'data-demo/vellan-coast.csv')));
const demoXlsx = () => new Uint8Array(readFileSync(join(REPO, 'data-demo/vellan-coast.xlsx')));

describe('file operations in the worker', () => {
  it('opens a CSV as a sheet, serves windows of cells, detects the layout and reads the table as src/io does', async () => {
    const o = await call<Opened>('file-open', { name: 'vellan-coast.csv', bytes: demoCsv() });
    expect(o.type).toBe('sheet');
    const s = o as SheetInfo;
    expect(s.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(s.rowCount).toBeGreaterThan(20);
    const w = await call<CellWindow>('file-cells', { id: s.id, top: 0, left: 0, rows: 3, cols: 2 });
    expect(w.texts[0]).toEqual(['title', 'Vellan Coast regional input-output table, 2025 (invented)']);
    expect(w.kinds[0]).toEqual([2, 2]);
    const d = await call<DetectResult>('file-detect', { id: s.id });
    expect(d.problem).toBeUndefined();
    expect(d.mapping!.format).toBe('ripplewise-layout');
    expect(d.mapping!.rows.filter((r) => r.role === 'sector')).toHaveLength(16);
    const r = await call<ReadResult>('file-read', { id: s.id, mapping: d.mapping });
    // The same file through src/io directly (what the command line does).
    const direct = await readTableFile(demoCsv(), { file: 'vellan-coast.csv' });
    expect(r.table.sectors.codes).toEqual(direct.table.sectors.codes);
    expect(r.table.Z).toEqual(Array.from({ length: 16 }, (_, i) => Array.from(direct.table.Z.data.subarray(i * 16, (i + 1) * 16))));
    expect(r.mapping.file).toBe('vellan-coast.csv');
  });

  it('a role changed in the mapping changes the reading (a sector read as value added is no longer a sector)', async () => {
    const s = (await call<Opened>('file-open', { name: 'v.csv', bytes: demoCsv() })) as SheetInfo;
    const d = await call<DetectResult>('file-detect', { id: s.id });
    const imp = d.mapping!.rows.find((x) => x.role === 'imports' || x.role === 'value-added')!;
    const d2 = await call<DetectResult>('file-detect', { id: s.id, mapping: { ...d.mapping, rows: { [imp.code]: 'ignore' } } });
    expect(d2.mapping!.rows.find((x) => x.code === imp.code)!.role).toBe('ignore');
    const bad = await call<DetectResult>('file-detect', { id: s.id, mapping: { rows: { [imp.code]: 'nonsense' } } });
    expect(bad.problem!.message).toMatch(/role 'nonsense', which is not one of/);
  });

  it('opens an XLSX, lists its sheets and reads the same table as from the CSV', async () => {
    const s = (await call<Opened>('file-open', { name: 'vellan-coast.xlsx', bytes: demoXlsx() })) as SheetInfo;
    expect(s.kind).toBe('xlsx');
    expect(s.sheets!.length).toBeGreaterThan(0);
    const d = await call<DetectResult>('file-detect', { id: s.id });
    const r = await call<ReadResult>('file-read', { id: s.id, mapping: d.mapping });
    const c = (await call<Opened>('file-open', { name: 'vellan-coast.csv', bytes: demoCsv() })) as SheetInfo;
    const rc = await call<ReadResult>('file-read', { id: c.id });
    expect(r.table.Z).toEqual(rc.table.Z);
    expect(r.table.sectors).toEqual(rc.table.sectors);
    expect(r.mapping.sheet).toBe(s.sheet);
  });

  it('a text where a number belongs: the error names the file, the cell, the row, the column and the text', async () => {
    const text = new TextDecoder().decode(demoCsv()).split('\n');
    const at = text.findIndex((l) => l.startsWith('FISH,'));
    const cells = text[at]!.split(',');
    cells[4] = 'n/a';
    text[at] = cells.join(',');
    const s = (await call<Opened>('file-open', { name: 'broken.csv', bytes: new TextEncoder().encode(text.join('\n')) })) as SheetInfo;
    const e = await fails('file-read', { id: s.id });
    expect(e.message).toMatch(/broken\.csv/);
    expect(e.message).toMatch(/'n\/a'/);
    expect(e.where).toMatchObject({ file: 'broken.csv', row: at + 1, column: 5, cell: `E${at + 1}`, text: 'n/a' });
  });

  it('an empty file, a truncated workbook and a bad JSON each fail with a message naming the file', async () => {
    expect((await fails('file-open', { name: 'empty.csv', bytes: new Uint8Array(0) })).message).toMatch(/empty\.csv is empty/);
    const zip = demoXlsx().slice(0, 400);
    expect((await fails('file-open', { name: 'cut.xlsx', bytes: zip })).message).toMatch(/cut\.xlsx/);
    const j = await fails('file-open', { name: 'bad.json', bytes: new TextEncoder().encode('{"sectors": {"codes": ["A"]}, "Z": [[1,]]}') });
    expect(j.message).toMatch(/bad\.json: not valid JSON at line 1, column/);
  });

  it('opens a project file (validated) and a plain-table JSON', async () => {
    const table = JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable;
    const text = writeProject({ tool: { name: 'ripplewise', version: '0' }, table, scenarios: [{ name: 'A', changes: [{ sector: 'FOOD', amount: 5 }] }], settings: { 'view.measure': 'output' }, source: { name: 'x.csv', sha256: 'a'.repeat(64) } });
    const p = await call<Opened>('file-open', { name: 'work.ripplewise.json', bytes: new TextEncoder().encode(text) });
    expect(p.type).toBe('project');
    if (p.type === 'project') expect(p.project.scenarios[0]!.name).toBe('A');
    const bad = JSON.parse(text);
    bad.table.Z[0] = [1, 2];
    const e = await fails('file-open', { name: 'bad-project.json', bytes: new TextEncoder().encode(JSON.stringify(bad)) });
    expect(e.message).toMatch(/bad-project\.json/);
    const t = await call<Opened>('file-open', { name: 't.json', bytes: new TextEncoder().encode(JSON.stringify(table)) });
    expect(t.type).toBe('table');
  });
});

describe.skipIf(!beaAvailable())(`make and use tables to a symmetric table (source: ${BEA_SOURCE})`, () => {
  const bytes = (f: string) => new Uint8Array(readFileSync(join(BEA_DIR, f)));

  it('industry by industry: the Leontief inverse of the derived table is Table 8 within 1e-6 (column sums checked for every industry)', async () => {
    const mk = (await call<Opened>('file-open', { name: 'make.txt', bytes: bytes('make.txt') })) as SheetInfo;
    const us = (await call<Opened>('file-open', { name: 'use.txt', bytes: bytes('use.txt') })) as SheetInfo;
    expect(mk.shape).toBe('long');
    const r = await call<SupplyUseResult>('file-read-supply-use', { make: mk.id, use: us.id, kind: 'industry-by-industry', scrap: 'S004' });
    expect(r.table.sectors.codes).toHaveLength(131);
    await call('set-table', { table: r.table });
    const om = await call<{ codes: string[]; values: number[] }>('output-multipliers');
    const sums = new Map<string, number>();
    for (const t of readTriplets('total-requirements-industry-by-industry.txt', 4)) sums.set(t.col, (sums.get(t.col) ?? 0) + t.value);
    let worst = 0;
    om.codes.forEach((c, j) => {
      expect(sums.has(c), c).toBe(true);
      worst = Math.max(worst, Math.abs(om.values[j]! - sums.get(c)!));
    });
    // Each published cell is rounded to 7 decimals; 131 of them make a column sum.
    expect(worst).toBeLessThan(131 * 5e-8 + 1e-6);
    // The derived table balances by rows: Σⱼ zᵢⱼ + Σ fᵢ = gᵢ (common practice).
    const t = makeTable(r.table);
    let rowGap = 0;
    for (let i = 0; i < 131; i++) {
      let s = 0;
      for (let j = 0; j < 131; j++) s += t.Z.data[i * 131 + j]!;
      for (let k = 0; k < t.F.cols; k++) s += t.F.data[i * t.F.cols + k]!;
      rowGap = Math.max(rowGap, Math.abs(s - t.x[i]!) / Math.max(1, t.x[i]!));
    }
    expect(rowGap).toBeLessThan(1e-3);
  });

  it('commodity by commodity: W times the Leontief inverse of the derived table is Table 7 (industry by commodity) within 1e-6', async () => {
    const mk = (await call<Opened>('file-open', { name: 'make.txt', bytes: bytes('make.txt') })) as SheetInfo;
    const us = (await call<Opened>('file-open', { name: 'use.txt', bytes: bytes('use.txt') })) as SheetInfo;
    const r = await call<SupplyUseResult>('file-read-supply-use', { make: mk.id, use: us.id, kind: 'commodity-by-commodity', scrap: 'S004' });
    const t = makeTable(r.table);
    const n = t.x.length;
    // Independent path: ml-matrix inverts I − A of the derived table.
    const A = new MlMatrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) A.set(i, j, (i === j ? 1 : 0) - (t.x[j]! > 0 ? t.Z.data[i * n + j]! / t.x[j]! : 0));
    const L = mlInverse(A);
    // W from the published make table by the agency's formulas (layouts/agency-method.txt), in plain loops.
    const make = readTriplets('make.txt', 4);
    const inds = [...new Set(make.map((x) => x.row))];
    const g = new Map<string, number>();
    const q = new Map<string, number>();
    const h = new Map<string, number>();
    for (const x of make) {
      g.set(x.row, (g.get(x.row) ?? 0) + x.value);
      if (x.col === 'S004') h.set(x.row, (h.get(x.row) ?? 0) + x.value);
      else q.set(x.col, (q.get(x.col) ?? 0) + x.value);
    }
    const ci = new Map(t.sectors.codes.map((c, i) => [c, i]));
    const Lic = new Map<string, number>();
    for (const x of make) {
      if (x.col === 'S004') continue;
      const w = x.value / q.get(x.col)! / (1 - (h.get(x.row) ?? 0) / g.get(x.row)!);
      const c = ci.get(x.col)!;
      for (let k = 0; k < n; k++) {
        const key = `${x.row}|${t.sectors.codes[k]}`;
        Lic.set(key, (Lic.get(key) ?? 0) + w * L.get(c, k));
      }
    }
    let worst = 0;
    let cells = 0;
    for (const p of readTriplets('total-requirements-industry-by-commodity.txt', 4)) {
      if (!inds.includes(p.row)) continue;
      worst = Math.max(worst, Math.abs((Lic.get(`${p.row}|${p.col}`) ?? 0) - p.value));
      cells++;
    }
    expect(cells).toBeGreaterThan(17000);
    expect(worst).toBeLessThan(1e-6);
  });
});

describe('reports built in the worker', () => {
  it('writes HTML, XLSX, CSV and JSON with the cautions, the inputs with SHA-256, and multipliers as an independent inverse gives them', async () => {
    const table = JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable;
    await call('set-table', { table });
    const sha = 'b'.repeat(64);
    const r = await call<{ title: string; files: ReportFile[]; cautions: string[] }>('report-export', {
      source: [{ name: 'vellan-coast.table.json', sha256: sha, bytes: 100 }],
      scenarios: [{ name: 'Plant', changes: [{ sector: 'FOOD', amount: 10 }] }],
      locale: 'en-GB',
      createdAt: '2026-01-01T00:00:00.000Z',
    });
    expect(r.files.map((f) => f.format)).toEqual(['html', 'xlsx', 'csv', 'json']);
    const json = JSON.parse(r.files[3]!.data as string);
    expect(json.format).toBe('ripplewise-report');
    expect(json.inputs[0]).toMatchObject({ role: 'table', name: 'vellan-coast.table.json', sha256: sha });
    expect(json.inputs[1].role).toBe('scenarios');
    expect(json.inputs[1].sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(json.cautions.join(' ')).toMatch(/not a forecast/i);
    // The FOOD output multiplier (simple) against ml-matrix's inverse of I − A.
    const t = makeTable(table);
    const n = t.x.length;
    const M = new MlMatrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M.set(i, j, (i === j ? 1 : 0) - t.Z.data[i * n + j]! / t.x[j]!);
    const L = mlInverse(M);
    const food = t.sectors.codes.indexOf('FOOD');
    let sum = 0;
    for (let i = 0; i < n; i++) sum += L.get(i, food);
    const mt = json.sections.find((s: { kind: string }) => s.kind === 'multipliers').tables[0];
    const col = mt.columns.findIndex((c: { key: string }) => /simple/i.test(c.key));
    const row = mt.rows.find((x: unknown[]) => x[0] === 'FOOD');
    expect(Math.abs(row[col] - sum)).toBeLessThan(1e-9);
    const html = r.files[0]!.data as string;
    expect(html).toMatch(/not a forecast/i);
    expect(html).toContain('INVENTED DATA');
    expect(html).toContain(sha);
    const csv = r.files[2]!.data as string;
    expect(csv).toMatch(/not a forecast/i);
    const xlsx = r.files[1]!.data as Uint8Array;
    expect([xlsx[0], xlsx[1]]).toEqual([0x50, 0x4b]);
  });
});
