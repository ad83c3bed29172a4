/** RAS and GRAS: worked checks, infeasible targets named, and properties. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { InputError } from '../../../engine/errors';
import { fromRows } from '../../../engine/linalg/matrix';
import type { Matrix } from '../../../engine/linalg/matrix';
import { gras, ras } from '../../../engine/regional/index';
import { rng } from '../../helpers/random';

const sums = (X: Matrix) => {
  const r = new Float64Array(X.rows);
  const c = new Float64Array(X.cols);
  for (let i = 0; i < X.rows; i++) for (let j = 0; j < X.cols; j++) {
    r[i] = r[i]! + X.data[i * X.cols + j]!;
    c[j] = c[j]! + X.data[i * X.cols + j]!;
  }
  return { r, c };
};

/** A straightforward RAS written here, independent of the engine's: alternate row and column scaling. */
function plainRas(A: number[][], u: number[], v: number[], sweeps = 5000): number[][] {
  let X = A.map((row) => [...row]);
  for (let k = 0; k < sweeps; k++) {
    X = X.map((row, i) => {
      const s = row.reduce((a, b) => a + b, 0);
      return row.map((x) => (s > 0 ? (x * u[i]!) / s : x));
    });
    const cs = v.map((_, j) => X.reduce((a, row) => a + row[j]!, 0));
    X = X.map((row) => row.map((x, j) => (cs[j]! > 0 ? (x * v[j]!) / cs[j]! : x)));
  }
  return X;
}

describe('RAS', () => {
  it('2 × 2: keeps the cross-product ratio, so the cell solves a quadratic (Bishop, Fienberg & Holland 1975, from memory; by hand)', () => {
    // A = [[1, 2], [3, 4]] to rows [5, 5] and columns [4, 6]: with x11 = t, x12 = 5 − t, x21 = 4 − t,
    // x22 = 1 + t and t(1 + t) / ((5 − t)(4 − t)) = 4/6: t² + 21t − 40 = 0, t = (−21 + √601)/2 = 1.757651
    const r = ras(fromRows([[1, 2], [3, 4]]), [5, 5], [4, 6], { tolerance: 1e-14 });
    const t = (-21 + Math.sqrt(601)) / 2;
    expect(t).toBeCloseTo(1.757651, 6);
    expect(r.converged).toBe(true);
    expect(Array.from(r.X.data)).toEqual([t, 5 - t, 4 - t, 1 + t].map((v) => expect.closeTo(v, 10)));
    expect(r.maxDeviation).toBeLessThanOrEqual(1e-14);
  });

  it('a 3 × 3 update to new totals in the manner of Miller & Blair (2009), ch. 7 (the book’s numbers are not recalled; checked against a plain RAS written in this test)', () => {
    // an old flows table and new margins (invented for this check)
    const A = [[120, 40, 130], [55, 10, 140], [60, 180, 20]];
    const u = [300, 220, 280];
    const v = [250, 240, 310];
    const r = ras(fromRows(A), u, v, { tolerance: 1e-14 });
    expect(r.converged).toBe(true);
    const plain = plainRas(A, u, v);
    Array.from(r.X.data).forEach((x, k) => expect(x).toBeCloseTo(plain[Math.floor(k / 3)]![k % 3]!, 9));
    const s = sums(r.X);
    s.r.forEach((x, i) => expect(Math.abs(x - u[i]!) / u[i]!).toBeLessThanOrEqual(1e-10));
    s.c.forEach((x, j) => expect(Math.abs(x - v[j]!) / v[j]!).toBeLessThanOrEqual(1e-10));
    expect(r.iterations).toBeGreaterThan(0);
  });

  it('holds fixed cells at their values', () => {
    const A = fromRows([[10, 20, 30], [5, 5, 5], [1, 2, 3]]);
    const fixed = new Uint8Array(9);
    fixed[1] = 1; // (1, 2) held at 20
    const r = ras(A, [70, 20, 12], [30, 40, 32], { fixed });
    expect(r.converged).toBe(true);
    expect(r.X.data[1]).toBe(20);
    const s = sums(r.X);
    expect(s.r[0]).toBeCloseTo(70, 8);
    expect(s.c[1]).toBeCloseTo(40, 8);
  });

  it('names the targets that cannot be met: a zero row with a positive target, totals that disagree', () => {
    const A = fromRows([[1, 2], [0, 0]]);
    const r = ras(A, [3, 4], [4, 3], { rowCodes: ['FOOD', 'MINING'], colCodes: ['FOOD', 'MINING'] });
    expect(r.converged).toBe(false);
    expect(r.infeasible.map((f) => [f.kind, f.code])).toEqual([['empty-with-target', 'MINING']]);
    expect(r.findings[0]!.message).toMatch(/row 'MINING' has no entries to scale but its target is 4/);
    const d = ras(fromRows([[1, 2], [3, 4]]), [3, 7], [4, 7], { rowCodes: ['A', 'B'] });
    expect(d.infeasible.map((f) => f.kind)).toEqual(['totals-disagree']);
    expect(d.findings[0]!.message).toMatch(/row totals sum to 10 and the column totals to 11/);
  });

  it('refuses a negative cell and points to GRAS', () => {
    expect(() => ras(fromRows([[1, -2], [3, 4]]), [1, 1], [1, 1], { rowCodes: ['A', 'B'], colCodes: ['A', 'B'] })).toThrow(InputError);
    expect(() => ras(fromRows([[1, -2], [3, 4]]), [1, 1], [1, 1], { rowCodes: ['A', 'B'], colCodes: ['A', 'B'] })).toThrow(/cell \(A, B\) is -2.*GRAS/);
  });
});

