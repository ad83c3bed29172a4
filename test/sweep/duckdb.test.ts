/**
 * The Parquet writer is chosen by this test: DuckDB (@duckdb/node-api, an independent Parquet
 * reader; source: DuckDB 1.5) reads the combined file and the shard parts, and its sums by
 * scenario, closure, measure and effect match the totals of `ripplewise impact --json` for the
 * same table and scenarios (the units without draws) and the JSON summary of the merge (every unit).
 */
import { join } from 'node:path';
import { DuckDBInstance } from '@duckdb/node-api';
import { describe, expect, it } from 'vitest';
import { run } from '../cli/harness';
import { sweepFolder } from './setup';

describe('DuckDB reads the sweep Parquet', () => {
  it('and its sums match the JSON of the same units', async () => {
    const f = sweepFolder();
    for (const i of [1, 2]) expect((await run(['sweep', f.plan, '--out', join(f.dir, 'r'), '--shard', `${i}/2`])).code).toBe(0);
    const file = join(f.dir, 'all.parquet');
    const m = await run(['sweep', 'merge', join(f.dir, 'r'), '--out', file, '--report', join(f.dir, 'all.json'), '--json']);
    expect(m.code, m.stderr).toBe(0);
    const summary = JSON.parse(m.stdout).summary as { scenario: string; household: string; cv: number; measure: string; effect: string; mean: number; draws: number }[];
    const db = await DuckDBInstance.create(':memory:');
    const con = await db.connect();
    const q = async (sql: string) => (await con.runAndReadAll(sql)).getRowObjects();
    const lit = (s: string) => `'${s.replace(/'/g, "''")}'`;
    const count = await q(`SELECT count(*) AS n, count(DISTINCT work_unit) AS u FROM read_parquet(${lit(file)})`);
    expect(Number(count[0]!.n)).toBe(63 * 2 * 4 * 4);
    expect(Number(count[0]!.u)).toBe(63);
    const parts = await q(`SELECT count(*) AS n FROM read_parquet(${lit(join(f.dir, 'r', '*', '*.parquet'))})`);
    expect(Number(parts[0]!.n)).toBe(63 * 2 * 4 * 4);
    // Units without draws against `impact --json`.
    const sums = await q(`SELECT scenario, household, measure, effect, sum(value) AS v, min(unit) AS unit FROM read_parquet(${lit(file)}) WHERE cv = 0 GROUP BY ALL`);
    expect(sums.length).toBe(3 * 3 * 4 * 4);
    const flags: Record<string, string[]> = { off: ['--no-household'], table: ['--household-column', 'HH', '--labour-income-row', 'COE'], '0.5': ['--household-column', 'HH', '--labour-income-row', 'COE', '--propensity', '0.5'] };
    for (const [household, fl] of Object.entries(flags)) {
      const doc = JSON.parse((await run(['impact', f.table, '--scenario', f.scenarios, '--json', ...fl])).stdout);
      for (const sc of doc.scenarios) {
        for (const me of sc.measures) {
          for (const effect of ['direct', 'indirect', 'induced', 'total']) {
            const row = sums.find((r) => r.scenario === sc.name && r.household === household && r.measure === me.code && r.effect === effect)!;
            expect(row, `${sc.name} ${household} ${me.code} ${effect}`).toBeDefined();
            expect(row.v as number).toBeCloseTo(me.totals[effect], 9);
            expect(row.unit).toBe(me.unit);
          }
        }
      }
    }
    // Every unit, with draws: the mean of per-unit totals against the merge's JSON summary.
    const means = await q(
      `SELECT scenario, household, cv, measure, effect, avg(t) AS mean, count(*) AS draws FROM (SELECT work_unit, scenario, household, cv, measure, effect, sum(value) AS t FROM read_parquet(${lit(file)}) GROUP BY ALL) GROUP BY ALL`,
    );
    expect(means.length).toBe(summary.length);
    for (const r of means) {
      const s = summary.find((x) => x.scenario === r.scenario && x.household === r.household && x.cv === r.cv && x.measure === r.measure && x.effect === r.effect)!;
      expect(s).toBeDefined();
      expect(s.draws).toBe(Number(r.draws));
      expect(s.mean).toBeCloseTo(r.mean as number, 9);
    }
    con.closeSync();
    db.closeSync();
  });
});
