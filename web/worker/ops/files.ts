/**
 * Files in the worker: every byte of a file the user opens is parsed here, never on the page.
 * A sheet (CSV, TSV, XLSX) is kept as a grid under an id while the user confirms its layout: the
 * page asks for windows of cells for the preview grid, for the detected layout (src/io's
 * mapping, the same JSON the command line takes with --mapping), and finally for the table read
 * with the confirmed mapping. JSON files are read at once: a project file (src/project) or a
 * plain table. exceljs is loaded by src/io only when a workbook is opened.
 */
import { InputError, sortFindings, toPlain } from '../../../engine/index';
import type { Finding, PlainTable, Technology } from '../../../engine/index';
import {
  guessShape,
  readCsv,
  unpackIfKeyed,
  readLongSheet,
  readSupplyUse,
  readTable,
  readTableJson,
  readXlsx,
  sniffFile,
  detectLayout,
  parseMapping,
  Grid,
} from '../../../src/io/index';
import type { DecimalMark, Delimiter, LayoutMapping, MappingInput, TableSource } from '../../../src/io/index';
import { PROJECT_FORMAT, readProject } from '../../../src/project/project';
import type { Project } from '../../../src/project/project';
import { parseJson } from '../../../src/project/json';
import { digestHex } from '../../../src/report/sha256';
import type { Handler } from '../context';
import { symmetricFromSupplyUse } from './symmetric';
import type { SymmetricKind } from './symmetric';
import { longFields } from './long-fields';
import type { LongFields } from './long-fields';

/** How to read a sheet's cells: the sheet of a workbook, the delimiter and number conventions of a CSV. */
export interface ReadConventions {
  sheet?: string | number;
  delimiter?: Delimiter;
  decimal?: DecimalMark;
  /** '' for no thousands separator. */
  thousands?: string;
}

interface OpenSheet {
  id: string;
  name: string;
  bytes: Uint8Array;
  sha256: string;
  kind: 'csv' | 'xlsx';
  grid: Grid;
  sheets?: string[];
  sheet?: string;
  conventions: Record<string, unknown>;
  readFindings: Finding[];
  options: ReadConventions;
}

/** What the page is told about an open sheet. */
export interface SheetInfo {
  type: 'sheet';
  id: string;
  name: string;
  sha256: string;
  size: number;
  kind: 'csv' | 'xlsx';
  sheets?: string[];
  sheet?: string;
  conventions: Record<string, unknown>;
  options: ReadConventions;
  rowCount: number;
  colCount: number;
  /** Wide (a table as laid out) or long (one line per cell), as guessed from the cells. */
  shape: 'wide' | 'long';
  findings: Finding[];
}

export interface ProjectOpened {
  type: 'project';
  name: string;
  sha256: string;
  size: number;
  project: Project;
}

export interface TableOpened {
  type: 'table';
  name: string;
  sha256: string;
  size: number;
  table: PlainTable;
}

export type Opened = SheetInfo | ProjectOpened | TableOpened;

/** A window of cells for the preview grid (0-based top-left; texts as found, kinds 0 empty, 1 number, 2 text). */
export interface CellWindow {
  top: number;
  left: number;
  texts: string[][];
  kinds: number[][];
  rowCount: number;
  colCount: number;
}

export interface DetectResult {
  mapping?: LayoutMapping;
  findings: Finding[];
  /** Why no layout could be found (the preview still works); `code` is the InputError's (such as 'duplicate-entry'). */
  problem?: { message: string; code?: string; where?: Record<string, unknown> };
}

export interface ReadResult {
  table: PlainTable;
  mapping: LayoutMapping;
  findings: Finding[];
}

export interface SupplyUseResult extends ReadResult {
  mappings: { make: LayoutMapping; use: LayoutMapping };
}

const sheets = new Map<string, OpenSheet>();
let nextId = 1;

