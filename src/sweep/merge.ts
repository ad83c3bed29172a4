/**
 * Merging a sweep: gather every shard's manifest in a folder, check that every unit of the plan
 * is there exactly once and that all were made from the same plan, inputs and tool version, then
 * stream the parts in unit order into one Parquet file and gather the summary.
 *
 * Refused, with the unit and the shard folder named: a unit no finished part holds (a missing or
 * unfinished shard), a unit two parts hold (the same shard copied twice, or shards of two
 * layouts that overlap), a shard made from other inputs (its SHA-256s differ) or by another
 * version, and a part file whose bytes no longer match its manifest.
 *
 * The combined file has one row group per `groupUnits` units, aligned to the plan's unit numbers,
 * whatever the shards were: a sweep run as 1 shard and as 4 merges to the same bytes.
 */
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { InputError } from '../../engine/errors';
import { TOOL } from '../cli/common';
import { readResults, ResultsFile, RowBuffer, resultsMeta } from './parquet';
import type { HouseholdPoint, SweepPlan } from './plan';
import { describeUnit, EFFECTS, expand } from './plan';
import type { Manifest } from './run';
import { changedInputs, readManifest } from './run';
import type { SummaryRow } from './summary';
import { SweepSummary } from './summary';

export interface FoundShard {
  folder: string;
  manifest: Manifest;
}

/** Every shard manifest in `dir` (the folder itself, or its sub-folders one level down), sorted by folder. */
export function findShards(dir: string): FoundShard[] {
  if (!existsSync(dir) || !statSync(dir).isDirectory()) throw new InputError('missing-folder', `'${dir}' is not a folder of sweep shards`, { file: dir }, 'Give the --out folder of the sweep shards');
  const out: FoundShard[] = [];
  if (existsSync(join(dir, 'manifest.json'))) out.push({ folder: dir, manifest: readManifest(join(dir, 'manifest.json')) });
  for (const name of readdirSync(dir).sort()) {
    const p = join(dir, name, 'manifest.json');
    if (existsSync(p)) out.push({ folder: join(dir, name), manifest: readManifest(p) });
  }
  if (!out.length) throw new InputError('no-shards', `no shard manifest (manifest.json) in '${dir}' or its folders`, { file: dir }, 'Run `ripplewise sweep PLAN --out DIR` for each shard first');
  return out;
}

/** The plan's expansion as the manifest records it (for naming units in messages). */
function planOf(m: Manifest): ReturnType<typeof expand> {
  const household: HouseholdPoint[] = m.plan.household.map((h) => (h === 'off' || h === 'table' ? h : Number(h)));
  const plan: SweepPlan = {
    name: m.plan.name,
    seed: m.plan.seed,
    draws: m.plan.draws,
    tables: m.tables.map((t) => ({ name: t.name, file: '' })),
    scenarios: [],
    household,
    cv: m.plan.cv,
    effects: m.plan.effects.filter((e): e is (typeof EFFECTS)[number] => (EFFECTS as readonly string[]).includes(e)),
    productivity: 'column-sums',
    rowsPerGroup: 1,
  };
  return expand(plan, m.scenarios.map((name) => ({ set: 0, name })));
}

export interface MergeCheck {
  shards: FoundShard[];
  first: Manifest;
  units: number;
  /** Parts in unit order, with their shard folder. */
  parts: { folder: string; part: Manifest['parts'][number] }[];
  rejected: { unit: number; reason: string }[];
}

function list(items: string[], max = 5): string {
  return items.length > max ? `${items.slice(0, max).join('; ')}; and ${items.length - max} more` : items.join('; ');
}

