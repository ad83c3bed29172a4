/**
 * Sensitivity in the worker: the tornado and the most influential coefficients for a chosen
 * result, what-if edits of coefficients with an instant update of the multipliers (Woodbury, no
 * new factorisation), and Monte Carlo on the coefficients, run in chunks in this worker or shared
 * among Web Workers of its own, with progress and cancellation either way.
 *
 * A result is r = c′ L d on the open model (the engine's sensitivity analysis does not include
 * the household closure): a measure's multiplier for one sector, or a scenario's total impact.
 */
import {
  InputError,
  SENSITIVITY_ABOUT,
  SENSITIVITY_CAUTIONS,
  UNCERTAINTY_ABOUT,
  WHATIF_ABOUT,
  WhatIf,
  distributionBins,
  influentialCoefficients,
  mergeDrawBlocks,
  multiplierUnit,
  prepareMonteCarlo,
  resolveScenario,
  runDraws,
  sampleColumn,
  tornado,
} from '../../../engine/index';
import type { Bin, DrawBlock, Finding, MonteCarloSpec, ResultTarget, Scenario, Summary, TornadoData } from '../../../engine/index';
import { monteCarloInWebWorkers } from '../../../src/parallel/montecarlo-web';
import { taskRanges } from '../../../src/parallel/montecarlo-protocol';
import type { Handler, HandlerContext } from '../context';
import { analysisModels, measureFor, sectorAt, transferArrays } from './models';
import { cached, current, openModel } from './session';

/** The result to study, named by codes as the page knows them. */
export type TargetChoice =
  | { kind: 'multiplier'; sector: string; measure?: string }
  | { kind: 'impact'; scenario: Scenario; measure?: string };

export interface CellLabel {
  row: number;
  col: number;
  rowCode: string;
  colCode: string;
  rowLabel: string;
  colLabel: string;
}

export interface SensitivityResult {
  about: string;
  /** In words: which result, in which unit. */
  label: string;
  unit: string;
  value: number;
  percent: number;
  tornado: TornadoData & { cells: CellLabel[] };
  influential: {
    cell: CellLabel;
    coefficient: number;
    derivative: number;
    elasticity: number | null;
    /** The smallest increase and decrease that move the result by `percent` %, or 'none'. */
    up: { change: number; coefficient: number; relative: number | null } | 'none';
    down: { change: number; coefficient: number; relative: number | null } | 'none';
  }[];
  cautions: readonly string[];
}

export interface CoefficientEdit {
  /** The supplying sector (row of A), by code. */
  row: string;
  /** The buying sector (column of A), by code. */
  col: string;
  /** The new value of the coefficient. */
  value: number;
}

export interface WhatIfResult {
  about: string;
  measure: { code: string; label: string; unit: string };
  edits: { row: number; col: number; rowCode: string; colCode: string; before: number; value: number }[];
  /** Output multipliers (column sums of L) of the table, and after the edits. */
  baseOutput: Float64Array;
  output: Float64Array;
  /** The chosen measure's simple multipliers c′L, before and after. */
  baseMeasure: Float64Array;
  measureValues: Float64Array;
  /** Column sums of the edited coefficients. */
  columnSums: Float64Array;
  /** Sectors whose edited column sums to 1 or more (the edited table may not be productive). */
  notProductive: string[];
  rank: number;
  refactors: number;
  findings: Finding[];
  cautions: readonly string[];
}

export interface MonteCarloArgs {
  /** Coefficient of variation, as a ratio (0.1 = 10 %), for every coefficient. */
  cv: number;
  draws: number;
  seed: number;
  measure?: string;
  /** Usable scenarios whose totals are summarised too. */
  scenarios?: Scenario[];
  /** The quantity whose distribution is binned: a sector's multiplier, or a scenario's total. */
  focus?: { sector?: string; scenario?: string };
  /** Draws per chunk to start with (the chunk then adapts to about 40 ms). */
  chunk?: number;
  /**
   * Web Workers to share the draws among: 1 runs them in this worker; more start that many
   * workers of their own; absent means one per processor core (at most 8) when the run has at
   * least 200 draws. The result is the same, draw for draw, whatever the number.
   */
  workers?: number;
}

export interface Band {
  point: Float64Array;
  mean: Float64Array;
  sd: Float64Array;
  p5: Float64Array;
  p50: Float64Array;
  p95: Float64Array;
}