function sheetOf(id: string): OpenSheet {
  const s = sheets.get(id);
  if (!s) throw new InputError('no-file', `the file is no longer open in the worker (id ${id}); open it again`);
  return s;
}

async function readCells(name: string, bytes: Uint8Array, options: ReadConventions): Promise<Omit<OpenSheet, 'id' | 'name' | 'bytes' | 'sha256' | 'options'>> {
  const kind = sniffFile(bytes, name);
  if (kind === 'json') throw new InputError('not-a-sheet', `file ${name} holds JSON, not a sheet of cells`, { file: name });
  const num = { ...(options.decimal ? { decimal: options.decimal } : {}), ...(options.thousands !== undefined ? { thousands: options.thousands } : {}) };
  if (kind === 'xlsx') {
    const x = await readXlsx(bytes, { file: name, ...num, ...(options.sheet !== undefined && options.sheet !== '' ? { sheet: options.sheet } : {}) });
    const k = unpackIfKeyed({ grid: x.grid, findings: x.findings });
    return { kind, grid: k.grid, sheets: x.sheets, sheet: x.sheet, conventions: { ...x.conventions }, readFindings: k.findings };
  }
  const c = unpackIfKeyed(readCsv(bytes, { file: name, ...num, ...(options.delimiter ? { delimiter: options.delimiter } : {}) }));
  return { kind, grid: c.grid, conventions: { ...c.conventions }, readFindings: c.findings };
}

function info(s: OpenSheet): SheetInfo {
  const out: SheetInfo = {
    type: 'sheet',
    id: s.id,
    name: s.name,
    sha256: s.sha256,
    size: s.bytes.length,
    kind: s.kind,
    conventions: s.conventions,
    options: { ...s.options },
    rowCount: s.grid.rowCount,
    colCount: s.grid.colCount,
    shape: guessShape(s.grid),
    findings: s.readFindings,
  };
  if (s.sheets) out.sheets = s.sheets;
  if (s.sheet !== undefined) out.sheet = s.sheet;
  return out;
}

/** The source a table reader takes for this sheet and shape: the grid, or the long file read from it. */
function sourceOf(s: OpenSheet, mapping: MappingInput | undefined): TableSource {
  const shape = mapping?.shape ?? guessShape(s.grid);
  if (shape !== 'long') return s.grid;
  return readLongSheet({ grid: s.grid, findings: s.readFindings }, mapping ? { mapping } : {});
}

function checkedMapping(m: unknown, file: string): MappingInput | undefined {
  if (m === undefined || m === null) return undefined;
  return parseMapping(m, `the layout of ${file}`);
}

function errorOf(e: unknown): { message: string; code?: string; where?: Record<string, unknown> } {
  const o = e as { message?: string; code?: unknown; where?: Record<string, unknown> };
  const out: { message: string; code?: string; where?: Record<string, unknown> } = { message: String(o?.message ?? e) };
  if (typeof o?.code === 'string') out.code = o.code;
  if (o?.where) out.where = { ...o.where };
  return out;
}


/**
 * The reading of a sheet with no kind given, when the reader takes it for technical coefficients
 * (its 'read-as-coefficients' note and mapping); undefined when it reads as flows or not at all.
 */
function coefficientsByContent(source: ReturnType<typeof sourceOf>, mapping: MappingInput | undefined): { mapping: LayoutMapping; note: Finding } | undefined {
  try {
    const r = readTable(source, mapping ? { mapping } : {});
    const note = r.findings.find((f) => f.code === 'read-as-coefficients');
    return note ? { mapping: r.mapping, note } : undefined;
  } catch {
    return undefined; // a sheet that does not read yet is shown with its detected layout and problem
  }
}

