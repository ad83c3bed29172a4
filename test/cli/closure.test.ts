/**
 * The household closure and the stated conventions on the command line: the closure bases and
 * their options, a closure that is not productive failing the checks (exit 1, not 2), the notes
 * without a closure, and a failed table's report saying so on its first page in every format.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import type { PlainTable } from '../../engine/table';
import { run, tempDir } from './harness';

const dir = tempDir();
function tableFile(name: string, p: PlainTable): string {
  const f = join(dir, name);
  writeFileSync(f, JSON.stringify({ format: 'ripplewise-table', version: 1, table: p }));
  return f;
}

const SMALL: PlainTable = {
  sectors: { codes: ['A', 'B'], labels: ['Farming', 'Services'] },
  Z: [
    [20, 30],
    [40, 10],
  ],
  finalDemand: { codes: ['HH', 'EXP'], labels: ['Household consumption', 'Exports'], values: [[40, 10], [100, 50]] },
  valueAdded: { codes: ['COE', 'GOS'], labels: ['Compensation of employees', 'Gross operating surplus'], values: [[30, 100], [10, 60]] },
};

describe('closure options on the command line', () => {
  const file = tableFile('small.json', SMALL);
  it('states the basis and the share in the settings and the JSON conventions; warns when the share is above 1', async () => {
    const r = await run(['multipliers', file, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.conventions.closure.basis).toBe('labour-income');
    expect(j.conventions.closure.share).toBeCloseTo(140 / 130, 12);
    expect(j.settings.find((s: { key: string }) => s.key === 'spendingShare').value).toBeCloseTo(140 / 130, 12);
    expect(j.findings.map((f: { code: string }) => f.code)).toContain('household-share-high');
    expect(j.conventions.definitions.total).toMatch(/household row .* not counted/);
    const text = await run(['multipliers', file]);
    expect(text.stdout).toMatch(/warning: households would spend 1\.077/);
    expect(text.stdout).toMatch(/Closure basis: labour-income/);
  });
  it('the bases give the same Type II when they imply the same share', async () => {
    const a = JSON.parse((await run(['multipliers', file, '--household-income', '280', '--json'])).stdout);
    const b = JSON.parse((await run(['multipliers', file, '--propensity', '0.5', '--json'])).stdout);
    const c = JSON.parse((await run(['multipliers', file, '--household-basis', 'consumption-total', '--json'])).stdout);
    expect(a.conventions.closure.basis).toBe('household-income');
    expect(b.conventions.closure.basis).toBe('propensity');
    expect(c.conventions.closure.share).toBeCloseTo(1, 12);
    for (let j = 0; j < 2; j++) expect(a.measures[0].sectors[j].total).toBeCloseTo(b.measures[0].sectors[j].total, 12);
  });
  it('bad closure options are usage errors (exit 2)', async () => {
    for (const args of [
      ['--household-income', '-5'],
      ['--household-basis', 'wages'],
      ['--propensity', '0.5', '--household-income', '100'],
      ['--household-basis', 'household-income'],
      ['--no-household', '--household-income', '100'],
      ['--split', 'sectors'],
    ]) {
      const r = await run(['multipliers', file, ...args]);
      expect(r.code, args.join(' ')).toBe(2);
    }
  });
  it('a closure that is not productive fails the checks (exit 1) naming the sectors and what to do', async () => {
    const r = await run(['multipliers', file, '--household-income', '20', '--json']);
    expect(r.code).toBe(1);
    const j = JSON.parse(r.stdout || r.stderr);
    const text = JSON.stringify(j);
    expect(text).toMatch(/household-not-productive/);
    expect(text).toMatch(/'B'/);
    expect(text).toMatch(/--household-income above/);
  });
  it('without a closure the notes say why Type II is blank, in text and in the report', async () => {
    const r = await run(['multipliers', file, '--no-household']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/open model was chosen/);
    const out = join(dir, 'open.json');
    expect((await run(['multipliers', file, '--no-household', '--out', out])).code).toBe(0);
    const rep = JSON.parse(readFileSync(out, 'utf8'));
    expect(rep.assumptions.join(' ')).toMatch(/Type II, induced and total are blank/);
    expect(rep.failed).toBeUndefined();
  });
});

describe("a failed table's report says so first, in every format", () => {
  // Column A buys more than it makes: I − A is not productive, an error finding of the checks.
  const bad = tableFile('bad.json', { ...SMALL, Z: [[90, 30], [40, 10]], x: [80, 200] });
  it('JSON top level, HTML first page, XLSX Summary first rows, CSV first line', async () => {
    const base = join(dir, 'checks');
    const r = await run(['check', bad, '--out', `${base}.json`, '--out', `${base}.html`, '--out', `${base}.xlsx`, '--out', `${base}.csv`]);
    expect(r.code).toBe(1);
    const j = JSON.parse(readFileSync(`${base}.json`, 'utf8'));
    expect(Object.keys(j).slice(0, 3)).toEqual(['format', 'version', 'failed']);
    expect(j.failed.message).toMatch(/FAILED/);
    expect(j.failed.findings.length).toBeGreaterThan(0);
    const html = readFileSync(`${base}.html`, 'utf8');
    const body = html.slice(html.indexOf('<body>'));
    expect(body.indexOf('class="failed"')).toBeGreaterThan(0);
    expect(body.indexOf('class="failed"')).toBeLessThan(body.indexOf('<h1>'));
    expect(body).toContain(j.failed.findings[0].code);
    const csv = readFileSync(`${base}.csv`, 'utf8');
    expect(csv.split(/\r?\n/)[0]).toMatch(/^"?THE TABLE FAILED/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(`${base}.xlsx`);
    const ws = wb.worksheets[0]!;
    expect(ws.name).toBe('Summary');
    const firstRows = [1, 2, 3].map((i) => String(ws.getRow(i).getCell(1).value ?? '')).join(' | ');
    expect(firstRows).toMatch(/THE TABLE FAILED/);
  });
});
