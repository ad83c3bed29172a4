/**
 * Long (triplet) files: one line per cell, with a row code, a column code and a value, and
 * perhaps other fields (a year, a table number, margins). The fields are found from the first
 * 2,000 lines: the codes are the first two fields that are not long labels (or the fields a
 * header names `row`/`from` and `column`/`to`; a header that names the column first marks the
 * file as transposed), and the value is the first field after them that holds numbers that
 * change from line to line. A field with the same value on every line (a year, a table number)
 * is never the value. Each choice is reported and can be given instead (1-based fields).
 *
 * The reader streams: codes are looked up from the bytes (no string per line), values read
 * by the byte number scanner, and cells kept in compact chunks (10 bytes each) until the codes
 * are known; then one dense matrix is filled. Missing pairs are zero. A pair given twice is an
 * error (or summed, when asked). The order of codes is the order the file lists them in,
 * merged across lines (so that a file sorted by row, then by column, keeps the agency's order).
 */
import { InputError, type Where } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { Axis } from '../../engine/table';
import type { Matrix } from '../../engine/linalg/matrix';
import { type Entry, DenseBlock } from './block';
import { CsvScanner, ESCAPED, type FieldSink, fieldText, numberScan, plainDecimal, scanNumber } from './csv-scan';
import { type CsvOptions, DELIMITERS, type Delimiter, detectDelimiter, whereAt, withTieBreak } from './csv';
import { decodeBytes, type Encoding, sniffBom } from './decode';
import { EMPTY, type Grid, normalizeCode, normalizeLabel } from './grid';
import { checkBytes, limitOption, limitsOf, sizeText } from './limits';
import type { LayoutMapping, MappingInput } from './mapping';
import { analyseNumber, type DecimalMark, type NumberConventions, NumberReader, numberHint } from './numbers';

export interface LongOptions extends CsvOptions {
  /** 1-based fields of the row code, the column code and the value. */
  rowCodeField?: number;
  columnCodeField?: number;
  valueField?: number;
  /** Whether the first line is a header (default: found from the value field). */
  header?: boolean;
  /** Read the first code field as the column and the second as the row. */
  transposed?: boolean;
  /** A pair given twice: an error (default) or added. */
  duplicates?: 'error' | 'sum';
  /** Keep only the lines whose fields hold these texts, by header name or 1-based field number (see LayoutMapping.select). */
  select?: Record<string, string>;
  /** An empty value field: an error (default) or zero. */
  blanks?: 'error' | 'zero';
  zeroTexts?: string[];
  /** Labels by code (such as a list of codes and titles). */
  labels?: Map<string, string> | Record<string, string>;
  /** A mapping with the fields above (rowCodeField, columnCodeField, valueField, headerLine, transposed). */
  mapping?: MappingInput;
}

export interface LongTable {
  rows: Axis;
  cols: Axis;
  /** Rows × columns; missing pairs are zero. */
  matrix: Matrix;
  /** The cells as a block, for the table readers. */
  block: DenseBlock;
  /** Number of lines with a value. */
  entries: number;
  mapping: Pick<LayoutMapping, 'shape' | 'file' | 'rowCodeField' | 'columnCodeField' | 'valueField' | 'headerLine' | 'transposed' | 'select' | 'blanks' | 'zeroTexts'> & { conventions?: Record<string, unknown> };
  conventions: NumberConventions & { delimiter?: Delimiter; encoding?: Encoding };
  findings: Finding[];
  /**
   * How the orientation was decided: given (an option or the mapping), named by the header, or
   * only the order of the fields (then the table readers may read it the other way round when
   * the codes say so: final-demand codes among the rows and value-added codes among the columns).
   */
  orientation: 'given' | 'named' | 'order';
}

export const SAMPLE_LINES = 2000;
/** Texts that stand for zero or a value not available in published tables. */
const GAP = /^(n\/?a|\.\.|\.\.\.|…|-|–|—|x|:|c)$/i;
const CHUNK = 1 << 20;

const ROW_NAMES = /^(row|rows|from|origin|source|supplier|seller|producer|industry code|commodity code|i|prod|prod_na|products?|commodity|commodities|supplying[\s_-]+(industry|sector))([\s_-]*(code|id|key))?$/i;
const COL_NAMES = /^(col|column|columns|to|destination|target|user|buyer|purchaser|j|induse|ind_use|uses?|using[\s_-]+(industry|sector)|purchasing[\s_-]+(industry|sector))([\s_-]*(code|id|key))?$/i;
const VALUE_NAMES = /^(value|values|amount|flow|flows|obs_value|coefficient|coefficients|val)([\s_-]*\w+)?$/i;

/** Codes to indices, looked up from bytes without making a string per line. */
class CodeTable {
  readonly codes: string[] = [];
  private byCode = new Map<string, number>();
  private keys: Int32Array = new Int32Array(1024).fill(-1);
  private arena: Uint8Array = new Uint8Array(1 << 16);
  private arenaLen = 0;
  private starts: Int32Array = new Int32Array(256);
  private lens: Int32Array = new Int32Array(256);
  private vals: Int32Array = new Int32Array(256);
  private count = 0;
  /** Per code index, the key (spelling) it was first seen with, or -1. */
  private firstKey: Int32Array = new Int32Array(256).fill(-1);

  /** The index of the code spelled by bytes [s, e) (trimmed), adding it if new; -1 if the bytes are not ASCII. */
  lookupBytes(b: Uint8Array, s: number, e: number): number {
    let h = 2166136261;
    let high = 0;
    for (let i = s; i < e; i++) {
      const c = b[i]!;
      high |= c;
      h = Math.imul(h ^ c, 16777619);
    }
    if (high & 128) return -1;
    const mask = this.keys.length - 1;
    let slot = (h >>> 0) & mask;
    const len = e - s;
    for (;;) {
      const k = this.keys[slot]!;
      if (k < 0) break;
      if (this.lens[k] === len) {
        const o = this.starts[k]!;
        let same = true;
        for (let i = 0; i < len; i++) if (this.arena[o + i] !== b[s + i]) {
          same = false;
          break;
        }
        if (same) return this.vals[k]!;
      }
      slot = (slot + 1) & mask;
    }
    // New spelling: normalise, then find or add the code.
    let t = '';
    for (let i = s; i < e; i++) t += String.fromCharCode(b[i]!);
    const v = this.lookup(t);
    this.addKey(b, s, e, v, slot);
    return v;
  }

