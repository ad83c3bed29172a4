/** `ripplewise coefficients`: its options and help, declared without loading the command (../commands/coefficients.ts runs it). */
import type { Command } from 'commander';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/coefficients';

export const COEFFICIENT_KINDS = {
  technical: { title: 'Technical coefficients A = Z x̂⁻¹', about: "What each sector (column) buys from each sector (row) per unit of its own output." },
  'total-requirements': { title: 'Total requirements (Leontief inverse) L = (I − A)⁻¹', about: 'The output of each sector (row), direct and indirect, per unit of final demand for each sector (column).' },
  allocation: { title: 'Allocation coefficients B = x̂⁻¹ Z', about: 'The share of each sector\'s (row) output sold to each sector (column) as an input.' },
  'ghosh-inverse': { title: 'Ghosh inverse G = (I − B)⁻¹', about: 'The output of each sector (column) per unit of primary input in each sector (row), in the supply-driven model.' },
} as const;

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json', 'html'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('coefficients')
    .summary('Technical coefficients, Leontief inverse, allocation or Ghosh matrix')
    .argument('<table>', "the table ('-' for standard input)")
    .description('Technical coefficients, the Leontief inverse (total requirements), allocation coefficients or the Ghosh inverse, as a matrix.')
    .option('-k, --kind <kind>', `${Object.keys(COEFFICIENT_KINDS).join('|')} (default technical)`, 'technical');
  tableOptions(cmd);
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise coefficients table.csv --out A.csv', 'technical coefficients as a wide CSV'],
    ['ripplewise coefficients table.csv --kind total-requirements --out L.xlsx', 'the Leontief inverse as a workbook'],
    ['ripplewise coefficients table.json --format csv > A.csv', 'to standard output'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/coefficients')).action(ctx, table, f), !!f.json));
}
