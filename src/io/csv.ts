/**
 * CSV, TSV and semicolon files to a grid.
 *
 * The delimiter is found from the first lines (the one that splits them most consistently; on a
 * tie tab, then semicolon, then bar, then comma), the decimal mark from the numbers themselves
 * (see numbers.ts), the encoding from a byte-order mark or by trying UTF-8; each choice is
 * reported in `conventions` and can be given instead. Files up to a few megabytes go through
 * papaparse; larger ones (and streams) through the byte scanner of csv-scan.ts, which gives the
 * same grid.
 */
import Papa from 'papaparse';
import { cellRef, columnLetters, InputError, type Where } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import { CsvScanner, ESCAPED, type FieldSink, fieldText, isShortestText, numberScan, plainDecimal, scanNumber } from './csv-scan';
import { decodeBytes, type Encoding, sniffBom } from './decode';
import { restoreText } from './escape';
import { EMPTY, Grid, GridBuilder, type GridRow, TEXT, TEXT_ZONE_COLS, TEXT_ZONE_ROWS } from './grid';

import { checkBytes, type Limits, limitsOf, tooManyCells } from './limits';
import { type DecimalMark, type NumberConventions, type NumberOptions, NumberReader } from './numbers';

export type Delimiter = ',' | ';' | '\t' | '|';
export const DELIMITERS: readonly Delimiter[] = ['\t', ';', '|', ','];

export interface CsvOptions extends NumberOptions {
  /** The file name, for messages. */
  file: string;
  delimiter?: Delimiter;
  encoding?: Encoding;
  limits?: Limits;
  /** Which parser: papaparse, the byte scanner, or by size (default; the scanner above 2 MiB). */
  parser?: 'auto' | 'papaparse' | 'scanner';
}

export interface CsvConventions extends NumberConventions {
  delimiter: Delimiter;
  delimiterFrom: 'option' | 'data' | 'default';
  encoding: Encoding;
  bom: boolean;
}

export interface CsvRead {
  grid: Grid;
  conventions: CsvConventions;
  findings: Finding[];
}

/** Above this size, `parser: 'auto'` uses the byte scanner. */
export const SCANNER_THRESHOLD = 2 * 1024 * 1024;

/**
 * The delimiter that splits a sample of lines best: the share of lines it splits into two fields
 * or more plus the share split into the most common number of fields, then the first share, then
 * the share of split lines with the most common number; on a tie, tab,
 * semicolon, bar, comma in that order (a decimal comma splits lines too, but less often).
 * Undefined when none splits any line.
 */
export function detectDelimiter(sample: string, complete = false): Delimiter | undefined {
  let best: { d: Delimiter; table: number; cover: number; share: number } | undefined;
  for (const d of DELIMITERS) {
    if (!sample.includes(d)) continue;
    const res = Papa.parse<string[]>(sample, { delimiter: d, newline: '\n', quoteChar: '"', preview: 200 });
    // A delimiter that leaves quotes unbalanced (a quote opened inside a field) is not the one.
    if (res.errors.some((e) => e.type === 'Quotes' && (complete || (e.row !== undefined && e.row < res.data.length - 1)))) continue;
    let rows = res.data;
    if (rows.length > 1 && !complete && !sample.endsWith('\n')) rows = rows.slice(0, -1);
    const counts = new Map<number, number>();
    let lines = 0;
    let split = 0;
    for (const r of rows) {
      if (r.every((f) => f.trim() === '')) continue;
      lines++;
      if (r.length >= 2) split++;
      counts.set(r.length, (counts.get(r.length) ?? 0) + 1);
    }
    let modeCount = 0;
    for (const [k, c] of counts) if (k >= 2 && c > modeCount) modeCount = c;
    if (!split || !lines) continue;
    // Shares of the lines of text the records came from: a quote opened by a delimiter that is not
    // the file's ('"1,5"' read with ';' is fine, read with ',' in a ';' file it can run on for
    // lines) folds many lines into a few records, which must not pass for a consistent split.
    let physical = 0;
    for (const l of sample.slice(0, res.meta.cursor ?? sample.length).split('\n')) if (l.trim()) physical++;
    lines = Math.max(lines, physical);
    // The share of lines split, plus the share split into the most common number of fields (the
    // lines of a table): title lines with commas in their words ('EUR million, basic prices') and
    // decimal commas split a semicolon file's lines by comma too, but into ragged numbers of
    // fields; a file whose rows differ in length is still split on every line by its delimiter.
    const cover = Math.round((split / lines) * 20) / 20;
    const table = cover + Math.round((modeCount / lines) * 20) / 20;
    const share = Math.round((modeCount / split) * 20) / 20;
    if (!best || table > best.table + 1e-9 || (Math.abs(table - best.table) <= 1e-9 && (cover > best.cover || (cover === best.cover && share > best.share)))) best = { d, table, cover, share };
  }
  return best?.d;
}