  private addKey(b: Uint8Array, s: number, e: number, v: number, slot: number): void {
    const len = e - s;
    if (this.count === this.starts.length) {
      const grow = (a: Int32Array) => {
        const g = new Int32Array(a.length * 2);
        g.set(a);
        return g;
      };
      this.starts = grow(this.starts);
      this.lens = grow(this.lens);
      this.vals = grow(this.vals);
    }
    while (this.arenaLen + len > this.arena.length) {
      const g = new Uint8Array(this.arena.length * 2);
      g.set(this.arena);
      this.arena = g;
    }
    this.arena.set(b.subarray(s, e), this.arenaLen);
    const k = this.count++;
    this.starts[k] = this.arenaLen;
    this.lens[k] = len;
    this.vals[k] = v;
    this.arenaLen += len;
    this.keys[slot] = k;
    if (v >= this.firstKey.length) {
      const g = new Int32Array(Math.max(v + 1, this.firstKey.length * 2)).fill(-1);
      g.set(this.firstKey);
      this.firstKey = g;
    }
    if (this.firstKey[v]! < 0) this.firstKey[v] = k;
    if (this.count * 2 > this.keys.length) this.rehash();
  }

  private rehash(): void {
    const keys = new Int32Array(this.keys.length * 2).fill(-1);
    const mask = keys.length - 1;
    for (let k = 0; k < this.count; k++) {
      let h = 2166136261;
      const o = this.starts[k]!;
      for (let i = 0; i < this.lens[k]!; i++) h = Math.imul(h ^ this.arena[o + i]!, 16777619);
      let slot = (h >>> 0) & mask;
      while (keys[slot]! >= 0) slot = (slot + 1) & mask;
      keys[slot] = k;
    }
    this.keys = keys;
  }

  /** Whether bytes [s, e) spell code v as it was first seen (a cheap check of a guess). */
  spells(v: number, b: Uint8Array, s: number, e: number): boolean {
    if (v < 0 || v >= this.firstKey.length) return false;
    const k = this.firstKey[v]!;
    if (k < 0 || this.lens[k] !== e - s) return false;
    const o = this.starts[k]!;
    for (let i = 0; i < e - s; i++) if (this.arena[o + i] !== b[s + i]) return false;
    return true;
  }

  /** The index of a code given as text (normalised here), adding it if new. */
  lookup(text: string): number {
    const code = normalizeCode(text);
    let v = this.byCode.get(code);
    if (v === undefined) {
      v = this.codes.length;
      this.codes.push(code);
      this.byCode.set(code, v);
    }
    return v;
  }
}

/** Which-comes-first constraints between codes, from the order lines list them. */
class OrderEdges {
  private last: Int32Array = new Int32Array(256).fill(-1);
  readonly edges = new Map<number, Set<number>>();
  /** The last code seen after a (a guess at the next one), or -1. */
  next(a: number): number {
    return a >= 0 && a < this.last.length ? this.last[a]! : -1;
  }
  add(a: number, b: number): void {
    if (a === b) return;
    if (a >= this.last.length) {
      const g = new Int32Array(Math.max(a + 1, this.last.length * 2)).fill(-1);
      g.set(this.last);
      this.last = g;
    }
    if (this.last[a] === b) return;
    this.last[a] = b;
    let s = this.edges.get(a);
    if (!s) this.edges.set(a, (s = new Set()));
    s.add(b);
  }
  /** A topological order with ties broken by first appearance, or undefined if the constraints disagree. */
  order(n: number): number[] | undefined {
    const indeg = new Int32Array(n);
    for (const [, s] of this.edges) for (const b of s) indeg[b]++;
    // A min-heap on index (first appearance).
    const heap: number[] = [];
    const push = (x: number) => {
      heap.push(x);
      let i = heap.length - 1;
      while (i > 0) {
        const p = (i - 1) >> 1;
        if (heap[p]! <= x) break;
        heap[i] = heap[p]!;
        i = p;
      }
      heap[i] = x;
    };
    const pop = () => {
      const top = heap[0]!;
      const x = heap.pop()!;
      if (heap.length) {
        let i = 0;
        for (;;) {
          const l = 2 * i + 1;
          if (l >= heap.length) break;
          const r = l + 1;
          const c = r < heap.length && heap[r]! < heap[l]! ? r : l;
          if (heap[c]! >= x) break;
          heap[i] = heap[c]!;
          i = c;
        }
        heap[i] = x;
      }
      return top;
    };
    for (let i = 0; i < n; i++) if (indeg[i] === 0) push(i);
    const out: number[] = [];
    while (heap.length) {
      const a = pop();
      out.push(a);
      const s = this.edges.get(a);
      if (s) for (const b of s) if (--indeg[b] === 0) push(b);
    }
    return out.length === n ? out : undefined;
  }
}

interface FieldChoice {
  row: number;
  col: number;
  value: number;
  header: boolean;
  transposed: boolean;
  /** How the orientation was decided: given (an option or the mapping), named by the header, or the order of the fields. */
  orientation: 'given' | 'named' | 'order';
  /** Lines kept only where field i (0-based) holds the text. */
  select: { field: number; name: string; value: string }[];
  /** Fields besides the codes and the value whose texts change from line to line, with a few of their texts (for the message on a pair given twice). */
  varying: { field: number; name: string; values: string[] }[];
  rowLabel?: number;
  colLabel?: number;
  why: string[];
}

/**
 * A test for the lines a selection keeps, with field names looked up in the first line (the
 * header), so that the sample the fields are decided from holds lines of the selection even when
 * the file lists them late (a year after another). Undefined when there is no selection or a
 * name is not in the first line (chooseFields then reports it).
 */
function selectionTest(first: string[] | undefined, select: Record<string, string> | undefined): ((l: string[]) => boolean) | undefined {
  if (!select || !first) return undefined;
  const r = resolveSelection(first.map((t) => t.trim()), select);
  return r.missing === undefined ? (l) => keepsLine(r.fields, l) : undefined;
}

type Selection = FieldChoice['select'];

/** A selection's fields, by 1-based number or by a name of `names` (case-insensitive); `missing` is the first key found neither way. */
function resolveSelection(names: string[], select: Record<string, string>): { fields: Selection; missing?: string } {
  const fields: Selection = [];
  for (const [key, value] of Object.entries(select)) {
    const k = key.trim();
    const field = /^\d+$/.test(k) ? Number(k) - 1 : names.findIndex((n) => n.toLowerCase() === k.toLowerCase());
    if (field < 0) return { fields, missing: key };
    fields.push({ field, name: names[field] || `field ${field + 1}`, value: String(value).trim() });
  }
  return { fields };
}

/** Whether a line holds every text of the selection. */
function keepsLine(select: Selection, l: string[]): boolean {
  return select.every((q) => (l[q.field] ?? '').trim() === q.value);
}

/** Lines for deciding the fields: the first SAMPLE_LINES, and with a selection the later lines it keeps, until it keeps SAMPLE_LINES. */
function sampleOf(lines: string[][], options: LongOptions): string[][] {
  const firstAt = lines.findIndex((f) => f.some((x) => x.trim() !== ''));
  const test = selectionTest(lines[firstAt], options.select ?? options.mapping?.select);
  const out = lines.slice(0, SAMPLE_LINES);
  if (!test) return out;
  // The first lines as they are (so a selection that keeps nothing can say what the field holds),
  // then the later lines the selection keeps, up to SAMPLE_LINES of them in all.
  let kept = out.filter((l, i) => i > firstAt && test(l)).length;
  for (let i = SAMPLE_LINES; i < lines.length && kept < SAMPLE_LINES; i++) {
    if (test(lines[i]!)) {
      out.push(lines[i]!);
      kept++;
    }
  }
  return out;
}

