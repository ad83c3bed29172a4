/**
 * The model views' shared state: the scenarios being built, the chosen measure, the household
 * closure, and each view's settings. It is plain, serialisable data (`$state.snapshot(viewState)`
 * is what a project file or the autosave keeps; `restoreViews` puts it back, checking every
 * field), while results from the worker live in `viewResults`, which is never saved: they are
 * recomputed from the table and these settings.
 *
 * Scenarios are kept as drafts (each change remembers whether it is an amount or a percentage
 * even while its number is still empty); `scenarioOf` turns a draft into the engine's Scenario
 * and `draftOf` the other way, so that project and scenario files hold engine scenarios.
 */
import type { ClosureBasis, DemandChange, HouseholdOptions, PlainTable, Scenario } from '../../engine/index';
import { CLOSURE_BASES } from '../../engine/household';
import { readScenarios } from '../../src/project/scenarios';
import demoScenarios from '../../data-demo/scenarios.json';
import type { AnalysisSetup } from '../worker/ops/analyses';
import { engine } from './state.svelte';

export const VIEWS_VERSION = 1;

/** The household closure for Type II numbers; `null` in `viewState.household` means "as guessed from the labels". */
export interface HouseholdSetting {
  /** False: the open model only (no induced effects, no Type II). */
  use: boolean;
  /** Value-added rows paid to households (such as compensation of employees). */
  income: string[];
  /** The final-demand column of household consumption. */
  consumption: string;
  /** The share of income spent in the economy (0 to 1); null: the column ÷ total labour income. */
  propensity: number | null;
  /** A household income (not in the table) that spending is divided by; null or absent: none. */
  householdIncome?: number | null;
  /** Older saved work: what spending is divided by when neither a share nor an income is given (labour income or the column's own total). */
  basis?: 'labour-income' | 'consumption-total' | null;
  /**
   * What household spending is divided by, one of the engine's four closure bases, as chosen in
   * the closure settings. Absent or null (older saved work): inferred as before (a share given:
   * propensity; else an income given: household-income; else `basis`, else labour-income), so
   * older projects open with the same closure.
   */
  closureBasis?: ClosureBasis | null;
  /** Households' purchases from households (the corner cell of a closed table), in money units; null or absent: 0. */
  ownPurchases?: number | null;
}

export interface DraftChange {
  /** A sector code. */
  sector: string;
  basis: 'amount' | 'percent';
  /** The amount (money units of the table) or the percentage (10 = +10 %); null while empty. */
  value: number | null;
  /** 0 to 1; null means 1 (all bought locally). */
  localShare: number | null;
  /** A final-demand column code, or '' for none. */
  category: string;
  note: string;
}

export interface DraftScenario {
  id: string;
  name: string;
  description: string;
  changes: DraftChange[];
}

/** One edited technical coefficient of the what-if, by sector codes. */
export interface CoefficientEdit {
  row: string;
  col: string;
  value: number;
}

export type SortKey = string;

export interface ViewState {
  version: number;
  /** The measure the views show (a measure code: output, value-added, labour-income, a satellite code). */
  measure: string;
  household: HouseholdSetting | null;
  /** Split the indirect effect into the first round and the later rounds (industrial support) in multipliers, impacts and the report. */
  rounds: boolean;
  scenarios: DraftScenario[];
  /** The id of the scenario open in the builder. */
  activeScenario: string | null;
  multipliers: { show: 'simple' | 'type'; sort: SortKey; descending: boolean; limit: number };
  linkages: { sort: SortKey; descending: boolean };
  results: { shown: string | null; base: string | null };
  sensitivity: {
    target: 'multiplier' | 'impact';
    /** The sector whose multiplier is studied. */
    sector: string;
    /** The scenario (id) whose total is studied. */
    scenario: string | null;
    /** The swing of each coefficient in the tornado, in percent. */
    percent: number;
    top: number;
    /** Monte Carlo: coefficient of variation in percent (10 = 10 %), draws and seed. */
    cv: number;
    draws: number;
    seed: number;
    edits: CoefficientEdit[];
  };
}

export function defaultViews(): ViewState {
  return {
    version: VIEWS_VERSION,
    measure: 'output',
    household: null,
    rounds: false,
    scenarios: [],
    activeScenario: null,
    multipliers: { show: 'simple', sort: 'simple', descending: true, limit: 30 },
    linkages: { sort: 'power', descending: true },
    results: { shown: null, base: null },
    sensitivity: { target: 'multiplier', sector: '', scenario: null, percent: 10, top: 10, cv: 10, draws: 1000, seed: 1, edits: [] },
  };
}

