/** `ripplewise multipliers`: its options and help, declared without loading the command (../commands/multipliers.ts runs it). */
import type { Command } from 'commander';
import { MULTIPLIERS_ABOUT } from '../../../engine/multipliers';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions, modelOptions } from '../options';
import type { Flags } from '../commands/multipliers';

export const FORMATS = ['json', 'html', 'xlsx', 'csv'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('multipliers')
    .summary('Multipliers of every measure, simple and total, Type I and II')
    .argument('<table>', "the table: .json, .csv, .tsv or .xlsx ('-' for standard input)")
    .description(`${MULTIPLIERS_ABOUT} Type I = simple ÷ direct; Type II = total ÷ direct (closed for households).`);
  tableOptions(cmd);
  modelOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise multipliers table.csv', 'a table of multipliers per measure'],
    ['ripplewise multipliers table.xlsx --sheet IO --json', 'per-sector multipliers of each measure as JSON'],
    ['ripplewise multipliers table.csv --household-column HHC --labour-income-row COE', 'choose the Type II closure'],
    ['ripplewise multipliers table.csv --no-household --measure output,JOBS', 'Type I only, two measures'],
    ['ripplewise multipliers table.xlsx --household-income 143398', 'Type II with spending divided by a household income not in the table'],
    ['ripplewise multipliers table.csv --household-basis consumption-total', "Type II with spending divided by the consumption column's own total"],
    ['ripplewise multipliers table.csv --split rounds', 'the indirect effect as first round and later rounds'],
    ['ripplewise multipliers table.csv --out multipliers.xlsx', 'a workbook of the multipliers'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/multipliers')).action(ctx, table, f), !!f.json));
}