/** Decide the fields from sample lines (texts, 0-based fields). */
function chooseFields(sample: string[][], options: LongOptions, file: string): FieldChoice {
  const m = options.mapping ?? {};
  const want = (v: number | undefined, what: string) => {
    if (v === undefined || v === null) return undefined;
    if (!Number.isInteger(v) || v < 1) throw new InputError('bad-option', `${what} must be a field number from 1; got ${v}`);
    return v - 1;
  };
  let row = want(options.rowCodeField ?? m.rowCodeField, 'rowCodeField');
  let col = want(options.columnCodeField ?? m.columnCodeField, 'columnCodeField');
  let value = want(options.valueField ?? m.valueField, 'valueField');
  let transposed = options.transposed ?? m.transposed ?? false;
  let orientation: FieldChoice['orientation'] = options.transposed !== undefined || m.transposed !== undefined || (row !== undefined && col !== undefined) ? 'given' : 'order';
  const lines = sample.filter((f) => f.some((x) => x.trim() !== ''));
  if (!lines.length) throw new InputError('empty-file', `file ${file} has no lines`, { file }, 'Give a file with a table in it');
  const nf = Math.max(...lines.map((f) => f.length));
  const why: string[] = [];
  // Header: the first line's value field (or, not knowing it yet, every field) is text.
  let header = options.header ?? (m.headerLine === undefined ? undefined : m.headerLine !== null);
  const first = lines[0]!;
  const isNum = (t: string) => analyseNumber(t.trim()) !== undefined;
  const named = first.filter((t) => ROW_NAMES.test(t.trim()) || COL_NAMES.test(t.trim()) || VALUE_NAMES.test(t.trim())).length;
  if (header === undefined && named >= 2) header = true;
  if (header === undefined) {
    if (value !== undefined) header = first[value] !== undefined && first[value]!.trim() !== '' && !isNum(first[value]!);
    else {
      const later = lines.slice(1, 50);
      header = first.some((t, i) => t.trim() !== '' && !isNum(t) && later.length > 0 && later.filter((l) => l[i] !== undefined && isNum(l[i]!)).length >= later.length * 0.8);
    }
  }
  const names = header ? first.map((t) => t.trim()) : [];
  let select: Selection = [];
  const given = options.select ?? m.select;
  if (given) {
    const r = resolveSelection(names, given);
    const key = r.missing ?? Object.keys(given).find((k) => /^\d+$/.test(k.trim()) && Number(k) > nf);
    if (key !== undefined) {
      throw new InputError(
        'bad-select',
        `file ${file}: the selection names field '${key}', which ${/^\d+$/.test(key.trim()) ? `is not among its ${nf} fields` : header ? 'is not in its header line' : 'cannot be found: the file has no header line, so give the field by number'}`,
        { file, text: key },
        names.length ? `The header names ${names.filter(Boolean).slice(0, 12).map((n) => `'${n}'`).join(', ')}` : undefined,
      );
    }
    select = r.fields;
  }
  /** Whether the header names field i a label ('row_label', 'sector name', 'description'). */
  const labelNamed = (i: number) => /(label|name|title|desc)/i.test(names[i] ?? '');
  const data = (header ? lines.slice(1) : lines).filter((l) => keepsLine(select, l));
  if (!data.length && select.length) {
    const q = select[0]!;
    const seen = [...new Set((header ? lines.slice(1) : lines).map((l) => (l[q.field] ?? '').trim()))].slice(0, 8);
    throw new InputError('select-nothing', `file ${file}: no line has ${select.map((x) => `${x.name} = '${x.value}'`).join(' and ')}`, { file, text: q.value }, `${q.name} holds ${seen.map((v) => `'${v}'`).join(', ')}${seen.length === 8 ? ', ...' : ''}`);
  }
  if (!data.length) throw new InputError('no-rows', `file ${file} has a header line but no data lines`, { file }, 'Give a file with at least one line of data');
  if (header) {
    const r = names.findIndex((n) => ROW_NAMES.test(n));
    const c = names.findIndex((n) => COL_NAMES.test(n));
    const v = names.findIndex((n) => VALUE_NAMES.test(n));
    if (row === undefined && col === undefined && r >= 0 && c >= 0) {
      row = r;
      col = c;
      if (c < r && options.transposed === undefined && m.transposed === undefined) transposed = false; // fields named: take them as named
      if (orientation === 'order') orientation = 'named';
      why.push(`the header names field ${r + 1} '${names[r]}' the row and field ${c + 1} '${names[c]}' the column`);
    }
    if (value === undefined && v >= 0) {
      value = v;
      why.push(`the header names field ${v + 1} '${names[v]}' the value`);
    }
  }
  const zeroTexts = new Set((options.zeroTexts ?? m.zeroTexts ?? []).map((t) => t.trim()));
  // Profile the fields.
  const prof = Array.from({ length: nf }, (_, i) => {
    let num = 0;
    let gaps = 0;
    let filled = 0;
    let spaced = 0;
    let len = 0;
    const distinct = new Set<string>();
    for (const l of data) {
      const t = (l[i] ?? '').trim();
      if (!t) continue;
      filled++;
      len += t.length;
      if (/\s/.test(t)) spaced++;
      if (isNum(t)) num++;
      else if (GAP.test(t) || zeroTexts.has(t)) gaps++;
      if (distinct.size < 3) distinct.add(t);
    }
    // Numeric: numbers on every line but for texts that stand for zero or a gap ('-', '..').
    return { num, filled, labelLike: filled > 0 && spaced >= filled * 0.5 && len / filled > 10, constant: distinct.size === 1 && filled === data.length, numeric: num > 0 && num + gaps === filled };
  });
  if (row === undefined || col === undefined) {
    const pick = (skipConstant: boolean) => {
      const out: number[] = [];
      for (let i = 0; i < nf && out.length < 2; i++) {
        if (i === value || i === row || i === col) continue;
        if (prof[i]!.filled === 0 || prof[i]!.labelLike || (labelNamed(i) && !ROW_NAMES.test(names[i]!) && !COL_NAMES.test(names[i]!))) continue;
        // A field with one value on every line (a region, a year, a table number) holds no codes,
        // unless too few fields are left without it (a table of one sector).
        if (skipConstant && prof[i]!.constant) continue;
        out.push(i);
      }
      return out;
    };
    let codeFields = pick(true);
    // Two code fields are needed, and a value field after them.
    const valueLeft = (f: number[]) => f.length === 2 && prof.some((p, i) => i > f[1]! && p.numeric && !p.constant);
    if (!valueLeft(codeFields)) codeFields = pick(false);
    if (row === undefined && col === undefined) {
      if (codeFields.length < 2) throw new InputError('no-code-fields', `file ${file}: two fields of codes (row and column) were not found`, { file }, 'Give rowCodeField and columnCodeField (1-based)');
      [row, col] = codeFields as [number, number];
      why.push(`fields ${row + 1} and ${col + 1} are the first two that are neither long labels nor the same on every line`);
    } else if (row === undefined) row = codeFields[0];
    else col = codeFields[0];
    if (row === undefined || col === undefined) throw new InputError('no-code-fields', `file ${file}: a field of codes was not found`, { file }, 'Give rowCodeField and columnCodeField (1-based)');
  }
  if (row === col) throw new InputError('bad-option', `the row code and the column code are both field ${row + 1}`);
  if (value === undefined) {
    const candidates = prof.map((p, i) => ({ p, i })).filter(({ p, i }) => i !== row && i !== col && p.numeric);
    const changing = candidates.filter(({ i, p }) => i > Math.min(row!, col!) && !p.constant);
    const constants = candidates.filter(({ p }) => p.constant).map(({ i }) => i + 1);
    if (changing.length) value = changing[0]!.i;
    else if (candidates.length === 1) value = candidates[0]!.i;
    else if (!candidates.length) {
      throw new InputError('no-value-field', `file ${file}: no field holds numbers on every line, so there is no value field`, { file }, 'Give valueField (1-based), and check the decimal mark');
    } else {
      throw new InputError(
        'value-field-ambiguous',
        `file ${file}: fields ${candidates.map(({ i }) => i + 1).join(', ')} hold numbers, but each holds the same number on every line, so none can be told to be the value`,
        { file },
        'Give valueField (1-based)',
      );
    }
    const others = changing.slice(1).map(({ i }) => i + 1);
    why.push(
      `field ${value + 1} is the value: the first field after the codes whose numbers change from line to line` +
        (constants.length ? `; field${constants.length > 1 ? 's' : ''} ${constants.join(', ')} hold${constants.length > 1 ? '' : 's'} the same value on every line (a year or a table number) and ${constants.length > 1 ? 'are' : 'is'} not read` : '') +
        (others.length ? `; field${others.length > 1 ? 's' : ''} ${rangeText(others)} also hold numbers (pass valueField to read one of them)` : ''),
    );
  }
  if (value === row || value === col) throw new InputError('bad-option', `the value field (${value + 1}) is also a code field`);
  if (value >= nf) throw new InputError('bad-option', `file ${file} has ${nf} field${nf > 1 ? 's' : ''} per line; there is no field ${value + 1} to read values from`, { file }, `Give valueField from 1 to ${nf}`);
  if (transposed) {
    [row, col] = [col, row];
    why.push('transposed: the first code field is the column');
  }
  const varying: FieldChoice['varying'] = [];
  for (let i = 0; i < nf; i++) {
    if (i === row || i === col || i === value || prof[i]!.filled === 0 || prof[i]!.labelLike || select.some((q) => q.field === i) || /^(obs_)?(flags?|status|notes?)$/i.test(names[i] ?? '')) continue;
    const vals = [...new Set(data.map((l) => (l[i] ?? '').trim()))];
    if (vals.length > 1) varying.push({ field: i, name: names[i] || `field ${i + 1}`, values: vals.slice(0, 4) });
  }
  if (select.length) why.push(`only lines with ${select.map((q) => `${q.name} = '${q.value}'`).join(' and ')} are read`);
  const choice: FieldChoice = { row, col, value, header, transposed, orientation, select, varying, why };
  // A label field right after a code field: long texts, or a header that says so ('row_label').
  const rl = row + 1;
  if (rl < nf && rl !== col && rl !== value && (prof[rl]!.labelLike || (labelNamed(rl) && !prof[rl]!.numeric))) choice.rowLabel = rl;
  const cl = col + 1;
  if (cl < nf && cl !== row && cl !== value && (prof[cl]!.labelLike || (labelNamed(cl) && !prof[cl]!.numeric))) choice.colLabel = cl;
  return choice;
}

