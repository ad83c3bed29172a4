/**
 * `ripplewise sweep PLAN --out DIR`: run one shard of a sweep plan (src/sweep);
 * `ripplewise sweep merge DIR --out FILE.parquet`: check and combine the shards, with a summary report;
 * `ripplewise sweep template slurm|kubernetes|parallel|dockerfile`: print a scheduler template.
 */
import { basename, dirname, extname, join } from 'node:path';
import { writeReport } from '../../report/write';
import { buildReport, setting, textSection } from '../../report/model';
import { checkShards, mergeShards } from '../../sweep/merge';
import { loadSweep, runShard } from '../../sweep/run';
import { chooseShard, ShardError, shardRange } from '../../sweep/shard';
import { summarySection } from '../../sweep/summary';
import type { TemplateKind } from '../../sweep/templates/index';
import { template, TEMPLATE_KINDS } from '../../sweep/templates/index';
import { localeOf, numberOption, reportBase, TOOL } from '../common';
import type { CliContext } from '../context';
import { absolute } from '../context';
import { UsageError } from '../errors';
import type { OutputFormat } from '../files';
import { outputFormat, writeOutput } from '../files';
import { jsonText } from '../output';
import { progress } from '../progress';
import { CAUTION_LINE } from '../text';

export interface RunFlags {
  out?: string;
  shard?: string;
  shards?: string;
  json?: boolean;
}

export interface MergeFlags {
  out?: string;
  report?: string[];
  locale?: string;
  json?: boolean;
}

export interface TemplateFlags {
  plan?: string;
  out?: string;
  merged?: string;
  shards?: string;
  program?: string;
  image?: string;
  jobs?: string;
}

const REPORT_FORMATS: readonly OutputFormat[] = ['html', 'xlsx', 'json'];

function shard(ctx: CliContext, f: RunFlags) {
  try {
    return chooseShard(f, ctx.env);
  } catch (e) {
    if (e instanceof ShardError) throw new UsageError(e.message, 'bad-shard', e.hint);
    throw e;
  }
}

export async function runAction(ctx: CliContext, planName: string, f: RunFlags): Promise<number> {
  if (!f.out) throw new UsageError('sweep needs --out DIR: the folder the shards write to', 'missing-option');
  const choice = shard(ctx, f);
  const s = await loadSweep(ctx, planName);
  const bar = await progress(ctx, `sweep shard ${choice.index + 1}/${choice.count}`, 1, f);
  const started = Date.now();
  let r;
  try {
    r = await runShard(s, absolute(ctx, f.out), choice, { onPart: (d, t) => bar.update(d, t) });
  } finally {
    bar.stop();
  }
  const m = r.manifest;
  const rows = m.parts.reduce((a, p) => a + p.rows, 0);
  const rejected = m.parts.reduce((a, p) => a + p.rejected.length, 0);
  const seconds = (Date.now() - started) / 1000;
  if (f.json) {
    ctx.stdout.write(jsonText({ folder: r.folder, shard: m.shard, units: m.units, planUnits: m.plan.units, computed: r.computed, kept: r.kept, parts: m.parts.length, rows, rejected, complete: m.complete, seconds }));
  } else {
    const { start, end } = shardRange(m.plan.units, choice.index, choice.count);
    ctx.stdout.write(
      `shard ${choice.index + 1} of ${choice.count} (${choice.source === 'default' ? 'the whole plan' : `from ${choice.source === 'option' ? '--shard' : choice.source === 'slurm' ? 'the Slurm array' : 'the Kubernetes index'}`}): units ${start} to ${end - 1} of ${m.plan.units}\n` +
        `  ${r.computed} computed, ${r.kept} kept from an earlier run, ${rejected} left out; ${rows} rows in ${m.parts.length} part files (${seconds.toFixed(1)} s)\n` +
        `  ${r.folder}\n`,
    );
  }
  return 0;
}

