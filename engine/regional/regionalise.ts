/**
 * From a national table to a region's: regional coefficients by a quotient method, then a
 * regional table that every other analysis uses.
 *
 * Coefficients (Miller & Blair 2009, ch. 8): rᵢⱼ = aᵢⱼ · min(1, Qᵢⱼ), with Q the method's
 * quotient (SLQᵢ or RPCᵢ by row; CILQᵢⱼ, FLQᵢⱼ or AFLQᵢⱼ by cell). The part aᵢⱼ − rᵢⱼ is bought
 * from outside the region.
 *
 * The regional table (common practice for a first estimate, stated in `REGIONAL_TABLE_NOTES`):
 * - output xᵢᴿ is the basis itself when it is output, else xᵢ · eᵢᴿ / eᵢᴺ (national output per
 *   unit of the basis);
 * - flows Zᴿ = R x̂ᴿ; value added, satellites and the national imports row keep their national
 *   amounts per unit of output; the imports row adds the purchases from outside the region
 *   Σᵢ (aᵢⱼ − rᵢⱼ) xⱼᴿ;
 * - final demand keeps the national columns in proportion to each sector's output (xᵢᴿ / xᵢ),
 *   and one balancing column, the intermediate sales outside the region, closes each row.
 * Columns balance when the national table does; a region that is the whole nation gets the
 * national table back (every quotient 1, λ = 1).
 */
import { InputError } from '../errors';
import type { Finding } from '../findings';
import type { Matrix } from '../linalg/matrix';
import { zeros } from '../linalg/matrix';
import { CAUTIONS } from '../measures';
import type { Axis, Table } from '../table';
import { coefficients, validateTable } from '../table';
import { AFLQ_ABOUT, aflq } from './aflq';
import type { BasisKind, RegionalBasis } from './basis';
import { checkBasis, total } from './basis';
import { CILQ_ABOUT, cilq } from './cilq';
import { DEFAULT_DELTA, FLQ_ABOUT, checkDelta, flq, regionShare } from './flq';
import { SDP_ABOUT, sdp } from './sdp';
import { SLQ_ABOUT, slq } from './slq';

export type RegionalMethod = 'slq' | 'cilq' | 'flq' | 'aflq' | 'sdp';

export const REGIONAL_METHODS: readonly RegionalMethod[] = ['slq', 'cilq', 'flq', 'aflq', 'sdp'];

export const METHOD_NAMES: Readonly<Record<RegionalMethod, string>> = {
  slq: 'Simple location quotient (SLQ)',
  cilq: 'Cross-industry location quotient (CILQ)',
  flq: "Flegg's location quotient (FLQ)",
  aflq: 'Augmented FLQ (AFLQ)',
  sdp: 'Supply-demand pool (SDP)',
};

export const METHOD_ABOUT: Readonly<Record<RegionalMethod, string>> = { slq: SLQ_ABOUT, cilq: CILQ_ABOUT, flq: FLQ_ABOUT, aflq: AFLQ_ABOUT, sdp: SDP_ABOUT };

export const REGIONALISE_ABOUT =
  "A region's table estimated from the national one: each coefficient keeps the part the region is taken to supply itself (a quotient capped at 1), the rest is bought from outside the region.";

/** The cautions every regional result carries, after the general ones. */
export const REGIONAL_CAUTIONS: readonly string[] = [
  'Quotient methods tend to overstate regional multipliers: they assume a region buys locally whatever it can make, and ignore cross-hauling. The simple location quotient overstates them most; CILQ less; FLQ and AFLQ least of these.',
  'A survey-based or hybrid regional table (local data on purchases and sales) is better than any quotient estimate; use one where it exists.',
  'δ = 0.3 is a common default for FLQ and AFLQ, not a value measured for this region; results move with δ.',
  'Follow local guidance on regional appraisal first: it may prescribe a method, a δ, or a published regional table.',
];

export const REGIONAL_TABLE_NOTES: readonly string[] = [
  'Regional output is the basis itself when the basis is output; otherwise national output per unit of the basis (employment or earnings) times the regional basis.',
  'Value added, satellites and national imports keep their national amounts per unit of output; purchases from outside the region are added to the imports row.',
  'Final demand keeps the national columns in proportion to each sector\'s regional output; one balancing column, intermediate sales outside the region, closes each row.',
];