/** Whether the value is the last field needed (so a line that stops early has an empty value). */
function valueLast(ch: FieldChoice): boolean {
  return ch.value > ch.row && ch.value > ch.col;
}

function rangeText(xs: number[]): string {
  if (xs.length > 2 && xs.every((x, i) => i === 0 || x === xs[i - 1]! + 1)) return `${xs[0]}-${xs[xs.length - 1]}`;
  return xs.join(', ');
}

/** Cells kept until the codes are known: column index and value, with row runs. */
class Cells {
  private colChunks: (Uint16Array | Uint32Array)[] = [];
  private valChunks: Float64Array[] = [];
  private cur: Uint16Array | Uint32Array = new Uint16Array(CHUNK);
  private curV: Float64Array = new Float64Array(CHUNK);
  private fill = 0;
  count = 0;
  runRow: Int32Array = new Int32Array(1024);
  runStart: Float64Array = new Float64Array(1024);
  runs = 0;
  private lastRow = -1;

  push(r: number, c: number, v: number): void {
    if (r !== this.lastRow) {
      if (this.runs === this.runRow.length) {
        const a = new Int32Array(this.runs * 2);
        a.set(this.runRow);
        this.runRow = a;
        const b = new Float64Array(this.runs * 2);
        b.set(this.runStart);
        this.runStart = b;
      }
      this.runRow[this.runs] = r;
      this.runStart[this.runs] = this.count;
      this.runs++;
      this.lastRow = r;
    }
    if (this.fill === CHUNK) this.flush();
    if (c > 65535 && this.cur instanceof Uint16Array) {
      const w = new Uint32Array(CHUNK);
      w.set(this.cur.subarray(0, this.fill));
      this.cur = w;
    }
    this.cur[this.fill] = c;
    this.curV[this.fill] = v;
    this.fill++;
    this.count++;
  }

  private flush(): void {
    this.colChunks.push(this.cur);
    this.valChunks.push(this.curV);
    const wide = this.cur instanceof Uint32Array;
    this.cur = wide ? new Uint32Array(CHUNK) : new Uint16Array(CHUNK);
    this.curV = new Float64Array(CHUNK);
    this.fill = 0;
  }

  /** Set the value of cell k (used to settle waiting numbers). */
  set(k: number, v: number): void {
    const ch = Math.floor(k / CHUNK);
    const o = k % CHUNK;
    if (ch < this.valChunks.length) this.valChunks[ch]![o] = v;
    else this.curV[o] = v;
  }

