/**
 * The report laid out as sheets of rows, shared by the XLSX and CSV writers: a summary, one
 * sheet per group of sections (impacts, multipliers, linkages...), the inputs used and the notes.
 *
 * Text cells stay as they are here; the writers neutralise them (src/io's `neutraliseText`:
 * the XLSX writer as it sets each text cell, the CSV writer through src/io's `cellsToCsv`).
 * Numbers stay numbers, so a negative impact is a negative number, never text.
 */
import { headerWithUnit, shownColumns, singleColumn, xlsxNumberFormat } from './format';
import type { Cell, Column, Report, ReportTable, Section } from './model';
import { failureLines } from './model';

export type RowKind = 'title' | 'heading' | 'about' | 'header' | 'data' | 'total' | 'note' | 'key' | 'blank';

export interface LayoutCell {
  value: string | number | null;
  /** A spreadsheet number format, for number cells. */
  numFmt?: string;
}

export interface LayoutRow {
  kind: RowKind;
  cells: LayoutCell[];
  /** The table the row belongs to (data, header and total rows). */
  table?: string;
}

export interface SheetLayout {
  name: string;
  rows: LayoutRow[];
  /** Suggested column widths in characters. */
  widths: number[];
}

/** A text cell (neutralised by the writer). */
export function textCell(s: string): LayoutCell {
  return { value: s };
}

function cell(v: Cell, c: Column | undefined): LayoutCell {
  if (v === null) return { value: null };
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) return { value: null };
    return c && c.type === 'number' ? { value: v, numFmt: xlsxNumberFormat(c) } : { value: v };
  }
  return textCell(v);
}

const row = (kind: RowKind, ...values: (string | number | null)[]): LayoutRow => ({
  kind,
  cells: values.map((v) => (typeof v === 'string' ? textCell(v) : { value: v })),
});

const blank = (): LayoutRow => ({ kind: 'blank', cells: [] });

/** A table of the model as rows: title, about, header (labels with units), data, totals, notes. */
export function tableRows(t: ReportTable): LayoutRow[] {
  const out: LayoutRow[] = [row('heading', t.title)];
  if (t.about) out.push(row('about', t.about));
  out.push({ kind: 'header', table: t.id, cells: t.columns.map((c) => textCell(headerWithUnit(c))) });
  const cols = shownColumns(t);
  for (const r of t.rows) out.push({ kind: 'data', table: t.id, cells: r.map((v, i) => cell(v, cols[i])) });
  if (t.totals) out.push({ kind: 'total', table: t.id, cells: t.totals.map((v, i) => cell(v, cols[i])) });
  for (const n of t.notes) out.push(row('note', n));
  out.push(blank());
  return out;
}

function sectionRows(s: Section): LayoutRow[] {
  const out: LayoutRow[] = [row('title', s.title), row('about', s.about)];
  for (const p of s.paragraphs) out.push(row('note', p));
  out.push(blank());
  for (const t of s.tables) out.push(...tableRows(t));
  for (const c of s.cautions) out.push(row('note', c));
  if (s.cautions.length) out.push(blank());
  return out;
}

/** Sheet names: at most 31 characters, none of []:*?/\ , unique. */
function sheetName(name: string, used: Set<string>): string {
  const base = name.replace(/[[\]:*?/\\]/g, ' ').trim().slice(0, 31) || 'Sheet';
  let n = base;
  for (let k = 2; used.has(n.toLowerCase()); k++) n = `${base.slice(0, 28)} ${k}`;
  used.add(n.toLowerCase());
  return n;
}