/** The views' state. Change it in place; `$state.snapshot(viewState)` is its plain copy. */
export const viewState: ViewState = $state(defaultViews());

/** Worker results the views keep while the page is open (never saved). */
export const viewResults = $state({
  /** The last Monte Carlo run and the settings it was run with. */
  monteCarlo: null as unknown,
  monteCarloKey: '' as string,
});

/** A plain copy of the views' state, for a project file or the autosave. */
export function snapshotViews(): ViewState {
  return $state.snapshot(viewState) as ViewState;
}

// ---------------------------------------------------------------------------------------------
// Restoring a snapshot

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const isStr = (v: unknown): v is string => typeof v === 'string';

let nextId = 1;
/** A fresh scenario id, unique within the page. */
export function newId(): string {
  return `s${Date.now().toString(36)}${(nextId++).toString(36)}`;
}

function changeFrom(v: unknown, at: string, notes: string[]): DraftChange | null {
  if (!isObj(v) || !isStr(v.sector)) {
    notes.push(`${at}: not a demand change (it needs a sector); left out`);
    return null;
  }
  const basis = v.basis === 'percent' ? 'percent' : 'amount';
  if (v.basis !== undefined && v.basis !== 'amount' && v.basis !== 'percent') notes.push(`${at}.basis: '${String(v.basis)}' is neither 'amount' nor 'percent'; amount is used`);
  const value = v.value === null || v.value === undefined ? null : isNum(v.value) ? v.value : (notes.push(`${at}.value: ${JSON.stringify(v.value)} is not a number; left empty`), null);
  const share = v.localShare === null || v.localShare === undefined ? null : isNum(v.localShare) ? v.localShare : (notes.push(`${at}.localShare: ${JSON.stringify(v.localShare)} is not a number; 1 is used`), null);
  return { sector: v.sector, basis, value, localShare: share, category: isStr(v.category) ? v.category : '', note: isStr(v.note) ? v.note : '' };
}

function scenarioFrom(v: unknown, at: string, notes: string[], ids: Set<string>): DraftScenario | null {
  if (!isObj(v) || !isStr(v.name) || !Array.isArray(v.changes)) {
    notes.push(`${at}: not a scenario (it needs a name and a list of changes); left out`);
    return null;
  }
  let id = isStr(v.id) && v.id && !ids.has(v.id) ? v.id : newId();
  while (ids.has(id)) id = newId();
  ids.add(id);
  const changes = v.changes.map((c, k) => changeFrom(c, `${at}.changes[${k}]`, notes)).filter((c): c is DraftChange => c !== null);
  return { id, name: v.name, description: isStr(v.description) ? v.description : '', changes };
}

function householdFrom(v: unknown, notes: string[]): HouseholdSetting | null {
  if (v === null || v === undefined) return null;
  if (!isObj(v) || typeof v.use !== 'boolean' || !Array.isArray(v.income) || !v.income.every(isStr) || !isStr(v.consumption)) {
    notes.push('household: not a household setting (use, income rows, consumption column); the guess from the labels is used');
    return null;
  }
  const p = v.propensity;
  if (p !== null && p !== undefined && !(isNum(p) && p >= 0 && p <= 1)) notes.push(`household.propensity: ${JSON.stringify(p)} is not a share from 0 to 1; left out`);
  const hi = v.householdIncome;
  if (hi !== null && hi !== undefined && !(isNum(hi) && hi > 0)) notes.push(`household.householdIncome: ${JSON.stringify(hi)} is not a positive amount; left out`);
  const basis = v.basis === 'consumption-total' || v.basis === 'labour-income' ? v.basis : null;
  const cb = (CLOSURE_BASES as readonly unknown[]).includes(v.closureBasis) ? (v.closureBasis as ClosureBasis) : null;
  if (v.closureBasis !== null && v.closureBasis !== undefined && !cb) notes.push(`household.closureBasis: ${JSON.stringify(v.closureBasis)} is not one of ${CLOSURE_BASES.join(', ')}; the basis is inferred from the figures given`);
  const own = v.ownPurchases;
  if (own !== null && own !== undefined && !(isNum(own) && own >= 0)) notes.push(`household.ownPurchases: ${JSON.stringify(own)} is not an amount of 0 or more; left out`);
  const out: HouseholdSetting = { use: v.use, income: [...v.income], consumption: v.consumption, propensity: isNum(p) && p >= 0 && p <= 1 ? p : null };
  // The two later fields only when set, so that older snapshots restore unchanged.
  if (isNum(hi) && hi > 0) out.householdIncome = hi;
  else if (hi === null) out.householdIncome = null;
  if (basis) out.basis = basis;
  else if (v.basis === null) out.basis = null;
  if (cb) out.closureBasis = cb;
  else if (v.closureBasis === null) out.closureBasis = null;
  if (isNum(own) && own >= 0) out.ownPurchases = own;
  else if (own === null) out.ownPurchases = null;
  return out;
}