  /** Visit every cell (row, column, value, index) in order, releasing chunks as they are done. */
  drain(f: (r: number, c: number, v: number, k: number) => void): void {
    this.colChunks.push(this.cur.subarray(0, this.fill) as Uint16Array | Uint32Array);
    this.valChunks.push(this.curV.subarray(0, this.fill));
    let run = 0;
    let row = this.runs ? this.runRow[0]! : 0;
    let nextStart = this.runs > 1 ? this.runStart[1]! : Infinity;
    let k = 0;
    for (let ch = 0; ch < this.colChunks.length; ch++) {
      const cs = this.colChunks[ch]!;
      const vs = this.valChunks[ch]!;
      const len = cs.length;
      for (let o = 0; o < len; o++, k++) {
        if (k >= nextStart) {
          do run++;
          while (run + 1 < this.runs && this.runStart[run + 1]! <= k);
          row = this.runRow[run]!;
          nextStart = run + 1 < this.runs ? this.runStart[run + 1]! : Infinity;
        }
        f(row, cs[o]!, vs[o]!, k);
      }
      this.colChunks[ch] = new Uint16Array(0);
      this.valChunks[ch] = new Float64Array(0);
    }
  }
}

/** The long-file accumulator behind the scanner sink and the grid reader. */
class LongReader {
  readonly rows = new CodeTable();
  readonly cols = new CodeTable();
  readonly cells = new Cells();
  private rowEdges = new OrderEdges();
  private colEdges = new OrderEdges();
  private prevRow = -1;
  private prevCol = -1;

  /** A guess at the next column code (row-major files list the columns in the same order in each run). */
  guessCol(): number {
    return this.rowMajor ? this.colEdges.next(this.prevCol) : -1;
  }
  rowMajor = true;
  /** Records (0-based) that gave no cell: header and blank lines. */
  readonly skipped: number[] = [];
  record = 0;
  readonly numbers: NumberReader;
  /** Waiting numbers: record → cell index. */
  readonly pending = new Map<number, number>();
  private readonly zeroBlank: boolean;
  private readonly zeroTexts: Set<string>;
  readonly labelOf = new Map<string, string>();
  private maxCells: number;

  constructor(
    readonly file: string,
    readonly choice: FieldChoice,
    readonly options: LongOptions,
  ) {
    this.numbers = new NumberReader(options, (r, c, text) => whereAt(file, r, c, text));
    this.zeroBlank = (options.blanks ?? options.mapping?.blanks ?? 'error') === 'zero';
    this.zeroTexts = new Set((options.zeroTexts ?? options.mapping?.zeroTexts ?? []).map((t) => t.trim()));
    this.maxCells = limitsOf(options.limits).maxCells;
  }

  private where(field: number, text?: string, codes?: [string, string]): Where {
    const w = whereAt(this.file, this.record, field, text);
    if (codes) {
      w.rowLabel = codes[0];
      w.columnLabel = codes[1];
    }
    return w;
  }

  add(r: number, c: number, v: number): void {
    if (r === this.prevRow) {
      if (this.rowMajor) this.colEdges.add(this.prevCol, c);
    } else if (this.prevRow >= 0 && this.rowMajor) this.rowEdges.add(this.prevRow, r);
    if (c === this.prevCol) {
      if (!this.rowMajor) this.rowEdges.add(this.prevRow, r);
    } else if (this.prevCol >= 0 && !this.rowMajor) this.colEdges.add(this.prevCol, c);
    this.prevRow = r;
    this.prevCol = c;
    if (this.cells.count >= this.maxCells) {
      throw new InputError('too-many-cells', `file ${this.file} has more than ${this.maxCells.toLocaleString('en')} lines of values, over the limit`, { file: this.file }, 'Raise the limit (maxCells) if this machine has the memory for it');
    }
    this.cells.push(r, c, v);
  }

  /** A value given as text (slow path); returns the number, or queues a waiting one. */
  valueText(t: string, r: number, c: number): void {
    const field = this.choice.value;
    if (t === '') {
      if (this.zeroBlank) return this.add(r, c, 0);
      throw new InputError('blank-cell', `file ${this.file}, line ${this.record + 1}: the value (field ${field + 1}) is empty for row '${this.rows.codes[r]}', column '${this.cols.codes[c]}'`, this.where(field, undefined, [this.rows.codes[r]!, this.cols.codes[c]!]), "If empty values mean zero, read with blanks: 'zero'");
    }
    const v = this.numbers.read(t, this.record, field);
    if (v === NumberReader.PENDING) {
      this.pending.set(this.record, this.cells.count);
      return this.add(r, c, 0);
    }
    if (Number.isNaN(v)) {
      if (this.zeroTexts.has(t)) return this.add(r, c, 0);
      throw new InputError('not-a-number', `file ${this.file}, line ${this.record + 1}, field ${field + 1}: text '${t}' where the value belongs (row '${this.rows.codes[r]}', column '${this.cols.codes[c]}')`, this.where(field, t, [this.rows.codes[r]!, this.cols.codes[c]!]), numberHint(t, this.numbers.decimal) ?? 'Give a number, or choose another value field (valueField)');
    }
    this.add(r, c, v);
  }

  /** One record as texts (grid lines and sample lines). */
  texts(f: string[]): void {
    const ch = this.choice;
    if (f.every((x) => x.trim() === '') || !keepsLine(ch.select, f)) {
      this.skipped.push(this.record);
      return;
    }
    const need = Math.max(ch.row, ch.col, ch.value);
    // A line that stops before its value (after both codes) has an empty value; shorter ones are short.
    if (f.length <= Math.max(ch.row, ch.col) || (f.length <= need && !valueLast(ch))) this.short(f.length);
    const rt = f[ch.row]!.trim();
    const ct = f[ch.col]!.trim();
    if (!rt || !ct) this.missingCode(!rt ? ch.row : ch.col);
    const r = this.rows.lookup(rt);
    const c = this.cols.lookup(ct);
    if (ch.rowLabel !== undefined && f[ch.rowLabel]) this.label(this.rows.codes[r]!, f[ch.rowLabel]!);
    if (ch.colLabel !== undefined && f[ch.colLabel]) this.label(this.cols.codes[c]!, f[ch.colLabel]!);
    this.valueText((f[ch.value] ?? '').trim(), r, c);
  }

  label(code: string, text: string): void {
    if (!this.labelOf.has(code)) this.labelOf.set(code, normalizeLabel(text));
  }

  short(n: number): never {
    const ch = this.choice;
    const need = Math.max(ch.row, ch.col, ch.value) + 1;
    throw new InputError('short-line', `file ${this.file}, line ${this.record + 1} has ${n} field${n === 1 ? '' : 's'}; ${need} are needed (codes in fields ${ch.row + 1} and ${ch.col + 1}, the value in field ${ch.value + 1})`, { file: this.file, row: this.record + 1 }, 'Fix the line, or give the fields (rowCodeField, columnCodeField, valueField)');
  }

