/**
 * `ripplewise sweep`: the plan file, shards, resume and merge.
 *
 * - The plan is validated like the project files: a bad field is named by its path.
 * - The expansion is a one-to-one numbering of every table × cv × draw × closure × scenario
 *   (fast-check over random grids).
 * - 1 shard and 4 shards (from --shard, from a Slurm array's environment, from a Kubernetes
 *   index) merge to the same Parquet bytes and the same report.
 * - A shard killed part-way (SIGKILL of the child process) resumes: run again it keeps the parts
 *   it had finished and the merge gives the same bytes as an uninterrupted run.
 * - The merge refuses a missing unit, a doubled unit and a unit made from a different table.
 * - The units without draws (cv 0) give the totals `ripplewise impact --json` gives for the same
 *   table and scenarios (with and without the closure; common practice: the impact command is
 *   checked against Miller and Blair, 2009, in test/cli).
 */
import { spawn } from 'node:child_process';
import { cpSync, existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readResults } from '../../src/sweep/parquet';
import { expand, readPlan } from '../../src/sweep/plan';
import { chooseShard, shardRange } from '../../src/sweep/shard';
import { BIN, run } from '../cli/harness';
import { SCENARIOS, sweepFolder } from './setup';

const UNITS = 63; // 1 table × (1 + 6 draws) × 3 closure settings × 3 scenarios

async function shards(plan: string, out: string, n: number): Promise<void> {
  for (let i = 1; i <= n; i++) {
    const r = await run(['sweep', plan, '--out', out, '--shard', `${i}/${n}`]);
    expect(r.code, r.stderr).toBe(0);
  }
}

async function merged(dir: string, out: string): Promise<{ parquet: Buffer; report: string }> {
  const r = await run(['sweep', 'merge', dir, '--out', join(out, 'all.parquet'), '--report', join(out, 'all.json')]);
  expect(r.code, r.stderr).toBe(0);
  return { parquet: readFileSync(join(out, 'all.parquet')), report: readFileSync(join(out, 'all.json'), 'utf8') };
}

