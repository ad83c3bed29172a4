/**
 * Hypothetical extraction: how much smaller would the economy's total output be without a
 * sector (or a group S of sectors), or without only its purchases or only its sales?
 *
 * The baseline is the table itself: final demand and primary inputs are those implied by the
 * outputs, f = x − Z i and v′ = x′ − i′Z, so that L f = x and v′G = x′.
 *
 *   total     S is removed: its rows and columns leave A and its final demand goes;
 *             x̄_R = (I − A_RR)⁻¹ f_R for the remaining sectors R, x̄_S = 0
 *   backward  S buys no intermediate inputs: the columns S of A are set to zero,
 *             x̄ = (I − Ā)⁻¹ f
 *   forward   S sells no intermediate output: the rows S of B = x̂⁻¹Z are set to zero,
 *             x̄′ = v′(I − B̄)⁻¹ (the Ghosh model)
 *
 * The loss is i′x − i′x̄, absolute (money) and as a percentage of i′x. A sector without
 * intermediate flows loses only its own output under `total` and nothing under the other two.
 *
 * Nothing is refactored: each extraction is a low-rank change of I − A or I − B, solved with
 * the factorisation already at hand (Woodbury; common practice). With M = I − A, L = M⁻¹ and
 * E_S the columns of the identity for S, A L = L − I gives
 *   backward  x̄ = x − (L_{:,S} − E_S) L_SS⁻¹ x_S
 *   total     z = x − L_{:,S} f_S,  x̄_R = z_R − L_RS L_SS⁻¹ z_S
 *   forward   x̄′ = x′ − x_S′ G_SS⁻¹ (G_{S,:} − E_S′)
 * so a group of s sectors costs s solves of the open model (and s of the Ghosh model).
 */
import { InputError } from './errors';
import { GhoshModel } from './ghosh';
import type { LeontiefModel } from './leontief';
import { LU } from './linalg/lu';
import { transpose, zeros } from './linalg/matrix';
import type { Matrix } from './linalg/matrix';
import { axisCopy, CAUTIONS } from './measures';
import type { Axis, Table } from './table';
import { moneyUnit, sectorIndex } from './table';

export const EXTRACTION_ABOUT =
  'Hypothetical extraction: how much total output the economy would lose without the sector or group (total), without only its purchases from suppliers (backward) or without only its sales to other sectors (forward).';

export type ExtractionKind = 'total' | 'backward' | 'forward';

export interface ExtractionPart {
  /** Output by sector after the extraction. */
  output: Float64Array;
  /** Output lost by sector: baseline − output. */
  lossBySector: Float64Array;
  /** Total output lost (money units). */
  loss: number;
  /** loss ÷ baseline total output × 100. */
  lossPercent: number;
}

export interface Extraction {
  about: string;
  sectors: Axis;
  /** The extracted sector codes. */
  extracted: string[];
  unit: string;
  /** Baseline output x by sector, and its total. */
  baseline: Float64Array;
  baselineTotal: number;
  total: ExtractionPart;
  backward: ExtractionPart;
  forward: ExtractionPart;
  cautions: readonly string[];
}

function impliedDemand(t: Table): Float64Array {
  const n = t.x.length;
  const f = Float64Array.from(t.x);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) f[i] -= t.Z.data[i * n + j]!;
  return f;
}

function groupOf(t: Table, group: string | readonly string[]): number[] {
  const codes = typeof group === 'string' ? [group] : [...group];
  if (!codes.length) throw new InputError('empty-group', 'no sector was named for extraction', {}, 'Name one sector code or more');
  const idx = codes.map((c) => sectorIndex(t, c));
  const seen = new Set<number>();
  for (const [k, i] of idx.entries()) {
    if (seen.has(i)) throw new InputError('duplicate-sector', `sector '${codes[k]}' is named twice in the group to extract`, { sector: codes[k]! });
    seen.add(i);
  }
  if (idx.length === t.x.length) throw new InputError('extract-all', 'every sector would be extracted, which leaves no economy to compare', { sectors: codes });
  return idx;
}

