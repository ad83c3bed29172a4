/**
 * A grid: the cells of one sheet (numbers, text, empty) with the file and sheet they came from,
 * so that every later message can name the file, the sheet, the A1 cell, and the text found.
 *
 * Storage is compact, one typed row per sheet row, because a wide table of 5,000 × 5,000 cells
 * must fit in a few hundred megabytes: `values` holds numbers (NaN where the cell is empty or
 * text), `kinds` says which, and `texts` keeps the text of text cells. The original text of a
 * number cell is kept where it differs from the number's shortest form (a code such as `0110`,
 * a value written `1,234.50`) in the first rows and columns, where codes and labels live.
 *
 * Rows and columns are 0-based in this API; every `Where` it builds is 1-based, as a
 * spreadsheet shows them.
 */
import { cellRef, type Where } from '../../engine/errors';

/** A cell as plain data: a number, a text, or empty. */
export type Cell = string | number | null | undefined;

export const EMPTY = 0;
export const NUMBER = 1;
export const TEXT = 2;
export type CellKind = typeof EMPTY | typeof NUMBER | typeof TEXT;

export interface GridRow {
  /** Numbers by column; NaN where the cell is empty or text. */
  values: Float64Array;
  /** EMPTY, NUMBER or TEXT by column. */
  kinds: Uint8Array;
  /** Text cells, and number cells whose text differs from the number's shortest form. */
  texts: Map<number, string> | null;
}

/** A merged range, 0-based and inclusive; the value sits in the top-left cell. */
export interface MergeRange {
  top: number;
  left: number;
  bottom: number;
  right: number;
}

/** Rows within this many of the top, or columns within this many of the left, keep number texts. */
export const TEXT_ZONE_ROWS = 64;
export const TEXT_ZONE_COLS = 16;

const NO_VALUES = new Float64Array(0);
const NO_KINDS = new Uint8Array(0);

export class Grid {
  readonly rows: GridRow[];
  readonly colCount: number;
  private mergeIndex: Map<number, MergeRange> | null = null;
  /** The conventions the reader used (delimiter, decimal mark, encoding...), for the mapping. */
  conventions?: Record<string, unknown>;

  constructor(
    readonly file: string,
    rows: GridRow[],
    readonly sheet?: string,
    readonly merges: MergeRange[] = [],
  ) {
    let n = rows.length;
    while (n > 0 && rows[n - 1]!.values.length === 0) n--;
    this.rows = n === rows.length ? rows : rows.slice(0, n);
    let c = 0;
    for (const r of this.rows) if (r.values.length > c) c = r.values.length;
    this.colCount = c;
  }

  get rowCount(): number {
    return this.rows.length;
  }

  kind(r: number, c: number): CellKind {
    const row = this.rows[r];
    if (!row || c >= row.kinds.length) return EMPTY;
    return row.kinds[c] as CellKind;
  }

  /** The number in a cell, or NaN when it is empty or text. */
  num(r: number, c: number): number {
    const row = this.rows[r];
    if (!row || c >= row.values.length) return NaN;
    return row.values[c]!;
  }

  /** The text of a cell as found: '' when empty; for numbers the original text when kept, else the shortest form. */
  text(r: number, c: number): string {
    const row = this.rows[r];
    if (!row || c >= row.kinds.length) return '';
    const k = row.kinds[c];
    if (k === EMPTY) return '';
    const t = row.texts?.get(c);
    if (t !== undefined) return t;
    return k === NUMBER ? numberText(row.values[c]!) : '';
  }

  /** The text of a cell, or of the merged range that covers it. */
  mergedText(r: number, c: number): string {
    const own = this.text(r, c);
    if (own || !this.merges.length) return own;
    const m = this.mergeAt(r, c);
    return m ? this.text(m.top, m.left) : '';
  }

  /** The merged range covering a cell, if any. */
  mergeAt(r: number, c: number): MergeRange | undefined {
    if (!this.merges.length) return undefined;
    if (!this.mergeIndex) {
      this.mergeIndex = new Map();
      for (const m of this.merges) {
        for (let i = m.top; i <= m.bottom; i++) for (let j = m.left; j <= m.right; j++) this.mergeIndex.set(i * 65536 + j, m);
      }
    }
    return this.mergeIndex.get(r * 65536 + c);
  }

  isEmptyRow(r: number): boolean {
    const row = this.rows[r];
    if (!row) return true;
    for (let c = 0; c < row.kinds.length; c++) if (row.kinds[c] !== EMPTY) return false;
    return true;
  }

  /** Where a cell is, for messages: file, sheet, A1 cell, 1-based row and column, and the text found. */
  where(r: number, c: number, extra: Partial<Where> = {}): Where {
    const w: Where = { file: this.file };
    if (this.sheet !== undefined) w.sheet = this.sheet;
    w.cell = cellRef(r + 1, c + 1);
    w.row = r + 1;
    w.column = c + 1;
    const t = this.text(r, c);
    if (t) w.text = t;
    return { ...w, ...extra };
  }

