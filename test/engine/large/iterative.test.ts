/**
 * Iterative solves of (I − A) x = d against the direct LU and against ml-matrix, an independent
 * general-purpose library (source: ml-matrix 6.15.1, solve); the slow case uses a matrix whose
 * columns all sum to 0.999, whose Perron root is then exactly 0.999 (common practice: the
 * spectral radius of a nonnegative matrix with equal column sums is that sum, Perron–Frobenius).
 */
import { describe, expect, it } from 'vitest';
import { Matrix as MlMatrix, solve as mlSolve } from 'ml-matrix';
import { ConvergenceError, csrOperator, denseOperator, gmres, powerSeries, scaledFlowsOperator, transposed } from '../../../engine/linalg/iterative';
import { LU } from '../../../engine/linalg/lu';
import { identityMinus, toRows, transpose } from '../../../engine/linalg/matrix';
import { toCSR } from '../../../engine/linalg/sparse';
import { InputError } from '../../../engine/errors';
import { randomCoefficients, rng } from '../../helpers/random';

function relErr(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let e = 0;
  let s = 0;
  for (let i = 0; i < a.length; i++) {
    e = Math.max(e, Math.abs(a[i]! - b[i]!));
    s = Math.max(s, Math.abs(b[i]!));
  }
  return e / s;
}

function demand(n: number, seed: number): Float64Array {
  const r = rng(seed);
  return Float64Array.from({ length: n }, () => r() * 100);
}

describe('iterative and direct solves agree', () => {
  for (const [n, seed, density, colSum] of [[60, 1, 1, 0.8], [150, 2, 0.3, 0.7], [240, 3, 0.05, 0.9]] as const) {
    it(`on a random table, n = ${n}, density ${density}, column sums up to ${colSum} (source: ml-matrix solve)`, () => {
      const A = randomCoefficients(n, seed, colSum, density);
      const d = demand(n, seed + 10);
      const direct = new LU(identityMinus(A)).solve(d);
      const ref = mlSolve(new MlMatrix(toRows(identityMinus(A))), MlMatrix.columnVector(Array.from(d))).getColumn(0);
      expect(relErr(direct, ref)).toBeLessThan(1e-11);
      for (const op of [denseOperator(A), csrOperator(toCSR(A))]) {
        const ps = powerSeries(op, d);
        expect(ps.converged).toBe(true);
        expect(ps.method).toBe('power-series');
        expect(relErr(ps.x, direct)).toBeLessThan(1e-9);
        expect(ps.residual).toBeLessThan(1e-11);
        // The a-posteriori bound holds: the true error is no larger than the bound.
        let err = 0;
        for (let i = 0; i < n; i++) err = Math.max(err, Math.abs(ps.x[i]! - direct[i]!));
        expect(err).toBeLessThanOrEqual(ps.errorBound! * (1 + 1e-6) + 1e-12 * Math.max(...direct));
        const g = gmres(op, d);
        expect(g.converged).toBe(true);
        expect(relErr(g.x, direct)).toBeLessThan(1e-9);
        expect(g.iterations).toBeGreaterThan(0);
      }
    });
  }

  it('solves the transposed system (multipliers c′L) like the direct transposed solve', () => {
    const n = 120;
    const A = randomCoefficients(n, 8, 0.75, 0.4);
    const c = Float64Array.from({ length: n }, () => 1);
    const direct = new LU(identityMinus(A)).solveTranspose(c);
    const ref = mlSolve(new MlMatrix(toRows(transpose(identityMinus(A)))), MlMatrix.columnVector(Array.from(c))).getColumn(0);
    expect(relErr(direct, ref)).toBeLessThan(1e-11);
    for (const r of [powerSeries(transposed(denseOperator(A)), c), gmres(transposed(csrOperator(toCSR(A))), c)]) {
      expect(r.converged).toBe(true);
      expect(relErr(r.x, direct)).toBeLessThan(1e-9);
    }
  });

  it('reads A = Z x̂⁻¹ from the flows without forming it', () => {
    const n = 80;
    const A = randomCoefficients(n, 4, 0.6, 0.5);
    const r = rng(3);
    const x = Float64Array.from({ length: n }, () => 10 + 100 * r());
    const Z = { rows: n, cols: n, data: A.data.map((v, k) => v * x[k % n]!) };
    const d = demand(n, 5);
    const a = gmres(scaledFlowsOperator(Z, x), d);
    const b = new LU(identityMinus(A)).solve(d);
    expect(relErr(a.x, b)).toBeLessThan(1e-9);
  });
});

