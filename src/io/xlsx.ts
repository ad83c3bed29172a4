/**
 * XLSX workbooks to a grid, with a streaming reader of our own: the zip's directory is read and
 * held to the limits (zip-guard.ts), then only the parts needed are inflated (fflate), in slices:
 * the workbook and its relationships, the shared strings, the styles (to tell dates), and the one
 * sheet asked for. The sheet's XML is scanned as it inflates, cell by cell, straight into the
 * grid's typed rows, counting cells against the limit, so a sheet of hundreds of megabytes never
 * becomes one string. exceljs stays for writing (`loadExcel`) and for callers of `openWorkbook`.
 *
 * A sheet is chosen by name or by 1-based index (default: by content, sheet-choice.ts, over each
 * sheet's first 400 rows; else the first that holds a table of numbers, else the first with cells). Formula cells give their saved values,
 * with a `formula-cells` note giving their count; a formula with no saved value reads as its
 * text (`=SUM(...)`) so that a data cell holding one is reported. Merged cells keep their value
 * in the top-left cell and are listed as merges. Numbers stored as text are read as numbers
 * (under the decimal convention, found or given, as in CSV files); codes keep their text, with
 * stray and non-breaking spaces removed when compared. Numbers in a date format read as ISO
 * dates (`2019-12-31`).
 *
 * `xlsxSheets(bytes, file)` lists the sheets cheaply (names, hidden or not) and
 * `readXlsx(bytes, { file, sheet, maxRows })` reads just a sheet's first rows: together they are
 * the cheap way to choose a sheet by its content.
 */
import { BODY_ROWS, chooseSheet } from './sheet-choice';
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import { whereAt } from './csv';
import { restoreText } from './escape';
import { EMPTY, Grid, GridBuilder, type GridRow, type MergeRange, NUMBER, TEXT } from './grid';
import { checkBytes, type Limits, limitsOf, tooManyCells } from './limits';
import { type NumberConventions, type NumberOptions, NumberReader } from './numbers';
import { checkZipSizes, inflatePart, STOP_PART, type ZipEntry, zipEntries } from './zip-guard';

export interface XlsxOptions extends NumberOptions {
  /** The file name, for messages. */
  file: string;
  /** A sheet name, or a 1-based index. */
  sheet?: string | number;
  limits?: Limits;
  /** Read only the first this many rows of the sheet (to look at a sheet before choosing it). */
  maxRows?: number;
}

export interface XlsxRead {
  grid: Grid;
  /** The names of every sheet in the workbook. */
  sheets: string[];
  /** The sheet read. */
  sheet: string;
  conventions: NumberConventions;
  findings: Finding[];
  /** How many cells of the sheet read hold a formula (their saved values were read). */
  formulas: number;
}

type ExcelModule = typeof import('exceljs');

let excel: Promise<ExcelModule> | undefined;

/** exceljs, imported on first use. */
export function loadExcel(): Promise<ExcelModule> {
  excel ??= import('exceljs').then((m) => ((m as unknown as { default?: ExcelModule }).default ?? m) as ExcelModule);
  return excel;
}

/** Check the archive against the limits, then open it with exceljs (whole: prefer readXlsx to read a sheet). */
export async function openWorkbook(bytes: Uint8Array, file: string, limitsIn?: Limits): Promise<import('exceljs').Workbook> {
  openPackage(bytes, file, limitsIn);
  const ExcelJS = await loadExcel();
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(bytes as unknown as Parameters<typeof wb.xlsx.load>[0]);
  } catch (e) {
    throw new InputError('bad-xlsx', `file ${file} could not be opened as an XLSX workbook: ${(e as Error).message}`, { file }, 'Open it in a spreadsheet program and save it again as .xlsx, or export the sheet as CSV');
  }
  return wb;
}

// ---------------------------------------------------------------------------------------------
// The package: zip directory, workbook, relationships, shared strings, styles.

