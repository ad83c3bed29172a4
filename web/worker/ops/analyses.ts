/**
 * The model's views in the worker: what the table offers (measures, the household closure it
 * suggests), multipliers for every measure with Type I and Type II, linkages and key sectors,
 * scenario checks, and impacts of several scenarios compared against a base. Models are built
 * once per table and household choice (see models.ts); results carry typed arrays that are
 * transferred to the page, never copied.
 */
import {
  CAUTIONS,
  COMPARE_ABOUT,
  IMPACT_ABOUT,
  KEY_SECTOR_GROUPS,
  LINKAGES_ABOUT,
  MULTIPLIERS_ABOUT,
  SCENARIO_ABOUT,
  checkScenario,
  compare,
  guessHousehold,
  impacts,
  linkages,
  multipliers,
  resolveScenario,
} from '../../../engine/index';
import type { Axis, Finding, HouseholdOptions, Impact, Linkages, MeasureComparison, MeasureInfo, Multipliers, Scenario } from '../../../engine/index';
import type { Handler } from '../context';
import type { HouseholdChoice, HouseholdInfo } from './models';
import { analysisModels, measureInfos, tableMoneyUnit, transferArrays } from './models';
import { cached, current, openModel } from './session';

export interface AnalysisSetup {
  n: number;
  moneyUnit: string;
  sectors: Axis;
  finalDemand: Axis;
  valueAdded: Axis;
  satellites: { code: string; label: string; unit: string }[];
  /** The measures the table offers with the guessed labour-income row. */
  measures: (MeasureInfo & { about: string; from: string[] })[];
  /** The household closure guessed from the labels, when one fits. */
  householdGuess?: HouseholdOptions;
  cautions: readonly string[];
}

export interface MultipliersResult {
  about: string;
  sectors: Axis;
  moneyUnit: string;
  household: HouseholdInfo;
  measures: Omit<Multipliers, 'sectors' | 'about' | 'cautions'>[];
  cautions: readonly string[];
}

export interface ScenarioCheck {
  about: string;
  /** Every problem of the scenario, with the change's position in each message. */
  findings: Finding[];
  /** The problems of each change on its own, without the position prefix (for the row). */
  rows: Finding[][];
  /** The resolved amounts when the scenario can be used. */
  resolved: { unit: string; totalGross: number; totalLocal: number; changes: { position: number; sector: string; amount: number; local: number }[] } | null;
}

export interface ImpactsResult {
  about: string;
  compareAbout: string;
  sectors: Axis;
  moneyUnit: string;
  household: HouseholdInfo;
  /** One entry per scenario asked for, in order: whether it could be used and why not. */
  scenarios: { name: string; ok: boolean; findings: Finding[]; totalGross?: number; totalLocal?: number }[];
  /** The impacts of the usable scenarios, in order. */
  impacts: Omit<Impact, 'sectors' | 'about' | 'cautions'>[];
  /** Side by side against the base (absent when no scenario is usable). */
  comparison?: { scenarios: string[]; base: string; baseIndex: number; measures: MeasureComparison[] };
  cautions: readonly string[];
}

export type LinkagesResult = Omit<Linkages, 'cautions'> & { groupsAbout: Readonly<Record<string, string>>; cautions: readonly string[] };

