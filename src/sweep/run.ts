/**
 * Running one shard of a sweep: read the plan and its inputs, expand it into units, and compute
 * this shard's units in order, writing the results as Parquet part files and a manifest.
 *
 * Each unit is one scenario on one table with one closure setting, one coefficient of variation
 * and one draw. Its numbers depend only on its inputs, the plan seed and its draw number: the
 * perturbed coefficients of draw d are the engine's `drawCoefficients` with stream d of the plan
 * seed (engine/random.ts), the same for every shard count. Units that share a table, a cv and a
 * draw use the same perturbed coefficients (common random numbers, common practice when
 * scenarios are compared), so each is factored once per shard.
 *
 * Files in the shard's folder (OUT/shard-0002-of-0004/):
 *   part-00000080.parquet   units [80, 160): row groups of `groupUnits` units each, aligned to
 *                           multiples of `groupUnits` in the whole plan, so a merge regroups the
 *                           same way whatever the number of shards
 *   manifest.json           the shard's units, the SHA-256 of the plan and of every input, the
 *                           tool version, and each finished part (file, units, rows, SHA-256)
 * A part is written to a temporary name and renamed when complete; the manifest is then
 * rewritten the same way. A shard that is killed and run again keeps the parts its manifest
 * lists and redoes only the units after them. Nothing holds more than one row group of results.
 */