describe('GRAS', () => {
  // The worked example of Junius & Oosterhaven (2003) is not recalled reliably enough to quote its
  // numbers; these checks test the properties that define the method instead (their paper, and
  // Lenzen, Wood & Gallego 2007, from memory): signs kept, totals met, and the form
  // xᵢⱼ = rᵢ aᵢⱼ sⱼ for positive cells and aᵢⱼ / (rᵢ sⱼ) for negative ones.
  const A = [[7, 3, 5, -3], [2, 9, 8, 1], [-2, 0, 2, 1], [-10, -1, -3, 7]];
  const u = [15, 26, -1, -10];
  const v = [-3, 14, 17, 2];

  it('meets the totals, keeps every sign and zero, and has the GRAS form (Junius & Oosterhaven 2003; Lenzen et al. 2007, from memory)', () => {
    const g = gras(fromRows(A), u, v);
    expect(g.converged).toBe(true);
    expect(g.maxDeviation).toBeLessThanOrEqual(1e-10);
    const s = sums(g.X);
    s.r.forEach((x, i) => expect(x).toBeCloseTo(u[i]!, 9));
    s.c.forEach((x, j) => expect(x).toBeCloseTo(v[j]!, 9));
    // gᵢⱼ = sign(aᵢⱼ) · ln(xᵢⱼ / aᵢⱼ) is additive, ρᵢ + σⱼ, in every cell that is not zero:
    // checked on every 2 × 2 of non-zero cells without using the engine's r and s.
    const g_ = A.map((row, i) => row.map((a, j) => (a === 0 ? NaN : Math.sign(a) * Math.log(g.X.data[i * 4 + j]! / a))));
    for (let i = 0; i < 4; i++) for (let k = 0; k < 4; k++) for (let j = 0; j < 4; j++) for (let l = 0; l < 4; l++) {
      const q = g_[i]![j]! + g_[k]![l]! - g_[i]![l]! - g_[k]![j]!;
      if (Number.isFinite(q)) expect(Math.abs(q)).toBeLessThan(1e-8);
    }
    A.forEach((row, i) => row.forEach((a, j) => expect(Math.sign(g.X.data[i * 4 + j]!)).toBe(Math.sign(a))));
  });

  it('a column with only negative entries takes −n/v (the correction of Lenzen et al. 2007, from memory)', () => {
    const g = gras(fromRows([[4, -1], [2, -3]]), [2, -2], [6, -6]);
    expect(g.converged).toBe(true);
    const s = sums(g.X);
    // within the default relative tolerance 1e-10
    expect(Math.abs(s.c[1]! + 6)).toBeLessThanOrEqual(6e-10);
    expect(Math.abs(s.r[1]! + 2)).toBeLessThanOrEqual(2e-10);
  });

  it('names a row with only positive entries and a negative target', () => {
    const g = gras(fromRows([[1, 2], [-1, 3]]), [-1, 3], [0, 2], { rowCodes: ['TAX', 'X'] });
    expect(g.infeasible.map((f) => [f.kind, f.code])).toEqual([['sign-impossible', 'TAX']]);
  });

  it('on a non-negative table it is RAS', () => {
    const M = fromRows([[120, 40, 130], [55, 10, 140], [60, 180, 20]]);
    const a = ras(M, [300, 220, 280], [250, 240, 310]);
    const b = gras(M, [300, 220, 280], [250, 240, 310]);
    Array.from(a.X.data).forEach((x, k) => expect(b.X.data[k]).toBeCloseTo(x, 12));
  });
});

