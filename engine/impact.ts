/**
 * Scenario impacts: the effect of a scenario's local demand change Δd on every sector and
 * measure, split into three parts. For a measure with coefficients c (per unit of output) and
 * ⊙ the element-wise product:
 *
 *   direct   = c ⊙ Δd                  the local demand change itself, counted in the measure:
 *                                       the first round, in the sectors where demand changes
 *   indirect = c ⊙ (L Δd − Δd)         the supply chain: output bought from every sector, round
 *                                       after round, to make the direct output (open model)
 *   induced  = c ⊙ (L̄ Δd − L Δd)       household spending: the labour income earned in the
 *                                       direct and indirect rounds spent again on consumption,
 *                                       with L̄ the n × n block of the closed model's inverse
 *   total    = direct + indirect + induced = c ⊙ L̄ Δd  (c ⊙ L Δd without a closure)
 *
 * With `rounds: true` the indirect part is split into the first round, c ⊙ (A Δd) (what the
 * direct output buys from its suppliers), and the later rounds (industrial support),
 * indirect − first round.
 *
 * Each part is reported by sector (where it happens) and in total. Without a household
 * closure `induced` is zero and `closed` is false.
 *
 * The open model is solved once per scenario (many scenarios at once with `impacts`); the
 * closed output follows from the open one without another solve.
 */
import { InputError } from './errors';
import type { Finding } from './findings';
import type { Models } from './household';
import type { Matrix } from './linalg/matrix';
import { matrix } from './linalg/matrix';
import type { Measure, MeasureInfo } from './measures';
import { axisCopy, CAUTIONS, checkMeasure, measureInfo } from './measures';
import type { ResolvedScenario, Scenario } from './scenario';
import { resolveScenario } from './scenario';
import type { Axis } from './table';
import { moneyUnit } from './table';

export const IMPACT_ABOUT =
  'Scenario impact: the change in each sector and measure caused by the scenario, split into direct (the local demand change itself), indirect (the supply chain) and induced (household spending of the income earned).';

export interface MeasureImpact {
  measure: MeasureInfo;
  /** The unit of every number: the measure's unit. */
  unit: string;
  /** By sector (length n). */
  direct: Float64Array;
  indirect: Float64Array;
  induced: Float64Array;
  total: Float64Array;
  /** c ⊙ (A Δd): the first round of the indirect part (with `rounds: true`). */
  firstRound?: Float64Array;
  /** indirect − first round: the later rounds (industrial support; with `rounds: true`). */
  laterRounds?: Float64Array;
  /** Sums over sectors. */
  totals: { direct: number; indirect: number; induced: number; total: number; firstRound?: number; laterRounds?: number };
}

export interface Impact {
  about: string;
  scenario: string;
  sectors: Axis;
  /** The money unit of `demand` and the outputs. */
  moneyUnit: string;
  /** Δd: the local demand change by sector. */
  demand: Float64Array;
  /** L Δd: output in the open model. */
  openOutput: Float64Array;
  /** L̄ Δd: output in the closed model (equal to `openOutput` without a closure). */
  output: Float64Array;
  /** The change in household (labour) income in the closed model; 0 without a closure. */
  householdIncome: number;
  /** True when the induced part was computed (a household closure was used). */
  closed: boolean;
  /** The relative residual of the open solve. */
  residual: number;
  measures: MeasureImpact[];
  findings: Finding[];
  cautions: readonly string[];
}

function sum(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i]!;
  return s;
}

export interface ImpactOptions {
  /** Split the indirect part into the first round and the later rounds. */
  rounds?: boolean;
}