describe('a Perron root near 1', () => {
  // Every column sums to 0.999: ρ(A) = 0.999, and the series shrinks by 0.999 per term.
  const n = 100;
  const A = randomCoefficients(n, 21, 1, 0.3);
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += A.data[i * n + j]!;
    for (let i = 0; i < n; i++) A.data[i * n + j] = (A.data[i * n + j]! * 0.999) / s;
  }
  const d = demand(n, 22);
  const direct = new LU(identityMinus(A)).solve(d);

  it('makes the power series slow: it stops at its cap and reports the residual reached', () => {
    const r = powerSeries(denseOperator(A), d, { maxIterations: 500, onFailure: 'report' });
    expect(r.converged).toBe(false);
    expect(r.iterations).toBe(501); // 500 terms and the final residual check
    expect(r.residual).toBeGreaterThan(1e-6);
    expect(r.contraction).toBeCloseTo(0.999, 12);
    expect(r.finding?.code).toBe('not-converged');
    expect(r.finding?.severity).toBe('error');
    expect(r.finding?.message).toMatch(/relative residual/);
    expect(r.finding?.data?.residual).toBe(r.residual);
  });

  it('throws a ConvergenceError that carries what was reached, by default', () => {
    let caught: unknown;
    try {
      powerSeries(denseOperator(A), d, { maxIterations: 200 });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ConvergenceError);
    const e = caught as ConvergenceError;
    expect(e.code).toBe('not-converged');
    expect(e.result.iterations).toBe(201);
    expect(e.result.residual).toBeGreaterThan(1e-6);
  });

  it('still converges with GMRES, which reports its iterations and residual', () => {
    const g = gmres(denseOperator(A), d, { tolerance: 1e-13 });
    expect(g.converged).toBe(true);
    expect(relErr(g.x, direct)).toBeLessThan(1e-9);
    expect(g.iterations).toBeGreaterThan(10);
    expect(g.residual).toBeLessThan(1e-11);
  });

  it('with enough terms the series gets there too, and many more than for a small root', () => {
    const slow = powerSeries(denseOperator(A), d, { tolerance: 1e-10, maxIterations: 40_000 });
    expect(slow.converged).toBe(true);
    expect(relErr(slow.x, direct)).toBeLessThan(1e-8);
    const fast = powerSeries(denseOperator(randomCoefficients(n, 2, 0.5, 0.3)), d, { tolerance: 1e-10 });
    expect(slow.iterations).toBeGreaterThan(20 * fast.iterations);
  });
});

describe('failures are clear', () => {
  it('a table that is not productive (columns summing to 1.2) makes the series diverge, reported as such', () => {
    const n = 30;
    const A = randomCoefficients(n, 5, 1, 1);
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += A.data[i * n + j]!;
      for (let i = 0; i < n; i++) A.data[i * n + j] = (A.data[i * n + j]! * 1.2) / s;
    }
    const r = powerSeries(denseOperator(A), demand(n, 1), { onFailure: 'report' });
    expect(r.converged).toBe(false);
    expect(r.finding?.message).toMatch(/diverges/);
    expect(r.finding?.message).toMatch(/not productive/);
  });

  it('GMRES on a singular I − A stops and says so', () => {
    // Columns summing to exactly 1: I − A is singular.
    const n = 20;
    const A = randomCoefficients(n, 6, 1, 1);
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += A.data[i * n + j]!;
      for (let i = 0; i < n; i++) A.data[i * n + j] = A.data[i * n + j]! / s;
    }
    const r = gmres(denseOperator(A), demand(n, 2), { onFailure: 'report', maxIterations: 400 });
    expect(r.converged).toBe(false);
    expect(r.finding?.code).toBe('not-converged');
    expect(() => gmres(denseOperator(A), demand(n, 2), { maxIterations: 400 })).toThrow(ConvergenceError);
  });

  it('refuses a wrong-sized or non-finite right-hand side', () => {
    const op = denseOperator(randomCoefficients(5, 1));
    expect(() => powerSeries(op, [1, 2, 3])).toThrow(InputError);
    expect(() => gmres(op, [1, 2, NaN, 4, 5])).toThrow(/value 3 of the right-hand side is NaN/);
  });
});
