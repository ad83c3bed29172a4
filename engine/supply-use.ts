/**
 * Supply-use (make and use) tables to direct and total requirements.
 *
 * Notation: V is the make matrix, industries × commodities (what each industry produces); U is
 * the use matrix, commodities × industries (what each industry buys, intermediate use only);
 * g = V i is industry output (scrap included); a hat is a diagonal matrix.
 *
 * Industry technology with market shares and the scrap adjustment, as the U.S. Bureau of
 * Economic Analysis derives its total requirements ("Mathematical derivation of the total
 * requirements tables", 1997 benchmark):
 *   B = U ĝ⁻¹                       direct requirements, commodity × industry
 *   h = scrap column of V, p = h / g
 *   V̄ = V with the scrap column set to zero, q = V̄′ i
 *   D = V̄ q̂⁻¹                       market shares, industry × commodity
 *   W = (I − p̂)⁻¹ D                 market shares adjusted for scrap
 *   commodity × commodity:  (I − B W)⁻¹
 *   industry × commodity:   W (I − B W)⁻¹
 *   industry × industry:    (I − W B)⁻¹
 * Without a scrap commodity, p = 0 and W = D. The industry-by-industry form is the model of a
 * fixed product-sales structure (each commodity is sold in the same proportions whoever makes
 * it): Z = D U, A = D B.
 *
 * Commodity technology (each commodity has one input structure, whichever industry makes it),
 * which needs as many industries as commodities: with C = V′ ĝ⁻¹ (the product mix of each
 * industry, commodity × industry; the scrap adjustment does not apply), q = C g and
 *   commodity × commodity:  A = B C⁻¹, total (I − B C⁻¹)⁻¹
 *   industry × commodity:   C⁻¹ (I − B C⁻¹)⁻¹
 *   industry × industry:    A = C⁻¹ B, total (I − C⁻¹ B)⁻¹
 * The industry-by-industry form is the model of a fixed industry-sales structure (each
 * industry sells its output in the same proportions whatever its product mix): U = V′ S with
 * S = ĝ⁻¹ Z, so Z = ĝ V′⁻¹ U and A = C⁻¹ B. Commodity technology can give negative coefficients;
 * each is reported as a finding.
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import { LU } from './linalg/lu';
import type { Matrix } from './linalg/matrix';
import { identityMinus, matMul, transpose, zeros } from './linalg/matrix';
import type { Axis } from './table';

export type RequirementsKind = 'direct' | 'commodity-by-commodity' | 'industry-by-commodity' | 'industry-by-industry';
export const REQUIREMENTS_KINDS: readonly RequirementsKind[] = ['direct', 'commodity-by-commodity', 'industry-by-commodity', 'industry-by-industry'];

export type Technology = 'industry' | 'commodity';

export interface SupplyUseInput {
  industries: Axis;
  commodities: Axis;
  /** Make: industries × commodities. */
  make: Matrix;
  /** Use of commodities by industries, intermediate only: commodities × industries. */
  use: Matrix;
  /** The code of the scrap (used and second-hand goods) commodity, if any. */
  scrap?: string;
  /** Industry output when the agency gives it; otherwise the row sums of the make matrix. */
  industryOutput?: Float64Array;
  technology?: Technology;
}

export interface SupplyUseModel {
  industries: Axis;
  commodities: Axis;
  technology: Technology;
  /** Industry output g. */
  g: Float64Array;
  /** Commodity output q (scrap excluded). */
  q: Float64Array;
  /** Scrap ratio p by industry. */
  p: Float64Array;
  /** Direct requirements B = U ĝ⁻¹. */
  B: Matrix;
  /** Market shares D = V̄ q̂⁻¹. */
  D: Matrix;
  /** Scrap-adjusted market shares W = (I − p̂)⁻¹ D. */
  W: Matrix;
  findings: Finding[];
  /** Direct coefficients of the symmetric table: commodity × commodity or industry × industry. */
  coefficients(kind: 'commodity-by-commodity' | 'industry-by-industry'): Matrix;
  /** A requirements matrix. */
  requirements(kind: RequirementsKind): Matrix;
  /** Row and column axes of a requirements matrix. */
  axes(kind: RequirementsKind): { rows: Axis; cols: Axis };
}

