/**
 * Reading a table for a command, through src/io: JSON (a table as src/io writes it, or a plain
 * table object), a CSV, TSV or XLSX sheet, wide or long, with the layout detected and a mapping
 * JSON to override it. A Ripplewise project file is accepted too (its table is used). The file's
 * bytes and SHA-256 come along for the report.
 */
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { Table } from '../../engine/table';
import { makeTable } from '../../engine/table';
import type { MappingInput, ReadFileOptions } from '../io/index';
import { applyLabels, attachSatellites, parseMapping, readGrid, readLabelList, readSatellites, readTableCsvStream, readTableFile, sniffFile } from '../io/index';
import { SCANNER_THRESHOLD } from '../io/csv';
import { checkSectors } from '../io/limits';
import { parseJson } from '../project/json';
import { PROJECT_FORMAT, readProject } from '../project/project';
import type { CliContext } from './context';
import { UsageError } from './errors';
import type { InputFile } from './files';
import { openInput, readInput, wholeInput } from './files';

export type InputFormat = 'json' | 'csv' | 'tsv' | 'xlsx';
export const INPUT_FORMATS: readonly InputFormat[] = ['json', 'csv', 'tsv', 'xlsx'];

export interface TableFlags {
  sheet?: string;
  mapping?: string;
  inputFormat?: string;
  shape?: string;
  blanks?: string;
  tableKind?: string;
  decimal?: string;
  thousands?: string;
  select?: string[];
  zeroText?: string[];
  encoding?: string;
  satelliteFile?: string[];
  labels?: string;
}

/** --labels FILE: a list of codes and titles (CSV, TSV, XLSX or lines of 'code title'). */
export async function loadLabels(ctx: CliContext, name: string | undefined): Promise<{ labels?: Map<string, string>; file?: InputFile }> {
  if (name === undefined) return {};
  const file = await readInput(ctx, name, 'labels');
  const { grid } = await readGrid(file.bytes, { file: file.name });
  return { labels: readLabelList(grid), file };
}

const ENCODINGS = ['utf-8', 'windows-1252', 'utf-16le', 'utf-16be'] as const;

/** --encoding, checked ('latin-1' and 'cp1252' are taken for windows-1252, 'utf8' for utf-8). */
export function encodingOption(v: string | undefined): (typeof ENCODINGS)[number] | undefined {
  if (v === undefined) return undefined;
  const e = v.trim().toLowerCase().replace(/^utf8$/, 'utf-8').replace(/^(latin-?1|iso-8859-1|cp1252|windows1252)$/, 'windows-1252');
  if (!(ENCODINGS as readonly string[]).includes(e)) throw new UsageError(`--encoding must be one of ${ENCODINGS.join(', ')}; got '${v}'`, 'bad-encoding');
  return e as (typeof ENCODINGS)[number];
}

/** --select FIELD=VALUE (repeatable), checked. */
export function selectOption(list: string[] | undefined): Record<string, string> | undefined {
  if (!list?.length) return undefined;
  const out: Record<string, string> = {};
  for (const s of list) {
    const at = s.indexOf('=');
    if (at <= 0) throw new UsageError(`--select takes FIELD=VALUE, such as TIME_PERIOD=2020; got '${s}'`, 'bad-select');
    out[s.slice(0, at).trim()] = s.slice(at + 1).trim();
  }
  return out;
}

/** --decimal and --thousands, checked, as the readers take them. */
export function numberOptions(flags: { decimal?: string; thousands?: string }): { decimal?: '.' | ','; thousands?: string } {
  const out: { decimal?: '.' | ','; thousands?: string } = {};
  if (flags.decimal !== undefined) {
    const d = flags.decimal.trim().toLowerCase();
    const mark = d === '.' || d === 'point' || d === 'dot' ? '.' : d === ',' || d === 'comma' ? ',' : undefined;
    if (!mark) throw new UsageError(`--decimal must be '.' or ','; got '${flags.decimal}'`, 'bad-decimal');
    out.decimal = mark;
  }
  if (flags.thousands !== undefined) {
    const t = flags.thousands;
    const sep = t === 'none' || t === '' ? '' : t === 'space' ? ' ' : t;
    if (sep.length > 1) throw new UsageError(`--thousands must be one character, 'space' or 'none'; got '${t}'`, 'bad-thousands');
    if (sep !== '' && /[0-9\-+eE]/.test(sep)) throw new UsageError(`--thousands cannot be '${t}'`, 'bad-thousands');
    if (out.decimal && sep === out.decimal) throw new UsageError(`--decimal and --thousands are both '${sep}'`, 'bad-thousands');
    out.thousands = sep;
  }
  return out;
}