export interface RegionaliseOptions {
  method: RegionalMethod;
  /** δ for FLQ and AFLQ (default 0.3). */
  delta?: number;
  /** The regional file, for the provenance. */
  source?: { file: string; sha256: string };
  /** SDP: the region's final demand by sector (default: national non-export final demand × the region's share). */
  finalDemand?: Float64Array;
}

/** A sector whose quotient was capped at 1 in at least one cell of its row. */
export interface CappedSector {
  code: string;
  label: string;
  /** The number of cells of its row (as seller) whose quotient was above 1. */
  cells: number;
}

export interface RegionalProvenance {
  method: RegionalMethod;
  delta?: number;
  lambda?: number;
  basis: BasisKind;
  unit: string;
  region?: string;
  /** The region's share of the nation in the basis. */
  share: number;
  file?: string;
  sha256?: string;
  /** Sector codes where the quotient was capped at 1. */
  capped: string[];
}

/** The regional coefficients and what they rest on. */
export interface RegionalCoefficients {
  method: RegionalMethod;
  sectors: Axis;
  /** National technical coefficients A. */
  national: Matrix;
  /** Regional input coefficients R (what the region buys from itself per unit of its output). */
  A: Matrix;
  /** The capped quotient of every cell, min(1, Qᵢⱼ) (for row methods each row repeats its value). */
  applied: Matrix;
  /** The quotient by sector: SLQ or RPC for the row methods; SLQ for the others (shown beside). */
  sectorQuotient: Float64Array;
  /** SLQ of every sector. */
  slq: Float64Array;
  /** The share of the region's purchases of each product met inside the region: Σⱼ rᵢⱼ xⱼᴿ / Σⱼ aᵢⱼ xⱼᴿ (1 where it buys none). */
  localShare: Float64Array;
  /** Regional output estimate xᴿ. */
  xR: Float64Array;
  lambda?: number;
  delta?: number;
  share: number;
  capped: CappedSector[];
  findings: Finding[];
}

/** A quotient is reported as capped above this (1 and round-off: a supply that equals its demand is not a surplus). */
const CAP_REPORTED = 1 + 1e-9;

/** Regional output: the basis when it is output, else national output per unit of the basis. */
export function regionalOutput(t: Table, b: RegionalBasis): Float64Array {
  const n = t.x.length;
  if (b.kind === 'output') return Float64Array.from(b.region);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = b.nation[i]! > 0 ? (t.x[i]! * b.region[i]!) / b.nation[i]! : 0;
  return x;
}

