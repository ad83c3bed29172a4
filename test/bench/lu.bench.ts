/**
 * Dense LU and inverse: our kernels (WebAssembly SIMD, pure JS, and WebAssembly SIMD on two
 * threads) against ml-matrix 6.15.1 in the same run, and against LAPACK through python3 and
 * numpy (OpenBLAS, OPENBLAS_NUM_THREADS=1) where the machine has them.
 *
 * Timings are medians of several runs in milliseconds (ml-matrix once at n ≥ 1000: it is slow).
 * LAPACK's LU is timed as numpy.linalg.solve with one right-hand side (getrf + getrs), its
 * inverse as numpy.linalg.inv.
 */
import { spawnSync } from 'node:child_process';
import { loadavg } from 'node:os';
import { LuDecomposition, Matrix as MlMatrix, inverse as mlInverse } from 'ml-matrix';
import { LU } from '../../engine/linalg/lu';
import { jsKernel, wasmKernel } from '../../engine/linalg/kernel';
import type { DenseKernel } from '../../engine/linalg/kernel';
import { toRows } from '../../engine/linalg/matrix';
import { startNodeKernel } from '../../src/parallel/kernel-node';
import { randomMatrix } from '../helpers/random';
import { table, target, timeMedian } from './util';

const sizes = [250, 500, 1000, 2000];
const runs = (n: number) => (n <= 500 ? 7 : n <= 1000 ? 5 : 3);

function lapack(): Map<number, { solve: number; inv: number }> | null {
  const code = `
import json, time, numpy as np
out = {}
rng = np.random.default_rng(1)
for n in ${JSON.stringify(sizes)}:
    a = rng.random((n, n)) - 0.5
    b = rng.random(n)
    r = 3 if n >= 1000 else 7
    def med(f):
        f()
        t = []
        for _ in range(r):
            s = time.perf_counter(); f(); t.append(time.perf_counter() - s)
        t.sort()
        return t[len(t) // 2] * 1000
    out[n] = {"solve": med(lambda: np.linalg.solve(a, b)), "inv": med(lambda: np.linalg.inv(a))}
print(json.dumps(out))
`;
  const r = spawnSync('python3', ['-c', code], { encoding: 'utf8', env: { ...process.env, OPENBLAS_NUM_THREADS: '1' }, timeout: 300_000 });
  if (r.status !== 0 || !r.stdout) return null;
  try {
    const o = JSON.parse(r.stdout.trim().split('\n').pop()!) as Record<string, { solve: number; inv: number }>;
    return new Map(Object.entries(o).map(([k, v]) => [Number(k), v]));
  } catch {
    return null;
  }
}

const loadBefore = loadavg()[0]!;
const parallel = await startNodeKernel({ threads: 2 });
const wasm = wasmKernel();
const kernels: [string, DenseKernel][] = [['js', jsKernel]];
if (wasm) kernels.push(['wasm', wasm]);
kernels.push(['2 threads', parallel]);

const lu = new Map<string, number>();
const inv = new Map<string, number>();
const key = (k: string, n: number) => `${k}@${n}`;
for (const n of sizes) {
  const a = randomMatrix(n, n, 0);
  for (const [name, k] of kernels) {
    lu.set(key(name, n), timeMedian(() => new LU(a, { kernel: k }), runs(n)));
    const f = new LU(a, { kernel: k });
    if (name !== 'js' || n <= 1000) inv.set(key(name, n), timeMedian(() => f.inverse(), runs(n)));
  }
  const m = new MlMatrix(toRows(a));
  lu.set(key('ml', n), timeMedian(() => new LuDecomposition(m), n >= 2000 ? 1 : runs(n), n >= 2000 ? 0 : 1));
  inv.set(key('ml', n), timeMedian(() => mlInverse(m), n >= 1000 ? 1 : 3, n >= 1000 ? 0 : 1));
}
const la = lapack();

// Many right-hand sides: X = A⁻¹ B with B n × n/2, one thread against two.
const nm = 2000;
const am = randomMatrix(nm, 77, 0);
const bm = randomMatrix(nm, 78).data.subarray(0, nm * (nm / 2));
const many = new Map<string, number>();
for (const [name, k] of kernels.filter(([nn]) => nn !== 'js')) {
  const f = new LU(am, { kernel: k });
  many.set(name, timeMedian(() => f.solveMany({ rows: nm, cols: nm / 2, data: Float64Array.from(bm) }), 3));
}
// The kernel alone: C ← C − A B with C 2000 × 2000 and depth 256, one thread against two.
const gemm = new Map<string, number>();
{
  const M = 2000;
  const K = 256;
  for (const [name, k] of kernels) {
    const ws = k.workspace(M * K + K * M + M * M);
    for (let i = 0; i < ws.f64.length; i++) ws.f64[i] = ((i * 7919) % 1000) / 1000 - 0.5;
    const ms = timeMedian(() => ws.gemmSub(M, M, K, 0, K, M * K, M, 2 * M * K, M), name === 'js' ? 3 : 7);
    gemm.set(name, (2 * M * M * K) / ms / 1e6);
  }
}
parallel.close();
const loadAfter = loadavg()[0]!;

