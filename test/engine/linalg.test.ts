/**
 * The dense kernels against ml-matrix, a general-purpose open-source linear-algebra library
 * (source: ml-matrix 6.15.1, LuDecomposition, inverse, determinant), and against the LAPACK
 * conventions for singular matrices (source: LAPACK dgetrf documentation, INFO = i when
 * U(i,i) is exactly zero).
 */
import { describe, expect, it } from 'vitest';
import { LuDecomposition, Matrix as MlMatrix, inverse as mlInverse } from 'ml-matrix';
import { LU } from '../../engine/linalg/lu';
import { conditionEstimate, inverseNorm1Estimate } from '../../engine/linalg/condition';
import { fromRows, identity, matMul, maxAbsDiff, norm1, toRows, transpose, zeros } from '../../engine/linalg/matrix';
import { relativeResidual } from '../../engine/linalg/residual';
import { perronRoot } from '../../engine/linalg/perron';
import { stronglyConnected } from '../../engine/linalg/graph';
import { gemmSub } from '../../engine/linalg/gemm';
import { InputError, SingularMatrixError } from '../../engine/errors';
import { randomMatrix, rng } from '../helpers/random';

const ml = (m: { rows: number; cols: number; data: Float64Array }) => new MlMatrix(toRows(m));

describe('LU with partial pivoting', () => {
  for (const n of [1, 2, 3, 17, 64, 65, 130, 200]) {
    it(`solves like ml-matrix at n = ${n} (source: ml-matrix LuDecomposition)`, () => {
      const a = randomMatrix(n, 100 + n, 0);
      const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
      const x = new LU(a).solve(b);
      const ref = new LuDecomposition(ml(a)).solve(MlMatrix.columnVector(Array.from(b))).getColumn(0);
      let scale = 0;
      for (const v of ref) scale = Math.max(scale, Math.abs(v));
      for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - ref[i]!) / scale).toBeLessThan(1e-9);
      expect(relativeResidual(a, x, b)).toBeLessThan(1e-14);
    });
  }

  it('gives the inverse that ml-matrix gives (source: ml-matrix inverse)', () => {
    for (const n of [1, 5, 63, 64, 129]) {
      const a = randomMatrix(n, 7 * n, 2);
      const inv = new LU(a).inverse();
      const ref = mlInverse(ml(a));
      expect(maxAbsDiff(inv, { rows: n, cols: n, data: Float64Array.from(ref.to1DArray()) })).toBeLessThan(1e-10);
      expect(maxAbsDiff(matMul(a, inv), identity(n))).toBeLessThan(1e-12);
    }
  });

  it('solves many right-hand sides and transposed systems', () => {
    const n = 150;
    const a = randomMatrix(n, 3, 1);
    const lu = new LU(a);
    const B = randomMatrix(n, 4).data.subarray(0, n * 7);
    const X = lu.solveMany({ rows: n, cols: 7, data: Float64Array.from(B) });
    const AX = matMul(a, X);
    for (let k = 0; k < n * 7; k++) expect(Math.abs(AX.data[k]! - B[k]!)).toBeLessThan(1e-11);
    const c = Float64Array.from({ length: n }, (_, i) => i % 3);
    const y = lu.solveTranspose(c);
    expect(relativeResidual(transpose(a), y, c)).toBeLessThan(1e-14);
    const Y = lu.solveTransposeMany({ rows: n, cols: 1, data: c });
    for (let i = 0; i < n; i++) expect(Y.data[i]).toBeCloseTo(y[i]!, 12);
  });

  it('does not depend on the block size', () => {
    const a = randomMatrix(97, 11);
    const b = Float64Array.from({ length: 97 }, (_, i) => i);
    const x1 = new LU(a, { blockSize: 1 }).solve(b);
    const x2 = new LU(a, { blockSize: 8 }).solve(b);
    const x3 = new LU(a, { blockSize: 200 }).solve(b);
    const scale = Math.max(...Array.from(x1, Math.abs));
    for (let i = 0; i < 97; i++) {
      expect(Math.abs(x2[i]! - x1[i]!) / scale).toBeLessThan(1e-12);
      expect(Math.abs(x3[i]! - x1[i]!) / scale).toBeLessThan(1e-12);
    }
  });

  it('reports the determinant sign and log-magnitude like ml-matrix (source: ml-matrix determinant)', () => {
    for (const n of [2, 3, 6, 9]) {
      const a = randomMatrix(n, 50 + n);
      const d = new LU(a).determinant();
      const ref = new LuDecomposition(ml(a)).determinant;
      expect(d.sign).toBe(Math.sign(ref));
      expect(d.logAbs).toBeCloseTo(Math.log(Math.abs(ref)), 10);
    }
    expect(new LU(fromRows([[0, 1], [1, 0]])).determinant()).toEqual({ sign: -1, logAbs: 0 });
  });

  it('reports a singular matrix by the column of its first zero pivot, as LAPACK getrf does', () => {
    // Second row twice the first: elimination leaves U(2,2) = 0, so INFO = 2.
    const lu = new LU(fromRows([[1, 2], [2, 4]]));
    expect(lu.isSingular).toBe(true);
    expect(lu.singularColumn).toBe(2);
    expect(() => lu.solve([1, 1])).toThrow(SingularMatrixError);
    // A zero first column: INFO = 1, and the factorisation still completes.
    const z = new LU(fromRows([[0, 1, 2], [0, 3, 4], [0, 5, 7]]));
    expect(z.singularColumn).toBe(1);
    expect(new LU(zeros(3, 3)).singularColumn).toBe(1);
    expect(new LU(zeros(0, 0)).singularColumn).toBe(0);
    expect(new LU(fromRows([[1, 2], [2, 4]])).determinant().sign).toBe(0);
  });

  it('refuses a non-square matrix and a wrong-sized right-hand side', () => {
    expect(() => new LU(zeros(2, 3))).toThrow(InputError);
    expect(() => new LU(identity(3)).solve([1, 2])).toThrow(/2 values; the matrix has 3 rows/);
    expect(() => fromRows([[1, 2], [3]])).toThrow(/row 2 has 1 values where row 1 has 2/);
  });
});

