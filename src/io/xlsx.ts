/**
 * XLSX workbooks to a grid, with exceljs (loaded only when a workbook is opened, so that a web
 * bundle carries it in a separate chunk).
 *
 * A sheet is chosen by name or by 1-based index (default: the first sheet with cells). Formula
 * cells give their saved values; a formula with no saved value reads as its text (`=SUM(...)`)
 * so that a data cell holding one is reported. Merged cells keep their value in the top-left
 * cell and are listed as merges. Numbers stored as text are read as numbers (under the decimal
 * convention, found or given, as in CSV files); codes keep their text, with stray and
 * non-breaking spaces removed when compared.
 */
import { chooseSheet } from './sheet-choice';
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import { whereAt } from './csv';
import { restoreText } from './escape';
import { Grid, GridBuilder, type MergeRange } from './grid';
import { checkBytes, type Limits, limitsOf, tooManyCells } from './limits';
import { type NumberConventions, type NumberOptions, NumberReader } from './numbers';
import { checkZipSizes, verifyZipSizes, zipEntries } from './zip-guard';

export interface XlsxOptions extends NumberOptions {
  /** The file name, for messages. */
  file: string;
  /** A sheet name, or a 1-based index. */
  sheet?: string | number;
  limits?: Limits;
}

export interface XlsxRead {
  grid: Grid;
  /** The names of every sheet in the workbook. */
  sheets: string[];
  /** The sheet read. */
  sheet: string;
  conventions: NumberConventions;
  findings: Finding[];
}

type ExcelModule = typeof import('exceljs');

let excel: Promise<ExcelModule> | undefined;

/** exceljs, imported on first use. */
export function loadExcel(): Promise<ExcelModule> {
  excel ??= import('exceljs').then((m) => ((m as unknown as { default?: ExcelModule }).default ?? m) as ExcelModule);
  return excel;
}

/** Check the archive against the limits, then open it with exceljs. */
export async function openWorkbook(bytes: Uint8Array, file: string, limitsIn?: Limits): Promise<import('exceljs').Workbook> {
  const limits = limitsOf(limitsIn);
  checkBytes(bytes.length, limits.maxXlsxBytes, file, 'maxXlsxBytes');
  const entries = zipEntries(bytes, file);
  checkZipSizes(entries, file, limits);
  await verifyZipSizes(bytes, entries, file);
  if (!entries.some((e) => /^xl\/workbook\.xml$/i.test(e.name))) {
    throw new InputError('not-xlsx', `file ${file} is a zip archive but not an XLSX workbook (it has no xl/workbook.xml)`, { file }, 'Give an .xlsx workbook, or read the file as CSV');
  }
  const ExcelJS = await loadExcel();
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(bytes as unknown as Parameters<typeof wb.xlsx.load>[0]);
  } catch (e) {
    throw new InputError('bad-xlsx', `file ${file} could not be opened as an XLSX workbook: ${(e as Error).message}`, { file }, 'Open it in a spreadsheet program and save it again as .xlsx, or export the sheet as CSV');
  }
  return wb;
}

