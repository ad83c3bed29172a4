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
