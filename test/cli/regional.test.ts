/** The regionalise and balance commands, in-process. */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fromRows } from '../../engine/linalg/matrix';
import { makeTable } from '../../engine/table';
import { ras, regionalise } from '../../engine/regional/index';
import { readTableFile, writeTableCsv } from '../../src/io/index';
import { run, tempDir } from './harness';

// The hand example of test/engine/regional/quotients.test.ts: A = [[.2,.1,.1],[.3,.3,.2],[.1,.2,.1]],
// x = [1000, 2000, 1000]; national jobs [100, 300, 600], the region's [20, 20, 60] (formulas of
// Miller & Blair 2009, ch. 8, from memory; numbers by hand).
const A0 = [[0.2, 0.1, 0.1], [0.3, 0.3, 0.2], [0.1, 0.2, 0.1]];
const X0 = [1000, 2000, 1000];
const Z0 = A0.map((row) => row.map((a, j) => a * X0[j]!));
const table = makeTable({
  sectors: { codes: ['AGR', 'MAN', 'SRV'], labels: ['Agriculture', 'Manufacturing', 'Services'] },
  Z: Z0,
  finalDemand: { codes: ['HH'], labels: ['Households'], values: Z0.map((row, i) => [X0[i]! - row.reduce((s, v) => s + v, 0)]) },
  valueAdded: { codes: ['COE'], labels: ['Compensation of employees'], values: [X0.map((x, j) => x - Z0.reduce((s, row) => s + row[j]!, 0))] },
  x: X0,
  satellites: [{ code: 'JOBS', label: 'Employment', unit: 'jobs', values: [100, 300, 600] }],
  meta: { title: 'Hand nation', currency: 'EUR', scaleLabel: 'millions' },
});

let dir: string;
let national: string;
let regional: string;
let regionalOnly: string;
beforeAll(() => {
  dir = tempDir();
  national = join(dir, 'nation.csv');
  writeFileSync(national, writeTableCsv(table));
  regional = join(dir, 'county.csv');
  writeFileSync(regional, 'code,label,County (jobs),Nation (jobs)\nAGR,Agriculture,20,100\nMAN,Manufacturing,20,300\nSRV,Services,60,600\nTotal,,100,1000\n');
  regionalOnly = join(dir, 'county-only.csv');
  writeFileSync(regionalOnly, 'code,Region (jobs)\nSRV,60\nAGR,20\nMAN,20\n');
});

