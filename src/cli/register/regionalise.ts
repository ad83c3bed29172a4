/** `ripplewise regionalise`: its options and help, declared without loading the command (../commands/regionalise.ts runs it). */
import type { Command } from 'commander';
import { REGIONAL_CAUTIONS, REGIONALISE_ABOUT } from '../../../engine/regional/index';
import type { Action } from '../main';
import { examples, outputOptions, regionalOptions, tableOptions } from '../options';
import type { Flags } from '../commands/regionalise';

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json', 'html'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('regionalise')
    .alias('regionalize')
    .summary("Estimate a region's table from the national one by location quotients or the supply-demand pool")
    .argument('<national>', "the national table ('-' for standard input)")
    .description(`${REGIONALISE_ABOUT} ${REGIONAL_CAUTIONS[0]}`)
    .requiredOption('-r, --regional <file>', "the regional file: a code column, optionally labels, then the region's values by sector (and the nation's, if the table has none), under a header such as 'Region (jobs)'")
    .option('--two-region', 'also build the two-region model (the region and the rest of the nation) and split each sector’s output multiplier into intraregional, feedback and spillover');
  regionalOptions(cmd);
  tableOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise regionalise national.csv --regional county-jobs.csv --method flq --out county.csv', 'FLQ with δ = 0.3'],
    ['ripplewise regionalise national.xlsx --regional jobs.xlsx --method slq --out report.html', 'a report with quotients and multipliers side by side'],
    ['ripplewise regionalise national.csv --regional jobs.csv --method aflq --delta 0.25 --json', 'AFLQ, the result as JSON'],
    ['ripplewise regionalise national.csv --regional output.csv --basis output --method sdp --two-region --out report.html', 'supply-demand pool on output, two regions'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/regionalise')).action(ctx, table, f), !!f.json));
}
