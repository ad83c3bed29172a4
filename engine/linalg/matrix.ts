/**
 * Dense row-major matrices: the one shape every matrix in the engine travels in.
 *
 * Element (i, j) of an `rows × cols` matrix lives at `data[i * cols + j]`.
 */
import { InputError } from '../errors';

export interface Matrix {
  rows: number;
  cols: number;
  data: Float64Array;
}

/** A new `rows × cols` matrix of zeros. */
export function zeros(rows: number, cols: number): Matrix {
  if (!Number.isInteger(rows) || !Number.isInteger(cols) || rows < 0 || cols < 0) {
    throw new InputError('bad-size', `a matrix needs whole, non-negative sizes; got ${rows} × ${cols}`);
  }
  return { rows, cols, data: new Float64Array(rows * cols) };
}

/** The `n × n` identity. */
export function identity(n: number): Matrix {
  const m = zeros(n, n);
  for (let i = 0; i < n; i++) m.data[i * n + i] = 1;
  return m;
}

/** Wrap existing row-major data, checking its length. */
export function matrix(rows: number, cols: number, data: Float64Array | ArrayLike<number>): Matrix {
  if (data.length !== rows * cols) {
    throw new InputError('bad-size', `a ${rows} × ${cols} matrix needs ${rows * cols} values; got ${data.length}`);
  }
  return { rows, cols, data: data instanceof Float64Array ? data : Float64Array.from(data) };
}

/**
 * A matrix from an array of rows. Every row must have the same length (a ragged input is an
 * `InputError` naming the first short or long row, counted from 1).
 *
 * @example fromRows([[1, 2], [3, 4]]) // { rows: 2, cols: 2, data: [1, 2, 3, 4] }
 */
export function fromRows(rows: ArrayLike<ArrayLike<number>>, what = 'matrix'): Matrix {
  const r = rows.length;
  const c = r === 0 ? 0 : rows[0]!.length;
  const m = zeros(r, c);
  for (let i = 0; i < r; i++) {
    const row = rows[i]!;
    if (row.length !== c) {
      throw new InputError(
        'ragged',
        `${what}: row ${i + 1} has ${row.length} values where row 1 has ${c}; every row must have the same length`,
        { row: i + 1 },
      );
    }
    for (let j = 0; j < c; j++) m.data[i * c + j] = row[j]!;
  }
  return m;
}

/** An array of plain rows (for JSON, tests and display). */
export function toRows(m: Matrix): number[][] {
  const out: number[][] = [];
  for (let i = 0; i < m.rows; i++) out.push(Array.from(m.data.subarray(i * m.cols, (i + 1) * m.cols)));
  return out;
}

export function clone(m: Matrix): Matrix {
  return { rows: m.rows, cols: m.cols, data: m.data.slice() };
}

export function get(m: Matrix, i: number, j: number): number {
  return m.data[i * m.cols + j]!;
}

/** Row `i` as a view (no copy). */
export function row(m: Matrix, i: number): Float64Array {
  return m.data.subarray(i * m.cols, (i + 1) * m.cols);
}

/** Column `j` as a new array. */
export function column(m: Matrix, j: number): Float64Array {
  const out = new Float64Array(m.rows);
  for (let i = 0; i < m.rows; i++) out[i] = m.data[i * m.cols + j]!;
  return out;
}

export function transpose(m: Matrix): Matrix {
  const { rows, cols, data } = m;
  const t = zeros(cols, rows);
  const td = t.data;
  const B = 32;
  for (let ii = 0; ii < rows; ii += B) {
    const ie = Math.min(ii + B, rows);
    for (let jj = 0; jj < cols; jj += B) {
      const je = Math.min(jj + B, cols);
      for (let i = ii; i < ie; i++) {
        for (let j = jj; j < je; j++) td[j * rows + i] = data[i * cols + j]!;
      }
    }
  }
  return t;
}

/** y = M x. */
export function matVec(m: Matrix, x: ArrayLike<number>, out = new Float64Array(m.rows)): Float64Array {
  const { rows, cols, data } = m;
  for (let i = 0; i < rows; i++) {
    let s = 0;
    const o = i * cols;
    for (let j = 0; j < cols; j++) s += data[o + j]! * x[j]!;
    out[i] = s;
  }
  return out;
}

/** y = x′ M (a row vector times a matrix). */
export function vecMat(x: ArrayLike<number>, m: Matrix, out = new Float64Array(m.cols)): Float64Array {
  const { rows, cols, data } = m;
  out.fill(0);
  for (let i = 0; i < rows; i++) {
    const xi = x[i]!;
    if (xi === 0) continue;
    const o = i * cols;
    for (let j = 0; j < cols; j++) out[j] += xi * data[o + j]!;
  }
  return out;
}