/** The report as sheets: Summary, the sections' sheets in order, Inputs, Notes. */
export function reportSheets(r: Report): SheetLayout[] {
  const used = new Set<string>();
  const summary: LayoutRow[] = [row('title', r.title)];
  if (r.subtitle) summary.push(row('about', r.subtitle));
  for (const line of failureLines(r)) summary.push(row('note', line));
  if (r.invented) summary.push(row('note', 'INVENTED DATA: every number in this report comes from an invented table. Do not use it for any decision.'));
  summary.push(
    row('key', 'Made', r.createdAt),
    row('key', 'Tool', `${r.tool.name} ${r.tool.version}`),
    row('key', 'Report format', `${r.format} version ${r.version}`),
    row('key', 'Invented data', r.invented ? 'yes' : 'no'),
    row('key', 'Table', r.table.title),
    row('key', 'Region', r.table.region ?? ''),
    row('key', 'Year', r.table.year ?? null),
    row('key', 'Money unit (currency and scale)', r.table.moneyUnit),
    row('key', 'Price basis', r.table.priceBasis ?? ''),
    row('key', 'Source', r.table.source ?? ''),
    row('key', 'Sectors', r.table.sectors),
    blank(),
  );
  if (r.headlines.length) {
    summary.push(row('heading', 'Headline results'), { kind: 'header', table: 'headlines', cells: ['Result', 'Value', 'Unit'].map(textCell) });
    for (const h of r.headlines) {
      summary.push({ kind: 'data', table: 'headlines', cells: [textCell(h.label), cell(h.value, singleColumn(h.style, h.value)), textCell(h.unit)] });
    }
    summary.push(blank());
  }
  for (const s of r.sections.filter((x) => x.sheet === 'Summary')) summary.push(...sectionRows(s));
  summary.push(row('heading', 'Read this first'));
  for (const c of r.cautions) summary.push(row('note', c));
  const sheets: SheetLayout[] = [{ name: sheetName('Summary', used), rows: summary, widths: [44, 22, 18, 16, 16, 16, 16] }];
  const order: string[] = [];
  for (const s of r.sections) if (s.sheet !== 'Summary' && !order.includes(s.sheet)) order.push(s.sheet);
  for (const name of order) {
    const rows = r.sections.filter((s) => s.sheet === name).flatMap(sectionRows);
    const cols = Math.max(2, ...r.sections.filter((s) => s.sheet === name).flatMap((s) => s.tables.map((t) => t.columns.length)));
    sheets.push({ name: sheetName(name, used), rows, widths: [12, 40, ...Array<number>(Math.max(0, cols - 2)).fill(16)] });
  }
  const inputs: LayoutRow[] = [row('title', 'Inputs and settings'), blank(), row('heading', 'Input files'), { kind: 'header', table: 'inputs', cells: ['Role', 'File', 'Sheet', 'Bytes', 'SHA-256'].map(textCell) }];
  for (const f of r.inputs) inputs.push({ kind: 'data', table: 'inputs', cells: [textCell(f.role), textCell(f.name), textCell(f.sheet ?? ''), { value: f.bytes ?? null, numFmt: '#,##0' }, textCell(f.sha256)] });
  inputs.push(blank(), row('heading', 'Settings'), { kind: 'header', table: 'settings', cells: ['Setting', 'Value', 'Chosen by', 'Note'].map(textCell) });
  for (const s of r.settings) {
    const v: LayoutCell = typeof s.value === 'number' ? { value: s.value } : textCell(s.value === null ? 'none' : String(s.value));
    inputs.push({ kind: 'data', table: 'settings', cells: [textCell(s.label), v, textCell(s.source === 'guessed' ? 'guessed from labels' : s.source), textCell(s.note ?? '')] });
  }
  inputs.push(blank(), row('heading', 'The table'));
  const t = r.table;
  inputs.push(
    row('key', 'Final-demand columns', t.finalDemand.map((x) => `${x.code} (${x.label})`).join(', ')),
    row('key', 'Value-added rows', t.valueAdded.map((x) => `${x.code} (${x.label})`).join(', ')),
    row('key', 'Satellites', t.satellites.map((x) => `${x.code} (${x.label}, ${x.unit})`).join(', ')),
    row('key', 'Imports row', t.hasImports ? 'yes' : 'no'),
  );
  for (const n of t.notes) inputs.push(row('note', n));
  sheets.push({ name: sheetName('Inputs', used), rows: inputs, widths: [30, 36, 14, 12, 68] });
  const notes: LayoutRow[] = [row('title', 'Assumptions, cautions, findings and notes'), blank(), row('heading', 'Assumptions')];
  for (const a of r.assumptions) notes.push(row('note', a));
  notes.push(blank(), row('heading', 'Cautions'));
  for (const c of r.cautions) notes.push(row('note', c));
  notes.push(blank(), row('heading', 'Findings'), { kind: 'header', table: 'findings', cells: ['Severity', 'Code', 'Finding', 'Where'].map(textCell) });
  for (const f of r.findings) notes.push({ kind: 'data', table: 'findings', cells: [textCell(f.severity), textCell(f.code), textCell(f.message), textCell(f.where ?? '')] });
  if (r.notes.length) {
    notes.push(blank(), row('heading', 'Notes'));
    for (const n of r.notes) notes.push(row('note', n));
  }
  sheets.push({ name: sheetName('Notes', used), rows: notes, widths: [100, 24, 80, 30] });
  return sheets;
}
