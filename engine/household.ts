/**
 * Closing the model for households (the Type II model).
 *
 * Households are added as sector n + 1: their row is labour income per unit of output, hᵣ (a
 * chosen value-added row, such as compensation of employees, ÷ output), and their column is
 * what households buy per unit of household income, h꜀ = f ÷ D, where f is the chosen
 * final-demand column over the sectors and D the household income it is divided by. Agencies
 * choose D in different ways; the closure basis names the choice (`basis`):
 *
 *   labour-income       D = Σ labour income (the chosen rows) + o        (the default)
 *   consumption-total   D = Σ f + o: the column's own total; households spend all they earn here
 *   household-income    D = a household income the user gives (not in the table), in its units
 *   propensity          D = (Σ f + o) ÷ c for a share c of income spent in the economy
 *
 * where o is the households' purchases from households (the corner cell of a closed table, such
 * as paid domestic work; 0 unless given), whose coefficient is h꜀꜀ = o ÷ D. The share of
 * household income spent on the table's products is (Σ f + o) ÷ D; each basis is the propensity
 * basis at that share (so `propensity` with that share reproduces any of them). The closed
 * coefficients are
 *
 *     Ā = [ A   h꜀  ]
 *         [ hᵣ′ h꜀꜀ ]
 *
 * Nothing here factors Ā: the closed model is solved through the open model's factorisation by
 * the bordered (Schur-complement) identities, with u = L h꜀, w′ = hᵣ′L and s = 1 − hᵣ′L h꜀:
 *
 *     (I − Ā)⁻¹ = [ L + u w′/s   u/s ]
 *                 [ w′/s         1/s ]
 *
 * so the n × n block is L̄ = L + u w′/s. Productivity: for a productive open model and
 * nonnegative hᵣ, h꜀, the closed model is productive (ρ(Ā) < 1) exactly when s > 0
 * (I − Ā is then a nonsingular M-matrix; common practice). s ≤ 0 means each unit of household
 * income comes back as one unit or more through consumption: induced effects have no bound.
 *
 * Example (Miller & Blair (2009), ch. 2, from memory): A = [.15 .25; .20 .05], h꜀ = [.05; .40],
 * hᵣ′ = [.30 .25], h꜀꜀ = .05 give the closed inverse [1.3651 .4253 .2509; .5273 1.3481 .5954;
 * .5698 .4890 1.2885] and Type II output multipliers 1.8924 and 1.7733.
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import { LeontiefModel } from './leontief';
import type { Matrix } from './linalg/matrix';
import { zeros } from './linalg/matrix';
import { bestMatch, finalDemandIndex, guessLabourIncomeRowIn, HOUSEHOLD_WORDS, NOT_HOUSEHOLD, onlyClassed, valueAddedIndex } from './measures';
import type { Table } from './table';
import { perUnit } from './table';

export const HOUSEHOLD_ABOUT =
  'The model closed for households: labour income earned in production is spent on consumption, and that spending is produced in turn (the induced effect behind Type II multipliers).';

/** How household spending is turned into coefficients: what it is divided by (see the file comment). */
export type ClosureBasis = 'labour-income' | 'consumption-total' | 'household-income' | 'propensity';

export const CLOSURE_BASES: readonly ClosureBasis[] = ['labour-income', 'consumption-total', 'household-income', 'propensity'];

/** One line per closure basis: what household spending is divided by. */
export const CLOSURE_BASIS_ABOUT: Readonly<Record<ClosureBasis, string>> = {
  'labour-income': 'household spending ÷ total labour income in the table (the chosen income rows)',
  'consumption-total': "household spending ÷ the consumption column's own total over the table's sectors (households spend all their income on the table's products; where a published column total also holds imports and taxes, give that total as the household income instead)",
  'household-income': 'household spending ÷ a household income given by the user (not in the table)',
  propensity: "a given share of income spent in the economy × the consumption column's shares of its own total",
};

