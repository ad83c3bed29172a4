/**
 * Analytic sensitivity against central finite differences (each a full new factorisation),
 * tolerable limits against a full recompute, the ranking against a brute-force sort built on
 * ml-matrix's inverse (source: ml-matrix 6.15.1), all on the U.S. 1997 summary economy
 * (source: U.S. Bureau of Economic Analysis, Benchmark Input-Output Accounts of the United
 * States, 1997, Table 8).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../engine/errors';
import { LeontiefModel } from '../../../engine/leontief';
import type { Matrix } from '../../../engine/linalg/matrix';
import { fromRows } from '../../../engine/linalg/matrix';
import type { ResultTarget } from '../../../engine/sensitivity';
import { influentialCoefficients, leontiefDerivative, resolveTarget, sensitivity, tolerableLimits } from '../../../engine/sensitivity';
import { tornado } from '../../../engine/tornado';
import { distributionBins } from '../../../engine/bins';
import { beaAvailable } from '../../helpers/reference';
import { rng } from '../../helpers/random';
import { beaEconomy, mlLeontief } from './bea';

const hasBea = beaAvailable();

function withCell(A: Matrix, i: number, j: number, delta: number): Matrix {
  const d = A.data.slice();
  d[i * A.cols + j]! += delta;
  return { rows: A.rows, cols: A.cols, data: d };
}

/** r = c′Ld by a full new factorisation. */
function resultOf(A: Matrix, target: ResultTarget): number {
  return resolveTarget(new LeontiefModel(A), target).value;
}

/** A measure row with some spread, such as jobs per unit of output (values of our own, only weights). */
function weights(n: number, seed: number): Float64Array {
  const r = rng(seed);
  return Float64Array.from({ length: n }, () => 0.1 + r());
}

