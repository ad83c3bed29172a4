/** `ripplewise check`: its options and help, declared without loading the command (../commands/check.ts runs it). */
import type { Command } from 'commander';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/check';

export const CHECK_ABOUT = 'The checks of a table: balances of rows and columns, productivity (Hawkins–Simon), singularity and conditioning of I − A.';

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p.command('check')
    .summary('Check a table: balances, productivity, singularity, conditioning').argument('<table>', "the table: .json, .csv, .tsv or .xlsx ('-' for standard input)").description(`${CHECK_ABOUT} Exit code 1 when a check fails.`);
  tableOptions(cmd);
  cmd.option('--balance-tolerance <ratio>', 'relative tolerance of the row and column balances (default 1e-4)');
  cmd.option('--condition-limit <number>', 'warn when the condition estimate of I − A is above this (default 1e10)');
  outputOptions(cmd, ['json', 'html', 'xlsx', 'csv'], { locale: true });
  examples(cmd, [
    ['ripplewise check table.csv', 'print the findings; exit 1 when a check fails'],
    ['ripplewise check table.xlsx --sheet IO --json', 'the findings as JSON'],
    ['ripplewise check - --input-format csv < table.csv', 'read standard input'],
    ['ripplewise check table.csv --out checks.html', 'a report of the checks'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/check')).action(ctx, table, f), !!f.json));
}