/**
 * Put a saved snapshot back, field by field. A field that is missing or malformed keeps its
 * default and is named in the returned notes (empty when everything was restored).
 */
export function restoreViews(snapshot: unknown): string[] {
  const notes: string[] = [];
  const d = defaultViews();
  if (!isObj(snapshot)) {
    notes.push('the saved views are not an object; the defaults are used');
    Object.assign(viewState, d);
    return notes;
  }
  const s = snapshot;
  if (s.version !== undefined && s.version !== VIEWS_VERSION) notes.push(`the saved views are version ${String(s.version)}; this workbench reads version ${VIEWS_VERSION}, so some settings may be lost`);
  const out: ViewState = d;
  if (isStr(s.measure) && s.measure) out.measure = s.measure;
  else if (s.measure !== undefined) notes.push('measure: not a measure code; output is used');
  out.household = householdFrom(s.household, notes);
  if (typeof s.rounds === 'boolean') out.rounds = s.rounds;
  else if (s.rounds !== undefined) notes.push('rounds: not true or false; the indirect effect is not split');
  const ids = new Set<string>();
  if (Array.isArray(s.scenarios)) out.scenarios = s.scenarios.map((x, i) => scenarioFrom(x, `scenarios[${i}]`, notes, ids)).filter((x): x is DraftScenario => x !== null);
  else if (s.scenarios !== undefined) notes.push('scenarios: not a list; no scenarios were restored');
  out.activeScenario = isStr(s.activeScenario) && out.scenarios.some((x) => x.id === s.activeScenario) ? s.activeScenario : (out.scenarios[0]?.id ?? null);
  if (isObj(s.multipliers)) {
    const m = s.multipliers;
    if (m.show === 'simple' || m.show === 'type') out.multipliers.show = m.show;
    if (isStr(m.sort)) out.multipliers.sort = m.sort;
    if (typeof m.descending === 'boolean') out.multipliers.descending = m.descending;
    if (isNum(m.limit) && m.limit >= 1) out.multipliers.limit = Math.floor(m.limit);
  }
  if (isObj(s.linkages)) {
    if (isStr(s.linkages.sort)) out.linkages.sort = s.linkages.sort;
    if (typeof s.linkages.descending === 'boolean') out.linkages.descending = s.linkages.descending;
  }
  if (isObj(s.results)) {
    const r = s.results;
    out.results.shown = isStr(r.shown) && out.scenarios.some((x) => x.id === r.shown) ? r.shown : null;
    out.results.base = isStr(r.base) && out.scenarios.some((x) => x.id === r.base) ? r.base : null;
  }
  if (isObj(s.sensitivity)) {
    const v = s.sensitivity;
    const o = out.sensitivity;
    if (v.target === 'multiplier' || v.target === 'impact') o.target = v.target;
    if (isStr(v.sector)) o.sector = v.sector;
    o.scenario = isStr(v.scenario) && out.scenarios.some((x) => x.id === v.scenario) ? v.scenario : null;
    if (isNum(v.percent) && v.percent > 0 && v.percent <= 100) o.percent = v.percent;
    if (isNum(v.top) && v.top >= 1) o.top = Math.min(50, Math.floor(v.top));
    if (isNum(v.cv) && v.cv > 0 && v.cv <= 200) o.cv = v.cv;
    if (isNum(v.draws) && v.draws >= 1) o.draws = Math.min(50_000, Math.floor(v.draws));
    if (isNum(v.seed) && Number.isInteger(v.seed) && v.seed >= 0) o.seed = v.seed;
    if (Array.isArray(v.edits)) {
      o.edits = v.edits.filter((e, k): e is CoefficientEdit => {
        const ok = isObj(e) && isStr(e.row) && isStr(e.col) && isNum(e.value);
        if (!ok) notes.push(`sensitivity.edits[${k}]: not a coefficient edit (row, column, value); left out`);
        return ok;
      }).map((e) => ({ row: e.row, col: e.col, value: e.value }));
    }
  }
  Object.assign(viewState, out);
  viewResults.monteCarlo = null;
  viewResults.monteCarloKey = '';
  return notes;
}

