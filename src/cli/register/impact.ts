/** `ripplewise impact`: its options and help, declared without loading the command (../commands/impact.ts runs it). */
import type { Command } from 'commander';
import { IMPACT_ABOUT } from '../../../engine/impact';
import type { Action } from '../main';
import { collect, examples, outputOptions, tableOptions, modelOptions } from '../options';
import type { Flags } from '../commands/impact';

export const FORMATS = ['html', 'xlsx', 'json', 'csv'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('impact')
    .summary('Scenario impacts: direct, indirect and induced, by sector and measure')
    .argument('<table>', "the table: .json, .csv, .tsv or .xlsx ('-' for standard input)")
    .description(IMPACT_ABOUT)
    .requiredOption('-s, --scenario <file>', 'the scenario file (JSON: one scenario, or a ripplewise-scenarios document with several)')
    .option('-n, --name <name>', 'only the scenario of this name (repeatable; default: every scenario in the file)', collect);
  tableOptions(cmd);
  modelOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise impact table.csv --scenario plant.json --out report.html', 'a self-contained HTML report'],
    ['ripplewise impact table.csv --scenario plant.json --out report.xlsx --out report.json', 'a workbook and the JSON'],
    ['ripplewise impact table.csv --scenario all.json --name "New plant" --json', 'one scenario, as JSON'],
    ['ripplewise impact table.csv --scenario plant.json --no-household', 'Type I only: no induced effects'],
    ['ripplewise impact table.csv --scenario plant.json --out report.html --locale de-DE', 'numbers in German notation'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/impact')).action(ctx, table, f), !!f.json));
}
