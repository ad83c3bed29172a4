/**
 * One large-table case, timed: make a seeded synthetic multi-regional table, then output
 * multipliers (i′L) and one scenario's output (L d) through `LargeLeontief`. The same function
 * runs in Node (test/bench/large.bench.ts) and in a browser worker (large-web-worker.ts), so that
 * both measure the same path. No Node API.
 */
import { LargeLeontief } from '../../engine/large';
import type { LargeOptions, LargeSolution } from '../../engine/large';
import { kernelInfo } from '../../engine/linalg/kernel';
import { syntheticTable } from '../../engine/synthetic';

export interface LargeCaseRequest {
  type: 'large-case';
  regions: number;
  sectors: number;
  /** Share of nonzero cells (default 0.06). */
  density?: number;
  seed?: number;
  /** Range of the column sums of A (default [0.25, 0.65]); near 1 makes the series slow. */
  coefficientSum?: [number, number];
  options?: LargeOptions;
}

export interface SolveSummary {
  method: string;
  storage: string;
  iterations: number;
  residual: number;
  converged: boolean;
  reason: string;
  /** A few values, to compare runs. */
  first: number[];
}

export interface LargeCaseResult {
  type: 'large-case-result';
  n: number;
  density: number;
  makeMs: number;
  scanMs: number;
  multipliersMs: number;
  impactMs: number;
  /** Scan, multipliers and impact: the time from a table in memory to both answers. */
  totalMs: number;
  multipliers: SolveSummary;
  impact: SolveSummary;
  kernel: string;
}

function summary(s: LargeSolution): SolveSummary {
  return {
    method: s.method,
    storage: s.storage,
    iterations: s.iterations,
    residual: s.residual,
    converged: s.converged,
    reason: s.reason,
    first: Array.from(s.values.subarray(0, 5)),
  };
}

export function runLargeCase(req: LargeCaseRequest, now: () => number = () => performance.now()): LargeCaseResult {
  const g0 = now();
  const t = syntheticTable({
    regions: req.regions,
    sectors: req.sectors,
    density: req.density ?? 0.06,
    seed: req.seed ?? 1,
    ...(req.coefficientSum ? { coefficientSum: req.coefficientSum } : {}),
  });
  const g1 = now();
  const n = t.x.length;
  // One scenario: a demand change in 50 sectors of the first region.
  const d = new Float64Array(n);
  for (let i = 0; i < Math.min(50, n); i++) d[(i * 7) % n] = 10 + i;
  const s0 = now();
  const m = new LargeLeontief(t, req.options);
  const s1 = now();
  const mult = m.outputMultipliers();
  const s2 = now();
  const imp = m.impact(d);
  const s3 = now();
  return {
    type: 'large-case-result',
    n,
    density: m.density,
    makeMs: g1 - g0,
    scanMs: s1 - s0,
    multipliersMs: s2 - s1,
    impactMs: s3 - s2,
    totalMs: s3 - s0,
    multipliers: summary(mult),
    impact: summary(imp),
    kernel: kernelInfo().large,
  };
}
