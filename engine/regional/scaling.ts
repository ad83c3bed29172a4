/**
 * The biproportional scaling that RAS and GRAS share: X = r̂ P ŝ − r̂⁻¹ N ŝ⁻¹ for the positive
 * part P and the absolute negative part N of a matrix (A = P − N), to row totals u and column
 * totals v. With N = 0 this is RAS (Stone; Bacharach 1970); with N ≠ 0 it is GRAS (Junius &
 * Oosterhaven 2003) in the form of Lenzen, Wood & Gallego (2007) as written out by Temurshoev,
 * Miller & Bouwmeester (2013) (from memory):
 *
 *     sⱼ = (vⱼ + √(vⱼ² + 4 pⱼ(r) nⱼ(r))) / (2 pⱼ(r)),   pⱼ(r) = Σᵢ pᵢⱼ rᵢ,  nⱼ(r) = Σᵢ nᵢⱼ / rᵢ
 *     rᵢ = (uᵢ + √(uᵢ² + 4 pᵢ(s) nᵢ(s))) / (2 pᵢ(s)),   pᵢ(s) = Σⱼ pᵢⱼ sⱼ,  nᵢ(s) = Σⱼ nᵢⱼ / sⱼ
 *
 * the positive root of pⱼ sⱼ² − vⱼ sⱼ − nⱼ = 0 (so column j sums to vⱼ), taken in the form
 * 2nⱼ / (√D − vⱼ) when vⱼ < 0 to avoid cancellation; where pⱼ = 0 (only negative entries) the
 * correction of Lenzen et al. gives sⱼ = −nⱼ / vⱼ. Zeros stay zero and every entry keeps its sign.
 *
 * Cells held fixed keep their values: their sums come off the targets and the rest is scaled.
 * Targets that cannot be met are found before any iteration and named: a row or column with no
 * entries to scale and a target other than 0, one with only positive entries and a negative
 * target (or only negative and a positive one), and row and column totals that disagree.
 *
 * Work per iteration is two passes over the dense positive part (row-major Float64Array, one
 * loop per row) and two over the negative entries kept in compressed rows.
 */
import { InputError } from '../errors';
import type { Finding } from '../findings';
import type { Matrix } from '../linalg/matrix';

export type BalanceMethod = 'ras' | 'gras';

export interface BalanceOptions {
  /** Stop when every row and column sum is within this relative deviation of its target (default 1e-10). */
  tolerance?: number;
  /** At most this many iterations (default 10 000). */
  maxIterations?: number;
  /** Cells held at their given values: 1 for fixed, row-major (rows × cols). */
  fixed?: Uint8Array;
  /** Row and column names, for messages. */
  rowCodes?: string[];
  colCodes?: string[];
  /** Called after each iteration with the largest relative deviation. */
  onIteration?: (iteration: number, deviation: number) => void;
}

export type InfeasibleKind = 'empty-with-target' | 'sign-impossible' | 'totals-disagree' | 'not-finite';

export interface Infeasible {
  kind: InfeasibleKind;
  axis: 'row' | 'column' | 'both';
  /** 0-based index (−1 for `totals-disagree`). */
  index: number;
  code: string;
  message: string;
}

export interface BalanceResult {
  method: BalanceMethod;
  X: Matrix;
  /** Row and column multipliers. */
  r: Float64Array;
  s: Float64Array;
  iterations: number;
  converged: boolean;
  /** The largest relative deviation of a row or column sum of X from its target. */
  maxDeviation: number;
  /** Where it is. */
  worst: { axis: 'row' | 'column'; index: number; code: string; deviation: number };
  infeasible: Infeasible[];
  findings: Finding[];
  tolerance: number;
}

/** A relative deviation |sum − target| / max(|target|, floor). */
function rel(sum: number, target: number, floor: number): number {
  return Math.abs(sum - target) / Math.max(Math.abs(target), floor);
}

/** Largest relative deviation of the row and column sums of X from u and v. */
export function deviations(X: Matrix, u: ArrayLike<number>, v: ArrayLike<number>, rowCodes?: string[], colCodes?: string[]): BalanceResult['worst'] {
  const { rows: m, cols: n, data } = X;
  const col = new Float64Array(n);
  let scale = 0;
  for (let i = 0; i < m; i++) scale = Math.max(scale, Math.abs(u[i]!));
  for (let j = 0; j < n; j++) scale = Math.max(scale, Math.abs(v[j]!));
  const floor = Math.max(scale * 1e-12, Number.MIN_VALUE);
  let worst: BalanceResult['worst'] = { axis: 'row', index: 0, code: rowCodes?.[0] ?? 'row 1', deviation: 0 };
  for (let i = 0; i < m; i++) {
    const o = i * n;
    let s = 0;
    for (let j = 0; j < n; j++) {
      const x = data[o + j]!;
      s += x;
      col[j] = col[j]! + x;
    }
    const d = rel(s, u[i]!, floor);
    if (d > worst.deviation) worst = { axis: 'row', index: i, code: rowCodes?.[i] ?? `row ${i + 1}`, deviation: d };
  }
  for (let j = 0; j < n; j++) {
    const d = rel(col[j]!, v[j]!, floor);
    if (d > worst.deviation) worst = { axis: 'column', index: j, code: colCodes?.[j] ?? `column ${j + 1}`, deviation: d };
  }
  return worst;
}

