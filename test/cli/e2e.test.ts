/**
 * The command end to end, in child processes (node bin/ripplewise.mjs, as `npx ripplewise` runs
 * it): the published 1997 U.S. total requirements from the agency's make and use files, the demo
 * report, standard input, and the exit codes. Few spawns (each costs the start-up of tsx), run
 * side by side where independent, with many assertions each.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { BEA_DIR, BEA_SOURCE, beaAvailable, readTriplets } from '../helpers/reference';
import { UNPRODUCTIVE } from './fixtures';
import { ROOT, spawnCli, tempDir } from './harness';

const have = beaAvailable();

function wide(csv: string): { rows: string[]; cols: string[]; value: (r: string, c: string) => number | undefined } {
  const data = Papa.parse<string[]>(csv.trim()).data;
  const cols = data[0]!.slice(1);
  const rows = data.slice(1).map((r) => r[0]!);
  const ri = new Map(rows.map((c, i) => [c, i]));
  const ci = new Map(cols.map((c, j) => [c, j]));
  return {
    rows,
    cols,
    value: (r, c) => {
      const i = ri.get(r);
      const j = ci.get(c);
      return i === undefined || j === undefined ? undefined : Number(data[i + 1]![j + 1]);
    },
  };
}

describe.skipIf(!have)(`requirements from the agency's make and use files (source: ${BEA_SOURCE})`, () => {
  const dir = tempDir();
  const runs: Record<string, Awaited<ReturnType<typeof spawnCli>>> = {};
  beforeAll(async () => {
    // The make file's value is field 4; the use file's is field 5 (a year and a table number,
    // constant on every line, come before it): both detected. The scrap commodity is S004.
    const make = join(BEA_DIR, 'make.txt');
    const use = join(BEA_DIR, 'use.txt');
    const [ixc, ixi, xlsx] = await Promise.all([
      spawnCli(['requirements', '--make', make, '--use', use, '--kind', 'industry-by-commodity', '--scrap', 'S004', '--out', join(dir, 'ixc.csv')]),
      spawnCli(['requirements', '--make', make, '--use', use, '--use-value-column', '5', '--kind', 'industry-by-industry', '--scrap', 'S004', '--out', join(dir, 'ixi.csv'), '--out', join(dir, 'ixi.xlsx')]),
      // The use table as the agency's spreadsheet (title rows, codes and titles, totals; empty cells are zero).
      spawnCli(['requirements', '--make', make, '--use', join(BEA_DIR, 'use.xlsx'), '--blanks', 'zero', '--kind', 'industry-by-commodity', '--scrap', 'S004', '--out', join(dir, 'ixc-xlsx.csv')]),
    ]);
    runs.ixc = ixc;
    runs.ixi = ixi;
    runs['ixc-xlsx'] = xlsx;
  });

  for (const [key, file, table, cells] of [
    ['ixc', 'total-requirements-industry-by-commodity.txt', 'Table 7', 17554],
    ['ixi', 'total-requirements-industry-by-industry.txt', 'Table 8', 17161],
    ['ixc-xlsx', 'total-requirements-industry-by-commodity.txt', 'Table 7 from the use spreadsheet', 17554],
  ] as const) {
    it(`${table}: the CSV written matches every published cell within 1e-6, codes in the first column and the header row`, () => {
      const r = runs[key]!;
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toContain(`wrote ${join(dir, `${key}.csv`)}`);
      const m = wide(readFileSync(join(dir, `${key}.csv`), 'utf8'));
      expect(m.rows.length).toBeGreaterThan(120);
      let worst = 0;
      let n = 0;
      for (const t of readTriplets(file, 4)) {
        const v = m.value(t.row, t.col);
        expect(v, `${t.row} × ${t.col}`).toBeDefined();
        worst = Math.max(worst, Math.abs(v! - t.value));
        n++;
      }
      expect(n).toBe(cells);
      expect(worst).toBeLessThan(1e-6);
      // A published file lists nonzero cells only: every other cell written must be (near) zero.
      const published = new Set(readTriplets(file, 4).map((t) => `${t.row}|${t.col}`));
      for (const row of m.rows) for (const col of m.cols) if (!published.has(`${row}|${col}`)) expect(Math.abs(m.value(row, col)!)).toBeLessThan(1e-6);
    });
  }

  it('the XLSX written holds the same matrix, read back with exceljs 4.4.0', async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(join(dir, 'ixi.xlsx'));
    const ws = wb.getWorksheet('Matrix')!;
    const m = wide(readFileSync(join(dir, 'ixi.csv'), 'utf8'));
    const head = ws.getRow(1);
    expect(String(head.getCell(2).value)).toBe(m.cols[0]);
    let compared = 0;
    for (let i = 0; i < m.rows.length; i += 13) {
      const row = ws.getRow(i + 2);
      expect(String(row.getCell(1).value)).toBe(m.rows[i]);
      for (let j = 0; j < m.cols.length; j += 7) {
        expect(row.getCell(j + 2).value).toBe(m.value(m.rows[i]!, m.cols[j]!));
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(100);
  });
});

describe('the demo, standard input and exit codes in child processes', () => {
  const dir = tempDir();
  let demo: Awaited<ReturnType<typeof spawnCli>>;
  let codes: Awaited<ReturnType<typeof spawnCli>>[];
  let stdin: Awaited<ReturnType<typeof spawnCli>>;
  beforeAll(async () => {
    const outs = ['demo.html', 'demo.xlsx', 'demo.json'].flatMap((n) => ['--out', join(dir, n)]);
    [demo, stdin, ...codes] = await Promise.all([
      spawnCli(['impact', 'data-demo/vellan-coast.table.json', '--scenario', 'data-demo/scenarios.json', '--name', 'New seafood processing plant', ...outs]),
      spawnCli(['check', '-', '--json'], { stdin: JSON.stringify(UNPRODUCTIVE) }),
      spawnCli(['multipliers', 'data-demo/vellan-coast.table.json', '--no-such-option']),
      spawnCli(['impact', 'data-demo/no-such-table.csv', '--scenario', 'data-demo/scenarios.json']),
    ]);
  });

  it('impact on the demo writes HTML, XLSX and JSON whose numbers agree, marked as invented', async () => {
    expect(demo.code, demo.stderr).toBe(0);
    const doc = JSON.parse(readFileSync(join(dir, 'demo.json'), 'utf8'));
    expect(doc.invented).toBe(true);
    const totals = doc.sections.find((s: { kind: string }) => s.kind === 'scenario').tables.find((t: { id: string }) => t.id === 'scenario-1-totals');
    const html = readFileSync(join(dir, 'demo.html'), 'utf8');
    expect(html).toContain('INVENTED DATA');
    const block = /<table data-table="scenario-1-totals">([\s\S]*?)<\/table>/.exec(html)![1]!;
    const values = [...block.matchAll(/data-value="([^"]*)"/g)].map((m) => Number(m[1]));
    expect(values).toEqual(totals.rows.flatMap((r: unknown[]) => r.filter((v) => typeof v === 'number')));
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(join(dir, 'demo.xlsx'));
    const xs: number[] = [];
    wb.getWorksheet('Impacts')!.eachRow((row) => {
      if (row.getCell(1).value === totals.rows[0][0] && typeof row.getCell(3).value === 'number') xs.push(row.getCell(6).value as number);
    });
    expect(xs[0]).toBe(totals.rows[0][5]);
    for (const f of doc.inputs) expect(html).toContain(f.sha256);
  });

  it('standard input, and exit codes: 1 for a table that fails its checks, 2 for a bad option and for a missing file (named)', () => {
    expect(stdin.code).toBe(1);
    expect(JSON.parse(stdin.stdout).passed).toBe(false);
    const [badOption, missing] = codes;
    expect(badOption!.code).toBe(2);
    expect(badOption!.stderr).toMatch(/unknown option '--no-such-option'/);
    expect(missing!.code).toBe(2);
    expect(missing!.stderr).toContain('data-demo/no-such-table.csv');
    expect(missing!.stderr).not.toMatch(/\bat .*\.ts:\d+/); // no stack trace
  });

  it('the package declares the bin and runs it without a build step (tsx is a runtime dependency)', () => {
    const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8'));
    expect(pkg.bin.ripplewise).toBe('bin/ripplewise.mjs');
    expect(pkg.dependencies.tsx).toMatch(/^\d+\.\d+\.\d+$/);
    expect(pkg.devDependencies?.tsx).toBeUndefined();
  });
});
