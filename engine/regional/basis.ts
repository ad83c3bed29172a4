/**
 * The regional basis: what a quotient method compares, the region's and the nation's employment,
 * output or earnings by sector, in the national table's sector order.
 *
 * `checkBasis` stops on what cannot be used (lengths that disagree, a negative or non-finite
 * value, a region with none of the basis at all, a sector the region has but the nation does
 * not) with an `InputError` naming the sector, and returns findings for what needs saying (a
 * sector whose regional value exceeds the national one, sectors absent from the region).
 */
import { InputError } from '../errors';
import type { Finding } from '../findings';
import type { Axis } from '../table';

export type BasisKind = 'employment' | 'output' | 'earnings';

export const BASIS_KINDS: readonly BasisKind[] = ['employment', 'output', 'earnings'];

export interface RegionalBasis {
  /** What the values count: employment, output or earnings. */
  kind: BasisKind;
  /** The unit of the values, such as `jobs` or `EUR millions`. */
  unit: string;
  /** The region's values by sector (length n, the table's order). */
  region: Float64Array;
  /** The nation's values by sector (length n). */
  nation: Float64Array;
  /** The region's name, shown in reports. */
  name?: string;
}

/** Σ of a vector. */
export function total(v: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i]!;
  return s;
}

function list(codes: string[]): string {
  return codes.slice(0, 10).map((c) => `'${c}'`).join(', ') + (codes.length > 10 ? ` and ${codes.length - 10} more` : '');
}

/** Check a basis against the table's sectors; errors throw, the rest are findings. */
export function checkBasis(b: RegionalBasis, sectors: Axis): Finding[] {
  const n = sectors.codes.length;
  if (b.region.length !== n || b.nation.length !== n) {
    throw new InputError('bad-size', `the regional basis has ${b.region.length} regional and ${b.nation.length} national values for ${n} sectors`);
  }
  for (const [v, what] of [[b.region, 'regional'], [b.nation, 'national']] as const) {
    for (let i = 0; i < n; i++) {
      const x = v[i]!;
      if (!Number.isFinite(x) || x < 0) {
        throw new InputError('bad-basis', `the ${what} ${b.kind} of sector '${sectors.codes[i]}' is ${x}; it must be a finite number, zero or more`, { sector: sectors.codes[i]!, text: String(x) });
      }
    }
  }
  if (!(total(b.region) > 0)) throw new InputError('empty-region', `the region has no ${b.kind} in any sector`, {}, 'Give the regional values by sector');
  const orphans: string[] = [];
  const over: string[] = [];
  const absent: string[] = [];
  for (let i = 0; i < n; i++) {
    if (b.region[i]! > 0 && b.nation[i]! === 0) orphans.push(sectors.codes[i]!);
    if (b.region[i]! > b.nation[i]! && b.nation[i]! > 0) over.push(sectors.codes[i]!);
    if (b.region[i]! === 0) absent.push(sectors.codes[i]!);
  }
  if (orphans.length) {
    throw new InputError('region-without-nation', `the region has ${b.kind} in ${orphans.length} sector${orphans.length > 1 ? 's' : ''} where the nation has none: ${list(orphans)}`, { sectors: orphans }, 'Check that the regional and national values are by the same sectors and in the same unit');
  }
  const findings: Finding[] = [];
  if (over.length) {
    findings.push({ code: 'region-exceeds-nation', severity: 'warning', message: `the region's ${b.kind} exceeds the nation's in ${over.length} sector${over.length > 1 ? 's' : ''}: ${list(over)}; check the units and the sector codes`, where: { sectors: over } });
  }
  if (absent.length) {
    findings.push({ code: 'sector-absent', severity: 'note', message: `${absent.length} sector${absent.length > 1 ? 's have' : ' has'} no ${b.kind} in the region (${list(absent)}): the region buys all of it from outside, and its own column has no output`, where: { sectors: absent } });
  }
  return findings;
}
