/**
 * The blocked many-column solves of the LU on both kernels against ml-matrix, an independent
 * general-purpose library (source: ml-matrix 6.15.1, solve and transpose).
 */
import { afterEach, describe, expect, it } from 'vitest';
import { Matrix as MlMatrix, solve as mlSolve } from 'ml-matrix';
import { LU } from '../../../engine/linalg/lu';
import { setKernel } from '../../../engine/linalg/kernel';
import { toRows, transpose } from '../../../engine/linalg/matrix';
import { randomMatrix } from '../../helpers/random';

afterEach(() => setKernel('auto'));

describe('many right-hand sides', () => {
  for (const kernel of ['js', 'wasm'] as const) {
    it(`solves A X = B and A′ Y = C like ml-matrix with the ${kernel} kernel (source: ml-matrix solve)`, () => {
      setKernel(kernel);
      for (const [n, r] of [[40, 3], [130, 9], [257, 33]] as const) {
        const a = randomMatrix(n, n + r, 0);
        const b = { rows: n, cols: r, data: randomMatrix(Math.max(n, r), 7).data.slice(0, n * r) };
        const lu = new LU(a);
        const bm = new MlMatrix(toRows(b));
        const X = lu.solveMany(b);
        const Y = lu.solveTransposeMany(b);
        const refX = mlSolve(new MlMatrix(toRows(a)), bm).to1DArray();
        const refY = mlSolve(new MlMatrix(toRows(transpose(a))), bm).to1DArray();
        const scale = (v: number[]) => Math.max(...v.map(Math.abs));
        const sx = scale(refX);
        const sy = scale(refY);
        for (let k = 0; k < n * r; k++) {
          expect(Math.abs(X.data[k]! - refX[k]!) / sx).toBeLessThan(1e-10);
          expect(Math.abs(Y.data[k]! - refY[k]!) / sy).toBeLessThan(1e-10);
        }
        // One column at a time gives the same answer as the blocked path.
        const col = Float64Array.from({ length: n }, (_, i) => b.data[i * r]!);
        const y0 = lu.solveTranspose(col);
        for (let i = 0; i < n; i++) expect(Math.abs(Y.data[i * r]! - y0[i]!) / sy).toBeLessThan(1e-12);
      }
    });
  }
});
