/**
 * What-if and Monte Carlo speed.
 *
 * - Target: at n = 400, updating all output multipliers after one coefficient change (WhatIf:
 *   two solves with the kept factors, then O(n)) takes at most 5 ms median. The ratio to a full
 *   refactor (a new LeontiefModel of the changed coefficients, then its multipliers) is printed.
 * - For information: Monte Carlo draws per second at n = 100 and 400, in this thread and on 1
 *   and 2 worker threads (worker start-up included).
 */
import { LeontiefModel } from '../../engine/leontief';
import { monteCarlo } from '../../engine/uncertainty';
import { WhatIf } from '../../engine/whatif';
import { monteCarloInWorkers } from '../../src/parallel/montecarlo-node';
import { randomCoefficients, rng } from '../helpers/random';
import { table, target, timeMedian } from './util';
import { availableParallelism, loadavg } from 'node:os';

const rows: (string | number)[][] = [];

// --- what-if at n = 400 ---
{
  const n = 400;
  const A = randomCoefficients(n, 400, 0.8);
  const base = new LeontiefModel(A);
  const w = new WhatIf(base);
  const r = rng(1);
  let check = 0;
  // Each timed run starts from the unedited model (the reset, an n² copy, is not timed).
  const times: number[] = [];
  for (let run = 0; run < 61; run++) {
    w.reset();
    const i = Math.floor(r() * n);
    const j = Math.floor(r() * n);
    const t0 = performance.now();
    w.setCoefficient(i, j, A.data[i * n + j]! * 1.3 + 0.001);
    check += w.outputMultipliers()[j]!;
    const t1 = performance.now();
    if (run >= 5) times.push(t1 - t0);
  }
  times.sort((a, b) => a - b);
  const tUpdate = times[Math.floor(times.length / 2)]!;
  const refactor = () => {
    const i = Math.floor(r() * n);
    const j = Math.floor(r() * n);
    const d = A.data.slice();
    d[i * n + j] = d[i * n + j]! * 1.3 + 0.001;
    check += new LeontiefModel({ rows: n, cols: n, data: d }).outputMultipliers()[j]!;
  };
  const tFull = timeMedian(refactor, 7, 1);
  // Agreement of the fast path with the refactor on one change (not timed).
  w.reset().setCoefficient(5, 9, A.data[5 * n + 9]! * 1.3 + 0.001);
  const fast = w.outputMultipliers();
  const slow = w.model().outputMultipliers();
  let err = 0;
  for (let k = 0; k < n; k++) err = Math.max(err, Math.abs(fast[k]! - slow[k]!) / Math.abs(slow[k]!));
  rows.push(['what-if: one coefficient → output multipliers', n, tUpdate, '']);
  rows.push(['full refactor → output multipliers', n, tFull, '']);
  table(['task', 'n', 'median ms', 'draws/s'], rows);
  console.log(`ratio full refactor / what-if: ${(tFull / tUpdate).toFixed(1)}×; max relative difference ${err.toExponential(2)} (checksum ${check.toFixed(3)})`);
  target('what-if update of all output multipliers at n = 400 ≤ 5 ms median', tUpdate <= 5, `${tUpdate.toFixed(3)} ms; full refactor ${tFull.toFixed(1)} ms`);
}

// --- Monte Carlo throughput (information) ---
// Worker runs include starting the threads (each registers tsx and loads the engine); the
// steady rate is taken from a run of 3N draws less a run of N draws.
{
  const mc: (string | number)[][] = [];
  for (const [n, draws] of [
    [100, 300],
    [400, 30],
  ] as const) {
    const A = randomCoefficients(n, 7 + n, 0.8);
    const spec = (N: number) => ({ A, cv: 0.1, draws: N, seed: 3, scenarios: [{ code: 's', d: new Float64Array(n).fill(1) }] });
    let t = performance.now();
    monteCarlo(spec(draws));
    let ms = performance.now() - t;
    mc.push(['Monte Carlo, this thread', n, draws, ms, (1000 * draws) / ms, '']);
    for (const workers of [1, 2]) {
      t = performance.now();
      await monteCarloInWorkers(spec(draws), { workers });
      const t1 = performance.now() - t;
      t = performance.now();
      await monteCarloInWorkers(spec(3 * draws), { workers });
      const t3 = performance.now() - t;
      mc.push([`Monte Carlo, ${workers} worker${workers > 1 ? 's' : ''}`, n, draws, t1, (1000 * draws) / t1, (1000 * 2 * draws) / (t3 - t1)]);
    }
  }
  console.log('');
  table(['task', 'n', 'draws', 'total ms', 'draws/s', 'steady draws/s'], mc);
  console.log(`(${availableParallelism()} cores; load average ${loadavg()[0]!.toFixed(2)} at the end: other work on the machine slows the worker runs)`);
}
