/**
 * Opening a file by its content: an XLSX workbook (a zip archive), JSON, or CSV text; and, for
 * a sheet, whether it is wide (a table) or long (one line per cell). Browser-safe: it takes
 * bytes and a file name, never a path.
 */
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import { type CsvOptions, readCsv, readCsvStream } from './csv';
import { EMPTY, type Grid, normalizeCode, NUMBER, TEXT } from './grid';
import { readTableJson } from './json';
import { unpackIfKeyed } from './keyed';
import { type LongOptions, type LongTable, readLongGrid } from './long';
import type { MappingInput } from './mapping';
import { type ReadTableOptions, readTable, type TableRead } from './tables';
import { readXlsx } from './xlsx';

export type FileKind = 'csv' | 'xlsx' | 'json';

/** What a file holds, from its first bytes (and its name when the bytes do not say). */
export function sniffFile(bytes: Uint8Array, name: string): FileKind {
  if (bytes.length >= 2 && bytes[0] === 0x50 && bytes[1] === 0x4b) return 'xlsx';
  if (bytes.length >= 4 && bytes[0] === 0xd0 && bytes[1] === 0xcf && bytes[2] === 0x11 && bytes[3] === 0xe0) return 'xlsx';
  let i = 0;
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) i = 3;
  while (i < bytes.length && i < 4096 && (bytes[i] === 32 || bytes[i] === 9 || bytes[i] === 10 || bytes[i] === 13)) i++;
  if (bytes[i] === 0x7b || (bytes[i] === 0x5b && /\.json$/i.test(name))) return 'json';
  if (/\.xlsx$/i.test(name) && bytes.length > 0) return 'xlsx';
  return 'csv';
}

export interface GridOptions extends CsvOptions {
  /** XLSX: a sheet name or a 1-based index. */
  sheet?: string | number;
}

export interface GridRead {
  grid: Grid;
  kind: 'csv' | 'xlsx';
  conventions: Record<string, unknown>;
  /** XLSX: every sheet name. */
  sheets?: string[];
  findings: Finding[];
}

/** Read a CSV or XLSX file into a grid. */
export async function readGrid(bytes: Uint8Array, options: GridOptions): Promise<GridRead> {
  const kind = sniffFile(bytes, options.file);
  if (kind === 'json') throw new InputError('not-a-sheet', `file ${options.file} holds JSON, not a sheet of cells`, { file: options.file }, 'Read it as a JSON table');
  if (kind === 'xlsx') {
    const x = await readXlsx(bytes, options);
    return unpackIfKeyed({ grid: x.grid, kind, conventions: { ...x.conventions }, sheets: x.sheets, findings: x.findings });
  }
  const c = readCsv(bytes, options);
  return unpackIfKeyed({ grid: c.grid, kind, conventions: { ...c.conventions }, findings: c.findings });
}

/**
 * Whether a sheet is long (one line per cell: codes repeat down two columns, a few columns in
 * all) rather than wide.
 */
export function guessShape(grid: Grid): 'wide' | 'long' {
  if (grid.colCount > 20 || grid.rowCount < 3) return 'wide';
  // Lines looked at: the first 2,500 and 2,500 spread evenly over the rest (a long file may give
  // one row code to its first 20,000 lines).
  const sample: number[] = [];
  const head = Math.min(grid.rowCount, 2500);
  for (let r = 0; r < head; r++) sample.push(r);
  const rest = grid.rowCount - head;
  if (rest > 0) {
    const step = Math.max(1, rest / 2500);
    for (let x = head; x < grid.rowCount; x += step) sample.push(Math.floor(x));
  }
  // The code fields: the first two columns, passing over any that hold one value on every line
  // (a region, a year, a table number).
  const first = new Map<number, string>();
  const varies = new Set<number>();
  for (const r of sample) {
    if (r === 0) continue;
    const row = grid.rows[r]!;
    for (let c = 0; c < row.kinds.length; c++) {
      if (row.kinds[c] === EMPTY) continue;
      const t = normalizeCode(grid.text(r, c));
      const f = first.get(c);
      if (f === undefined) first.set(c, t);
      else if (f !== t) varies.add(c);
    }
  }
  const fields = [...varies].sort((p, q) => p - q).slice(0, 2);
  if (fields.length < 2) return 'wide';
  const [f0, f1] = fields as [number, number];
  const a = new Set<string>();
  const b = new Set<string>();
  const pairs = new Set<string>();
  let lines = 0;
  let numeric = false;
  let oneValueLines = 0; // lines of two text codes and one number
  for (const r of sample) {
    const row = grid.rows[r]!;
    if (row.kinds.length < 3 || row.kinds[f0] === EMPTY || row.kinds[f1] === EMPTY) continue;
    lines++;
    const x = normalizeCode(grid.text(r, f0));
    const y = normalizeCode(grid.text(r, f1));
    a.add(x);
    b.add(y);
    pairs.add(`${x}\u0000${y}`);
    // A number, or a number kept as text (a value set apart from its flag in a keyed sheet).
    for (let c = f1 + 1; c < row.kinds.length && !numeric; c++) if (row.kinds[c] === 1 || (row.kinds[c] !== EMPTY && /^\s*[-+]?\d[\d.,]*\s*$/.test(grid.text(r, c)))) numeric = true;
    if (row.kinds[f0] === TEXT && row.kinds[f1] === TEXT) {
      let nums = 0;
      for (let c = f1 + 1; c < row.kinds.length; c++) if (row.kinds[c] === NUMBER) nums++;
      if (nums === 1) oneValueLines++;
    }
  }
  if (lines < 3 || !numeric) return 'wide';
  if (a.size > lines * 0.8 || b.size > lines * 0.8) {
    // A code and a label column (or a code column and numbers) name a new line each time: wide.
    // But a long file that starts with one sector's row across thousands of columns (row code A,
    // column codes F1 … F20000) has one field that hardly varies, both fields text, and one number
    // per line: still long.
    if (!(Math.min(a.size, b.size) <= lines * 0.1 && pairs.size >= lines * 0.9 && oneValueLines >= lines * 0.9)) return 'wide';
  }
  if (pairs.size >= lines * 0.9) return 'long';
  // Pairs repeat (several years or regions in one download): still long when a header names the
  // value field and the file has few fields; the long reader then asks which lines to keep.
  const top = grid.rows[0];
  const named = top && top.kinds.some((k, c) => k !== EMPTY && /^(value|values|amount|obs_value|flow|flows)$/i.test(grid.text(0, c).trim()));
  return named && grid.colCount <= 20 ? 'long' : 'wide';
}