describe.skipIf(!hasBea)('derivatives of L and of results (source: U.S. BEA 1997 Table 8)', () => {
  it('the model from the recovered A reproduces the published output multipliers', () => {
    const { A, L } = beaEconomy();
    const n = A.rows;
    const m = new LeontiefModel(A).outputMultipliers();
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += L.data[i * n + j]!;
      expect(Math.abs(m[j]! - s)).toBeLessThan(1e-6);
    }
  });

  it('∂L/∂aᵢⱼ = L eᵢ eⱼ′ L agrees with central finite differences of L', () => {
    const { A } = beaEconomy();
    const model = new LeontiefModel(A);
    const n = A.rows;
    const h = 1e-6;
    for (const [i, j] of [
      [0, 0],
      [3, 17],
      [60, 2],
      [130, 129],
    ] as const) {
      const D = leontiefDerivative(model, i, j);
      const Lp = new LeontiefModel(withCell(A, i, j, h)).inverse().data;
      const Lm = new LeontiefModel(withCell(A, i, j, -h)).inverse().data;
      let worst = 0;
      let scale = 0;
      for (let k = 0; k < n * n; k++) {
        const fd = (Lp[k]! - Lm[k]!) / (2 * h);
        worst = Math.max(worst, Math.abs(fd - D.data[k]!));
        scale = Math.max(scale, Math.abs(D.data[k]!));
      }
      // Rounding in the differences is about 1e-16 · ‖L‖ / h ≈ 1e-10; truncation is O(h²).
      expect(worst / scale).toBeLessThan(1e-6);
    }
  });

  it('derivatives and elasticities of a multiplier and of an impact agree with central differences', () => {
    const { A } = beaEconomy();
    const n = A.rows;
    const model = new LeontiefModel(A);
    const c = weights(n, 11);
    const d = Float64Array.from(weights(n, 12), (v) => 100 * v);
    const targets: ResultTarget[] = [
      { kind: 'multiplier', sector: 40 },
      { kind: 'multiplier', sector: 7, c },
      { kind: 'impact', d, c },
    ];
    const r = rng(5);
    for (const target of targets) {
      const s = sensitivity(model, target);
      const base = resultOf(A, target);
      expect(Math.abs(s.value - base) / Math.abs(base)).toBeLessThan(1e-12);
      for (let t = 0; t < 6; t++) {
        const i = Math.floor(r() * n);
        const j = Math.floor(r() * n);
        const a = A.data[i * n + j]!;
        const h = 1e-6;
        const fd = (resultOf(withCell(A, i, j, h), target) - resultOf(withCell(A, i, j, -h), target)) / (2 * h);
        const g = s.derivatives.data[i * n + j]!;
        expect(Math.abs(fd - g)).toBeLessThan(1e-6 * Math.max(1, Math.abs(g)));
        const e = s.elasticities!.data[i * n + j]!;
        expect(Math.abs(e - (a * fd) / base)).toBeLessThan(1e-6 * Math.max(1e-6, Math.abs(e)));
      }
    }
  });

  it('the O(n²) ranking equals a brute-force sort of every cell built on ml-matrix (source: ml-matrix 6.15.1)', () => {
    const { A } = beaEconomy();
    const n = A.rows;
    const model = new LeontiefModel(A);
    const c = weights(n, 21);
    const d = weights(n, 22);
    const L = mlLeontief(A);
    const u = new Float64Array(n);
    const v = new Float64Array(n);
    let r = 0;
    for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) u[k] += c[i]! * L[i * n + k]!;
    for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) v[i] += L[i * n + k]! * d[k]!;
    for (let i = 0; i < n; i++) r += c[i]! * v[i]!;
    for (const by of ['elasticity', 'derivative'] as const) {
      const all: { cell: number; score: number }[] = [];
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          const g = u[i]! * v[j]!;
          all.push({ cell: i * n + j, score: Math.abs(by === 'elasticity' ? (A.data[i * n + j]! * g) / r : g) });
        }
      }
      all.sort((p, q) => q.score - p.score || p.cell - q.cell);
      const got = influentialCoefficients(model, { kind: 'impact', c, d }, { top: 15, by });
      expect(got.entries.map((e) => e.row * n + e.col)).toEqual(all.slice(0, 15).map((x) => x.cell));
      got.entries.forEach((e, q) => {
        const ref = all[q]!.score;
        const mine = by === 'elasticity' ? Math.abs(e.elasticity!) : Math.abs(e.derivative);
        expect(Math.abs(mine - ref) / ref).toBeLessThan(1e-9);
      });
    }
  });

  it('tolerable limits move the result by exactly the percentage in a full recompute (Sherman–Morrison)', () => {
    const { A } = beaEconomy();
    const n = A.rows;
    const model = new LeontiefModel(A);
    const target: ResultTarget = { kind: 'multiplier', sector: 12 };
    const base = resultOf(A, target);
    const ranked = influentialCoefficients(model, target, { top: 8, percent: 1 });
    let checked = 0;
    for (const e of ranked.entries) {
      const lim = e.limit!;
      for (const [side, sign] of [
        ['up', 1],
        ['down', -1],
      ] as const) {
        const l = lim[side];
        if (l === 'none') continue;
        expect(Math.sign(l.change)).toBe(sign);
        const after = resultOf(withCell(A, e.row, e.col, l.change), target);
        expect(Math.abs(Math.abs(after - base) / Math.abs(base) - 0.01)).toBeLessThan(1e-10);
        expect(Math.abs(after - l.result) / Math.abs(base)).toBeLessThan(1e-10);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(8);
    // The same limits come out of tolerableLimits for a list of cells.
    const again = tolerableLimits(model, target, { percent: 1, cells: ranked.entries });
    again.forEach((l, q) => expect(l).toEqual(ranked.entries[q]!.limit));
    // A zero coefficient cannot fall: its 'down' limit is 'none'.
    let zero = -1;
    for (let k = 0; k < n * n && zero < 0; k++) if (A.data[k] === 0) zero = k;
    if (zero >= 0) {
      const [l] = tolerableLimits(model, target, { percent: 1, cells: [{ row: Math.floor(zero / n), col: zero % n }] });
      expect(l!.down).toBe('none');
    }
  });
});

