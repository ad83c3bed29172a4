/**
 * The sweep plan: tables × scenario sets × parameter grids × Monte Carlo draws, as one versioned
 * JSON document, validated on load like the project files (src/project), and expanded
 * deterministically into numbered work units.
 *
 *   { "format": "ripplewise-sweep", "version": 1,
 *     "name": "Coast study", "seed": 1, "draws": 200,
 *     "tables": [ { "name": "coast", "file": "coast.csv", "mapping": "coast-mapping.json" } ],
 *     "scenarios": [ { "file": "scenarios.json", "names": ["New plant"] } ],
 *     "parameters": { "household": ["off", "table", 0.6, 0.8], "cv": [0, 0.1], "delta": [0.1, 0.2, 0.3] },
 *     "measures": ["output", "value-added"], "effects": ["direct", "indirect", "induced", "total"],
 *     "rowsPerGroup": 65536 }
 *
 * Paths are relative to the plan file's folder. `household` values: "off" (open model, Type I
 * only), "table" (the closure with the share of income spent taken from the table) or a share
 * from 0 to 1 (the closure share, `--propensity` of `impact`). `cv` is the coefficient of
 * variation of every technical coefficient (0: the table's own coefficients, one unit, no draws).
 *
 * A table entry may carry `"regional": { "file": "region.csv", "method": "flq" }` (and optionally
 * `basis` employment | output | earnings, `regionalColumn`, `nationalColumn`, `region`, `sheet`,
 * `delta`): the table is then regionalised first, as `ripplewise regionalise` does, and the units
 * run on the regional table. `delta` of `parameters` is a grid over the FLQ or AFLQ δ: each table
 * regionalised by FLQ or AFLQ becomes one table variant per δ (its own `delta` is then not given);
 * the other tables have one variant each. Variants take the table's name, with ` δ=…` added when a
 * table has several.
 *
 * Expansion order (the unit number is a mixed-radix number in this order, last fastest):
 * table variant (table, then δ), cv, draw, household, scenario. Units that share a table, a cv and a draw share one
 * perturbed coefficient matrix, so a contiguous block of units (a shard) factors it once.
 * Browser-safe: no file system here.
 */
import type { BasisKind } from '../../engine/regional/basis';
import { BASIS_KINDS } from '../../engine/regional/basis';
import type { RegionalMethod } from '../../engine/regional/regionalise';
import { REGIONAL_METHODS } from '../../engine/regional/regionalise';
import { DEFAULT_DELTA } from '../../engine/regional/flq';
import { Checker } from '../project/check';
import { parseJson } from '../project/json';

export const SWEEP_FORMAT = 'ripplewise-sweep';
export const SWEEP_VERSION = 1;

export const EFFECTS = ['direct', 'indirect', 'induced', 'total'] as const;
export type Effect = (typeof EFFECTS)[number];

/** A closure setting of the grid: open model, the table's own share, or a given share. */
export type HouseholdPoint = 'off' | 'table' | number;

/** Regionalisation of a table before its units run (as `ripplewise regionalise`). */
export interface PlanRegional {
  file: string;
  method: RegionalMethod;
  basis: BasisKind;
  sheet?: string;
  regionalColumn?: string;
  nationalColumn?: string;
  region?: string;
  /** δ for FLQ and AFLQ when `parameters.delta` is not given (default 0.3). */
  delta?: number;
}

export interface PlanTable {
  name: string;
  file: string;
  sheet?: string;
  mapping?: string;
  householdColumn?: string;
  labourIncomeRow?: string;
  regional?: PlanRegional;
}

/** One table as the units see it: a plan table, regionalised with one δ or not regionalised. */
export interface TableVariant {
  /** Index in plan.tables. */
  table: number;
  name: string;
  /** The δ of FLQ or AFLQ (undefined for other methods and national tables). */
  delta?: number;
}

/** Methods that take a δ. */
export const DELTA_METHODS: readonly RegionalMethod[] = ['flq', 'aflq'];

export interface PlanScenarios {
  file: string;
  /** Only these scenarios of the file (default: all). */
  names?: string[];
}