export interface HouseholdOptions {
  /** The value-added row or rows paid to households as labour income (such as compensation of employees). */
  income: string | string[];
  /** The final-demand column of household consumption. */
  consumption: string;
  /**
   * What household spending is divided by (default: `propensity` when a propensity is given,
   * `household-income` when a household income is given, else `labour-income`).
   */
  basis?: ClosureBasis;
  /**
   * The share of household income that households spend in the table's economy (basis
   * `propensity`): the household column is this share times the column's shares of its own total.
   */
  propensity?: number;
  /** The household income spending is divided by (basis `household-income`), in the table's money units. */
  householdIncome?: number;
  /** Households' purchases from households (the corner cell of a closed table), in money units; default 0. */
  ownPurchases?: number;
}

/** The basis a set of options means (an explicit basis, else inferred from the figures given). */
export function closureBasis(o: Pick<HouseholdOptions, 'basis' | 'propensity' | 'householdIncome'>): ClosureBasis {
  return o.basis ?? (o.propensity !== undefined ? 'propensity' : o.householdIncome !== undefined ? 'household-income' : 'labour-income');
}

/** The spending share below which, and above which, a closure is flagged as implausible. */
export const PLAUSIBLE_SHARE = { low: 0.2, high: 1 } as const;

export interface HouseholdClosure {
  about: string;
  incomeRows: string[];
  consumptionColumn: string;
  /** hᵣ: labour income per unit of output, by sector (length n). */
  income: Float64Array;
  /** h꜀: household purchases per unit of household income, by sector (length n). */
  consumption: Float64Array;
  /** Σ labour income in the table (money units). */
  totalIncome: number;
  /** Σ of the consumption column (money units). */
  totalConsumption: number;
  /** Σ h꜀: household spending in the economy per unit of income. */
  spendingRate: number;
  /** The closure basis used. */
  basis: ClosureBasis;
  /** D: the household income household spending is divided by (money units). */
  denominator: number;
  /** o: households' purchases from households (money units; 0 when not given). */
  ownPurchases: number;
  /** h꜀꜀ = o ÷ D. */
  own: number;
  /** (Σ f + o) ÷ D: the share of household income spent on the table's products (households' own purchases included). */
  share: number;
  /** s = 1 − h꜀꜀ − hᵣ′L h꜀; the closed model is productive exactly when s > 0. */
  schur: number;
  productive: boolean;
  /** Errors when the closure cannot be used; notes otherwise. */
  findings: Finding[];
}

/** The remedy named in every refusal of a non-productive closure. */
const REMEDY = 'Give a smaller share of income spent (propensity), choose a narrower income row, or use the open model (Type I only)';

