/** `ripplewise extract`: its options and help, declared without loading the command (../commands/extract.ts runs it). */
import type { Command } from 'commander';
import { EXTRACTION_ABOUT } from '../../../engine/extraction';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/extract';

export const FORMATS = ['json', 'html', 'xlsx', 'csv'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('extract')
    .summary('Hypothetical extraction of a sector, a group or each sector')
    .argument('<table>', "the table ('-' for standard input)")
    .description(`${EXTRACTION_ABOUT} Without --sector, every sector is extracted in turn and ranked.`)
    .option('--sector <codes>', 'the sector or group to extract, comma-separated codes');
  tableOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise extract table.csv', 'every sector in turn, ranked by the output lost'],
    ['ripplewise extract table.csv --sector FISH,FOOD', 'extract a group'],
    ['ripplewise extract table.csv --sector MINE --out mine.html', 'a report'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/extract')).action(ctx, table, f), !!f.json));
}