export interface XlsxSheetInfo {
  /** The sheet's name as the workbook gives it. */
  name: string;
  /** 1-based position among the worksheets. */
  index: number;
  /** Hidden or very hidden in the workbook. */
  hidden: boolean;
  /** The part holding its XML. */
  part: string;
  /** Its XML's size in bytes, as the zip declares it. */
  bytes: number;
}

interface Package {
  bytes: Uint8Array;
  file: string;
  entries: Map<string, ZipEntry>;
  sheets: XlsxSheetInfo[];
  workbookPart: string;
  date1904: boolean;
}

function badXlsx(file: string, what: string): InputError {
  return new InputError('bad-xlsx', `file ${file} could not be opened as an XLSX workbook: ${what}`, { file }, 'Open it in a spreadsheet program and save it again as .xlsx, or export the sheet as CSV');
}


/** A small part as text (the workbook, relationships, styles). */
function partText(pkg: { bytes: Uint8Array; file: string; entries: Map<string, ZipEntry> }, name: string): string | undefined {
  const e = pkg.entries.get(name.toLowerCase());
  if (!e) return undefined;
  const chunks: string[] = [];
  const dec = new TextDecoder('utf-8');
  inflatePart(pkg.bytes, e, pkg.file, (c) => void chunks.push(dec.decode(c, { stream: true })));
  chunks.push(dec.decode());
  return chunks.join('');
}

const ATTR = /([\w:.-]+)\s*=\s*(?:"([^"]*)"|'([^']*)')/g;

/** The attributes of a start tag's text, local names (prefixes dropped, except xmlns). */
function attrsOf(s: string): Record<string, string> {
  const out: Record<string, string> = {};
  ATTR.lastIndex = 0;
  for (let m = ATTR.exec(s); m; m = ATTR.exec(s)) {
    const k = m[1]!;
    const local = k.includes(':') && !k.startsWith('xmlns') ? k.slice(k.indexOf(':') + 1) : k;
    out[local] = unescapeXml(m[2] ?? m[3] ?? '');
  }
  return out;
}

/** Every start tag of a local name in a small part (its attribute texts). */
function tagsOf(xml: string, local: string): Record<string, string>[] {
  const re = new RegExp(`<(?:[\\w.-]+:)?${local}\\b([^>]*)>`, 'g');
  const out: Record<string, string>[] = [];
  for (let m = re.exec(xml); m; m = re.exec(xml)) out.push(attrsOf(m[1]!));
  return out;
}

/** A path inside the package, relative to the folder of `from`. */
function resolvePart(from: string, target: string): string {
  if (target.startsWith('/')) return target.slice(1);
  const parts = from.split('/').slice(0, -1);
  for (const seg of target.split('/')) {
    if (seg === '..') parts.pop();
    else if (seg !== '.' && seg !== '') parts.push(seg);
  }
  return parts.join('/');
}

function relsPath(part: string): string {
  const i = part.lastIndexOf('/');
  return `${part.slice(0, i + 1)}_rels/${part.slice(i + 1)}.rels`;
}