describe('the plan file', () => {
  it('names the path of a bad field, refuses unknown fields and a newer version', () => {
    const base = { format: 'ripplewise-sweep', version: 1, tables: [{ file: 't.csv' }], scenarios: [{ file: 's.json' }] };
    expect(() => readPlan(JSON.stringify({ ...base, parameters: { cv: [0.1, -1] } }), 'p.json')).toThrow(/p\.json: parameters\.cv\[1\] should be a ratio from 0 to 2/);
    expect(() => readPlan(JSON.stringify({ ...base, parameters: { household: ['table', 'sometimes'] } }), 'p.json')).toThrow(/parameters\.household\[1\] should be 'off', 'table' or a share/);
    expect(() => readPlan(JSON.stringify({ ...base, parameters: { delta: [0.2] } }), 'p.json')).toThrow(/parameters\.delta should be given only when some table has "regional"/);
    expect(() => readPlan(JSON.stringify({ ...base, draw: 10 }), 'p.json')).toThrow(/p\.json: draw should be one of the known fields/);
    expect(() => readPlan(JSON.stringify({ ...base, version: 2 }), 'p.json')).toThrow(/newer than this program reads/);
    expect(() => readPlan(JSON.stringify({ ...base, tables: [] }), 'p.json')).toThrow(/tables should be a list of at least one table/);
    const p = readPlan(JSON.stringify(base), 'p.json');
    expect(p.household).toEqual(['table']);
    expect(p.cv).toEqual([0]);
  });

  it('expands into a one-to-one numbering of every combination (fast-check)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 3 }), fc.uniqueArray(fc.constantFrom(0, 0.05, 0.1, 0.2), { minLength: 1 }), fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 3 }), fc.integer({ min: 1, max: 4 }), (T, cv, draws, H, S) => {
        const plan = readPlan(
          JSON.stringify({
            format: 'ripplewise-sweep',
            version: 1,
            draws,
            tables: Array.from({ length: T }, (_, i) => ({ name: `t${i}`, file: `t${i}.csv` })),
            scenarios: [{ file: 's.json' }],
            parameters: { cv, household: ['off', 'table', 0.5].slice(0, H) },
          }),
          'p.json',
        );
        const e = expand(plan, Array.from({ length: S }, (_, i) => ({ set: 0, name: `s${i}` })));
        const perCv = cv.map((v) => (v === 0 ? 1 : draws));
        expect(e.count).toBe(T * perCv.reduce((a, b) => a + b, 0) * H * S);
        const seen = new Set<string>();
        for (let i = 0; i < e.count; i++) {
          const u = e.unit(i);
          expect(u.draw).toBeLessThan(perCv[u.cv]!);
          seen.add(`${u.table}/${u.cv}/${u.draw}/${u.household}/${u.scenario}`);
        }
        expect(seen.size).toBe(e.count);
      }),
      { numRuns: 60 },
    );
  });

  it('takes the shard from --shard, a Slurm array or a Kubernetes index, and the shards cover every unit once', () => {
    expect(chooseShard({ shard: '2/4' }, {})).toEqual({ index: 1, count: 4, source: 'option' });
    expect(chooseShard({}, { SLURM_ARRAY_TASK_ID: '3', SLURM_ARRAY_TASK_COUNT: '4', SLURM_ARRAY_TASK_MIN: '1' })).toEqual({ index: 2, count: 4, source: 'slurm' });
    expect(chooseShard({ shards: '4' }, { JOB_COMPLETION_INDEX: '3' })).toEqual({ index: 3, count: 4, source: 'kubernetes' });
    expect(chooseShard({}, {})).toEqual({ index: 0, count: 1, source: 'default' });
    expect(() => chooseShard({}, { JOB_COMPLETION_INDEX: '0' })).toThrow(/not the number of shards/);
    expect(() => chooseShard({ shard: '5/4' }, {})).toThrow(/I must be from 1 to N/);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 500 }), fc.integer({ min: 1, max: 40 }), (U, N) => {
        let next = 0;
        for (let i = 0; i < N; i++) {
          const r = shardRange(U, i, N);
          expect(r.start).toBe(next);
          next = r.end;
        }
        expect(next).toBe(U);
      }),
    );
  });
});