/** --blanks error|zero, checked. */
export function blanksOption(v: string | undefined): 'error' | 'zero' | undefined {
  if (v === undefined) return undefined;
  if (v !== 'error' && v !== 'zero') throw new UsageError(`--blanks must be error or zero; got '${v}'`, 'bad-blanks');
  return v;
}

export interface LoadedTable {
  table: Table;
  file: InputFile;
  /** Findings of the reader (layout detection, coercions it reported). */
  findings: Finding[];
  /** Other files read (the mapping). */
  extra: { role: string; file: InputFile }[];
  /** The layout mapping the reader used (pass it back with --mapping to read the file the same way). */
  mapping?: unknown;
  shape?: 'wide' | 'long' | 'json';
  sheet?: string;
}

/** A sheet name, or a 1-based sheet number. */
export function sheetOption(s: string | undefined): string | number | undefined {
  if (s === undefined) return undefined;
  return /^\d+$/.test(s.trim()) ? Number(s.trim()) : s;
}

/** Read a mapping file given with --mapping. */
export async function loadMapping(ctx: CliContext, name: string | undefined): Promise<{ mapping?: MappingInput; file?: InputFile }> {
  if (name === undefined) return {};
  const file = await readInput(ctx, name, 'mapping');
  try {
    return { mapping: parseMapping(new TextDecoder('utf-8').decode(file.bytes), name), file };
  } catch (e) {
    // Name the file in every message about it.
    if (e instanceof InputError && !e.message.includes(name)) throw new InputError(e.code, `${name}: ${e.message}`, { ...e.where, file: name });
    throw e;
  }
}

function checkInputFormat(given: string | undefined): InputFormat | undefined {
  if (given === undefined) return undefined;
  const g = given.toLowerCase() as InputFormat;
  if (!INPUT_FORMATS.includes(g)) throw new UsageError(`--input-format ${given} is not known; choose one of ${INPUT_FORMATS.join(', ')}`, 'bad-input-format');
  return g;
}

/** A name for src/io that carries the format when the user gave one (standard input has no extension). */
function ioName(f: InputFile, format: InputFormat | undefined): string {
  const base = f.name === '-' ? 'standard input' : f.name;
  return format ? `${base}${base.toLowerCase().endsWith(`.${format}`) ? '' : `.${format}`}` : base;
}

