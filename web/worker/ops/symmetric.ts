/**
 * A symmetric table from supply-use (make and use) tables, for the workbench's views: the
 * engine's direct coefficients of the chosen kind (industry by industry or commodity by
 * commodity) with final demand and value added carried over by the same transformation, so that
 * the table's Leontief inverse is the total-requirements matrix of that kind.
 *
 * With T the industry × commodity transformation (industry technology: the scrap-adjusted market
 * shares W; commodity technology: C⁻¹, C = V′ ĝ⁻¹ the product mix):
 *   industry × industry:   A = T B, x = g, F = T F_c, V as read (by industry)
 *   commodity × commodity: A = B T, x = q, F = F_c, V = (V ĝ⁻¹) T q̂
 * and Z = A x̂. These are the usual product-technology and industry-technology constructions
 * (common practice; see the derivation in engine/supply-use.ts).
 */
import { InputError, LU, matMul, supplyUse, transpose, zeros } from '../../../engine/index';
import type { Finding, Matrix, PlainTable, SupplyUseModel, Technology } from '../../../engine/index';
import type { SupplyUseRead } from '../../../src/io/index';

export type SymmetricKind = 'industry-by-industry' | 'commodity-by-commodity';
export const SYMMETRIC_KINDS: readonly SymmetricKind[] = ['industry-by-industry', 'commodity-by-commodity'];

export interface SymmetricRead {
  table: PlainTable;
  findings: Finding[];
  model: SupplyUseModel;
}

const rowsOf = (m: Matrix): number[][] => Array.from({ length: m.rows }, (_, i) => Array.from(m.data.subarray(i * m.cols, (i + 1) * m.cols)));

/** C⁻¹ applied on the left (C⁻¹ M) for commodity technology, M commodities × anything. */
function productMixLU(model: SupplyUseModel, make: Matrix): { left: (m: Matrix) => Matrix; right: (m: Matrix) => Matrix } {
  const ni = model.industries.codes.length;
  const nc = model.commodities.codes.length;
  if (ni !== nc) throw new InputError('not-square', `commodity technology needs as many industries as commodities; these tables have ${ni} and ${nc}`, {}, 'Choose industry technology');
  const C = zeros(nc, ni);
  for (let c = 0; c < nc; c++) for (let i = 0; i < ni; i++) C.data[c * ni + i] = model.g[i]! > 0 ? make.data[i * nc + c]! / model.g[i]! : 0;
  const lu = new LU(C);
  const lut = new LU(transpose(C));
  if (lu.isSingular) throw new InputError('singular', 'the product-mix matrix C = V′ ĝ⁻¹ is singular, so commodity technology cannot be applied', {}, 'Choose industry technology');
  return { left: (m) => lu.solveMany(m), right: (m) => transpose(lut.solveMany(transpose(m))) };
}

/** Build the symmetric table of `kind` from what readSupplyUse read. */
export function symmetricFromSupplyUse(read: SupplyUseRead, kind: SymmetricKind, options: { technology?: Technology; title?: string } = {}): SymmetricRead {
  if (!SYMMETRIC_KINDS.includes(kind)) throw new InputError('bad-kind', `the kind of table must be ${SYMMETRIC_KINDS.join(' or ')}; got '${String(kind)}'`);
  const input = { ...read.input, ...(options.technology ? { technology: options.technology } : {}) };
  const model = supplyUse(input);
  const A = model.coefficients(kind);
  const ni = model.industries.codes.length;
  const nc = model.commodities.codes.length;
  const Fc = read.finalDemand.F;
  const Vi = read.valueAdded.V;
  const tech = model.technology;
  const mix = tech === 'commodity' ? productMixLU(model, read.input.make) : undefined;
  let sectors = model.industries;
  let x: Float64Array;
  let F: Matrix;
  let V: Matrix;
  if (kind === 'industry-by-industry') {
    x = Float64Array.from(model.g);
    F = mix ? mix.left(Fc) : matMul(model.W, Fc);
    V = Vi;
  } else {
    sectors = model.commodities;
    x = Float64Array.from(model.q);
    F = Fc;
    // Value added per unit of industry output, moved to commodities by T, times commodity output.
    const vc = zeros(Vi.rows, ni);
    for (let r = 0; r < Vi.rows; r++) for (let i = 0; i < ni; i++) vc.data[r * ni + i] = model.g[i]! > 0 ? Vi.data[r * ni + i]! / model.g[i]! : 0;
    const perUnit = mix ? mix.right(vc) : matMul(vc, model.W);
    V = zeros(Vi.rows, nc);
    for (let r = 0; r < Vi.rows; r++) for (let c = 0; c < nc; c++) V.data[r * nc + c] = perUnit.data[r * nc + c]! * x[c]!;
  }
  const n = sectors.codes.length;
  const Z = zeros(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) Z.data[i * n + j] = A.data[i * n + j]! * x[j]!;
  const meta = { ...(read.mappings.use.meta ?? {}) };
  const techText = tech === 'industry' ? 'industry technology (market shares' + (input.scrap ? `, scrap ${input.scrap} adjusted` : '') + ')' : 'commodity technology';
  meta.title = options.title ?? `${meta.title ?? 'Supply-use tables'}: ${kind.replace(/-/g, ' ')} (${techText})`;
  meta.notes = [
    ...(meta.notes ?? []),
    `Derived from make and use tables: ${kind.replace(/-/g, ' ')} coefficients under ${techText}; total output is ${kind === 'industry-by-industry' ? 'industry output g' : 'commodity output q'}.`,
  ];
  const table: PlainTable = {
    sectors: { codes: [...sectors.codes], labels: [...sectors.labels] },
    Z: rowsOf(Z),
    finalDemand: { codes: [...read.finalDemand.axis.codes], labels: [...read.finalDemand.axis.labels], values: rowsOf(F) },
    valueAdded: { codes: [...read.valueAdded.axis.codes], labels: [...read.valueAdded.axis.labels], values: rowsOf(V) },
    x: Array.from(x),
    meta,
  };
  return { table, findings: [...read.findings, ...model.findings], model };
}
