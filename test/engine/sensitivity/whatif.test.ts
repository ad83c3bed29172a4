/**
 * Exact what-if updates (Sherman–Morrison and Woodbury) against a full recompute with our own
 * LU and against ml-matrix's inverse as an independent path (source: ml-matrix 6.15.1), on the
 * U.S. 1997 summary economy (source: U.S. Bureau of Economic Analysis, Benchmark Input-Output
 * Accounts of the United States, 1997, Table 8).
 */
import { describe, expect, it } from 'vitest';
import { InputError, SingularMatrixError } from '../../../engine/errors';
import { LeontiefModel } from '../../../engine/leontief';
import type { Matrix } from '../../../engine/linalg/matrix';
import { fromRows } from '../../../engine/linalg/matrix';
import { WhatIf } from '../../../engine/whatif';
import { beaAvailable } from '../../helpers/reference';
import { rng } from '../../helpers/random';
import { beaEconomy, mlLeontief } from './bea';

const hasBea = beaAvailable();

function maxRel(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let scale = 0;
  let d = 0;
  for (let i = 0; i < a.length; i++) {
    scale = Math.max(scale, Math.abs(b[i]!));
    d = Math.max(d, Math.abs(a[i]! - b[i]!));
  }
  return d / Math.max(scale, 1e-300);
}

/** Column sums of ml-matrix's (I − A)⁻¹. */
function mlMultipliers(A: Matrix): Float64Array {
  const n = A.rows;
  const L = mlLeontief(A);
  const m = new Float64Array(n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) m[j] += L[i * n + j]!;
  return m;
}

/** Everything the what-if answers, against a full recompute of the same coefficients. */
function expectExact(w: WhatIf, c: Float64Array, d: Float64Array): void {
  const full = w.model();
  expect(maxRel(w.outputMultipliers(), full.outputMultipliers())).toBeLessThan(1e-10);
  expect(maxRel(w.solve(d), full.solve(d))).toBeLessThan(1e-10);
  expect(maxRel(w.weighted(c), full.weighted(c))).toBeLessThan(1e-10);
}

describe.skipIf(!hasBea)('what-if without refactoring (source: U.S. BEA 1997 Table 8)', () => {
  const r = rng(77);

  it('one coefficient: the output multipliers agree with a full recompute and with ml-matrix', () => {
    const { A } = beaEconomy();
    const n = A.rows;
    const base = new LeontiefModel(A);
    for (const [i, j, factor] of [
      [0, 0, 1.5],
      [12, 40, 0.5],
      [100, 3, 3],
    ] as const) {
      const w = new WhatIf(base);
      const a = A.data[i * n + j]!;
      w.setCoefficient(i, j, a * factor + 0.01);
      expect(w.rank).toBe(1);
      const edited = w.coefficients();
      expect(edited.data[i * n + j]).toBe(a * factor + 0.01);
      const got = w.outputMultipliers();
      expect(maxRel(got, new LeontiefModel(edited).outputMultipliers())).toBeLessThan(1e-10);
      expect(maxRel(got, mlMultipliers(edited))).toBeLessThan(1e-10);
      expect(w.refactorCount).toBe(0);
    }
  });

  it('a new technology in one column, and a new row, agree with a full recompute', () => {
    const { A } = beaEconomy();
    const n = A.rows;
    const base = new LeontiefModel(A);
    const c = Float64Array.from({ length: n }, () => r());
    const d = Float64Array.from({ length: n }, () => 100 * r());
    const j = 57;
    const col = new Float64Array(n);
    let s = 0;
    for (let i = 0; i < n; i++) s += (col[i] = r() < 0.3 ? r() : 0);
    for (let i = 0; i < n; i++) col[i]! *= 0.6 / s; // a column summing to 0.6
    const w = new WhatIf(base).setColumn(j, col);
    expect(w.rank).toBe(1);
    expectExact(w, c, d);
    expect(maxRel(w.outputMultipliers(), mlMultipliers(w.coefficients()))).toBeLessThan(1e-10);
    const row = Float64Array.from({ length: n }, (_, k) => A.data[9 * n + k]! * 0.7);
    w.setRow(9, row);
    expect(w.rank).toBe(2);
    expectExact(w, c, d);
    // A cell in the edited column joins that column's term: the rank stays 2.
    w.addToCoefficient(4, j, 0.01);
    expect(w.rank).toBe(2);
    expectExact(w, c, d);
    w.reset();
    expect(w.rank).toBe(0);
    expect(maxRel(w.outputMultipliers(), base.outputMultipliers())).toBe(0);
  });

  it('a long sequence of edits stays exact, refactoring when the rank passes its bound', () => {
    const { A } = beaEconomy();
    const n = A.rows;
    const w = new WhatIf(new LeontiefModel(A), { maxRank: 6 });
    const c = Float64Array.from({ length: n }, () => r());
    const d = Float64Array.from({ length: n }, () => r());
    for (let step = 0; step < 40; step++) {
      const i = Math.floor(r() * n);
      const j = Math.floor(r() * n);
      const kind = r();
      if (kind < 0.7) w.setCoefficient(i, j, w.coefficient(i, j) * (0.5 + r()) + 0.002 * r());
      else if (kind < 0.85) {
        const col = w.coefficients();
        const v = Float64Array.from({ length: n }, (_, k) => col.data[k * n + j]! * (0.8 + 0.3 * r()));
        w.setColumn(j, v);
      } else {
        const cur = w.coefficients();
        w.setRow(i, Float64Array.from({ length: n }, (_, k) => cur.data[i * n + k]! * (0.8 + 0.3 * r())));
      }
      expect(w.rank).toBeLessThanOrEqual(6);
      if (step % 5 === 4) expectExact(w, c, d);
    }
    expect(w.refactorCount).toBeGreaterThan(0);
    expectExact(w, c, d);
  });
});

describe('what-if in small economies (common practice)', () => {
  it('a one-sector economy: m = 1 / (1 − a) after each change', () => {
    const w = new WhatIf(new LeontiefModel(fromRows([[0.5]])));
    w.setCoefficient(0, 0, 0.2);
    expect(w.outputMultipliers()[0]).toBeCloseTo(1.25, 14);
    w.addToCoefficient(0, 0, 0.55);
    expect(w.outputMultipliers()[0]).toBeCloseTo(4, 12);
    expect(w.solve([3])[0]).toBeCloseTo(12, 11);
  });

  it('an edit that makes I − A singular is reported, not answered with nonsense', () => {
    const w = new WhatIf(new LeontiefModel(fromRows([[0.5]])));
    w.setCoefficient(0, 0, 1);
    expect(() => w.outputMultipliers()).toThrow(SingularMatrixError);
  });

  it('refuses bad input with clear errors', () => {
    const w = new WhatIf(new LeontiefModel(fromRows([[0.1, 0.2], [0.3, 0.1]])));
    expect(() => w.setCoefficient(2, 0, 0.1)).toThrow(/coefficient row index 2 is out of range: the model has 2 sectors/);
    expect(() => w.setCoefficient(0, -1, 0.1)).toThrow(InputError);
    expect(() => w.setCoefficient(0, 0, Number.NaN)).toThrow(/not a finite number/);
    expect(() => w.setColumn(0, [0.1])).toThrow(/has 1 values; the model has 2 sectors/);
    expect(() => w.setRow(5, [0.1, 0.1])).toThrow(InputError);
    expect(() => w.solve([1, 2, 3])).toThrow(InputError);
    expect(w.rank).toBe(0);
  });
});
