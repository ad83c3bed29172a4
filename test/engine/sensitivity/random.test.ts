/**
 * The seeded generator: reproducible, distinct streams per draw, and the right distributions:
 * Kolmogorov–Smirnov statistics √N·D of independent streams against the uniform and the
 * standard normal follow Kolmogorov's distribution (mean 0.8687, 5 % critical value 1.358;
 * common practice, from memory).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../engine/errors';
import { Random, drawStream } from '../../../engine/random';

/** Φ by Simpson's rule on the normal density from 0 (error far below 1e-12 with this step). */
function Phi(z: number): number {
  const m = 2 * Math.max(10, Math.ceil(Math.abs(z) * 100));
  const h = z / m;
  let s = 0;
  for (let k = 0; k <= m; k++) {
    const t = k * h;
    const w = k === 0 || k === m ? 1 : k % 2 ? 4 : 2;
    s += w * Math.exp((-t * t) / 2);
  }
  return 0.5 + ((h / 3) * s) / Math.sqrt(2 * Math.PI);
}

function ks(sample: Float64Array, cdf: (x: number) => number): number {
  const x = sample.slice().sort();
  const N = x.length;
  let d = 0;
  for (let k = 0; k < N; k++) {
    const F = cdf(x[k]!);
    d = Math.max(d, Math.abs(F - k / N), Math.abs((k + 1) / N - F));
  }
  return d;
}

describe('seeded random numbers', () => {
  it('the same seed and stream give the same numbers; other streams and seeds differ', () => {
    const a = new Random(123, 4);
    const b = new Random(123, 4);
    const xs = Array.from({ length: 100 }, () => a.normal());
    const ys = Array.from({ length: 100 }, () => b.normal());
    expect(xs).toEqual(ys);
    expect(drawStream(123, 4).uint32()).toBe(new Random(123, 4).uint32());
    expect(new Random(123, 5).uint32()).not.toBe(new Random(123, 4).uint32());
    expect(new Random(124, 4).uint32()).not.toBe(new Random(123, 4).uint32());
    // Large seeds use their high bits too.
    expect(new Random(2 ** 40, 0).uint32()).not.toBe(new Random(0, 0).uint32());
  });

  it('draw streams of one seed never start in the same state', () => {
    const first = new Set<number>();
    for (let k = 0; k < 20000; k++) {
      const r = new Random(99, k);
      first.add(r.uint32() * 4294967296 + r.uint32());
    }
    expect(first.size).toBe(20000);
  });

  it('uniform and normal draws follow their distributions (Kolmogorov–Smirnov over 10 streams)', () => {
    const N = 20000;
    const streams = 10;
    for (const kind of ['uniform', 'normal'] as const) {
      const stats: number[] = [];
      for (let k = 0; k < streams; k++) {
        const r = new Random(2024, k);
        const x = Float64Array.from({ length: N }, () => (kind === 'uniform' ? r.uniform() : r.normal()));
        if (kind === 'uniform') for (const v of x) expect(v >= 0 && v < 1).toBe(true);
        stats.push(Math.sqrt(N) * ks(x, kind === 'uniform' ? (v) => v : Phi));
      }
      // The mean of 10 statistics has sd ≈ 0.26 / √10 ≈ 0.082: allow 4 sd around 0.8687.
      const mean = stats.reduce((a, b) => a + b, 0) / streams;
      expect(Math.abs(mean - 0.8687)).toBeLessThan(4 * 0.082);
      // Each passes at 5 % with probability 0.95: more than 4 failures of 10 has probability < 0.001.
      expect(stats.filter((d) => d > 1.358).length).toBeLessThanOrEqual(4);
    }
    const r = new Random(2024, 99);
    const z = Float64Array.from({ length: N }, () => r.normal());
    let m = 0;
    for (const v of z) m += v;
    m /= N;
    let s2 = 0;
    for (const v of z) s2 += (v - m) ** 2;
    s2 /= N - 1;
    expect(Math.abs(m)).toBeLessThan(4 / Math.sqrt(N));
    expect(Math.abs(s2 - 1)).toBeLessThan(4 * Math.sqrt(2 / N));
  });

  it('refuses a seed that is not a whole number', () => {
    expect(() => new Random(1.5)).toThrow(InputError);
    expect(() => new Random(-1)).toThrow(/seed must be a whole number/);
    expect(() => new Random(1, Number.NaN)).toThrow(/stream index/);
  });
});
