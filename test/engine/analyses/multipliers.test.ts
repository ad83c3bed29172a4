/**
 * Multipliers: the identities (output multipliers are the column sums of L; Type II ≥ Type I),
 * a handbook example, and every multiplier on random tables against plain dense computations
 * with ml-matrix (source: ml-matrix 6.15.1).
 */
import { describe, expect, it } from 'vitest';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { buildModels } from '../../../engine/household';
import { fromRows } from '../../../engine/linalg/matrix';
import { measures, outputMeasure } from '../../../engine/measures';
import { multipliers, multipliersOf, requirementsMultipliers } from '../../../engine/multipliers';
import { makeTable } from '../../../engine/table';
import { colSum, denseA, denseL, randomTable, relErr, rowTimes } from './tables';

describe('multipliers', () => {
  it('output multipliers equal the column sums of L (source: Miller & Blair 2009, ch. 2, two-sector example, from memory)', () => {
    // Z = [[150, 500], [200, 100]], f = [350, 1700], x = [1000, 2000], value added [650, 1400]
    // (from memory). A = [[0.15, 0.25], [0.2, 0.05]], L = [[0.95, 0.25], [0.2, 0.85]] / 0.7575.
    const t = makeTable({
      sectors: { codes: ['1', '2'] },
      Z: [
        [150, 500],
        [200, 100],
      ],
      finalDemand: { codes: ['F'], values: [[350], [1700]] },
      valueAdded: { codes: ['VA'], values: [[650, 1400]] },
    });
    const models = buildModels(t);
    const [m] = multipliers(models, [outputMeasure(t)]);
    expect(m!.simple[0]).toBeCloseTo((0.95 + 0.2) / 0.7575, 12);
    expect(m!.simple[1]).toBeCloseTo((0.25 + 0.85) / 0.7575, 12);
    // L ≈ [[1.254, 0.330], [0.264, 1.122]] (from memory), so the output multipliers are ≈ 1.518 and 1.452.
    const L = models.open.inverse();
    expect(L.data[0]).toBeCloseTo(1.254, 3);
    expect(L.data[1]).toBeCloseTo(0.33, 3);
    expect(L.data[2]).toBeCloseTo(0.264, 3);
    expect(L.data[3]).toBeCloseTo(1.122, 3);
    expect(m!.simple[0]).toBeCloseTo(1.518, 3);
    expect(m!.simple[1]).toBeCloseTo(1.452, 3);
    expect(Array.from(m!.direct)).toEqual([1, 1]);
    expect(m!.typeI[0]).toBe(m!.simple[0]);
  });

  for (const [n, seed] of [
    [6, 1],
    [25, 2],
    [60, 3],
  ] as const) {
    it(`match dense computations on a random table of ${n} sectors (source: ml-matrix inverse)`, () => {
      const t = randomTable({ n, seed });
      const models = buildModels(t, { household: { income: 'COE', consumption: 'HH' } });
      const list = measures(t);
      const res = multipliers(models, list);
      const A = denseA(t);
      const L = denseL(A);
      // The closed model as a bordered matrix, inverted densely.
      const Abar = new MlMatrix(n + 1, n + 1);
      let income = 0;
      for (let j = 0; j < n; j++) income += t.V.data[j]!;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) Abar.set(i, j, A.get(i, j));
        Abar.set(i, n, t.F.data[i * 3]! / income);
        Abar.set(n, i, t.V.data[i]! / t.x[i]!);
      }
      const Lbar = mlInverse(MlMatrix.eye(n + 1).sub(Abar)).subMatrix(0, n - 1, 0, n - 1);
      expect(relErr(res[0]!.simple, colSum(L))).toBeLessThan(1e-12);
      expect(relErr(res[0]!.total!, colSum(Lbar))).toBeLessThan(1e-11);
      for (const [k, m] of res.entries()) {
        const c = list[k]!.coefficients;
        const simple = rowTimes(c, L);
        const total = rowTimes(c, Lbar);
        expect(relErr(m.simple, simple)).toBeLessThan(1e-11);
        expect(relErr(m.total!, total)).toBeLessThan(1e-11);
        for (let j = 0; j < n; j++) {
          expect(m.direct[j]).toBe(c[j]);
          expect(m.indirect[j]).toBeCloseTo(simple[j]! - c[j]!, 10);
          expect(m.induced![j]).toBeCloseTo(total[j]! - simple[j]!, 10);
          expect(m.typeI[j]).toBeCloseTo(simple[j]! / c[j]!, 9);
          expect(m.typeII![j]).toBeCloseTo(total[j]! / c[j]!, 9);
          // Type II ≥ Type I (common practice: induced effects are nonnegative).
          expect(m.typeII![j]!).toBeGreaterThanOrEqual(m.typeI[j]! - 1e-12);
          expect(m.total![j]!).toBeGreaterThanOrEqual(m.simple[j]! - 1e-12);
        }
        expect(m.about.length).toBeGreaterThan(20);
        expect(m.cautions.length).toBeGreaterThan(3);
      }
      expect(res[3]!.unit).toBe('FTE jobs per USD millions of final demand');
      expect(res[0]!.unit).toBe('USD millions per USD millions of final demand');
    });
  }

  it('the labour-income Type II multiplier is the Type I multiplier ÷ (1 − hᵣ′L h꜀) (common practice)', () => {
    const t = randomTable({ n: 15, seed: 8 });
    const models = buildModels(t, { household: { income: 'COE', consumption: 'HH' } });
    const li = measures(t).find((m) => m.kind === 'labour-income')!;
    const m = multipliersOf(t.sectors, models.open, li, models.closed);
    for (let j = 0; j < 15; j++) expect(m.total![j]).toBeCloseTo(m.simple[j]! / models.closure!.schur, 11);
  });

  it('leaves Type I blank where the direct coefficient is zero, and says so', () => {
    const t = makeTable({
      sectors: { codes: ['A', 'B'] },
      Z: [
        [10, 20],
        [30, 40],
      ],
      finalDemand: { codes: ['F'], values: [[70], [130]] },
      valueAdded: { codes: ['COE', 'GOS'], labels: ['Compensation of employees', 'Surplus'], values: [[0, 60], [60, 80]] },
    });
    const models = buildModels(t);
    const li = measures(t).find((m) => m.kind === 'labour-income')!;
    const m = multipliersOf(t.sectors, models.open, li);
    expect(Number.isNaN(m.typeI[0]!)).toBe(true);
    expect(Number.isFinite(m.typeI[1]!)).toBe(true);
    expect(m.findings[0]!.code).toBe('no-direct-effect');
    expect(m.findings[0]!.message).toContain("'A'");
  });

  it('reads multipliers from any requirements matrix as weighted column sums', () => {
    const R = fromRows([
      [1.2, 0.3, 0.1],
      [0.4, 1.1, 0.2],
    ]);
    const r = requirementsMultipliers(R, { codes: ['a', 'b', 'c'], labels: ['a', 'b', 'c'] });
    expect(Array.from(r.simple).map((v) => +v.toFixed(12))).toEqual([1.6, 1.4, 0.3]);
    const w = requirementsMultipliers(R, { codes: ['a', 'b', 'c'], labels: ['a', 'b', 'c'] }, { weights: [2, 0.5] });
    expect(w.simple[0]).toBeCloseTo(2.6, 12);
    expect(() => requirementsMultipliers(R, { codes: ['a'], labels: ['a'] })).toThrow(/1 column codes/);
  });
});