function openPackage(bytes: Uint8Array, file: string, limitsIn?: Limits): Package {
  const limits = limitsOf(limitsIn);
  checkBytes(bytes.length, limits.maxXlsxBytes, file, 'maxXlsxBytes');
  const list = zipEntries(bytes, file);
  checkZipSizes(list, file, limits);
  const entries = new Map<string, ZipEntry>();
  for (const e of list) entries.set(e.name.toLowerCase(), e);
  const base = { bytes, file, entries };
  // The workbook part: named by the package's relationships (officeDocument), else the usual place.
  let workbookPart = 'xl/workbook.xml';
  const root = partText(base, '_rels/.rels');
  if (root) {
    const doc = tagsOf(root, 'Relationship').find((r) => /\/officeDocument$/.test(r.Type ?? '') && r.Target);
    if (doc && entries.has(resolvePart('', doc.Target!).toLowerCase())) workbookPart = resolvePart('', doc.Target!);
  }
  const wbXml = partText(base, workbookPart);
  if (wbXml === undefined) {
    throw new InputError('not-xlsx', `file ${file} is a zip archive but not an XLSX workbook (it has no xl/workbook.xml)`, { file }, 'Give an .xlsx workbook, or read the file as CSV');
  }
  const rels = new Map<string, { target: string; type: string }>();
  for (const r of tagsOf(partText(base, relsPath(workbookPart)) ?? '', 'Relationship')) {
    if (r.Id && r.Target) rels.set(r.Id, { target: resolvePart(workbookPart, r.Target), type: r.Type ?? '' });
  }
  const sheets: XlsxSheetInfo[] = [];
  for (const s of tagsOf(wbXml, 'sheet')) {
    const rel = rels.get(s.id ?? '');
    if (!rel || /chartsheet|dialogsheet/i.test(rel.type)) continue;
    const e = entries.get(rel.target.toLowerCase());
    if (!e) continue;
    sheets.push({ name: s.name ?? `Sheet${sheets.length + 1}`, index: sheets.length + 1, hidden: s.state === 'hidden' || s.state === 'veryHidden', part: e.name, bytes: e.size });
  }
  const pr = tagsOf(wbXml, 'workbookPr')[0];
  const date1904 = pr?.date1904 === '1' || pr?.date1904 === 'true';
  return { bytes, file, entries, sheets, workbookPart, date1904 };
}

/** The sheets of a workbook, read from its directory and workbook part only (no sheet is inflated). */
export function xlsxSheets(bytes: Uint8Array, file: string, limits?: Limits): XlsxSheetInfo[] {
  return openPackage(bytes, file, limits).sheets;
}

const ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

/** XML entities and character references, then OOXML's `_xHHHH_` escapes. */
export function unescapeXml(s: string): string {
  // Line ends as an XML parser gives them (XML 1.0, 2.11): CR LF and a lone CR become LF.
  if (s.indexOf('\r') >= 0) s = s.replace(/\r\n?/g, '\n');
  if (s.indexOf('&') >= 0) {
    s = s.replace(/&(#x[0-9a-fA-F]+|#\d+|\w+);/g, (m, e: string) => {
      if (e[0] === '#') {
        const cp = e[1] === 'x' ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10);
        return cp >= 0 && cp <= 0x10ffff ? String.fromCodePoint(cp) : m;
      }
      return ENTITIES[e] ?? m;
    });
  }
  if (s.indexOf('_x') >= 0) s = s.replace(/_x([0-9a-fA-F]{4})_/g, (_m, h: string) => String.fromCharCode(parseInt(h, 16)));
  return s;
}

/** The text of a rich or plain string element's content: its `<t>` runs, phonetic runs left out. */
function stringText(inner: string): string {
  if (inner.indexOf('<') < 0) return unescapeXml(inner);
  let s = inner;
  if (s.indexOf('rPh') >= 0) s = s.replace(/<(?:[\w.-]+:)?rPh\b[\s\S]*?<\/(?:[\w.-]+:)?rPh>/g, '');
  let out = '';
  const re = /<(?:[\w.-]+:)?t\b[^>]*?(?:\/>|>([\s\S]*?)<\/(?:[\w.-]+:)?t>)/g;
  for (let m = re.exec(s); m; m = re.exec(s)) out += cdata(m[1] ?? '');
  return out;
}

function cdata(s: string): string {
  if (s.indexOf('<![CDATA[') < 0) return unescapeXml(s);
  return s.split(/(<!\[CDATA\[[\s\S]*?\]\]>)/).map((p) => (p.startsWith('<![CDATA[') ? p.slice(9, -3) : unescapeXml(p))).join('');
}

// ---------------------------------------------------------------------------------------------
// A scanner over XML that arrives in pieces.

interface XmlHandler {
  /** A start tag (or an empty element) of an element not in `units`. */
  open(name: string, attrs: string, empty: boolean): void;
  close(name: string): void;
  /** A whole element of one of the `units` names, with its content (null when empty). */
  unit(name: string, attrs: string, inner: string | null): void;
}