function delimiterName(d: string): string {
  return d === '\t' ? 'tab' : d === ';' ? 'semicolon' : d === '|' ? 'bar' : d === ',' ? 'comma' : `'${d}'`;
}

/** The decimal mark that goes with a delimiter, for cells that cannot tell (see NumberOptions.tieBreak). */
export function withTieBreak<T extends NumberOptions>(options: T, delimiter: Delimiter): T {
  if (options.decimal || options.tieBreak) return options;
  return delimiter === ',' ? { ...options, tieBreak: '.' } : options;
}

/** Builds a grid from cells, reading numbers under the conventions. */
class CellSink {
  readonly builder: GridBuilder;
  readonly numbers: NumberReader;
  private pendingRows = new Set<number>();

  constructor(readonly file: string, options: NumberOptions, maxCells: number) {
    this.builder = new GridBuilder(maxCells, () => tooManyCells(file, maxCells));
    this.numbers = new NumberReader(options, (r, c, text) => whereAt(file, r, c, text));
  }

  /** A trimmed text cell, read as a number where it is one. */
  text(t: string): void {
    const b = this.builder;
    if (t === '') return b.empty();
    const v = this.numbers.read(t, b.row, b.col);
    if (v === NumberReader.PENDING) {
      this.pendingRows.add(b.row);
      b.text(t);
    } else if (Number.isNaN(v)) b.text(restoreText(t));
    else if (b.inTextZone) b.number(v, t);
    else b.number(v);
  }

  finish(): Grid {
    const settled = this.numbers.settle();
    const rows = this.builder.rows;
    for (const { cell, value } of settled) {
      if (!Number.isNaN(value)) GridBuilder.patch(rows[cell.row]!, cell.col, value, cell.text);
    }
    return new Grid(this.file, rows);
  }
}

export function whereAt(file: string, r: number, c: number, text?: string): Where {
  const w: Where = { file, cell: cellRef(r + 1, c + 1), row: r + 1, column: c + 1 };
  if (text !== undefined) w.text = text;
  return w;
}

/** The wide-grid sink of the byte scanner: numbers straight from bytes, the rest through CellSink. */
class ScanGridSink implements FieldSink {
  constructor(
    private readonly cells: CellSink,
    private readonly decoder: TextDecoder,
    private readonly file: string,
  ) {}

  row(b: Uint8Array, fs: Int32Array, nf: number): void {
    const builder = this.cells.builder;
    // Past the first rows and columns (where codes and labels are), with the decimal point
    // settled, plain numbers are read here in one pass; anything else goes to field().
    const fastFrom = builder.row < TEXT_ZONE_ROWS || this.cells.numbers.decimal !== '.' ? nf : TEXT_ZONE_COLS;
    for (let k = 0; k < nf; k++) {
      let s = fs[3 * k]!;
      let e = fs[3 * k + 1]!;
      if (k >= fastFrom && fs[3 * k + 2] === 0) {
        while (s < e && b[s] === 32) s++;
        while (e > s && b[e - 1] === 32) e--;
        if (s === e) {
          builder.empty();
          continue;
        }
        const v = plainDecimal(b, s, e);
        if (v === v) {
          builder.plainNumber(v);
          continue;
        }
      }
      this.field(b, s, e, fs[3 * k + 2]!);
    }
    builder.endRow();
  }

