/**
 * The parallel kernel (worker_threads over a shared WebAssembly memory) gives the same bits as
 * the single-thread kernels: every element of C is computed by one thread in the kernel's
 * order. The JS kernel is the independent reference (common practice: compare against the
 * serial computation).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LU } from '../../../engine/linalg/lu';
import { jsKernel, setKernel, wasmKernel } from '../../../engine/linalg/kernel';
import { LargeLeontief } from '../../../engine/large';
import { syntheticTable } from '../../../engine/synthetic';
import type { ParallelKernel } from '../../../src/parallel/kernel-protocol';
import { startNodeKernel } from '../../../src/parallel/kernel-node';
import { randomMatrix } from '../../helpers/random';

let kernel: ParallelKernel;
beforeAll(async () => {
  kernel = await startNodeKernel({ threads: 2 });
});
afterAll(() => kernel.close());

describe('the parallel kernel', () => {
  it('runs two threads and splits the large calls', () => {
    expect(kernel.threads).toBe(2);
    expect(kernel.name).toBe('wasm-simd ×2 threads');
  });

  it('gives the LU, solves and inverse of the single-thread kernels, bit for bit', () => {
    for (const n of [160, 333]) {
      const a = randomMatrix(n, n + 1, 0);
      const before = kernel.splitCalls;
      const lp = new LU(a, { kernel });
      expect(kernel.splitCalls).toBeGreaterThan(before);
      const lw = new LU(a, { kernel: wasmKernel()! });
      const lj = new LU(a, { kernel: jsKernel });
      expect(Array.from(lp.pivots)).toEqual(Array.from(lj.pivots));
      expect(lp.lu).toEqual(lw.lu);
      expect(lp.lu).toEqual(lj.lu);
      const B = randomMatrix(n, 5).data.subarray(0, n * 40);
      const xp = lp.solveMany({ rows: n, cols: 40, data: Float64Array.from(B) });
      const xj = lj.solveMany({ rows: n, cols: 40, data: Float64Array.from(B) });
      expect(xp.data).toEqual(xj.data);
      expect(lp.inverse().data).toEqual(lj.inverse().data);
    }
  });

  it('keeps results apart when the shared memory is reused', () => {
    const a = new LU(randomMatrix(200, 1, 0), { kernel });
    const b = new LU(randomMatrix(300, 2, 0), { kernel });
    expect(a.lu).toEqual(new LU(randomMatrix(200, 1, 0), { kernel: jsKernel }).lu);
    expect(b.lu).toEqual(new LU(randomMatrix(300, 2, 0), { kernel: jsKernel }).lu);
  });

  it('serves the direct large-table path when chosen for every LU', () => {
    const t = syntheticTable({ regions: 3, sectors: 60, seed: 5 });
    setKernel('js');
    const ref = new LargeLeontief(t, { method: 'direct' });
    const refMult = ref.outputMultipliers().values;
    const refImpact = ref.impact(t.x).values;
    setKernel(kernel);
    try {
      const m = new LargeLeontief(t, { method: 'direct' });
      const s = m.outputMultipliers();
      // Another LU in between reuses the shared memory; the first factor must not change.
      new LU(randomMatrix(180, 3, 0));
      expect(s.method).toBe('direct');
      expect(s.values).toEqual(refMult);
      expect(m.impact(t.x).values).toEqual(refImpact);
    } finally {
      setKernel('auto');
    }
  });
});