import { createHash } from 'node:crypto';
import { existsSync, fsyncSync, closeSync, openSync, readdirSync, readFileSync, renameSync, statSync, unlinkSync, writeSync, mkdirSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../../engine/errors';
import type { Models } from '../../engine/household';
import { ClosedModel } from '../../engine/household';
import { impact } from '../../engine/impact';
import { LeontiefModel } from '../../engine/leontief';
import { matrix } from '../../engine/linalg/matrix';
import type { ResolvedScenario } from '../../engine/scenario';
import type { PreparedMonteCarlo } from '../../engine/uncertainty';
import { drawCoefficients, prepareMonteCarlo, productivityRejection } from '../../engine/uncertainty';
import type { TableSummary } from '../report/model';
import { describeTable } from '../report/model';
import { regionalise } from '../../engine/regional/regionalise';
import { checkedTable, TOOL } from '../cli/common';
import { chooseBasis, readValues } from '../cli/regional-input';
import type { CliContext } from '../cli/context';
import { absolute } from '../cli/context';
import { UsageError } from '../cli/errors';
import { readInput, sha256Hex } from '../cli/files';
import type { PreparedModels } from '../cli/model-options';
import { prepareModels } from '../cli/model-options';
import { loadScenarios } from '../cli/scenario-input';
import { RowBuffer, ResultsFile } from './parquet';
import type { Expansion, HouseholdPoint, SweepPlan, WorkUnit } from './plan';
import { describeUnit, expand, householdText, readPlan, tableVariants } from './plan';
import type { ShardChoice } from './shard';
import { shardFolder, shardRange } from './shard';

export const MANIFEST_FORMAT = 'ripplewise-sweep-shard';
export const MANIFEST_VERSION = 1;
/** Row groups per part file. */
export const GROUPS_PER_PART = 8;

export interface SweepInput {
  role: string;
  name: string;
  sha256: string;
}

export interface PartEntry {
  file: string;
  start: number;
  end: number;
  rows: number;
  bytes: number;
  sha256: string;
  /** Units of the part left out, with the reason (an unproductive draw, a singular model). */
  rejected: { unit: number; reason: string }[];
}

export interface TableEntry {
  name: string;
  summary: TableSummary;
  measures: { code: string; label: string; unit: string }[];
  sectors: number;
}

export interface Manifest {
  format: typeof MANIFEST_FORMAT;
  version: typeof MANIFEST_VERSION;
  tool: { name: string; version: string };
  plan: { name: string; file: string; sha256: string; units: number; seed: number; draws: number; cv: number[]; delta?: number[]; household: string[]; effects: string[] };
  /** SHA-256 of the sorted input list: equal digests mean the same inputs. */
  inputsDigest: string;
  inputs: SweepInput[];
  shard: { index: number; count: number; source: ShardChoice['source'] };
  units: { start: number; end: number };
  groupUnits: number;
  tables: TableEntry[];
  scenarios: string[];
  parts: PartEntry[];
  complete: boolean;
}

/** What the runner needs from a loaded table (one table variant: a plan table, regionalised with one δ or not). */
interface LoadedSweepTable {
  name: string;
  /** The δ of a table regionalised by FLQ or AFLQ, else null. */
  delta: number | null;
  n: number;
  codes: string[];
  /** Per closure point of the plan: the models of the table's own coefficients and the measures. */
  prepared: PreparedModels[];
  /** Resolved scenarios, in the order of the expansion. */
  scenarios: ResolvedScenario[];
}

export interface LoadedSweep {
  plan: SweepPlan;
  planFile: string;
  expansion: Expansion;
  inputs: SweepInput[];
  inputsDigest: string;
  planSha256: string;
  tables: LoadedSweepTable[];
  entries: TableEntry[];
  groupUnits: number;
}

export function inputsDigest(inputs: readonly SweepInput[]): string {
  return sha256Hex(new TextEncoder().encode(JSON.stringify([...inputs].sort((a, b) => (a.role < b.role ? -1 : a.role > b.role ? 1 : 0)))));
}

function modelFlags(plan: SweepPlan, t: SweepPlan['tables'][number], h: HouseholdPoint) {
  return {
    ...(h === 'off' ? { household: false } : {}),
    ...(typeof h === 'number' ? { propensity: String(h) } : {}),
    ...(h !== 'off' && t.householdColumn ? { householdColumn: t.householdColumn } : {}),
    ...(h !== 'off' && t.labourIncomeRow ? { labourIncomeRow: t.labourIncomeRow } : {}),
    ...(plan.measures ? { measure: plan.measures.join(',') } : {}),
  };
}

/** Read the plan, its tables (checked) and its scenarios (checked against every table), and expand it. */
export async function loadSweep(ctx: CliContext, planName: string): Promise<LoadedSweep> {
  if (planName === '-') throw new UsageError('the sweep plan must be a file (its folder is where the tables and scenarios are found)', 'plan-stdin');
  const planFile = await readInput(ctx, planName, 'sweep plan');
  const plan = readPlan(new TextDecoder('utf-8').decode(planFile.bytes), planName);
  const base = dirname(planFile.path!);
  const at = (f: string) => absolute({ ...ctx, cwd: base }, f);
  const inputs: SweepInput[] = [{ role: 'plan', name: basename(planName), sha256: planFile.sha256 }];
  const tables: LoadedSweepTable[] = [];
  const entries: TableEntry[] = [];
  let scenarioNames: { set: number; name: string }[] | undefined;
  const variants = tableVariants(plan);
  for (const [ti, pt] of plan.tables.entries()) {
    const loaded = await checkedTable(ctx, at(pt.file), { ...(pt.sheet !== undefined ? { sheet: pt.sheet } : {}), ...(pt.mapping !== undefined ? { mapping: at(pt.mapping) } : {}) });
    inputs.push({ role: `table:${pt.name}`, name: pt.file, sha256: loaded.file.sha256 });
    for (const x of loaded.extra) inputs.push({ role: `${x.role}:${pt.name}`, name: pt.mapping ?? basename(x.file.name), sha256: x.file.sha256 });
    const national = loaded.table;
    // A regional table: its file read and its basis chosen once, then regionalised for each δ.
    let regional: { basis: ReturnType<typeof chooseBasis>['basis']; source: { file: string; sha256: string } } | undefined;
    if (pt.regional) {
      const r = pt.regional;
      const read = await readValues(ctx, at(r.file), 'regional file', national.sectors, r.sheet !== undefined ? { sheet: r.sheet } : {});
      inputs.push({ role: `regional:${pt.name}`, name: r.file, sha256: read.file.sha256 });
      const choice = chooseBasis(national, read, r.basis, { ...(r.regionalColumn ? { regionalColumn: r.regionalColumn } : {}), ...(r.nationalColumn ? { nationalColumn: r.nationalColumn } : {}), ...(r.region ? { name: r.region } : {}) });
      regional = { basis: choice.basis, source: { file: basename(r.file), sha256: read.file.sha256 } };
    }
    const resolved: ResolvedScenario[] = [];
    const names: { set: number; name: string }[] = [];
    for (const [si, ps] of plan.scenarios.entries()) {
      const sc = await loadScenarios(ctx, at(ps.file), national, ps.names, { holdsResults: false });
      if (ti === 0) inputs.push({ role: `scenarios:${si + 1}`, name: ps.file, sha256: sc.file.sha256 });
      sc.resolved.forEach((r) => {
        resolved.push(r);
        names.push({ set: si, name: r.name });
      });
    }
    if (!scenarioNames) {
      scenarioNames = names;
      const seen = new Map<string, number>();
      for (const s of names) {
        if (seen.has(s.name)) throw new UsageError(`plan ${planName}: the scenario '${s.name}' is in scenarios[${seen.get(s.name)}] and scenarios[${s.set}]; each scenario of a sweep needs its own name`, 'duplicate-scenario');
        seen.set(s.name, s.set);
      }
    }
    for (const v of variants.filter((x) => x.table === ti)) {
      const t = pt.regional && regional ? regionalise(national, regional.basis, { method: pt.regional.method, ...(v.delta !== undefined ? { delta: v.delta } : {}), source: regional.source }).table : national;
      const prepared = plan.household.map((h) => {
        const p = prepareModels(t, modelFlags(plan, pt, h));
        if (h !== 'off' && p.closure !== 'closed') {
          throw new UsageError(
            `plan ${planName}: table '${v.name}' has no household closure that could be identified, but parameters.household asks for ${householdText(h)}`,
            'closure-incomplete',
            `Give tables[${ti}].householdColumn and tables[${ti}].labourIncomeRow, or use "off" only`,
          );
        }
        return p;
      });
      const ms = prepared[0]!.measures;
      tables.push({ name: v.name, delta: v.delta ?? null, n: t.sectors.codes.length, codes: [...t.sectors.codes], prepared, scenarios: resolved });
      entries.push({ name: v.name, summary: describeTable(t), measures: ms.map((m) => ({ code: m.code, label: m.label, unit: m.unit })), sectors: t.sectors.codes.length });
    }
  }
  const expansion = expand(plan, scenarioNames!);
  const rowsPerUnit = Math.max(...tables.map((t) => t.n * t.prepared[0]!.measures.length * plan.effects.length));
  const groupUnits = Math.max(1, Math.floor(plan.rowsPerGroup / rowsPerUnit));
  return { plan, planFile: planName, expansion, inputs, inputsDigest: inputsDigest(inputs), planSha256: planFile.sha256, tables, entries, groupUnits };
}

/** Write a file whole through a temporary name in the same folder, then rename it. */
export function writeAtomic(path: string, data: string | Uint8Array): void {
  const tmp = `${path}.tmp-${process.pid}`;
  const fd = openSync(tmp, 'w');
  try {
    writeSync(fd, typeof data === 'string' ? new TextEncoder().encode(data) : data);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  renameSync(tmp, path);
}

export function readManifest(path: string): Manifest {
  let m: Manifest;
  try {
    m = JSON.parse(readFileSync(path, 'utf8')) as Manifest;
  } catch (e) {
    throw new InputError('bad-manifest', `${path}: not a readable shard manifest (${(e as Error).message})`, { file: path }, 'Delete the shard folder and run the shard again');
  }
  if (m?.format !== MANIFEST_FORMAT) throw new InputError('bad-manifest', `${path}: not a ripplewise sweep shard manifest`, { file: path });
  if (m.version > MANIFEST_VERSION) throw new InputError('newer-version', `${path}: the manifest is version ${m.version}, newer than this program reads (up to ${MANIFEST_VERSION})`, { file: path });
  return m;
}

export interface ShardRunOptions {
  /** Called after each part is written. */
  onPart?: (done: number, total: number) => void;
}

export interface ShardRunResult {
  folder: string;
  manifest: Manifest;
  /** Units computed by this run (not kept from an earlier one). */
  computed: number;
  kept: number;
}

/** Models for one (table, closure point, cv, draw): the table's own, or a perturbed draw; or why the draw is left out. */
class ModelCache {
  private key = '';
  private value: Models | string | undefined;
  private mc = new Map<string, PreparedMonteCarlo>();

  constructor(private readonly s: LoadedSweep) {}

  get(u: WorkUnit): Models | string {
    const key = `${u.table}/${u.household}/${u.cv}/${u.draw}`;
    if (key === this.key) return this.value!;
    this.key = key;
    this.value = this.build(u);
    return this.value;
  }

  private build(u: WorkUnit): Models | string {
    const { plan } = this.s;
    const cv = plan.cv[u.cv]!;
    const base = this.s.tables[u.table]!.prepared[u.household]!.models;
    if (cv === 0) return base;
    const mcKey = `${u.table}/${u.cv}`;
    let p = this.mc.get(mcKey);
    if (!p) {
      const A = base.open.A;
      p = prepareMonteCarlo({ A: { rows: A.rows, cols: A.cols, data: A.data }, cv, draws: plan.draws, seed: plan.seed, measures: [{ code: 'output', c: new Float64Array(A.rows).fill(1) }], scenarios: [], productivity: plan.productivity });
      this.mc.set(mcKey, p);
    }
    const a = drawCoefficients(p, u.draw);
    const why = productivityRejection(p, a, u.draw);
    if (why) return why.reason === 'column-sum' ? `draw ${u.draw}: column ${why.sector! + 1} of A sums to ${why.value}` : `draw ${u.draw}: Perron root of A at least ${why.value}`;
    try {
      const open = new LeontiefModel(matrix(p.n, p.n, a));
      const out: Models = { table: base.table, open };
      if (base.closure) {
        out.closure = base.closure;
        out.closed = new ClosedModel(open, base.closure);
      }
      return out;
    } catch (e) {
      if (e instanceof InputError || (e as Error).name === 'SingularMatrixError') return `draw ${u.draw}: ${(e as Error).message}`;
      throw e;
    }
  }
}

/** The rows of one unit into `b`; a reason when the unit is left out. */
function unitRows(s: LoadedSweep, cache: ModelCache, u: WorkUnit, b: RowBuffer): string | undefined {
  const { plan, expansion } = s;
  const t = s.tables[u.table]!;
  const m = cache.get(u);
  if (typeof m === 'string') return m;
  let im;
  try {
    im = impact(m, t.scenarios[u.scenario]!, t.prepared[u.household]!.measures);
  } catch (e) {
    if ((e as Error).name === 'SingularMatrixError') return (e as Error).message;
    throw e;
  }
  const scenario = expansion.scenarios[u.scenario]!.name;
  const household = householdText(plan.household[u.household]!);
  const cv = plan.cv[u.cv]!;
  for (const mi of im.measures) {
    const code = mi.measure.code;
    for (let i = 0; i < t.n; i++) {
      for (const e of plan.effects) b.push(u.index, t.name, scenario, household, cv, t.delta, u.draw, t.codes[i]!, code, e, mi[e][i]!, mi.unit);
    }
  }
  return undefined;
}

function partName(start: number, units: number): string {
  return `part-${String(start).padStart(Math.max(8, String(units).length), '0')}.parquet`;
}

/** Run (or resume) one shard into OUT/shard-I-of-N/. */
export async function runShard(s: LoadedSweep, out: string, shard: ShardChoice, o: ShardRunOptions = {}): Promise<ShardRunResult> {
  const U = s.expansion.count;
  const { start, end } = shardRange(U, shard.index, shard.count);
  const folder = join(out, shardFolder(shard.index, shard.count));
  mkdirSync(folder, { recursive: true });
  for (const f of readdirSync(folder)) if (/\.tmp-\d+$/.test(f)) unlinkSync(join(folder, f));
  const manifestPath = join(folder, 'manifest.json');
  const fresh: Manifest = {
    format: MANIFEST_FORMAT,
    version: MANIFEST_VERSION,
    tool: { ...TOOL },
    plan: {
      name: s.plan.name,
      file: basename(s.planFile),
      sha256: s.planSha256,
      units: U,
      seed: s.plan.seed,
      draws: s.plan.draws,
      cv: s.plan.cv,
      ...(s.plan.delta ? { delta: s.plan.delta } : {}),
      household: s.plan.household.map(householdText),
      effects: s.plan.effects,
    },
    inputsDigest: s.inputsDigest,
    inputs: s.inputs,
    shard: { index: shard.index + 1, count: shard.count, source: shard.source },
    units: { start, end },
    groupUnits: s.groupUnits,
    tables: s.entries,
    scenarios: s.expansion.scenarios.map((x) => x.name),
    parts: [],
    complete: false,
  };
  let manifest = fresh;
  if (existsSync(manifestPath)) {
    const old = readManifest(manifestPath);
    const same = old.inputsDigest === s.inputsDigest && old.tool.version === TOOL.version && old.shard.count === shard.count && old.shard.index === shard.index + 1 && old.groupUnits === s.groupUnits;
    if (!same) {
      const why = old.inputsDigest !== s.inputsDigest ? `other inputs (${changedInputs(old.inputs, s.inputs).join(', ') || 'the plan'})` : old.tool.version !== TOOL.version ? `Ripplewise ${old.tool.version}` : 'another shard layout';
      throw new UsageError(`${folder} holds results made from ${why}; they cannot be resumed with this plan`, 'shard-mismatch', 'Give another --out folder, or delete this shard folder to start it again');
    }
    // Keep the contiguous run of finished parts whose files are still whole.
    let next = start;
    const kept: PartEntry[] = [];
    for (const p of old.parts) {
      const path = join(folder, p.file);
      if (p.start !== next || !existsSync(path) || statSync(path).size !== p.bytes) break;
      kept.push(p);
      next = p.end;
    }
    manifest = { ...fresh, parts: kept, complete: next === end };
  }
  const keptUnits = manifest.parts.reduce((a, p) => a + (p.end - p.start), 0);
  let next = start + keptUnits;
  writeAtomic(manifestPath, JSON.stringify(manifest, null, 1) + '\n');
  const cache = new ModelCache(s);
  const partUnits = s.groupUnits * GROUPS_PER_PART;
  const totalParts = countParts(start, end, partUnits);
  o.onPart?.(manifest.parts.length, totalParts);
  const meta = { 'ripplewise.plan.sha256': s.planSha256, 'ripplewise.inputs': s.inputsDigest, 'ripplewise.tool': `${TOOL.name} ${TOOL.version}` };
  while (next < end) {
    const partEnd = Math.min(end, (Math.floor(next / partUnits) + 1) * partUnits);
    const file = partName(next, U);
    const rf = new ResultsFile(join(folder, file), meta, `${TOOL.name} ${TOOL.version}`);
    const rejected: PartEntry['rejected'] = [];
    try {
      let u = next;
      while (u < partEnd) {
        const groupEnd = Math.min(partEnd, (Math.floor(u / s.groupUnits) + 1) * s.groupUnits);
        const b = new RowBuffer();
        for (; u < groupEnd; u++) {
          const unit = s.expansion.unit(u);
          const why = unitRows(s, cache, unit, b);
          if (why !== undefined) rejected.push({ unit: u, reason: `${describeUnit(s.expansion, unit)}: ${why}` });
        }
        rf.writeGroup(b);
      }
      rf.close();
    } catch (e) {
      rf.abandon();
      throw e;
    }
    const bytes = readFileSync(join(folder, file));
    manifest.parts.push({ file, start: next, end: partEnd, rows: rf.rows, bytes: bytes.length, sha256: createHash('sha256').update(bytes).digest('hex'), rejected });
    next = partEnd;
    manifest.complete = next === end;
    writeAtomic(manifestPath, JSON.stringify(manifest, null, 1) + '\n');
    o.onPart?.(manifest.parts.length, totalParts);
  }
  return { folder, manifest, computed: end - start - keptUnits, kept: keptUnits };
}

function countParts(start: number, end: number, partUnits: number): number {
  if (end <= start) return 0;
  return Math.floor((end - 1) / partUnits) - Math.floor(start / partUnits) + 1;
}

/** Roles whose file differs between two input lists. */
export function changedInputs(a: readonly SweepInput[], b: readonly SweepInput[]): string[] {
  const roles = new Set([...a.map((x) => x.role), ...b.map((x) => x.role)]);
  const out: string[] = [];
  for (const r of roles) {
    const x = a.find((i) => i.role === r);
    const y = b.find((i) => i.role === r);
    if (x?.sha256 !== y?.sha256) out.push(`${r} ${y?.name ?? x?.name}`);
  }
  return out.sort();
}