/** Balance a matrix to row totals u and column totals v (RAS when it has no negative entries). */
export function scale(method: BalanceMethod, A: Matrix, u: ArrayLike<number>, v: ArrayLike<number>, o: BalanceOptions = {}): BalanceResult {
  const { rows: m, cols: n } = A;
  const tol = o.tolerance ?? 1e-10;
  const maxIt = o.maxIterations ?? 10000;
  if (u.length !== m || v.length !== n) {
    throw new InputError('bad-size', `the table is ${m} × ${n} but there are ${u.length} row totals and ${v.length} column totals`);
  }
  if (o.fixed && o.fixed.length !== m * n) throw new InputError('bad-size', `the fixed cells mask has ${o.fixed.length} entries for ${m} × ${n} cells`);
  const rowName = (i: number) => o.rowCodes?.[i] ?? `row ${i + 1}`;
  const colName = (j: number) => o.colCodes?.[j] ?? `column ${j + 1}`;
  // Positive part dense, negative part in compressed rows, fixed cells out of both.
  const a = A.data;
  for (let k = 0; k < m * n; k++) {
    if (!Number.isFinite(a[k]!)) {
      const i = Math.floor(k / n);
      const j = k % n;
      throw new InputError('non-finite', `cell (${rowName(i)}, ${colName(j)}) is ${a[k]}, not a finite number`, { row: i + 1, column: j + 1, rowLabel: rowName(i), columnLabel: colName(j), text: String(a[k]) });
    }
  }
  const ut = Float64Array.from(u);
  const vt = Float64Array.from(v);
  const { P, negPtr, negCol, negVal, rowPos, rowNeg, colPos, colNeg } = split(a, m, n, o.fixed, ut, vt);
  const negCount = negVal.length;
  const infeasible: Infeasible[] = [];
  if (method === 'ras' && negCount > 0) {
    let k = 0;
    while (!(a[k]! < 0 && !o.fixed?.[k])) k++;
    const i = Math.floor(k / n);
    const j = k % n;
    throw new InputError('negative-cell', `cell (${rowName(i)}, ${colName(j)}) is ${a[k]}; RAS scales non-negative tables only`, { row: i + 1, column: j + 1, rowLabel: rowName(i), columnLabel: colName(j), text: String(a[k]) }, 'Use GRAS (--method gras) for a table with negative entries');
  }
  // Feasibility that can be seen from the signs alone.
  let usum = 0;
  let vsum = 0;
  let uabs = 0;
  let vabs = 0;
  for (let i = 0; i < m; i++) {
    if (!Number.isFinite(ut[i]!)) infeasible.push({ kind: 'not-finite', axis: 'row', index: i, code: rowName(i), message: `the target of row '${rowName(i)}' is ${u[i]}, not a finite number` });
    usum += ut[i]!;
    uabs += Math.abs(ut[i]!);
  }
  for (let j = 0; j < n; j++) {
    if (!Number.isFinite(vt[j]!)) infeasible.push({ kind: 'not-finite', axis: 'column', index: j, code: colName(j), message: `the target of column '${colName(j)}' is ${v[j]}, not a finite number` });
    vsum += vt[j]!;
    vabs += Math.abs(vt[j]!);
  }
  const big = Math.max(uabs, vabs);
  const small = big * 1e-14;
  const signCheck = (axis: 'row' | 'column', idx: number, pos: number, neg: number, t: number) => {
    const name = axis === 'row' ? rowName(idx) : colName(idx);
    const fixedNote = o.fixed ? ' (after the cells held fixed)' : '';
    if (!pos && !neg && Math.abs(t) > small) infeasible.push({ kind: 'empty-with-target', axis, index: idx, code: name, message: `${axis} '${name}' has no entries to scale but its target${fixedNote} is ${t}` });
    else if (pos && !neg && t < -small) infeasible.push({ kind: 'sign-impossible', axis, index: idx, code: name, message: `${axis} '${name}' has only positive entries but its target${fixedNote} is negative (${t})` });
    else if (!pos && neg && t > small) infeasible.push({ kind: 'sign-impossible', axis, index: idx, code: name, message: `${axis} '${name}' has only negative entries but its target${fixedNote} is positive (${t})` });
  };
  for (let i = 0; i < m; i++) signCheck('row', i, rowPos[i]!, rowNeg[i]!, ut[i]!);
  for (let j = 0; j < n; j++) signCheck('column', j, colPos[j]!, colNeg[j]!, vt[j]!);
  if (Math.abs(usum - vsum) > Math.max(tol, 1e-14) * Math.max(Math.abs(usum), Math.abs(vsum), big * 1e-12)) {
    infeasible.push({ kind: 'totals-disagree', axis: 'both', index: -1, code: 'totals', message: `the row totals sum to ${usum} and the column totals to ${vsum}${o.fixed ? ' (after the cells held fixed)' : ''}; they must agree` });
  }
  const r = new Float64Array(m).fill(1);
  const s = new Float64Array(n).fill(1);
  const X = { rows: m, cols: n, data: new Float64Array(m * n) };
  const findings: Finding[] = [];
  let iterations = 0;
  let converged = false;
  if (!infeasible.length) {
    let top = 0;
    for (let i = 0; i < m; i++) top = Math.max(top, Math.abs(ut[i]!));
    for (let j = 0; j < n; j++) top = Math.max(top, Math.abs(vt[j]!));
    const floor = Math.max(top * 1e-12, Number.MIN_VALUE);
    const pc = new Float64Array(n);
    const nc = new Float64Array(n);
    const pr = new Float64Array(m);
    const nr = new Float64Array(m);
    while (iterations < maxIt) {
      // Column step: sums by column with the current r; check the columns; new s.
      weightedColumnSums(P, r, pc, m, n);
      negativeColumnSums(negPtr, negCol, negVal, r, nc, m);
      let dev = 0;
      if (iterations > 0) {
        for (let j = 0; j < n; j++) {
          const sj = s[j]!;
          dev = Math.max(dev, rel(sj * pc[j]! - (nc[j]! === 0 ? 0 : nc[j]! / sj), vt[j]!, floor));
        }
        if (dev <= tol) {
          converged = true;
          break;
        }
      }
      for (let j = 0; j < n; j++) s[j] = root(pc[j]!, nc[j]!, vt[j]!, s[j]!);
      // Row step: sums by row with the new s; check the rows; new r.
      dev = 0;
      weightedRowSums(P, s, pr, m, n);
      negativeRowSums(negPtr, negCol, negVal, s, nr, m);
      for (let i = 0; i < m; i++) {
        const ri = r[i]!;
        dev = Math.max(dev, rel(ri * pr[i]! - (nr[i]! === 0 ? 0 : nr[i]! / ri), ut[i]!, floor));
      }
      if (dev <= tol) {
        converged = true;
        break;
      }
      for (let i = 0; i < m; i++) r[i] = root(pr[i]!, nr[i]!, ut[i]!, r[i]!);
      iterations++;
      o.onIteration?.(iterations, dev);
    }
    for (let i = 0; i < m; i++) {
      const off = i * n;
      const ri = r[i]!;
      for (let j = 0; j < n; j++) X.data[off + j] = ri * P[off + j]! * s[j]!;
      for (let e = negPtr[i]!; e < negPtr[i + 1]!; e++) X.data[off + negCol[e]!] = -negVal[e]! / (ri * s[negCol[e]!]!);
    }
  } else X.data.set(a);
  if (o.fixed) for (let k = 0; k < m * n; k++) if (o.fixed[k]) X.data[k] = a[k]!;
  const worst = deviations(X, u, v, o.rowCodes, o.colCodes);
  for (const f of infeasible) findings.push({ code: `target-${f.kind}`, severity: 'error', message: f.message, where: f.axis === 'row' ? { rowLabel: f.code, row: f.index + 1 } : f.axis === 'column' ? { columnLabel: f.code, column: f.index + 1 } : {} });
  if (!infeasible.length && !converged) {
    findings.push({ code: 'not-converged', severity: 'error', message: `${method.toUpperCase()} did not reach a relative deviation of ${tol} in ${iterations} iterations; the largest remaining is ${worst.deviation.toPrecision(3)} in ${worst.axis} '${worst.code}' (the targets may be infeasible for the pattern of zeros)`, where: worst.axis === 'row' ? { rowLabel: worst.code } : { columnLabel: worst.code } });
  }
  return { method, X, r, s, iterations, converged: converged && !infeasible.length, maxDeviation: worst.deviation, worst, infeasible, findings, tolerance: tol };
}