/** The most text held while waiting for an element's end (an element this large is not a cell). */
const MAX_PENDING = 64 * 1024 * 1024;

/**
 * Scans XML text pushed in pieces: start and end tags are reported as they come, and elements
 * named in `units` (a cell, a shared string) whole. Only the unfinished end of the text is kept.
 */
class XmlScanner {
  private rest = '';
  constructor(
    private readonly units: ReadonlySet<string>,
    private readonly h: XmlHandler,
    private readonly fail: (what: string) => never,
  ) {}

  push(text: string, final: boolean): void {
    const buf = this.rest ? this.rest + text : text;
    const n = buf.length;
    let pos = 0;
    for (;;) {
      const lt = buf.indexOf('<', pos);
      if (lt < 0) {
        pos = n;
        break;
      }
      const c1 = buf.charCodeAt(lt + 1);
      if (c1 === 33 /* ! */) {
        const close = buf.startsWith('<!--', lt) ? '-->' : buf.startsWith('<![CDATA[', lt) ? ']]>' : '>';
        const k = buf.indexOf(close, lt + 2);
        if (k < 0) {
          pos = lt;
          break;
        }
        pos = k + close.length;
        continue;
      }
      const gt = buf.indexOf('>', lt + 1);
      if (gt < 0) {
        pos = lt;
        break;
      }
      if (c1 === 63 /* ? */) {
        pos = gt + 1;
        continue;
      }
      if (c1 === 47 /* / */) {
        this.h.close(localName(buf.slice(lt + 2, gt).trim()));
        pos = gt + 1;
        continue;
      }
      let e = lt + 1;
      while (e < gt) {
        const ch = buf.charCodeAt(e);
        if (ch === 32 || ch === 9 || ch === 10 || ch === 13 || ch === 47) break;
        e++;
      }
      const raw = buf.slice(lt + 1, e);
      const name = localName(raw);
      const empty = buf.charCodeAt(gt - 1) === 47;
      const attrs = buf.slice(e, empty ? gt - 1 : gt);
      if (this.units.has(name)) {
        if (empty) {
          this.h.unit(name, attrs, null);
          pos = gt + 1;
          continue;
        }
        const end = `</${raw}>`;
        const k = buf.indexOf(end, gt + 1);
        if (k < 0) {
          pos = lt;
          break;
        }
        this.h.unit(name, attrs, buf.slice(gt + 1, k));
        pos = k + end.length;
        continue;
      }
      this.h.open(name, attrs, empty);
      pos = gt + 1;
    }
    this.rest = pos < n ? buf.slice(pos) : '';
    if (this.rest.length > MAX_PENDING) this.fail(`an element is over ${MAX_PENDING / 1024 / 1024} MiB long`);
    if (final && this.rest.trim()) this.fail('the XML of a part ends in the middle of an element');
  }
}

function localName(raw: string): string {
  const i = raw.indexOf(':');
  return i < 0 ? raw : raw.slice(i + 1);
}

/** Inflate a part and feed its text to a scanner; false when the consumer stopped early. */
function scanPart(pkg: Package, e: ZipEntry, scanner: XmlScanner): boolean {
  const dec = new TextDecoder('utf-8');
  const whole = inflatePart(pkg.bytes, e, pkg.file, (c) => scanner.push(dec.decode(c, { stream: true }), false));
  if (whole) scanner.push(dec.decode(), true);
  return whole;
}