  missingCode(field: number): never {
    throw new InputError('empty-code', `file ${this.file}, line ${this.record + 1}: the code in field ${field + 1} is empty`, this.where(field), 'Every line needs a row code and a column code');
  }

  finish(extra: { delimiter?: Delimiter; encoding?: Encoding; findings?: Finding[] }): LongTable {
    const file = this.file;
    for (const { cell, value } of this.numbers.settle()) {
      const k = this.pending.get(cell.row);
      if (k === undefined) continue;
      if (Number.isNaN(value)) {
        throw new InputError('not-a-number', `file ${file}, line ${cell.row + 1}, field ${cell.col + 1}: text '${cell.text}' is not a number under the decimal mark of this file`, whereAt(file, cell.row, cell.col, cell.text), 'Give a number');
      }
      this.cells.set(k, value);
    }
    const nr = this.rows.codes.length;
    const nc = this.cols.codes.length;
    if (!this.cells.count) throw new InputError('no-rows', `file ${file} has no lines of values`, { file }, 'Give a file with at least one line of data');
    const ro = this.rowEdges.order(nr);
    const co = this.colEdges.order(nc);
    const findings: Finding[] = [...(extra.findings ?? [])];
    if (!ro || !co) findings.push({ code: 'order-by-appearance', severity: 'note', message: `file ${file}: the lines do not list the ${!ro ? 'row' : 'column'} codes in one consistent order, so they are kept in the order they first appear`, where: { file } });
    const rowOrder = ro ?? [...Array(nr).keys()];
    const colOrder = co ?? [...Array(nc).keys()];
    const rPos = new Int32Array(nr);
    rowOrder.forEach((r, i) => (rPos[r] = i));
    const cPos = new Int32Array(nc);
    colOrder.forEach((c, i) => (cPos[c] = i));
    const bytes = nr * nc * 8;
    // The dense matrix is held to the cell limit before it is made (a few hundred kilobytes of lines can name 20,000 codes).
    if (nr * nc > this.maxCells) throw new InputError('too-large', `file ${file} has ${nr.toLocaleString('en')} row codes and ${nc.toLocaleString('en')} column codes: a dense matrix of ${(nr * nc).toLocaleString('en')} cells (${sizeText(bytes)}) is over the limit of ${this.maxCells.toLocaleString('en')} cells`, { file }, `Check the code fields (a long file of a table has a few thousand codes at most), or raise the limit (${limitOption('maxCells')})`);
    const data = new Float64Array(nr * nc);
    const seen = new Uint8Array(Math.ceil((nr * nc) / 8));
    const sum = (this.options.duplicates ?? 'error') === 'sum';
    let dup: { k: number; r: number; c: number } | undefined;
    this.cells.drain((r, c, v, k) => {
      const idx = rPos[r]! * nc + cPos[c]!;
      const bit = 1 << (idx & 7);
      const byte = idx >> 3;
      if (seen[byte]! & bit) {
        if (sum) data[idx] += v;
        else if (!dup) dup = { k, r, c };
        return;
      }
      seen[byte] = seen[byte]! | bit;
      data[idx] = v;
    });
    if (dup) {
      const d = dup as { k: number; r: number; c: number };
      const line = this.recordOf(d.k) + 1;
      throw new InputError(
        'duplicate-entry',
        `file ${file}, line ${line}: row '${this.rows.codes[d.r]}', column '${this.cols.codes[d.c]}' is given a second time`,
        { file, row: line, rowLabel: this.rows.codes[d.r]!, columnLabel: this.cols.codes[d.c]! },
        this.choice.varying.length
          ? `The lines differ in ${this.choice.varying.map((v) => `${v.name} (${v.values.map((x) => `'${x}'`).join(', ')}${v.values.length === 4 ? ', ...' : ''})`).join(' and ')}: keep one with a selection, such as select: { "${this.choice.varying[0]!.name}": "${this.choice.varying[0]!.values.at(-1)}" } (the command line: --select ${/\s/.test(this.choice.varying[0]!.name) ? this.choice.varying[0]!.field + 1 : this.choice.varying[0]!.name}=${this.choice.varying[0]!.values.at(-1)})`
          : "Remove the repeated line, or read with duplicates: 'sum' if repeated lines are parts to add",
      );
    }
    const labels = this.options.labels instanceof Map ? this.options.labels : new Map(Object.entries(this.options.labels ?? {}));
    const labelFor = (code: string) => labels.get(code) ?? this.labelOf.get(code) ?? code;
    const rowEntries: Entry[] = rowOrder.map((r, i) => ({ code: this.rows.codes[r]!, label: labelFor(this.rows.codes[r]!), pos: i, at: i + 1 }));
    const colEntries: Entry[] = colOrder.map((c, j) => ({ code: this.cols.codes[c]!, label: labelFor(this.cols.codes[c]!), pos: j, at: j + 1 }));
    const block = new DenseBlock(file, rowEntries, colEntries, data);
    const ch = this.choice;
    const conventions: LongTable['conventions'] = { ...this.numbers.conventions() };
    if (extra.delimiter) conventions.delimiter = extra.delimiter;
    if (extra.encoding) conventions.encoding = extra.encoding;
    const mapping: LongTable['mapping'] = {
      shape: 'long',
      file,
      rowCodeField: (ch.transposed ? ch.col : ch.row) + 1,
      columnCodeField: (ch.transposed ? ch.row : ch.col) + 1,
      valueField: ch.value + 1,
      headerLine: ch.header ? 1 : null,
      transposed: ch.transposed,
      ...(ch.select.length ? { select: Object.fromEntries(ch.select.map((q) => [q.name.startsWith('field ') ? String(q.field + 1) : q.name, q.value])) } : {}),
      blanks: this.zeroBlank ? 'zero' : 'error',
      conventions: { ...conventions },
    };
    if (this.zeroTexts.size) mapping.zeroTexts = [...this.zeroTexts];
    findings.push({ code: 'long-fields', severity: 'note', message: `file ${file} read as a long file: row codes in field ${ch.row + 1}, column codes in field ${ch.col + 1}, values in field ${ch.value + 1}${ch.header ? ', a header line' : ''}; ${ch.why.join('; ')}`, where: { file }, data: { entries: this.cells.count } });
    return {
      rows: { codes: rowEntries.map((e) => e.code), labels: rowEntries.map((e) => e.label) },
      cols: { codes: colEntries.map((e) => e.code), labels: colEntries.map((e) => e.label) },
      matrix: { rows: nr, cols: nc, data },
      block,
      entries: this.cells.count,
      mapping,
      conventions,
      findings,
      orientation: ch.orientation,
    };
  }

  recordOf(k: number): number {
    let rec = k;
    for (const s of this.skipped) {
      if (s <= rec) rec++;
      else break;
    }
    return rec;
  }
}