function part(baseline: Float64Array, output: Float64Array, baselineTotal: number): ExtractionPart {
  const n = baseline.length;
  const lossBySector = new Float64Array(n);
  let loss = 0;
  for (let i = 0; i < n; i++) {
    lossBySector[i] = baseline[i]! - output[i]!;
    loss += lossBySector[i]!;
  }
  return { output, lossBySector, loss, lossPercent: baselineTotal !== 0 ? (100 * loss) / baselineTotal : 0 };
}

function solveSmall(M: Matrix, b: Float64Array, what: string): Float64Array {
  const lu = new LU(M);
  if (lu.isSingular) throw new InputError('singular', `the ${what} cannot be computed: the extracted block is singular`);
  return lu.solve(b);
}

/** Extract one sector or a group: total, backward-only and forward-only losses. */
export function extraction(t: Table, model: LeontiefModel, group: string | readonly string[], options: { ghosh?: GhoshModel } = {}): Extraction {
  const n = t.x.length;
  if (model.n !== n) throw new InputError('bad-size', `the model has ${model.n} sectors but the table has ${n}`);
  const S = groupOf(t, group);
  const s = S.length;
  const inS = new Uint8Array(n);
  for (const i of S) inS[i] = 1;
  const x = Float64Array.from(t.x);
  let xTotal = 0;
  for (let i = 0; i < n; i++) xTotal += x[i]!;
  const f = impliedDemand(t);

  // L_{:,S}: s solves with unit columns.
  const E = zeros(n, s);
  S.forEach((i, k) => (E.data[i * s + k] = 1));
  const LS = model.solveMany(E);
  const LSS = zeros(s, s);
  for (let a = 0; a < s; a++) for (let b = 0; b < s; b++) LSS.data[a * s + b] = LS.data[S[a]! * s + b]!;

  // Backward: x̄ = x − (L_{:,S} − E_S) L_SS⁻¹ x_S.
  const q = solveSmall(LSS, Float64Array.from(S, (i) => x[i]!), 'backward extraction');
  const back = Float64Array.from(x);
  for (let i = 0; i < n; i++) {
    let d = 0;
    for (let k = 0; k < s; k++) d += (LS.data[i * s + k]! - E.data[i * s + k]!) * q[k]!;
    back[i] -= d;
  }

  // Total: z = x − L_{:,S} f_S; x̄_R = z_R − L_RS L_SS⁻¹ z_S; x̄_S = 0.
  const z = Float64Array.from(x);
  for (let i = 0; i < n; i++) {
    let d = 0;
    for (let k = 0; k < s; k++) d += LS.data[i * s + k]! * f[S[k]!]!;
    z[i] -= d;
  }
  const r = solveSmall(LSS, Float64Array.from(S, (i) => z[i]!), 'total extraction');
  const tot = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (inS[i]) continue;
    let d = 0;
    for (let k = 0; k < s; k++) d += LS.data[i * s + k]! * r[k]!;
    tot[i] = z[i]! - d;
  }

  // Forward: x̄′ = x′ − x_S′ G_SS⁻¹ (G_{S,:} − E_S′), rows of G by transposed solves.
  const ghosh = options.ghosh ?? GhoshModel.fromTable(t);
  if (ghosh.n !== n) throw new InputError('bad-size', `the Ghosh model has ${ghosh.n} sectors but the table has ${n}`);
  const GS = zeros(s, n);
  S.forEach((i, k) => {
    const e = new Float64Array(n);
    e[i] = 1;
    GS.data.set(ghosh.weighted(e), k * n);
  });
  const GSS = zeros(s, s);
  for (let a = 0; a < s; a++) for (let b = 0; b < s; b++) GSS.data[a * s + b] = GS.data[a * n + S[b]!]!;
  // y′ = x_S′ G_SS⁻¹  ⇔  G_SS′ y = x_S.
  const y = solveSmall(transpose(GSS), Float64Array.from(S, (i) => x[i]!), 'forward extraction');
  const fwd = Float64Array.from(x);
  for (let j = 0; j < n; j++) {
    let d = 0;
    for (let k = 0; k < s; k++) d += y[k]! * (GS.data[k * n + j]! - (S[k] === j ? 1 : 0));
    fwd[j] -= d;
  }

  return {
    about: EXTRACTION_ABOUT,
    sectors: axisCopy(t.sectors),
    extracted: S.map((i) => t.sectors.codes[i]!),
    unit: moneyUnit(t.meta),
    baseline: x,
    baselineTotal: xTotal,
    total: part(x, tot, xTotal),
    backward: part(x, back, xTotal),
    forward: part(x, fwd, xTotal),
    cautions: CAUTIONS,
  };
}

