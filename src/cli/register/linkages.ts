/** `ripplewise linkages`: its options and help, declared without loading the command (../commands/linkages.ts runs it). */
import type { Command } from 'commander';
import { LINKAGES_ABOUT } from '../../../engine/linkages';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/linkages';

export const FORMATS = ['json', 'html', 'xlsx', 'csv'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p.command('linkages')
    .summary('Backward and forward linkages and key sectors').argument('<table>', "the table ('-' for standard input)").description(LINKAGES_ABOUT);
  tableOptions(cmd);
  cmd.option('--no-variation', 'skip the coefficients of variation (they need the whole Leontief inverse)');
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise linkages table.csv', 'indices and key-sector groups'],
    ['ripplewise linkages table.csv --out linkages.html', 'a report with the key-sector quadrant'],
    ['ripplewise linkages table.csv --json', 'as JSON'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/linkages')).action(ctx, table, f), !!f.json));
}
