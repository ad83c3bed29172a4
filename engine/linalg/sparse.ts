/**
 * Compressed sparse row (CSR) storage for large, mostly empty matrices (multi-regional tables
 * below about 10% density), and the products the iterative solves need.
 *
 * Row i holds the entries `values[rowPtr[i] .. rowPtr[i+1])` in the columns
 * `colIdx[rowPtr[i] .. rowPtr[i+1])`, columns increasing within a row.
 *
 * @example
 * const s = toCSR(fromRows([[1, 0], [0, 2]]));   // nnz 2
 * csrMatVec(s, Float64Array.of(3, 4));           // [3, 8]
 */
import { InputError } from '../errors';
import type { Matrix } from './matrix';

export interface CSR {
  rows: number;
  cols: number;
  rowPtr: Int32Array;
  colIdx: Int32Array;
  values: Float64Array;
}

/** The density below which the large-table solves store coefficients sparsely (10%). */
export const SPARSE_BELOW = 0.1;

/** Number of stored entries. */
export function nnz(s: CSR): number {
  return s.rowPtr[s.rows]!;
}

/** The share of nonzero cells of a dense matrix (0 for an empty one). */
export function density(m: Matrix): number {
  const { data } = m;
  let c = 0;
  for (let k = 0; k < data.length; k++) if (data[k] !== 0) c++;
  return data.length ? c / data.length : 0;
}

/**
 * The CSR form of a dense matrix, optionally scaling column j by `colScale[j]` on the way
 * (so that A = Z x̂⁻¹ goes straight from Z to sparse storage without a dense A).
 */
export function toCSR(m: Matrix, colScale?: ArrayLike<number>): CSR {
  const { rows, cols, data } = m;
  if (colScale && colScale.length !== cols) {
    throw new InputError('bad-size', `the column scale has ${colScale.length} values for ${cols} columns`);
  }
  let count = 0;
  for (let k = 0; k < data.length; k++) if (data[k] !== 0) count++;
  const rowPtr = new Int32Array(rows + 1);
  const colIdx = new Int32Array(count);
  const values = new Float64Array(count);
  let q = 0;
  for (let i = 0; i < rows; i++) {
    const o = i * cols;
    for (let j = 0; j < cols; j++) {
      const v = data[o + j]!;
      if (v === 0) continue;
      colIdx[q] = j;
      values[q] = colScale ? v * colScale[j]! : v;
      q++;
    }
    rowPtr[i + 1] = q;
  }
  return { rows, cols, rowPtr, colIdx, values };
}

/** The dense form (for tests and small matrices). */
export function csrToDense(s: CSR): Matrix {
  const data = new Float64Array(s.rows * s.cols);
  for (let i = 0; i < s.rows; i++) {
    for (let q = s.rowPtr[i]!; q < s.rowPtr[i + 1]!; q++) data[i * s.cols + s.colIdx[q]!] = s.values[q]!;
  }
  return { rows: s.rows, cols: s.cols, data };
}

/**
 * A CSR matrix from (row, column, value) triplets in any order; duplicates are added
 * together, exact zeros are kept out.
 */
