/**
 * The compiled command (dist/cli, built by scripts/build-cli.mjs as the `prepare` step) gives
 * what the sources give, byte for byte, and the bin runs it only while it is current. Under CI the
 * build must be there and current (`npm ci` ran `prepare`); on a developer's machine with a stale
 * build the comparison is skipped with a message, as the bin then runs the sources anyway.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, spawnCli } from '../cli/harness';

function buildIsCurrent(): boolean {
  const manifest = join(ROOT, 'dist/cli/sources.json');
  const ok = existsSync(manifest) && Object.entries(JSON.parse(readFileSync(manifest, 'utf8')).files as Record<string, number>).every(([f, t]) => existsSync(join(ROOT, f)) && statSync(join(ROOT, f)).mtimeMs <= t);
  if (!ok) {
    if (process.env.CI === 'true') throw new Error('dist/cli is missing or older than the sources under CI: npm ci should have run the prepare step (node scripts/build-cli.mjs)');
    console.warn('skipping the compiled-command comparison: dist/cli is missing or older than the sources (npm run build:cli builds it)');
  }
  return ok;
}

describe('the compiled command', () => {
  it.runIf(buildIsCurrent())('gives the same result as the sources through tsx, and the same exit codes', async () => {
    const args = ['multipliers', 'data-demo/vellan-coast.csv', '--json'];
    const [compiled, sources] = await Promise.all([spawnCli(args), spawnCli(args, { env: { RIPPLEWISE_SOURCES: '1' } })]);
    expect(compiled.code).toBe(0);
    expect(compiled.stdout).toBe(sources.stdout);
    const [bad, badSources] = await Promise.all([spawnCli(['multipliers', 'no-such.csv']), spawnCli(['multipliers', 'no-such.csv'], { env: { RIPPLEWISE_SOURCES: '1' } })]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toBe(badSources.stderr);
    expect(readFileSync(join(ROOT, 'dist/cli/main.mjs'), 'utf8')).not.toMatch(/from ['"]tsx/);
  }, 60_000);

  it.runIf(buildIsCurrent())('starts without the readers, the report writers or the heavy libraries, with the help of the sources', async () => {
    // sources.json lists the source files in main.mjs and the chunks it imports statically (what
    // every start parses); each command's own module is a chunk loaded only when it runs.
    const { startup } = JSON.parse(readFileSync(join(ROOT, 'dist/cli/sources.json'), 'utf8')) as { startup: { inputs: string[] } };
    expect(startup.inputs).toContain('src/cli/register/multipliers.ts');
    const heavy = startup.inputs.filter((f) => /^src\/(io|report|project|sweep)\//.test(f) && !/^src\/io\/limits\.ts$|^src\/sweep\/templates\//.test(f));
    expect(heavy).toEqual([]);
    expect(startup.inputs.filter((f) => /^src\/cli\/commands\//.test(f))).toEqual([]);
    expect(startup.inputs.filter((f) => f.includes('node_modules/') && !f.includes('node_modules/commander/'))).toEqual([]);
    for (const args of [['--help'], ['multipliers', '--help'], ['sweep', 'template', '--help'], ['multipliers', '--no-such-option']]) {
      const [compiled, sources] = await Promise.all([spawnCli(args), spawnCli(args, { env: { RIPPLEWISE_SOURCES: '1' } })]);
      expect(compiled.code).toBe(sources.code);
      expect(compiled.stdout).toBe(sources.stdout);
      expect(compiled.stderr).toBe(sources.stderr);
    }
  }, 60_000);
});