function build(models: Models, name: string, demand: Float64Array, x0: Float64Array, measures: readonly Measure[], options: ImpactOptions = {}): Impact {
  const { table, open, closed } = models;
  const n = open.n;
  let x = x0;
  let income = 0;
  if (closed) {
    const r = closed.extend(demand, x0);
    x = r.x;
    income = r.income;
  }
  let ad: Float64Array | undefined;
  if (options.rounds) {
    ad = new Float64Array(n);
    const A = open.A.data;
    for (let i = 0; i < n; i++) {
      let v = 0;
      for (let j = 0; j < n; j++) v += A[i * n + j]! * demand[j]!;
      ad[i] = v;
    }
  }
  const out: MeasureImpact[] = measures.map((m) => {
    const c = m.coefficients;
    const direct = new Float64Array(n);
    const indirect = new Float64Array(n);
    const induced = new Float64Array(n);
    const total = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      direct[i] = c[i]! * demand[i]!;
      indirect[i] = c[i]! * (x0[i]! - demand[i]!);
      induced[i] = closed ? c[i]! * (x[i]! - x0[i]!) : 0;
      total[i] = c[i]! * x[i]!;
    }
    const mi: MeasureImpact = {
      measure: measureInfo(m),
      unit: m.unit,
      direct,
      indirect,
      induced,
      total,
      totals: { direct: sum(direct), indirect: sum(indirect), induced: sum(induced), total: sum(total) },
    };
    if (ad) {
      const first = new Float64Array(n);
      const later = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        first[i] = c[i]! * ad[i]!;
        later[i] = indirect[i]! - first[i]!;
      }
      mi.firstRound = first;
      mi.laterRounds = later;
      mi.totals.firstRound = sum(first);
      mi.totals.laterRounds = sum(later);
    }
    return mi;
  });
  const residual = open.residual(x0, demand);
  const findings: Finding[] = [];
  if (residual > 1e-8) {
    findings.push({
      code: 'residual',
      severity: 'warning',
      message: `the output of scenario '${name}' solves the model only to a relative residual of ${residual.toExponential(2)}; the table may be nearly singular (see the condition estimate)`,
      data: { residual },
    });
  }
  return {
    about: IMPACT_ABOUT,
    scenario: name,
    sectors: axisCopy(table.sectors),
    moneyUnit: moneyUnit(table.meta),
    demand: Float64Array.from(demand),
    openOutput: x0,
    output: x,
    householdIncome: income,
    closed: closed !== undefined,
    residual,
    measures: out,
    findings,
    cautions: CAUTIONS,
  };
}

function resolved(models: Models, s: Scenario | ResolvedScenario): ResolvedScenario {
  if ('demand' in s && s.demand instanceof Float64Array) {
    if (s.demand.length !== models.open.n) throw new InputError('bad-size', `scenario '${s.name}' has ${s.demand.length} demand values for ${models.open.n} sectors`);
    return s;
  }
  return resolveScenario(models.table, s as Scenario);
}

/** The impact of one scenario (validated against the table first) on every measure. */
export function impact(models: Models, scenario: Scenario | ResolvedScenario, measures: readonly Measure[], options: ImpactOptions = {}): Impact {
  for (const m of measures) checkMeasure(m, models.open.n);
  const r = resolved(models, scenario);
  const x0 = models.open.solve(r.demand);
  return build(models, r.name, r.demand, x0, measures, options);
}

/** Impacts of many scenarios with one multi-column solve of the open model. */
export function impacts(models: Models, scenarios: readonly (Scenario | ResolvedScenario)[], measures: readonly Measure[], options: ImpactOptions = {}): Impact[] {
  for (const m of measures) checkMeasure(m, models.open.n);
  const rs = scenarios.map((s) => resolved(models, s));
  const n = models.open.n;
  const r = rs.length;
  if (!r) return [];
  const D: Matrix = matrix(n, r, new Float64Array(n * r));
  rs.forEach((s, j) => {
    for (let i = 0; i < n; i++) D.data[i * r + j] = s.demand[i]!;
  });
  const X = models.open.solveMany(D);
  return rs.map((s, j) => {
    const x0 = new Float64Array(n);
    for (let i = 0; i < n; i++) x0[i] = X.data[i * r + j]!;
    return build(models, s.name, s.demand, x0, measures, options);
  });
}