export const fileOps: Record<string, Handler> = {
  /**
   * Open a file's bytes: a project file or a JSON table is read at once; a sheet is kept for the
   * layout step. Errors name the file, sheet, row, column and the text found.
   */
  'file-open': async (args: { name: string; bytes: ArrayBuffer | Uint8Array; options?: ReadConventions }, ctx): Promise<Opened> => {
    const name = String(args?.name ?? 'file');
    const bytes = args.bytes instanceof Uint8Array ? args.bytes : new Uint8Array(args.bytes);
    if (!bytes.length) throw new InputError('empty-file', `file ${name} is empty`, { file: name }, 'Choose a file with a table in it');
    ctx.progress(0, `reading ${name}`);
    const sha256 = await digestHex(bytes);
    const kind = sniffFile(bytes, name);
    if (kind === 'json') {
      const text = new TextDecoder('utf-8').decode(bytes);
      const head = parseJson(text, name) as { format?: unknown } | null;
      if (head && typeof head === 'object' && !Array.isArray(head) && head.format === PROJECT_FORMAT) {
        return { type: 'project', name, sha256, size: bytes.length, project: readProject(text, name) };
      }
      return { type: 'table', name, sha256, size: bytes.length, table: toPlain(readTableJson(text, name)) };
    }
    const options = { ...(args.options ?? {}) };
    const cells = await readCells(name, bytes, options);
    await ctx.checkpoint();
    const s: OpenSheet = { id: `f${nextId++}`, name, bytes, sha256, options, ...cells };
    sheets.set(s.id, s);
    ctx.progress(1);
    return info(s);
  },

  /** Read an open file's cells again with other conventions (another sheet, delimiter, decimal mark). */
  'file-reread': async (args: { id: string; options: ReadConventions }): Promise<SheetInfo> => {
    const s = sheetOf(args.id);
    const options = { ...(args.options ?? {}) };
    const cells = await readCells(s.name, s.bytes, options);
    Object.assign(s, cells, { options });
    return info(s);
  },

  /** A window of cells for the preview grid. */
  'file-cells': (args: { id: string; top: number; left: number; rows: number; cols: number }): CellWindow => {
    const s = sheetOf(args.id);
    const g = s.grid;
    const top = Math.max(0, Math.floor(args.top || 0));
    const left = Math.max(0, Math.floor(args.left || 0));
    const rows = Math.min(Math.max(0, g.rowCount - top), Math.max(1, Math.min(500, Math.floor(args.rows || 1))));
    const cols = Math.min(Math.max(0, g.colCount - left), Math.max(1, Math.min(200, Math.floor(args.cols || 1))));
    const texts: string[][] = [];
    const kinds: number[][] = [];
    for (let r = top; r < top + rows; r++) {
      const t: string[] = [];
      const k: number[] = [];
      for (let c = left; c < left + cols; c++) {
        const kind = g.kind(r, c);
        k.push(kind);
        t.push(kind === 0 ? g.mergedText(r, c) : g.text(r, c));
      }
      texts.push(t);
      kinds.push(k);
    }
    return { top, left, texts, kinds, rowCount: g.rowCount, colCount: g.colCount };
  },

  /**
   * The layout src/io detects for an open sheet, with any part of a mapping given to override
   * the guesses (as the command line's --mapping). A layout that cannot be found is reported as
   * a problem, not an error, so the preview stays usable.
   */
  'file-detect': (args: { id: string; mapping?: MappingInput; kind?: LayoutMapping['kind'] }): DetectResult => {
    const s = sheetOf(args.id);
    try {
      const mapping = checkedMapping(args.mapping, s.name);
      const kind = args.kind ?? mapping?.kind ?? 'flows';
      const source = sourceOf(s, mapping);
      // detectLayout classifies make and use sheets too (src/io/assemble.ts classify), though its options type names flows and coefficients only.
      const r = detectLayout(source, { ...(mapping ? { mapping } : {}), kind: kind as 'flows' });
      // Rule coefficients-by-content, as on the command line: with no kind chosen yet, a sheet that
      // reads as technical coefficients (columns summing below 1, no output) is proposed so, with
      // the reader's reason as a note, instead of flows that fail their checks.
      if (args.kind === undefined && mapping?.kind === undefined) {
        const coefficients = coefficientsByContent(source, mapping);
        if (coefficients) {
          r.mapping.kind = 'coefficients';
          r.mapping.output = coefficients.mapping.output;
          r.findings.push(coefficients.note);
        }
      }
      if (s.sheet !== undefined) r.mapping.sheet = s.sheet;
      r.mapping.file = s.name;
      if (s.grid.conventions || s.conventions) r.mapping.conventions = { ...(s.grid.conventions ?? s.conventions) };
      return { mapping: r.mapping, findings: sortFindings(r.findings) };
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      return { findings: [], problem: errorOf(e) };
    }
  },

  /**
   * The fields of an open sheet read as a long file that a selection (`select` in the mapping)
   * could keep one text of: all but the code and value fields, with their distinct texts.
   */
  'file-long-fields': (args: { id: string; mapping?: MappingInput }): LongFields => {
    const s = sheetOf(args.id);
    const mapping = checkedMapping(args.mapping, s.name) ?? {};
    return longFields(s.grid, mapping, s.readFindings);
  },

  /** Read the table of an open sheet with the confirmed mapping. */
  'file-read': (args: { id: string; mapping?: MappingInput }, ctx): ReadResult => {
    const s = sheetOf(args.id);
    const mapping = checkedMapping(args.mapping, s.name);
    const kind = mapping?.kind === 'coefficients' ? 'coefficients' : 'flows';
    ctx.progress(0.1, 'reading the table');
    const r = readTable(sourceOf(s, mapping), { ...(mapping ? { mapping } : {}), kind });
    r.mapping.file = s.name;
    if (s.sheet !== undefined) r.mapping.sheet = s.sheet;
    if (!r.mapping.conventions) r.mapping.conventions = { ...s.conventions };
    ctx.progress(1);
    return { table: toPlain(r.table), mapping: r.mapping, findings: [...s.readFindings, ...r.findings] };
  },

  /**
   * Read make and use tables (two open sheets, or two sheets of one workbook opened twice) and
   * derive the symmetric table of the chosen kind for the views.
   */
  'file-read-supply-use': (
    args: { make: string; use: string; makeMapping?: MappingInput; useMapping?: MappingInput; kind: SymmetricKind; scrap?: string; technology?: Technology; blanks?: 'error' | 'zero' },
    ctx,
  ): SupplyUseResult => {
    const mk = sheetOf(args.make);
    const us = sheetOf(args.use);
    const makeMapping = checkedMapping(args.makeMapping, mk.name);
    const useMapping = checkedMapping(args.useMapping, us.name);
    ctx.progress(0.1, 'reading the make and use tables');
    const read = readSupplyUse(sourceOf(mk, makeMapping), sourceOf(us, useMapping), {
      ...(makeMapping ? { makeMapping } : {}),
      ...(useMapping ? { useMapping } : {}),
      ...(args.scrap ? { scrap: args.scrap } : {}),
      ...(args.technology ? { technology: args.technology } : {}),
      ...(args.blanks ? { blanks: args.blanks } : {}),
    });
    ctx.progress(0.5, 'deriving the symmetric table');
    const sym = symmetricFromSupplyUse(read, args.kind, args.technology ? { technology: args.technology } : {});
    for (const [m, s] of [
      [read.mappings.make, mk],
      [read.mappings.use, us],
    ] as const) {
      m.file = s.name;
      if (s.sheet !== undefined) m.sheet = s.sheet;
    }
    ctx.progress(1);
    return { table: sym.table, mapping: read.mappings.use, mappings: read.mappings, findings: [...mk.readFindings, ...us.readFindings, ...sym.findings] };
  },

  /** Forget open sheets (all when no id is given). */
  'file-close': (args: { id?: string }) => {
    if (args?.id) sheets.delete(args.id);
    else sheets.clear();
    return { open: sheets.size };
  },
};