/** Check the shards: one plan, one set of inputs, one version, every unit exactly once. */
export function checkShards(dir: string): MergeCheck {
  const shards = findShards(dir);
  const first = shards[0]!.manifest;
  const name = (f: FoundShard) => relative(dir, f.folder) || '.';
  for (const s of shards.slice(1)) {
    const m = s.manifest;
    if (m.plan.sha256 !== first.plan.sha256 || m.inputsDigest !== first.inputsDigest) {
      const changed = changedInputs(first.inputs, m.inputs);
      throw new InputError(
        'different-inputs',
        `shard ${name(s)} (units ${m.units.start} to ${m.units.end - 1}) was made from other inputs than shard ${name(shards[0]!)}: ${changed.join(', ') || 'the plan'} differ${changed.length === 1 ? 's' : ''} (SHA-256)`,
        { file: join(s.folder, 'manifest.json') },
        'Run that shard again from the same plan and files, into its own folder',
      );
    }
    if (m.tool.version !== first.tool.version) {
      throw new InputError('different-version', `shard ${name(s)} was made by Ripplewise ${m.tool.version}, shard ${name(shards[0]!)} by ${first.tool.version}; results of two versions are not merged`, { file: join(s.folder, 'manifest.json') }, 'Run every shard with one version');
    }
    if (m.groupUnits !== first.groupUnits) throw new InputError('different-layout', `shard ${name(s)} groups ${m.groupUnits} units per row group, shard ${name(shards[0]!)} ${first.groupUnits}`, { file: join(s.folder, 'manifest.json') });
  }
  const U = first.plan.units;
  const owner = new Int32Array(U).fill(-1);
  const doubled: string[] = [];
  const parts: MergeCheck['parts'] = [];
  const e = planOf(first);
  shards.forEach((s, k) => {
    for (const p of s.manifest.parts) {
      parts.push({ folder: s.folder, part: p });
      for (let u = p.start; u < p.end; u++) {
        if (owner[u]! >= 0) doubled.push(`${describeUnit(e, e.unit(u))} is in ${name(shards[owner[u]!]!)} and in ${name(s)}`);
        else owner[u] = k;
      }
    }
  });
  if (doubled.length) throw new InputError('doubled-unit', `${doubled.length} unit${doubled.length === 1 ? ' is' : 's are'} in more than one shard: ${list(doubled)}`, { file: dir }, 'Keep one copy of each shard folder');
  const missing: string[] = [];
  for (let u = 0; u < U; u++) {
    if (owner[u] === -1) {
      const holder = shards.find((s) => s.manifest.units.start <= u && u < s.manifest.units.end);
      missing.push(`${describeUnit(e, e.unit(u))}${holder ? ` (shard ${name(holder)} has not finished it)` : ' (no shard in the folder holds it)'}`);
    }
  }
  if (missing.length) throw new InputError('missing-unit', `${missing.length} of ${U} units are missing: ${list(missing)}`, { file: dir }, 'Run the missing or unfinished shards (a shard run again finishes only what it had not)');
  parts.sort((a, b) => a.part.start - b.part.start);
  for (const { folder, part } of parts) {
    const path = join(folder, part.file);
    if (!existsSync(path)) throw new InputError('missing-part', `${path}: the manifest lists this part, but the file is not there`, { file: path }, 'Run the shard again');
    const bytes = readFileSync(path);
    const sha = createHash('sha256').update(bytes).digest('hex');
    if (sha !== part.sha256) throw new InputError('changed-part', `${path}: the file's SHA-256 differs from the manifest's (units ${part.start} to ${part.end - 1}); it was changed after it was written`, { file: path }, 'Delete the shard folder and run the shard again');
    const meta = resultsMeta(path);
    if (meta['ripplewise.inputs'] !== first.inputsDigest) throw new InputError('different-inputs', `${path}: this part was made from other inputs than its manifest states`, { file: path }, 'Delete the shard folder and run the shard again');
  }
  return { shards, first, units: U, parts, rejected: parts.flatMap((p) => p.part.rejected) };
}

export interface MergeResult {
  check: MergeCheck;
  rows: number;
  groups: number;
  bytes: number;
  summary: SummaryRow[];
}

/** Merge checked shards into one Parquet file at `out`. */
export async function mergeShards(check: MergeCheck, out: string): Promise<MergeResult> {
  const { first } = check;
  const G = first.groupUnits;
  const rf = new ResultsFile(out, { 'ripplewise.plan.sha256': first.plan.sha256, 'ripplewise.inputs': first.inputsDigest, 'ripplewise.tool': `${TOOL.name} ${first.tool.version}`, 'ripplewise.units': String(first.plan.units) }, `${TOOL.name} ${first.tool.version}`);
  const summary = new SweepSummary();
  let pending = new RowBuffer();
  let pendingGroup = -1;
  try {
    for (const { folder, part } of check.parts) {
      for await (const b of readResults(join(folder, part.file))) {
      summary.add(b);
      // Regroup by the plan's group boundaries.
      let r = 0;
      while (r < b.length) {
        const g = Math.floor(b.work_unit[r]! / G);
        let e = r;
        while (e < b.length && Math.floor(b.work_unit[e]! / G) === g) e++;
        if (g !== pendingGroup && pending.length) {
          rf.writeGroup(pending);
          pending = new RowBuffer();
        }
        pendingGroup = g;
        // A part's row group that is a whole plan group (the usual case) is taken as it is.
        if (!pending.length && r === 0 && e === b.length) pending = b;
        else pending.append(b, r, e);
        r = e;
      }
      }
    }
    rf.writeGroup(pending);
    rf.close();
  } catch (err) {
    rf.abandon();
    throw err;
  }
  return { check, rows: rf.rows, groups: rf.groups, bytes: statSync(out).size, summary: summary.finish() };
}
