/**
 * The rounds of the indirect effect against a published worked example (source: Australian
 * Bureau of Statistics, Information Paper: Australian National Accounts: Introduction to
 * Input-Output Multipliers, cat. no. 5246.0 (1995), Tables 1, 3 and 5; the figures as
 * transcribed in ../shared/reference/abs-5246-worked-example/). Its Table 5 prints, per
 * industry, the first-round effect (column sum of A), the industrial-support effect (simple − 1
 * − first round), the simple output multiplier, the initial and simple income multipliers
 * (income = wages, salaries and supplements) and the employment ones, to 4 decimals (whole
 * persons per $1 million for employment). The printed Type II columns are not tested: the
 * paper itself says its B* matrix, and so those columns, are wrong (README of the folder).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildModels } from '../../engine/household';
import { impact } from '../../engine/impact';
import { jobsMeasure, labourIncomeMeasure, outputMeasure } from '../../engine/measures';
import { multipliers } from '../../engine/multipliers';
import { toPlain } from '../../engine/table';
import { run, tempDir } from '../cli/harness';
import { absAvailable, loadAbs } from '../helpers/abs-worked-example';

const have = absAvailable();
const load = loadAbs;

const PRINTED = 8e-5;

describe.skipIf(!have)('first round and industrial support (ABS 5246.0 worked example, Table 5)', () => {
  it('first round, industrial support, simple output and income, and employment, per industry', () => {
    const { table, published } = load();
    const models = buildModels(table);
    const [out, inc, emp] = multipliers(models, [outputMeasure(table), labourIncomeMeasure(table, 'WSS'), jobsMeasure(table, 'EMP')], { rounds: true });
    expect(published.map((p) => p.code)).toEqual(table.sectors.codes);
    if (process.env.RIPPLEWISE_SHOW) {
      const w = (f: (p: (typeof published)[number], j: number) => number) => Math.max(...published.map(f)).toExponential(2);
      console.log(`largest gaps: first round ${w((p, j) => Math.abs(out!.firstRound![j]! - p.first))}, industrial support ${w((p, j) => Math.abs(out!.laterRounds![j]! - p.support))}, simple ${w((p, j) => Math.abs(out!.simple[j]! - p.simple))}, income simple ${w((p, j) => Math.abs(inc!.simple[j]! - p.incomeSimple))}`);
    }
    published.forEach((p, j) => {
      expect(Math.abs(out!.firstRound![j]! - p.first), `first round ${p.code}`).toBeLessThan(PRINTED);
      expect(Math.abs(out!.laterRounds![j]! - p.support), `industrial support ${p.code}`).toBeLessThan(PRINTED);
      expect(Math.abs(out!.simple[j]! - p.simple), `simple ${p.code}`).toBeLessThan(PRINTED);
      expect(Math.abs(inc!.direct[j]! - p.incomeInitial), `income initial ${p.code}`).toBeLessThan(PRINTED);
      expect(Math.abs(inc!.simple[j]! - p.incomeSimple), `income simple ${p.code}`).toBeLessThan(PRINTED);
      expect(Math.round(emp!.direct[j]!), `employment initial ${p.code}`).toBe(p.empInitial);
      expect(Math.round(emp!.simple[j]!), `employment simple ${p.code}`).toBe(p.empSimple);
      // The split adds up: direct + first round + later rounds = simple.
      expect(inc!.direct[j]! + inc!.firstRound![j]! + inc!.laterRounds![j]!).toBeCloseTo(inc!.simple[j]!, 12);
    });
  });

  it('a scenario of one unit of demand for each industry has the same first round and industrial support', () => {
    const { table, published } = load();
    const models = buildModels(table);
    published.forEach((p) => {
      const im = impact(models, { name: p.code, changes: [{ sector: p.code, amount: 1 }] }, [outputMeasure(table)], { rounds: true });
      expect(Math.abs(im.measures[0]!.totals.firstRound! - p.first)).toBeLessThan(PRINTED);
      expect(Math.abs(im.measures[0]!.totals.laterRounds! - p.support)).toBeLessThan(PRINTED);
    });
  });

  it('the command line shows the split with --split rounds (JSON) and states it', async () => {
    const { table, published } = load();
    const dir = tempDir();
    const file = join(dir, 'abs.json');
    writeFileSync(file, JSON.stringify({ format: 'ripplewise-table', version: 1, table: toPlain(table) }));
    const r = await run(['multipliers', file, '--no-household', '--split', 'rounds', '--measure', 'output', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    const rows = j.measures[0].sectors as { firstRound: number; laterRounds: number }[];
    published.forEach((p, k) => {
      expect(Math.abs(rows[k]!.firstRound - p.first)).toBeLessThan(PRINTED);
      expect(Math.abs(rows[k]!.laterRounds - p.support)).toBeLessThan(PRINTED);
    });
    expect(j.conventions.closure.state).toBe('off');
    expect(j.conventions.closure.whyNoTypeII).toMatch(/open model/);
    const text = await run(['multipliers', file, '--no-household', '--split', 'rounds', '--measure', 'output']);
    expect(text.stdout).toMatch(/first round/);
    expect(text.stdout).toMatch(/industrial support/);
    expect(text.stdout).toMatch(/Type II, induced and total are blank/);
  });
});