export interface SweepPlan {
  name: string;
  seed: number;
  draws: number;
  tables: PlanTable[];
  scenarios: PlanScenarios[];
  household: HouseholdPoint[];
  cv: number[];
  /** The grid over δ for tables regionalised by FLQ or AFLQ (none: each table's own δ). */
  delta?: number[];
  measures?: string[];
  effects: Effect[];
  productivity: 'column-sums' | 'perron';
  /** Target rows of one Parquet row group (default 65,536); a group always holds whole units. */
  rowsPerGroup: number;
}

const TOP_KEYS = ['format', 'version', 'name', 'seed', 'draws', 'tables', 'scenarios', 'parameters', 'measures', 'effects', 'productivity', 'description', 'rowsPerGroup'];
const PARAMETER_KEYS = ['household', 'cv', 'delta'];
const REGIONAL_KEYS = ['file', 'method', 'basis', 'sheet', 'regionalColumn', 'nationalColumn', 'region', 'delta'];
const MAX_UNITS = 100_000_000;

function noUnknown(c: Checker, o: Record<string, unknown>, allowed: string[], at: string, hint?: Record<string, string>): void {
  for (const k of Object.keys(o)) {
    if (!allowed.includes(k)) c.fail(`${at}${k}`, hint?.[k] ?? `one of the known fields (${allowed.join(', ')})`, k);
  }
}

function distinct<T>(c: Checker, values: T[], path: string): T[] {
  const seen = new Set<string>();
  values.forEach((v, i) => {
    const key = String(v);
    if (seen.has(key)) c.fail(`${path}[${i}]`, 'a value not listed before', v);
    seen.add(key);
  });
  return values;
}

function readRegional(c: Checker, v: unknown, at: string): PlanRegional {
  const r = c.object(v, at);
  noUnknown(c, r, REGIONAL_KEYS, `${at}.`);
  const file = c.string(r.file, `${at}.file`);
  if (!file.trim()) c.fail(`${at}.file`, 'a file name', r.file);
  const method = c.string(r.method, `${at}.method`);
  if (!(REGIONAL_METHODS as readonly string[]).includes(method)) c.fail(`${at}.method`, REGIONAL_METHODS.join(', '), method);
  const basis = c.optString(r.basis, `${at}.basis`) ?? 'employment';
  if (!(BASIS_KINDS as readonly string[]).includes(basis)) c.fail(`${at}.basis`, BASIS_KINDS.join(', '), basis);
  const out: PlanRegional = { file, method: method as RegionalMethod, basis: basis as BasisKind };
  for (const k of ['sheet', 'regionalColumn', 'nationalColumn', 'region'] as const) {
    const x = c.optString(r[k], `${at}.${k}`);
    if (x !== undefined) out[k] = x;
  }
  const d = c.optNumber(r.delta, `${at}.delta`);
  if (d !== undefined) {
    if (!(d >= 0 && d <= 1)) c.fail(`${at}.delta`, 'a δ from 0 to 1', d);
    if (!DELTA_METHODS.includes(out.method)) c.fail(`${at}.delta`, `left out: ${method} takes no δ`, d);
    out.delta = d;
  }
  return out;
}

/** The table variants of a plan, in expansion order: each table, then each δ of the grid where it applies. */
export function tableVariants(plan: SweepPlan): TableVariant[] {
  const out: TableVariant[] = [];
  plan.tables.forEach((t, i) => {
    const r = t.regional;
    if (r && DELTA_METHODS.includes(r.method) && plan.delta) {
      for (const d of plan.delta) out.push({ table: i, name: plan.delta.length > 1 ? `${t.name} δ=${d}` : t.name, delta: d });
    } else out.push({ table: i, name: t.name, ...(r && DELTA_METHODS.includes(r.method) ? { delta: r.delta ?? DEFAULT_DELTA } : {}) });
  });
  return out;
}