const best = wasm ? 'wasm' : 'js';
const fmt = (v: number | undefined) => (v === undefined ? 'not run' : v);
console.log('LU with partial pivoting (ms, median)');
table(
  ['n', 'ours wasm', 'ours js', 'ours 2 threads', 'ml-matrix', 'LAPACK', 'ml / ours', 'ours / LAPACK', '2-thread speed-up'],
  sizes.map((n) => {
    const ours = lu.get(key(best, n))!;
    const l = la?.get(n)?.solve;
    return [
      n,
      fmt(lu.get(key('wasm', n))),
      fmt(lu.get(key('js', n))),
      fmt(lu.get(key('2 threads', n))),
      fmt(lu.get(key('ml', n))),
      l === undefined ? 'absent' : l,
      lu.get(key('ml', n))! / ours,
      l === undefined ? 'absent' : ours / l,
      ours / lu.get(key('2 threads', n))!,
    ];
  }),
);
console.log('\nInverse (ms, median)');
table(
  ['n', 'ours wasm', 'ours js', 'ours 2 threads', 'ml-matrix', 'LAPACK', 'ml / ours', 'ours / LAPACK', '2-thread speed-up'],
  sizes.map((n) => {
    const ours = inv.get(key(best, n))!;
    const l = la?.get(n)?.inv;
    const ml = inv.get(key('ml', n));
    return [
      n,
      fmt(inv.get(key('wasm', n))),
      fmt(inv.get(key('js', n))),
      fmt(inv.get(key('2 threads', n))),
      fmt(ml),
      l === undefined ? 'absent' : l,
      ml === undefined ? 'not run' : ml / ours,
      l === undefined ? 'absent' : ours / l,
      ours / inv.get(key('2 threads', n))!,
    ];
  }),
);
console.log(`\nMany right-hand sides at n = ${nm}, ${nm / 2} columns (ms, median)`);
table(['kernel', 'solveMany'], [...many].map(([k, v]) => [k, v]));
console.log('\nThe kernel alone, C ← C − A B, 2000 × 2000, depth 256 (GFLOPS, median)');
table(['kernel', 'GFLOPS'], [...gemm].map(([k, v]) => [k, v]));
console.log(`LAPACK column: ${la ? 'numpy.linalg.solve / inv with OPENBLAS_NUM_THREADS=1' : 'absent (python3 with numpy not found)'}`);
console.log(`kernel for the ratios: ${best}; 2 threads in the parallel runs; load average ${loadBefore.toFixed(2)} before, ${loadAfter.toFixed(2)} after (on 2 cores: above about 1, other work competes for the second core)\n`);

const lu2000 = lu.get(key(best, 2000))!;
target('LU at n = 2000 at least 8× faster than ml-matrix', lu.get(key('ml', 2000))! / lu2000 >= 8, `${(lu.get(key('ml', 2000))! / lu2000).toFixed(1)}×`);
const l2000 = la?.get(2000)?.solve;
if (l2000 === undefined) console.log('target: LU at n = 2000 within 5× of LAPACK: not measured (LAPACK absent)');
else target('LU at n = 2000 within 5× of LAPACK single-thread', lu2000 / l2000 <= 5, `${(lu2000 / l2000).toFixed(2)}× LAPACK (${lu2000.toFixed(0)} ms against ${l2000.toFixed(0)} ms)`);
const inv1000 = inv.get(key(best, 1000))!;
target('inverse at n = 1000 at least 25× faster than ml-matrix', inv.get(key('ml', 1000))! / inv1000 >= 25, `${(inv.get(key('ml', 1000))! / inv1000).toFixed(1)}×`);
const sp = lu2000 / lu.get(key('2 threads', 2000))!;
console.log(`report: two-thread speed-up at n = 2000: LU ${sp.toFixed(2)}×, solveMany ${(many.get(best)! / many.get('2 threads')!).toFixed(2)}×, the kernel alone ${(gemm.get('2 threads')! / gemm.get(best)!).toFixed(2)}×`);