/** How many of a sheet's first 200 rows hold at least two numbers (stops counting at 2). */
function numericRows(w: import('exceljs').Worksheet): number {
  let rows = 0;
  const last = Math.min(w.actualRowCount ? w.rowCount : 0, 200);
  for (let r = 1; r <= last && rows < 2; r++) {
    let nums = 0;
    w.getRow(r).eachCell((cell) => {
      const v = cell.value as unknown;
      const x = v && typeof v === 'object' && 'result' in (v as object) ? (v as { result: unknown }).result : v;
      // Numbers stored as text count too, with any thousands separator ('1 234,5', '1’234').
      if (typeof x === 'number' || (typeof x === 'string' && /^\s*[-+\u2212]?\d[\d.,'\u2019 \u00a0\u202f\u2009]*\s*$/.test(x))) nums++;
    });
    if (nums >= 2) rows++;
  }
  return rows;
}

/** Read one sheet of an XLSX workbook into a grid. */
export async function readXlsx(bytes: Uint8Array, options: XlsxOptions): Promise<XlsxRead> {
  const { file } = options;
  if (bytes.length === 0) throw new InputError('empty-file', `file ${file} is empty`, { file }, 'Give a file with a table in it');
  const limits = limitsOf(options.limits);
  const wb = await openWorkbook(bytes, file, options.limits);
  const sheets = wb.worksheets.map((w) => w.name);
  const findings: Finding[] = [];
  let ws: import('exceljs').Worksheet | undefined;
  const want = options.sheet;
  if (want === undefined) {
    // The first sheet that looks like a table (rows with several numbers), else the first with cells:
    // agency workbooks often open with a contents or notes sheet.
    // By content first (sheet-choice.ts): the sheet whose header row and lead column share most codes.
    const chosen = wb.worksheets.length > 1 ? chooseSheet(wb.worksheets) : undefined;
    const tabular = chosen?.sheet ?? wb.worksheets.find((w) => numericRows(w) >= 2);
    ws = tabular ?? wb.worksheets.find((w) => w.actualRowCount > 0) ?? wb.worksheets[0];
    const others = wb.worksheets.filter((w) => w !== ws && w.actualRowCount > 0).map((w) => w.name);
    if (chosen && others.length) {
      findings.push({ code: 'sheet-chosen', severity: 'note', message: `file ${file}: read sheet '${chosen.sheet.name}': ${chosen.why}; other candidates: ${chosen.others.map((o) => `'${o.name}' (${o.codes} codes${o.kind !== 'flows' ? `, named as ${o.kind}` : ''})`).join(', ') || 'none'}; the workbook also has ${others.map((s) => `'${s}'`).join(', ')} (choose one with sheet)`, where: { file, sheet: chosen.sheet.name }, data: { candidates: chosen.others.map((o) => o.name) } });
    } else if (ws && others.length) {
      findings.push({ code: 'sheet-chosen', severity: 'note', message: `file ${file}: read sheet '${ws.name}', the first ${tabular ? 'that holds a table of numbers' : 'with cells'}; the workbook also has ${others.map((s) => `'${s}'`).join(', ')} (choose one with sheet)`, where: { file, sheet: ws.name } });
    }
  } else if (typeof want === 'number') {
    if (!Number.isInteger(want) || want < 1 || want > wb.worksheets.length) {
      throw new InputError('unknown-sheet', `file ${file} has no sheet ${want}; it has ${wb.worksheets.length} sheet${wb.worksheets.length === 1 ? '' : 's'}: ${sheets.map((s) => `'${s}'`).join(', ')}`, { file }, 'Give a sheet number from 1, or a sheet name');
    }
    ws = wb.worksheets[want - 1];
  } else {
    const norm = (s: string) => s.trim().toLowerCase();
    ws = wb.worksheets.find((w) => w.name === want) ?? wb.worksheets.find((w) => norm(w.name) === norm(want));
    if (!ws) throw new InputError('unknown-sheet', `file ${file} has no sheet '${want}'; its sheets are ${sheets.map((s) => `'${s}'`).join(', ')}`, { file }, 'Give one of those names, or a sheet number from 1');
  }
  if (!ws) throw new InputError('empty-file', `file ${file} has no sheets`, { file });
  const sheet = ws.name;
  const numbers = new NumberReader(options, (r, c, text) => ({ ...whereAt(file, r, c, text), sheet }));
  const builder = new GridBuilder(limits.maxCells, () => tooManyCells(file, limits.maxCells));
  const pendingAt: { r: number; c: number }[] = [];
  const cells: (string | number | null)[] = [];
  const ExcelJS = await loadExcel();
  const MERGE = ExcelJS.ValueType.Merge;
  const last = ws.rowCount;
  for (let r = 1; r <= last; r++) {
    const row = ws.findRow(r);
    cells.length = 0;
    if (row) {
      row.eachCell({ includeEmpty: false }, (cell, c) => {
        while (cells.length < c - 1) cells.push(null);
        cells.push(cell.type === MERGE ? null : cellValue(cell.value));
      });
    }
    for (let c = 0; c < cells.length; c++) {
      const v = cells[c];
      if (v === null || v === undefined) builder.empty();
      else if (typeof v === 'number') {
        if (Number.isFinite(v)) builder.number(v);
        else builder.text(String(v));
      } else {
        const t = v.trim();
        if (!t) {
          builder.empty();
          continue;
        }
        const n = t.startsWith('=') ? NaN : numbers.read(t, r - 1, c);
        if (n === NumberReader.PENDING) {
          pendingAt.push({ r: r - 1, c });
          builder.text(v);
        } else if (Number.isNaN(n)) builder.text(restoreText(v));
        else builder.number(n, v);
      }
    }
    builder.endRow();
  }
  const rows = builder.rows;
  for (const { cell, value } of numbers.settle()) {
    if (!Number.isNaN(value)) GridBuilder.patch(rows[cell.row]!, cell.col, value, cell.text);
  }
  const merges: MergeRange[] = [];
  for (const m of (ws.model as { merges?: string[] }).merges ?? []) {
    const range = parseRange(m);
    if (range) merges.push(range);
  }
  const grid = new Grid(file, rows, sheet, merges);
  grid.conventions = { ...numbers.conventions() };
  if (grid.rowCount === 0) throw new InputError('empty-file', `file ${file}, sheet '${sheet}' has no cells`, { file, sheet }, sheets.length > 1 ? `Choose another sheet: ${sheets.map((s) => `'${s}'`).join(', ')}` : 'Give a sheet with a table in it');
  return { grid, sheets, sheet, conventions: numbers.conventions(), findings };
}

/** A cell's value as a number or a text (formulas give their saved result). */
function cellValue(v: unknown): string | number | null {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string') return v;
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  if (v instanceof Date) return Number.isNaN(v.getTime()) ? null : v.toISOString().slice(0, 10);
  if (typeof v === 'object') {
    const o = v as Record<string, unknown>;
    if ('formula' in o || 'sharedFormula' in o) {
      if (o.result === undefined || o.result === null) return `=${String(o.formula ?? o.sharedFormula ?? '')}`;
      return cellValue(o.result);
    }
    if ('error' in o) return String(o.error);
    if ('richText' in o && Array.isArray(o.richText)) return (o.richText as { text: string }[]).map((t) => t.text).join('');
    if ('text' in o) return cellValue(o.text);
  }
  return String(v);
}

/** 'EJ5:EN5' to a 0-based range. */
export function parseRange(s: string): MergeRange | undefined {
  const m = /^\$?([A-Z]+)\$?(\d+)(?::\$?([A-Z]+)\$?(\d+))?$/i.exec(s.trim());
  if (!m) return undefined;
  const col = (t: string) => [...t.toUpperCase()].reduce((a, ch) => a * 26 + ch.charCodeAt(0) - 64, 0) - 1;
  const top = Number(m[2]) - 1;
  const left = col(m[1]!);
  const bottom = m[4] ? Number(m[4]) - 1 : top;
  const right = m[3] ? col(m[3]) : left;
  return { top: Math.min(top, bottom), left: Math.min(left, right), bottom: Math.max(top, bottom), right: Math.max(left, right) };
}