/** The shared strings, in order. */
function sharedStrings(pkg: Package): string[] {
  const rel = tagsOf(partText(pkg, relsPath(pkg.workbookPart)) ?? '', 'Relationship').find((r) => /\/sharedStrings$/.test(r.Type ?? ''));
  const e = pkg.entries.get((rel?.Target ? resolvePart(pkg.workbookPart, rel.Target) : 'xl/sharedStrings.xml').toLowerCase()) ?? pkg.entries.get('xl/sharedstrings.xml');
  const out: string[] = [];
  if (!e) return out;
  const fail = (what: string): never => {
    throw badXlsx(pkg.file, `its shared strings: ${what}`);
  };
  scanPart(pkg, e, new XmlScanner(new Set(['si']), { open() {}, close() {}, unit: (_n, _a, inner) => void out.push(inner === null ? '' : stringText(inner)) }, fail));
  return out;
}

/** Built-in number formats that show dates (ECMA-376 part 1, 18.8.30; common practice). */
const DATE_FORMAT_IDS = new Set([14, 15, 16, 17, 22, 27, 28, 29, 30, 31, 32, 33, 34, 35, 36, 50, 51, 52, 53, 54, 55, 56, 57, 58]);

/** Which cell styles (by `s` index) show a date. */
function dateStyles(pkg: Package): boolean[] {
  const rel = tagsOf(partText(pkg, relsPath(pkg.workbookPart)) ?? '', 'Relationship').find((r) => /\/styles$/.test(r.Type ?? ''));
  const xml = partText(pkg, rel?.Target ? resolvePart(pkg.workbookPart, rel.Target) : 'xl/styles.xml');
  if (!xml) return [];
  const custom = new Map<number, boolean>();
  for (const f of tagsOf(xml, 'numFmt')) {
    // A date format shows a day or a year; quoted text, [colours] and escaped letters do not count.
    const code = (f.formatCode ?? '').replace(/"[^"]*"|\[[^\]]*\]|\\./g, '');
    custom.set(Number(f.numFmtId), /[dy]/i.test(code));
  }
  const xfs = /<(?:[\w.-]+:)?cellXfs\b[^>]*>([\s\S]*?)<\/(?:[\w.-]+:)?cellXfs>/.exec(xml);
  if (!xfs) return [];
  return tagsOf(xfs[1]!, 'xf').map((x) => {
    const id = Number(x.numFmtId ?? 0);
    return custom.get(id) ?? DATE_FORMAT_IDS.has(id);
  });
}

/** A date serial as an ISO date (1900 or 1904 system). */
function serialDate(v: number, date1904: boolean): string | undefined {
  const ms = date1904 ? Date.UTC(1904, 0, 1) + v * 864e5 : Date.UTC(1899, 11, v < 61 ? 31 : 30) + v * 864e5;
  const d = new Date(Math.round(ms / 1000) * 1000);
  return Number.isNaN(d.getTime()) ? undefined : d.toISOString().slice(0, 10);
}

// ---------------------------------------------------------------------------------------------
// One sheet.

const CELL_ATTR_R = /(?:^|\s)r\s*=\s*["']([^"']*)["']/;
const CELL_ATTR_T = /(?:^|\s)t\s*=\s*["']([^"']*)["']/;
const CELL_ATTR_S = /(?:^|\s)s\s*=\s*["']([^"']*)["']/;
const CELL_PART = /<(?:[\w.-]+:)?(v|f|is)\b([^>]*?)(?:\/>|>([\s\S]*?)<\/(?:[\w.-]+:)?\1>)/g;

/** The most columns of an XLSX sheet (XFD, ECMA-376). */
const MAX_COLUMNS = 16384;

interface SheetScan {
  rows: GridRow[];
  merges: MergeRange[];
  formulas: number;
  numbers: NumberReader;
  complete: boolean;
}

/** A cell reference's 0-based column ('AB12' → 27), or -1. */
function refColumn(ref: string): number {
  let c = 0;
  let i = 0;
  for (; i < ref.length; i++) {
    const ch = ref.charCodeAt(i) | 32;
    if (ch < 97 || ch > 122) break;
    c = c * 26 + ch - 96;
  }
  return i === 0 ? -1 : c - 1;
}

