/**
 * The large-table entry point against independent paths: ml-matrix's inverse of I − A (source:
 * ml-matrix 6.15.1, inverse; output multipliers are its column sums, common practice) and the
 * engine's LeontiefModel (dense LU). Tables come from the seeded generator and from random
 * coefficients; the method chosen and the residual reached are part of every answer.
 */
import { describe, expect, it } from 'vitest';
import { Matrix as MlMatrix, inverse as mlInverse } from 'ml-matrix';
import { LargeLeontief, largeImpact, largeOutputMultipliers } from '../../../engine/large';
import { ConvergenceError } from '../../../engine/linalg/iterative';
import { LeontiefModel } from '../../../engine/leontief';
import { coefficients } from '../../../engine/table';
import { identityMinus, toRows } from '../../../engine/linalg/matrix';
import { syntheticTable } from '../../../engine/synthetic';
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

describe('LargeLeontief', () => {
  const t = syntheticTable({ regions: 5, sectors: 40, seed: 4, density: 0.07 });
  const n = 200;
  const A = coefficients(t);
  const Linv = mlInverse(new MlMatrix(toRows(identityMinus(A))));
  const mlMult = Array.from({ length: n }, (_, j) => Linv.getColumn(j).reduce((s, v) => s + v, 0));
  const r = rng(9);
  const d = Float64Array.from({ length: n }, () => (r() < 0.1 ? 50 * r() : 0));
  const mlImpact = Linv.mmul(MlMatrix.columnVector(Array.from(d))).getColumn(0);

  for (const method of ['direct', 'power-series', 'gmres', 'auto'] as const) {
    it(`gives the multipliers and impact of ml-matrix's inverse with method ${method} (source: ml-matrix inverse)`, () => {
      const m = new LargeLeontief(t, method === 'auto' ? { directMax: 100 } : { method });
      const mult = m.outputMultipliers();
      const imp = m.impact(d);
      expect(relErr(mult.values, mlMult)).toBeLessThan(1e-9);
      expect(relErr(imp.values, mlImpact)).toBeLessThan(1e-9);
      for (const s of [mult, imp]) {
        expect(s.converged).toBe(true);
        expect(s.residual).toBeLessThan(1e-11);
        expect(s.reason).toMatch(/n = 200/);
      }
      if (method === 'direct') {
        expect(mult.method).toBe('direct');
        expect(mult.storage).toBe('dense-lu');
        expect(mult.iterations).toBe(0);
      } else {
        expect(mult.storage).toBe('sparse');
        expect(mult.iterations).toBeGreaterThan(5);
      }
      if (method === 'auto') {
        // A small contraction: the bound predicts few series terms, so the series is used.
        expect(mult.method).toBe('power-series');
        expect(mult.errorBound).toBeGreaterThan(0);
        expect(mult.reason).toMatch(/contraction/);
      }
    });
  }

  it('agrees with LeontiefModel (dense LU), and picks the direct solve for a small table by default', () => {
    const model = LeontiefModel.fromTable(t);
    expect(relErr(largeOutputMultipliers(t).values, model.outputMultipliers())).toBeLessThan(1e-12);
    const s = largeImpact(t, d);
    expect(s.method).toBe('direct');
    expect(relErr(s.values, model.solve(d))).toBeLessThan(1e-12);
    const c = Float64Array.from({ length: n }, (_, i) => t.satellites[0]!.values[i]! / t.x[i]!);
    expect(relErr(new LargeLeontief(t, { method: 'gmres' }).weighted(c).values, model.weighted(c))).toBeLessThan(1e-9);
  });

  it('reads a dense table from the flows without a CSR copy', () => {
    const Ad = randomCoefficients(120, 3, 0.7, 0.9);
    const x = Float64Array.from({ length: 120 }, (_, i) => 100 + i);
    const Z = { rows: 120, cols: 120, data: Ad.data.map((v, k) => v * x[k % 120]!) };
    const m = new LargeLeontief({ Z, x }, { directMax: 0 });
    expect(m.density).toBeGreaterThan(0.5);
    const s = m.outputMultipliers();
    expect(s.storage).toBe('scaled-flows');
    expect(relErr(s.values, new LeontiefModel(Ad).outputMultipliers())).toBeLessThan(1e-9);
  });

  it('switches to GMRES when the Perron root is near 1, and reports the iterations', () => {
    // Column sums of 0.995 everywhere: ρ(A) = 0.995 (common practice, Perron–Frobenius).
    const k = 150;
    const Ad = randomCoefficients(k, 12, 1, 0.05);
    for (let j = 0; j < k; j++) {
      let s = 0;
      for (let i = 0; i < k; i++) s += Ad.data[i * k + j]!;
      for (let i = 0; i < k; i++) Ad.data[i * k + j] = (Ad.data[i * k + j]! * 0.995) / s;
    }
    const x = new Float64Array(k).fill(1);
    const m = new LargeLeontief({ Z: Ad, x }, { directMax: 0 });
    expect(m.plan().method).toBe('gmres');
    expect(m.plan().reason).toMatch(/series terms/);
    const s = m.outputMultipliers();
    expect(s.method).toBe('gmres');
    expect(s.converged).toBe(true);
    // Every column of A sums to 0.995, so every output multiplier is 1 / (1 − 0.995) = 200.
    for (const v of s.values) expect(v).toBeCloseTo(200, 6);
    // Forced to the series with a cap, the answer says it missed, never silently.
    const capped = new LargeLeontief({ Z: Ad, x }, { method: 'power-series', maxIterations: 300, onFailure: 'report' }).outputMultipliers();
    expect(capped.converged).toBe(false);
    expect(capped.finding?.code).toBe('not-converged');
    expect(capped.residual).toBeGreaterThan(1e-3);
    expect(() => new LargeLeontief({ Z: Ad, x }, { method: 'power-series', maxIterations: 300 }).outputMultipliers()).toThrow(ConvergenceError);
  });

  it('in auto, hands over to GMRES when the series misses, and says so', () => {
    const m = new LargeLeontief(t, { directMax: 0, maxIterations: 12 });
    const s = m.impact(d);
    expect(s.method).toBe('gmres');
    expect(s.reason).toMatch(/GMRES took over/);
    expect(s.converged).toBe(true);
    expect(relErr(s.values, mlImpact)).toBeLessThan(1e-9);
  });

  it('refuses bad input with the place named', () => {
    const Z = { rows: 2, cols: 2, data: Float64Array.of(1, NaN, 0, 1) };
    expect(() => new LargeLeontief({ Z, x: Float64Array.of(10, 10) })).toThrow(/intermediate flow \(1, 2\) is NaN/);
    expect(() => new LargeLeontief(t).impact([1, 2])).toThrow(InputError);
    expect(() => new LargeLeontief(t).impact(new Float64Array(n).fill(Infinity))).toThrow(/value 1 of the vector/);
  });
});

