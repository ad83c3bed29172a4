/**
 * Monte Carlo on the coefficients.
 *
 * - A one-sector economy x = d / (1 − a′), a′ = a·exp(σZ − σ²/2), σ² = ln(1 + cv²): its mean,
 *   spread and percentiles are derived in the test by numerical integration over the normal
 *   density (Simpson's rule) and compared with the sample within 4 standard errors (common
 *   practice: the error of a sample mean is sd/√N, of a sample sd about √(μ₄ − σ⁴)/(2σ√N), of a
 *   sample q-quantile √(q(1 − q)/N) / f(x_q)).
 * - With cv = 0 every draw is the point result, which on the U.S. 1997 summary economy is the
 *   published output multiplier (source: U.S. Bureau of Economic Analysis, Benchmark
 *   Input-Output Accounts of the United States, 1997, Table 8).
 */
import { describe, expect, it } from 'vitest';
import { CancelledError, InputError } from '../../../engine/errors';
import { LeontiefModel } from '../../../engine/leontief';
import { fromRows } from '../../../engine/linalg/matrix';
import { perronRoot } from '../../../engine/linalg/perron';
import type { MonteCarloSpec } from '../../../engine/uncertainty';
import { drawCoefficients, mergeDrawBlocks, monteCarlo, prepareMonteCarlo, runDraws, sampleColumn } from '../../../engine/uncertainty';
import { distributionBins } from '../../../engine/bins';
import { beaAvailable } from '../../helpers/reference';
import { randomCoefficients } from '../../helpers/random';
import { beaEconomy } from './bea';

const hasBea = beaAvailable();
const phi = (z: number) => Math.exp((-z * z) / 2) / Math.sqrt(2 * Math.PI);

/** ∫ f(z) φ(z) dz over [lo, hi] by Simpson's rule with step ≈ 1e-3. */
function integrate(f: (z: number) => number, lo: number, hi: number): number {
  const m = 2 * Math.ceil((hi - lo) / 2e-3);
  const h = (hi - lo) / m;
  let s = 0;
  for (let k = 0; k <= m; k++) {
    const z = lo + k * h;
    s += (k === 0 || k === m ? 1 : k % 2 ? 4 : 2) * f(z) * phi(z);
  }
  return (s * h) / 3;
}

const Phi = (z: number) => (z < -10 ? 0 : integrate(() => 1, -10, z));

