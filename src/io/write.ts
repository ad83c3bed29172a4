/**
 * Writers: a table, or a plain matrix with row and column codes (such as total requirements),
 * as CSV, as an XLSX workbook of named sheets with number formats, or as JSON. What they write
 * the readers read back to the identical table (codes, labels, every number to the last bit,
 * units and metadata).
 *
 * The sheet layout of a table: metadata rows (`title`, `currency`, `scale`...: a key and a value),
 * then a row of codes headed `code`, `label`, `unit` (when there are satellites) and `role`, a
 * row of labels and a row of roles (`sector`, `final-demand`, `output`...), then the sector rows
 * (intermediate flows, final demand, total output `x`), the imports row, the value-added rows and
 * the satellite rows (with their units), and notes below. Text cells are neutralised (see
 * escape.ts); numbers are written in their shortest exact form.
 */
import { InputError } from '../../engine/errors';
import type { Matrix } from '../../engine/linalg/matrix';
import type { Axis, Table, TableMeta } from '../../engine/table';
import { toPlain } from '../../engine/table';
import { neutraliseText, protectText } from './escape';
import { type Cell, numberText } from './grid';
import { loadExcel } from './xlsx';

/** A matrix with its row and column axes (requirements, coefficients, any result by sector). */
export interface LabelledMatrix {
  rows: Axis;
  cols: Axis;
  matrix: Matrix;
  title?: string;
  /** One line saying what the numbers mean. */
  description?: string;
  notes?: string[];
}

export interface CsvWriteOptions {
  delimiter?: ',' | ';' | '\t';
  /** The decimal mark; ',' needs a delimiter other than ','. */
  decimal?: '.' | ',';
  lineEnding?: '\n' | '\r\n';
  /** Start with a UTF-8 byte-order mark (some spreadsheet programs need it to read accents). */
  bom?: boolean;
}

const META_ORDER: [keyof TableMeta, string][] = [
  ['title', 'title'],
  ['currency', 'currency'],
  ['scale', 'scale'],
  ['scaleLabel', 'scale label'],
  ['year', 'year'],
  ['region', 'region'],
  ['priceBasis', 'price basis'],
  ['source', 'source'],
  ['outputAssumed', 'output assumed'],
  ['rounding', 'rounded to'],
  ['invented', 'invented data'],
];

function metaRows(meta: TableMeta): Cell[][] {
  const rows: Cell[][] = [];
  for (const [k, name] of META_ORDER) {
    const v = meta[k];
    if (v === undefined) continue;
    rows.push([name, typeof v === 'boolean' ? String(v) : typeof v === 'number' ? v : String(v)]);
  }
  return rows;
}

function checkFinite(v: number, what: string, row: string, col: string): number {
  if (!Number.isFinite(v)) {
    throw new InputError('non-finite', `${what}: row '${row}', column '${col}' is ${v}, which cannot be written`, { rowLabel: row, columnLabel: col }, 'Check the table (checks reports non-finite values) before writing it');
  }
  return v;
}

