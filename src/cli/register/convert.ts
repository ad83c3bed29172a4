/** `ripplewise convert`: its options and help, declared without loading the command (../commands/convert.ts runs it). */
import type { Command } from 'commander';
import type { Action } from '../main';
import { examples, outputOptions, tableOptions } from '../options';
import type { Flags } from '../commands/convert';

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json', 'html'] as const;

export const CONVERT_ABOUT = 'Read a table (JSON, CSV, TSV or XLSX, wide or long, with a mapping if needed) and write it in one layout that every Ripplewise reader reads back to the identical table.';

export function register(p: Command, run: (a: Action, json: boolean) => void): void {
  const cmd = p.command('convert')
    .summary('Read a table in any layout and write it as CSV, TSV, XLSX or JSON').argument('<table>', "the table ('-' for standard input)").description(CONVERT_ABOUT);
  tableOptions(cmd);
  cmd.option('--coefficients', 'XLSX: add a sheet of technical coefficients');
  cmd.option('--print-mapping', 'print the layout the reader detected (JSON), to edit and pass back with --mapping');
  outputOptions(cmd, FORMATS, { locale: true });
  examples(cmd, [
    ['ripplewise convert table.json --out table.xlsx', 'JSON to a workbook'],
    ['ripplewise convert agency.xlsx --sheet "Table 2" --out table.csv', 'one sheet of an agency workbook to CSV'],
    ['ripplewise convert agency.csv --print-mapping > mapping.json', 'the detected layout, to correct'],
    ['ripplewise convert agency.csv --mapping mapping.json --out table.json', 'read with a corrected layout'],
  ]);
  cmd.action((table: string, f: Flags) => run(async (ctx) => (await import('../commands/convert')).action(ctx, table, f), !!f.json));
}