/** Read and validate a plan; every problem names the file and the path of the field. */
export function readPlan(text: string, file: string): SweepPlan {
  const c = new Checker(file);
  const o = c.object(parseJson(text, file), '');
  c.header(o, SWEEP_FORMAT, SWEEP_VERSION);
  noUnknown(c, o, TOP_KEYS, '');
  const seed = c.optNumber(o.seed, 'seed') ?? 1;
  if (!Number.isSafeInteger(seed) || seed < 0) c.fail('seed', 'a whole number from 0 to 2^53 − 1', o.seed);
  const draws = c.optNumber(o.draws, 'draws') ?? 1;
  if (!Number.isInteger(draws) || draws < 1 || draws > 10_000_000) c.fail('draws', 'a whole number from 1 to 10,000,000', o.draws);
  const tables = c.array(o.tables, 'tables').map((x, i) => {
    const t = c.object(x, `tables[${i}]`);
    const at = `tables[${i}].`;
    noUnknown(c, t, ['name', 'file', 'sheet', 'mapping', 'householdColumn', 'labourIncomeRow', 'regional'], at);
    const fileName = c.string(t.file, `${at}file`);
    if (!fileName.trim()) c.fail(`${at}file`, 'a file name', t.file);
    const out: PlanTable = { name: c.optString(t.name, `${at}name`) ?? fileName, file: fileName };
    const sheet = c.optString(t.sheet, `${at}sheet`);
    const mapping = c.optString(t.mapping, `${at}mapping`);
    const hc = c.optString(t.householdColumn, `${at}householdColumn`);
    const lr = c.optString(t.labourIncomeRow, `${at}labourIncomeRow`);
    if (sheet !== undefined) out.sheet = sheet;
    if (mapping !== undefined) out.mapping = mapping;
    if (hc !== undefined) out.householdColumn = hc;
    if (lr !== undefined) out.labourIncomeRow = lr;
    if (t.regional !== undefined) out.regional = readRegional(c, t.regional, `${at}regional`);
    return out;
  });
  if (!tables.length) c.fail('tables', 'a list of at least one table', o.tables);
  distinct(c, tables.map((t) => t.name), 'tables');
  const scenarios = c.array(o.scenarios, 'scenarios').map((x, i) => {
    const s = c.object(x, `scenarios[${i}]`);
    noUnknown(c, s, ['file', 'names'], `scenarios[${i}].`);
    const out: PlanScenarios = { file: c.string(s.file, `scenarios[${i}].file`) };
    if (s.names !== undefined) out.names = distinct(c, c.strings(s.names, `scenarios[${i}].names`), `scenarios[${i}].names`);
    return out;
  });
  if (!scenarios.length) c.fail('scenarios', 'a list of at least one scenario file', o.scenarios);
  const params = c.object(o.parameters ?? {}, 'parameters');
  noUnknown(c, params, PARAMETER_KEYS, 'parameters.');
  const household = distinct(
    c,
    c.array(params.household ?? ['table'], 'parameters.household').map((v, i): HouseholdPoint => {
      if (v === 'off' || v === 'table') return v;
      if (typeof v === 'number' && Number.isFinite(v) && v >= 0 && v <= 1) return v;
      return c.fail(`parameters.household[${i}]`, "'off', 'table' or a share from 0 to 1", v);
    }),
    'parameters.household',
  );
  if (!household.length) c.fail('parameters.household', 'a list of at least one closure setting', params.household);
  const cv = distinct(
    c,
    c.numbers(params.cv ?? [0], 'parameters.cv').map((v, i) => (v >= 0 && v <= 2 ? v : c.fail(`parameters.cv[${i}]`, 'a ratio from 0 to 2 (0.1 is 10 %)', v))),
    'parameters.cv',
  );
  if (!cv.length) c.fail('parameters.cv', 'a list of at least one coefficient of variation', params.cv);
  let delta: number[] | undefined;
  if (params.delta !== undefined) {
    delta = distinct(
      c,
      c.numbers(params.delta, 'parameters.delta').map((v, i) => (v >= 0 && v <= 1 ? v : c.fail(`parameters.delta[${i}]`, 'a δ from 0 to 1 (the common default is 0.3)', v))),
      'parameters.delta',
    );
    if (!delta.length) c.fail('parameters.delta', 'a list of at least one δ', params.delta);
    const takers = tables.filter((t) => t.regional && DELTA_METHODS.includes(t.regional.method));
    if (!takers.length) c.fail('parameters.delta', 'given only when some table has "regional" with the method flq or aflq (δ is their parameter)', params.delta);
    tables.forEach((t, i) => {
      if (t.regional?.delta !== undefined && DELTA_METHODS.includes(t.regional.method)) c.fail(`tables[${i}].regional.delta`, 'left out when parameters.delta gives the grid', t.regional.delta);
    });
  }
  const plan: SweepPlan = {
    name: c.optString(o.name, 'name') ?? file,
    seed,
    draws,
    tables,
    scenarios,
    household,
    cv,
    ...(delta ? { delta } : {}),
    effects: [...EFFECTS],
    productivity: 'column-sums',
    rowsPerGroup: 65_536,
  };
  const rpg = c.optNumber(o.rowsPerGroup, 'rowsPerGroup');
  if (rpg !== undefined) {
    if (!Number.isInteger(rpg) || rpg < 1 || rpg > 10_000_000) c.fail('rowsPerGroup', 'a whole number from 1 to 10,000,000', rpg);
    plan.rowsPerGroup = rpg;
  }
  if (o.measures !== undefined) {
    plan.measures = distinct(c, c.strings(o.measures, 'measures'), 'measures');
    if (!plan.measures.length) c.fail('measures', 'a list of at least one measure code', o.measures);
  }
  if (o.effects !== undefined) {
    plan.effects = distinct(
      c,
      c.strings(o.effects, 'effects').map((e, i) => ((EFFECTS as readonly string[]).includes(e) ? (e as Effect) : c.fail(`effects[${i}]`, EFFECTS.join(', '), e))),
      'effects',
    );
    if (!plan.effects.length) c.fail('effects', 'a list of at least one effect', o.effects);
  }
  if (o.productivity !== undefined) {
    const p = c.string(o.productivity, 'productivity');
    if (p !== 'column-sums' && p !== 'perron') c.fail('productivity', "'column-sums' or 'perron'", p);
    plan.productivity = p as SweepPlan['productivity'];
  }
  return plan;
}