const POSITION = /^change \d+ of (?:scenario '.*?'|the scenario)(?: \('[^']*'\))?: /;

/** Every problem of a scenario, and each change's own problems for its row of the editor. */
export function scenarioCheck(s: Scenario): ScenarioCheck {
  const t = current().table;
  const findings = checkScenario(t, s);
  const changes = Array.isArray(s?.changes) ? s.changes : [];
  const rows = changes.map((c) =>
    checkScenario(t, { name: s?.name || 'x', changes: [c] })
      .filter((f) => f.code !== 'scenario-name')
      .map((f) => ({ ...f, message: f.message.replace(POSITION, '') })),
  );
  let resolved: ScenarioCheck['resolved'] = null;
  if (!findings.length) {
    const r = resolveScenario(t, s);
    resolved = { unit: r.unit, totalGross: r.totalGross, totalLocal: r.totalLocal, changes: r.changes.map((c) => ({ position: c.position, sector: c.sector, amount: c.amount, local: c.local })) };
  }
  return { about: SCENARIO_ABOUT, findings, rows, resolved };
}

export const analysisOps: Record<string, Handler> = {
  /** What the current table offers to the views: axes, measures, the suggested household closure. */
  'analysis-setup': (): AnalysisSetup => {
    const t = current().table;
    const out: AnalysisSetup = {
      n: t.x.length,
      moneyUnit: tableMoneyUnit(),
      sectors: { codes: [...t.sectors.codes], labels: [...t.sectors.labels] },
      finalDemand: { codes: [...t.finalDemand.codes], labels: [...t.finalDemand.labels] },
      valueAdded: { codes: [...t.valueAdded.codes], labels: [...t.valueAdded.labels] },
      satellites: t.satellites.map((s) => ({ code: s.code, label: s.label, unit: s.unit })),
      measures: measureInfos(analysisModels('guess').measures),
      cautions: CAUTIONS,
    };
    const g = guessHousehold(t);
    if (g) out.householdGuess = { ...g, income: Array.isArray(g.income) ? [...g.income] : [g.income] };
    return out;
  },

  /** Multipliers of every measure: direct, indirect (with `rounds`, its first and later rounds), simple, Type I, and with the closure induced, total, Type II. */
  multipliers: (args: { household?: HouseholdChoice; rounds?: boolean }, ctx): MultipliersResult => {
    ctx.progress(0, 'building the models');
    const a = analysisModels(args?.household);
    ctx.progress(0.3, 'multipliers');
    const list = multipliers(a.models, a.measures, { rounds: args?.rounds === true }).map(({ sectors: _s, about: _a, cautions: _c, ...rest }) => rest);
    const t = current().table;
    const out: MultipliersResult = {
      about: MULTIPLIERS_ABOUT,
      sectors: { codes: [...t.sectors.codes], labels: [...t.sectors.labels] },
      moneyUnit: tableMoneyUnit(),
      household: a.household,
      measures: list,
      cautions: CAUTIONS,
    };
    transferArrays(ctx, out.measures);
    return out;
  },

  /** Backward and forward linkages, the dispersion indices and the key-sector groups. */
  linkages: (_args, ctx): LinkagesResult => {
    const t = current().table;
    // L is formed once for the coefficients of variation; the model keeps it.
    const l = cached('linkages', () => linkages(t, openModel()));
    const copy = (v: Float64Array | undefined) => (v ? v.slice() : undefined);
    const out: LinkagesResult = {
      ...l,
      directBackward: l.directBackward.slice(),
      directForward: l.directForward.slice(),
      directBackwardIndex: l.directBackwardIndex.slice(),
      directForwardIndex: l.directForwardIndex.slice(),
      totalBackward: l.totalBackward.slice(),
      totalForward: l.totalForward.slice(),
      power: l.power.slice(),
      sensitivity: l.sensitivity.slice(),
      group: [...l.group],
      groupsAbout: KEY_SECTOR_GROUPS,
      about: LINKAGES_ABOUT,
      cautions: CAUTIONS,
    };
    const vb = copy(l.variationBackward);
    const vf = copy(l.variationForward);
    if (vb) out.variationBackward = vb;
    if (vf) out.variationForward = vf;
    transferArrays(ctx, out);
    return out;
  },

  /** Check one scenario against the table: every problem, each row's own, and the resolved amounts. */
  'check-scenario': (args: { scenario: Scenario }): ScenarioCheck => scenarioCheck(args?.scenario),

  /**
   * Impacts of several scenarios (one multi-column solve for the usable ones), split into direct,
   * indirect (with `rounds`, also its first round and later rounds) and induced for every measure, and compared against a base (a position among the
   * usable scenarios, or a name; default the first).
   */
  impacts: (args: { scenarios: Scenario[]; household?: HouseholdChoice; base?: string | number; rounds?: boolean }, ctx): ImpactsResult => {
    const t = current().table;
    const list = Array.isArray(args?.scenarios) ? args.scenarios : [];
    ctx.progress(0, 'checking the scenarios');
    const checked = list.map((s) => ({ s, findings: checkScenario(t, s) }));
    const usable = checked.filter((c) => !c.findings.length).map((c) => resolveScenario(t, c.s));
    ctx.progress(0.2, 'building the models');
    const a = analysisModels(args?.household);
    ctx.progress(0.4, `solving for ${usable.length} scenario${usable.length === 1 ? '' : 's'}`);
    const all = impacts(a.models, usable, a.measures, { rounds: args?.rounds === true });
    const out: ImpactsResult = {
      about: IMPACT_ABOUT,
      compareAbout: COMPARE_ABOUT,
      sectors: { codes: [...t.sectors.codes], labels: [...t.sectors.labels] },
      moneyUnit: tableMoneyUnit(),
      household: a.household,
      scenarios: checked.map((c) => {
        const r = usable.find((u) => u.name === c.s?.name);
        return r && !c.findings.length
          ? { name: c.s.name, ok: true, findings: [], totalGross: r.totalGross, totalLocal: r.totalLocal }
          : { name: String(c.s?.name ?? ''), ok: false, findings: c.findings };
      }),
      impacts: all.map(({ sectors: _s, about: _a, cautions: _c, ...rest }) => rest),
      cautions: CAUTIONS,
    };
    if (all.length) {
      let base = args?.base ?? 0;
      if (typeof base === 'string' && !all.some((x) => x.scenario === base)) base = 0;
      if (typeof base === 'number' && (base < 0 || base >= all.length)) base = 0;
      const c = compare(all, { base });
      out.comparison = { scenarios: c.scenarios, base: c.base, baseIndex: c.baseIndex, measures: c.measures };
    }
    ctx.progress(1);
    transferArrays(ctx, out);
    return out;
  },
};