describe('shards and merge', () => {
  it('1 shard and 4 shards (option, Slurm, Kubernetes) merge to the same bytes', async () => {
    const f = sweepFolder();
    await shards(f.plan, join(f.dir, 'one'), 1);
    await shards(f.plan, join(f.dir, 'four'), 4);
    for (let i = 1; i <= 4; i++) {
      const r = await run(['sweep', f.plan, '--out', join(f.dir, 'slurm')], { env: { SLURM_ARRAY_TASK_ID: String(i), SLURM_ARRAY_TASK_COUNT: '4', SLURM_ARRAY_TASK_MIN: '1' } });
      expect(r.code, r.stderr).toBe(0);
      const k = await run(['sweep', f.plan, '--out', join(f.dir, 'k8s'), '--shards', '4'], { env: { JOB_COMPLETION_INDEX: String(i - 1) } });
      expect(k.code, k.stderr).toBe(0);
    }
    const a = await merged(join(f.dir, 'one'), join(f.dir, 'm1'));
    const b = await merged(join(f.dir, 'four'), join(f.dir, 'm4'));
    const c = await merged(join(f.dir, 'slurm'), join(f.dir, 'ms'));
    const d = await merged(join(f.dir, 'k8s'), join(f.dir, 'mk'));
    expect(b.parquet.equals(a.parquet)).toBe(true);
    expect(c.parquet.equals(a.parquet)).toBe(true);
    expect(d.parquet.equals(a.parquet)).toBe(true);
    // The reports differ only in the number of shards merged.
    const norm = (s: string) => s.replace(/"value": \d+,\n(\s+)"source": "given",\n\s+"note": "The results do not depend on it"/, '').replace(/merged from \d+ shards?/, '');
    expect(norm(b.report)).toBe(norm(a.report));
    // Every unit once, in order, with the rows of 2 sectors × 4 measures × 4 effects.
    const units: number[] = [];
    let rows = 0;
    for await (const g of readResults(join(f.dir, 'm1', 'all.parquet'))) {
      rows += g.length;
      for (const u of g.work_unit) if (units[units.length - 1] !== u) units.push(u);
    }
    expect(units).toEqual(Array.from({ length: UNITS }, (_, i) => i));
    expect(rows).toBe(UNITS * 2 * 4 * 4);
    const report = JSON.parse(a.report);
    expect(report.cautions.join(' ')).toMatch(/fixed coefficients/i);
  });

  it('runs past the limit on scenarios × sectors that a single impact run holds (a sweep streams its results)', async () => {
    const f = sweepFolder();
    const env = { RIPPLEWISE_LIMITS: 'maxScenarioCells=4' }; // 3 scenarios × 2 sectors = 6
    const im = await run(['impact', f.table, '--scenario', f.scenarios, '--no-household', '--json'], { env });
    expect(im.code).toBe(2);
    expect(im.stderr).toMatch(/over the limit of 4.*maxScenarioCells.*a sweep/s);
    const sw = await run(['sweep', f.plan, '--out', join(f.dir, 'r'), '--shard', '1/1'], { env });
    expect(sw.code, sw.stderr).toBe(0);
    const m = await run(['sweep', 'merge', join(f.dir, 'r'), '--out', join(f.dir, 'all.parquet')], { env });
    expect(m.code, m.stderr).toBe(0);
    let rows = 0;
    for await (const g of readResults(join(f.dir, 'all.parquet'))) rows += g.length;
    expect(rows).toBe(UNITS * 2 * 4 * 4);
  });

  it('gives the totals of `ripplewise impact --json` for the units without draws', async () => {
    const f = sweepFolder();
    await shards(f.plan, join(f.dir, 'r'), 2);
    const m = await run(['sweep', 'merge', join(f.dir, 'r'), '--out', join(f.dir, 'all.parquet'), '--report', join(f.dir, 'all.json'), '--json']);
    expect(m.code, m.stderr).toBe(0);
    const summary = JSON.parse(m.stdout).summary as { scenario: string; household: string; cv: number; measure: string; effect: string; mean: number; draws: number; p5: number; p95: number }[];
    for (const [household, flags] of [
      ['off', ['--no-household']],
      ['table', ['--household-column', 'HH', '--labour-income-row', 'COE']],
      ['0.5', ['--household-column', 'HH', '--labour-income-row', 'COE', '--propensity', '0.5']],
    ] as const) {
      const im = await run(['impact', f.table, '--scenario', f.scenarios, '--json', ...flags]);
      expect(im.code, im.stderr).toBe(0);
      const doc = JSON.parse(im.stdout);
      for (const sc of doc.scenarios) {
        for (const me of sc.measures) {
          for (const effect of ['direct', 'indirect', 'induced', 'total'] as const) {
            const row = summary.find((r) => r.scenario === sc.name && r.household === household && r.cv === 0 && r.measure === me.code && r.effect === effect)!;
            expect(row, `${sc.name} ${household} ${me.code} ${effect}`).toBeDefined();
            expect(row.draws).toBe(1);
            expect(row.mean).toBeCloseTo(me.totals[effect], 9);
          }
        }
      }
    }
    // With draws the spread brackets the median.
    const spread = summary.filter((r) => r.cv > 0);
    expect(spread.length).toBeGreaterThan(0);
    for (const r of spread) {
      expect(r.draws).toBeLessThanOrEqual(6);
      expect(r.p5).toBeLessThanOrEqual(r.p95);
    }
    expect(SCENARIOS.length).toBe(3);
  });

  it('resumes a shard that was killed: only unfinished units are redone, the merge is the same', async () => {
    const f = sweepFolder({ draws: 400, parameters: { household: ['table'], cv: [0.1] }, rowsPerGroup: 32 });
    const out = join(f.dir, 'killed');
    const manifest = join(out, 'shard-0001-of-0001', 'manifest.json');
    // Run in a child process and kill it (SIGKILL) once it has finished a part.
    await new Promise<void>((resolve, reject) => {
      const child = spawn(process.execPath, [BIN, 'sweep', f.plan, '--out', out], { stdio: 'ignore' });
      const timer = setInterval(() => {
        try {
          if (existsSync(manifest) && JSON.parse(readFileSync(manifest, 'utf8')).parts.length >= 1) child.kill('SIGKILL');
        } catch {
          /* manifest being replaced */
        }
      }, 5);
      child.on('exit', () => {
        clearInterval(timer);
        resolve();
      });
      child.on('error', reject);
    });
    const before = JSON.parse(readFileSync(manifest, 'utf8'));
    const incomplete = await run(['sweep', 'merge', out, '--out', join(f.dir, 'x.parquet')]);
    expect(before.complete).toBe(false);
    expect(incomplete.code).toBe(2);
    expect(incomplete.stderr).toMatch(/units are missing: unit \d+ .*has not finished it/);
    const again = await run(['sweep', f.plan, '--out', out, '--json']);
    expect(again.code, again.stderr).toBe(0);
    const j = JSON.parse(again.stdout);
    expect(j.kept).toBe(before.parts.reduce((a: number, p: { start: number; end: number }) => a + p.end - p.start, 0));
    expect(j.kept).toBeGreaterThan(0);
    expect(j.computed + j.kept).toBe(1200);
    await shards(f.plan, join(f.dir, 'clean'), 1);
    const a = await merged(out, join(f.dir, 'ma'));
    const b = await merged(join(f.dir, 'clean'), join(f.dir, 'mb'));
    expect(a.parquet.equals(b.parquet)).toBe(true);
  });

  it('refuses a missing unit, a doubled unit and a unit made from a different input', async () => {
    const f = sweepFolder();
    const out = join(f.dir, 'r');
    await shards(f.plan, out, 3);
    // Doubled: a copy of a shard folder.
    cpSync(join(out, 'shard-0002-of-0003'), join(out, 'copy-of-2'), { recursive: true });
    let r = await run(['sweep', 'merge', out, '--out', join(f.dir, 'a.parquet')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/units are in more than one shard: unit 21 \(table 'two', scenario '[^']+', household \w+, cv [\d.]+, draw \d+\) is in copy-of-2 and in shard-0002-of-0003/);
    rmSync(join(out, 'copy-of-2'), { recursive: true });
    // Missing: a shard folder gone.
    rmSync(join(out, 'shard-0003-of-0003'), { recursive: true });
    r = await run(['sweep', 'merge', out, '--out', join(f.dir, 'a.parquet')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/21 of 63 units are missing: unit 42 .*no shard in the folder holds it/);
    // Different input: shard 3 run on a changed table.
    writeFileSync(f.table, readFileSync(f.table, 'utf8').replace('150', '151'));
    await run(['sweep', f.plan, '--out', out, '--shard', '3/3']).then((x) => expect(x.code, x.stderr).toBe(0));
    r = await run(['sweep', 'merge', out, '--out', join(f.dir, 'a.parquet')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/shard shard-0003-of-0003 \(units 42 to 62\) was made from other inputs .*table:two two\.csv differs \(SHA-256\)/);
    // Resuming shard 1 with the changed table is refused too.
    r = await run(['sweep', f.plan, '--out', out, '--shard', '1/3']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/holds results made from other inputs \(table:two two\.csv\)/);
    expect(existsSync(join(f.dir, 'a.parquet'))).toBe(false);
  });
});
