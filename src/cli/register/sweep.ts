/** `ripplewise sweep`: its options and help, declared without loading the command (../commands/sweep.ts runs it). */
import type { Command } from 'commander';
import { TEMPLATE_KINDS } from '../../sweep/templates/index';
import type { Action } from '../main';
import { examples, TOOL } from '../options';
import type { MergeFlags, RunFlags, TemplateFlags } from '../commands/sweep';

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
  cmd.action((plan: string, f: RunFlags) => run(async (ctx) => (await import('../commands/sweep')).runAction(ctx, plan, f), !!f.json));

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
    run(async (ctx) => (await import('../commands/sweep')).mergeAction(ctx, dir, f), !!f.json);
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
    run(async (ctx) => (await import('../commands/sweep')).templateAction(ctx, kind, f), false);
  });
}
