/** `ripplewise report`: its options and help, declared without loading the command (../commands/report.ts runs it). */
import type { Command } from 'commander';
import type { Action } from '../main';
import { collect, examples, outputOptions, regionalOptions, tableOptions, modelOptions } from '../options';
import type { Flags } from '../commands/report';

export const FORMATS = ['html', 'xlsx', 'json', 'csv'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('report')
    .summary('The whole report: checks, multipliers, linkages, tornado, scenarios')
    .argument('<table>', "the table ('-' for standard input)")
    .description('The whole report of a table: checks, multipliers of every measure, linkages and key sectors, the sensitivity tornado and, with --scenario, each scenario\'s impact.')
    .option('-s, --scenario <file>', 'scenarios to report (JSON)')
    .option('-n, --name <name>', 'only the scenario of this name (repeatable)', collect)
    .option('--title <text>', 'the report title')
    .option('--no-tornado', 'leave out the sensitivity tornado')
    .option('--tornado-sector <code>', "the tornado's result: the output multiplier of this sector (default: the first scenario's total output, else the largest output multiplier)")
    .option('--tornado-top <n>', 'coefficients in the tornado (default 10)')
    .option('--tornado-percent <p>', 'the swing of each coefficient, in percent (default 10)')
    .option('-r, --regional <file>', "add the regional table estimated from this file (a code column, optionally labels, then the region's values by sector) by --method: quotients and the national and regional multipliers side by side");
  regionalOptions(cmd);
  tableOptions(cmd);
  modelOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise report table.csv --out report.html', 'checks, multipliers, linkages and the tornado'],
    ['ripplewise report table.csv --scenario s.json --out r.html --out r.xlsx --out r.json', 'three formats at once'],
    ['ripplewise report table.csv --scenario s.json --name "New plant" --out r.html', 'one scenario'],
    ['ripplewise report table.csv --tornado-sector FOOD --tornado-percent 20 --out r.html', 'the tornado of one multiplier'],
    ['ripplewise report national.csv --regional county-jobs.csv --method flq --out r.html', 'with the regional table (FLQ, δ = 0.3) beside the national one'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/report')).action(ctx, table, f), !!f.json));
}
