/**
 * Aggregation of a table with a concordance: a many-to-one mapping of sector codes onto groups.
 *
 * With S the n × N matrix that puts sector i into group g(i) (sᵢ,g(i) = 1), the aggregated table
 * is Z* = S′ Z S, F* = S′ F, V* = V S, imports* = imports S, x* = S′ x, and each satellite row
 * s* = s S: flows, final demand, value added, output and satellite quantities are summed over
 * the members of each group (common practice). Final-demand columns and value-added rows keep
 * their codes. The balances of the table carry over, since sums of balanced rows balance.
 *
 * Every sector of the table must be mapped, every code mapped must be a sector of the table,
 * and every group named must have a member; each failure is an `InputError` that lists the
 * codes. A table read from coefficients without outputs (x = 1 for every sector) cannot be
 * aggregated by summing, since its "flows" are coefficients; that too is an error.
 */
import { InputError } from './errors';
import type { Axis, Table } from './table';
import { validateTable } from './table';
import { classedAxisCopy } from './measures';

export interface Concordance {
  /** Sector codes of the detailed table... */
  from: string[];
  /** ...and the group each one goes to (same length). */
  to: string[];
  /** The groups, in the order wanted, with labels (default: first appearance, labels = codes). */
  groups?: Axis;
}

export const AGGREGATE_ABOUT =
  'The same economy with fewer sectors: flows, final demand, value added, output and satellites summed over the sectors of each group; multipliers of an aggregated table differ from those of the detailed one.';

function list(codes: string[]): string {
  return codes.slice(0, 10).map((c) => `'${c}'`).join(', ') + (codes.length > 10 ? ` and ${codes.length - 10} more` : '');
}

/** Aggregate a table's sectors into groups. */
export function aggregate(t: Table, c: Concordance): Table {
  if (c.from.length !== c.to.length) {
    throw new InputError('bad-concordance', `the concordance has ${c.from.length} codes mapped but ${c.to.length} targets`);
  }
  if (t.meta.outputAssumed) {
    throw new InputError(
      'aggregate-coefficients',
      'this table was read from technical coefficients without total output, so its columns cannot be summed into groups',
      {},
      'Read the coefficients with total output (a row or column x), or aggregate the table of flows',
    );
  }
  const n = t.sectors.codes.length;
  const index = new Map(t.sectors.codes.map((code, i) => [code, i]));
  const groupOf = new Int32Array(n).fill(-1);
  const groupCodes: string[] = c.groups ? [...c.groups.codes] : [];
  const groupIndex = new Map(groupCodes.map((g, k) => [g, k]));
  if (groupIndex.size !== groupCodes.length) {
    const dup = groupCodes.find((g, k) => groupCodes.indexOf(g) !== k)!;
    throw new InputError('duplicate-code', `the concordance lists group '${dup}' twice`, { sector: dup });
  }
  const unknown: string[] = [];
  const unlisted: string[] = [];
  for (let k = 0; k < c.from.length; k++) {
    const code = c.from[k]!;
    const target = c.to[k]!;
    const i = index.get(code);
    if (i === undefined) {
      unknown.push(code);
      continue;
    }
    let gi = groupIndex.get(target);
    if (gi === undefined) {
      if (c.groups) {
        unlisted.push(target);
        continue;
      }
      gi = groupCodes.length;
      groupCodes.push(target);
      groupIndex.set(target, gi);
    }
    if (groupOf[i]! >= 0 && groupOf[i] !== gi) {
      throw new InputError('not-many-to-one', `the concordance maps sector '${code}' to two groups, '${groupCodes[groupOf[i]!]}' and '${target}'`, { sector: code }, 'Map each sector to one group');
    }
    groupOf[i] = gi;
  }
  if (unknown.length) {
    throw new InputError('unknown-sector', `the concordance maps ${unknown.length} code${unknown.length > 1 ? 's' : ''} that ${unknown.length > 1 ? 'are' : 'is'} not a sector of the table: ${list(unknown)}`, { sectors: unknown }, `The table's sectors start ${list(t.sectors.codes.slice(0, 5))}`);
  }
  if (unlisted.length) {
    throw new InputError('unknown-group', `the concordance maps sectors to ${unlisted.length} group${unlisted.length > 1 ? 's' : ''} not among its listed groups: ${list([...new Set(unlisted)])}`, {}, 'List every group, or leave the list of groups out');
  }
  const unmapped = t.sectors.codes.filter((_, i) => groupOf[i]! < 0);
  if (unmapped.length) {
    throw new InputError('unmapped-sector', `${unmapped.length} sector${unmapped.length > 1 ? 's' : ''} of the table ${unmapped.length > 1 ? 'are' : 'is'} not in the concordance: ${list(unmapped)}`, { sectors: unmapped }, 'Map every sector to a group');
  }
  const N = groupCodes.length;
  const members = new Int32Array(N);
  for (let i = 0; i < n; i++) members[groupOf[i]!]++;
  const empty = groupCodes.filter((_, g) => members[g] === 0);
  if (empty.length) {
    throw new InputError('empty-group', `${empty.length} group${empty.length > 1 ? 's have' : ' has'} no sector: ${list(empty)}`, { sectors: empty }, 'Map at least one sector to each group, or leave the group out');
  }
  const labels = groupCodes.map((g, k) => (c.groups ? c.groups.labels[k] ?? g : g));

  const Z = new Float64Array(N * N);
  for (let i = 0; i < n; i++) {
    const gi = groupOf[i]! * N;
    const o = i * n;
    for (let j = 0; j < n; j++) Z[gi + groupOf[j]!] += t.Z.data[o + j]!;
  }
  const k = t.F.cols;
  const F = new Float64Array(N * k);
  for (let i = 0; i < n; i++) for (let q = 0; q < k; q++) F[groupOf[i]! * k + q] += t.F.data[i * k + q]!;
  const m = t.V.rows;
  const V = new Float64Array(m * N);
  for (let a = 0; a < m; a++) for (let j = 0; j < n; j++) V[a * N + groupOf[j]!] += t.V.data[a * n + j]!;
  const sumRow = (v: Float64Array) => {
    const out = new Float64Array(N);
    for (let j = 0; j < n; j++) out[groupOf[j]!] += v[j]!;
    return out;
  };
  const out: Table = {
    sectors: { codes: groupCodes, labels },
    Z: { rows: N, cols: N, data: Z },
    finalDemand: classedAxisCopy(t.finalDemand),
    F: { rows: N, cols: k, data: F },
    valueAdded: classedAxisCopy(t.valueAdded),
    V: { rows: m, cols: N, data: V },
    x: sumRow(t.x),
    satellites: t.satellites.map((s) => ({ code: s.code, label: s.label, unit: s.unit, values: sumRow(s.values) })),
    meta: { ...t.meta, notes: [...(t.meta.notes ?? []), `Aggregated from ${n} to ${N} sectors with a concordance.`] },
  };
  if (t.imports) out.imports = sumRow(t.imports);
  validateTable(out);
  return out;
}
