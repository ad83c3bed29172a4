/** `ripplewise price`: its options and help, declared without loading the command (../commands/price.ts runs it). */
import type { Command } from 'commander';
import { PRICE_ABOUT } from '../../../engine/price';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/price';

export const FORMATS = ['json', 'html', 'xlsx', 'csv'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p.command('price')
    .summary('Leontief price model: cost push through the supply chain').argument('<table>', "the table ('-' for standard input)").description(PRICE_ABOUT);
  tableOptions(cmd);
  cmd
    .option('--value-added-percent <percent>', 'raise value added by this percentage (5 means +5 %): all rows, or the --row, in every sector or the --sector ones')
    .option('--per-unit <amount>', 'raise value added by this amount per unit of output instead (in every sector or the --sector ones)')
    .option('--row <code>', 'the value-added row to raise (such as compensation of employees); default all rows')
    .option('--sector <codes>', 'the sectors whose value added rises, comma-separated; default every sector')
    .option('--import-price <percent>', 'raise the price of imported inputs by this percentage in every sector (needs an imports row)')
    .option('--shock <file>', 'a JSON file with the shock: { "valueAdded": [{ "sector", "row", "percent" | "perUnit" }], "importPrice": percent | [{ "sector", "percent" }] }');
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise price table.csv --value-added-percent 5 --row COE', 'a 5 % rise in wages everywhere'],
    ['ripplewise price table.csv --per-unit 0.02 --sector ENER', 'a tax of 0.02 per unit of energy output'],
    ['ripplewise price table.csv --import-price 10 --json', 'imported inputs 10 % dearer, as JSON'],
    ['ripplewise price table.csv --shock shock.json --out prices.xlsx', 'a shock from a file, as a workbook'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/price')).action(ctx, table, f), !!f.json));
}