/** The cells of a table in the sheet layout above. */
export function tableCells(t: Table): Cell[][] {
  const n = t.sectors.codes.length;
  const k = t.finalDemand.codes.length;
  const hasUnits = t.satellites.length > 0;
  const lead = hasUnits ? ['code', 'label', 'unit', 'role'] : ['code', 'label', 'role'];
  const L = lead.length;
  const blankLead = () => new Array<Cell>(L).fill(null);
  const rows: Cell[][] = metaRows(t.meta);
  rows.push([...lead, ...t.sectors.codes, ...t.finalDemand.codes, 'x']);
  rows.push([...blankLead(), ...t.sectors.labels, ...t.finalDemand.labels, 'Total output']);
  const roleRow = blankLead();
  roleRow[0] = 'role';
  rows.push([...roleRow, ...new Array<Cell>(n).fill('sector'), ...new Array<Cell>(k).fill('final-demand'), 'output']);
  const leadOf = (code: string, label: string, role: string, unit?: string): Cell[] => (hasUnits ? [code, label, unit ?? null, role] : [code, label, role]);
  for (let i = 0; i < n; i++) {
    const r = leadOf(t.sectors.codes[i]!, t.sectors.labels[i]!, 'sector');
    const code = t.sectors.codes[i]!;
    for (let j = 0; j < n; j++) r.push(checkFinite(t.Z.data[i * n + j]!, 'intermediate flows', code, t.sectors.codes[j]!));
    for (let j = 0; j < k; j++) r.push(checkFinite(t.F.data[i * k + j]!, 'final demand', code, t.finalDemand.codes[j]!));
    r.push(checkFinite(t.x[i]!, 'total output', code, 'x'));
    rows.push(r);
  }
  if (t.imports) {
    const r = leadOf('imports', 'Imports', 'imports');
    for (let j = 0; j < n; j++) r.push(checkFinite(t.imports[j]!, 'imports', 'imports', t.sectors.codes[j]!));
    rows.push(r);
  }
  for (let a = 0; a < t.valueAdded.codes.length; a++) {
    const r = leadOf(t.valueAdded.codes[a]!, t.valueAdded.labels[a]!, 'value-added');
    for (let j = 0; j < n; j++) r.push(checkFinite(t.V.data[a * n + j]!, 'value added', t.valueAdded.codes[a]!, t.sectors.codes[j]!));
    rows.push(r);
  }
  for (const s of t.satellites) {
    const r = leadOf(s.code, s.label, 'satellite', s.unit);
    for (let j = 0; j < n; j++) r.push(checkFinite(s.values[j]!, `satellite '${s.code}'`, s.code, t.sectors.codes[j]!));
    rows.push(r);
  }
  for (const note of t.meta.notes ?? []) rows.push(['note', note]);
  return rows;
}

/** The cells of a labelled matrix: title and description rows, a code row, a label row, then the rows. */
export function matrixCells(m: LabelledMatrix): Cell[][] {
  const rows: Cell[][] = [];
  if (m.title !== undefined) rows.push(['title', m.title]);
  if (m.description !== undefined) rows.push(['description', m.description]);
  rows.push(['code', 'label', ...m.cols.codes]);
  rows.push([null, null, ...m.cols.labels]);
  const { rows: R, cols: C, data } = m.matrix;
  if (R !== m.rows.codes.length || C !== m.cols.codes.length) {
    throw new InputError('bad-size', `the matrix is ${R} × ${C} but has ${m.rows.codes.length} row codes and ${m.cols.codes.length} column codes`);
  }
  for (let i = 0; i < R; i++) {
    const r: Cell[] = [m.rows.codes[i]!, m.rows.labels[i]!];
    for (let j = 0; j < C; j++) r.push(checkFinite(data[i * C + j]!, m.title ?? 'matrix', m.rows.codes[i]!, m.cols.codes[j]!));
    rows.push(r);
  }
  for (const note of m.notes ?? []) rows.push(['note', note]);
  return rows;
}

/** Cells to CSV text: texts neutralised and quoted where needed, numbers in their shortest exact form. */
export function cellsToCsv(rows: readonly (readonly Cell[])[], options: CsvWriteOptions = {}): string {
  const d = options.delimiter ?? ',';
  const dec = options.decimal ?? '.';
  if (dec === ',' && d === ',') throw new InputError('bad-option', "a decimal comma needs another delimiter, such as ';'");
  const eol = options.lineEnding ?? '\n';
  const needsQuote = new RegExp(`[${d === '\t' ? '\\t' : d}"\\r\\n]|^\\s|\\s$`);
  const out: string[] = [];
  for (const row of rows) {
    let last = row.length;
    while (last > 0 && (row[last - 1] === null || row[last - 1] === undefined || row[last - 1] === '')) last--;
    const cells: string[] = [];
    for (let j = 0; j < last; j++) {
      const c = row[j];
      if (c === null || c === undefined) cells.push('');
      else if (typeof c === 'number') {
        const s = c === 0 ? '0' : numberText(c);
        cells.push(dec === ',' ? s.replace('.', ',') : s);
      } else {
        const s = protectText(c, dec);
        cells.push(needsQuote.test(s) || looksNumeric(s) ? `"${s.replace(/"/g, '""')}"` : s);
      }
    }
    out.push(cells.join(d));
  }
  return (options.bom ? '\ufeff' : '') + out.join(eol) + eol;
}

