/**
 * The Ghosh (supply-driven) model.
 *
 *   B = x̂⁻¹ Z          allocation coefficients: the share of sector i's output sold to sector j
 *   G = (I − B)⁻¹      the Ghosh inverse
 *   x′ = v′ G          output from primary inputs v (value added and imports), so Δx′ = Δv′ G
 *
 * `GhoshModel` factors I − B once; `outputs` is one transposed solve, `rowSums` (G i, the total
 * forward linkages) one solve, and `inverse` forms G only when G is the result. With positive
 * outputs G = x̂⁻¹ L x̂ (common practice).
 *
 * Caution (common practice): the model assumes each sector sells its output to buyers in
 * fixed shares, so a buyer takes more inputs when its suppliers have more to sell, whatever
 * its own needs, and can produce without the inputs it lost. It is widely judged implausible
 * as a causal model of supply shocks; read its results as a measure of forward
 * interdependence, not as a forecast of what a supply cut would do.
 */
import { InputError } from './errors';
import { LeontiefModel } from './leontief';
import type { Matrix } from './linalg/matrix';
import { zeros } from './linalg/matrix';
import { axisCopy, CAUTIONS } from './measures';
import type { Axis, Table } from './table';
import { moneyUnit, sectorIndex } from './table';

/** The caution every Ghosh result carries. */
export const GHOSH_CAUTION =
  'Supply-driven model: it assumes buyers take whatever their suppliers sell them in fixed shares, whatever their own technology needs, and is widely judged implausible as a model of cause and effect; treat its results as a measure of forward interdependence, not as a forecast of a supply shock.';

export const GHOSH_ABOUT =
  'Ghosh supply-driven model: the change in each sector\'s output when primary inputs change, with every sector\'s sales shared among buyers in fixed proportions; widely judged implausible as a model of cause and effect, so read it as a measure of forward interdependence, not a forecast.';

/** Allocation coefficients B = x̂⁻¹ Z (row i divided by xᵢ; a zero-output row stays zero). */
export function allocationCoefficients(t: Pick<Table, 'Z' | 'x'>): Matrix {
  const n = t.x.length;
  const B = zeros(n, n);
  for (let i = 0; i < n; i++) {
    const xi = t.x[i]!;
    if (!(xi > 0)) continue;
    const o = i * n;
    for (let j = 0; j < n; j++) B.data[o + j] = t.Z.data[o + j]! / xi;
  }
  return B;
}

/** Primary inputs by sector implied by the table: vⱼ = xⱼ − Σᵢ zᵢⱼ (value added and imports). */
export function primaryInputs(t: Pick<Table, 'Z' | 'x'>): Float64Array {
  const n = t.x.length;
  const v = Float64Array.from(t.x);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) v[j] -= t.Z.data[i * n + j]!;
  return v;
}

export class GhoshModel {
  readonly n: number;
  /** Allocation coefficients. */
  readonly B: Matrix;
  private readonly core: LeontiefModel;

  constructor(B: Matrix) {
    this.core = new LeontiefModel(B);
    this.n = B.rows;
    this.B = B;
  }

  static fromTable(t: Table): GhoshModel {
    return new GhoshModel(allocationCoefficients(t));
  }

  /** Output x′ = v′G for primary inputs v (one transposed solve). */
  outputs(v: ArrayLike<number>): Float64Array {
    return this.core.weighted(v);
  }

  /** Row sums of G, G i (one solve): the total forward linkages. */
  rowSums(): Float64Array {
    return this.core.solve(new Float64Array(this.n).fill(1));
  }

  /** y = G c for any column c (one solve). */
  solve(c: ArrayLike<number>): Float64Array {
    return this.core.solve(c);
  }

  /** Row vector c′G (one transposed solve). */
  weighted(c: ArrayLike<number>): Float64Array {
    return this.core.weighted(c);
  }

  /** The Ghosh inverse G = (I − B)⁻¹, formed on first request. */
  inverse(): Matrix {
    return this.core.inverse();
  }

  get isSingular(): boolean {
    return this.core.isSingular;
  }
}

export interface PrimaryInputChange {
  /** A sector code (or label). */
  sector: string;
  /** The change in that sector's primary inputs, in money units. */
  amount: number;
}

export interface GhoshImpact {
  about: string;
  sectors: Axis;
  unit: string;
  /** Δv by sector. */
  primaryChange: Float64Array;
  /** Δx′ = Δv′G by sector. */
  output: Float64Array;
  totalOutput: number;
  cautions: readonly string[];
}

/** Output changes in the supply-driven model from changes in primary inputs (by sector, or a full vector). */
export function ghoshImpact(t: Table, model: GhoshModel, change: readonly PrimaryInputChange[] | ArrayLike<number>): GhoshImpact {
  const n = t.x.length;
  if (model.n !== n) throw new InputError('bad-size', `the Ghosh model has ${model.n} sectors but the table has ${n}`);
  const dv = new Float64Array(n);
  if (Array.isArray(change) && (change.length === 0 || typeof change[0] === 'object')) {
    (change as readonly PrimaryInputChange[]).forEach((c, k) => {
      const i = sectorIndex(t, c.sector);
      if (typeof c.amount !== 'number' || !Number.isFinite(c.amount)) {
        throw new InputError('bad-amount', `primary-input change ${k + 1} ('${c.sector}'): the amount ${JSON.stringify(c.amount)} is not a finite number`, { sector: c.sector });
      }
      dv[i] += c.amount;
    });
  } else {
    const v = change as ArrayLike<number>;
    if (v.length !== n) throw new InputError('bad-size', `the primary-input change has ${v.length} values for ${n} sectors`);
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(v[i]!)) throw new InputError('non-finite', `the primary-input change for '${t.sectors.codes[i]}' is ${v[i]}`, { sector: t.sectors.codes[i]! });
      dv[i] = v[i]!;
    }
  }
  const output = model.outputs(dv);
  let total = 0;
  for (let i = 0; i < n; i++) total += output[i]!;
  return { about: GHOSH_ABOUT, sectors: axisCopy(t.sectors), unit: moneyUnit(t.meta), primaryChange: dv, output, totalOutput: total, cautions: [GHOSH_CAUTION, ...CAUTIONS] };
}