  private field(b: Uint8Array, s: number, e: number, flags: number): void {
    while (s < e && (b[s] === 32 || b[s] === 9)) s++;
    while (e > s && (b[e - 1] === 32 || b[e - 1] === 9)) e--;
    const builder = this.cells.builder;
    if (s === e) return builder.empty();
    const numbers = this.cells.numbers;
    const dec = numbers.decimal;
    if (!(flags & ESCAPED)) {
      const c0 = b[s]!;
      if ((c0 >= 48 && c0 <= 57) || c0 === 45 || c0 === 43 || c0 === 46 || c0 === 44) {
        const v = scanNumber(b, s, e, dec === ',' ? 44 : 46);
        if (!Number.isNaN(v) && !(dec === undefined && numberScan.ambiguous)) {
          if (numberScan.decimalSeen && dec === undefined) numbers.see('.', builder.row, builder.col, fieldText(b, s, e, false));
          if (builder.inTextZone && !(dec !== ',' && isShortestText(b, s, e))) builder.number(v, fieldText(b, s, e, false));
          else builder.number(v);
          return;
        }
      }
    }
    let t: string;
    try {
      t = fieldText(b, s, e, (flags & ESCAPED) !== 0, this.decoder).trim();
    } catch {
      throw new InputError(
        'bad-encoding',
        `file ${this.file}, cell ${columnLetters(builder.col + 1)}${builder.row + 1}: the bytes are not valid UTF-8`,
        whereAt(this.file, builder.row, builder.col),
        `Pass the file's encoding (for example encoding: 'windows-1252')`,
      );
    }
    this.cells.text(t);
  }
}

function conventionsOf(numbers: NumberReader, delimiter: Delimiter, delimiterFrom: CsvConventions['delimiterFrom'], encoding: Encoding, bom: boolean): CsvConventions {
  return { delimiter, delimiterFrom, encoding, bom, ...numbers.conventions() };
}

function emptyFile(file: string): never {
  throw new InputError('empty-file', `file ${file} is empty`, { file }, 'Give a file with a table in it');
}

function findingsOf(c: CsvConventions, file: string, encodingGiven = false): Finding[] {
  const out: Finding[] = [];
  const parts = [
    `${delimiterName(c.delimiter)}-separated${c.delimiterFrom === 'default' ? ' (no delimiter found; one column)' : ''}`,
    `decimal mark '${c.decimal}'${c.decimalFrom === 'data' ? ` (seen in ${c.decimalEvidence})` : c.decimalFrom === 'default' ? ' (default; no cell needed it)' : c.decimalFrom === 'delimiter' ? ' (taken from the delimiter; see the warning)' : ' (as given)'}`,
    c.thousands.length ? `thousands separator ${c.thousands.map((t) => `'${t}'`).join(', ')}` : 'no thousands separator',
    `${c.encoding}${c.bom ? ' with a byte-order mark' : ''}`,
  ];
  out.push({ code: 'csv-conventions', severity: 'note', message: `file ${file} read as ${parts.join(', ')}`, where: { file } });
  if (c.decimalFrom === 'delimiter' && c.ambiguous) {
    out.push({
      code: 'decimal-from-delimiter',
      severity: 'warning',
      message: `file ${file}: no cell shows the decimal mark, and ${c.ambiguous.count} cell${c.ambiguous.count > 1 ? 's' : ''} such as ${c.ambiguous.cell} could be read with '.' as a thousands separator or as the decimal mark; they were read with '.' as the decimal mark, as in comma-separated files, where a decimal comma would need quotes. If '.' separates thousands in this file, give the decimal mark ','`,
      where: { file },
      data: { cells: c.ambiguous.count },
    });
  }
  if (c.encoding === 'windows-1252' && !encodingGiven) {
    out.push({ code: 'encoding-guessed', severity: 'warning', message: `file ${file} is not UTF-8; it was read as Windows-1252. If letters look wrong, give the file's encoding (the command line: --encoding)`, where: { file } });
  }
  return out;
}

