/**
 * The mixed exogenous/endogenous model: the outputs of some sectors X are fixed (a capacity
 * limit, a closure, a quota); the final demand of the other sectors E is given. The model
 * finds the outputs of E and the final demand that X can serve:
 *
 *   x_E = (I − A_EE)⁻¹ (f_E + A_EX x_X)
 *   f_X = (I − A_XX) x_X − A_XE x_E
 *
 * Solved with the open model's factorisation: with z = L [f_E; 0] and L_{:,X} (one solve per
 * fixed sector), f_X solves L_XX f_X = x_X − z_X and x = z + L_{:,X} f_X. The model is linear,
 * so it works alike on levels (the default: the table's own final demand, f = x − Z i) and on
 * changes (pass changes in final demand and fixed changes in output).
 *
 * With nothing fixed it is the open model, x = L f.
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import type { LeontiefModel } from './leontief';
import { LU } from './linalg/lu';
import { zeros } from './linalg/matrix';
import { axisCopy, CAUTIONS } from './measures';
import type { Axis, Table } from './table';
import { moneyUnit, sectorIndex } from './table';

export const MIXED_ABOUT =
  'Mixed model: with the outputs of some sectors fixed (a capacity limit or a closure), the outputs the other sectors then need and the final demand the fixed sectors can still serve.';

export interface FixedOutput {
  /** A sector code (or label). */
  sector: string;
  /** Its output, held fixed (money units; a level, or a change when final demand is given as changes). */
  output: number;
}

export interface MixedResult {
  about: string;
  sectors: Axis;
  unit: string;
  /** The sector codes whose outputs were fixed. */
  fixed: string[];
  /** True for each fixed sector. */
  isFixed: boolean[];
  /** Output by sector: as fixed for X, solved for E. */
  output: Float64Array;
  /** Final demand by sector: as given for E, solved for X (what the fixed sectors can serve). */
  finalDemand: Float64Array;
  /** The relative residual ‖(I − A)x − f‖ of the solution. */
  residual: number;
  findings: Finding[];
  cautions: readonly string[];
}

export function mixedModel(t: Table, model: LeontiefModel, fixed: readonly FixedOutput[], options: { finalDemand?: ArrayLike<number> } = {}): MixedResult {
  const n = t.x.length;
  if (model.n !== n) throw new InputError('bad-size', `the model has ${model.n} sectors but the table has ${n}`);
  const X: number[] = [];
  const xX: number[] = [];
  const isFixed = new Array<boolean>(n).fill(false);
  fixed.forEach((c, k) => {
    const i = sectorIndex(t, c.sector);
    if (isFixed[i]) throw new InputError('duplicate-sector', `the output of '${t.sectors.codes[i]}' is fixed twice`, { sector: t.sectors.codes[i]! }, 'Fix each sector once');
    if (typeof c.output !== 'number' || !Number.isFinite(c.output)) {
      throw new InputError('bad-amount', `fixed output ${k + 1} ('${c.sector}'): ${JSON.stringify(c.output)} is not a finite number`, { sector: t.sectors.codes[i]!, text: String(c.output) });
    }
    isFixed[i] = true;
    X.push(i);
    xX.push(c.output);
  });
  let f: Float64Array;
  if (options.finalDemand) {
    if (options.finalDemand.length !== n) throw new InputError('bad-size', `final demand has ${options.finalDemand.length} values for ${n} sectors`);
    f = Float64Array.from(options.finalDemand);
    for (let i = 0; i < n; i++) if (!Number.isFinite(f[i]!)) throw new InputError('non-finite', `final demand for '${t.sectors.codes[i]}' is ${f[i]}`, { sector: t.sectors.codes[i]! });
  } else {
    f = Float64Array.from(t.x);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) f[i] -= t.Z.data[i * n + j]!;
  }
  const s = X.length;
  const fE = Float64Array.from(f);
  for (const i of X) fE[i] = 0;
  const z = model.solve(fE);
  const output = Float64Array.from(z);
  const finalDemand = Float64Array.from(f);
  if (s > 0) {
    const E = zeros(n, s);
    X.forEach((i, k) => (E.data[i * s + k] = 1));
    const LX = model.solveMany(E);
    const LXX = zeros(s, s);
    for (let a = 0; a < s; a++) for (let b = 0; b < s; b++) LXX.data[a * s + b] = LX.data[X[a]! * s + b]!;
    const lu = new LU(LXX);
    if (lu.isSingular) throw new InputError('singular', 'the fixed sectors form a singular block of the Leontief inverse; their outputs cannot all be fixed', { sectors: X.map((i) => t.sectors.codes[i]!) });
    const fX = lu.solve(Float64Array.from(X, (i, k) => xX[k]! - z[i]!));
    for (let i = 0; i < n; i++) {
      let d = 0;
      for (let k = 0; k < s; k++) d += LX.data[i * s + k]! * fX[k]!;
      output[i] = z[i]! + d;
    }
    X.forEach((i, k) => {
      output[i] = xX[k]!;
      finalDemand[i] = fX[k]!;
    });
  }
  const findings: Finding[] = [];
  const short = X.filter((i) => finalDemand[i]! < 0 && !options.finalDemand);
  if (short.length) {
    findings.push({
      code: 'fixed-output-short',
      severity: 'warning',
      message: `the fixed output of ${short.map((i) => `'${t.sectors.codes[i]}'`).join(', ')} does not cover what the other sectors need from ${short.length > 1 ? 'them' : 'it'}: the final demand ${short.length > 1 ? 'they' : 'it'} can serve is negative (${short
        .map((i) => finalDemand[i]!.toPrecision(4))
        .join(', ')}), so the other sectors' output cannot be reached without imports or more capacity`,
      where: { sectors: short.map((i) => t.sectors.codes[i]!) },
    });
  }
  return {
    about: MIXED_ABOUT,
    sectors: axisCopy(t.sectors),
    unit: moneyUnit(t.meta),
    fixed: X.map((i) => t.sectors.codes[i]!),
    isFixed,
    output,
    finalDemand,
    residual: model.residual(output, finalDemand),
    findings,
    cautions: CAUTIONS,
  };
}
