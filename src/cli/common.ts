/** Pieces every subcommand uses: output and input options, examples in help, the checked table, report parts. */
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

// The option declarations live in ./options (loaded at start-up without the readers and the engine).
export { collect, examples, outputOptions, tableOptions, TOOL } from './options';
import { TOOL } from './options';

export interface CommonFlags extends OutputOptions, TableFlags {
  locale?: string;
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
