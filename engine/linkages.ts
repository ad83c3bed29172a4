/**
 * Linkages and key sectors.
 *
 *   direct backward   bⱼ = Σᵢ aᵢⱼ         column sums of A: what sector j buys per unit of output
 *   direct forward    fᵢ = Σⱼ bᵢⱼ         row sums of B = x̂⁻¹Z: the share of sector i's output sold
 *                                          to other sectors (and itself) as inputs
 *   total backward    i′L                  column sums of the Leontief inverse (output multipliers)
 *   total forward     G i                  row sums of the Ghosh inverse G = (I − B)⁻¹
 *   power of dispersion (Rasmussen–Hirschman backward index)   Uⱼ = (i′L)ⱼ ÷ mean of i′L
 *   sensitivity of dispersion (forward index, from G)          Sᵢ = (G i)ᵢ ÷ mean of G i
 *   coefficients of variation   Vⱼ = sd of column j of L ÷ its mean, and likewise for row i
 *                                of G (sd with n − 1); a low value means the sector's pull is
 *                                spread over many sectors
 *
 * The indices average 1 over the sectors with output. Key-sector groups (common practice): `key`
 * (both indices above 1), `backward` (only the backward index above 1), `forward` (only the
 * forward index above 1), `weak` (neither).
 *
 * Sectors with no output (xⱼ = 0) are left out: they are not counted in the means that
 * normalise the indices nor in the coefficients of variation, their own figures are NaN
 * (blank), and their group is `no-output`. So adding or removing such a sector leaves every
 * other sector's figures unchanged.
 *
 * G i is computed as x̂⁻¹ L x with one solve of the open model (G = x̂⁻¹ L x̂ where outputs
 * are positive); when some output is negative, a Ghosh model is factored instead. The
 * coefficients of variation need every entry of L, which is formed for them (skip them with
 * `variation: false`).
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import { allocationCoefficients, GhoshModel } from './ghosh';
import type { LeontiefModel } from './leontief';
import { colSums, rowSums } from './linalg/matrix';
import { axisCopy, CAUTIONS } from './measures';
import type { Axis, Table } from './table';

export const LINKAGES_ABOUT =
  'Linkages: how strongly each sector pulls on its suppliers (backward) and pushes to its buyers (forward), directly and in total; the indices average 1, and a key sector is above 1 in both.';

export type KeySectorGroup = 'key' | 'backward' | 'forward' | 'weak' | 'no-output';

/** One line for each key-sector group. */
export const KEY_SECTOR_GROUPS: Readonly<Record<KeySectorGroup, string>> = {
  key: 'key sector: above-average backward and forward linkages',
  backward: 'backward-oriented: above-average pull on suppliers, below-average supply to other sectors',
  forward: 'forward-oriented: above-average supply to other sectors, below-average pull on suppliers',
  weak: 'weakly linked: below-average backward and forward linkages',
  'no-output': 'no output: left out of the averages, no linkage index',
};

export interface Linkages {
  about: string;
  sectors: Axis;
  /** Column sums of A. */
  directBackward: Float64Array;
  /** Row sums of B. */
  directForward: Float64Array;
  /** Direct linkages normalised to a mean of 1. */
  directBackwardIndex: Float64Array;
  directForwardIndex: Float64Array;
  /** Column sums of L. */
  totalBackward: Float64Array;
  /** Row sums of G. */
  totalForward: Float64Array;
  /** Power of dispersion: totalBackward ÷ its mean. */
  power: Float64Array;
  /** Sensitivity of dispersion: totalForward ÷ its mean. */
  sensitivity: Float64Array;
  /** Coefficient of variation of each column of L (absent with `variation: false`). */
  variationBackward?: Float64Array;
  /** Coefficient of variation of each row of G. */
  variationForward?: Float64Array;
  /** The key-sector group of each sector. */
  group: KeySectorGroup[];
  /** The sector codes in each group. */
  groups: Record<KeySectorGroup, string[]>;
  findings: Finding[];
  cautions: readonly string[];
}

/** v ÷ its mean over the sectors `live` (NaN elsewhere). */
function normalised(v: Float64Array, live: readonly number[]): Float64Array {
  let s = 0;
  for (const i of live) s += v[i]!;
  const mean = s / live.length;
  const out = new Float64Array(v.length).fill(NaN);
  for (const i of live) out[i] = mean === 0 ? 0 : v[i]! / mean;
  return out;
}

