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
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildModels } from '../../engine/household';
import { impact } from '../../engine/impact';
import { jobsMeasure, labourIncomeMeasure, outputMeasure } from '../../engine/measures';
import { multipliers } from '../../engine/multipliers';
import type { InputClass, PlainTable } from '../../engine/table';
import { makeTable, toPlain } from '../../engine/table';
import { run, tempDir } from '../cli/harness';
import { REFERENCE_DIR } from '../helpers/reference';

const DIR = join(REFERENCE_DIR, 'abs-5246-worked-example');
const WHERE = 'published by the Australian Bureau of Statistics (abs.gov.au, cat. no. 5246.0, 1995); set RIPPLEWISE_REFERENCE to a folder holding abs-5246-worked-example/';
function available(): boolean {
  const ok = existsSync(join(DIR, 'flows-1989-90.csv'));
  if (!ok) {
    if (process.env.CI === 'true') throw new Error(`reference data missing under CI: ${DIR} (${WHERE})`);
    console.warn(`skipping the ABS worked-example tests: ${DIR} not found; the data is ${WHERE}`);
  }
  return ok;
}
const have = available();

/** A plain CSV reader for these hand-transcribed files (quoted fields without embedded quotes). */
function csv(file: string): string[][] {
  return readFileSync(join(DIR, file), 'utf8')
    .split(/\r?\n/)
    .filter((l) => l.trim())
    .map((l) => (l.match(/("[^"]*"|[^,]*)(,|$)/g) ?? []).map((f) => f.replace(/,$/, '').replace(/^"|"$/g, '')));
}

const CLASSES: Record<string, InputClass> = { WSS: 'compensation', GOS: 'operating-surplus', CTX: 'product-taxes', ITX: 'production-taxes', SFB: 'final-buyers', CMI: 'imports', DCM: 'imports', CPI: 'imports', DCP: 'imports' };

function load() {
  const rows = csv('flows-1989-90.csv');
  const head = rows[0]!;
  const n = 7;
  const sectors = rows.slice(1, 1 + n);
  const va = rows.filter((r) => r[0]! in CLASSES);
  const out = rows.find((r) => r[0] === 'OUT')!;
  const fd = ['FCE', 'GFCE', 'STK', 'EXP'].map((c) => head.indexOf(c));
  const emp = new Map(csv('employment-1989-90.csv').slice(1).map((r) => [r[0]!, Number(r[1])]));
  const plain: PlainTable = {
    sectors: { codes: sectors.map((r) => r[0]!), labels: sectors.map((r) => r[1]!) },
    Z: sectors.map((r) => r.slice(2, 2 + n).map(Number)),
    finalDemand: { codes: ['FCE', 'GFCE', 'STK', 'EXP'], values: sectors.map((r) => fd.map((k) => Number(r[k]))) },
    valueAdded: { codes: va.map((r) => r[0]!), labels: va.map((r) => r[1]!), classes: va.map((r) => CLASSES[r[0]!]!), values: va.map((r) => r.slice(2, 2 + n).map(Number)) },
    x: out.slice(2, 2 + n).map(Number),
    satellites: [{ code: 'EMP', label: 'Employed persons', unit: 'persons (FTE)', values: sectors.map((r) => emp.get(r[0]!)!) }],
    meta: { title: 'Australia 1989-90 (ABS 5246.0 worked example)', currency: 'AUD', scale: 1e6, scaleLabel: 'millions', year: 1990 },
  };
  const published = csv('published-multipliers.csv')
    .slice(1)
    .map((r) => ({ code: r[0]!, first: Number(r[2]), support: Number(r[3]), simple: Number(r[4]), incomeInitial: Number(r[5]), incomeSimple: Number(r[6]), empInitial: Number(r[7]), empSimple: Number(r[8]) }));
  return { table: makeTable(plain), published };
}

// Half a unit in the 4th decimal, with a little room for the transcription's own rounding (README: within 8e-5).
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