function scanSheet(pkg: Package, info: XlsxSheetInfo, sst: string[], dates: boolean[], options: XlsxOptions, limits: Required<Limits>, untilCell = false): SheetScan {
  const { file } = options;
  const sheet = info.name;
  const numbers = new NumberReader(options, (r, c, text) => ({ ...whereAt(file, r, c, text), sheet }));
  const builder = new GridBuilder(limits.maxCells, () => tooManyCells(file, limits.maxCells));
  const merges: MergeRange[] = [];
  const maxRows = options.maxRows ?? Infinity;
  let formulas = 0;
  let inRow = false;
  let inData = false;
  const fail = (what: string): never => {
    throw badXlsx(file, `sheet '${sheet}': ${what}`);
  };
  const toRow = (r: number) => {
    if (r < builder.row) fail(`row ${r + 1} comes after row ${builder.row}`);
    while (builder.row < r && builder.row < maxRows) builder.endRow();
    if (builder.row >= maxRows) throw STOP_PART;
  };
  const endRow = () => {
    builder.endRow();
    inRow = false;
    if (builder.row >= maxRows) throw STOP_PART;
  };
  const text = (v: string, r: number, c: number) => {
    const t = v.trim();
    if (!t) return builder.empty();
    const n = t.startsWith('=') ? NaN : numbers.read(t, r, c);
    if (n === NumberReader.PENDING) builder.text(v);
    else if (Number.isNaN(n)) builder.text(restoreText(v));
    else builder.number(n, v);
  };
  const handler: XmlHandler = {
    open(name, attrs, empty) {
      if (name === 'sheetData') inData = !empty;
      else if (name === 'row' && inData) {
        const m = CELL_ATTR_R.exec(attrs);
        if (m) toRow(Number(m[1]) - 1);
        inRow = true;
        if (empty) endRow();
      } else if (name === 'mergeCell') {
        const m = /ref\s*=\s*["']([^"']*)["']/.exec(attrs);
        const range = m ? parseRange(m[1]!) : undefined;
        if (range) merges.push(range);
      }
    },
    close(name) {
      if (name === 'row' && inRow) endRow();
      else if (name === 'sheetData') inData = false;
    },
    unit(_name, attrs, inner) {
      if (!inData) return;
      if (!inRow) inRow = true;
      const ref = CELL_ATTR_R.exec(attrs)?.[1];
      const r = builder.row;
      let c = builder.col;
      if (ref) {
        c = refColumn(ref);
        if (c < builder.col) fail(`cell ${ref} comes after column ${builder.col} of its row`);
      }
      if (c >= MAX_COLUMNS) fail(`cell ${ref ?? ''} is past the last column (XFD)`);
      if (inner === null) return;
      let v: string | null = null;
      let f: string | null = null;
      let is: string | null = null;
      if (inner.startsWith('<v>') && inner.endsWith('</v>') && inner.indexOf('<', 3) === inner.length - 4) v = inner.slice(3, -4);
      else {
        CELL_PART.lastIndex = 0;
        for (let m = CELL_PART.exec(inner); m; m = CELL_PART.exec(inner)) {
          if (m[1] === 'v') v = m[3] ?? '';
          else if (m[1] === 'f') f = m[3] ?? '';
          else is = m[3] ?? '';
        }
      }
      const t = CELL_ATTR_T.exec(attrs)?.[1] ?? 'n';
      if (f !== null) formulas++;
      if (v === null && is === null && f === null) return;
      if (untilCell) {
        builder.text('cell');
        throw STOP_PART;
      }
      while (builder.col < c) builder.empty();
      if (f !== null && (v === null || (v === '' && t !== 'str'))) return text(`=${unescapeXml(f)}`, r, c);
      switch (t) {
        case 's': {
          const s = sst[Number(v)];
          if (s === undefined) fail(`cell ${ref ?? ''} names shared string ${v}, which the workbook does not have`);
          return text(s!, r, c);
        }
        case 'inlineStr':
          return text(is === null ? unescapeXml(v ?? '') : stringText(is), r, c);
        case 'str':
        case 'e':
          return text(cdata(v ?? ''), r, c);
        case 'b':
          return builder.text(v === '1' || v === 'true' ? 'TRUE' : 'FALSE');
        case 'd':
          return text((v ?? '').slice(0, 10), r, c);
        default: {
          const x = Number(v);
          if (v === null || v.trim() === '') return builder.empty();
          if (Number.isNaN(x)) return text(unescapeXml(v), r, c);
          const s = CELL_ATTR_S.exec(attrs)?.[1];
          if (s !== undefined && dates[Number(s)]) {
            const d = serialDate(x, pkg.date1904);
            if (d) return builder.text(d);
          }
          if (Number.isFinite(x)) builder.number(x);
          else builder.text(v);
        }
      }
    },
  };
  const scanner = new XmlScanner(new Set(['c']), handler, fail);
  const complete = scanPart(pkg, pkg.entries.get(info.part.toLowerCase())!, scanner);
  if (inRow && builder.row < maxRows) builder.endRow();
  const rows = builder.rows;
  for (const { cell, value } of numbers.settle()) {
    if (!Number.isNaN(value) && rows[cell.row]) GridBuilder.patch(rows[cell.row]!, cell.col, value, cell.text);
  }
  // A merged range keeps its value in its top-left cell only (as spreadsheet programs show it).
  for (const m of merges) {
    for (let i = m.top; i <= m.bottom && i < rows.length; i++) {
      const row = rows[i]!;
      for (let j = m.left; j <= m.right && j < row.kinds.length; j++) {
        if (i === m.top && j === m.left) continue;
        if (row.kinds[j] !== EMPTY) {
          row.kinds[j] = EMPTY;
          row.values[j] = NaN;
          row.texts?.delete(j);
        }
      }
    }
  }
  return { rows, merges, formulas, numbers, complete };
}