/** The scanner sink: a sample of lines as text first, then straight from bytes. */
class LongSink implements FieldSink {
  private sample: string[][] = [];
  reader: LongReader | undefined;
  private fs: Int32Array = new Int32Array(0);
  private nf = 0;
  private buf: Uint8Array = new Uint8Array(0);
  private readonly decoder: TextDecoder;

  constructor(
    private readonly file: string,
    private readonly options: LongOptions,
    encoding: Encoding,
  ) {
    this.decoder = encoding === 'windows-1252' ? new TextDecoder('windows-1252') : new TextDecoder('utf-8', { fatal: true });
  }

  private text(b: Uint8Array, s: number, e: number, flags: number, line: number, field: number): string {
    try {
      return fieldText(b, s, e, (flags & ESCAPED) !== 0, this.decoder);
    } catch {
      throw new InputError('bad-encoding', `file ${this.file}, line ${line + 1}, field ${field + 1}: the bytes are not valid UTF-8`, whereAt(this.file, line, field), `Pass the file's encoding (for example encoding: 'windows-1252')`);
    }
  }

  row(b: Uint8Array, fs: Int32Array, nf: number): void {
    if (!this.reader) {
      const fields: string[] = [];
      for (let k = 0; k < nf; k++) fields.push(this.text(b, fs[3 * k]!, fs[3 * k + 1]!, fs[3 * k + 2]!, this.sample.length, k));
      // With a selection, lines it drops wait in the sample as empty lines (skipped on replay),
      // until SAMPLE_LINES lines it keeps are in (or a million lines have gone by).
      let kept = true;
      if (this.keeps === undefined) {
        // The first line with text (a header, if any) is kept and names the fields.
        if (fields.some((x) => x.trim() !== '')) this.keeps = selectionTest(fields, this.options.select ?? this.options.mapping?.select) ?? null;
      } else if (this.keeps) kept = this.keeps(fields);
      this.sample.push(kept || this.sample.length < SAMPLE_LINES ? fields : []);
      if (kept) this.kept++;
      if (this.kept >= SAMPLE_LINES || this.sample.length >= 1_000_000) this.start();
      return;
    }
    this.buf = b;
    this.fs = fs;
    this.nf = nf;
    this.fast();
  }

  /** The test of a selection on lines (null: none), decided at the first line. */
  private keeps: ((l: string[]) => boolean) | null | undefined;
  private kept = 0;

  /** Decide the fields from the sample, then replay it. */
  start(): void {
    const choice = chooseFields(this.sample, this.options, this.file);
    const r = new LongReader(this.file, choice, this.options);
    // Row-major if row codes change less often than column codes in the sample.
    let rc = 0;
    let cc = 0;
    for (let i = 1; i < this.sample.length; i++) {
      const a = this.sample[i - 1]!;
      const b = this.sample[i]!;
      if (a[choice.row] !== b[choice.row]) rc++;
      if (a[choice.col] !== b[choice.col]) cc++;
    }
    r.rowMajor = rc <= cc;
    this.reader = r;
    let headerSkipped = false;
    for (const f of this.sample) {
      if (choice.header && !headerSkipped && f.some((x) => x.trim() !== '')) {
        headerSkipped = true;
        r.skipped.push(r.record);
        r.record++;
        continue;
      }
      r.texts(f);
      r.record++;
    }
    this.sample = [];
  }

  /** The last row code's bytes and index: a long file lists many cells of one row in a run. */
  private lastRow: Uint8Array = new Uint8Array(64);
  private lastRowLen = -1;
  private lastRowIndex = -1;

  private code(field: number, table: CodeTable, isRow: boolean): number {
    const r = this.reader!;
    const b = this.buf;
    const fs = this.fs;
    let s = fs[3 * field]!;
    let e = fs[3 * field + 1]!;
    const flags = fs[3 * field + 2]!;
    while (s < e && (b[s] === 32 || b[s] === 9)) s++;
    while (e > s && (b[e - 1] === 32 || b[e - 1] === 9)) e--;
    if (s === e) r.missingCode(field);
    if (!isRow) {
      const guess = r.guessCol();
      if (guess >= 0 && table.spells(guess, b, s, e)) return guess;
    }
    if (isRow && e - s === this.lastRowLen) {
      const last = this.lastRow;
      let same = true;
      for (let i = 0; i < e - s; i++) if (last[i] !== b[s + i]) {
        same = false;
        break;
      }
      if (same) return this.lastRowIndex;
    }
    let v = flags & ESCAPED ? -1 : table.lookupBytes(b, s, e);
    const ascii = v >= 0;
    if (!ascii) {
      const t = this.text(b, s, e, flags, r.record, field).trim();
      if (!t) r.missingCode(field);
      v = table.lookup(t);
    }
    if (isRow && ascii && e - s <= 64) {
      this.lastRow.set(b.subarray(s, e));
      this.lastRowLen = e - s;
      this.lastRowIndex = v;
    }
    return v;
  }

  private fast(): void {
    const r = this.reader!;
    const ch = r.choice;
    const nf = this.nf;
    this.nf = 0;
    const b = this.buf;
    const fs = this.fs;
    if (nf <= 1 && (nf === 0 || fs[0] === fs[1])) {
      r.skipped.push(r.record);
      r.record++;
      return;
    }
    for (const q of ch.select) {
      if ((q.field < nf ? this.text(b, fs[3 * q.field]!, fs[3 * q.field + 1]!, fs[3 * q.field + 2]!, r.record, q.field).trim() : '') !== q.value) {
        r.skipped.push(r.record);
        r.record++;
        return;
      }
    }
    const need = Math.max(ch.row, ch.col, ch.value);
    if (nf <= Math.max(ch.row, ch.col) || (nf <= need && !valueLast(ch))) r.short(nf);
    const ri = this.code(ch.row, r.rows, true);
    const ci = this.code(ch.col, r.cols, false);
    if (ch.rowLabel !== undefined && !r.labelOf.has(r.rows.codes[ri]!)) r.label(r.rows.codes[ri]!, this.text(b, fs[3 * ch.rowLabel]!, fs[3 * ch.rowLabel + 1]!, fs[3 * ch.rowLabel + 2]!, r.record, ch.rowLabel));
    if (ch.colLabel !== undefined && !r.labelOf.has(r.cols.codes[ci]!)) r.label(r.cols.codes[ci]!, this.text(b, fs[3 * ch.colLabel]!, fs[3 * ch.colLabel + 1]!, fs[3 * ch.colLabel + 2]!, r.record, ch.colLabel));
    const missing = nf <= ch.value;
    let s = missing ? 0 : fs[3 * ch.value]!;
    let e = missing ? 0 : fs[3 * ch.value + 1]!;
    const flags = missing ? 0 : fs[3 * ch.value + 2]!;
    while (s < e && (b[s] === 32 || b[s] === 9)) s++;
    while (e > s && (b[e - 1] === 32 || b[e - 1] === 9)) e--;
    const dec = r.numbers.decimal;
    if (dec === '.' && s < e && flags === 0) {
      // The common case in one pass: [-]digits[.digits], at most 15 significant digits.
      const v = plainDecimal(b, s, e);
      if (v === v) {
        r.add(ri, ci, v);
        r.record++;
        return;
      }
    }
    if (s < e && !(flags & ESCAPED)) {
      const v = scanNumber(b, s, e, dec === ',' ? 44 : 46);
      if (v === v && !(dec === undefined && numberScan.ambiguous)) {
        if (numberScan.decimalSeen && dec === undefined) r.numbers.see('.', r.record, ch.value, fieldText(b, s, e, false));
        r.add(ri, ci, v);
        r.record++;
        return;
      }
    }
    r.valueText(s < e ? this.text(b, s, e, flags, r.record, ch.value).trim() : '', ri, ci);
    r.record++;
  }

