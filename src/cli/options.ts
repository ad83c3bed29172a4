/**
 * The option declarations that the commands share, for src/cli/register/*.ts: main.ts declares
 * every command with these at start-up, and nothing here loads the readers, the report writers or
 * the engine's models (the command's own module is loaded only when it runs). common.ts and
 * model-options.ts re-export them.
 */
import { readFileSync } from 'node:fs';
import type { Command } from 'commander';
import { CLOSURE_BASES } from '../../engine/household';
import { BASIS_KINDS, DEFAULT_DELTA, METHOD_NAMES, REGIONAL_METHODS } from '../../engine/regional/index';
import type { OutputFormat } from './files';

const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { name: string; version: string };

export const TOOL = { name: 'ripplewise', version: pkg.version } as const;

/** Commander's collector for a repeatable option. */
export function collect(v: string, prev: string[] | undefined): string[] {
  return [...(prev ?? []), v];
}

/** --out (repeatable), --format, --json and, for reports, --locale. */
export function outputOptions(cmd: Command, formats: readonly OutputFormat[], o: { locale?: boolean } = {}): Command {
  cmd
    .option('-o, --out <file>', `write the result to a file (repeatable; the format from the extension: ${formats.map((f) => `.${f}`).join(', ')}; '-' for standard output)`, collect)
    .option('-f, --format <format>', `output format: ${formats.join('|')} (default: from the --out extension)`)
    .option('--json', 'print the machine-readable result as JSON on standard output');
  if (o.locale) cmd.option('--locale <tag>', 'locale of the numbers shown in HTML reports, such as en-GB or de-DE (default en)');
  return cmd;
}

/** --sheet, --mapping and --input-format for a command that reads a table. */
export function tableOptions(cmd: Command): Command {
  return cmd
    .option('--sheet <name>', 'the sheet of an XLSX workbook to read (default: the first that holds a table)')
    .option('--mapping <file>', 'a layout mapping (JSON) that overrides the detected layout of the table')
    .option('--input-format <format>', 'json|csv|tsv|xlsx (default: from the contents and the extension)')
    .option('--shape <shape>', 'wide|long: a wide sheet or a long file of row code, column code and value (default: detected)')
    .option('--blanks <rule>', 'empty cells in the table: error or zero (default: zero in spreadsheets, error in text files)')
    .option('--select <field=value>', 'long files: read only the lines whose field (a header name or a number from 1) holds this text, such as TIME_PERIOD=2020 (repeatable)', collect)
    .option('--zero-text <text>', "a text that means zero in the table's cells, such as - or .. (repeatable; default: none, such cells are errors)", collect)
    .option('--decimal <mark>', "the decimal mark of a CSV or TSV file: '.' or ',' (default: seen in the numbers)")
    .option('--encoding <name>', 'the text encoding of a CSV or TSV file: utf-8, windows-1252, utf-16le or utf-16be (default: from a byte-order mark, else UTF-8, else Windows-1252 with a warning)')
    .option('--thousands <separator>', "the thousands separator: one character, such as ',' '.' or ' ', or 'none' (default: seen in the numbers)")
    .option('--table-kind <kind>', 'flows|coefficients: transactions, or technical coefficients A (default: detected)')
    .option('--labels <file>', 'a list of codes and titles (CSV, TSV, XLSX or lines of code and title) for a table that carries codes only')
    .option('--satellite-file <file>', 'employment, emissions or other values by sector from another file: sector codes in one column, one or more value columns, the unit in a unit row, in brackets or in the heading (repeatable)', collect);
}

/** Examples at the end of a command's help. */
export function examples(cmd: Command, lines: [string, string][]): Command {
  const w = Math.max(...lines.map(([c]) => c.length));
  return cmd.addHelpText('after', `\nExamples:\n${lines.map(([c, d]) => `  $ ${c.padEnd(w)}  ${d}`).join('\n')}\n`);
}

/** Add the household and measure options to a command. */
export function modelOptions(cmd: Command): Command {
  return cmd
    .option('--household-column <code>', 'final-demand column of household consumption for the Type II closure (default: guessed from the labels)')
    .option('--labour-income-row <codes>', 'value-added row(s) of labour income, comma-separated (default: guessed from the labels)')
    .option('--propensity <share>', 'share of household income spent in the economy, 0 to 1: the household column is this share × the consumption column\'s own shares (basis propensity)')
    .option('--household-income <amount>', "household income that household spending is divided by, in the table's money units (basis household-income; for agencies that divide by an income not in the table)")
    .option('--household-basis <basis>', `what household spending is divided by: ${CLOSURE_BASES.join('|')} (default: labour-income, or the basis of --propensity or --household-income)`)
    .option('--household-own-purchases <amount>', "households' purchases from households (the corner cell of a closed table), in the table's money units (default 0)")
    .option('--split <parts>', 'rounds: split the indirect effect into the first round (A\'s column sums, weighted by the measure) and the later rounds (industrial support)')
    .option('--no-household', 'open model only: no induced effects, no Type II')
    .option('--jobs <code>', 'the satellite row that counts jobs (default: guessed from its label or unit)')
    .option('--satellites <codes>', 'satellite rows to count as measures, comma-separated (default: all)')
    .option('--value-added-rows <codes>', 'value-added rows summed as value added, comma-separated (default: all)')
    .option('--measure <codes>', 'only these measures, comma-separated codes such as output,value-added,JOBS');
}

/** The options of a regionalisation, shared by `regionalise` and `report` (checked by regional-input.ts's regionalChoices). */
export function regionalOptions(cmd: Command): Command {
  return cmd
    .option('--regional-sheet <name>', 'the sheet of a regional workbook')
    .option('-m, --method <method>', `${REGIONAL_METHODS.join('|')}: ${REGIONAL_METHODS.map((m) => METHOD_NAMES[m]).join('; ')} (default flq)`)
    .option('--delta <number>', `δ of FLQ and AFLQ, from 0 to 1 (default ${DEFAULT_DELTA}, a common default)`)
    .option('--basis <kind>', `what the regional values count: ${BASIS_KINDS.join('|')} (default employment)`)
    .option('--regional-column <name>', "the column of the region's values (a header or a number from 1; default: the one named for a region, else the first)")
    .option('--national-column <name>', "the column of the nation's values (default: the one named for the nation, else from the table: jobs satellite, output, or compensation row)")
    .option('--region <name>', 'the name of the region, shown in the report')
    .option('--concordance <file>', "a concordance from the regional file's codes to the table's (values summed per table code)");
}
