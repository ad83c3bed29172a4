/**
 * Balancing: GRAS on a 5,000 × 5,000 table with 10 % negative cells to a relative deviation of
 * 1e-8 (target ≤ 10 s on this machine), our RAS on the same table's absolute values, and a
 * straightforward numpy RAS (alternate row and column scaling with matrix-vector products, then
 * the balanced matrix formed; OPENBLAS_NUM_THREADS=1) on a table of the same kind, where python3 and numpy are present.
 *
 * The targets are the row and column sums of a copy scaled by random positive factors between
 * 0.5 and 2 (feasible by construction); a fifth of the cells are zero. Each method stops when every row and column sum is within 1e-8 of its target.
 */
import { spawnSync } from 'node:child_process';
import { loadavg } from 'node:os';
import { gras, ras } from '../../engine/regional/index';
import { rng } from '../helpers/random';
import { peakRssMB, table, target } from './util';

const N = Number(process.env.RIPPLEWISE_BALANCE_N ?? 5000);
const TOL = 1e-8;
/** A fifth of the cells are zero; the new totals come from factors between e^−0.7 ≈ 0.5 and e^0.7 ≈ 2. */
const ZEROS = 0.2;
const SPREAD = 0.7;

function problem(n: number, seed: number, negShare: number) {
  const r = rng(seed);
  const data = new Float64Array(n * n);
  for (let k = 0; k < n * n; k++) {
    const z = r();
    data[k] = z < ZEROS ? 0 : (z < ZEROS + negShare ? -1 : 1) * (0.01 + r());
  }
  const rho = new Float64Array(n);
  const sig = new Float64Array(n);
  for (let i = 0; i < n; i++) rho[i] = Math.exp(SPREAD * (2 * r() - 1));
  for (let j = 0; j < n; j++) sig[j] = Math.exp(SPREAD * (2 * r() - 1));
  const u = new Float64Array(n);
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const a = data[i * n + j]!;
      const x = a > 0 ? rho[i]! * a * sig[j]! : a / (rho[i]! * sig[j]!);
      u[i] = u[i]! + x;
      v[j] = v[j]! + x;
    }
  }
  return { A: { rows: n, cols: n, data }, u, v };
}

function numpyRas(n: number): { ms: number; iterations: number; deviation: number } | null {
  const code = `
import json, time, numpy as np
n = ${n}
rng = np.random.default_rng(7)
a = 0.01 + rng.random((n, n))
a[rng.random((n, n)) < ${ZEROS}] = 0.0
rho = np.exp(${SPREAD} * (2 * rng.random(n) - 1)); sig = np.exp(${SPREAD} * (2 * rng.random(n) - 1))
x = a * rho[:, None] * sig[None, :]
u = x.sum(axis=1); v = x.sum(axis=0)
del x
t0 = time.perf_counter()
r = np.ones(n); s = np.ones(n); it = 0
while True:
    r = u / (a @ s)
    cs = (a.T @ r) * s
    dev = np.max(np.abs(cs - v) / np.abs(v))
    it += 1
    if dev <= ${TOL} or it >= 10000: break
    s = v / (a.T @ r)
x = a * r[:, None] * s[None, :]
ms = (time.perf_counter() - t0) * 1000
print(json.dumps({"ms": ms, "iterations": it, "deviation": float(dev)}))
`;
  const r = spawnSync('python3', ['-c', code], { encoding: 'utf8', env: { ...process.env, OPENBLAS_NUM_THREADS: '1' }, timeout: 600_000 });
  if (r.status !== 0 || !r.stdout) return null;
  try {
    return JSON.parse(r.stdout.trim().split('\n').pop()!) as { ms: number; iterations: number; deviation: number };
  } catch {
    return null;
  }
}

const loadBefore = loadavg()[0]!;
console.log(`n = ${N}, tolerance ${TOL}, load average ${loadBefore.toFixed(2)} before`);
const g = problem(N, 11, 0.1);
let t0 = performance.now();
const rg = gras(g.A, g.u, g.v, { tolerance: TOL });
const gMs = performance.now() - t0;

const p = problem(N, 12, 0);
t0 = performance.now();
const rr = ras(p.A, p.u, p.v, { tolerance: TOL });
const rMs = performance.now() - t0;

const np = numpyRas(N);
const rows: (string | number)[][] = [
  ['GRAS (ours), 10% negative', gMs, rg.iterations, rg.maxDeviation.toExponential(2), rg.converged ? 'yes' : 'no'],
  ['RAS (ours), non-negative', rMs, rr.iterations, rr.maxDeviation.toExponential(2), rr.converged ? 'yes' : 'no'],
];
if (np) rows.push(['RAS (numpy, 1 thread)', np.ms, np.iterations, np.deviation.toExponential(2), np.deviation <= TOL ? 'yes' : 'no']);
table(['method', 'ms', 'iterations', 'max deviation', 'converged'], rows);
console.log(`per iteration: GRAS ${(gMs / Math.max(rg.iterations, 1)).toFixed(0)} ms, RAS ${(rMs / Math.max(rr.iterations, 1)).toFixed(0)} ms${np ? `, numpy RAS ${(np.ms / Math.max(np.iterations, 1)).toFixed(0)} ms` : ''}`);
if (np) console.log(`ratio: GRAS (ours) / numpy RAS = ${(gMs / np.ms).toFixed(2)}; RAS (ours) / numpy RAS = ${(rMs / np.ms).toFixed(2)}`);
else console.log('numpy: not present (python3 or numpy missing); no ratio');
console.log(`peak memory ${peakRssMB().toFixed(0)} MB; load average ${loadavg()[0]!.toFixed(2)} after`);
target(`GRAS ${N} × ${N}, 10% negative, to ${TOL} within 10 s`, rg.converged && gMs <= 10_000, `${(gMs / 1000).toFixed(2)} s, ${rg.iterations} iterations`);
