/**
 * `ripplewise uncertainty`: Monte Carlo on the coefficients from the command line.
 *
 * - For a one-sector economy the output multiplier is 1 ÷ (1 − a); with a multiplied by
 *   exp(σZ − σ²/2), σ² = ln(1 + cv²), its mean and standard deviation are integrals over the
 *   standard normal, computed here by the trapezoid rule (an independent path; the log-normal
 *   model is the one the engine documents). The command's mean and spread agree within sampling
 *   error.
 * - The same seed gives the same result on one worker thread and on two, digit for digit.
 * - The table values are the open model's multipliers and impacts that `multipliers` and
 *   `impact` print for the same table (the two-sector worked example of Miller and Blair, 2009,
 *   ch. 2, from memory; see fixtures.ts).
 * - The HTML report shows the numbers of the JSON; bad options are usage errors (exit 2).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { beforeAll, describe, expect, it } from 'vitest';
import { makeTable } from '../../engine/table';
import { writeTableJson } from '../../src/io/index';
import type { Fixtures } from './fixtures';
import { writeFixtures } from './fixtures';
import { run } from './harness';

let fx: Fixtures;
let one: string;

beforeAll(async () => {
  fx = await writeFixtures();
  one = join(fx.dir, 'one.json');
  writeFileSync(
    one,
    writeTableJson(
      makeTable({
        sectors: { codes: ['S'], labels: ['Everything'] },
        Z: [[30]],
        finalDemand: { codes: ['F'], labels: ['Final demand'], values: [[70]] },
        valueAdded: { codes: ['V'], labels: ['Value added'], values: [[70]] },
        x: [100],
      }),
    ),
  );
});

interface Out {
  accepted: number;
  draws: number;
  workers: number;
  measures: { code: string; unit: string; sectors: { code: string; point: number; mean: number; sd: number; p5: number; p50: number; p95: number }[] }[];
  scenarios: { name: string; measures: { code: string; total: { point: number; p5: number; p50: number; p95: number } }[] }[];
  cautions: string[];
}

const json = async (args: string[]): Promise<Out> => {
  const r = await run(['uncertainty', ...args, '--json']);
  expect(r.code, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as Out;
};

/** E[g(Z)] for Z standard normal, by the trapezoid rule on [−10, 10]. */
function normalMean(g: (z: number) => number): number {
  const steps = 20000;
  const h = 20 / steps;
  let s = 0;
  for (let k = 0; k <= steps; k++) {
    const z = -10 + k * h;
    const w = k === 0 || k === steps ? 0.5 : 1;
    s += w * g(z) * Math.exp(-z * z / 2);
  }
  return (s * h) / Math.sqrt(2 * Math.PI);
}

describe('ripplewise uncertainty', () => {
  it('agrees with the log-normal model of a one-sector economy within sampling error', async () => {
    const a = 0.3;
    const cv = 0.2;
    const N = 20000;
    const sigma = Math.sqrt(Math.log(1 + cv * cv));
    const mult = (z: number) => 1 / (1 - a * Math.exp(sigma * z - (sigma * sigma) / 2));
    const mean = normalMean(mult);
    const sd = Math.sqrt(normalMean((z) => mult(z) ** 2) - mean * mean);
    const out = await json([one, '--cv', String(cv), '--draws', String(N), '--seed', '11', '--workers', '1']);
    expect(out.accepted).toBe(N);
    const s = out.measures.find((m) => m.code === 'output')!.sectors[0]!;
    expect(s.point).toBeCloseTo(1 / (1 - a), 12);
    expect(Math.abs(s.mean - mean)).toBeLessThan((4 * sd) / Math.sqrt(N));
    expect(Math.abs(s.sd - sd) / sd).toBeLessThan(0.05);
    expect(s.p5).toBeLessThan(s.p50);
    expect(s.p50).toBeLessThan(s.p95);
  });

  it('gives the same numbers on one worker thread and on two, and its table values are those of multipliers and impact', async () => {
    const args = [fx.json, '--scenario', fx.scenario, '--draws', '400', '--cv', '0.15', '--seed', '5'];
    const a = await json([...args, '--workers', '1']);
    const b = await json([...args, '--workers', '2']);
    expect(b.workers).toBe(2);
    expect(b.measures).toEqual(a.measures);
    expect(b.scenarios).toEqual(a.scenarios);
    const m = await run(['multipliers', fx.json, '--no-household', '--json']);
    const mult = JSON.parse(m.stdout) as { measures: { code: string; sectors: { code: string; simple: number }[] }[] };
    for (const measure of a.measures) {
      const ref = mult.measures.find((x) => x.code === measure.code)!;
      measure.sectors.forEach((s, j) => {
        expect(Math.abs(s.point - ref.sectors[j]!.simple)).toBeLessThan(1e-12 * Math.max(1, Math.abs(s.point)));
        expect(s.p5).toBeLessThanOrEqual(s.p50);
        expect(s.p50).toBeLessThanOrEqual(s.p95);
      });
    }
    const im = await run(['impact', fx.json, '--scenario', fx.scenario, '--no-household', '--json']);
    const imp = JSON.parse(im.stdout) as { scenarios: { name: string; measures: { code: string; totals: { total: number } }[] }[] };
    expect(a.scenarios.map((s) => s.name)).toEqual(imp.scenarios.map((s) => s.name));
    a.scenarios.forEach((s, k) => {
      for (const x of s.measures) {
        const ref = imp.scenarios[k]!.measures.find((y) => y.code === x.code)!.totals.total;
        expect(Math.abs(x.total.point - ref)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref)));
      }
    });
    expect(a.cautions.join(' ')).toMatch(/qualified economist/);
  });

  it('writes a report whose numbers are those of the JSON', async () => {
    const html = join(fx.dir, 'spread.html');
    const xlsx = join(fx.dir, 'spread.xlsx');
    const r = await run(['uncertainty', fx.json, '--draws', '200', '--workers', '1', '--out', html, '--out', xlsx]);
    expect(r.code, r.stderr).toBe(0);
    const out = await json([fx.json, '--draws', '200', '--workers', '1']);
    const page = readFileSync(html, 'utf8');
    expect(page).toMatch(/Uncertainty: Monte Carlo on the technical coefficients/);
    expect(page).toMatch(/5th to 95th percentile of 200 draws/);
    const p50 = out.measures.find((m) => m.code === 'output')!.sectors[0]!.p50;
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(xlsx);
    const sheet = wb.getWorksheet('Uncertainty')!;
    const found: number[] = [];
    sheet.eachRow((row) => row.eachCell((c) => typeof c.value === 'number' && found.push(c.value)));
    expect(found).toContain(p50);
  });

  it('refuses bad options with exit code 2 and a message naming the option', async () => {
    for (const [args, msg] of [
      [['--cv', '0'], /--cv must be above 0/],
      [['--cv', 'x'], /--cv must be a number/],
      [['--draws', '0'], /--draws must be a whole number from 1/],
      [['--workers', '0'], /--workers must be a whole number from 1/],
      [['--productivity', 'maybe'], /--productivity must be column-sums or perron/],
      [['--name', 'X'], /--name chooses scenarios of --scenario FILE/],
    ] as [string[], RegExp][]) {
      const r = await run(['uncertainty', fx.json, ...args]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(msg);
    }
  });
});
