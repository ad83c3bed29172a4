/** `ripplewise uncertainty`: its options and help, declared without loading the command (../commands/uncertainty.ts runs it). */
import type { Command } from 'commander';
import { UNCERTAINTY_ABOUT } from '../../../engine/uncertainty';
import type { Action } from '../main';
import { collect, examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/uncertainty';

export const FORMATS = ['html', 'xlsx', 'json', 'csv'] as const;

export const MAX_WORKERS = 16;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('uncertainty')
    .summary('Monte Carlo on the coefficients: percentiles of multipliers and scenario impacts')
    .argument('<table>', "the table: .json, .csv, .tsv or .xlsx ('-' for standard input)")
    .description(`${UNCERTAINTY_ABOUT} Every technical coefficient gets independent multiplicative log-normal noise with mean 1 and the coefficient of variation given; draws that make the economy unproductive are counted and left out. The open model (direct and indirect effects).`)
    .option('--cv <ratio>', 'coefficient of variation of every coefficient, as a ratio (0.1 is 10 %; default 0.1)')
    .option('--draws <n>', 'number of draws (default 1000)')
    .option('--seed <n>', 'the seed: the same seed gives the same draws (default 1)')
    .option('--workers <n>', `worker threads to share the draws (1 runs them in this process; default: one per core, at most ${MAX_WORKERS})`)
    .option('--productivity <rule>', 'what rejects a draw: column-sums (a column of A summing to 1 or more; the default) or perron (a Perron root of 1 or more)')
    .option('-s, --scenario <file>', 'a scenario file: the spread of each scenario\'s totals too')
    .option('-n, --name <name>', 'only the scenario of this name (repeatable)', collect)
    .option('--jobs <code>', 'the satellite row that counts jobs (default: guessed from its label or unit)')
    .option('--satellites <codes>', 'satellite rows to count as measures, comma-separated (default: all)')
    .option('--value-added-rows <codes>', 'value-added rows summed as value added, comma-separated (default: all)')
    .option('--measure <codes>', 'only these measures, comma-separated codes such as output,value-added,JOBS');
  tableOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise uncertainty table.csv', 'output multipliers with 10 % noise, 1,000 draws'],
    ['ripplewise uncertainty table.csv --cv 0.2 --draws 5000 --workers 2 --out spread.html', 'a report with percentile bands'],
    ['ripplewise uncertainty table.csv --scenario plant.json --measure output,JOBS --json', "a scenario's totals, as JSON"],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/uncertainty')).action(ctx, table, f), !!f.json));
}