export const EXTRACTION_RANKING_ABOUT =
  'Hypothetical extraction of each sector in turn: the total output the economy would lose without it (total), without its purchases (backward) or without its sales to other sectors (forward).';

export interface ExtractionRanking {
  about: string;
  sectors: Axis;
  unit: string;
  baselineTotal: number;
  /** Loss of total output when each sector alone is extracted (money units and percent). */
  total: Float64Array;
  totalPercent: Float64Array;
  backward: Float64Array;
  backwardPercent: Float64Array;
  forward: Float64Array;
  forwardPercent: Float64Array;
  cautions: readonly string[];
}

/**
 * Extract every sector in turn. Uses L (formed once) and, for the forward losses, G (from
 * x̂⁻¹ L x̂ when every output is positive, else the inverse of the Ghosh model, given or
 * built); each sector then costs O(1):
 *   backward_j = (i′L_{:,j} − 1) x_j / l_jj,  forward_j = ((G i)_j − 1) x_j / g_jj,
 *   total_j = i′x − [(i′z − z_j) − (i′L_{:,j} − l_jj) z_j / l_jj] with z = x − L_{:,j} f_j.
 */
export function extractEach(t: Table, model: LeontiefModel, options: { ghosh?: GhoshModel } = {}): ExtractionRanking {
  const n = t.x.length;
  if (model.n !== n) throw new InputError('bad-size', `the model has ${model.n} sectors but the table has ${n}`);
  const x = t.x;
  const f = impliedDemand(t);
  const L = model.inverse();
  const colL = new Float64Array(n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) colL[j] += L.data[i * n + j]!;
  const positive = x.every((v) => v > 0);
  let rowG: Float64Array;
  let diagG: Float64Array;
  if (positive) {
    const lx = model.solve(x);
    rowG = Float64Array.from(lx, (v, i) => v / x[i]!);
    diagG = Float64Array.from({ length: n }, (_, i) => L.data[i * n + i]!);
  } else {
    const G = (options.ghosh ?? GhoshModel.fromTable(t)).inverse();
    rowG = new Float64Array(n);
    diagG = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) rowG[i] += G.data[i * n + j]!;
      diagG[i] = G.data[i * n + i]!;
    }
  }
  let xTotal = 0;
  for (let i = 0; i < n; i++) xTotal += x[i]!;
  const total = new Float64Array(n);
  const backward = new Float64Array(n);
  const forward = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const ljj = L.data[j * n + j]!;
    backward[j] = ((colL[j]! - 1) * x[j]!) / ljj;
    forward[j] = ((rowG[j]! - 1) * x[j]!) / diagG[j]!;
    const sumZ = xTotal - colL[j]! * f[j]!;
    const zj = x[j]! - ljj * f[j]!;
    const remaining = sumZ - zj - ((colL[j]! - ljj) * zj) / ljj;
    total[j] = xTotal - remaining;
  }
  const pct = (v: Float64Array) => Float64Array.from(v, (a) => (xTotal !== 0 ? (100 * a) / xTotal : 0));
  return {
    about: EXTRACTION_RANKING_ABOUT,
    sectors: axisCopy(t.sectors),
    unit: moneyUnit(t.meta),
    baselineTotal: xTotal,
    total,
    totalPercent: pct(total),
    backward,
    backwardPercent: pct(backward),
    forward,
    forwardPercent: pct(forward),
    cautions: CAUTIONS,
  };
}