/** Φ⁻¹ by bisection on the integrated Φ. */
function PhiInv(p: number): number {
  let lo = -10;
  let hi = 10;
  for (let k = 0; k < 60; k++) {
    const mid = (lo + hi) / 2;
    if (Phi(mid) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

function oneSector(a: number, cv: number) {
  const s2 = Math.log1p(cv * cv);
  const s = Math.sqrt(s2);
  const ap = (z: number) => a * Math.exp(s * z - s2 / 2);
  const m = (z: number) => 1 / (1 - ap(z));
  const dm = (z: number) => (s * ap(z)) / (1 - ap(z)) ** 2;
  /** The draw is productive while a′ < 1, that is z < z0. */
  const z0 = (Math.log(1 / a) + s2 / 2) / s;
  return { s, m, dm, z0 };
}

describe('one-sector economy x = d / (1 − a): Monte Carlo against the analytic log-normal model', () => {
  it('mean, spread and percentiles agree within sampling error (no draw near the boundary)', () => {
    const a = 0.3;
    const cv = 0.1;
    const d = 2;
    const N = 20000;
    const { m, dm, z0 } = oneSector(a, cv);
    expect(z0).toBeGreaterThan(12); // P(a′ ≥ 1) < 1e-32: no draw is rejected in practice
    // The exact mean diverges (logarithmically) at the pole a′ = 1, z = z0 > 12, which the model
    // excludes; over |z| ≤ 10 (mass 1 − 1.5e-23) the moments below are what any sample sees.
    const E1 = integrate((z) => m(z), -10, 10);
    const E2 = integrate((z) => m(z) ** 2, -10, 10);
    const sd = Math.sqrt(E2 - E1 * E1);
    const mu4 = integrate((z) => (m(z) - E1) ** 4, -10, 10);
    const r = monteCarlo({ A: fromRows([[a]]), cv, draws: N, seed: 31, scenarios: [{ code: 'd', d: [d] }] });
    expect(r.rejected.total).toBe(0);
    expect(r.accepted).toBe(N);
    const mult = r.multipliers[0]!.bySector[0]!;
    expect(mult.point).toBeCloseTo(1 / (1 - a), 14);
    expect(Math.abs(mult.mean - E1)).toBeLessThan((4 * sd) / Math.sqrt(N));
    expect(Math.abs(mult.sd - sd)).toBeLessThan((4 * Math.sqrt(mu4 - sd ** 4)) / (2 * sd * Math.sqrt(N)));
    for (const [q, key] of [
      [0.05, 'p5'],
      [0.5, 'p50'],
      [0.95, 'p95'],
    ] as const) {
      const zq = PhiInv(q);
      const se = Math.sqrt((q * (1 - q)) / N) / (phi(zq) / dm(zq));
      expect(Math.abs(mult[key] - m(zq))).toBeLessThan(4 * se);
    }
    // The scenario's impact is d times the multiplier, draw by draw.
    const total = r.scenarios[0]!.measures[0]!.total;
    expect(total.mean).toBeCloseTo(d * mult.mean, 12);
    expect(total.p95).toBeCloseTo(d * mult.p95, 12);
  });

  it('counts and excludes the draws with a′ ≥ 1, and the percentiles are those of the truncated model', () => {
    const a = 0.8;
    const cv = 0.25;
    const N = 20000;
    const { m, dm, z0 } = oneSector(a, cv);
    const pAccept = Phi(z0);
    const r = monteCarlo({ A: fromRows([[a]]), cv, draws: N, seed: 5 });
    const rej = r.rejected.total;
    expect(r.accepted + rej).toBe(N);
    expect(r.rejected.byReason['column-sum']).toBe(rej);
    expect(Math.abs(rej - N * (1 - pAccept))).toBeLessThan(4 * Math.sqrt(N * pAccept * (1 - pAccept)));
    const f = r.findings.find((x) => x.code === 'draws-rejected')!;
    expect(f.severity).toBe('warning');
    expect(f.message).toContain(`${rej} of ${N} draws`);
    expect(r.rejected.bySector).toEqual([{ sector: '1', count: rej }]);
    // Never silently kept: every accepted draw is productive, every listed rejection is not.
    const p = prepareMonteCarlo({ A: fromRows([[a]]), cv, draws: N, seed: 5 });
    for (const k of r.samples.draws) expect(drawCoefficients(p, k)[0]!).toBeLessThan(1);
    for (const x of r.rejected.first) expect(drawCoefficients(p, x.draw)[0]!).toBeGreaterThanOrEqual(1);
    const mult = r.multipliers[0]!.bySector[0]!;
    const Nacc = r.accepted;
    for (const [q, key] of [
      [0.05, 'p5'],
      [0.5, 'p50'],
      [0.95, 'p95'],
    ] as const) {
      const zq = PhiInv(q * pAccept);
      const density = phi(zq) / (pAccept * dm(zq));
      const se = Math.sqrt((q * (1 - q)) / Nacc) / density;
      expect(Math.abs(mult[key] - m(zq))).toBeLessThan(4 * se);
    }
  });
});

describe('Monte Carlo runs', () => {
  const A = randomCoefficients(12, 8, 0.85);
  const n = 12;
  const spec: MonteCarloSpec = {
    A,
    cv: 0.15,
    draws: 300,
    seed: 2025,
    measures: [
      { code: 'output', c: new Float64Array(n).fill(1) },
      { code: 'jobs', unit: 'jobs', c: Float64Array.from({ length: n }, (_, i) => 0.5 + (i % 3)) },
    ],
    scenarios: [{ code: 'plant', d: Float64Array.from({ length: n }, (_, i) => (i === 3 ? 100 : i === 7 ? 20 : 0)) }],
  };

  it('the same seed gives identical draws; another seed does not', () => {
    const a = monteCarlo(spec);
    const b = monteCarlo(spec);
    expect(b.samples.data).toEqual(a.samples.data);
    expect(b.multipliers).toEqual(a.multipliers);
    const c = monteCarlo({ ...spec, seed: 2026 });
    expect(c.samples.data).not.toEqual(a.samples.data);
  });

  it('draws split into ranges and merged equal the single run, bit for bit', () => {
    const whole = monteCarlo(spec);
    const p = prepareMonteCarlo(spec);
    const blocks = [runDraws(p, 170, 300), runDraws(p, 0, 1), runDraws(p, 1, 170)];
    const merged = mergeDrawBlocks(spec, blocks);
    expect(merged.samples.data).toEqual(whole.samples.data);
    expect(merged.scenarios).toEqual(whole.scenarios);
    expect(() => mergeDrawBlocks(spec, [blocks[0]!, blocks[1]!])).toThrow(/do not cover/);
  });

  it('the scenario total is the sum of its sector impacts in every draw, and measures are c′L', () => {
    const r = monteCarlo(spec);
    const tot = sampleColumn(r, { measure: 'jobs', scenario: 'plant' });
    const parts = Array.from({ length: n }, (_, i) => sampleColumn(r, { measure: 'jobs', scenario: 'plant', sector: i }));
    for (let k = 0; k < r.accepted; k++) {
      let s = 0;
      for (const p of parts) s += p[k]!;
      expect(Math.abs(s - tot[k]!)).toBeLessThan(1e-9 * Math.abs(tot[k]!));
    }
    // Check one draw against a full model of its coefficients.
    const p = prepareMonteCarlo(spec);
    const k0 = r.samples.draws[10]!;
    const model = new LeontiefModel({ rows: n, cols: n, data: drawCoefficients(p, k0) });
    const jobs = model.weighted(spec.measures![1]!.c);
    const got = sampleColumn(r, { measure: 'jobs', sector: '5' });
    expect(got[10]).toBeCloseTo(jobs[4]!, 12);
    for (const b of distributionBins(tot)) expect(b.x1).toBeGreaterThanOrEqual(b.x0);
  });

  it('keeps the mean of every coefficient and its coefficient of variation (log-normal moments, common practice)', () => {
    const cv = fromRows([
      [0.1, 0.3, 0],
      [0.2, 0.05, 0.4],
      [0.5, 0, 0.15],
    ]);
    const A3 = fromRows([
      [0.2, 0.1, 0.05],
      [0.1, 0.3, 0.1],
      [0.05, 0.2, 0.1],
    ]);
    const p = prepareMonteCarlo({ A: A3, cv, draws: 1, seed: 1 });
    const N = 20000;
    const sum = new Float64Array(9);
    const sum2 = new Float64Array(9);
    for (let k = 0; k < N; k++) {
      const a = drawCoefficients(p, k);
      for (let q = 0; q < 9; q++) {
        const ratio = a[q]! / A3.data[q]!;
        sum[q] += ratio;
        sum2[q] += ratio * ratio;
      }
    }
    for (let q = 0; q < 9; q++) {
      const c = cv.data[q]!;
      const mean = sum[q]! / N;
      const v = sum2[q]! / N - mean * mean;
      if (c === 0) {
        expect(v).toBe(0);
        continue;
      }
      expect(Math.abs(mean - 1)).toBeLessThan((4 * c) / Math.sqrt(N));
      // R = exp(σZ − σ²/2) has E[Rᵏ] = exp(k(k − 1)σ²/2), so μ₄ = e^{6σ²} − 4e^{3σ²} + 6e^{σ²} − 3.
      const s2 = Math.log1p(c * c);
      const mu4 = Math.exp(6 * s2) - 4 * Math.exp(3 * s2) + 6 * Math.exp(s2) - 3;
      expect(Math.abs(Math.sqrt(v) - c)).toBeLessThan((4 * Math.sqrt(mu4 - c ** 4)) / (2 * c * Math.sqrt(N)));
    }
  });

  it('reports progress after each draw and stops with CancelledError when asked', () => {
    const seen: number[] = [];
    monteCarlo({ ...spec, draws: 25 }, { onProgress: (done, total) => (expect(total).toBe(25), seen.push(done)) });
    expect(seen).toEqual(Array.from({ length: 25 }, (_, k) => k + 1));
    const signal = { aborted: false };
    let count = 0;
    expect(() =>
      monteCarlo(spec, {
        signal,
        onProgress: () => {
          if (++count === 7) signal.aborted = true;
        },
      }),
    ).toThrow(CancelledError);
    expect(count).toBe(7);
  });

  it("under the 'perron' rule a productive table with a column sum above 1 runs, and only unproductive draws go", () => {
    // Column 2 sums to 1.2, yet ρ = 0.25 + √0.0925 ≈ 0.554 (common practice: 2 × 2 eigenvalues).
    const B = fromRows([
      [0.2, 0.9],
      [0.1, 0.3],
    ]);
    expect(() => monteCarlo({ A: B, cv: 0.1, draws: 10, seed: 1 })).toThrow(/sum to 1.2.*column-sum rule/);
    const r = monteCarlo({ A: B, cv: 0.6, draws: 2000, seed: 1, productivity: 'perron' });
    expect(r.rejected.byReason['column-sum']).toBe(0);
    expect(r.rejected.byReason.perron).toBeGreaterThan(0);
    const p = prepareMonteCarlo({ A: B, cv: 0.6, draws: 2000, seed: 1, productivity: 'perron' });
    for (const x of r.rejected.first) {
      expect(perronRoot({ rows: 2, cols: 2, data: drawCoefficients(p, x.draw) }).estimate).toBeGreaterThanOrEqual(1 - 1e-9);
    }
    for (const k of r.samples.draws.subarray(0, 200)) {
      expect(perronRoot({ rows: 2, cols: 2, data: drawCoefficients(p, k) }).upper).toBeLessThan(1);
    }
  });

  it('refuses bad input with clear errors', () => {
    const code = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        return (e as InputError).code;
      }
      return 'no error';
    };
    expect(code(() => monteCarlo({ ...spec, cv: -0.1 }))).toBe('negative-cv');
    expect(() => monteCarlo({ ...spec, cv: Float64Array.from({ length: n }, (_, j) => (j === 4 ? -1 : 0.1)) })).toThrow(/column 5/);
    expect(() => monteCarlo({ ...spec, cv: [0.1, 0.2] })).toThrow(/2 per-column coefficients of variation for 12 sectors/);
    expect(code(() => monteCarlo({ ...spec, draws: 0 }))).toBe('bad-draws');
    expect(() => monteCarlo({ ...spec, draws: 0 })).toThrow(/at least 1 draw/);
    expect(code(() => monteCarlo({ ...spec, draws: 2.5 }))).toBe('bad-draws');
    expect(code(() => monteCarlo({ ...spec, seed: -3 }))).toBe('bad-seed');
    expect(code(() => monteCarlo({ ...spec, measures: [{ code: 'x', c: [1, 2] }] }))).toBe('bad-size');
    expect(code(() => monteCarlo({ ...spec, scenarios: [{ code: 's', d: new Float64Array(n).fill(Number.NaN) }] }))).toBe('non-finite');
    expect(code(() => runDraws(spec, 0, 301))).toBe('bad-range');
    const r = monteCarlo({ ...spec, draws: 5 });
    expect(code(() => sampleColumn(r, { measure: 'water', sector: 0 }))).toBe('unknown-measure');
    expect(code(() => sampleColumn(r, { measure: 'output', sector: 12 }))).toBe('unknown-sector');
    expect(r.findings.some((f) => f.code === 'few-draws')).toBe(true);
  });
});

describe.skipIf(!hasBea)('cv = 0 gives the point result (source: U.S. BEA 1997 Table 8)', () => {
  it('every percentile equals the point result, which is the published output multiplier', () => {
    const { A, L, codes } = beaEconomy();
    const n = A.rows;
    const d = new Float64Array(n);
    d[5] = 1000;
    d[80] = 250;
    const r = monteCarlo({ A, cv: 0, draws: 3, seed: 4, sectors: codes, scenarios: [{ code: 's', d }] });
    expect(r.accepted).toBe(3);
    const point = new LeontiefModel(A).outputMultipliers();
    r.multipliers[0]!.bySector.forEach((s, j) => {
      for (const v of [s.p5, s.p50, s.p95, s.mean, s.min, s.max]) expect(v).toBe(s.point);
      expect(s.sd).toBe(0);
      expect(s.point).toBe(point[j]);
      let published = 0;
      for (let i = 0; i < n; i++) published += L.data[i * n + j]!;
      expect(Math.abs(s.point - published)).toBeLessThan(1e-6);
    });
    const t = r.scenarios[0]!.measures[0]!.total;
    expect(t.p5).toBe(t.point);
    expect(t.p95).toBe(t.point);
  });
});