/** Text that a reader would take for a number is quoted (it is still read as a number: quoting marks only the field). */
function looksNumeric(s: string): boolean {
  return /^[0-9.,\s]+$/.test(s) && /[0-9]/.test(s);
}

/** A table as CSV (the sheet layout above). */
export function writeTableCsv(t: Table, options: CsvWriteOptions = {}): string {
  return cellsToCsv(tableCells(t), options);
}

/** A labelled matrix as CSV. */
export function writeMatrixCsv(m: LabelledMatrix, options: CsvWriteOptions = {}): string {
  return cellsToCsv(matrixCells(m), options);
}

/** One sheet of a workbook. */
export interface SheetSpec {
  name: string;
  rows: Cell[][];
  /** An Excel number format for number cells, such as '#,##0.0' or '0.000000'. */
  numberFormat?: string;
  /** Rows and columns to keep in view (frozen). */
  freezeRows?: number;
  freezeColumns?: number;
  /** Column widths in characters. */
  widths?: number[];
  /** Also protect texts that would read back as numbers under another decimal mark (the table writers set it). */
  protectNumbers?: boolean;
}

const SHEET_NAME_BAD = /[\\/?*[\]:]/;

/** A workbook of named sheets, as XLSX bytes. Text cells are neutralised; numbers stay numbers. */
export async function writeWorkbook(sheets: SheetSpec[]): Promise<Uint8Array> {
  const ExcelJS = await loadExcel();
  const wb = new ExcelJS.Workbook();
  const names = new Set<string>();
  for (const s of sheets) {
    if (!s.name || s.name.length > 31 || SHEET_NAME_BAD.test(s.name)) {
      throw new InputError('bad-sheet-name', `the sheet name '${s.name}' cannot be used: a name has 1 to 31 characters and none of \\ / ? * [ ] :`);
    }
    if (names.has(s.name.toLowerCase())) throw new InputError('bad-sheet-name', `two sheets are named '${s.name}'`);
    names.add(s.name.toLowerCase());
    const views: Partial<import('exceljs').WorksheetView>[] = s.freezeRows || s.freezeColumns ? [{ state: 'frozen', xSplit: s.freezeColumns ?? 0, ySplit: s.freezeRows ?? 0 }] : [];
    const ws = wb.addWorksheet(s.name, { views: views as import('exceljs').WorksheetView[] });
    s.rows.forEach((row, i) => {
      const r = ws.getRow(i + 1);
      row.forEach((c, j) => {
        if (c === null || c === undefined || c === '') return;
        const cell = r.getCell(j + 1);
        if (typeof c === 'number') {
          cell.value = c === 0 ? 0 : c;
          if (s.numberFormat) cell.numFmt = s.numberFormat;
        } else cell.value = s.protectNumbers ? protectText(c, '.') : neutraliseText(c);
      });
    });
    s.widths?.forEach((w, j) => (ws.getColumn(j + 1).width = w));
  }
  const buf = await wb.xlsx.writeBuffer();
  return new Uint8Array(buf as ArrayBuffer);
}

export interface XlsxTableOptions {
  /** The sheet's name (default 'Table'). */
  sheet?: string;
  /** The number format of the flows (default '#,##0.0##'). */
  numberFormat?: string;
  /** Also a sheet of technical coefficients A = Z x̂⁻¹ (when outputs are not assumed). */
  coefficients?: boolean;
}

