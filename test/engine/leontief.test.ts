/**
 * The open Leontief model: handbook examples, and properties on random productive tables
 * checked against independent computations with ml-matrix.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Matrix as MlMatrix, inverse as mlInverse, solve as mlSolve } from 'ml-matrix';
import { LeontiefModel } from '../../engine/leontief';
import { checks } from '../../engine/checks';
import { fromRows, identity, identityMinus, matMul, maxAbsDiff, toRows, zeros } from '../../engine/linalg/matrix';
import type { Matrix } from '../../engine/linalg/matrix';
import { makeTable } from '../../engine/table';
import { SingularMatrixError } from '../../engine/errors';
import { randomCoefficients, rng } from '../helpers/random';

describe('handbook examples', () => {
  it('Miller & Blair (2009), ch. 2, two-sector example (from memory)', () => {
    const m = LeontiefModel.fromFlows(fromRows([[150, 500], [200, 100]]), Float64Array.of(1000, 2000));
    expect(Array.from(m.A.data)).toEqual([0.15, 0.25, 0.2, 0.05]);
    const L = m.inverse();
    const expected = [1.2541, 0.33, 0.264, 1.1221];
    for (let k = 0; k < 4; k++) expect(L.data[k]).toBeCloseTo(expected[k]!, 4);
    const x = m.solveChecked(Float64Array.of(600, 1500));
    expect(x.x[0]).toBeCloseTo(1247.52, 2);
    expect(x.x[1]).toBeCloseTo(1841.58, 2);
    expect(x.residual).toBeLessThan(1e-15);
  });

  it('Lay, Linear Algebra and Its Applications, the three-sector consumption-matrix example (from memory)', () => {
    const m = new LeontiefModel(fromRows([[0.5, 0.4, 0.2], [0.2, 0.3, 0.1], [0.1, 0.1, 0.3]]));
    const x = m.solve([50, 30, 20]);
    expect(x[0]).toBeCloseTo(225.9, 1);
    expect(x[1]).toBeCloseTo(118.5, 1);
    expect(x[2]).toBeCloseTo(77.8, 1);
  });

  it('gives output multipliers as column sums of L by one transposed solve (common practice)', () => {
    const m = new LeontiefModel(fromRows([[0.15, 0.25], [0.2, 0.05]]));
    const om = m.outputMultipliers();
    // Column sums of the Miller & Blair inverse (from memory): 1.5181, 1.4521.
    expect(om[0]).toBeCloseTo(1.2541 + 0.264, 3);
    expect(om[1]).toBeCloseTo(0.33 + 1.1221, 3);
  });
});

const productive = fc
  .record({ n: fc.integer({ min: 1, max: 12 }), seed: fc.integer({ min: 1, max: 2 ** 30 }), density: fc.double({ min: 0.2, max: 1, noNaN: true }) })
  .map(({ n, seed, density }) => ({ n, seed, A: randomCoefficients(n, seed, 0.9, density) }));

const ml = (m: Matrix) => new MlMatrix(toRows(m));

describe('properties on random productive tables (fast-check)', () => {
  it('L ≥ 0 elementwise and (I − A)L = I within 1e-10', () => {
    fc.assert(
      fc.property(productive, ({ n, A }) => {
        const L = new LeontiefModel(A).inverse();
        for (const v of L.data) expect(v).toBeGreaterThanOrEqual(0);
        expect(maxAbsDiff(matMul(identityMinus(A), L), identity(n))).toBeLessThan(1e-10);
      }),
      { numRuns: 60 },
    );
  });

  it('L equals the Neumann series I + A + A² + … truncated where the tail is below 1e-12 (common practice)', () => {
    fc.assert(
      fc.property(productive, ({ n, A }) => {
        const L = new LeontiefModel(A).inverse();
        let term = identity(n);
        const sum = identity(n);
        // ‖A‖₁ ≤ 0.9 here, so the tail after the term Aᵏ is at most ‖Aᵏ‖₁·0.9/(1 − 0.9).
        for (let k = 1; k < 2000; k++) {
          term = matMul(term, A);
          let t = 0;
          for (const v of term.data) t = Math.max(t, Math.abs(v));
          for (let q = 0; q < n * n; q++) sum.data[q] += term.data[q]!;
          if (t * n * 10 < 1e-13) break;
        }
        expect(maxAbsDiff(L, sum)).toBeLessThan(1e-10);
      }),
      { numRuns: 30 },
    );
  });

  it('solves agree with ml-matrix within 1e-9 relative (source: ml-matrix 6.15.1 solve and inverse)', () => {
    fc.assert(
      fc.property(productive, fc.integer({ min: 0, max: 1e6 }), ({ n, A }, s) => {
        const r = rng(s + 1);
        const d = Float64Array.from({ length: n }, () => r() * 100);
        const x = new LeontiefModel(A).solve(d);
        const ref = mlSolve(ml(identityMinus(A)), MlMatrix.columnVector(Array.from(d))).getColumn(0);
        const Lref = mlInverse(ml(identityMinus(A)));
        const scale = Math.max(1e-300, ...ref.map(Math.abs));
        for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - ref[i]!) / scale).toBeLessThan(1e-9);
        const om = new LeontiefModel(A).outputMultipliers();
        for (let j = 0; j < n; j++) {
          let cs = 0;
          for (let i = 0; i < n; i++) cs += Lref.get(i, j);
          expect(Math.abs(om[j]! - cs) / cs).toBeLessThan(1e-9);
        }
      }),
      { numRuns: 60 },
    );
  });

  it('a table made non-productive by construction is reported with exactly the sectors that make it so (common practice: ρ of a block with equal row sums r is r)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 10 }), fc.integer({ min: 1, max: 2 ** 30 }), fc.double({ min: 1, max: 1.6, noNaN: true }), (n, seed, root) => {
        const r = rng(seed);
        const inGroup = Array.from({ length: n }, () => r() < 0.4);
        if (!inGroup.some(Boolean)) inGroup[0] = true;
        if (inGroup.every(Boolean)) inGroup[n - 1] = false;
        const A = zeros(n, n);
        for (let i = 0; i < n; i++) {
          for (let j = 0; j < n; j++) {
            if (inGroup[i] && inGroup[j]) A.data[i * n + j] = 0.1 + r();
            else if (!inGroup[i] && !inGroup[j]) A.data[i * n + j] = r() * (0.4 / n);
            else if (inGroup[i] && !inGroup[j]) A.data[i * n + j] = r() * (0.4 / n); // others buy from the group
            // the group buys nothing from the others: it is closed
          }
        }
        // Scale the group's block to equal row sums `root`, so that its Perron root is exactly `root`.
        for (let i = 0; i < n; i++) {
          if (!inGroup[i]) continue;
          let s = 0;
          for (let j = 0; j < n; j++) if (inGroup[j]) s += A.data[i * n + j]!;
          for (let j = 0; j < n; j++) if (inGroup[j]) A.data[i * n + j] = (A.data[i * n + j]! * root) / s;
        }
        const codes = Array.from({ length: n }, (_, i) => `S${i + 1}`);
        const t = makeTable({ sectors: { codes }, Z: toRows(A), x: new Array(n).fill(1), meta: { outputAssumed: true } });
        const bad = checks(t).filter((f) => f.code === 'not-productive');
        expect(bad).toHaveLength(1);
        expect(bad[0]!.severity).toBe('error');
        expect(bad[0]!.where?.sectors).toEqual(codes.filter((_, i) => inGroup[i]));
      }),
      { numRuns: 80 },
    );
  });
});

describe('bad input', () => {
  it('refuses NaN and Infinity coefficients with the cell named', () => {
    expect(() => new LeontiefModel(fromRows([[0.1, NaN], [0.2, 0.3]]))).toThrow(/\(1, 2\) is NaN/);
    expect(() => new LeontiefModel(fromRows([[0.1, 0], [Infinity, 0.3]]))).toThrow(/\(2, 1\) is Infinity/);
  });

  it('refuses an empty or non-square model', () => {
    expect(() => new LeontiefModel(zeros(0, 0))).toThrow(/no sectors/);
    expect(() => new LeontiefModel(zeros(2, 3))).toThrow(/square/);
  });

  it('reports a singular I − A and refuses to solve', () => {
    const m = new LeontiefModel(fromRows([[1, 0], [0, 0.5]]));
    expect(m.isSingular).toBe(true);
    expect(m.singularColumn).toBe(1);
    expect(() => m.solve([1, 1])).toThrow(SingularMatrixError);
  });
});