describe('the 1-norm condition estimate (Hager/Higham)', () => {
  it('is a lower bound within a factor of 3 of the exact κ₁ computed with ml-matrix (source: Higham 1988, ACM TOMS 14)', () => {
    for (const seed of [1, 2, 3, 4, 5, 6]) {
      const n = 40;
      const a = randomMatrix(n, seed, seed % 2 ? 0 : 0.5);
      const lu = new LU(a);
      const exactInv = norm1({ rows: n, cols: n, data: Float64Array.from(mlInverse(ml(a)).to1DArray()) });
      const est = inverseNorm1Estimate(lu);
      expect(est).toBeLessThanOrEqual(exactInv * (1 + 1e-10));
      expect(est).toBeGreaterThanOrEqual(exactInv / 3);
      expect(conditionEstimate(lu)).toBeCloseTo(norm1(a) * est, 6);
    }
  });

  it('is exact for a diagonal matrix and infinite for a singular one', () => {
    expect(conditionEstimate(new LU(fromRows([[1, 0], [0, 1e-3]])))).toBeCloseTo(1000, 9);
    expect(conditionEstimate(new LU(fromRows([[1, 1], [1, 1]])))).toBe(Infinity);
  });
});

describe('Perron root bounds and strongly connected components', () => {
  it('brackets the spectral radius found by ml-matrix eigenvalues (source: ml-matrix EigenvalueDecomposition)', async () => {
    const { EigenvalueDecomposition } = await import('ml-matrix');
    const r = rng(9);
    for (let t = 0; t < 10; t++) {
      const n = 3 + t;
      const a = zeros(n, n);
      for (let k = 0; k < n * n; k++) a.data[k] = r() < 0.6 ? r() : 0;
      const e = new EigenvalueDecomposition(ml(a));
      let rho = 0;
      for (let i = 0; i < n; i++) rho = Math.max(rho, Math.hypot(e.realEigenvalues[i]!, e.imaginaryEigenvalues[i]!));
      const p = perronRoot(a, { tolerance: 1e-12 });
      expect(p.lower).toBeLessThanOrEqual(rho + 1e-9);
      expect(p.upper).toBeGreaterThanOrEqual(rho - 1e-9);
    }
  });

  it('converges on an irreducible matrix (common practice: ρ of [[0.5,0.4],[0.2,0.3]] is 0.7)', () => {
    const p = perronRoot(fromRows([[0.5, 0.4], [0.2, 0.3]]), { tolerance: 1e-13 });
    expect(p.estimate).toBeCloseTo(0.7, 10);
  });

  it('closes in on the root of a reducible matrix block by block (common practice: ρ(A) is the largest root of its irreducible diagonal blocks)', () => {
    // Block {0, 1} has root 0.7; sector 2 has a zero row (nobody buys from it); sector 3 a self-loop of 0.2.
    const a = fromRows([
      [0.5, 0.4, 0.1, 0.0],
      [0.2, 0.3, 0.1, 0.1],
      [0.0, 0.0, 0.0, 0.0],
      [0.0, 0.0, 0.3, 0.2],
    ]);
    const p = perronRoot(a, { tolerance: 1e-12 });
    expect(p.lower).toBeCloseTo(0.7, 10);
    expect(p.upper).toBeCloseTo(0.7, 10);
  });

  it('finds the strongly connected components', () => {
    // 0 ⇄ 1, 1 → 2, 2 ⇄ 3, 4 alone.
    const a = fromRows([
      [0, 1, 0, 0, 0],
      [1, 0, 1, 0, 0],
      [0, 0, 0, 1, 0],
      [0, 0, 1, 0, 0],
      [0, 0, 0, 0, 0],
    ]);
    const comps = stronglyConnected(a).map((c) => c.join(',')).sort();
    expect(comps).toEqual(['0,1', '2,3', '4']);
  });

  it('handles a long chain without overflowing the stack', () => {
    const n = 3000;
    const a = zeros(n, n);
    for (let i = 0; i + 1 < n; i++) a.data[i * n + i + 1] = 1;
    a.data[(n - 1) * n] = 1; // close the cycle
    expect(stronglyConnected(a)).toHaveLength(1);
  });
});

describe('the GEMM kernel', () => {
  it('matches a plain triple loop on odd shapes', () => {
    const r = rng(5);
    for (const [m, nc, kc] of [[1, 1, 1], [3, 5, 7], [2, 600, 130], [7, 3, 257]] as const) {
      const a = Float64Array.from({ length: m * kc }, r);
      const b = Float64Array.from({ length: kc * nc }, r);
      const c = Float64Array.from({ length: m * nc }, r);
      const ref = c.slice();
      for (let i = 0; i < m; i++) for (let j = 0; j < nc; j++) for (let p = 0; p < kc; p++) ref[i * nc + j] -= a[i * kc + p]! * b[p * nc + j]!;
      gemmSub(m, nc, kc, a, 0, kc, b, 0, nc, c, 0, nc);
      for (let k = 0; k < m * nc; k++) expect(c[k]).toBeCloseTo(ref[k]!, 10);
    }
  });
});
