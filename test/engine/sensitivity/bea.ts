/**
 * The U.S. 1997 summary economy as technical coefficients, for the sensitivity tests
 * (source: U.S. Bureau of Economic Analysis, Benchmark Input-Output Accounts of the United
 * States, 1997, Table 8, industry-by-industry total requirements, read in place).
 *
 * The agency publishes L = (I − A)⁻¹ (131 industries, 7 decimals); A is recovered here as
 * I − L⁻¹ with ml-matrix, an independent general-purpose library. Rounding in the published
 * table leaves entries of order 1e-8 below zero; they are kept as they are.
 */
import { Matrix as MlMatrix, inverse as mlInverse } from 'ml-matrix';
import type { Matrix } from '../../../engine/linalg/matrix';
import { dense, readTriplets, uniq } from '../../helpers/reference';

export interface BeaEconomy {
  codes: string[];
  /** Published L (Table 8). */
  L: Matrix;
  /** A = I − L⁻¹. */
  A: Matrix;
}

let cached: BeaEconomy | undefined;

export function beaEconomy(): BeaEconomy {
  if (cached) return cached;
  const t = readTriplets('total-requirements-industry-by-industry.txt', 4);
  const codes = uniq(t.map((x) => x.row));
  const L = dense(t, codes, codes);
  const n = codes.length;
  const rows: number[][] = [];
  for (let i = 0; i < n; i++) rows.push(Array.from(L.data.subarray(i * n, (i + 1) * n)));
  const Li = mlInverse(new MlMatrix(rows));
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) A[i * n + j] = (i === j ? 1 : 0) - Li.get(i, j);
  cached = { codes, L, A: { rows: n, cols: n, data: A } };
  return cached;
}

/** ml-matrix's inverse of I − A, as an independent path (row-major data). */
export function mlLeontief(A: Matrix): Float64Array {
  const n = A.rows;
  const rows: number[][] = [];
  for (let i = 0; i < n; i++) {
    const r: number[] = [];
    for (let j = 0; j < n; j++) r.push((i === j ? 1 : 0) - A.data[i * n + j]!);
    rows.push(r);
  }
  return Float64Array.from(mlInverse(new MlMatrix(rows)).to1DArray());
}
