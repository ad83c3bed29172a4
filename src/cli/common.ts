/** Pieces every subcommand uses: output and input options, examples in help, the checked table, report parts. */
import { readFileSync } from 'node:fs';
import type { Command } from 'commander';
import { checks } from '../../engine/checks';
import type { Finding } from '../../engine/findings';
import { hasErrors } from '../../engine/findings';
import { checkLocale } from '../report/format';
import type { ReportInputFile, ReportParts } from '../report/model';
import type { CliContext } from './context';
import { reportDate } from './context';
import { ChecksFailed, UsageError } from './errors';
import type { OutputFormat } from './files';
import { reportInput } from './files';
import type { OutputOptions } from './output';
import type { LoadedTable, TableFlags } from './table-input';
import { loadTable } from './table-input';
import { rangeFindings } from './finite';

const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { name: string; version: string };

export const TOOL = { name: 'ripplewise', version: pkg.version } as const;

export interface CommonFlags extends OutputOptions, TableFlags {
  locale?: string;
}

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

/** The locale for reports, checked. */
export function localeOf(flags: { locale?: string }): string {
  if (flags.locale === undefined) return 'en';
  try {
    return checkLocale(flags.locale);
  } catch {
    throw new UsageError(`--locale '${flags.locale}' is not a locale tag`, 'bad-locale', 'Give a tag such as en, en-GB, fr-FR or de-DE');
  }
}

export interface CheckedTable extends LoadedTable {
  checks: Finding[];
}

/** Read the table and run its checks; a table with error findings stops the command (exit 1). */
export async function checkedTable(ctx: CliContext, name: string, flags: TableFlags, o: { allowErrors?: boolean } = {}): Promise<CheckedTable> {
  const loaded = await loadTable(ctx, name, flags);
  const found = [...loaded.findings, ...checks(loaded.table), ...rangeFindings(loaded.table)];
  if (!o.allowErrors && hasErrors(found)) throw new ChecksFailed(name, found);
  return { ...loaded, checks: found };
}

/** The inputs of a report: the table (and mapping) and any other files. */
export function reportInputs(t: LoadedTable, more: ReportInputFile[] = []): ReportInputFile[] {
  return [reportInput(t.file, 'table', t.sheet), ...t.extra.map((x) => reportInput(x.file, x.role)), ...more];
}

/** The parts every report of a command shares. */
export function reportBase(ctx: CliContext, flags: CommonFlags): Pick<ReportParts, 'tool' | 'createdAt' | 'locale'> {
  return { tool: { ...TOOL }, createdAt: reportDate(ctx).toISOString(), locale: localeOf(flags) };
}

/** Parse a number option with a clear message. */
export function numberOption(v: string | undefined, name: string, o: { min?: number; max?: number; integer?: boolean } = {}): number | undefined {
  if (v === undefined) return undefined;
  const x = Number(v);
  const bad = !Number.isFinite(x) || (o.integer && !Number.isInteger(x)) || (o.min !== undefined && x < o.min) || (o.max !== undefined && x > o.max);
  if (v.trim() === '' || bad) {
    const range = [o.integer ? 'a whole number' : 'a number', o.min !== undefined ? `from ${o.min}` : '', o.max !== undefined ? `to ${o.max}` : ''].filter(Boolean).join(' ');
    throw new UsageError(`${name} must be ${range}; got '${v}'`, 'bad-number');
  }
  return x;
}

/** The table's one-line description for text output. */
export function tableLine(t: LoadedTable): string {
  const m = t.table.meta;
  return `${m.title ?? t.file.name}: ${t.table.sectors.codes.length} sectors${m.invented ? ' (INVENTED DATA)' : ''}`;
}

/**
 * The four report writers over one report, built once on first use. Each writer is loaded when
 * it is used (the HTML writer brings d3 for the charts, the XLSX writer exceljs).
 */
export function reportWriters(make: () => import('../report/model').Report): Partial<Record<OutputFormat, () => Promise<string | Uint8Array> | string>> {
  let r: import('../report/model').Report | undefined;
  const get = () => (r ??= make());
  return {
    json: async () => (await import('../report/json')).writeJson(get()),
    html: async () => (await import('../report/html')).writeHtml(get()),
    xlsx: async () => (await import('../report/xlsx')).writeXlsx(get()),
    csv: async () => (await import('../report/csv')).writeCsv(get()),
  };
}

/** The settings and closure of a command's JSON result. */
export function settingsJson(settings: readonly import('../report/model').ReportSetting[]) {
  return settings.map((s) => ({ key: s.key, label: s.label, value: s.value, source: s.source, ...(s.note ? { note: s.note } : {}) }));
}