export interface MonteCarloView {
  about: string;
  errorModel: string;
  seed: number;
  cv: number;
  draws: number;
  accepted: number;
  rejected: number;
  /** `unit` is the multipliers' unit; `impactUnit` the unit of scenario impacts. */
  measure: { code: string; label: string; unit: string; impactUnit: string };
  sectors: string[];
  multipliers: Band;
  scenarios: { scenario: string; total: Summary; bySector: Band }[];
  focus: { label: string; bins: Bin[]; summary: Summary } | null;
  findings: Finding[];
  cautions: readonly string[];
  chunks: number;
  /** The number of workers the draws ran on (1: in the engine worker itself). */
  workers: number;
}

/** Resolve a target choice into the engine's target on the open model. */
function resolveChoice(choice: TargetChoice, household: unknown): { target: ResultTarget; label: string; unit: string } {
  const t = current().table;
  const a = analysisModels(household as never);
  const m = measureFor(a.measures, choice?.measure);
  const c = m.coefficients;
  if (choice?.kind === 'multiplier') {
    const j = sectorAt(choice.sector);
    const unit = multiplierUnit(m);
    return { target: { kind: 'multiplier', sector: j, c }, label: `${m.label} multiplier of ${t.sectors.labels[j]} (${t.sectors.codes[j]}), simple (open model)`, unit };
  }
  if (choice?.kind === 'impact') {
    const r = resolveScenario(t, choice.scenario);
    return { target: { kind: 'impact', d: r.demand, c }, label: `Total ${m.label.toLowerCase()} impact of '${r.name}' (open model: direct and indirect)`, unit: m.unit };
  }
  throw new InputError('bad-target', 'choose a multiplier (a sector) or a scenario to study', {}, "Give { kind: 'multiplier', sector } or { kind: 'impact', scenario }");
}

function cellLabel(i: number, j: number): CellLabel {
  const s = current().table.sectors;
  return { row: i, col: j, rowCode: s.codes[i]!, colCode: s.codes[j]!, rowLabel: s.labels[i]!, colLabel: s.labels[j]! };
}

function band(list: readonly Summary[]): Band {
  const n = list.length;
  const b: Band = { point: new Float64Array(n), mean: new Float64Array(n), sd: new Float64Array(n), p5: new Float64Array(n), p50: new Float64Array(n), p95: new Float64Array(n) };
  list.forEach((s, i) => {
    b.point[i] = s.point;
    b.mean[i] = s.mean;
    b.sd[i] = s.sd;
    b.p5[i] = s.p5;
    b.p50[i] = s.p50;
    b.p95[i] = s.p95;
  });
  return b;
}

const MAX_DRAWS = 50_000;
const MAX_WORKERS = 16;

/** How many workers a run of `draws` draws gets (see MonteCarloArgs.workers). */
function workersFor(asked: unknown, draws: number): number {
  const canSpawn = typeof Worker !== 'undefined';
  if (asked !== undefined) {
    if (typeof asked !== 'number' || !Number.isInteger(asked) || asked < 1 || asked > MAX_WORKERS) {
      throw new InputError('bad-workers', `the number of workers must be a whole number from 1 to ${MAX_WORKERS}; got ${JSON.stringify(asked)}`, { text: String(asked) });
    }
    return canSpawn ? asked : 1;
  }
  if (!canSpawn || draws < 200) return 1;
  return Math.max(1, Math.min(8, globalThis.navigator?.hardwareConcurrency ?? 1));
}

/** The draws in this worker, in chunks of about 40 ms with a checkpoint (and cancel) between. */
async function drawsHere(spec: MonteCarloSpec, firstChunk: number, ctx: HandlerContext): Promise<{ result: ReturnType<typeof mergeDrawBlocks>; chunks: number }> {
  const p = prepareMonteCarlo(spec);
  const draws = p.draws;
  const blocks: DrawBlock[] = [];
  let chunk = Math.max(1, Math.min(firstChunk, draws));
  let at = 0;
  let chunks = 0;
  while (at < draws) {
    const end = Math.min(draws, at + chunk);
    const t0 = performance.now();
    blocks.push(runDraws(p, at, end));
    const dt = Math.max(0.5, performance.now() - t0);
    chunks++;
    at = end;
    // Aim at about 40 ms per chunk, growing at most fourfold at a time.
    chunk = Math.max(1, Math.min(4 * chunk, Math.round((chunk * 40) / dt)));
    ctx.progress(at / draws, `${at} of ${draws} draws`);
    await ctx.checkpoint();
  }
  return { result: mergeDrawBlocks(p, blocks), chunks };
}

