/**
 * The part of a table that `balance` scales, and the table rebuilt from the balanced part. No
 * Node imports: the command line and the workbench's worker share it.
 *
 * - `intermediate`: the flows between sectors Z (sectors × sectors).
 * - `whole`: sectors and the primary-input rows (value added, then imports when the table has
 *   them) by sectors and final-demand columns.
 *
 * The rebuilt table (`balancedTable`): the balanced cells replace the old ones; total output x is
 * the new sector row sums for the whole part (rows and columns then balance by construction when
 * the targets do), and stays as it was for the intermediate part (the final-demand and
 * value-added blocks were not scaled, so the checks say where rows or columns no longer add up).
 * A note in the table's notes says which part was balanced and by which method.
 */
import type { Matrix } from '../../engine/linalg/matrix';
import { zeros } from '../../engine/linalg/matrix';
import type { Axis, Table } from '../../engine/table';

export type BalancePartName = 'intermediate' | 'whole';

/** The part to balance as a matrix with its row and column axes. */
export function balancePart(t: Table, part: BalancePartName): { rows: Axis; cols: Axis; A: Matrix } {
  const n = t.sectors.codes.length;
  if (part === 'intermediate') return { rows: t.sectors, cols: t.sectors, A: { rows: n, cols: n, data: Float64Array.from(t.Z.data) } };
  const k = t.finalDemand.codes.length;
  const m = t.valueAdded.codes.length;
  const imp = t.imports ? 1 : 0;
  const R = n + m + imp;
  const C = n + k;
  const A = zeros(R, C);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) A.data[i * C + j] = t.Z.data[i * n + j]!;
    for (let q = 0; q < k; q++) A.data[i * C + n + q] = t.F.data[i * k + q]!;
  }
  for (let a = 0; a < m; a++) for (let j = 0; j < n; j++) A.data[(n + a) * C + j] = t.V.data[a * n + j]!;
  if (t.imports) for (let j = 0; j < n; j++) A.data[(n + m) * C + j] = t.imports[j]!;
  const rows: Axis = { codes: [...t.sectors.codes, ...t.valueAdded.codes, ...(imp ? ['IMPORTS'] : [])], labels: [...t.sectors.labels, ...t.valueAdded.labels, ...(imp ? ['Imports'] : [])] };
  const cols: Axis = { codes: [...t.sectors.codes, ...t.finalDemand.codes], labels: [...t.sectors.labels, ...t.finalDemand.labels] };
  return { rows, cols, A };
}

/** A copy of the table with the balanced part `X` (of `balancePart(t, part)`'s shape) in place. */
export function balancedTable(t: Table, part: BalancePartName, X: Matrix, method: string): Table {
  const n = t.sectors.codes.length;
  const out: Table = {
    ...t,
    sectors: { codes: [...t.sectors.codes], labels: [...t.sectors.labels] },
    Z: { rows: n, cols: n, data: new Float64Array(n * n) },
    F: { rows: t.F.rows, cols: t.F.cols, data: Float64Array.from(t.F.data) },
    V: { rows: t.V.rows, cols: t.V.cols, data: Float64Array.from(t.V.data) },
    x: Float64Array.from(t.x),
    satellites: t.satellites.map((s) => ({ ...s, values: Float64Array.from(s.values) })),
    meta: { ...t.meta, notes: [...(t.meta.notes ?? []), `The ${part === 'whole' ? 'whole table (sectors and primary inputs by sectors and final demand)' : 'intermediate flows'} balanced by ${method.toUpperCase()} to new row and column totals.`] },
  };
  if (t.imports) out.imports = Float64Array.from(t.imports);
  if (part === 'intermediate') {
    out.Z.data.set(X.data.subarray(0, n * n));
    return out;
  }
  const C = X.cols;
  const k = t.finalDemand.codes.length;
  const m = t.valueAdded.codes.length;
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let j = 0; j < C; j++) sum += X.data[i * C + j]!;
    out.x[i] = sum;
    for (let j = 0; j < n; j++) out.Z.data[i * n + j] = X.data[i * C + j]!;
    for (let q = 0; q < k; q++) out.F.data[i * k + q] = X.data[i * C + n + q]!;
  }
  for (let a = 0; a < m; a++) for (let j = 0; j < n; j++) out.V.data[a * n + j] = X.data[(n + a) * C + j]!;
  if (out.imports) for (let j = 0; j < n; j++) out.imports[j] = X.data[(n + m) * C + j]!;
  // Satellites per unit of output keep their intensity.
  for (const s of out.satellites) for (let j = 0; j < n; j++) s.values[j] = t.x[j]! > 0 ? (s.values[j]! * out.x[j]!) / t.x[j]! : s.values[j]!;
  return out;
}