export interface ReadFileOptions extends GridOptions, ReadTableOptions {
  /** Wide or long (default: found from the sheet; a mapping's shape also counts). */
  shape?: 'wide' | 'long';
  /** Long files: fields and labels (see readLongCsv). */
  long?: Omit<LongOptions, 'file'>;
  mapping?: MappingInput;
}

/**
 * A keyed sheet of several periods (see keyed.ts) is read for its latest period unless a period
 * is chosen: the selection to use and the note that says so, or undefined.
 */
export function latestPeriod(findings: readonly Finding[], file: string, chosen: Record<string, string>): { select: Record<string, string>; note: Finding } | undefined {
  const keyed = findings.find((f) => f.code === 'keyed-sheet');
  const field = keyed?.data?.field as string | undefined;
  if (!keyed || !field || Number(keyed.data!.periods) < 2 || Object.keys(chosen).some((k) => k.toLowerCase() === field.toLowerCase())) return undefined;
  const latest = String(keyed.data!.latest);
  return {
    select: { ...chosen, [field]: latest },
    note: { code: 'latest-period', severity: 'note', message: `file ${file}: the latest ${field}, ${latest}, is read; choose another with select: { "${field}": "..." } (the command line: --select ${field}=...)`, where: { file } },
  };
}

/**
 * The long table of a sheet (with the findings its reader gave): for a keyed sheet of several
 * periods with none chosen, the latest, with a note saying so first among the table's findings.
 */
export function readLongSheet(read: { grid: Grid; findings: readonly Finding[] }, options: Omit<LongOptions, 'file'>): LongTable {
  const latest = latestPeriod(read.findings, read.grid.file, { ...(options.mapping?.select ?? {}), ...(options.select ?? {}) });
  const t = readLongGrid(read.grid, latest ? { ...options, select: latest.select } : options);
  if (latest) t.findings.unshift(latest.note);
  return t;
}

/** Read a table from a file's bytes: JSON as written by the JSON writer, or a CSV or XLSX sheet, wide or long. */
export async function readTableFile(bytes: Uint8Array, options: ReadFileOptions): Promise<TableRead & { shape: 'wide' | 'long' | 'json' }> {
  const kind = sniffFile(bytes, options.file);
  if (kind === 'json') {
    const table = readTableJson(new TextDecoder().decode(bytes), options.file);
    return { table, mapping: { format: 'ripplewise-layout', version: 1, kind: 'flows', shape: 'wide', file: options.file, rows: [], columns: [], output: { from: 'column', code: 'x' }, blanks: 'error' }, findings: [], shape: 'json' };
  }
  return tableOfGrid(await readGrid(bytes, options), options);
}

/**
 * Read a table from a CSV file given as a stream of byte chunks (a file read piece by piece), so
 * the file is never held whole: the byte scanner reads the chunks as they come (the encoding and
 * the delimiter from the first 64 KiB). The same table, findings and layout as readTableFile on
 * the file's bytes, which reads a CSV above SCANNER_THRESHOLD through the same scanner.
 */
export async function readTableCsvStream(chunks: AsyncIterable<Uint8Array>, options: ReadFileOptions): Promise<TableRead & { shape: 'wide' | 'long' }> {
  const c = await readCsvStream(chunks, options);
  return tableOfGrid(unpackIfKeyed({ grid: c.grid, kind: 'csv', conventions: { ...c.conventions }, findings: c.findings }), options);
}

/** The table of a sheet read as a grid: wide, or long when it is long (given or detected). */
function tableOfGrid(g: GridRead, options: ReadFileOptions): TableRead & { shape: 'wide' | 'long' } {
  const shape = options.shape ?? options.mapping?.shape ?? guessShape(g.grid);
  if (shape === 'long') {
    const lo: Omit<LongOptions, 'file'> = { ...(options.decimal ? { decimal: options.decimal } : {}), ...(options.thousands !== undefined ? { thousands: options.thousands } : {}), ...(options.long ?? {}) };
    if (options.mapping) lo.mapping = options.mapping;
    const long = readLongSheet(g, lo);
    const r = readTable(long, options);
    return { ...r, findings: [...g.findings, ...r.findings], shape };
  }
  const r = readTable(g.grid, options);
  r.mapping.conventions = g.conventions;
  return { ...r, findings: [...g.findings, ...r.findings], shape };
}