export function supplyUse(input: SupplyUseInput): SupplyUseModel {
  const { industries, commodities, make, use } = input;
  const ni = industries.codes.length;
  const nc = commodities.codes.length;
  const technology = input.technology ?? 'industry';
  if (ni === 0 || nc === 0) throw new InputError('empty', `supply-use tables need industries and commodities; got ${ni} industries and ${nc} commodities`);
  if (make.rows !== ni || make.cols !== nc) {
    throw new InputError('bad-size', `the make matrix must be industries × commodities (${ni} × ${nc}); it is ${make.rows} × ${make.cols}`);
  }
  if (use.rows !== nc || use.cols !== ni) {
    throw new InputError('bad-size', `the use matrix must be commodities × industries (${nc} × ${ni}); it is ${use.rows} × ${use.cols}`);
  }
  for (const [m, what, rows, cols] of [
    [make, 'make', industries, commodities],
    [use, 'use', commodities, industries],
  ] as const) {
    for (let k = 0; k < m.data.length; k++) {
      if (!Number.isFinite(m.data[k]!)) {
        const i = Math.floor(k / m.cols);
        const j = k % m.cols;
        throw new InputError('non-finite', `${what} table: row '${rows.codes[i]}', column '${cols.codes[j]}' is ${m.data[k]}, not a finite number`, {
          rowLabel: rows.codes[i]!,
          columnLabel: cols.codes[j]!,
        });
      }
    }
  }
  const findings: Finding[] = [];
  const scrapIdx = input.scrap === undefined ? -1 : commodities.codes.indexOf(input.scrap);
  if (input.scrap !== undefined && scrapIdx < 0) {
    throw new InputError('unknown-commodity', `the scrap commodity '${input.scrap}' is not among the commodities`, { columnLabel: input.scrap });
  }

  // g: industry output.
  const g = new Float64Array(ni);
  for (let i = 0; i < ni; i++) {
    let s = 0;
    for (let c = 0; c < nc; c++) s += make.data[i * nc + c]!;
    g[i] = s;
  }
  if (input.industryOutput) {
    if (input.industryOutput.length !== ni) throw new InputError('bad-size', `industry output has ${input.industryOutput.length} values for ${ni} industries`);
    g.set(input.industryOutput);
  }
  const zeroG = [...g.keys()].filter((i) => !(g[i]! > 0));
  if (zeroG.length) {
    findings.push({
      code: 'zero-industry-output',
      severity: 'warning',
      message: `${zeroG.length} industr${zeroG.length > 1 ? 'ies have' : 'y has'} no output: ${zeroG.slice(0, 10).map((i) => `'${industries.codes[i]}'`).join(', ')}; their coefficients are set to zero`,
      where: { sectors: zeroG.map((i) => industries.codes[i]!) },
    });
  }

  // B = U ĝ⁻¹.
  const B = zeros(nc, ni);
  for (let c = 0; c < nc; c++) {
    for (let i = 0; i < ni; i++) B.data[c * ni + i] = g[i]! > 0 ? use.data[c * ni + i]! / g[i]! : 0;
  }

  // Scrap, V̄, q, D, W.
  const p = new Float64Array(ni);
  const Vbar = zeros(ni, nc);
  Vbar.data.set(make.data);
  if (scrapIdx >= 0) {
    for (let i = 0; i < ni; i++) {
      p[i] = g[i]! > 0 ? make.data[i * nc + scrapIdx]! / g[i]! : 0;
      Vbar.data[i * nc + scrapIdx] = 0;
    }
  }
  const q = new Float64Array(nc);
  for (let i = 0; i < ni; i++) for (let c = 0; c < nc; c++) q[c] += Vbar.data[i * nc + c]!;
  const notMade = [...q.keys()].filter((c) => c !== scrapIdx && !(q[c]! > 0));
  if (notMade.length) {
    findings.push({
      code: 'commodity-not-made',
      severity: 'note',
      message: `${notMade.length} commodit${notMade.length > 1 ? 'ies are' : 'y is'} made by no industry: ${notMade.slice(0, 10).map((c) => `'${commodities.codes[c]}'`).join(', ')}; their use acts as a primary input (as noncomparable imports do)`,
      data: { commodities: notMade.map((c) => commodities.codes[c]!) },
    });
  }
  const D = zeros(ni, nc);
  const W = zeros(ni, nc);
  for (let i = 0; i < ni; i++) {
    const adj = 1 - p[i]!;
    if (!(adj > 0)) {
      throw new InputError('scrap-share', `industry '${industries.codes[i]}' makes only scrap (scrap share ${p[i]}), so its output cannot be adjusted for scrap`, {
        sector: industries.codes[i]!,
      });
    }
    for (let c = 0; c < nc; c++) {
      const d = q[c]! > 0 ? Vbar.data[i * nc + c]! / q[c]! : 0;
      D.data[i * nc + c] = d;
      W.data[i * nc + c] = d / adj;
    }
  }

  // Commodity technology: C = V′ ĝ⁻¹, square only.
  let Clu: LU | undefined;
  let CtLu: LU | undefined;
  const commodityLU = (): { C: LU; Ct: LU } => {
    if (!Clu || !CtLu) {
      if (ni !== nc) {
        throw new InputError(
          'not-square',
          `the commodity-technology assumption needs as many industries as commodities; these tables have ${ni} industries and ${nc} commodities`,
          {},
          'Use the industry-technology assumption, or aggregate the tables to a square classification',
        );
      }
      if (scrapIdx >= 0) {
        throw new InputError(
          'scrap-commodity-technology',
          `the scrap adjustment applies to the industry-technology assumption only; with commodity technology, leave out the scrap option`,
        );
      }
      const C = zeros(nc, ni);
      for (let c = 0; c < nc; c++) for (let i = 0; i < ni; i++) C.data[c * ni + i] = g[i]! > 0 ? make.data[i * nc + c]! / g[i]! : 0;
      Clu = new LU(C);
      if (Clu.isSingular) {
        throw new InputError('singular', `the product-mix matrix C = V′ ĝ⁻¹ is singular (zero pivot in column ${Clu.singularColumn}), so commodity technology cannot be applied`);
      }
      CtLu = new LU(transpose(C));
    }
    return { C: Clu, Ct: CtLu };
  };

  const cache = new Map<string, Matrix>();
  const memo = (key: string, f: () => Matrix): Matrix => {
    let m = cache.get(key);
    if (!m) {
      m = f();
      cache.set(key, m);
    }
    return m;
  };

  const coefficientsOf = (kind: 'commodity-by-commodity' | 'industry-by-industry'): Matrix =>
    memo(`A:${kind}`, () => {
      if (technology === 'industry') return kind === 'commodity-by-commodity' ? matMul(B, W) : matMul(W, B);
      const { C, Ct } = commodityLU();
      // B C⁻¹ = (C′⁻¹ B′)′ ; C⁻¹ B directly.
      const A = kind === 'commodity-by-commodity' ? transpose(Ct.solveMany(transpose(B))) : C.solveMany(B);
      reportNegatives(A, kind, kind === 'commodity-by-commodity' ? commodities : industries, findings);
      return A;
    });

  const totalOf = (kind: 'commodity-by-commodity' | 'industry-by-industry'): Matrix =>
    memo(`L:${kind}`, () => {
      const lu = new LU(identityMinus(coefficientsOf(kind)), { overwrite: true });
      if (lu.isSingular) {
        throw new InputError('singular', `I − A (${kind}) is singular (zero pivot in column ${lu.singularColumn}): no total requirements exist`);
      }
      return lu.inverse();
    });

  const model: SupplyUseModel = {
    industries,
    commodities,
    technology,
    g,
    q,
    p,
    B,
    D,
    W,
    findings,
    coefficients: coefficientsOf,
    requirements(kind) {
      switch (kind) {
        case 'direct':
          return B;
        case 'commodity-by-commodity':
        case 'industry-by-industry':
          return totalOf(kind);
        case 'industry-by-commodity':
          return memo('L:industry-by-commodity', () => {
            const Lcc = totalOf('commodity-by-commodity');
            if (technology === 'industry') return matMul(W, Lcc);
            return commodityLU().C.solveMany(Lcc);
          });
        default:
          throw new InputError('unknown-kind', `unknown requirements kind '${kind as string}'`, {}, `Use one of ${REQUIREMENTS_KINDS.join(', ')}`);
      }
    },
    axes(kind) {
      switch (kind) {
        case 'direct':
          return { rows: commodities, cols: industries };
        case 'commodity-by-commodity':
          return { rows: commodities, cols: commodities };
        case 'industry-by-commodity':
          return { rows: industries, cols: commodities };
        case 'industry-by-industry':
          return { rows: industries, cols: industries };
        default:
          throw new InputError('unknown-kind', `unknown requirements kind '${kind as string}'`, {}, `Use one of ${REQUIREMENTS_KINDS.join(', ')}`);
      }
    },
  };
  return model;
}

function reportNegatives(A: Matrix, kind: string, axis: Axis, findings: Finding[]): void {
  const n = A.rows;
  const cells: { row: number; col: number; v: number }[] = [];
  let count = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const v = A.data[i * n + j]!;
      if (v < -1e-12) {
        count++;
        if (cells.length < 20) cells.push({ row: i, col: j, v });
      }
    }
  }
  if (!count) return;
  cells.sort((a, b) => a.v - b.v);
  findings.push({
    code: 'negative-coefficient',
    severity: 'warning',
    message: `commodity technology gives ${count} negative ${kind} coefficient${count > 1 ? 's' : ''}, such as ${cells
      .slice(0, 5)
      .map((c) => `'${axis.codes[c.row]}' → '${axis.codes[c.col]}' ${c.v.toPrecision(4)}`)
      .join('; ')}; common remedies are to move the secondary output or to use the industry-technology assumption for it`,
    cells: cells.map((c) => ({ block: 'A', row: c.row, col: c.col })),
    data: { count },
  });
}
