/**
 * Sweeps over the FLQ δ: a table with `regional` in the plan is regionalised first, once per δ of
 * `parameters.delta`, and its units run on the regional table. Each δ's units give the totals that
 * `ripplewise regionalise --method flq --delta δ` followed by `ripplewise impact --json` give on
 * the same files (common practice: the two commands are checked against Flegg and Webber's formula
 * by hand and against Miller and Blair, 2009, in test/cli/regional.test.ts and test/cli), and 1
 * shard and 3 shards merge to the same bytes. The regional employment below is invented for the
 * layout of this test only; the table is the two-sector example of test/sweep/setup.ts.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readResults } from '../../src/sweep/parquet';
import { readPlan, tableVariants } from '../../src/sweep/plan';
import { readFileSync } from 'node:fs';
import { run } from '../cli/harness';
import { sweepFolder } from './setup';

const DELTAS = [0.1, 0.3, 0.5];

function regionalFolder() {
  const f = sweepFolder({
    tables: [{ name: 'two', file: 'two.csv', regional: { file: 'region.csv', method: 'flq', region: 'Coast' } }],
    parameters: { household: ['off'], cv: [0], delta: DELTAS },
  });
  const regional = join(f.dir, 'region.csv');
  writeFileSync(regional, 'code,Region (jobs),Nation (jobs)\nS1,12,100\nS2,5,80\n');
  return { ...f, regional };
}

describe('sweeps over the FLQ δ', () => {
  it('validates the regional entry and the δ grid, naming the field', () => {
    const base = { format: 'ripplewise-sweep', version: 1, scenarios: [{ file: 's.json' }] };
    const t = (regional: unknown) => JSON.stringify({ ...base, tables: [{ file: 't.csv', regional }], parameters: { delta: [0.2] } });
    expect(() => readPlan(JSON.stringify({ ...base, tables: [{ file: 't.csv' }], parameters: { delta: [0.2] } }), 'p.json')).toThrow(/parameters\.delta should be given only when some table has "regional" with the method flq or aflq/);
    expect(() => readPlan(t({ file: 'r.csv', method: 'lq' }), 'p.json')).toThrow(/tables\[0\]\.regional\.method should be slq, cilq, flq, aflq, sdp/);
    expect(() => readPlan(t({ file: 'r.csv', method: 'flq', delta: 0.3 }), 'p.json')).toThrow(/tables\[0\]\.regional\.delta should be left out when parameters\.delta gives the grid/);
    expect(() => readPlan(JSON.stringify({ ...base, tables: [{ file: 't.csv', regional: { file: 'r.csv', method: 'flq' } }], parameters: { delta: [0.2, 1.5] } }), 'p.json')).toThrow(/parameters\.delta\[1\] should be a δ from 0 to 1/);
    const p = readPlan(JSON.stringify({ ...base, tables: [{ name: 'a', file: 'a.csv', regional: { file: 'r.csv', method: 'flq' } }, { name: 'b', file: 'b.csv', regional: { file: 'r.csv', method: 'slq' } }, { name: 'c', file: 'c.csv' }], parameters: { delta: [0.1, 0.2] } }), 'p.json');
    expect(tableVariants(p)).toEqual([
      { table: 0, name: 'a δ=0.1', delta: 0.1 },
      { table: 0, name: 'a δ=0.2', delta: 0.2 },
      { table: 1, name: 'b' },
      { table: 2, name: 'c' },
    ]);
  });

  it('gives, for each δ, the totals of regionalise then impact, and the same bytes for 1 and 3 shards', async () => {
    const f = regionalFolder();
    for (const [out, n] of [['one', 1], ['three', 3]] as const) {
      for (let i = 1; i <= n; i++) {
        const r = await run(['sweep', f.plan, '--out', join(f.dir, out), '--shard', `${i}/${n}`]);
        expect(r.code, r.stderr).toBe(0);
      }
      const m = await run(['sweep', 'merge', join(f.dir, out), '--out', join(f.dir, `${out}.parquet`)]);
      expect(m.code, m.stderr).toBe(0);
    }
    expect(readFileSync(join(f.dir, 'three.parquet')).equals(readFileSync(join(f.dir, 'one.parquet')))).toBe(true);
    // Totals by δ, scenario, measure and effect from the merged file.
    const got = new Map<string, number>();
    const tables = new Set<string>();
    for await (const g of readResults(join(f.dir, 'one.parquet'))) {
      for (let r = 0; r < g.length; r++) {
        tables.add(g.text.table[r]!);
        const k = [g.delta[r], g.text.scenario[r], g.text.measure[r], g.text.effect[r]].join('|');
        got.set(k, (got.get(k) ?? 0) + g.value[r]!);
      }
    }
    expect([...tables].sort()).toEqual(DELTAS.map((d) => `two δ=${d}`));
    for (const d of DELTAS) {
      const regionalTable = join(f.dir, `coast-${d}.csv`);
      const rg = await run(['regionalise', f.table, '--regional', f.regional, '--method', 'flq', '--delta', String(d), '--region', 'Coast', '--out', regionalTable]);
      expect(rg.code, rg.stderr).toBe(0);
      const im = await run(['impact', regionalTable, '--scenario', f.scenarios, '--no-household', '--json']);
      expect(im.code, im.stderr).toBe(0);
      const doc = JSON.parse(im.stdout);
      let compared = 0;
      for (const sc of doc.scenarios) {
        for (const me of sc.measures) {
          for (const effect of ['direct', 'indirect', 'total'] as const) {
            const v = got.get([d, sc.name, me.code, effect].join('|'));
            expect(v, `δ ${d} ${sc.name} ${me.code} ${effect}`).toBeDefined();
            expect(v!).toBeCloseTo(me.totals[effect], 9);
            compared++;
          }
        }
      }
      expect(compared).toBeGreaterThan(0);
    }
    // A larger δ shrinks the regional coefficients (λ^(δ) falls as δ rises), so the indirect output effect does not grow.
    const indirect = DELTAS.map((d) => got.get([d, 'Farm exports', 'output', 'indirect'].join('|'))!);
    expect(indirect[1]!).toBeLessThanOrEqual(indirect[0]!);
    expect(indirect[2]!).toBeLessThanOrEqual(indirect[1]!);
  });
});