export function fromTriplets(rows: number, cols: number, ri: ArrayLike<number>, ci: ArrayLike<number>, v: ArrayLike<number>): CSR {
  const n = ri.length;
  if (ci.length !== n || v.length !== n) throw new InputError('bad-size', 'triplets need equal numbers of rows, columns and values');
  const count = new Int32Array(rows + 1);
  for (let k = 0; k < n; k++) {
    const i = ri[k]!;
    const j = ci[k]!;
    if (!(i >= 0 && i < rows && j >= 0 && j < cols && Number.isInteger(i) && Number.isInteger(j))) {
      throw new InputError('bad-index', `triplet ${k + 1} is at (${i + 1}, ${j + 1}), outside the ${rows} × ${cols} matrix`);
    }
    count[i + 1]!++;
  }
  for (let i = 0; i < rows; i++) count[i + 1]! += count[i]!;
  const next = count.slice(0, rows);
  const cj = new Int32Array(n);
  const cv = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const q = next[ri[k]!]!++;
    cj[q] = ci[k]!;
    cv[q] = v[k]!;
  }
  // Sort each row by column and merge duplicates.
  const rowPtr = new Int32Array(rows + 1);
  let out = 0;
  for (let i = 0; i < rows; i++) {
    const s = count[i]!;
    const e = count[i + 1]!;
    const order = Array.from({ length: e - s }, (_, t) => s + t).sort((a, b) => cj[a]! - cj[b]!);
    let last = -1;
    for (const q of order) {
      if (cj[q] === last) cv[out - 1]! += cv[q]!;
      else {
        cj[out] = cj[q]!;
        cv[out] = cv[q]!;
        last = cj[q]!;
        out++;
      }
    }
    // Drop entries that summed to zero.
    let w = rowPtr[i]!;
    for (let q = rowPtr[i]!; q < out; q++) {
      if (cv[q] !== 0) {
        cj[w] = cj[q]!;
        cv[w] = cv[q]!;
        w++;
      }
    }
    out = w;
    rowPtr[i + 1] = out;
  }
  return { rows, cols, rowPtr, colIdx: cj.slice(0, out), values: cv.slice(0, out) };
}

/** y = S x. */
export function csrMatVec(s: CSR, x: ArrayLike<number>, out: Float64Array = new Float64Array(s.rows)): Float64Array {
  const { rows, rowPtr, colIdx, values } = s;
  for (let i = 0; i < rows; i++) {
    let acc = 0;
    const e = rowPtr[i + 1]!;
    for (let q = rowPtr[i]!; q < e; q++) acc += values[q]! * x[colIdx[q]!]!;
    out[i] = acc;
  }
  return out;
}

/** y = S′ x (equivalently the row vector x′S). */
export function csrVecMat(x: ArrayLike<number>, s: CSR, out: Float64Array = new Float64Array(s.cols)): Float64Array {
  const { rows, rowPtr, colIdx, values } = s;
  out.fill(0);
  for (let i = 0; i < rows; i++) {
    const xi = x[i]!;
    if (xi === 0) continue;
    const e = rowPtr[i + 1]!;
    for (let q = rowPtr[i]!; q < e; q++) out[colIdx[q]!]! += values[q]! * xi;
  }
  return out;
}

/** The transpose, in CSR. */
export function csrTranspose(s: CSR): CSR {
  const { rows, cols, rowPtr, colIdx, values } = s;
  const count = new Int32Array(cols + 1);
  const total = rowPtr[rows]!;
  for (let q = 0; q < total; q++) count[colIdx[q]! + 1]!++;
  for (let j = 0; j < cols; j++) count[j + 1]! += count[j]!;
  const next = count.slice(0, cols);
  const ci = new Int32Array(total);
  const cv = new Float64Array(total);
  for (let i = 0; i < rows; i++) {
    for (let q = rowPtr[i]!; q < rowPtr[i + 1]!; q++) {
      const p = next[colIdx[q]!]!++;
      ci[p] = i;
      cv[p] = values[q]!;
    }
  }
  return { rows: cols, cols: rows, rowPtr: count, colIdx: ci, values: cv };
}

/** Column sums of a CSR matrix (i′S). */
export function csrColSums(s: CSR): Float64Array {
  const out = new Float64Array(s.cols);
  const total = nnz(s);
  for (let q = 0; q < total; q++) out[s.colIdx[q]!]! += s.values[q]!;
  return out;
}

/** Row sums of a CSR matrix (S i). */
export function csrRowSums(s: CSR): Float64Array {
  const out = new Float64Array(s.rows);
  for (let i = 0; i < s.rows; i++) {
    let acc = 0;
    for (let q = s.rowPtr[i]!; q < s.rowPtr[i + 1]!; q++) acc += s.values[q]!;
    out[i] = acc;
  }
  return out;
}
