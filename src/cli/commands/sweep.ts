/**
 * `ripplewise sweep PLAN --out DIR`: run one shard of a sweep plan (src/sweep);
 * `ripplewise sweep merge DIR --out FILE.parquet`: check and combine the shards, with a summary report;
 * `ripplewise sweep template slurm|kubernetes|parallel|dockerfile`: print a scheduler template.
 */
import { basename, dirname, extname, join } from 'node:path';
import type { Command } from 'commander';
import { writeReport } from '../../report/write';
import { buildReport, setting, textSection } from '../../report/model';
import { checkShards, mergeShards } from '../../sweep/merge';
import { loadSweep, runShard } from '../../sweep/run';
import { chooseShard, ShardError, shardRange } from '../../sweep/shard';
import { summarySection } from '../../sweep/summary';
import type { TemplateKind } from '../../sweep/templates/index';
import { template, TEMPLATE_KINDS } from '../../sweep/templates/index';
import { examples, localeOf, numberOption, reportBase, TOOL } from '../common';
import type { CliContext } from '../context';
import { absolute } from '../context';
import { UsageError } from '../errors';
import type { OutputFormat } from '../files';
import { outputFormat, writeOutput } from '../files';
import type { Action } from '../main';
import { jsonText } from '../output';
import { progress } from '../progress';
import { CAUTION_LINE } from '../text';

interface RunFlags {
  out?: string;
  shard?: string;
  shards?: string;
  json?: boolean;
}

interface MergeFlags {
  out?: string;
  report?: string[];
  locale?: string;
  json?: boolean;
}

interface TemplateFlags {
  plan?: string;
  out?: string;
  merged?: string;
  shards?: string;
  program?: string;
  image?: string;
  jobs?: string;
}

const REPORT_FORMATS: readonly OutputFormat[] = ['html', 'xlsx', 'json'];

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('sweep')
    .summary('Sweeps: tables × scenarios × parameters × draws, in shards for Slurm, Kubernetes or GNU parallel')
    .description(
      'Run the units of one shard of a sweep plan (a ripplewise-sweep file: tables, scenario files, a grid of closure shares and coefficient cvs, Monte Carlo draws with a seed) and write them as Parquet with a manifest. Each unit depends only on its inputs, the plan seed and its draw number, so the results do not depend on the number of shards. Run again, a shard redoes only its unfinished units.',
    )
    .argument('<plan>', 'the sweep plan (JSON, format ripplewise-sweep)')
    .option('-o, --out <dir>', 'the folder the shards write to (each shard in its own sub-folder)')
    .option('--shard <I/N>', 'run shard I of N (I from 1); default: from SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT, or JOB_COMPLETION_INDEX with --shards, else the whole plan')
    .option('--shards <n>', 'the number of shards, for a Kubernetes Indexed Job (JOB_COMPLETION_INDEX gives the shard)')
    .option('--json', 'print what the shard did as JSON on standard output');
  examples(cmd, [
    ['ripplewise sweep plan.json --out results --shard 1/4', 'shard 1 of 4'],
    ['ripplewise sweep plan.json --out results', 'the whole plan, or the shard of a Slurm array task'],
    ['ripplewise sweep merge results --out results.parquet', 'combine the shards, with results.html and results.xlsx'],
    ['ripplewise sweep template slurm --plan plan.json --shards 8', 'a Slurm job array script'],
  ]);
  cmd.action((plan: string, f: RunFlags) => run((ctx) => runAction(ctx, plan, f), !!f.json));

  const merge = cmd
    .command('merge')
    .summary('Check the shards and combine them into one Parquet file, with a summary report')
    .description(
      'Check that every unit of the plan is in the folder exactly once, made from the same plan, inputs (SHA-256) and version, then write the combined Parquet file (one row per unit × sector × measure × effect) and a summary report with the percentiles across the draws.',
    )
    .argument('<dir>', 'the folder the shards wrote to')
    .option('-o, --out <file>', 'the combined Parquet file (.parquet)')
    .option('--report <file>', 'a summary report: .html, .xlsx or .json (repeatable; default: the --out name with .html and .xlsx)', (v: string, prev: string[] | undefined) => [...(prev ?? []), v])
    .option('--locale <tag>', 'locale of the numbers shown in the HTML report, such as en-GB or de-DE (default en)')
    .option('--json', 'print the merge as JSON on standard output');
  // The parent's --out and --json are read where the subcommand's are (optsWithGlobals): commander
  // gives an option the parent knows to the parent, wherever it stands.
  merge.action((dir: string, _f: MergeFlags, c: Command) => {
    const f = c.optsWithGlobals<MergeFlags>();
    run((ctx) => mergeAction(ctx, dir, f), !!f.json);
  });

  const tpl = cmd
    .command('template')
    .summary('Print a Slurm, Kubernetes, GNU parallel or Dockerfile template for a plan')
    .argument('<kind>', TEMPLATE_KINDS.join('|'))
    .option('--plan <file>', 'the plan as the jobs see it (default plan.json)')
    .option('--out <dir>', 'the shards\' folder (default results)')
    .option('--merged <file>', 'the combined Parquet file (default: the folder name with .parquet)')
    .option('--shards <n>', 'the number of shards (default 4)')
    .option('--program <command>', "the command that runs Ripplewise where the jobs run (default 'ripplewise')")
    .option('--image <name>', `the container image (default ripplewise:${TOOL.version})`)
    .option('--jobs <n>', 'GNU parallel: shards at a time (default: all)');
  tpl.action((kind: string, _f: TemplateFlags, c: Command) => {
    const f = c.optsWithGlobals<TemplateFlags>();
    run((ctx) => templateAction(ctx, kind, f), false);
  });
}

function shard(ctx: CliContext, f: RunFlags) {
  try {
    return chooseShard(f, ctx.env);
  } catch (e) {
    if (e instanceof ShardError) throw new UsageError(e.message, 'bad-shard', e.hint);
    throw e;
  }
}

async function runAction(ctx: CliContext, planName: string, f: RunFlags): Promise<number> {
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

async function mergeAction(ctx: CliContext, dir: string, f: MergeFlags): Promise<number> {
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

async function templateAction(ctx: CliContext, kind: string, f: TemplateFlags): Promise<number> {
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
