/**
 * Temporary files left by a run that was killed while writing (SIGKILL leaves no time to remove
 * them): the next run that writes the same output removes those whose process has ended, with a
 * note, and leaves alone those of a living process, of other outputs, and names that do not
 * follow the pattern `.NAME.PID-RANDOM.tmp` exactly. The files of a killed run are made here by
 * hand, with the number of a process that has really ended (a child run to its end).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { TWO_SECTORS } from '../cli/fixtures';
import { run, tempDir } from '../cli/harness';

describe('temporary files of a killed run', () => {
  it('are removed with a note when their process has ended; others are kept', async () => {
    const dir = tempDir();
    const table = join(dir, 't.json');
    writeFileSync(table, JSON.stringify(TWO_SECTORS));
    const ended = spawnSync(process.execPath, ['-e', '0']).pid!;
    expect(ended).toBeGreaterThan(0);
    const dead = `.out.csv.${ended}-0badc0de.tmp`;
    const living = `.out.csv.1-cafebabe.tmp`; // process 1 is alive on every Unix system
    const other = `.other.csv.${ended}-0badc0de.tmp`;
    const unlike = `.out.csv.${ended}-notours.tmp`;
    for (const f of [dead, living, other, unlike]) writeFileSync(join(dir, f), 'half-written');
    const r = await run(['coefficients', table, '--out', join(dir, 'out.csv')]);
    expect(r.code).toBe(0);
    expect(readFileSync(join(dir, 'out.csv'), 'utf8')).toMatch(/^[^\n]*S1/);
    expect(existsSync(join(dir, dead))).toBe(false);
    expect(r.stderr).toContain(`note: removed ${dead}`);
    expect(r.stderr).toContain(`(process ${ended})`);
    for (const f of [living, other, unlike]) expect(existsSync(join(dir, f))).toBe(true);
    expect(r.stderr).not.toContain(living);
  });
});
