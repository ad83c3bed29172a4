/**
 * Closing the model for households (the Type II model).
 *
 * Households are added as sector n + 1: their row is labour income per unit of output, hᵣ (a
 * chosen value-added row, such as compensation of employees, ÷ output), and their column is
 * what households buy per unit of that income, h꜀ (a chosen final-demand column ÷ total labour
 * income; or, with a `propensity` c, c × the column's shares of its own total). The closed
 * coefficients are
 *
 *     Ā = [ A   h꜀ ]
 *         [ hᵣ′  0 ]
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
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import { LeontiefModel } from './leontief';
import type { Matrix } from './linalg/matrix';
import { zeros } from './linalg/matrix';
import { bestMatch, finalDemandIndex, HOUSEHOLD_WORDS, LABOUR_INCOME_WORDS, NOT_HOUSEHOLD, valueAddedIndex } from './measures';
import type { Table } from './table';
import { perUnit } from './table';

export const HOUSEHOLD_ABOUT =
  'The model closed for households: labour income earned in production is spent on consumption, and that spending is produced in turn (the induced effect behind Type II multipliers).';

export interface HouseholdOptions {
  /** The value-added row or rows paid to households as labour income (such as compensation of employees). */
  income: string | string[];
  /** The final-demand column of household consumption. */
  consumption: string;
  /**
   * The share of labour income that households spend in the table's economy. When given, the
   * household column is this share times the consumption column's shares of its own total;
   * when absent, the column divided by total labour income.
   */
  propensity?: number;
}

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
  /** s = 1 − hᵣ′L h꜀; the closed model is productive exactly when s > 0. */
  schur: number;
  productive: boolean;
  /** Errors when the closure cannot be used; notes otherwise. */
  findings: Finding[];
}

function numberOk(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/**
 * Build the household row and column from a value-added row and a final-demand column and
 * check the closed model for productivity. Throws `InputError` for rows or columns that do not
 * exist, a propensity outside [0, 1], or no labour income at all; a closure that is not
 * productive is returned with an error finding (`household-not-productive`), and
 * `ClosedModel` refuses it.
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
  if (options.propensity !== undefined && (!numberOk(options.propensity) || options.propensity < 0 || options.propensity > 1)) {
    throw new InputError('bad-propensity', `the share of income spent must be a number from 0 to 1; got ${options.propensity}`, { text: String(options.propensity) });
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
  if (options.propensity !== undefined && !(totalConsumption > 0)) {
    throw new InputError('no-household-consumption', `the final-demand column '${consumptionColumn}' adds up to ${totalConsumption}, so it gives no consumption shares`, { columnLabel: consumptionColumn });
  }
  const income = perUnit(pay, t.x);
  const consumption = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    consumption[i] = options.propensity !== undefined ? (options.propensity * col[i]!) / totalConsumption : col[i]! / totalIncome;
  }
  let spendingRate = 0;
  for (let i = 0; i < n; i++) spendingRate += consumption[i]!;
  const w = open.weighted(income);
  let loop = 0;
  for (let i = 0; i < n; i++) loop += w[i]! * consumption[i]!;
  const schur = 1 - loop;
  const findings: Finding[] = [];
  const negative = [...income].some((v) => v < 0) || [...consumption].some((v) => v < 0);
  const productive = schur > 1e-9;
  if (!productive) {
    findings.push({
      code: 'household-not-productive',
      severity: 'error',
      message: `the model closed for households (income ${incomeRows.map((c) => `'${c}'`).join(', ')}, consumption '${consumptionColumn}') is not productive: each unit of household income spent comes back as ${loop.toPrecision(4)} units of household income (hᵣ′L h꜀ ≥ 1), so induced effects would grow without bound`,
      where: { rowLabel: incomeRows[0]!, columnLabel: consumptionColumn },
      cells: [{ block: 'closed', row: n, col: n }],
      data: { loop, schur, spendingRate },
    });
  } else {
    findings.push({
      code: 'household-closure',
      severity: 'note',
      message: `closed for households with income ${incomeRows.map((c) => `'${c}'`).join(', ')} and consumption '${consumptionColumn}': households spend ${spendingRate.toPrecision(4)} per unit of income in the economy, and each unit of household income regenerates ${loop.toPrecision(4)} (Type II / Type I labour-income ratio ${(1 / schur).toPrecision(4)})`,
      data: { loop, schur, spendingRate },
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
    schur,
    productive,
    findings,
  };
}

/** The remedy named in every refusal of a non-productive closure. */
const REMEDY = 'Give a smaller share of income spent (propensity), choose a narrower income row, or use the open model (Type I only)';

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
  /** s = 1 − hᵣ′L h꜀. */
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
    let loop = 0;
    for (let i = 0; i < n; i++) loop += this.w[i]! * closure.consumption[i]!;
    this.s = 1 - loop;
    if (!(this.s > 1e-9) || !closure.productive) {
      const f = closure.findings.find((x) => x.code === 'household-not-productive');
      throw new InputError(
        'household-not-productive',
        f?.message ?? `the model closed for households is not productive (1 − hᵣ′L h꜀ = ${this.s.toPrecision(4)} ≤ 0)`,
        { rowLabel: closure.incomeRows[0]!, columnLabel: closure.consumptionColumn },
        REMEDY,
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
    return out;
  }
}

/** The final-demand column of household consumption guessed from its label or code, or undefined when unsure. */
export function guessHouseholdColumn(t: Table): string | undefined {
  return bestMatch(t.finalDemand, HOUSEHOLD_WORDS, NOT_HOUSEHOLD);
}

/** The value-added row of labour income (compensation, wages, labour income) guessed from its label, or undefined when unsure. */
export function guessLabourIncomeRow(t: Table): string | undefined {
  return bestMatch(t.valueAdded, LABOUR_INCOME_WORDS, []);
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
  }
  return out;
}