export async function mergeAction(ctx: CliContext, dir: string, f: MergeFlags): Promise<number> {
  if (!f.out) throw new UsageError('sweep merge needs --out FILE.parquet', 'missing-option');
  if (extname(f.out).toLowerCase() !== '.parquet') throw new UsageError(`--out '${f.out}' must end in .parquet`, 'bad-format');
  const out = absolute(ctx, f.out);
  const reports = (f.report ?? [join(dirname(f.out), `${basename(f.out, extname(f.out))}.html`), join(dirname(f.out), `${basename(f.out, extname(f.out))}.xlsx`)]).map((r) => ({ out: r, format: outputFormat(r, undefined, REPORT_FORMATS) }));
  const locale = localeOf(f);
  const check = checkShards(absolute(ctx, dir));
  const result = await mergeShards(check, out);
  const m = check.first;
  const report = buildReport({
    ...reportBase(ctx, { locale }),
    title: `Sweep: ${m.plan.name}`,
    subtitle: `${m.plan.units} units from ${m.tables.length} table${m.tables.length === 1 ? '' : 's'} and ${m.scenarios.length} scenario${m.scenarios.length === 1 ? '' : 's'}`,
    tableSummary: m.tables[0]!.summary,
    inputs: m.inputs.map((i) => ({ role: i.role, name: i.name, sha256: i.sha256 })),
    settings: [
      setting('units', 'Units', m.plan.units, 'given'),
      setting('seed', 'Seed', m.plan.seed, 'given'),
      setting('draws', 'Draws per coefficient of variation above 0', m.plan.draws, 'given'),
      setting('cv', 'Coefficients of variation', m.plan.cv.join(', '), 'given'),
      setting('household', 'Household closure settings', m.plan.household.join(', '), 'given'),
      setting('tables', 'Tables', m.tables.map((t) => `${t.name} (${t.sectors} sectors)`).join('; '), 'given'),
      setting('shards', 'Shards merged', check.shards.length, 'given', 'The results do not depend on it'),
    ],
    assumptions: [
      'Every unit is an impact of the Leontief model (Type II where the household closure is on): fixed coefficients and no capacity limits.',
      'Draws perturb every technical coefficient by independent multiplicative log-normal noise with mean 1; a draw that breaks productivity is left out.',
    ],
    sections: [
      summarySection(result.summary, { units: m.plan.units, rejected: check.rejected.length, shards: check.shards.length }),
      ...(check.rejected.length ? [textSection('sweep-rejected', 'Units left out', 'Units whose drawn coefficients broke productivity or made the model singular.', check.rejected.slice(0, 200).map((r) => r.reason), 'Sweep')] : []),
    ],
    notes: m.tables.length > 1 ? [`The table description is of the first table, '${m.tables[0]!.name}'; the sweep has ${m.tables.map((t) => `'${t.name}'`).join(', ')}.`] : [],
  });
  const written: { file: string; bytes: number }[] = [{ file: f.out, bytes: result.bytes }];
  for (const r of reports) {
    const data = await writeReport(report, r.format as 'html' | 'xlsx' | 'json', { locale });
    const w = await writeOutput(ctx, r.out, data, r.format);
    written.push({ file: w.name, bytes: w.bytes });
  }
  if (f.json) {
    ctx.stdout.write(jsonText({ units: check.units, shards: check.shards.length, rows: result.rows, rowGroups: result.groups, rejected: check.rejected, written, summary: result.summary }));
  } else {
    ctx.stdout.write(`${check.units} units from ${check.shards.length} shard${check.shards.length === 1 ? '' : 's'}: ${result.rows} rows in ${result.groups} row groups, ${check.rejected.length} units left out\n${written.map((w) => `  wrote ${w.file} (${w.bytes} bytes)`).join('\n')}\n${CAUTION_LINE}\n`);
  }
  return 0;
}

export async function templateAction(ctx: CliContext, kind: string, f: TemplateFlags): Promise<number> {
  if (!(TEMPLATE_KINDS as readonly string[]).includes(kind)) throw new UsageError(`there is no template '${kind}'; choose one of ${TEMPLATE_KINDS.join(', ')}`, 'bad-template');
  const shards = numberOption(f.shards ?? '4', '--shards', { min: 1, max: 100_000, integer: true })!;
  const jobs = numberOption(f.jobs, '--jobs', { min: 1, integer: true });
  const out = f.out ?? 'results';
  const program = (f.program ?? 'ripplewise').trim().split(/\s+/).filter(Boolean);
  if (!program.length) throw new UsageError('--program must name a command', 'bad-program');
  ctx.stdout.write(
    template(kind as TemplateKind, {
      plan: f.plan ?? 'plan.json',
      out,
      merged: f.merged ?? `${out.replace(/\/+$/, '')}.parquet`,
      shards,
      program,
      image: f.image ?? `ripplewise:${TOOL.version}`,
      ...(jobs !== undefined ? { jobs } : {}),
      toolVersion: TOOL.version,
    }),
  );
  return 0;
}