/**
 * Drop references the current table cannot satisfy (a measure, household rows, what-if edits on
 * sectors it does not have). Scenarios are kept as they are: the builder shows their problems.
 * Safe to call again and again; it changes nothing that still fits.
 */
export function syncViewsToTable(t: PlainTable, measureCodes?: string[]): string[] {
  const notes: string[] = [];
  const codes = new Set(t.sectors.codes);
  if (measureCodes && !measureCodes.includes(viewState.measure)) {
    notes.push(`the measure '${viewState.measure}' does not exist for this table; output is shown`);
    viewState.measure = 'output';
  }
  const h = viewState.household;
  if (h) {
    const va = new Set(t.valueAdded?.codes ?? []);
    const fd = new Set(t.finalDemand?.codes ?? []);
    if (!h.income.every((r) => va.has(r)) || (h.use && !fd.has(h.consumption))) {
      notes.push('the household rows or column chosen before are not in this table; the guess from its labels is used');
      viewState.household = null;
    }
  }
  const s = viewState.sensitivity;
  if (s.sector && !codes.has(s.sector)) s.sector = t.sectors.codes[0] ?? '';
  if (!s.sector) s.sector = t.sectors.codes[0] ?? '';
  const kept = s.edits.filter((e) => codes.has(e.row) && codes.has(e.col));
  if (kept.length !== s.edits.length) {
    notes.push(`${s.edits.length - kept.length} what-if edit(s) name sectors this table does not have; they were dropped`);
    s.edits = kept;
  }
  return notes;
}

// ---------------------------------------------------------------------------------------------
// Household choice as the worker takes it

/** The worker's household argument: 'guess', 'none', or the options. */
export function householdArg(h: HouseholdSetting | null = viewState.household): 'guess' | 'none' | HouseholdOptions {
  if (!h) return 'guess';
  if (!h.use) return 'none';
  const o: HouseholdOptions = { income: [...h.income], consumption: h.consumption };
  const basis = householdBasisOf(h);
  // Only the figure the basis uses goes to the worker (the others stay in the settings, so
  // switching back and forth loses nothing the user typed). A basis without its figure is sent
  // as it is: the engine refuses it and the page says what is missing.
  if (h.closureBasis || h.basis) o.basis = basis;
  if (basis === 'propensity' && h.propensity !== null) o.propensity = h.propensity;
  if (basis === 'household-income' && h.householdIncome) o.householdIncome = h.householdIncome;
  if (h.ownPurchases) o.ownPurchases = h.ownPurchases;
  return o;
}

/** The closure basis a setting means: the one chosen, or (older saved work) inferred from the figures given, as before. */
export function householdBasisOf(h: HouseholdSetting): ClosureBasis {
  if (h.closureBasis) return h.closureBasis;
  if (h.propensity !== null) return 'propensity';
  if (h.householdIncome) return 'household-income';
  return h.basis ?? 'labour-income';
}

// ---------------------------------------------------------------------------------------------
// Scenarios

/** The engine's scenario for a draft: an empty number stays absent, so the check names it. */
export function scenarioOf(d: DraftScenario): Scenario {
  const s: Scenario = { name: d.name, changes: d.changes.map(changeOf) };
  if (d.description) s.description = d.description;
  return s;
}

function changeOf(c: DraftChange): DemandChange {
  const out: DemandChange = { sector: c.sector };
  if (c.value !== null) {
    if (c.basis === 'percent') out.percent = c.value;
    else out.amount = c.value;
  }
  if (c.localShare !== null) out.localShare = c.localShare;
  if (c.category) out.category = c.category;
  if (c.note) out.note = c.note;
  return out;
}

/** A draft of an engine scenario (a change with both or neither of amount and percent keeps the amount). */
export function draftOf(s: Scenario, id = newId()): DraftScenario {
  return {
    id,
    name: s.name,
    description: s.description ?? '',
    changes: s.changes.map((c) => ({
      sector: c.sector,
      basis: c.amount === undefined && c.percent !== undefined ? 'percent' : 'amount',
      value: c.amount ?? c.percent ?? null,
      localShare: c.localShare ?? null,
      category: c.category ?? '',
      note: c.note ?? '',
    })),
  };
}

/** Every scenario as the engine's Scenario, for a project or scenario file. */
export function scenariosForProject(): Scenario[] {
  return viewState.scenarios.map((d) => scenarioOf($state.snapshot(d) as DraftScenario));
}

