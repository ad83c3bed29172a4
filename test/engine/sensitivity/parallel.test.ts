/**
 * Monte Carlo across worker_threads equals the single-thread run for the same seed, bit for
 * bit, whatever the number of workers and the task size (each draw depends only on the seed and
 * its index). Checked on the U.S. 1997 summary economy when present (source: U.S. Bureau of
 * Economic Analysis, Benchmark Input-Output Accounts of the United States, 1997, Table 8), else
 * on generated coefficients.
 */
import { describe, expect, it } from 'vitest';
import { CancelledError, InputError } from '../../../engine/errors';
import type { MonteCarloSpec } from '../../../engine/uncertainty';
import { monteCarlo } from '../../../engine/uncertainty';
import { monteCarloInWorkers } from '../../../src/parallel/montecarlo-node';
import { taskRanges } from '../../../src/parallel/montecarlo-protocol';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { BEA_DIR } from '../../helpers/reference';
import { randomCoefficients } from '../../helpers/random';
import { beaEconomy } from './bea';

function spec(): MonteCarloSpec {
  const bea = existsSync(join(BEA_DIR, 'make.txt'));
  const A = bea ? beaEconomy().A : randomCoefficients(60, 3, 0.9);
  const n = A.rows;
  const d = new Float64Array(n);
  d[2] = 500;
  d[n - 1] = 80;
  return {
    A,
    cv: 0.2,
    draws: 120,
    seed: 77,
    measures: [
      { code: 'output', c: new Float64Array(n).fill(1) },
      { code: 'jobs', c: Float64Array.from({ length: n }, (_, i) => 1 + (i % 5) / 10) },
    ],
    scenarios: [{ code: 'new plant', d }],
  };
}

describe('Monte Carlo on worker threads', () => {
  const s = spec();
  const single = monteCarlo(s);

  it('1 worker and 2 workers give exactly the single-thread result', async () => {
    for (const [workers, chunk] of [
      [1, undefined],
      [2, 7],
    ] as const) {
      let last = 0;
      const r = await monteCarloInWorkers(s, { workers, chunk, onProgress: (done, total) => ((last = done), expect(total).toBe(120)) });
      expect(last).toBe(120);
      expect(r.samples.draws).toEqual(single.samples.draws);
      expect(r.samples.data).toEqual(single.samples.data);
      expect(r.multipliers).toEqual(single.multipliers);
      expect(r.scenarios).toEqual(single.scenarios);
      expect(r.rejected).toEqual(single.rejected);
      expect(r.findings).toEqual(single.findings);
    }
  });

  it('cancels with CancelledError and reports bad input as InputError before starting', async () => {
    const controller = new AbortController();
    const run = monteCarloInWorkers({ ...s, draws: 2000 }, {
      workers: 2,
      chunk: 5,
      signal: controller.signal,
      onProgress: (done) => {
        if (done >= 10) controller.abort();
      },
    });
    await expect(run).rejects.toBeInstanceOf(CancelledError);
    await expect(monteCarloInWorkers({ ...s, cv: -1 }, { workers: 2 })).rejects.toBeInstanceOf(InputError);
    await expect(monteCarloInWorkers({ ...s, draws: 0 }, { workers: 2 })).rejects.toThrow(/at least 1 draw/);
    await expect(monteCarloInWorkers(s, { workers: 0 })).rejects.toThrow(/number of workers/);
  });

  it('cuts the draws into ranges that cover each draw once', () => {
    for (const [N, w, c] of [
      [1, 4, undefined],
      [120, 2, 7],
      [1001, 3, undefined],
    ] as const) {
      const t = taskRanges(N, w, c);
      expect(t[0]![0]).toBe(0);
      expect(t[t.length - 1]![1]).toBe(N);
      for (let k = 1; k < t.length; k++) expect(t[k]![0]).toBe(t[k - 1]![1]);
    }
  });
});