/** Read a CSV file held in memory (bytes or text). */
export function readCsv(input: Uint8Array | string, options: CsvOptions): CsvRead {
  const { file } = options;
  const limits = limitsOf(options.limits);
  const size = typeof input === 'string' ? input.length : input.length;
  checkBytes(size, limits.maxBytes, file);
  const useScanner = typeof input !== 'string' && (options.parser === 'scanner' || (options.parser !== 'papaparse' && input.length > SCANNER_THRESHOLD));
  if (useScanner) return readCsvBytes(input as Uint8Array, options);
  let text: string;
  let encoding: Encoding = 'utf-8';
  let bom = false;
  if (typeof input === 'string') {
    text = input;
    if (text.charCodeAt(0) === 0xfeff) {
      text = text.slice(1);
      bom = true;
    }
  } else {
    const d = decodeBytes(input, file, options.encoding);
    text = d.text;
    encoding = d.encoding;
    bom = d.bom;
  }
  if (text.trim() === '') emptyFile(file);
  if (text.indexOf('\r') >= 0) text = text.replace(/\r\n?/g, '\n');
  let delimiter = options.delimiter;
  let delimiterFrom: CsvConventions['delimiterFrom'] = 'option';
  if (delimiter !== undefined && !DELIMITERS.includes(delimiter)) throw badDelimiter(delimiter);
  if (!delimiter) {
    const found = detectDelimiter(text.slice(0, 65536), text.length <= 65536);
    delimiter = found ?? ',';
    delimiterFrom = found ? 'data' : 'default';
  }
  const res = Papa.parse<string[]>(text, { delimiter, newline: '\n', quoteChar: '"', escapeChar: '"', skipEmptyLines: false });
  const quoteError = res.errors.find((e) => e.type === 'Quotes');
  if (quoteError) {
    const row = (quoteError.row ?? 0) + 1;
    const what = quoteError.code === 'MissingQuotes' ? 'a quoted field is never closed' : 'a quoted field has text after its closing quote';
    throw new InputError('bad-quote', `file ${file}, row ${row}: ${what}`, { file, row }, 'Check the quotes on that row: a quote inside a quoted field is written twice ("")');
  }
  const sink = new CellSink(file, withTieBreak(options, delimiter), limits.maxCells);
  for (const r of res.data) {
    for (const f of r) sink.text(f.trim());
    sink.builder.endRow();
  }
  const grid = sink.finish();
  if (grid.rowCount === 0) emptyFile(file);
  const conventions = conventionsOf(sink.numbers, delimiter, delimiterFrom, encoding, bom);
  grid.conventions = { ...conventions };
  return { grid, conventions, findings: findingsOf(conventions, file, options.encoding !== undefined) };
}

function badDelimiter(d: string): InputError {
  return new InputError('bad-option', `the delimiter must be one of comma, semicolon, tab or bar; got '${d}'`);
}

/** The scanner path over bytes in memory. */
function readCsvBytes(input: Uint8Array, options: CsvOptions): CsvRead {
  const r = new StreamingCsv(options);
  r.push(input);
  return r.end();
}

/**
 * Read a CSV file from a stream of byte chunks (a file read piece by piece, or a web
 * `ReadableStream`), through the byte scanner.
 */
export async function readCsvStream(chunks: AsyncIterable<Uint8Array>, options: CsvOptions): Promise<CsvRead> {
  const r = new StreamingCsv(options);
  for await (const c of chunks) r.push(c);
  return r.end();
}

/** Decodes UTF-16 chunks to UTF-8 bytes on the way in, so the scanner sees UTF-8. */
class Transcoder {
  private dec: TextDecoder;
  private enc = new TextEncoder();
  constructor(encoding: Encoding) {
    this.dec = new TextDecoder(encoding);
  }
  push(c: Uint8Array): Uint8Array {
    return this.enc.encode(this.dec.decode(c, { stream: true }));
  }
  end(): Uint8Array {
    return this.enc.encode(this.dec.decode());
  }
}

/**
 * The streaming reader: the first 64 KiB settle the encoding and the delimiter, then every byte
 * goes through the scanner once.
 */
export class StreamingCsv {
  private head: Uint8Array[] = [];
  private headBytes = 0;
  private total = 0;
  private scanner: CsvScanner | undefined;
  private sink: CellSink | undefined;
  private transcoder: Transcoder | undefined;
  private encoding: Encoding = 'utf-8';
  private bom = false;
  private delimiter: Delimiter = ',';
  private delimiterFrom: CsvConventions['delimiterFrom'] = 'option';
  private readonly limits: Required<Limits>;

