/** Small seeded generators for tests (mulberry32; common practice for reproducible test data). */
import type { Matrix } from '../../engine/linalg/matrix';

export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A random dense n × n matrix with entries in [-0.5, 0.5) plus `diag` on the diagonal. */
export function randomMatrix(n: number, seed: number, diag = 0): Matrix {
  const r = rng(seed);
  const data = new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) data[i] = r() - 0.5;
  for (let i = 0; i < n; i++) data[i * n + i] += diag;
  return { rows: n, cols: n, data };
}

/**
 * Random productive technical coefficients: nonnegative, each column summing to at most
 * `maxColSum` (< 1), with a share `density` of nonzero cells.
 */
export function randomCoefficients(n: number, seed: number, maxColSum = 0.8, density = 1): Matrix {
  const r = rng(seed);
  const data = new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) data[i] = r() < density ? r() : 0;
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += data[i * n + j]!;
    const target = maxColSum * (0.3 + 0.7 * r());
    if (s > 0) for (let i = 0; i < n; i++) data[i * n + j] = (data[i * n + j]! * target) / s;
  }
  return { rows: n, cols: n, data };
}
