/**
 * The layout of a sheet as the preview grid shows it: which block each cell belongs to, from
 * src/io's layout mapping (titles, code and label columns and rows, header rows, the
 * intermediate square, final demand, value added, imports, totals, satellites, notes); and the
 * cell of the file a finding points at (from the reader's own cell, or from the block and
 * sector codes of a check through the mapping). Plain functions, testable without a browser.
 */
import { cellRef, columnLetters } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { LayoutMapping, MappedColumn, MappedRow } from '../../src/io/mapping';

export type Region =
  | 'title'
  | 'header'
  | 'note'
  | 'code'
  | 'label'
  | 'unit'
  | 'intermediate'
  | 'final-demand'
  | 'value-added'
  | 'imports'
  | 'total'
  | 'satellite'
  | 'ignore'
  | 'value'
  | '';

/** The blocks in words, for the legend and for screen readers. */
export const REGION_NAMES: Record<Exclude<Region, ''>, string> = {
  title: 'title rows',
  header: 'header rows',
  note: 'notes',
  code: 'codes',
  label: 'labels',
  unit: 'units',
  intermediate: 'intermediate square',
  'final-demand': 'final demand',
  'value-added': 'value added',
  imports: 'imports',
  total: 'totals and output',
  satellite: 'satellites',
  ignore: 'ignored',
  value: 'values (one cell per line)',
};

export interface RegionIndex {
  shape: 'wide' | 'long';
  rowRole: Map<number, MappedRow['role']>;
  colRole: Map<number, MappedColumn['role']>;
  titles: Set<number>;
  headers: Set<number>;
  notes: Set<number>;
  codeColumn: number | null;
  labelColumn: number | null;
  unitColumn: number | null;
  codeRow: number | null;
  labelRow: number | null;
  fields: { row?: number; col?: number; value?: number; header?: number | null };
}

/** Index a mapping once for many `regionOf` calls (rows and columns 1-based, as the mapping has them). */
export function regionIndex(m: LayoutMapping): RegionIndex {
  const ix: RegionIndex = {
    shape: m.shape,
    rowRole: new Map(),
    colRole: new Map(),
    titles: new Set(m.titleRows ?? []),
    headers: new Set(m.headerRows ?? []),
    notes: new Set(m.noteRows ?? []),
    codeColumn: m.codeColumn ?? null,
    labelColumn: m.labelColumn ?? null,
    unitColumn: m.unitColumn ?? null,
    codeRow: m.codeRow ?? null,
    labelRow: m.labelRow ?? null,
    fields: {},
  };
  if (m.shape === 'long') {
    if (m.rowCodeField !== undefined) ix.fields.row = m.rowCodeField;
    if (m.columnCodeField !== undefined) ix.fields.col = m.columnCodeField;
    if (m.valueField !== undefined) ix.fields.value = m.valueField;
    ix.fields.header = m.headerLine ?? null;
    return ix;
  }
  for (const r of m.rows) if (typeof r.row === 'number') ix.rowRole.set(r.row, r.role);
  for (const c of m.columns) if (typeof c.column === 'number') ix.colRole.set(c.column, c.role);
  return ix;
}

/** The block of the 1-based cell (row, column) under the mapping; '' for a cell outside every block. */
export function regionOf(ix: RegionIndex, row: number, column: number): Region {
  if (ix.shape === 'long') {
    if (ix.fields.header === row) return 'header';
    if (column === ix.fields.row || column === ix.fields.col) return 'code';
    if (column === ix.fields.value) return 'value';
    return '';
  }
  if (ix.titles.has(row)) return 'title';
  if (ix.notes.has(row)) return 'note';
  const rr = ix.rowRole.get(row);
  const cr = ix.colRole.get(column);
  if (column === ix.codeColumn && (rr !== undefined || row === ix.codeRow)) return 'code';
  if (column === ix.labelColumn && rr !== undefined) return 'label';
  if (column === ix.unitColumn && rr !== undefined) return 'unit';
  if (row === ix.codeRow && cr !== undefined) return 'code';
  if (row === ix.labelRow && cr !== undefined) return 'label';
  if (ix.headers.has(row) || row === ix.codeRow || row === ix.labelRow) return 'header';
  if (rr === undefined || cr === undefined) return '';
  if (rr === 'ignore' || cr === 'ignore') return 'ignore';
  if (rr === 'total' || rr === 'output' || cr === 'total' || cr === 'output') return 'total';
  if (rr === 'sector') return cr === 'sector' ? 'intermediate' : cr === 'final-demand' ? 'final-demand' : '';
  if (rr === 'value-added') return cr === 'sector' ? 'value-added' : '';
  if (rr === 'imports') return cr === 'sector' ? 'imports' : '';
  if (rr === 'satellite') return cr === 'sector' ? 'satellite' : '';
  return '';
}

/** A cell of the file, 1-based, with its A1 reference. */
export interface FileCell {
  file?: string;
  sheet?: string;
  row: number;
  column: number;
  cell: string;
}

/** Parse an A1 reference ('E14') to a 1-based row and column; undefined when it is not one. */
export function parseA1(ref: string): { row: number; column: number } | undefined {
  const m = /^\s*\$?([A-Za-z]{1,3})\$?(\d{1,7})\s*$/.exec(ref);
  if (!m) return undefined;
  let column = 0;
  for (const ch of m[1]!.toUpperCase()) column = column * 26 + (ch.charCodeAt(0) - 64);
  return { row: Number(m[2]), column };
}

