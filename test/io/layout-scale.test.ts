/**
 * Layout recognition stays near-linear in the cells, whatever the number of adjacent
 * final-demand columns or value-added rows (a run of them used to cost the cube of its length:
 * a 3 × 20,000-column CSV ran for minutes). The sizes here are CI-friendly (FUZZ_SCALE=10 makes
 * them ten times larger); the speed itself is measured in test/bench/layout.bench.ts, never here.
 *
 * Checks: the tables come back exactly as generated (invented tables, whole numbers, balanced by
 * construction); the subtotal search agrees with the plain search that tries every run (the rule
 * as first written, kept here as the reference) on random runs; and the number of values it reads
 * grows linearly with the run (counted, not timed).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readTableFile } from '../../src/io';
import { runSubtotals } from '../../src/io/rules/run-subtotals';
import { roundingBound } from '../../engine/rounding';
import { longOneRowFirst, SECTORS, wideFinalDemand, wideValueAdded } from '../helpers/layout-scale';

const SCALE = Number(process.env.FUZZ_SCALE ?? 1);
const N = 2000 * SCALE;
const bytes = (s: string) => new TextEncoder().encode(s);

describe('layout recognition at scale', () => {
  it(`reads ${N} final-demand columns and their subtotal column`, async () => {
    const g = wideFinalDemand(N);
    const r = await readTableFile(bytes(g.text), { file: 'wide-fd.csv' });
    expect(r.table.finalDemand.codes.length).toBe(N);
    expect(r.table.finalDemand.codes[N - 1]).toBe(`F${N}`);
    expect(Array.from(r.table.x)).toEqual(g.x);
    for (let i = 0; i < 3; i++) expect(r.table.F.data[i * N + N - 1]).toBe(g.fd[i]![N - 1]);
    const fsum = r.mapping.columns.find((c) => c.code === 'FSUM')!;
    expect(fsum.role).toBe('total');
    expect(r.findings.filter((f) => f.severity !== 'note').map((f) => f.code)).toEqual([]);
  }, 120_000);

  it(`reads ${N} value-added rows and their subtotal row`, async () => {
    const g = wideValueAdded(N);
    const r = await readTableFile(bytes(g.text), { file: 'wide-va.csv' });
    expect(r.table.valueAdded.codes.length).toBe(N);
    expect(Array.from(r.table.x)).toEqual(g.x);
    expect(r.mapping.rows.find((c) => c.code === 'VSUM')!.role).toBe('total');
    expect(r.findings.filter((f) => f.severity !== 'note').map((f) => f.code)).toEqual([]);
  }, 120_000);

  it(`reads a long file whose first ${N} lines are one sector's row`, async () => {
    const r = await readTableFile(bytes(longOneRowFirst(N)), { file: 'long.csv' });
    expect(r.shape).toBe('long');
    expect(r.table.sectors.codes).toEqual(SECTORS);
    expect(r.table.finalDemand.codes.length).toBe(N);
  }, 120_000);
});

/** The rule as first written: every run before, then every run after, nearest first; each checked at every position. */
function plainSubtotals(lines: number[][], unit: number): { line: number; lo: number; hi: number }[] {
  const K = lines[0]?.length ?? 0;
  const tol = (found: number, sum: number, parts: number) => Math.min(roundingBound(unit, parts), 0.02 * Math.abs(sum)) + 1e-9 * Math.max(Math.abs(found), Math.abs(sum), 1);
  const out: { line: number; lo: number; hi: number }[] = [];
  const cut = new Set<number>();
  for (let t = 0; t < lines.length; t++) {
    const runs: number[][] = [];
    for (const dir of [-1, 1]) {
      const run: number[] = [];
      for (let u = t + dir; u >= 0 && u < lines.length && !cut.has(u); u += dir) {
        run.push(u);
        if (run.length >= 2) runs.push([...run]);
      }
    }
    for (const parts of runs) {
      let ok = true;
      let nonzero = 0;
      for (let k = 0; k < K && ok; k++) {
        const sum = parts.reduce((a, p) => a + lines[p]![k]!, 0);
        const found = lines[t]![k]!;
        if (Math.abs(found - sum) > tol(found, sum, parts.length)) ok = false;
        if (found !== 0) nonzero++;
      }
      if (ok && nonzero * 2 > K) {
        out.push({ line: t, lo: Math.min(...parts), hi: Math.max(...parts) });
        cut.add(t);
        break;
      }
    }
  }
  return out;
}

function fast(lines: number[][], unit: number): { line: number; lo: number; hi: number }[] {
  const K = lines[0]?.length ?? 0;
  return runSubtotals({
    count: lines.length,
    positions: K,
    at: (l, k) => lines[l]![k]!,
    unit,
    tol: (found, sum, parts) => Math.min(roundingBound(unit, parts), 0.02 * Math.abs(sum)) + 1e-9 * Math.max(Math.abs(found), Math.abs(sum), 1),
    judged: () => true,
  });
}

describe('subtotal search', () => {
  it('finds exactly the subtotals the plain search finds (random runs with planted subtotals)', () => {
    const lineArb = (k: number) => fc.array(fc.integer({ min: -3, max: 9 }), { minLength: k, maxLength: k });
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 4 }).chain((k) =>
          fc.record({
            lines: fc.array(lineArb(k), { minLength: 1, maxLength: 14 }),
            plants: fc.array(fc.record({ at: fc.nat(), len: fc.integer({ min: 2, max: 5 }), after: fc.boolean() }), { maxLength: 3 }),
            unit: fc.constantFrom(0, 1),
          }),
        ),
        ({ lines, plants, unit }) => {
          // Insert subtotal lines: the sum of `len` lines before (or after) a position.
          const rows = lines.map((l) => [...l]);
          for (const p of plants) {
            const at = p.at % (rows.length + 1);
            const from = p.after ? at : Math.max(0, at - p.len);
            const to = p.after ? Math.min(rows.length, at + p.len) : at;
            if (to - from < 2) continue;
            const sum = rows[0]!.map((_, k) => rows.slice(from, to).reduce((a, r) => a + r[k]!, 0));
            rows.splice(at, 0, sum);
          }
          expect(fast(rows, unit)).toEqual(plainSubtotals(rows, unit));
        },
      ),
      { numRuns: 300 * SCALE },
    );
  });

  it('reads a number of values that grows linearly with the run (counted)', () => {
    const reads = (m: number) => {
      let count = 0;
      const lines = Array.from({ length: m }, (_, l) => [((l * 7) % 11) + 1000, ((l * 3) % 13) + 2000, ((l * 5) % 17) + 1500]);
      lines.push([0, 1, 2].map((k) => lines.reduce((a, r) => a + r[k]!, 0)));
      const found = runSubtotals({ count: lines.length, positions: 3, at: (l, k) => (count++, lines[l]![k]!), unit: 1, tol: (f, s, p) => Math.min(roundingBound(1, p), 0.02 * Math.abs(s)) + 1e-9 * Math.max(Math.abs(f), Math.abs(s), 1), judged: () => true });
      expect(found.at(-1)).toEqual({ line: m, lo: 0, hi: m - 1 });
      return count;
    };
    const a = reads(1000);
    const b = reads(4000);
    // Linear: four times the lines, about four times the reads (a quadratic search would read sixteen times as many).
    expect(b / a).toBeLessThan(6);
  });
});