describe('ripplewise regionalise', () => {
  it('FLQ by the hand example: quotients, λ, capped sectors, the regional file’s SHA-256, and the regional table written', async () => {
    const out = join(dir, 'county-flq.csv');
    const r = await run(['regionalise', national, '--regional', regional, '--method', 'flq', '--region', 'County', '--json', '--out', out]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.provenance.method).toBe('flq');
    expect(j.provenance.delta).toBe(0.3);
    // by hand: [log2(1.1)]^0.3 = 0.551435
    expect(j.provenance.lambda).toBeCloseTo(0.551435, 6);
    expect(j.provenance.sha256).toBe(createHash('sha256').update(readFileSync(regional)).digest('hex'));
    expect(j.provenance.capped).toEqual(['AGR']);
    expect(j.sectors.map((s: { slq: number }) => s.slq)).toEqual([2, 2 / 3, 1].map((v) => expect.closeTo(v, 12)));
    expect(j.cautions.join(' ')).toMatch(/overstate regional multipliers/);
    expect(j.findings.some((f: { code: string }) => f.code === 'total-line-left-out')).toBe(true);
    // The file read back is the engine's regional table.
    const back = await readTableFile(readFileSync(out), { file: out });
    const engine = regionalise(table, { kind: 'employment', unit: 'jobs', region: Float64Array.of(20, 20, 60), nation: Float64Array.of(100, 300, 600) }, { method: 'flq' });
    Array.from(back.table.Z.data).forEach((v, k) => expect(v).toBeCloseTo(engine.table.Z.data[k]!, 6));
    // by hand: MAN → AGR = 0.3 × 0.183812 × 200 = 11.0287
    expect(back.table.Z.data[3]).toBeCloseTo(11.0287, 3);
    for (let j2 = 0; j2 < 3; j2++) expect(j.sectors[j2].outputMultiplier.regional).toBeLessThanOrEqual(j.sectors[j2].outputMultiplier.national);
  });

  it('takes the nation’s jobs from the table when the file gives the region’s only, and the sectors in any order', async () => {
    const r = await run(['regionalise', national, '--regional', regionalOnly, '--method', 'slq', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.settings.find((s: { key: string }) => s.key === 'nationValues').value).toMatch(/satellite 'JOBS'/);
    expect(j.sectors.map((s: { slq: number }) => s.slq)).toEqual([2, 2 / 3, 1].map((v) => expect.closeTo(v, 12)));
  });

  it('writes an HTML report with the quotients, the two-region split and the cautions', async () => {
    const out = join(dir, 'county.html');
    const r = await run(['regionalise', national, '--regional', regional, '--method', 'cilq', '--two-region', '--out', out]);
    expect(r.code).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toMatch(/Quotients and multipliers by sector/);
    expect(html).toMatch(/Interregional feedback/);
    expect(html).toMatch(/survey-based or hybrid/);
    expect(html).toMatch(/Local guidance first/);
  });

  it('sums a finer regional file onto the table’s sectors through a concordance', async () => {
    const fine = join(dir, 'fine.csv');
    const con = join(dir, 'fine-map.csv');
    writeFileSync(fine, 'code,Region (jobs),Nation (jobs)\nA01,12,60\nA02,8,40\nC10,20,300\nS90,60,600\n');
    writeFileSync(con, 'code,group\nA01,AGR\nA02,AGR\nC10,MAN\nS90,SRV\n');
    const r = await run(['regionalise', national, '--regional', fine, '--concordance', con, '--method', 'slq', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.sectors.map((s: { region: number }) => s.region)).toEqual([20, 20, 60]);
    expect(j.sectors.map((s: { slq: number }) => s.slq)).toEqual([2, 2 / 3, 1].map((v) => expect.closeTo(v, 12)));
  });

  it('names the file, cell, row, column and text of a bad value (exit 2)', async () => {
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'code,Region (jobs)\nAGR,20\nMAN,n/a\nSRV,60\n');
    const r = await run(['regionalise', national, '--regional', bad]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bad\.csv.*cell B3 \(row 'MAN', column 'Region \(jobs\)'\): text 'n\/a' where a number belongs/);
    const unknown = join(dir, 'unknown.csv');
    writeFileSync(unknown, 'code,Region (jobs)\nAGR,20\nMAN,20\nSRV,60\nFISH,3\n');
    const u = await run(['regionalise', national, '--regional', unknown]);
    expect(u.code).toBe(2);
    expect(u.stderr).toMatch(/'FISH'/);
    const d = await run(['regionalise', national, '--regional', regional, '--method', 'slq', '--delta', '0.3']);
    expect(d.code).toBe(2);
    expect(d.stderr).toMatch(/--delta applies to FLQ and AFLQ/);
  });
});

describe('ripplewise balance', () => {
  it('RAS of the intermediate flows to new totals agrees with the engine, and writes the matrix', async () => {
    const rows = join(dir, 'rows.csv');
    const cols = join(dir, 'cols.csv');
    writeFileSync(rows, 'code,total\nAGR,450\nMAN,1200\nSRV,560\n');
    writeFileSync(cols, 'code,total\nAGR,700\nMAN,1100\nSRV,410\n');
    const out = join(dir, 'balanced.csv');
    const r = await run(['balance', national, '--row-totals', rows, '--column-totals', cols, '--json', '--out', out]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.method).toBe('ras');
    expect(j.converged).toBe(true);
    expect(j.maxDeviation).toBeLessThanOrEqual(1e-10);
    const engine = ras(fromRows(Z0), [450, 1200, 560], [700, 1100, 410]);
    j.matrix.values.flat().forEach((v: number, k: number) => expect(v).toBeCloseTo(engine.X.data[k]!, 9));
    expect(existsSync(out)).toBe(true);
    expect(readFileSync(out, 'utf8').split('\n')[0]).toMatch(/^sector,AGR,MAN,SRV/);
  });

  it('names the targets that cannot be met and writes nothing (exit 1)', async () => {
    const rows = join(dir, 'rows-bad.csv');
    const cols = join(dir, 'cols-bad.csv');
    writeFileSync(rows, 'code,total\nAGR,450\nMAN,1200\nSRV,560\n');
    writeFileSync(cols, 'code,total\nAGR,700\nMAN,1100\nSRV,999\n');
    const out = join(dir, 'never.csv');
    const r = await run(['balance', national, '--row-totals', rows, '--column-totals', cols, '--out', out]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/row totals sum to 2210 and the column totals to 2799/);
    expect(existsSync(out)).toBe(false);
  });

  it('GRAS on the whole table with a negative cell, one cell held fixed', async () => {
    const neg = join(dir, 'neg.csv');
    const t2 = makeTable({ sectors: { codes: ['A', 'B'] }, Z: [[10, 20], [30, 5]], finalDemand: { codes: ['HH', 'INV'], values: [[15, -5], [20, 5]] }, valueAdded: { codes: ['VA', 'TAX'], values: [[25, 40], [-5, 5]] }, x: [40, 60] });
    writeFileSync(neg, writeTableCsv(t2));
    const rows = join(dir, 'rows-w.csv');
    const cols = join(dir, 'cols-w.csv');
    writeFileSync(rows, 'code,total\nA,44\nB,66\nVA,72\nTAX,-2\n');
    writeFileSync(cols, 'code,total\nA,44\nB,66\nHH,38\nINV,32\n');
    const r = await run(['balance', neg, '--part', 'whole', '--row-totals', rows, '--column-totals', cols, '--fix', 'A:A', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.method).toBe('gras');
    expect(j.matrix.values[0][0]).toBe(10);
    expect(j.matrix.values[0][3]).toBeLessThan(0);
    expect(j.matrix.values[3][0]).toBeLessThan(0);
    const rs = j.matrix.values.map((row: number[]) => row.reduce((a, b) => a + b, 0));
    expect(rs).toEqual([44, 66, 72, -2].map((v) => expect.closeTo(v, 7)));
  });
});

describe('ripplewise report with a regional table', () => {
  it('carries the regional section: the same quotients and multipliers as regionalise, the regional file hashed, the cautions', async () => {
    const r = await run(['report', national, '--no-household', '--regional', regional, '--method', 'flq', '--region', 'County', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const rep = JSON.parse(r.stdout);
    const sec = rep.sections.find((s: { id: string }) => s.id === 'regional');
    expect(sec).toBeDefined();
    expect(sec.title).toMatch(/County/);
    const g = await run(['regionalise', national, '--regional', regional, '--method', 'flq', '--json']);
    const j = JSON.parse(g.stdout);
    const tbl = sec.tables.find((t: { id: string }) => t.id === 'regional-quotients');
    const col = (key: string) => tbl.columns.findIndex((c: { key: string }) => c.key === key);
    const value = (cell: unknown) => (typeof cell === 'object' && cell !== null && 'value' in cell ? (cell as { value: number }).value : cell);
    tbl.rows.forEach((row: unknown[], i: number) => {
      expect(value(row[col('multR')])).toBeCloseTo(j.sectors[i].outputMultiplier.regional, 12);
      expect(value(row[col('multN')])).toBeCloseTo(j.sectors[i].outputMultiplier.national, 12);
      expect(value(row[col('slq')])).toBeCloseTo(j.sectors[i].slq, 12);
    });
    const sha = createHash('sha256').update(readFileSync(regional)).digest('hex');
    expect(rep.inputs.some((f: { role: string; sha256: string }) => f.role === 'regional' && f.sha256 === sha)).toBe(true);
    expect(rep.settings.some((x: { key: string; value: unknown }) => x.key === 'regional.method' && /Flegg/.test(String(x.value)))).toBe(true);
    expect(JSON.stringify(rep.cautions)).toMatch(/overstate regional multipliers/);
    // the other sections are still there
    expect(rep.sections.some((s: { id: string; kind?: string }) => s.id === 'multipliers' || s.kind === 'multipliers')).toBe(true);
  });

  it('refuses regional options without --regional (exit 2)', async () => {
    const r = await run(['report', national, '--method', 'slq', '--json']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/need --regional FILE/);
  });
});

describe('ripplewise balance --write table', () => {
  it('writes the whole table with the balanced part in place: rows and columns add up to the new totals', async () => {
    const t2 = makeTable({ sectors: { codes: ['A', 'B'] }, Z: [[10, 20], [30, 5]], finalDemand: { codes: ['HH', 'INV'], values: [[15, -5], [20, 5]] }, valueAdded: { codes: ['VA', 'TAX'], values: [[25, 40], [-5, 5]] }, x: [40, 60] });
    const neg = join(dir, 'neg-write.csv');
    writeFileSync(neg, writeTableCsv(t2));
    const rows = join(dir, 'rows-wt.csv');
    const cols = join(dir, 'cols-wt.csv');
    writeFileSync(rows, 'code,total\nA,44\nB,66\nVA,72\nTAX,-2\n');
    writeFileSync(cols, 'code,total\nA,44\nB,66\nHH,38\nINV,32\n');
    const out = join(dir, 'balanced-table.csv');
    const r = await run(['balance', neg, '--part', 'whole', '--write', 'table', '--row-totals', rows, '--column-totals', cols, '--out', out]);
    expect(r.stderr).toMatch(/^wrote .*balanced-table\.csv/);
    expect(r.code).toBe(0);
    const back = (await readTableFile(readFileSync(out), { file: out })).table;
    expect(Array.from(back.x)).toEqual([44, 66].map((v) => expect.closeTo(v, 7)));
    // column j: Σ z + Σ v = x_j (the table's own accounting identity, common practice)
    for (let j = 0; j < 2; j++) {
      const colSum = back.Z.data[j]! + back.Z.data[2 + j]! + back.V.data[j]! + back.V.data[2 + j]!;
      expect(colSum).toBeCloseTo(back.x[j]!, 7);
    }
    // rows of primary inputs meet their targets
    expect(back.V.data[0]! + back.V.data[1]!).toBeCloseTo(72, 7);
    expect(back.V.data[2]! + back.V.data[3]!).toBeCloseTo(-2, 7);
    const bad = await run(['balance', neg, '--write', 'cells', '--row-totals', rows, '--column-totals', cols]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--write must be matrix or table/);
  });
});
