/** `ripplewise aggregate`: its options and help, declared without loading the command (../commands/aggregate.ts runs it). */
import type { Command } from 'commander';
import { AGGREGATE_ABOUT } from '../../../engine/aggregate';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/aggregate';

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json', 'html'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('aggregate')
    .summary('Aggregate sectors into groups with a concordance')
    .argument('<table>', "the detailed table ('-' for standard input)")
    .description(AGGREGATE_ABOUT)
    .requiredOption('-c, --concordance <file>', 'the concordance: a sheet (code, group, optional group label) or JSON')
    .option('--concordance-sheet <name>', 'the sheet of a concordance workbook');
  tableOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise aggregate detailed.csv --concordance groups.csv --out aggregated.csv', 'sum sectors into groups'],
    ['ripplewise aggregate detailed.xlsx --concordance map.json --out small.xlsx', 'a JSON concordance'],
    ['ripplewise aggregate detailed.csv --concordance groups.csv --json', 'the groups and totals as JSON'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/aggregate')).action(ctx, table, f), !!f.json));
}