/** How many of a sheet's rows hold at least two numbers (numbers stored as text too). */
function numericRows(rows: readonly GridRow[]): number {
  let n = 0;
  for (const row of rows) {
    let nums = 0;
    for (let c = 0; c < row.kinds.length && nums < 2; c++) {
      const k = row.kinds[c];
      // Numbers stored as text count too, with any thousands separator ('1 234,5', '1’234').
      if (k === NUMBER || (k === TEXT && /^\s*[-+\u2212]?\d[\d.,'\u2019 \u00a0\u202f\u2009]*\s*$/.test(row.texts?.get(c) ?? ''))) nums++;
    }
    if (nums >= 2) n++;
  }
  return n;
}

function hasCells(rows: readonly GridRow[]): boolean {
  return rows.some((r) => r.kinds.length > 0);
}

/** Read one sheet of an XLSX workbook into a grid. */
export async function readXlsx(bytes: Uint8Array, options: XlsxOptions): Promise<XlsxRead> {
  const { file } = options;
  if (bytes.length === 0) throw new InputError('empty-file', `file ${file} is empty`, { file }, 'Give a file with a table in it');
  const limits = limitsOf(options.limits);
  const pkg = openPackage(bytes, file, options.limits);
  const sheets = pkg.sheets.map((s) => s.name);
  const findings: Finding[] = [];
  const sst = sharedStrings(pkg);
  const dates = dateStyles(pkg);
  let info: XlsxSheetInfo | undefined;
  const want = options.sheet;
  // Sheets looked at to choose one; a look that reached the sheet's end is its whole read.
  const peeked = new Map<XlsxSheetInfo, SheetScan>();
  if (want === undefined) {
    // The first sheet that looks like a table (rows with several numbers), else the first with cells:
    // agency workbooks often open with a contents or notes sheet. Each is looked at over its first
    // BODY_ROWS rows only. By content first (sheet-choice.ts): the sheet whose header row and lead
    // column share most codes.
    const peek = { ...options, maxRows: Math.min(BODY_ROWS, options.maxRows ?? Infinity) };
    const look = (s: XlsxSheetInfo) => {
      let scan = peeked.get(s);
      if (!scan) peeked.set(s, (scan = scanSheet(pkg, s, sst, dates, peek, limits)));
      return scan.rows;
    };
    const chosen = pkg.sheets.length > 1 ? chooseSheet(pkg.sheets, look) : undefined;
    const tabular = chosen?.sheet ?? pkg.sheets.find((s) => numericRows(look(s)) >= 2);
    info = tabular ?? pkg.sheets.find((s) => hasCells(look(s))) ?? pkg.sheets[0];
    // The other sheets named in the note are those with cells: a sheet not looked at is read up to its first cell only.
    const others = pkg.sheets.filter((s) => s !== info && hasCells(peeked.get(s)?.rows ?? scanSheet(pkg, s, sst, dates, peek, limits, true).rows)).map((s) => s.name);
    if (chosen && others.length) {
      findings.push({ code: 'sheet-chosen', severity: 'note', message: `file ${file}: read sheet '${chosen.sheet.name}': ${chosen.why}; other candidates: ${chosen.others.map((o) => `'${o.name}' (${o.codes} codes${o.kind !== 'flows' ? `, named as ${o.kind}` : ''})`).join(', ') || 'none'}; the workbook also has ${others.map((s) => `'${s}'`).join(', ')} (choose one with sheet)`, where: { file, sheet: chosen.sheet.name }, data: { candidates: chosen.others.map((o) => o.name) } });
    } else if (info && others.length) {
      findings.push({ code: 'sheet-chosen', severity: 'note', message: `file ${file}: read sheet '${info.name}', the first ${tabular ? 'that holds a table of numbers' : 'with cells'}; the workbook also has ${others.map((s) => `'${s}'`).join(', ')} (choose one with sheet)`, where: { file, sheet: info.name } });
    }
  } else if (typeof want === 'number') {
    if (!Number.isInteger(want) || want < 1 || want > pkg.sheets.length) {
      throw new InputError('unknown-sheet', `file ${file} has no sheet ${want}; it has ${pkg.sheets.length} sheet${pkg.sheets.length === 1 ? '' : 's'}: ${sheets.map((s) => `'${s}'`).join(', ')}`, { file }, 'Give a sheet number from 1, or a sheet name');
    }
    info = pkg.sheets[want - 1];
  } else {
    const norm = (s: string) => s.trim().toLowerCase();
    info = pkg.sheets.find((w) => w.name === want) ?? pkg.sheets.find((w) => norm(w.name) === norm(want));
    if (!info) throw new InputError('unknown-sheet', `file ${file} has no sheet '${want}'; its sheets are ${sheets.map((s) => `'${s}'`).join(', ')}`, { file }, 'Give one of those names, or a sheet number from 1');
  }
  if (!info) throw new InputError('empty-file', `file ${file} has no sheets`, { file });
  const early = peeked.get(info);
  const scan = early?.complete ? early : scanSheet(pkg, info, sst, dates, options, limits);
  const sheet = info.name;
  const grid = new Grid(file, scan.rows, sheet, scan.merges);
  grid.conventions = { ...scan.numbers.conventions() };
  if (grid.rowCount === 0) throw new InputError('empty-file', `file ${file}, sheet '${sheet}' has no cells`, { file, sheet }, sheets.length > 1 ? `Choose another sheet: ${sheets.map((s) => `'${s}'`).join(', ')}` : 'Give a sheet with a table in it');
  if (scan.formulas > 0) {
    findings.push({
      code: 'formula-cells',
      severity: 'note',
      message: `file ${file}, sheet '${sheet}': ${scan.formulas.toLocaleString('en')} cell${scan.formulas === 1 ? ' holds a formula; its value was' : 's hold formulas; their values were'} read as the spreadsheet program last saved them (recalculate and save the workbook if they may be out of date)`,
      where: { file, sheet },
      data: { formulas: scan.formulas },
    });
  }
  return { grid, sheets, sheet, conventions: scan.numbers.conventions(), findings, formulas: scan.formulas };
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