export const sensitivityOps: Record<string, Handler> = {
  /** The tornado and the most influential coefficients for a multiplier or a scenario's total. */
  sensitivity: (args: { target: TargetChoice; percent?: number; top?: number; household?: unknown }, ctx): SensitivityResult => {
    const percent = args?.percent ?? 10;
    const top = args?.top ?? 10;
    const model = openModel();
    const { target, label, unit } = resolveChoice(args?.target, args?.household);
    ctx.progress(0.1, 'ranking coefficients');
    const td = tornado(model, target, { top, percent });
    const rank = influentialCoefficients(model, target, { top, by: 'elasticity', percent });
    ctx.progress(1);
    return {
      about: SENSITIVITY_ABOUT,
      label,
      unit,
      value: td.value,
      percent,
      tornado: { ...td, cells: td.bars.map((b) => cellLabel(b.row, b.col)) },
      influential: rank.entries.map((e) => {
        const lim = e.limit;
        const side = (x: NonNullable<typeof lim>['up']) => (x === 'none' ? ('none' as const) : { change: x.change, coefficient: x.coefficient, relative: x.relative });
        return {
          cell: cellLabel(e.row, e.col),
          coefficient: e.coefficient,
          derivative: e.derivative,
          elasticity: e.elasticity,
          up: lim ? side(lim.up) : 'none',
          down: lim ? side(lim.down) : 'none',
        };
      }),
      cautions: SENSITIVITY_CAUTIONS,
    };
  },

  /**
   * Multipliers after editing coefficients, by Woodbury's identity on the table's factorisation:
   * the edits are applied afresh on every call (so the page holds the list and a restarted worker
   * loses nothing), each costing one solve and one transposed solve.
   */
  'what-if': (args: { edits: CoefficientEdit[]; measure?: string; household?: unknown }, ctx): WhatIfResult => {
    const t = current().table;
    const n = t.x.length;
    const a = analysisModels(args?.household as never);
    const m = measureFor(a.measures, args?.measure);
    const w = cached('whatif', () => new WhatIf(openModel()));
    w.reset();
    const edits: WhatIfResult['edits'] = [];
    for (const [k, e] of (Array.isArray(args?.edits) ? args.edits : []).entries()) {
      const i = sectorAt(e?.row);
      const j = sectorAt(e?.col);
      if (typeof e.value !== 'number' || !Number.isFinite(e.value)) {
        throw new InputError('bad-coefficient', `edit ${k + 1} (row '${t.sectors.codes[i]}', column '${t.sectors.codes[j]}'): the new value ${JSON.stringify(e.value)} is not a finite number`, { sector: t.sectors.codes[j]!, text: String(e.value) });
      }
      const before = openModel().A.data[i * n + j]!;
      w.setCoefficient(i, j, e.value);
      edits.push({ row: i, col: j, rowCode: t.sectors.codes[i]!, colCode: t.sectors.codes[j]!, before, value: e.value });
    }
    const columnSums = w.columnSums();
    const notProductive = t.sectors.codes.filter((_, j) => !(columnSums[j]! < 1));
    const findings: Finding[] = [];
    if (notProductive.length) {
      findings.push({
        code: 'edit-not-productive',
        severity: 'error',
        message: `after the edits the coefficients of ${notProductive.map((c) => `'${c}'`).join(', ')} sum to 1 or more: such a sector needs at least one unit of inputs from the economy per unit of output, so the edited table may not be productive and its multipliers cannot be trusted`,
        where: { sectors: notProductive },
      });
    }
    if (edits.some((e) => e.value < 0)) {
      findings.push({ code: 'negative-coefficient', severity: 'warning', message: 'an edited coefficient is negative; technical coefficients are normally zero or more', where: { sectors: edits.filter((e) => e.value < 0).map((e) => e.colCode) } });
    }
    const out: WhatIfResult = {
      about: WHATIF_ABOUT,
      measure: { code: m.code, label: m.label, unit: multiplierUnit(m) },
      edits,
      baseOutput: openModel().outputMultipliers(),
      output: w.outputMultipliers(),
      baseMeasure: openModel().weighted(m.coefficients),
      measureValues: w.weighted(m.coefficients),
      columnSums,
      notProductive,
      rank: w.rank,
      refactors: w.refactorCount,
      findings,
      cautions: SENSITIVITY_CAUTIONS,
    };
    transferArrays(ctx, out);
    return out;
  },

  /**
   * Monte Carlo on the coefficients: draws run here in chunks of about 40 ms with progress after
   * each and a checkpoint between chunks, where a cancel stops the run; or, with more than one
   * worker, in Web Workers started for the run (src/parallel/montecarlo-web.ts), terminated on a
   * cancel. Percentiles 5, 50 and 95 of the
   * chosen measure's multipliers by sector and of each scenario's impacts.
   */
  'monte-carlo': async (args: MonteCarloArgs & { household?: unknown }, ctx): Promise<MonteCarloView> => {
    const t = current().table;
    const draws = args?.draws;
    if (typeof draws !== 'number' || !Number.isInteger(draws) || draws < 1 || draws > MAX_DRAWS) {
      throw new InputError('bad-draws', `the number of draws must be a whole number from 1 to ${MAX_DRAWS}; got ${JSON.stringify(draws)}`, { text: String(draws) });
    }
    const cv = args?.cv;
    if (typeof cv !== 'number' || !Number.isFinite(cv) || cv <= 0 || cv > 2) {
      throw new InputError('bad-cv', `the coefficient of variation must be above 0 and at most 2 (0.1 means 10 %); got ${JSON.stringify(cv)}`, { text: String(cv) });
    }
    const a = analysisModels(args?.household as never);
    const m = measureFor(a.measures, args?.measure);
    const unit = multiplierUnit(m);
    const scen = (args.scenarios ?? []).map((s) => resolveScenario(t, s));
    const A = openModel().A;
    const spec: MonteCarloSpec = {
      A: { rows: A.rows, cols: A.cols, data: A.data },
      cv,
      draws,
      seed: args.seed,
      sectors: [...t.sectors.codes],
      measures: [{ code: m.code, label: m.label, unit, c: m.coefficients }],
      scenarios: scen.map((s, k) => ({ code: `s${k}`, label: s.name, d: s.demand })),
    };
    const workers = workersFor(args.workers, draws);
    ctx.progress(0, `0 of ${draws} draws`);
    let r: ReturnType<typeof mergeDrawBlocks>;
    let chunks: number;
    if (workers === 1) {
      ({ result: r, chunks } = await drawsHere(spec, args.chunk ?? 1, ctx));
    } else {
      // The engine worker hands the draws to workers of its own and waits; a cancel from the
      // page arrives meanwhile and ends them at their next message.
      const signal = { get aborted() { return ctx.cancelled; } };
      r = await monteCarloInWebWorkers(spec, {
        workers,
        signal,
        onProgress: (done, total) => {
          ctx.progress(done / total, `${done} of ${total} draws on ${workers} workers`);
        },
      });
      chunks = taskRanges(draws, workers).length;
    }
    let focus: MonteCarloView['focus'] = null;
    const f = args.focus;
    if (f?.scenario !== undefined) {
      const k = scen.findIndex((s) => s.name === f.scenario);
      if (k >= 0) {
        const col = sampleColumn(r, { measure: m.code, scenario: `s${k}` });
        focus = { label: `Total ${m.label.toLowerCase()} impact of '${scen[k]!.name}' (${m.unit})`, bins: distributionBins(col), summary: r.scenarios[k]!.measures[0]!.total };
      }
    } else if (f?.sector !== undefined) {
      const j = sectorAt(f.sector);
      const col = sampleColumn(r, { measure: m.code, sector: j });
      focus = { label: `${m.label} multiplier of ${t.sectors.labels[j]} (${unit})`, bins: distributionBins(col), summary: r.multipliers[0]!.bySector[j]! };
    }
    const out: MonteCarloView = {
      about: UNCERTAINTY_ABOUT,
      errorModel: r.errorModel,
      seed: r.seed,
      cv,
      draws: r.draws,
      accepted: r.accepted,
      rejected: r.rejected.total,
      measure: { code: m.code, label: m.label, unit, impactUnit: m.unit },
      sectors: r.sectors,
      multipliers: band(r.multipliers[0]!.bySector),
      scenarios: r.scenarios.map((s) => ({ scenario: s.label, total: s.measures[0]!.total, bySector: band(s.measures[0]!.bySector) })),
      focus,
      findings: r.findings,
      cautions: r.cautions,
      chunks,
      workers,
    };
    transferArrays(ctx, out);
    return out;
  },
};
