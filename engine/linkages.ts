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
 * The indices average 1. Key-sector groups (common practice): `key` (both indices above 1),
 * `backward` (only the backward index above 1), `forward` (only the forward index above 1),
 * `weak` (neither).
 *
 * G i is computed as x̂⁻¹ L x with one solve of the open model (G = x̂⁻¹ L x̂ when every output
 * is positive); when some output is zero or negative, a Ghosh model is factored instead. The
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

export type KeySectorGroup = 'key' | 'backward' | 'forward' | 'weak';

/** One line for each key-sector group. */
export const KEY_SECTOR_GROUPS: Readonly<Record<KeySectorGroup, string>> = {
  key: 'key sector: above-average backward and forward linkages',
  backward: 'backward-oriented: above-average pull on suppliers, below-average supply to other sectors',
  forward: 'forward-oriented: above-average supply to other sectors, below-average pull on suppliers',
  weak: 'weakly linked: below-average backward and forward linkages',
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

function normalised(v: Float64Array): Float64Array {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i]!;
  const mean = s / v.length;
  const out = new Float64Array(v.length);
  if (mean === 0) return out;
  for (let i = 0; i < v.length; i++) out[i] = v[i]! / mean;
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
  const positive = t.x.every((v) => v > 0);
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
  if (!positive) {
    const zero = [...t.x.keys()].filter((i) => !(t.x[i]! > 0));
    findings.push({
      code: 'zero-output',
      severity: 'warning',
      message: `${zero.length} sector${zero.length > 1 ? 's have' : ' has'} no positive output (${zero
        .slice(0, 10)
        .map((i) => `'${t.sectors.codes[i]}'`)
        .join(', ')}); their coefficients are zero and their linkage indices say nothing about them`,
      where: { sectors: zero.map((i) => t.sectors.codes[i]!) },
    });
  }
  const power = normalised(totalBackward);
  const sensitivity = normalised(totalForward);
  const group: KeySectorGroup[] = [];
  const groups: Record<KeySectorGroup, string[]> = { key: [], backward: [], forward: [], weak: [] };
  for (let j = 0; j < n; j++) {
    const g: KeySectorGroup = power[j]! > 1 ? (sensitivity[j]! > 1 ? 'key' : 'backward') : sensitivity[j]! > 1 ? 'forward' : 'weak';
    group.push(g);
    groups[g].push(t.sectors.codes[j]!);
  }
  const out: Linkages = {
    about: LINKAGES_ABOUT,
    sectors: axisCopy(t.sectors),
    directBackward,
    directForward,
    directBackwardIndex: normalised(directBackward),
    directForwardIndex: normalised(directForward),
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
    const vb = new Float64Array(n);
    const vf = new Float64Array(n);
    const dof = Math.max(n - 1, 1);
    // Backward: columns of L.
    const mean = new Float64Array(n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) mean[j] += L.data[i * n + j]!;
    for (let j = 0; j < n; j++) mean[j] /= n;
    const ss = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const d = L.data[i * n + j]! - mean[j]!;
        ss[j] += d * d;
      }
    }
    for (let j = 0; j < n; j++) vb[j] = mean[j]! !== 0 ? Math.sqrt(ss[j]! / dof) / mean[j]! : 0;
    // Forward: rows of G, gᵢⱼ = lᵢⱼ xⱼ / xᵢ (or G itself).
    // With positive outputs G = x̂⁻¹ L x̂ from L at hand; otherwise G itself (a second inverse).
    const G = positive ? undefined : ghosh!.inverse();
    const rowG = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) {
        rowG[j] = G ? G.data[i * n + j]! : (L.data[i * n + j]! * t.x[j]!) / t.x[i]!;
        s += rowG[j]!;
      }
      const m = s / n;
      let dev = 0;
      for (let j = 0; j < n; j++) dev += (rowG[j]! - m) * (rowG[j]! - m);
      vf[i] = m !== 0 ? Math.sqrt(dev / dof) / m : 0;
    }
    out.variationBackward = vb;
    out.variationForward = vf;
  }
  return out;
}