describe('tolerable limits in a one-sector economy, x = d / (1 − a) (common practice)', () => {
  const model = new LeontiefModel(fromRows([[0.5]]));
  const target: ResultTarget = { kind: 'impact', d: [1] };

  it('gives the exact changes worked by hand', () => {
    // r = 2. +40 %: 1 / (1 − a′) = 2.8, a′ = 1 − 1/2.8; −40 %: 1 / (1 − a′) = 1.2, a′ = 1/6.
    const [l] = tolerableLimits(model, target, { percent: 40 });
    expect(l!.up).not.toBe('none');
    expect(l!.down).not.toBe('none');
    if (l!.up !== 'none') expect(l!.up.coefficient).toBeCloseTo(1 - 1 / 2.8, 14);
    if (l!.down !== 'none') {
      expect(l!.down.coefficient).toBeCloseTo(1 / 6, 14);
      expect(l!.down.relative).toBeCloseTo((1 / 6 - 0.5) / 0.5, 14);
    }
  });

  it("reports 'none' when no admissible change moves the result that far", () => {
    // Even a = 0 only lowers r from 2 to 1 (−50 %), so −60 % cannot be reached.
    const [l] = tolerableLimits(model, target, { percent: 60 });
    expect(l!.down).toBe('none');
    expect(l!.up).not.toBe('none');
  });

  it('refuses bad input with clear errors', () => {
    expect(() => tolerableLimits(model, target, { percent: -1 })).toThrow(InputError);
    expect(() => tolerableLimits(model, target, { percent: 1, cells: [{ row: 1, col: 0 }] })).toThrow(/out of range/);
    expect(() => leontiefDerivative(model, 0, 3)).toThrow(/coefficient column index 3 is out of range/);
    expect(() => sensitivity(model, { kind: 'multiplier', sector: -1 })).toThrow(InputError);
    expect(() => sensitivity(model, { kind: 'impact', d: [1, 2] })).toThrow(/has 2 values; the model has 1/);
    expect(() => influentialCoefficients(model, { kind: 'impact', d: [0] })).toThrow(/result is 0/);
    try {
      leontiefDerivative(model, 5, 0);
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).code).toBe('index-out-of-range');
    }
  });
});

describe.skipIf(!hasBea)('tornado data (source: U.S. BEA 1997 Table 8)', () => {
  it('gives the exact result at the low and high value of each coefficient, widest bar first', () => {
    const { A } = beaEconomy();
    const model = new LeontiefModel(A);
    const target: ResultTarget = { kind: 'multiplier', sector: 30 };
    const t = tornado(model, target, { top: 6, percent: 20 });
    expect(t.bars).toHaveLength(6);
    let prev = Infinity;
    for (const b of t.bars) {
      expect(b.range).not.toBe('none');
      const range = b.range as number;
      expect(range).toBeLessThanOrEqual(prev);
      prev = range;
      for (const end of [b.low, b.high]) {
        const full = resultOf(withCell(A, b.row, b.col, end.coefficient - b.coefficient), target);
        expect(end.result).not.toBe('none');
        expect(Math.abs((end.result as number) - full) / full).toBeLessThan(1e-11);
      }
      expect(b.low.coefficient).toBeCloseTo(b.coefficient * 0.8, 15);
    }
    expect(() => tornado(model, target, { percent: 0 })).toThrow(InputError);
  });
});

describe('distribution bins', () => {
  it('count every value once, over equal widths (common practice)', () => {
    const r = rng(3);
    const v = Float64Array.from({ length: 1000 }, () => r() * 10 - 3);
    const bins = distributionBins(v, { count: 12 });
    expect(bins).toHaveLength(12);
    expect(bins.reduce((s, b) => s + b.count, 0)).toBe(1000);
    for (const b of bins) {
      const inside = Array.from(v).filter((x) => x >= b.x0 && (x < b.x1 || (b === bins[bins.length - 1] && x === b.x1))).length;
      expect(b.count).toBe(inside);
    }
    expect(distributionBins(v)).toHaveLength(Math.ceil(Math.log2(1000)) + 1);
    expect(distributionBins([2, 2, 2])).toEqual([{ x0: 2, x1: 2, count: 3 }]);
    expect(() => distributionBins([1, Number.NaN])).toThrow(/value 2 of the sample is NaN/);
    expect(() => distributionBins([1, 2], { count: 0 })).toThrow(InputError);
  });
});