/**
 * The positive part P (dense, fixed cells and negatives zero), the absolute negative part in
 * compressed rows, which rows and columns have entries of each sign; fixed cells come off the
 * targets `ut` and `vt` (changed in place).
 */
function split(a: Float64Array, m: number, n: number, fixed: Uint8Array | undefined, ut: Float64Array, vt: Float64Array) {
  const P = new Float64Array(m * n);
  let count = 0;
  for (let k = 0; k < m * n; k++) if (a[k]! < 0 && !(fixed && fixed[k])) count++;
  const negPtr = new Int32Array(m + 1);
  const negCol = new Int32Array(count);
  const negVal = new Float64Array(count);
  const rowPos = new Uint8Array(m);
  const rowNeg = new Uint8Array(m);
  const colPos = new Uint8Array(n);
  const colNeg = new Uint8Array(n);
  let q = 0;
  for (let i = 0; i < m; i++) {
    negPtr[i] = q;
    const off = i * n;
    for (let j = 0; j < n; j++) {
      const x = a[off + j]!;
      if (fixed && fixed[off + j]) {
        ut[i] = ut[i]! - x;
        vt[j] = vt[j]! - x;
      } else if (x > 0) {
        P[off + j] = x;
        rowPos[i] = 1;
        colPos[j] = 1;
      } else if (x < 0) {
        negCol[q] = j;
        negVal[q++] = -x;
        rowNeg[i] = 1;
        colNeg[j] = 1;
      }
    }
  }
  negPtr[m] = q;
  return { P, negPtr, negCol, negVal, rowPos, rowNeg, colPos, colNeg };
}