  constructor(private readonly options: CsvOptions) {
    this.limits = limitsOf(options.limits);
    if (options.delimiter !== undefined && !DELIMITERS.includes(options.delimiter)) throw badDelimiter(options.delimiter);
  }

  push(chunk: Uint8Array): void {
    this.total += chunk.length;
    checkBytes(this.total, this.limits.maxBytes, this.options.file);
    if (!this.scanner) {
      this.head.push(chunk);
      this.headBytes += chunk.length;
      if (this.headBytes < 65536) return;
      this.start(false);
      return;
    }
    this.feed(chunk);
  }

  private feed(chunk: Uint8Array): void {
    this.scanner!.push(this.transcoder ? this.transcoder.push(chunk) : chunk);
  }

  private start(final: boolean): void {
    const file = this.options.file;
    let head = concat(this.head, this.headBytes);
    this.head = [];
    const bom = sniffBom(head);
    let encoding: Encoding;
    if (bom) {
      encoding = bom.encoding;
      this.bom = true;
      head = head.subarray(bom.length);
    } else if (this.options.encoding) encoding = this.options.encoding;
    else {
      // The encoding from a sample, the first 64 KiB (a character cut at its end left out), however
      // the bytes come: decoding a whole file of more than 512 MiB at once is beyond V8's string
      // length. A later byte that is not UTF-8 is then an error naming its cell.
      const sample = head.subarray(0, 65536);
      encoding = decodeBytes(final && head.length <= 65536 ? sample : trimPartial(sample), file).encoding;
    }
    this.encoding = encoding;
    if (encoding === 'utf-16le' || encoding === 'utf-16be') this.transcoder = new Transcoder(encoding);
    const sampleText = new TextDecoder(encoding).decode(head.subarray(0, 65536 * (this.transcoder ? 2 : 1))).replace(/\r\n?/g, '\n');
    let delimiter = this.options.delimiter;
    if (delimiter) this.delimiterFrom = 'option';
    else {
      const found = detectDelimiter(sampleText, final);
      delimiter = found ?? ',';
      this.delimiterFrom = found ? 'data' : 'default';
    }
    this.delimiter = delimiter;
    this.sink = new CellSink(file, withTieBreak(this.options, delimiter), this.limits.maxCells);
    const decoder = encoding === 'windows-1252' ? new TextDecoder('windows-1252') : new TextDecoder('utf-8', { fatal: true });
    this.scanner = new CsvScanner(delimiter.charCodeAt(0), new ScanGridSink(this.sink, decoder, file), file);
    this.feed(head);
  }

  end(): CsvRead {
    const file = this.options.file;
    if (!this.scanner) {
      if (this.headBytes === 0) emptyFile(file);
      this.start(true);
    }
    if (this.transcoder) this.scanner!.push(this.transcoder.end());
    this.scanner!.end();
    const grid = this.sink!.finish();
    if (grid.rowCount === 0) emptyFile(file);
    const conventions = conventionsOf(this.sink!.numbers, this.delimiter, this.delimiterFrom, this.encoding, this.bom);
    grid.conventions = { ...conventions };
    return { grid, conventions, findings: findingsOf(conventions, file, this.options.encoding !== undefined) };
  }
}

function concat(parts: Uint8Array[], total: number): Uint8Array {
  if (parts.length === 1) return parts[0]!;
  const out = new Uint8Array(total);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

/** Drop an incomplete UTF-8 sequence at the end of a sample, so that it can be checked strictly. */
function trimPartial(b: Uint8Array): Uint8Array {
  let i = b.length;
  let k = 0;
  while (i > 0 && k < 4 && (b[i - 1]! & 0xc0) === 0x80) {
    i--;
    k++;
  }
  if (i > 0 && b[i - 1]! >= 0xc0) return b.subarray(0, i - 1);
  return b;
}

/** A trimmed copy of a grid's kinds, for tests that compare the two parsers. */
export function gridSignature(g: Grid): string {
  return JSON.stringify(g.rows.map((r: GridRow, i) => Array.from(r.kinds, (k, c) => (k === EMPTY ? null : k === TEXT ? `t:${g.text(i, c)}` : g.num(i, c)))));
}

export type { DecimalMark };