export { cellRef, columnLetters };

/** What a table knows of its own axes, to turn a finding's block cell into codes. */
export interface AxesOf {
  sectors: { codes: string[] };
  finalDemand?: { codes: string[] };
  valueAdded?: { codes: string[] };
}

function rowOf(m: LayoutMapping, code: string | undefined, roles: MappedRow['role'][]): number | undefined {
  if (code === undefined) return undefined;
  return m.rows.find((r) => r.code === code && roles.includes(r.role))?.row;
}

function colOf(m: LayoutMapping, code: string | undefined, roles: MappedColumn['role'][]): number | undefined {
  if (code === undefined) return undefined;
  return m.columns.find((c) => c.code === code && roles.includes(c.role))?.column;
}

/**
 * The cell of the file a finding points at: the reader's own cell (`where.cell`, or row and
 * column), else the first of its block cells (`cells`) found through the mapping, else the code
 * cell of the sector it names. Undefined when it names no cell of this file.
 */
export function findingCell(f: Finding, m: LayoutMapping | null | undefined, axes?: AxesOf): FileCell | undefined {
  const w = f.where ?? {};
  const file = w.file ?? m?.file;
  const sheet = w.sheet ?? m?.sheet;
  const done = (row: number | undefined, column: number | undefined): FileCell | undefined => {
    if (!row || !column) return undefined;
    const out: FileCell = { row, column, cell: cellRef(row, column) };
    if (file !== undefined) out.file = file;
    if (sheet !== undefined) out.sheet = sheet;
    return out;
  };
  if (w.file && m?.file && w.file !== m.file) return undefined;
  if (w.cell) {
    const a = parseA1(w.cell);
    if (a) return done(a.row, a.column);
  }
  if (w.row !== undefined && w.column !== undefined) return done(w.row, w.column);
  if (!m || m.shape !== 'wide') return undefined;
  const s = axes?.sectors.codes ?? [];
  for (const c of f.cells ?? []) {
    let r: number | undefined;
    let k: number | undefined;
    switch (c.block) {
      case 'Z':
      case 'A':
        r = rowOf(m, s[c.row], ['sector']);
        k = colOf(m, s[c.col], ['sector']);
        break;
      case 'F':
        r = rowOf(m, s[c.row], ['sector']);
        k = colOf(m, axes?.finalDemand?.codes[c.col], ['final-demand']);
        break;
      case 'V':
        r = rowOf(m, axes?.valueAdded?.codes[c.row], ['value-added']);
        k = colOf(m, s[c.col], ['sector']);
        break;
      case 'imports':
        r = m.rows.find((x) => x.role === 'imports')?.row;
        k = colOf(m, s[c.row] ?? s[c.col], ['sector']);
        break;
      case 'satellite':
        r = rowOf(m, c.name, ['satellite']);
        k = colOf(m, s[c.row] ?? s[c.col], ['sector']);
        break;
      case 'x': {
        const out = m.output;
        if (out.from === 'column') {
          r = rowOf(m, s[c.row], ['sector']);
          k = colOf(m, out.code, ['output', 'total']);
        } else if (out.from === 'row') {
          r = rowOf(m, out.code, ['output', 'total']);
          k = colOf(m, s[c.row], ['sector']);
        }
        break;
      }
      default:
        break;
    }
    const hit = done(r, k);
    if (hit) return hit;
  }
  const sector = w.sector ?? w.sectors?.[0];
  if (sector !== undefined) {
    const r = rowOf(m, sector, ['sector']);
    if (r !== undefined && m.codeColumn) return done(r, m.codeColumn);
    const k = colOf(m, sector, ['sector']);
    if (k !== undefined && m.codeRow) return done(m.codeRow, k);
  }
  return undefined;
}

/** "file use.csv, sheet 'Use', cell E14" for a cell of a file. */
export function describeCell(c: FileCell): string {
  return [c.file ? `file ${c.file}` : '', c.sheet ? `sheet '${c.sheet}'` : '', `cell ${c.cell}`].filter(Boolean).join(', ');
}

/** Numbers listed as text ('1, 2, 5-7') → [1, 2, 5, 6, 7]; undefined when the text is not such a list. */
export function parseRowList(text: string): number[] | undefined {
  const t = text.trim();
  if (!t) return [];
  const out: number[] = [];
  for (const part of t.split(/[,;\s]+/).filter(Boolean)) {
    const m = /^(\d+)(?:\s*[-–]\s*(\d+))?$/.exec(part);
    if (!m) return undefined;
    const a = Number(m[1]);
    const b = m[2] === undefined ? a : Number(m[2]);
    if (a < 1 || b < a || b - a > 10_000) return undefined;
    for (let x = a; x <= b; x++) out.push(x);
  }
  return [...new Set(out)].sort((x, y) => x - y);
}

/** [1, 2, 5, 6, 7] → '1-2, 5-7'. */
export function rowListText(list: readonly number[] | undefined): string {
  if (!list?.length) return '';
  const s = [...list].sort((a, b) => a - b);
  const parts: string[] = [];
  let start = s[0]!;
  let prev = start;
  for (const x of [...s.slice(1), Number.NaN]) {
    if (x === prev + 1) {
      prev = x;
      continue;
    }
    parts.push(start === prev ? String(start) : `${start}-${prev}`);
    start = x;
    prev = x;
  }
  return parts.join(', ');
}