export function linkages(t: Table, model: LeontiefModel, options: { variation?: boolean; ghosh?: GhoshModel } = {}): Linkages {
  const n = t.x.length;
  if (model.n !== n) throw new InputError('bad-size', `the model has ${model.n} sectors but the table has ${n}`);
  const variation = options.variation ?? true;
  const directBackward = colSums(model.A);
  const B = options.ghosh?.B ?? allocationCoefficients(t);
  const directForward = rowSums(B);
  const totalBackward = model.outputMultipliers();
  const live = [...t.x.keys()].filter((i) => t.x[i] !== 0);
  const none = [...t.x.keys()].filter((i) => t.x[i] === 0);
  const positive = t.x.every((v) => v >= 0);
  const findings: Finding[] = [];
  let ghosh = options.ghosh;
  let totalForward: Float64Array;
  if (positive && !ghosh) {
    const lx = model.solve(t.x);
    totalForward = new Float64Array(n);
    for (let i = 0; i < n; i++) totalForward[i] = lx[i]! / t.x[i]!;
  } else {
    ghosh ??= new GhoshModel(B);
    totalForward = ghosh.rowSums();
  }
  for (const a of [directBackward, directForward, totalBackward, totalForward]) for (const i of none) a[i] = NaN;
  if (none.length) {
    findings.push({
      code: 'zero-output',
      severity: 'note',
      message: `${none.length} sector${none.length > 1 ? 's have' : ' has'} no output (${none
        .slice(0, 10)
        .map((i) => `'${t.sectors.codes[i]}'`)
        .join(', ')}${none.length > 10 ? ', …' : ''}): left out of the averages that normalise the indices and of the coefficients of variation; their linkages are blank`,
      where: { sectors: none.map((i) => t.sectors.codes[i]!) },
    });
  }
  const negative = [...t.x.keys()].filter((i) => t.x[i]! < 0);
  if (negative.length) {
    findings.push({
      code: 'negative-output',
      severity: 'warning',
      message: `${negative.length} sector${negative.length > 1 ? 's have' : ' has'} negative output (${negative
        .slice(0, 10)
        .map((i) => `'${t.sectors.codes[i]}'`)
        .join(', ')}); their linkage indices say nothing about them`,
      where: { sectors: negative.map((i) => t.sectors.codes[i]!) },
    });
  }
  const power = normalised(totalBackward, live);
  const sensitivity = normalised(totalForward, live);
  const group: KeySectorGroup[] = [];
  const groups: Record<KeySectorGroup, string[]> = { key: [], backward: [], forward: [], weak: [], 'no-output': [] };
  for (let j = 0; j < n; j++) {
    const g: KeySectorGroup = t.x[j] === 0 ? 'no-output' : power[j]! > 1 ? (sensitivity[j]! > 1 ? 'key' : 'backward') : sensitivity[j]! > 1 ? 'forward' : 'weak';
    group.push(g);
    groups[g].push(t.sectors.codes[j]!);
  }
  const out: Linkages = {
    about: LINKAGES_ABOUT,
    sectors: axisCopy(t.sectors),
    directBackward,
    directForward,
    directBackwardIndex: normalised(directBackward, live),
    directForwardIndex: normalised(directForward, live),
    totalBackward,
    totalForward,
    power,
    sensitivity,
    group,
    groups,
    findings,
    cautions: CAUTIONS,
  };
  if (variation) {
    const L = model.inverse();
    const vb = new Float64Array(n).fill(NaN);
    const vf = new Float64Array(n).fill(NaN);
    const m = live.length;
    const dof = Math.max(m - 1, 1);
    // Backward: columns of L over the rows of sectors with output.
    for (const j of live) {
      let s = 0;
      for (const i of live) s += L.data[i * n + j]!;
      const mean = s / m;
      let ss = 0;
      for (const i of live) {
        const d = L.data[i * n + j]! - mean;
        ss += d * d;
      }
      vb[j] = mean !== 0 ? Math.sqrt(ss / dof) / mean : 0;
    }
    // Forward: rows of G, gᵢⱼ = lᵢⱼ xⱼ / xᵢ with nonnegative outputs (from L at hand), or G itself (a second inverse).
    const G = positive ? undefined : ghosh!.inverse();
    const rowG = new Float64Array(n);
    for (const i of live) {
      let s = 0;
      for (const j of live) {
        rowG[j] = G ? G.data[i * n + j]! : (L.data[i * n + j]! * t.x[j]!) / t.x[i]!;
        s += rowG[j]!;
      }
      const mean = s / m;
      let dev = 0;
      for (const j of live) dev += (rowG[j]! - mean) * (rowG[j]! - mean);
      vf[i] = mean !== 0 ? Math.sqrt(dev / dof) / mean : 0;
    }
    out.variationBackward = vb;
    out.variationForward = vf;
  }
  return out;
}