describe('several scenarios and measures', () => {
  const t = syntheticTable({ regions: 3, sectors: 40, seed: 8 });
  const n = 120;
  const k = 3;
  const D = { rows: n, cols: k, data: Float64Array.from({ length: n * k }, (_, q) => ((q * 37) % 11) + (q % k)) };
  const Linv = mlInverse(new MlMatrix(toRows(identityMinus(coefficients(t)))));

  for (const method of ['direct', 'gmres'] as const) {
    it(`solve column by column like ml-matrix's inverse, ${method} (source: ml-matrix inverse)`, () => {
      const m = new LargeLeontief(t, { method });
      const imp = m.impactMany(D);
      const wm = m.weightedMany(D);
      expect(imp).toHaveLength(k);
      const ref = Linv.mmul(new MlMatrix(toRows(D)));
      const refT = Linv.transpose().mmul(new MlMatrix(toRows(D)));
      for (let j = 0; j < k; j++) {
        expect(imp[j]!.method).toBe(method);
        expect(relErr(imp[j]!.values, ref.getColumn(j))).toBeLessThan(1e-9);
        expect(relErr(wm[j]!.values, refT.getColumn(j))).toBeLessThan(1e-9);
        expect(imp[j]!.residual).toBeLessThan(1e-11);
      }
    });
  }

  it('refuses a column block of the wrong height or with a non-finite value', () => {
    const m = new LargeLeontief(t);
    expect(() => m.impactMany({ rows: 2, cols: 1, data: Float64Array.of(1, 2) })).toThrow(InputError);
    const bad = { rows: n, cols: 2, data: new Float64Array(n * 2) };
    bad.data[5] = NaN;
    expect(() => m.impactMany(bad)).toThrow(/row 3, column 2/);
  });
});