function numberOk(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/**
 * Build the household row and column from a value-added row and a final-demand column and
 * check the closed model for productivity. Throws `InputError` for rows or columns that do not
 * exist, a propensity outside [0, 1], a household income that is not positive, or no labour
 * income at all; a closure that is not productive is returned with an error finding
 * (`household-not-productive`, naming the sectors that carry most of the loop), and
 * `ClosedModel` refuses it. A spending share above 1 or below 0.2 is a warning
 * (`household-share-high`, `household-share-low`).
 */
export function householdClosure(t: Table, open: LeontiefModel, options: HouseholdOptions): HouseholdClosure {
  const n = t.x.length;
  if (open.n !== n) throw new InputError('bad-size', `the model has ${open.n} sectors but the table has ${n}`);
  const rows = Array.isArray(options.income) ? options.income : [options.income];
  if (!rows.length) throw new InputError('no-labour-income', 'no value-added row was named as household income', {}, 'Name the row of compensation of employees');
  const ri = rows.map((r) => valueAddedIndex(t, r));
  const ci = finalDemandIndex(t, options.consumption);
  const incomeRows = ri.map((i) => t.valueAdded.codes[i]!);
  const consumptionColumn = t.finalDemand.codes[ci]!;
  const basis = closureBasis(options);
  if (!CLOSURE_BASES.includes(basis)) throw new InputError('bad-closure-basis', `the closure basis must be one of ${CLOSURE_BASES.join(', ')}; got '${String(basis)}'`, { text: String(basis) });
  if (basis === 'propensity' && options.propensity === undefined) throw new InputError('bad-propensity', 'the propensity basis needs the share of income spent (propensity)');
  if (options.propensity !== undefined && (!numberOk(options.propensity) || options.propensity < 0 || options.propensity > 1)) {
    throw new InputError('bad-propensity', `the share of income spent must be a number from 0 to 1; got ${options.propensity}`, { text: String(options.propensity) });
  }
  if (basis === 'household-income' && !(numberOk(options.householdIncome) && options.householdIncome > 0)) {
    throw new InputError('bad-household-income', `the household income must be a positive number in the table's money units; got ${options.householdIncome}`, { text: String(options.householdIncome) });
  }
  const ownPurchases = options.ownPurchases ?? 0;
  if (!numberOk(ownPurchases) || ownPurchases < 0) {
    throw new InputError('bad-own-purchases', `households' purchases from households must be a number of 0 or more; got ${options.ownPurchases}`, { text: String(options.ownPurchases) });
  }
  const pay = new Float64Array(n);
  for (const r of ri) for (let j = 0; j < n; j++) pay[j] += t.V.data[r * n + j]!;
  let totalIncome = 0;
  for (let j = 0; j < n; j++) totalIncome += pay[j]!;
  const k = t.F.cols;
  const col = new Float64Array(n);
  let totalConsumption = 0;
  for (let i = 0; i < n; i++) {
    col[i] = t.F.data[i * k + ci]!;
    totalConsumption += col[i]!;
  }
  for (const [v, what] of [
    [totalIncome, 'labour income'],
    [totalConsumption, 'household consumption'],
  ] as const) {
    if (!Number.isFinite(v)) throw new InputError('non-finite', `total ${what} is ${v}; the ${what === 'labour income' ? `row${rows.length > 1 ? 's' : ''} ${incomeRows.join(', ')}` : `column ${consumptionColumn}`} must hold finite numbers`);
  }
  if (!(totalIncome > 0)) {
    throw new InputError(
      'no-household-income',
      `the value-added row${incomeRows.length > 1 ? 's' : ''} ${incomeRows.map((c) => `'${c}'`).join(', ')} add${incomeRows.length > 1 ? '' : 's'} up to ${totalIncome}, so households earn no income to spend`,
      { rowLabel: incomeRows[0]! },
      'Choose the row of compensation of employees (or wages and salaries)',
    );
  }
  const spent = totalConsumption + ownPurchases;
  if ((basis === 'propensity' || basis === 'consumption-total') && !(spent > 0)) {
    throw new InputError('no-household-consumption', `the final-demand column '${consumptionColumn}' adds up to ${totalConsumption}, so it gives no consumption shares`, { columnLabel: consumptionColumn });
  }
  const denominator =
    basis === 'labour-income' ? totalIncome + ownPurchases : basis === 'consumption-total' ? spent : basis === 'household-income' ? options.householdIncome! : options.propensity! > 0 ? spent / options.propensity! : Infinity;
  const income = perUnit(pay, t.x);
  const consumption = new Float64Array(n);
  for (let i = 0; i < n; i++) consumption[i] = col[i]! / denominator;
  const own = ownPurchases / denominator;
  let spendingRate = 0;
  for (let i = 0; i < n; i++) spendingRate += consumption[i]!;
  const share = spendingRate + own;
  const w = open.weighted(income);
  let loop = own;
  for (let i = 0; i < n; i++) loop += w[i]! * consumption[i]!;
  const schur = 1 - loop;
  const findings: Finding[] = [];
  const negative = [...income].some((v) => v < 0) || [...consumption].some((v) => v < 0);
  const productive = schur > 1e-9;
  const named = `income ${incomeRows.map((c) => `'${c}'`).join(', ')}, consumption '${consumptionColumn}'`;
  const data = { loop, schur, spendingRate, share, basis, denominator, own };
  if (!productive) {
    // The sectors that carry most of the loop hᵣ′L h꜀: wᵢ h꜀ᵢ, largest first.
    const parts = [...consumption.keys()].map((i) => ({ i, v: w[i]! * consumption[i]! })).sort((a, b) => b.v - a.v).filter((p) => p.v > 0).slice(0, 5);
    const sectors = parts.map((p) => t.sectors.codes[p.i]!);
    findings.push({
      code: 'household-not-productive',
      severity: 'error',
      message: `the model closed for households (${named}; ${basis}) is not productive: each unit of household income spent comes back as ${loop.toPrecision(4)} units of household income (h꜀꜀ + hᵣ′L h꜀ ≥ 1), so induced effects would grow without bound; households spend ${share.toPrecision(4)} of their income here, most of the loop through ${sectors.map((c) => `'${c}'`).join(', ') || 'no sector'}. ${REMEDY}`,
      where: { rowLabel: incomeRows[0]!, columnLabel: consumptionColumn, sectors },
      cells: [{ block: 'closed', row: n, col: n }],
      data: { ...data, sectors },
    });
  } else {
    findings.push({
      code: 'household-closure',
      severity: 'note',
      message: `closed for households with ${named}, basis ${basis} (${CLOSURE_BASIS_ABOUT[basis]}; divided by ${denominator.toPrecision(6)}): households spend ${share.toPrecision(4)} of their income on the table's products, and each unit of household income regenerates ${loop.toPrecision(4)} (Type II / Type I labour-income ratio ${(1 / schur).toPrecision(4)})`,
      data,
    });
  }
  if (share > PLAUSIBLE_SHARE.high || share < PLAUSIBLE_SHARE.low) {
    const high = share > PLAUSIBLE_SHARE.high;
    findings.push({
      code: high ? 'household-share-high' : 'household-share-low',
      severity: 'warning',
      message: high
        ? `households would spend ${share.toPrecision(4)} per unit of income on the table's products (more than all of it), which inflates induced effects and Type II multipliers; the consumption column probably holds more than labour income pays for (other income, transfers, imports or taxes). Choose another basis: a household income (--household-income), the column's own total, or a propensity`
        : `households would spend only ${share.toPrecision(4)} per unit of income on the table's products (below ${PLAUSIBLE_SHARE.low}); check that the consumption column and the income rows are the ones meant, and the basis`,
      where: { rowLabel: incomeRows[0]!, columnLabel: consumptionColumn },
      data: { share },
    });
  }
  if (negative) {
    findings.push({
      code: 'household-negative',
      severity: 'warning',
      message: 'the household row or column holds negative values, so the productivity test (1 − hᵣ′L h꜀ > 0) is a necessary condition only; check that the chosen row and column are the ones meant',
      where: { rowLabel: incomeRows[0]!, columnLabel: consumptionColumn },
    });
  }
  return {
    about: HOUSEHOLD_ABOUT,
    incomeRows,
    consumptionColumn,
    income,
    consumption,
    totalIncome,
    totalConsumption,
    spendingRate,
    basis,
    denominator,
    ownPurchases,
    own,
    share,
    schur,
    productive,
    findings,
  };
}

/**
 * The model closed for households, answered through the open model's factorisation (no second
 * factorisation; see the file comment). Refuses a closure that is not productive with an
 * `InputError` `household-not-productive`.
 */
export class ClosedModel {
  readonly n: number;
  readonly open: LeontiefModel;
  readonly closure: HouseholdClosure;
  /** u = L h꜀: output per unit of household spending. */
  readonly u: Float64Array;
  /** w′ = hᵣ′L: labour-income (open) multipliers. */
  readonly w: Float64Array;
  /** s = 1 − h꜀꜀ − hᵣ′L h꜀. */
  readonly s: number;

  constructor(open: LeontiefModel, closure: HouseholdClosure) {
    const n = open.n;
    if (closure.income.length !== n || closure.consumption.length !== n) {
      throw new InputError('bad-size', `the household row and column must have ${n} values, one per sector`);
    }
    this.n = n;
    this.open = open;
    this.closure = closure;
    this.u = open.solve(closure.consumption);
    this.w = open.weighted(closure.income);
    let loop = closure.own ?? 0;
    for (let i = 0; i < n; i++) loop += this.w[i]! * closure.consumption[i]!;
    this.s = 1 - loop;
    if (!(this.s > 1e-9) || !closure.productive) {
      const f = closure.findings.find((x) => x.code === 'household-not-productive');
      throw new InputError(
        'household-not-productive',
        f?.message ?? `the model closed for households is not productive (1 − hᵣ′L h꜀ = ${this.s.toPrecision(4)} ≤ 0)`,
        { rowLabel: closure.incomeRows[0]!, columnLabel: closure.consumptionColumn },
        f ? undefined : REMEDY,
      );
    }
  }

  /**
   * Sector outputs x̄ (length n) and household income y in the closed model for a demand d on
   * the sectors (and e on households, default 0): y = (e + w′d)/s, x̄ = L d + u y.
   */
  solve(d: ArrayLike<number>, e = 0): { x: Float64Array; income: number; open: Float64Array } {
    const x0 = this.open.solve(d);
    return this.extend(d, x0, e);
  }

  /** The closed solution from an open solution x0 = L d already at hand (no further solve). */
  extend(d: ArrayLike<number>, x0: Float64Array, e = 0): { x: Float64Array; income: number; open: Float64Array } {
    const n = this.n;
    let wd = 0;
    for (let i = 0; i < n; i++) wd += this.w[i]! * d[i]!;
    const y = (e + wd) / this.s;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = x0[i]! + this.u[i]! * y;
    return { x, income: y, open: x0 };
  }

  /**
   * The row vector c̄′(I − Ā)⁻¹ for weights c on sectors and cₕ on households:
   * q = (cₕ + (c′L) h꜀)/s, p′ = c′L + q w′. `sectors` is p (length n), `household` is q.
   * With cₕ = 0, `sectors` is c′L̄: the total (Type II) multipliers of the measure c.
   */
  weighted(c: ArrayLike<number>, cHousehold = 0): { sectors: Float64Array; household: number; open: Float64Array } {
    const cl = this.open.weighted(c);
    return this.extendWeighted(cl, cHousehold);
  }

  /** The closed weighted row from an open one cl = c′L already at hand. */
  extendWeighted(cl: Float64Array, cHousehold = 0): { sectors: Float64Array; household: number; open: Float64Array } {
    const n = this.n;
    let ch = 0;
    for (let i = 0; i < n; i++) ch += cl[i]! * this.closure.consumption[i]!;
    const q = (cHousehold + ch) / this.s;
    const p = new Float64Array(n);
    for (let j = 0; j < n; j++) p[j] = cl[j]! + q * this.w[j]!;
    return { sectors: p, household: q, open: cl };
  }

  /** Total (Type II) output multipliers: the column sums of L̄ over the n sectors (households excluded). */
  outputMultipliers(): Float64Array {
    return this.weighted(new Float64Array(this.n).fill(1)).sectors;
  }

  /** The n × n block L̄ = L + u w′/s of the closed inverse, formed on request (it needs L). */
  inverseBlock(): Matrix {
    const n = this.n;
    const L = this.open.inverse();
    const out = zeros(n, n);
    for (let i = 0; i < n; i++) {
      const ui = this.u[i]! / this.s;
      const o = i * n;
      for (let j = 0; j < n; j++) out.data[o + j] = L.data[o + j]! + ui * this.w[j]!;
    }
    return out;
  }

  /** The whole (n + 1) × (n + 1) closed inverse (I − Ā)⁻¹, households last, formed on request. */
  inverse(): Matrix {
    const n = this.n;
    const B = this.inverseBlock();
    const out = zeros(n + 1, n + 1);
    for (let i = 0; i < n; i++) {
      out.data.set(B.data.subarray(i * n, (i + 1) * n), i * (n + 1));
      out.data[i * (n + 1) + n] = this.u[i]! / this.s;
      out.data[n * (n + 1) + i] = this.w[i]! / this.s;
    }
    out.data[n * (n + 1) + n] = 1 / this.s;
    return out;
  }

  /** The closed coefficients Ā, (n + 1) × (n + 1), households last (for display and export). */
  coefficients(): Matrix {
    const n = this.n;
    const A = this.open.A;
    const out = zeros(n + 1, n + 1);
    for (let i = 0; i < n; i++) {
      out.data.set(A.data.subarray(i * n, (i + 1) * n), i * (n + 1));
      out.data[i * (n + 1) + n] = this.closure.consumption[i]!;
      out.data[n * (n + 1) + i] = this.closure.income[i]!;
    }
    out.data[n * (n + 1) + n] = this.closure.own ?? 0;
    return out;
  }
}

/** The final-demand column of household consumption guessed from its label or code, or undefined when unsure. */
export function guessHouseholdColumn(t: Table): string | undefined {
  return onlyClassed(t.finalDemand, 'households') ?? bestMatch(t.finalDemand, HOUSEHOLD_WORDS, NOT_HOUSEHOLD);
}


/** The value-added row of labour income (compensation, wages, labour income) guessed from its label, or undefined when unsure. */
export function guessLabourIncomeRow(t: Table): string | undefined {
  return guessLabourIncomeRowIn(t);
}

/**
 * Both halves of the household closure guessed from labels ('household', 'personal
 * consumption', 'compensation', 'wages', 'labour income'...); undefined unless each matches
 * exactly one row or column. A guess is a suggestion to show the user, not a silent choice.
 */
export function guessHousehold(t: Table): HouseholdOptions | undefined {
  const consumption = guessHouseholdColumn(t);
  const income = guessLabourIncomeRow(t);
  return consumption !== undefined && income !== undefined ? { income, consumption } : undefined;
}

/** What analyses run on: the table, its open model (factored once) and, optionally, the model closed for households. */
export interface Models {
  table: Table;
  open: LeontiefModel;
  closed?: ClosedModel;
  closure?: HouseholdClosure;
}

/**
 * Factor the open model once and, when `household` is given, close it for households.
 * Throws `InputError` `household-not-productive` when the closure is not productive.
 */
export function buildModels(t: Table, options: { household?: HouseholdOptions } = {}): Models {
  const open = LeontiefModel.fromTable(t);
  const out: Models = { table: t, open };
  if (options.household) {
    const closure = householdClosure(t, open, options.household);
    out.closure = closure;
    out.closed = new ClosedModel(open, closure);
    const f = inducedPlausibility(t, out.open, out.closed);
    if (f) closure.findings.push(f);
  }
  return out;
}

/**
 * A warning when induced output exceeds indirect output for most sectors with output (more
 * than half): induced effects that large usually mean too high a spending share or the wrong
 * income rows. Undefined when they do not.
 */
export function inducedPlausibility(t: Table, open: LeontiefModel, closed: ClosedModel): Finding | undefined {
  const simple = open.outputMultipliers();
  const total = closed.extendWeighted(simple).sectors;
  const live = [...t.x.keys()].filter((j) => t.x[j] !== 0);
  const over = live.filter((j) => total[j]! - simple[j]! > simple[j]! - 1);
  if (!live.length || over.length * 2 <= live.length) return undefined;
  return {
    code: 'induced-exceeds-indirect',
    severity: 'warning',
    message: `induced output exceeds indirect output for ${over.length} of ${live.length} sectors (such as ${over
      .slice(0, 5)
      .map((j) => `'${t.sectors.codes[j]}'`)
      .join(', ')}): household spending drives more than the supply chain does, which is rare; check the closure basis and the spending share (${closed.closure.share.toPrecision(4)})`,
    where: { sectors: over.map((j) => t.sectors.codes[j]!) },
    data: { sectors: over.length, of: live.length },
  };
}