/** The regional coefficients of a table for a basis, by one method. */
export function regionalCoefficients(t: Table, b: RegionalBasis, o: RegionaliseOptions): RegionalCoefficients {
  if (!REGIONAL_METHODS.includes(o.method)) {
    throw new InputError('unknown-method', `there is no regionalisation method '${String(o.method)}'`, { text: String(o.method) }, `Use one of: ${REGIONAL_METHODS.join(', ')}`);
  }
  const findings = checkBasis(b, t.sectors);
  const n = t.sectors.codes.length;
  const A = coefficients(t);
  const xR = regionalOutput(t, b);
  const s = slq(b);
  const share = regionShare(b);
  let applied: Matrix;
  let raw: Matrix | undefined;
  let rowRaw: Float64Array | undefined;
  let lambda: number | undefined;
  let delta: number | undefined;
  if (o.method === 'slq' || o.method === 'sdp') {
    if (o.method === 'slq') rowRaw = s;
    else {
      const bShare = b.kind === 'output' ? total(xR) / total(t.x) : share;
      rowRaw = sdp(t, xR, { share: bShare, ...(o.finalDemand ? { finalDemand: o.finalDemand } : {}) }).raw;
    }
    applied = zeros(n, n);
    for (let i = 0; i < n; i++) applied.data.fill(Math.min(1, rowRaw[i]!), i * n, (i + 1) * n);
  } else {
    if (o.method === 'cilq') raw = cilq(b);
    else {
      delta = o.delta ?? DEFAULT_DELTA;
      checkDelta(delta);
      const r = o.method === 'flq' ? flq(b, delta) : aflq(b, delta);
      raw = r.Q;
      lambda = r.lambda;
    }
    applied = zeros(n, n);
    for (let k = 0; k < n * n; k++) applied.data[k] = Math.min(1, raw.data[k]!);
  }
  const R = zeros(n, n);
  for (let k = 0; k < n * n; k++) R.data[k] = A.data[k]! * applied.data[k]!;
  const capped: CappedSector[] = [];
  for (let i = 0; i < n; i++) {
    let cells = 0;
    if (rowRaw) cells = rowRaw[i]! > CAP_REPORTED ? A.data.subarray(i * n, (i + 1) * n).filter((a) => a !== 0).length : 0;
    else for (let j = 0; j < n; j++) if (raw!.data[i * n + j]! > CAP_REPORTED && A.data[i * n + j]! !== 0) cells++;
    if (cells) capped.push({ code: t.sectors.codes[i]!, label: t.sectors.labels[i]!, cells });
  }
  const localShare = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let all = 0;
    let local = 0;
    for (let j = 0; j < n; j++) {
      all += A.data[i * n + j]! * xR[j]!;
      local += R.data[i * n + j]! * xR[j]!;
    }
    localShare[i] = all > 0 ? local / all : 1;
  }
  if (capped.length) {
    findings.push({
      code: 'quotient-capped',
      severity: 'note',
      message: `the quotient was above 1 and capped at 1 for ${capped.length} selling sector${capped.length > 1 ? 's' : ''} (${capped.slice(0, 10).map((c) => `'${c.code}'`).join(', ')}${capped.length > 10 ? ', …' : ''}): the region is taken to supply its own needs for ${capped.length > 1 ? 'these products' : 'this product'} (in the cells capped), and what it makes beyond them is sold outside the region`,
      where: { sectors: capped.map((c) => c.code) },
    });
  }
  const out: RegionalCoefficients = { method: o.method, sectors: { codes: [...t.sectors.codes], labels: [...t.sectors.labels] }, national: A, A: R, applied, sectorQuotient: rowRaw ? Float64Array.from(rowRaw) : Float64Array.from(s), slq: s, localShare, xR, share, capped, findings };
  if (lambda !== undefined) out.lambda = lambda;
  if (delta !== undefined) out.delta = delta;
  return out;
}

export interface Regionalised extends RegionalCoefficients {
  /** The regional table: flows, final demand, value added, imports, output, satellites. */
  table: Table;
  basis: RegionalBasis;
  provenance: RegionalProvenance;
  about: string;
  cautions: string[];
}

/** A code not among `taken`: `base`, else `base-2`, `base-3`... */
function freeCode(base: string, taken: string[]): string {
  if (!taken.includes(base)) return base;
  for (let k = 2; ; k++) if (!taken.includes(`${base}-${k}`)) return `${base}-${k}`;
}

