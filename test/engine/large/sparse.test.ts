/**
 * CSR storage against the dense path and against ml-matrix (source: ml-matrix 6.15.1, mmul
 * and transpose), written as an independent computation.
 */
import { describe, expect, it } from 'vitest';
import { Matrix as MlMatrix } from 'ml-matrix';
import { csrColSums, csrMatVec, csrRowSums, csrToDense, csrTranspose, csrVecMat, density, fromTriplets, nnz, toCSR } from '../../../engine/linalg/sparse';
import { colSums, fromRows, matVec, rowSums, toRows, vecMat } from '../../../engine/linalg/matrix';
import { csrOperator, denseOperator, gmres, powerSeries } from '../../../engine/linalg/iterative';
import { InputError } from '../../../engine/errors';
import { randomCoefficients, rng } from '../../helpers/random';

describe('CSR storage', () => {
  const A = randomCoefficients(90, 7, 0.8, 0.08);
  const S = toCSR(A);
  const r = rng(2);
  const v = Float64Array.from({ length: 90 }, () => r() - 0.3);

  it('keeps exactly the nonzero cells and gives the dense matrix back', () => {
    expect(nnz(S)).toBe(Math.round(density(A) * 90 * 90));
    expect(density(A)).toBeLessThan(0.12);
    expect(csrToDense(S).data).toEqual(A.data);
  });

  it('multiplies like the dense matrix and like ml-matrix (source: ml-matrix mmul)', () => {
    const dense = matVec(A, v);
    const sparse = csrMatVec(S, v);
    const ml = new MlMatrix(toRows(A)).mmul(MlMatrix.columnVector(Array.from(v))).getColumn(0);
    for (let i = 0; i < 90; i++) {
      expect(sparse[i]).toBeCloseTo(dense[i]!, 14);
      expect(sparse[i]).toBeCloseTo(ml[i]!, 14);
    }
    const left = csrVecMat(v, S);
    const leftDense = vecMat(v, A);
    for (let j = 0; j < 90; j++) expect(left[j]).toBeCloseTo(leftDense[j]!, 14);
    const cs = csrColSums(S);
    const rs = csrRowSums(S);
    const cd = colSums(A);
    const rd = rowSums(A);
    for (let j = 0; j < 90; j++) {
      expect(cs[j]).toBeCloseTo(cd[j]!, 14);
      expect(rs[j]).toBeCloseTo(rd[j]!, 14);
    }
  });

  it('transposes like ml-matrix (source: ml-matrix transpose)', () => {
    const T = csrToDense(csrTranspose(S));
    expect(toRows(T)).toEqual(new MlMatrix(toRows(A)).transpose().to2DArray());
  });

  it('scales columns on the way in (A = Z x̂⁻¹ without a dense A)', () => {
    const Z = fromRows([[0, 2], [4, 0]]);
    const s = toCSR(Z, [0.5, 0.25]);
    expect(toRows(csrToDense(s))).toEqual([[0, 0.5], [2, 0]]);
    expect(() => toCSR(Z, [1])).toThrow(InputError);
  });

  it('builds from triplets, adding duplicates and dropping cancelled cells', () => {
    const s = fromTriplets(3, 3, [2, 0, 2, 1, 1], [1, 2, 1, 0, 0], [1, 5, 2, 3, -3]);
    expect(toRows(csrToDense(s))).toEqual([[0, 0, 5], [0, 0, 0], [0, 3, 0]]);
    expect(nnz(s)).toBe(2);
    expect(() => fromTriplets(2, 2, [2], [0], [1])).toThrow(/outside the 2 × 2 matrix/);
  });

  it('gives the same iterative solutions as the dense operator', () => {
    const d = Float64Array.from({ length: 90 }, (_, i) => 1 + (i % 5));
    for (const solve of [powerSeries, gmres]) {
      const a = solve(denseOperator(A), d);
      const b = solve(csrOperator(S), d);
      for (let i = 0; i < 90; i++) expect(Math.abs(a.x[i]! - b.x[i]!)).toBeLessThan(1e-10 * Math.abs(a.x[i]!));
      expect(a.iterations).toBe(b.iterations);
    }
  });
});