/** `base`, or `base (2)`, `base (3)`... whichever no scenario has yet. */
export function uniqueName(base: string, taken: readonly string[]): string {
  const name = base.trim() || 'Scenario';
  if (!taken.includes(name)) return name;
  const stem = name.replace(/ \(\d+\)$/, '');
  for (let k = 2; ; k++) {
    const c = `${stem} (${k})`;
    if (!taken.includes(c)) return c;
  }
}

const names = () => viewState.scenarios.map((s) => s.name);

export function findScenario(id: string | null): DraftScenario | undefined {
  return id === null ? undefined : viewState.scenarios.find((s) => s.id === id);
}

/** Add an empty scenario and open it. */
export function addScenario(name = 'New scenario'): DraftScenario {
  const d: DraftScenario = { id: newId(), name: uniqueName(name, names()), description: '', changes: [] };
  viewState.scenarios.push(d);
  viewState.activeScenario = d.id;
  return d;
}

/** Rename a scenario; returns a problem in words, or null when renamed. */
export function renameScenario(id: string, name: string): string | null {
  const s = findScenario(id);
  if (!s) return 'there is no such scenario';
  const n = name.trim();
  if (!n) return 'a scenario needs a name';
  if (viewState.scenarios.some((x) => x.id !== id && x.name === n)) return `another scenario is already called '${n}'; choose a different name`;
  s.name = n;
  return null;
}

export function duplicateScenario(id: string): DraftScenario | undefined {
  const s = findScenario(id);
  if (!s) return undefined;
  const copy: DraftScenario = { ...($state.snapshot(s) as DraftScenario), id: newId(), name: uniqueName(`${s.name} (copy)`, names()) };
  const at = viewState.scenarios.findIndex((x) => x.id === id);
  viewState.scenarios.splice(at + 1, 0, copy);
  viewState.activeScenario = copy.id;
  return copy;
}

export function deleteScenario(id: string): void {
  const at = viewState.scenarios.findIndex((x) => x.id === id);
  if (at < 0) return;
  viewState.scenarios.splice(at, 1);
  const next = viewState.scenarios[Math.min(at, viewState.scenarios.length - 1)];
  if (viewState.activeScenario === id) viewState.activeScenario = next?.id ?? null;
  if (viewState.results.shown === id) viewState.results.shown = null;
  if (viewState.results.base === id) viewState.results.base = null;
  if (viewState.sensitivity.scenario === id) viewState.sensitivity.scenario = null;
}

export function addChange(id: string, sector: string): void {
  findScenario(id)?.changes.push({ sector, basis: 'amount', value: null, localShare: null, category: '', note: '' });
}

export function removeChange(id: string, index: number): void {
  findScenario(id)?.changes.splice(index, 1);
}

/** The three invented demo scenarios, read through the scenario file's own validation. */
export function demoScenarioList(): Scenario[] {
  return readScenarios(JSON.stringify(demoScenarios), 'data-demo/scenarios.json');
}

/** Add scenarios (from a file or the demo), renaming any whose name is taken; returns the drafts added. */
export function loadScenarios(list: readonly Scenario[]): DraftScenario[] {
  const added: DraftScenario[] = [];
  for (const s of list) {
    const d = draftOf(s);
    d.name = uniqueName(d.name, names());
    viewState.scenarios.push(d);
    added.push(d);
  }
  if (added.length) viewState.activeScenario = added[0]!.id;
  return added;
}

// ---------------------------------------------------------------------------------------------
// Worker calls without the busy bar (quick answers such as a scenario check or a what-if)

/** Call the worker quietly: no busy bar; the caller shows errors where they belong. */
export function ask<T>(op: string, args: unknown): Promise<T> {
  return engine().call<T>(op, args);
}

let setupCache: { table: unknown; promise: Promise<AnalysisSetup> } | null = null;

/**
 * What the current table offers the views (axes, measures, the suggested household closure),
 * asked of the worker once per table; the views' settings are then fitted to the table.
 */
export function loadSetup(table: PlainTable): Promise<AnalysisSetup> {
  if (!setupCache || setupCache.table !== table) {
    const promise = ask<AnalysisSetup>('analysis-setup', {});
    setupCache = { table, promise };
    promise.then(
      (s) => syncViewsToTable(table, s.measures.map((m) => m.code)),
      () => {
        if (setupCache?.promise === promise) setupCache = null;
      },
    );
  }
  return setupCache.promise;
}
