/**
 * `convert --print-mapping` always prints the detected mapping, with a reason for every row and
 * column, even when reading the table then fails (the error and the role to change come with it,
 * and the exit code still says the read failed). Also the agency files of ../shared/reference
 * (the Scottish workbook, the ABS worked example): a why for every line.
 */
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REFERENCE_DIR } from '../helpers/reference';
import { run, tempDir } from './harness';

describe('convert --print-mapping', () => {
  it('prints the mapping and the role to change when the read fails', async () => {
    const dir = tempDir();
    const file = join(dir, 'dup.csv');
    // Invented: sector A written twice.
    writeFileSync(file, 'code,label,A,B,Z\nA,a,1,2,3\nB,b,2,1,1\nA,again,1,1,1\n');
    const r = await run(['convert', file, '--print-mapping']);
    expect(r.code).not.toBe(0);
    const m = JSON.parse(r.stdout);
    expect(m.format).toBe('ripplewise-layout');
    expect(m.rows.length).toBe(3);
    expect(m.error.code).toBe('duplicate-code');
    expect(m.error.change).toMatch(/'A'/);
    expect(r.stderr).toMatch(/appears twice/);
  });

  it('shows a mapping\'s rename in the printed mapping and in each renamed line\'s why; an unknown code names the file and the code', async () => {
    const dir = tempDir();
    const file = join(dir, 'prefix.csv');
    // Invented: rows DOM_xx, columns Dxx; the mapping equates them by renaming.
    writeFileSync(file, 'code,label,D01,D02,D03,HH,OUT\nDOM_01,Farms,10,5,2,33,50\nDOM_02,Mills,4,20,6,70,100\nDOM_03,Shops,3,9,12,36,60\nCoE,Compensation of employees,20,40,25\nGOS,Operating surplus,13,26,15\nOUT,Total output,50,100,60\n');
    const rename = { DOM_01: 'A', D01: 'A', DOM_02: 'B', D02: 'B', DOM_03: 'C', D03: 'C' };
    const good = join(dir, 'rename.json');
    writeFileSync(good, JSON.stringify({ affixCodes: false, rename }));
    const r = await run(['convert', file, '--mapping', good, '--print-mapping']);
    expect(r.code, r.stderr).toBe(0);
    const m = JSON.parse(r.stdout);
    expect(m.rename).toEqual(rename);
    expect(m.rows.filter((x: { role: string }) => x.role === 'sector').map((x: { code: string }) => x.code)).toEqual(['A', 'B', 'C']);
    expect(m.rows[0].why).toMatch(/code 'DOM_01' renamed 'A' by the mapping/);
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ rename: { DOM_09: 'I' } }));
    const e = await run(['convert', file, '--mapping', bad, '--print-mapping']);
    expect(e.code).not.toBe(0);
    expect(JSON.parse(e.stdout).error.code).toBe('mapping-unknown-code');
    expect(e.stderr).toMatch(/prefix\.csv: the mapping renames 'DOM_09', but no row or column has that code/);
  });

  for (const [folder, name] of [
    ['scotland-2016-io', 'IO2016.xlsx'],
    ['abs-5246-worked-example', 'flows-1989-90.csv'],
  ] as const) {
    const path = join(REFERENCE_DIR, folder, name);
    it.skipIf(!existsSync(path) && process.env.CI !== 'true')(`gives a reason for every row and column of ${name}`, async () => {
      const r = await run(['convert', path, '--print-mapping']);
      expect(r.code).toBe(0);
      const m = JSON.parse(r.stdout);
      for (const line of [...m.rows, ...m.columns]) expect(line.why, `${line.code}`).toBeTruthy();
    }, 60_000);
  }
});