/** Regionalise a national table by one quotient method. */
export function regionalise(t: Table, b: RegionalBasis, o: RegionaliseOptions): Regionalised {
  const c = regionalCoefficients(t, b, o);
  const n = t.sectors.codes.length;
  const { A, xR } = c;
  const nat = c.national;
  const k = t.finalDemand.codes.length;
  const m = t.valueAdded.codes.length;
  const Z = zeros(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) Z.data[i * n + j] = A.data[i * n + j]! * xR[j]!;
  const ratio = new Float64Array(n);
  for (let i = 0; i < n; i++) ratio[i] = t.x[i]! > 0 ? xR[i]! / t.x[i]! : 0;
  const V = zeros(m, n);
  for (let a = 0; a < m; a++) for (let j = 0; j < n; j++) V.data[a * n + j] = t.V.data[a * n + j]! * ratio[j]!;
  const leak = new Float64Array(n);
  let anyLeak = false;
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += (nat.data[i * n + j]! - A.data[i * n + j]!) * xR[j]!;
    leak[j] = s;
    if (s !== 0) anyLeak = true;
  }
  const fdCodes = [...t.finalDemand.codes];
  const fdLabels = [...t.finalDemand.labels];
  const balance = new Float64Array(n);
  let anyBalance = false;
  for (let i = 0; i < n; i++) {
    let s = xR[i]!;
    for (let j = 0; j < n; j++) s -= Z.data[i * n + j]!;
    for (let q = 0; q < k; q++) s -= t.F.data[i * k + q]! * ratio[i]!;
    // Round-off of a region that is the whole nation is not a sale outside it.
    if (Math.abs(s) <= 1e-12 * Math.max(Math.abs(xR[i]!), 1e-300)) s = 0;
    balance[i] = s;
    if (s !== 0) anyBalance = true;
  }
  const kk = anyBalance ? k + 1 : k;
  const F = zeros(n, kk);
  for (let i = 0; i < n; i++) {
    for (let q = 0; q < k; q++) F.data[i * kk + q] = t.F.data[i * k + q]! * ratio[i]!;
    if (anyBalance) F.data[i * kk + k] = balance[i]!;
  }
  const classes = t.finalDemand.classes ? [...t.finalDemand.classes] : anyBalance ? fdCodes.map(() => undefined) : undefined;
  if (anyBalance) {
    fdCodes.push(freeCode('OUTSIDE', fdCodes));
    fdLabels.push('Intermediate sales outside the region (balancing)');
    classes?.push('exports');
  }
  const name = b.name ?? 'the region';
  const table: Table = {
    sectors: { codes: [...t.sectors.codes], labels: [...t.sectors.labels] },
    Z,
    finalDemand: { codes: fdCodes, labels: fdLabels, ...(classes ? { classes } : {}) },
    F,
    valueAdded: { codes: [...t.valueAdded.codes], labels: [...t.valueAdded.labels], ...(t.valueAdded.classes ? { classes: [...t.valueAdded.classes] } : {}) },
    V,
    x: xR,
    satellites: t.satellites.map((s) => ({ code: s.code, label: s.label, unit: s.unit, values: s.values.map((v, j) => v * ratio[j]!) })),
    meta: {
      ...t.meta,
      title: `${name}: regional table by ${METHOD_NAMES[o.method]}${t.meta.title ? ` from ${t.meta.title}` : ''}`,
      region: b.name ?? t.meta.region,
      notes: [...(t.meta.notes ?? []), `Regionalised by ${METHOD_NAMES[o.method]}${c.delta !== undefined ? ` with δ = ${c.delta}` : ''} on ${b.kind} (${b.unit}).`, ...REGIONAL_TABLE_NOTES],
    },
  };
  if (t.imports || anyLeak) {
    const imp = new Float64Array(n);
    for (let j = 0; j < n; j++) imp[j] = (t.imports ? t.imports[j]! * ratio[j]! : 0) + leak[j]!;
    table.imports = imp;
  }
  validateTable(table);
  const findings = [...c.findings];
  const negative = t.sectors.codes.filter((_, i) => balance[i]! < -1e-9 * Math.max(xR[i]!, 1));
  if (negative.length) {
    findings.push({
      code: 'negative-outside-sales',
      severity: 'warning',
      message: `the regional table's balancing column (intermediate sales outside the region) is negative for ${negative.length} sector${negative.length > 1 ? 's' : ''} (${negative.slice(0, 10).map((s) => `'${s}'`).join(', ')}): the region is estimated to use more of ${negative.length > 1 ? 'these products' : 'this product'} than national proportions leave for it; check the basis, or balance the table to known totals`,
      where: { sectors: negative },
    });
  }
  const provenance: RegionalProvenance = { method: o.method, basis: b.kind, unit: b.unit, share: c.share, capped: c.capped.map((s) => s.code) };
  if (c.delta !== undefined) provenance.delta = c.delta;
  if (c.lambda !== undefined) provenance.lambda = c.lambda;
  if (b.name) provenance.region = b.name;
  if (o.source) {
    provenance.file = o.source.file;
    provenance.sha256 = o.source.sha256;
  }
  return {
    ...c,
    findings,
    table,
    basis: { kind: b.kind, unit: b.unit, region: Float64Array.from(b.region), nation: Float64Array.from(b.nation), ...(b.name ? { name: b.name } : {}) },
    provenance,
    about: `${REGIONALISE_ABOUT} ${METHOD_ABOUT[o.method]}`,
    cautions: [...CAUTIONS, ...REGIONAL_CAUTIONS],
  };
}