export async function loadTable(ctx: CliContext, name: string, flags: TableFlags = {}): Promise<LoadedTable> {
  const format = checkInputFormat(flags.inputFormat);
  const blanks = blanksOption(flags.blanks);
  if (flags.shape !== undefined && flags.shape !== 'wide' && flags.shape !== 'long') throw new UsageError(`--shape must be wide or long; got '${flags.shape}'`, 'bad-shape');
  if (flags.tableKind !== undefined && flags.tableKind !== 'flows' && flags.tableKind !== 'coefficients') {
    throw new UsageError(`--table-kind must be flows or coefficients; got '${flags.tableKind}'`, 'bad-table-kind');
  }
  const { mapping, file: mappingFile } = await loadMapping(ctx, flags.mapping);
  // A large CSV, from a file or standard input, is read as a stream (never held whole; its hash
  // from the same chunks); other inputs are read whole.
  const opened = format === undefined || format === 'csv' || format === 'tsv' ? await openInput(ctx, name, 'table', SCANNER_THRESHOLD) : await readInput(ctx, name, 'table');
  const streamed = 'read' in opened && sniffFile(opened.file.bytes, ioName(opened.file, format)) === 'csv' && firstChar(opened.file.bytes) !== '{' ? opened : undefined;
  const file = streamed ? streamed.file : 'read' in opened ? await wholeInput(opened) : opened;
  const extra = mappingFile ? [{ role: 'mapping', file: mappingFile }] : [];
  const looksJson = format === 'json' || (format === undefined && firstChar(file.bytes) === '{');
  if (looksJson) {
    if (flags.sheet !== undefined) throw new UsageError('--sheet applies to XLSX workbooks; this table is JSON', 'sheet-not-xlsx');
    const text = new TextDecoder('utf-8').decode(file.bytes);
    const head = parseJson(text, name) as { format?: unknown };
    if (head && typeof head === 'object' && head.format === PROJECT_FORMAT) {
      const table = makeTable(readProject(text, name).table);
      checkSectors(table.sectors.codes.length, name);
      return { table, file, findings: [], extra, shape: 'json' };
    }
  }
  const sheet = sheetOption(flags.sheet);
  const numbers = numberOptions(flags);
  const encoding = encodingOption(flags.encoding);
  const select = selectOption(flags.select);
  const zeroTexts = flags.zeroText?.length ? flags.zeroText.map((t) => t.trim()).filter(Boolean) : undefined;
  if (select && flags.shape === 'wide') throw new UsageError('--select applies to long files; this one is read as wide (--shape wide)', 'select-not-long');
  const options: ReadFileOptions = {
    file: ioName(file, format),
    ...numbers,
    ...(encoding ? { encoding } : {}),
    ...(sheet !== undefined ? { sheet } : {}),
    ...(format === 'tsv' ? { delimiter: '\t' as const } : {}),
    ...(mapping ? { mapping } : {}),
    ...(flags.shape ? { shape: flags.shape as 'wide' | 'long' } : {}),
    ...(blanks || select || zeroTexts ? { long: { ...(blanks ? { blanks } : {}), ...(select ? { select } : {}), ...(zeroTexts ? { zeroTexts } : {}) } } : {}),
    ...(zeroTexts ? { zeroTexts } : {}),
    ...(blanks ? { blanks } : {}),
    ...(select ? { shape: flags.shape === 'wide' ? 'wide' : ('long' as const) } : {}),
    ...(flags.tableKind ? { kind: flags.tableKind as 'flows' | 'coefficients' } : {}),
  };
  const r = streamed ? await streamed.read((chunks) => readTableCsvStream(chunks, options)) : await readTableFile(file.bytes, options);
  checkSectors(r.table.sectors.codes.length, name);
  let table = r.table;
  const findings = [...r.findings];
  for (const name of flags.satelliteFile ?? []) {
    const sf = await readInput(ctx, name, 'satellites');
    const g = await readGrid(sf.bytes, { file: sf.name });
    const sat = readSatellites(g.grid, { sectors: table.sectors });
    table = attachSatellites(table, sat);
    extra.push({ role: 'satellites', file: sf });
    findings.push({ code: 'satellites-attached', severity: 'note', message: `file ${sf.name}: ${sat.satellites.map((x) => `'${x.code}' (${x.unit})`).join(', ')} attached to the table's ${table.sectors.codes.length} sectors`, where: { file: sf.name } });
  }
  const lab = await loadLabels(ctx, flags.labels);
  if (lab.labels) {
    const n = applyLabels(table.sectors, lab.labels) + applyLabels(table.finalDemand, lab.labels) + applyLabels(table.valueAdded, lab.labels);
    extra.push({ role: 'labels', file: lab.file! });
    findings.push({ code: 'labels-attached', severity: 'note', message: `file ${lab.file!.name}: ${n} titles attached to codes of the table`, where: { file: lab.file!.name } });
  }
  const out: LoadedTable = { table, file, findings, extra, mapping: r.mapping, shape: r.shape };
  if (flags.sheet !== undefined) out.sheet = flags.sheet;
  return out;
}

function firstChar(b: Uint8Array): string {
  let i = b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf ? 3 : 0;
  while (i < b.length && (b[i] === 0x20 || b[i] === 0x09 || b[i] === 0x0a || b[i] === 0x0d)) i++;
  return String.fromCharCode(b[i] ?? 0);
}
