/** `ripplewise balance`: its options and help, declared without loading the command (../commands/balance.ts runs it). */
import type { Command } from 'commander';
import { GRAS_ABOUT, RAS_ABOUT } from '../../../engine/regional/index';
import type { Action } from '../main';
import { collect, examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/balance';

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json', 'html'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('balance')
    .summary('Scale a table to new row and column totals by RAS, or GRAS for tables with negative entries')
    .argument('<table>', "the table to update ('-' for standard input)")
    .description(`${RAS_ABOUT} ${GRAS_ABOUT}`)
    .requiredOption('--row-totals <file>', 'the new row totals: a code column, optionally labels, then the totals')
    .requiredOption('--column-totals <file>', 'the new column totals, in the same layout')
    .option('--row-totals-column <name>', 'the column of the row-totals file to use (default: the first column of numbers)')
    .option('--column-totals-column <name>', 'the column of the column-totals file to use (default: the first column of numbers)')
    .option('-m, --method <method>', 'ras|gras (default: ras, or gras when the part has negative entries)')
    .option('--part <part>', 'intermediate: the flows between sectors; whole: sectors and primary-input rows by sectors and final-demand columns', 'intermediate')
    .option('--fix <row:column>', 'hold a cell at its value, by row and column code (repeatable)', collect)
    .option('--tolerance <number>', 'stop when every row and column sum is within this relative deviation of its target (default 1e-10)')
    .option('--max-iterations <n>', 'at most this many iterations (default 10000)')
    .option('--write <what>', 'matrix: the balanced part only; table: the whole table with the balanced part in place (whole part: total output from the new row sums; intermediate part: final demand, value added and total output as they were, so the checks say where sums no longer add up)', 'matrix');
  tableOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise balance old.csv --row-totals sales.csv --column-totals purchases.csv --out new.csv', 'RAS update of the flows between sectors'],
    ['ripplewise balance use.xlsx --part whole --method gras --row-totals rows.csv --column-totals cols.csv --out balanced.xlsx', 'GRAS with taxes less subsidies'],
    ['ripplewise balance old.csv --row-totals r.csv --column-totals c.csv --fix AGR:FOOD --json', 'one cell held fixed; the result as JSON'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/balance')).action(ctx, table, f), !!f.json));
}