/** A table as an XLSX workbook: the table sheet (read back by the readers), and optionally its coefficients. */
export async function writeTableXlsx(t: Table, options: XlsxTableOptions = {}): Promise<Uint8Array> {
  const hasUnits = t.satellites.length > 0;
  const sheets: SheetSpec[] = [
    { name: options.sheet ?? 'Table', rows: tableCells(t), numberFormat: options.numberFormat ?? '#,##0.0##', freezeColumns: hasUnits ? 4 : 3, widths: [10, 36], protectNumbers: true },
  ];
  if (options.coefficients) {
    const n = t.sectors.codes.length;
    const data = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) data[i * n + j] = t.x[j]! > 0 ? t.Z.data[i * n + j]! / t.x[j]! : 0;
    sheets.push({
      name: 'Coefficients',
      rows: matrixCells({ rows: t.sectors, cols: t.sectors, matrix: { rows: n, cols: n, data }, title: 'Technical coefficients A', description: 'Input from each row sector per unit of output of each column sector (A = Z x̂⁻¹); fixed coefficients, no capacity limits' }),
      numberFormat: '0.000000',
      widths: [10, 36],
      protectNumbers: true,
    });
  }
  return writeWorkbook(sheets);
}

/** A labelled matrix as an XLSX workbook of one sheet. */
export async function writeMatrixXlsx(m: LabelledMatrix, options: { sheet?: string; numberFormat?: string } = {}): Promise<Uint8Array> {
  return writeWorkbook([{ name: options.sheet ?? 'Matrix', rows: matrixCells(m), numberFormat: options.numberFormat ?? '0.000000', widths: [10, 36], protectNumbers: true }]);
}

/** A table as JSON (its plain form, with a format marker). Numbers round-trip exactly. */
export function writeTableJson(t: Table, space?: number): string {
  checkTableFinite(t);
  return JSON.stringify({ format: 'ripplewise-table', version: 1, table: toPlain(t) }, null, space);
}

/** A labelled matrix as JSON. */
export function writeMatrixJson(m: LabelledMatrix, space?: number): string {
  const rows: number[][] = [];
  const { rows: R, cols: C, data } = m.matrix;
  for (let i = 0; i < R; i++) {
    const r: number[] = [];
    for (let j = 0; j < C; j++) r.push(checkFinite(data[i * C + j]!, m.title ?? 'matrix', m.rows.codes[i] ?? String(i), m.cols.codes[j] ?? String(j)));
    rows.push(r);
  }
  const o: Record<string, unknown> = { format: 'ripplewise-matrix', version: 1 };
  if (m.title !== undefined) o.title = m.title;
  if (m.description !== undefined) o.description = m.description;
  o.rows = m.rows;
  o.cols = m.cols;
  o.values = rows;
  if (m.notes) o.notes = m.notes;
  return JSON.stringify(o, null, space);
}

function checkTableFinite(t: Table): void {
  const n = t.sectors.codes.length;
  const k = t.finalDemand.codes.length;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) checkFinite(t.Z.data[i * n + j]!, 'intermediate flows', t.sectors.codes[i]!, t.sectors.codes[j]!);
    for (let j = 0; j < k; j++) checkFinite(t.F.data[i * k + j]!, 'final demand', t.sectors.codes[i]!, t.finalDemand.codes[j]!);
    checkFinite(t.x[i]!, 'total output', t.sectors.codes[i]!, 'x');
  }
  for (let a = 0; a < t.valueAdded.codes.length; a++) for (let j = 0; j < n; j++) checkFinite(t.V.data[a * n + j]!, 'value added', t.valueAdded.codes[a]!, t.sectors.codes[j]!);
  if (t.imports) for (let j = 0; j < n; j++) checkFinite(t.imports[j]!, 'imports', 'imports', t.sectors.codes[j]!);
  for (const s of t.satellites) for (let j = 0; j < n; j++) checkFinite(s.values[j]!, `satellite '${s.code}'`, s.code, t.sectors.codes[j]!);
}
