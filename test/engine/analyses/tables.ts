/**
 * Random balanced tables for the analyses' tests, and the plain dense computations the tests
 * compare against, written with ml-matrix (source: ml-matrix 6.15.1, a general-purpose
 * linear-algebra library): an independent path that shares no code with the engine's solvers.
 */
import { inverse as mlInverse, Matrix as MlMatrix, solve as mlSolve } from 'ml-matrix';
import { makeTable } from '../../../engine/table';
import type { PlainTable, Table } from '../../../engine/table';
import { randomCoefficients, rng } from '../../helpers/random';

export interface RandomTableOptions {
  n: number;
  seed: number;
  /** Density of nonzero coefficients (default 0.7). */
  density?: number;
  /** Largest column sum of A (default 0.75). */
  maxColSum?: number;
  /** Add an imports row (default true). */
  imports?: boolean;
}

/**
 * A balanced random table: A productive, final demand F (n × 3) positive, x = L f, Z = A x̂,
 * value added (3 rows) and imports sharing xⱼ − Σᵢ zᵢⱼ, two satellites (jobs and emissions).
 */
export function randomTable(o: RandomTableOptions): Table {
  const { n, seed } = o;
  const A = randomCoefficients(n, seed, o.maxColSum ?? 0.75, o.density ?? 0.7);
  const r = rng(seed * 7 + 1);
  const F: number[][] = [];
  for (let i = 0; i < n; i++) F.push([50 + 100 * r(), 10 + 40 * r(), r() < 0.2 ? 0 : 80 * r()]);
  const f = F.map((row) => row.reduce((a, b) => a + b, 0));
  const Aml = new MlMatrix(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) Aml.set(i, j, A.data[i * n + j]!);
  const M = MlMatrix.eye(n).sub(Aml);
  const x = mlSolve(M, MlMatrix.columnVector(f)).getColumn(0);
  const Z: number[][] = [];
  for (let i = 0; i < n; i++) Z.push(Array.from({ length: n }, (_, j) => A.data[i * n + j]! * x[j]!));
  const withImports = o.imports ?? true;
  const V: number[][] = [[], [], []];
  const imports: number[] = [];
  for (let j = 0; j < n; j++) {
    let v = x[j]!;
    for (let i = 0; i < n; i++) v -= Z[i]![j]!;
    const w = [0.3 + r(), 0.2 + r(), 0.05 + 0.2 * r(), withImports ? 0.1 + 0.5 * r() : 0];
    const s = w.reduce((a, b) => a + b, 0);
    V[0]!.push((v * w[0]!) / s);
    V[1]!.push((v * w[1]!) / s);
    V[2]!.push((v * w[2]!) / s);
    imports.push((v * w[3]!) / s);
  }
  const p: PlainTable = {
    sectors: { codes: Array.from({ length: n }, (_, i) => `S${String(i + 1).padStart(2, '0')}`), labels: Array.from({ length: n }, (_, i) => `Sector ${i + 1}`) },
    Z,
    finalDemand: { codes: ['HH', 'GOV', 'EXP'], labels: ['Household consumption', 'Government consumption', 'Exports'], values: F },
    valueAdded: { codes: ['COE', 'GOS', 'TAX'], labels: ['Compensation of employees', 'Gross operating surplus', 'Taxes less subsidies on production'], values: V },
    x,
    satellites: [
      { code: 'JOBS', label: 'Employment', unit: 'FTE jobs', values: x.map((xi) => xi * (0.5 + 5 * r())) },
      { code: 'GHG', label: 'Greenhouse gas emissions', unit: 't CO2e', values: x.map((xi) => xi * 20 * r()) },
    ],
    meta: { currency: 'USD', scaleLabel: 'millions', title: 'random test table' },
  };
  if (withImports) p.imports = imports;
  return makeTable(p);
}

/** ml-matrix from a row-major engine matrix. */
export function ml(m: { rows: number; cols: number; data: Float64Array }): MlMatrix {
  const out = new MlMatrix(m.rows, m.cols);
  for (let i = 0; i < m.rows; i++) for (let j = 0; j < m.cols; j++) out.set(i, j, m.data[i * m.cols + j]!);
  return out;
}

/** Dense A = Z x̂⁻¹, computed cell by cell. */
export function denseA(t: Table): MlMatrix {
  const n = t.x.length;
  const A = new MlMatrix(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) A.set(i, j, t.x[j]! > 0 ? t.Z.data[i * n + j]! / t.x[j]! : 0);
  return A;
}

/** Dense L = (I − A)⁻¹ by ml-matrix's inverse. */
export function denseL(A: MlMatrix): MlMatrix {
  return mlInverse(MlMatrix.eye(A.rows).sub(A));
}

export function colSum(M: MlMatrix): number[] {
  return Array.from({ length: M.columns }, (_, j) => M.getColumn(j).reduce((a, b) => a + b, 0));
}

export function rowSum(M: MlMatrix): number[] {
  return Array.from({ length: M.rows }, (_, i) => M.getRow(i).reduce((a, b) => a + b, 0));
}

/** Row vector c′M. */
export function rowTimes(c: ArrayLike<number>, M: MlMatrix): number[] {
  return MlMatrix.rowVector(Array.from(c)).mmul(M).getRow(0);
}

/** Column vector M d. */
export function timesCol(M: MlMatrix, d: ArrayLike<number>): number[] {
  return M.mmul(MlMatrix.columnVector(Array.from(d))).getColumn(0);
}

/** The largest |a − b| / max(1, |b|) over two vectors. */
export function relErr(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) return Infinity;
  let e = 0;
  for (let i = 0; i < a.length; i++) {
    const d = Math.abs(a[i]! - b[i]!) / Math.max(1, Math.abs(b[i]!));
    if (!(d <= e)) e = d;
  }
  return e;
}
