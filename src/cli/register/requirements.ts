/** `ripplewise requirements`: its options and help, declared without loading the command (../commands/requirements.ts runs it). */
import type { Command } from 'commander';
import { REQUIREMENTS_KINDS } from '../../../engine/supply-use';
import type { Action } from '../main';
import { collect, examples, outputOptions } from '../options';
import type { Flags } from '../commands/requirements';

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json', 'html'] as const;

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p
    .command('requirements')
    .summary('Make and use tables to direct or total requirements (wide CSV)')
    .description('Supply-use (make and use) tables to direct or total requirements, written as a wide matrix: codes in the first column and in the header row.')
    .requiredOption('--make <file>', 'the make (supply) table: industries × commodities, a sheet or a long file')
    .requiredOption('--use <file>', 'the use table: commodities × industries with final-demand columns and value-added rows, a sheet or a long file')
    .requiredOption('-k, --kind <kind>', REQUIREMENTS_KINDS.join('|'))
    .option('--labels <file>', 'a list of codes and titles (CSV, TSV, XLSX or lines of code and title) for make and use tables that carry codes only')
    .option('--scrap <code>', 'the commodity code of scrap and second-hand goods (its output is taken out of market shares), or none (default: proposed from its title or the make table, with a note)')
    .option('--technology <assumption>', 'industry (default: market shares) or commodity (needs as many industries as commodities)')
    .option('--value-added <patterns>', 'codes of value-added rows of the use table, comma-separated patterns such as V*,T* (default: V* and the usual labels)')
    .option('--final-demand <patterns>', 'codes of final-demand columns of the use table, such as F* (default: F* and the usual labels)')
    .option('--ignore <patterns>', 'codes of rows or columns to leave out, comma-separated patterns')
    .option('--make-sheet <name>', 'the sheet of the make workbook (default: the first with a table)')
    .option('--use-sheet <name>', 'the sheet of the use workbook')
    .option('--make-value-column <n>', 'the field of the make long file that holds the values, counted from 1 (default: detected)')
    .option('--blanks <rule>', 'empty cells in the tables: error (default) or zero')
    .option('--zero-text <text>', "a text that means zero in the tables' cells, such as - or .. (repeatable)", collect)
    .option('--decimal <mark>', "the decimal mark of CSV or TSV files: '.' or ',' (default: seen in the numbers)")
    .option('--thousands <separator>', "the thousands separator: one character or 'none' (default: seen in the numbers)")
    .option('--select <field=value>', 'long files: read only the lines whose field holds this text, such as TIME_PERIOD=2020 (repeatable)', collect)
    .option('--use-value-column <n>', 'the field of the use long file that holds the values, counted from 1 (default: detected)');
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise requirements --make make.txt --use use.txt --kind industry-by-commodity --scrap S004 --out total.csv', 'long text files to a wide CSV'],
    ['ripplewise requirements --make make.txt --use use.txt --use-value-column 5 --kind industry-by-industry --out ixi.csv', 'the value field given'],
    ['ripplewise requirements --make su.xlsx --make-sheet Supply --use su.xlsx --use-sheet Use --kind direct --out B.xlsx', 'one workbook, two sheets'],
    ['ripplewise requirements --make make.csv --use use.csv --kind commodity-by-commodity --value-added "V*,T*" --json', 'as JSON'],
  ]);
  cmd.action((f: Flags) => run(async (ctx) => (await import('../commands/requirements')).action(ctx, f), !!f.json));
}