  end(): LongReader {
    if (!this.reader) this.start();
    return this.reader!;
  }
}

/** Streams a long CSV file: settle encoding and delimiter from the first 64 KiB, then scan. */
export class StreamingLong {
  private head: Uint8Array[] = [];
  private headBytes = 0;
  private total = 0;
  private scanner: CsvScanner | undefined;
  private sink: LongSink | undefined;
  private delimiter: Delimiter = ',';
  private encoding: Encoding = 'utf-8';
  private transcode: { dec: TextDecoder; enc: TextEncoder } | undefined;
  private findings: Finding[] = [];

  constructor(private readonly options: LongOptions) {
    if (options.delimiter !== undefined && !DELIMITERS.includes(options.delimiter)) {
      throw new InputError('bad-option', `the delimiter must be one of comma, semicolon, tab or bar; got '${options.delimiter}'`);
    }
  }

  push(chunk: Uint8Array): void {
    this.total += chunk.length;
    checkBytes(this.total, limitsOf(this.options.limits).maxBytes, this.options.file);
    if (!this.scanner) {
      this.head.push(chunk);
      this.headBytes += chunk.length;
      if (this.headBytes >= 65536) this.start(false);
      return;
    }
    this.feed(chunk);
  }

  private feed(c: Uint8Array): void {
    this.scanner!.push(this.transcode ? this.transcode.enc.encode(this.transcode.dec.decode(c, { stream: true })) : c);
  }

  private start(final: boolean): void {
    const file = this.options.file;
    let head: Uint8Array = new Uint8Array(this.headBytes);
    let o = 0;
    for (const h of this.head) {
      head.set(h, o);
      o += h.length;
    }
    this.head = [];
    const bom = sniffBom(head);
    if (bom) {
      this.encoding = bom.encoding;
      head = head.subarray(bom.length);
    } else if (this.options.encoding) this.encoding = this.options.encoding;
    else {
      let cut = head;
      if (!final) {
        let i = head.length;
        let k = 0;
        while (i > 0 && k < 4 && (head[i - 1]! & 0xc0) === 0x80) {
          i--;
          k++;
        }
        if (i > 0 && head[i - 1]! >= 0xc0) cut = head.subarray(0, i - 1);
      }
      this.encoding = decodeBytes(cut, file).encoding;
    }
    if (this.encoding === 'utf-16le' || this.encoding === 'utf-16be') this.transcode = { dec: new TextDecoder(this.encoding), enc: new TextEncoder() };
    if (this.encoding === 'windows-1252') this.findings.push({ code: 'encoding-guessed', severity: 'warning', message: `file ${file} is not UTF-8; it was read as Windows-1252`, where: { file } });
    const sample = new TextDecoder(this.encoding).decode(head.subarray(0, 131072)).replace(/\r\n?/g, '\n');
    this.delimiter = this.options.delimiter ?? detectDelimiter(sample, final) ?? ',';
    this.sink = new LongSink(file, withTieBreak(this.options, this.delimiter), this.transcode ? 'utf-8' : this.encoding);
    this.scanner = new CsvScanner(this.delimiter.charCodeAt(0), this.sink, file);
    this.feed(head);
  }

  end(): LongTable {
    const file = this.options.file;
    if (!this.scanner) {
      if (this.headBytes === 0) throw new InputError('empty-file', `file ${file} is empty`, { file }, 'Give a file with a table in it');
      this.start(true);
    }
    if (this.transcode) this.scanner!.push(this.transcode.enc.encode(this.transcode.dec.decode()));
    this.scanner!.end();
    const reader = this.sink!.end();
    return reader.finish({ delimiter: this.delimiter, encoding: this.encoding, findings: this.findings });
  }
}

/** Read a long CSV file held in memory. */
export function readLongCsv(input: Uint8Array | string, options: LongOptions): LongTable {
  const bytes = typeof input === 'string' ? new TextEncoder().encode(input) : input;
  if (bytes.length === 0 || (typeof input === 'string' && input.trim() === '')) throw new InputError('empty-file', `file ${options.file} is empty`, { file: options.file }, 'Give a file with a table in it');
  const r = new StreamingLong(options);
  r.push(bytes);
  return r.end();
}

/** Read a long CSV file from a stream of byte chunks. */
export async function readLongCsvStream(chunks: AsyncIterable<Uint8Array>, options: LongOptions): Promise<LongTable> {
  const r = new StreamingLong(options);
  for await (const c of chunks) r.push(c);
  return r.end();
}

/** Read a long table from a grid (a sheet of a workbook, or a CSV read as a grid). */
export function readLongGrid(grid: Grid, options: Omit<LongOptions, 'file'> & { file?: string }): LongTable {
  const file = grid.file;
  const lines: string[][] = [];
  for (let r = 0; r < grid.rowCount; r++) {
    const row = grid.rows[r]!;
    const f: string[] = [];
    for (let c = 0; c < row.kinds.length; c++) f.push(row.kinds[c] === EMPTY ? '' : grid.text(r, c));
    lines.push(f);
  }
  const o: LongOptions = { ...options, file };
  // The reader of the sheet has settled the decimal mark already (from the cells, or from the
  // delimiter for cells that could not tell): the same mark here.
  const c = grid.conventions as { decimal?: DecimalMark; decimalFrom?: string } | undefined;
  if (o.decimal === undefined && c?.decimal && (c.decimalFrom === 'data' || c.decimalFrom === 'delimiter')) o.decimal = c.decimal;
  const choice = chooseFields(sampleOf(lines, o), o, file);
  const reader = new LongReader(file, choice, o);
  let headerSkipped = false;
  for (const f of lines) {
    if (choice.header && !headerSkipped && f.some((x) => x.trim() !== '')) {
      headerSkipped = true;
      reader.skipped.push(reader.record);
      reader.record++;
      continue;
    }
    reader.texts(f);
    reader.record++;
  }
  const t = reader.finish({});
  if (grid.sheet !== undefined) {
    t.mapping = { ...t.mapping };
    (t.block as { sheet?: string }).sheet = grid.sheet;
  }
  return t;
}