/** One work unit: what it computes, and its number in the expansion. */
export interface WorkUnit {
  index: number;
  /** The table variant (index in Expansion.variants). */
  table: number;
  cv: number;
  draw: number;
  household: number;
  scenario: number;
}

/** The expansion of a plan once the scenario names are known: unit count and unit by number. */
export interface Expansion {
  plan: SweepPlan;
  /** The table variants (tableVariants), which units number by. */
  variants: TableVariant[];
  /** Every scenario of the sweep, in plan order: its file (index in plan.scenarios) and name. */
  scenarios: { set: number; name: string }[];
  /** Draws of each cv value (1 for cv 0: the table's own coefficients). */
  drawsOf: number[];
  count: number;
  unit(index: number): WorkUnit;
}

export function expand(plan: SweepPlan, scenarios: { set: number; name: string }[]): Expansion {
  const S = scenarios.length;
  const H = plan.household.length;
  const drawsOf = plan.cv.map((v) => (v === 0 ? 1 : plan.draws));
  const perTable = drawsOf.reduce((a, d) => a + d * H * S, 0);
  const variants = tableVariants(plan);
  const count = variants.length * perTable;
  if (!S) throw new Error('a sweep needs at least one scenario');
  if (count > MAX_UNITS) throw new Error(`the plan expands to ${count} units, more than ${MAX_UNITS}`);
  const cvStart: number[] = [];
  let acc = 0;
  for (const d of drawsOf) {
    cvStart.push(acc);
    acc += d * H * S;
  }
  return {
    plan,
    variants,
    scenarios,
    drawsOf,
    count,
    unit(index: number): WorkUnit {
      if (!Number.isInteger(index) || index < 0 || index >= count) throw new RangeError(`unit ${index} is not in 0 … ${count - 1}`);
      const table = Math.floor(index / perTable);
      let r = index - table * perTable;
      let cv = cvStart.length - 1;
      while (cvStart[cv]! > r) cv--;
      r -= cvStart[cv]!;
      const draw = Math.floor(r / (H * S));
      r -= draw * H * S;
      const household = Math.floor(r / S);
      const scenario = r - household * S;
      return { index, table, cv, draw, household, scenario };
    },
  };
}

/** The household point as text, as it appears in the results ("off", "table" or the share). */
export function householdText(h: HouseholdPoint): string {
  return typeof h === 'number' ? String(h) : h;
}

/** A unit described in words, for messages: table, scenario and parameters. */
export function describeUnit(e: Expansion, u: WorkUnit): string {
  const p = e.plan;
  return `unit ${u.index} (table '${e.variants[u.table]!.name}', scenario '${e.scenarios[u.scenario]!.name}', household ${householdText(p.household[u.household]!)}, cv ${p.cv[u.cv]}, draw ${u.draw})`;
}