  /** The grid as plain rows (tests, small sheets). */
  toRows(): Cell[][] {
    return this.rows.map((row, r) => {
      const out: Cell[] = [];
      for (let c = 0; c < row.kinds.length; c++) {
        const k = row.kinds[c];
        out.push(k === EMPTY ? null : k === NUMBER ? row.values[c]! : this.text(r, c));
      }
      return out;
    });
  }
}

/** The shortest text of a number (as JavaScript writes it; -0 written as '-0'). */
export function numberText(v: number): string {
  return Object.is(v, -0) ? '-0' : String(v);
}

/** A code as compared: non-breaking and other odd spaces made plain, trimmed, inner runs of space collapsed. */
export function normalizeCode(s: string): string {
  return normalizeLabel(s).replace(/\s+/g, ' ');
}

/** A label as kept: odd spaces made plain and the ends trimmed. */
export function normalizeLabel(s: string): string {
  return s.replace(/[\u00a0\u2007\u202f\u2009\u200b\ufeff]/g, ' ').trim();
}

/**
 * Builds grid rows one cell at a time. `number` and `text` take the next cell; `endRow`
 * closes the row (trailing empty cells are dropped).
 */
export class GridBuilder {
  private vals: Float64Array = new Float64Array(64);
  private kinds: Uint8Array = new Uint8Array(64);
  private texts: Map<number, string> | null = null;
  private len = 0;
  private last = -1;
  readonly rows: GridRow[] = [];
  cells = 0;

  constructor(private readonly maxCells = Infinity, private readonly onTooMany?: () => never) {}

  /** The 0-based index of the row being built. */
  get row(): number {
    return this.rows.length;
  }

  /** The 0-based column of the next cell. */
  get col(): number {
    return this.len;
  }

  /** Whether the next cell is in the zone where number texts are kept. */
  get inTextZone(): boolean {
    return this.rows.length < TEXT_ZONE_ROWS || this.len < TEXT_ZONE_COLS;
  }

  private grow(): void {
    const v = new Float64Array(this.vals.length * 2);
    v.set(this.vals);
    this.vals = v;
    const k = new Uint8Array(this.kinds.length * 2);
    k.set(this.kinds);
    this.kinds = k;
  }

  empty(): void {
    if (this.len === this.vals.length) this.grow();
    this.vals[this.len] = NaN;
    this.kinds[this.len] = EMPTY;
    this.len++;
  }

  /** A number with no text to keep (the fast path of the byte scanner). */
  plainNumber(v: number): void {
    if (this.len === this.vals.length) this.grow();
    this.vals[this.len] = v;
    this.kinds[this.len] = NUMBER;
    this.last = this.len;
    this.len++;
  }

  number(v: number, text?: string): void {
    if (this.len === this.vals.length) this.grow();
    this.vals[this.len] = v;
    this.kinds[this.len] = NUMBER;
    if (text !== undefined && text !== numberText(v)) (this.texts ??= new Map()).set(this.len, text);
    this.last = this.len;
    this.len++;
  }

  text(t: string): void {
    if (t === '') return this.empty();
    if (this.len === this.vals.length) this.grow();
    this.vals[this.len] = NaN;
    this.kinds[this.len] = TEXT;
    (this.texts ??= new Map()).set(this.len, t);
    this.last = this.len;
    this.len++;
  }

  /** Put a value into a cell of a finished row (used to settle numbers whose reading waited). */
  static patch(row: GridRow, c: number, v: number, text: string): void {
    row.values[c] = v;
    row.kinds[c] = NUMBER;
    if (text !== numberText(v)) (row.texts ??= new Map()).set(c, text);
    else row.texts?.delete(c);
  }

  endRow(): void {
    const n = this.last + 1;
    this.cells += n;
    if (this.cells > this.maxCells && this.onTooMany) this.onTooMany();
    let texts = this.texts;
    if (texts && n < this.len) for (const k of texts.keys()) if (k >= n) texts.delete(k);
    if (texts && texts.size === 0) texts = null;
    this.rows.push({
      values: n ? this.vals.slice(0, n) : NO_VALUES,
      kinds: n ? this.kinds.slice(0, n) : NO_KINDS,
      texts,
    });
    this.texts = null;
    this.len = 0;
    this.last = -1;
  }
}

/**
 * A grid from plain rows. Strings stay text (a caller that wants text read as numbers parses
 * first); numbers must be finite.
 */
export function gridFromRows(rows: readonly (readonly Cell[])[], file: string, sheet?: string, merges: MergeRange[] = []): Grid {
  const b = new GridBuilder();
  for (const row of rows) {
    for (const cell of row) {
      if (cell === null || cell === undefined || cell === '') b.empty();
      else if (typeof cell === 'number') {
        if (!Number.isFinite(cell)) b.text(String(cell));
        else b.number(cell);
      } else b.text(String(cell));
    }
    b.endRow();
  }
  return new Grid(file, b.rows, sheet, merges);
}