/** pc[j] = Σᵢ r[i] P[i, j] (rows of a row-major m × n array, the inner loop unrolled by four). */
function weightedColumnSums(P: Float64Array, r: Float64Array, pc: Float64Array, m: number, n: number): void {
  pc.fill(0);
  const n4 = n - (n % 4);
  for (let i = 0; i < m; i++) {
    const ri = r[i]!;
    if (ri === 0) continue;
    const off = i * n;
    let j = 0;
    for (; j < n4; j += 4) {
      pc[j] += ri * P[off + j]!;
      pc[j + 1] += ri * P[off + j + 1]!;
      pc[j + 2] += ri * P[off + j + 2]!;
      pc[j + 3] += ri * P[off + j + 3]!;
    }
    for (; j < n; j++) pc[j] += ri * P[off + j]!;
  }
}

/** pr[i] = Σⱼ P[i, j] s[j] (four partial sums, then a clean-up loop). */
function weightedRowSums(P: Float64Array, s: Float64Array, pr: Float64Array, m: number, n: number): void {
  const n4 = n - (n % 4);
  for (let i = 0; i < m; i++) {
    const off = i * n;
    let a0 = 0;
    let a1 = 0;
    let a2 = 0;
    let a3 = 0;
    let j = 0;
    for (; j < n4; j += 4) {
      a0 += P[off + j]! * s[j]!;
      a1 += P[off + j + 1]! * s[j + 1]!;
      a2 += P[off + j + 2]! * s[j + 2]!;
      a3 += P[off + j + 3]! * s[j + 3]!;
    }
    for (; j < n; j++) a0 += P[off + j]! * s[j]!;
    pr[i] = a0 + a1 + (a2 + a3);
  }
}

/** nc[j] = Σᵢ N[i, j] / r[i] over the negative entries in compressed rows. */
function negativeColumnSums(ptr: Int32Array, col: Int32Array, val: Float64Array, r: Float64Array, nc: Float64Array, m: number): void {
  nc.fill(0);
  for (let i = 0; i < m; i++) {
    const inv = 1 / r[i]!;
    for (let e = ptr[i]!; e < ptr[i + 1]!; e++) nc[col[e]!] += val[e]! * inv;
  }
}

/** nr[i] = Σⱼ N[i, j] / s[j]. */
function negativeRowSums(ptr: Int32Array, col: Int32Array, val: Float64Array, s: Float64Array, nr: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) {
    let a = 0;
    for (let e = ptr[i]!; e < ptr[i + 1]!; e++) a += val[e]! / s[col[e]!]!;
    nr[i] = a;
  }
}

/** The positive root s of p s² − t s − nn = 0 (p s = t when nn = 0); `keep` where there is none. */
function root(p: number, nn: number, t: number, keep: number): number {
  if (p > 0) {
    if (nn === 0) return Math.max(t, 0) / p;
    const d = Math.sqrt(t * t + 4 * p * nn);
    return t >= 0 ? (t + d) / (2 * p) : (2 * nn) / (d - t);
  }
  if (nn > 0 && t < 0) return -nn / t;
  return keep;
}