/** C = A B, with an i-k-j loop so the inner loop runs along rows. */
export function matMul(a: Matrix, b: Matrix): Matrix {
  if (a.cols !== b.rows) {
    throw new InputError('bad-size', `cannot multiply ${a.rows} × ${a.cols} by ${b.rows} × ${b.cols}`);
  }
  const n = a.rows;
  const p = a.cols;
  const m = b.cols;
  const c = zeros(n, m);
  const ad = a.data;
  const bd = b.data;
  const cd = c.data;
  for (let i = 0; i < n; i++) {
    const ci = i * m;
    for (let k = 0; k < p; k++) {
      const aik = ad[i * p + k]!;
      if (aik === 0) continue;
      const bk = k * m;
      for (let j = 0; j < m; j++) cd[ci + j] += aik * bd[bk + j]!;
    }
  }
  return c;
}

/** Column sums (i′M). */
export function colSums(m: Matrix): Float64Array {
  const out = new Float64Array(m.cols);
  for (let i = 0; i < m.rows; i++) {
    const o = i * m.cols;
    for (let j = 0; j < m.cols; j++) out[j] += m.data[o + j]!;
  }
  return out;
}

/** Row sums (M i). */
export function rowSums(m: Matrix): Float64Array {
  const out = new Float64Array(m.rows);
  for (let i = 0; i < m.rows; i++) {
    let s = 0;
    const o = i * m.cols;
    for (let j = 0; j < m.cols; j++) s += m.data[o + j]!;
    out[i] = s;
  }
  return out;
}

/** M diag(d): scale column j by d[j]. */
export function scaleCols(m: Matrix, d: ArrayLike<number>): Matrix {
  const out = clone(m);
  for (let i = 0; i < m.rows; i++) {
    const o = i * m.cols;
    for (let j = 0; j < m.cols; j++) out.data[o + j]! *= d[j]!;
  }
  return out;
}

/** diag(d) M: scale row i by d[i]. */
export function scaleRows(m: Matrix, d: ArrayLike<number>): Matrix {
  const out = clone(m);
  for (let i = 0; i < m.rows; i++) {
    const o = i * m.cols;
    const di = d[i]!;
    for (let j = 0; j < m.cols; j++) out.data[o + j]! *= di;
  }
  return out;
}

/** I − M for a square M. */
export function identityMinus(m: Matrix): Matrix {
  const n = m.rows;
  if (m.cols !== n) throw new InputError('not-square', `I − M needs a square matrix; got ${m.rows} × ${m.cols}`);
  const out = zeros(n, n);
  for (let k = 0; k < n * n; k++) out.data[k] = -m.data[k]!;
  for (let i = 0; i < n; i++) out.data[i * n + i]! += 1;
  return out;
}

/** The largest absolute column sum (the matrix 1-norm). */
export function norm1(m: Matrix): number {
  const s = new Float64Array(m.cols);
  for (let i = 0; i < m.rows; i++) {
    const o = i * m.cols;
    for (let j = 0; j < m.cols; j++) s[j] += Math.abs(m.data[o + j]!);
  }
  let best = 0;
  for (let j = 0; j < m.cols; j++) if (s[j]! > best) best = s[j]!;
  return best;
}

/** The largest absolute row sum (the matrix ∞-norm). */
export function normInf(m: Matrix): number {
  let best = 0;
  for (let i = 0; i < m.rows; i++) {
    let s = 0;
    const o = i * m.cols;
    for (let j = 0; j < m.cols; j++) s += Math.abs(m.data[o + j]!);
    if (s > best) best = s;
  }
  return best;
}

/** The largest absolute difference between two matrices of the same shape. */
export function maxAbsDiff(a: Matrix, b: Matrix): number {
  if (a.rows !== b.rows || a.cols !== b.cols) {
    throw new InputError('bad-size', `cannot compare ${a.rows} × ${a.cols} with ${b.rows} × ${b.cols}`);
  }
  let d = 0;
  for (let k = 0; k < a.data.length; k++) {
    const e = Math.abs(a.data[k]! - b.data[k]!);
    if (e > d || Number.isNaN(e)) d = e;
  }
  return d;
}

/** Copy rows `r` and columns `c` (index lists) into a new matrix. */
export function submatrix(m: Matrix, r: ArrayLike<number>, c: ArrayLike<number>): Matrix {
  const out = zeros(r.length, c.length);
  for (let i = 0; i < r.length; i++) {
    const o = r[i]! * m.cols;
    for (let j = 0; j < c.length; j++) out.data[i * c.length + j] = m.data[o + c[j]!]!;
  }
  return out;
}