/** A random m × n matrix with zeros and (for GRAS) negatives, and feasible targets from a scaled copy. */
const problems = (negatives: boolean) =>
  fc.record({ m: fc.integer({ min: 1, max: 8 }), n: fc.integer({ min: 1, max: 8 }), seed: fc.integer({ min: 1, max: 2 ** 30 }) }).map(({ m, n, seed }) => {
    const r = rng(seed);
    const data = new Float64Array(m * n);
    for (let k = 0; k < m * n; k++) {
      const z = r();
      data[k] = z < 0.2 ? 0 : (negatives && z < 0.35 ? -1 : 1) * (0.1 + 10 * r());
    }
    // Targets from X* = ρ̂ P σ̂ − ρ̂⁻¹ N σ̂⁻¹ for random positive ρ, σ: feasible by construction.
    const rho = Array.from({ length: m }, () => 0.5 + 1.5 * r());
    const sig = Array.from({ length: n }, () => 0.5 + 1.5 * r());
    const u = new Array<number>(m).fill(0);
    const v = new Array<number>(n).fill(0);
    for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) {
      const a = data[i * n + j]!;
      const x = a > 0 ? rho[i]! * a * sig[j]! : a / (rho[i]! * sig[j]!);
      u[i] += x;
      v[j] += x;
    }
    return { A: { rows: m, cols: n, data }, u, v };
  });

describe('properties (fast-check)', () => {
  it('RAS keeps zeros and signs, and meets feasible totals within 1e-10', () => {
    fc.assert(
      fc.property(problems(false), ({ A, u, v }) => {
        const r = ras(A, u, v, { tolerance: 1e-11, maxIterations: 100000 });
        expect(r.infeasible).toEqual([]);
        expect(r.converged).toBe(true);
        for (let k = 0; k < A.data.length; k++) expect(Math.sign(r.X.data[k]!)).toBe(Math.sign(A.data[k]!));
        expect(r.maxDeviation).toBeLessThanOrEqual(1e-10);
      }),
      { numRuns: 100 },
    );
  });

  it('GRAS keeps zeros and signs, and meets feasible totals within 1e-10', () => {
    fc.assert(
      fc.property(problems(true), ({ A, u, v }) => {
        const g = gras(A, u, v, { tolerance: 1e-11, maxIterations: 100000 });
        expect(g.infeasible).toEqual([]);
        expect(g.converged).toBe(true);
        for (let k = 0; k < A.data.length; k++) expect(Math.sign(g.X.data[k]!)).toBe(Math.sign(A.data[k]!));
        const s = sums(g.X);
        const scale = Math.max(...u.map(Math.abs), ...v.map(Math.abs));
        s.r.forEach((x, i) => expect(Math.abs(x - u[i]!)).toBeLessThanOrEqual(1e-10 * Math.max(Math.abs(u[i]!), scale * 1e-12) * 1.0001));
        s.c.forEach((x, j) => expect(Math.abs(x - v[j]!)).toBeLessThanOrEqual(1e-10 * Math.max(Math.abs(v[j]!), scale * 1e-12) * 1.0001));
      }),
      { numRuns: 100 },
    );
  });
});
