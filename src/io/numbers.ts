/**
 * Reading numbers written as text, under a decimal convention that is either given or found in
 * the data, and never guessed silently.
 *
 * A token such as `0,5`, `12.25`, `1.234,5` or `1,234,567` shows which mark is the decimal one;
 * `1,234` or `1.234` alone does not (a thousand and some, or one and a fraction). Such cells wait
 * until the file shows its convention; if it never does, reading stops with an error that names
 * the first of them and says how to choose. Thousands separators (`,` `.` space, non-breaking
 * space, apostrophe) are accepted where they group digits by three. A minus sign may be `-` or
 * the typographic `−`.
 */
import { InputError, type Where } from '../../engine/errors';

export type DecimalMark = '.' | ',';

/** How numbers are written. `thousands: ''` allows no thousands separator. */
export interface NumberOptions {
  decimal?: DecimalMark;
  thousands?: string;
  /**
   * The decimal mark to take when no cell shows it and every ambiguous cell uses it (such as
   * '48.986'): the CSV readers give '.' for unquoted cells of comma-separated files, where a
   * decimal comma would have to be quoted. Without it (and in every other case) ambiguous cells
   * are an error. The conventions say how many cells it decided, and the readers warn.
   */
  tieBreak?: DecimalMark;
}

/** The conventions a reader used, for the report (and to pass back in to override). */
export interface NumberConventions {
  decimal: DecimalMark;
  /** Where the decimal mark came from: given as an option, seen in the data, the delimiter's usual pair (ambiguous cells only), or the default (no cell needed it). */
  decimalFrom: 'option' | 'data' | 'delimiter' | 'default';
  /** With decimalFrom 'delimiter': how many cells could be read either way, and the first. */
  ambiguous?: { count: number; cell: string };
  /** The cell that showed the decimal mark, when seen in the data. */
  decimalEvidence?: string;
  /** Thousands separators seen (or allowed, when given). */
  thousands: string[];
}

type Analysis =
  | { k: 'plain'; v: number }
  /** A decimal mark is certain; `sep` is the thousands separator used with it, if any. */
  | { k: 'decimal'; mark: DecimalMark; v: number; sep?: string }
  /** Digits grouped by a thousands separator only; if `sep` is ',' or '.', the decimal mark is the other one. */
  | { k: 'thousands'; sep: string; v: number }
  /** One ',' or '.' followed by exactly three digits: a thousands separator or a decimal mark. */
  | { k: 'ambiguous'; sep: DecimalMark; asDecimal: number; asThousands: number };

const SPACE_SEPS = new Set([' ', '\u00a0', '\u202f', '\u2009', "'", '\u2019']);
const NUMERIC_BODY = /^[0-9.,'\u2019 \u00a0\u202f\u2009]+$/;
const EXPONENT = /^(.*[0-9.])([eE][+-]?[0-9]+)$/;

/** Analyse a trimmed text; undefined when it is not a number in any convention (or only beyond the range of doubles, such as '1e400'). */
export function analyseNumber(raw: string): Analysis | undefined {
  const a = analyse(raw);
  if (!a) return undefined;
  if (a.k === 'ambiguous') return Number.isFinite(a.asDecimal) && Number.isFinite(a.asThousands) ? a : undefined;
  return Number.isFinite(a.v) ? a : undefined;
}

function analyse(raw: string): Analysis | undefined {
  let s = raw;
  let sign = 1;
  const c0 = s.charCodeAt(0);
  if (c0 === 45 || c0 === 0x2212) {
    sign = -1;
    s = s.slice(1);
  } else if (c0 === 43) s = s.slice(1);
  let exp = '';
  const m = EXPONENT.exec(s);
  if (m) {
    s = m[1]!;
    exp = m[2]!;
  }
  if (!s || !NUMERIC_BODY.test(s)) return undefined;
  const sepPos: number[] = [];
  let digits = 0;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c >= 48 && c <= 57) digits++;
    else sepPos.push(i);
  }
  if (!digits) return undefined;
  if (!sepPos.length) return { k: 'plain', v: sign * Number(s + exp) };
  // No separator at the end, none doubled.
  if (sepPos[sepPos.length - 1] === s.length - 1) return undefined;
  for (let i = 1; i < sepPos.length; i++) if (sepPos[i] === sepPos[i - 1]! + 1) return undefined;
  const chars: string[] = [];
  for (const p of sepPos) if (!chars.includes(s[p]!)) chars.push(s[p]!);
  const digitsOnly = (a: string) => a.replace(/[^0-9]/g, '');
  if (chars.length > 2) return undefined;
  if (chars.length === 2) {
    const [X, Y] = chars as [string, string];
    if (Y !== '.' && Y !== ',') return undefined;
    const lastY = s.lastIndexOf(Y);
    if (s.indexOf(Y) !== lastY || s.indexOf(X, lastY) >= 0) return undefined;
    const intPart = s.slice(0, lastY);
    if (!groupedByThree(intPart, X)) return undefined;
    return { k: 'decimal', mark: Y, sep: X, v: sign * Number(`${digitsOnly(intPart)}.${s.slice(lastY + 1)}${exp}`) };
  }
  const X = chars[0]!;
  const count = sepPos.length;
  if (SPACE_SEPS.has(X)) {
    if (exp || !groupedByThree(s, X)) return undefined;
    return { k: 'thousands', sep: X, v: sign * Number(digitsOnly(s)) };
  }
  if (X !== '.' && X !== ',') return undefined;
  if (count > 1) {
    if (exp || !groupedByThree(s, X)) return undefined;
    return { k: 'thousands', sep: X, v: sign * Number(digitsOnly(s)) };
  }
  const p = sepPos[0]!;
  const before = s.slice(0, p);
  const after = s.slice(p + 1);
  const asDecimal = sign * Number(`${before || '0'}.${after}${exp}`);
  if (exp || after.length !== 3 || before.length === 0 || before.length > 3 || before[0] === '0') {
    return { k: 'decimal', mark: X, v: asDecimal };
  }
  return { k: 'ambiguous', sep: X, asDecimal, asThousands: sign * Number(before + after) };
}

function groupedByThree(s: string, sep: string): boolean {
  const parts = s.split(sep);
  if (parts[0]!.length < 1 || parts[0]!.length > 3) return false;
  for (let i = 1; i < parts.length; i++) if (parts[i]!.length !== 3) return false;
  return parts.every((x) => /^[0-9]+$/.test(x));
}

const OTHER: Record<DecimalMark, DecimalMark> = { '.': ',', ',': '.' };

/** A cell waiting for the decimal convention. */
export interface PendingCell {
  row: number;
  col: number;
  text: string;
  asDecimal: number;
  asThousands: number;
  sep: DecimalMark;
}

/**
 * Reads number texts under one convention, finding the decimal mark in the data when it is not
 * given. `read` returns a number, NaN for text that is not a number, or `PENDING` for an
 * ambiguous cell while the mark is still unknown. `settle` decides the waiting cells at the end.
 */
export class NumberReader {
  decimal: DecimalMark | undefined;
  private from: NumberConventions['decimalFrom'];
  private evidence: { mark: DecimalMark; where: Where; text: string } | undefined;
  readonly thousandsSeen = new Set<string>();
  readonly pending: PendingCell[] = [];
  private ambiguousCells: { count: number; cell: string } | undefined;
  static readonly PENDING = -Infinity;

  constructor(
    private readonly options: NumberOptions,
    private readonly whereOf: (row: number, col: number, text: string) => Where,
  ) {
    this.decimal = options.decimal;
    this.from = options.decimal ? 'option' : 'default';
    if (options.decimal && options.decimal !== '.' && options.decimal !== ',') {
      throw new InputError('bad-option', `the decimal mark must be '.' or ','; got '${String(options.decimal)}'`);
    }
    if (options.thousands !== undefined && options.thousands.length > 1) {
      throw new InputError('bad-option', `the thousands separator must be one character or ''; got '${options.thousands}'`);
    }
    if (options.decimal && options.thousands && options.thousands === options.decimal) {
      throw new InputError('bad-option', `the decimal mark and the thousands separator are both '${options.decimal}'`);
    }
  }

  /** Record that a cell shows the decimal mark (also used by the fast byte path). */
  see(mark: DecimalMark, row: number, col: number, text: string): void {
    if (this.decimal === undefined) {
      this.decimal = mark;
      this.from = 'data';
      this.evidence = { mark, where: this.whereOf(row, col, text), text };
      return;
    }
    if (this.decimal !== mark) {
      if (this.from === 'option') return; // the caller's choice stands; the cell reads as text
      const first = this.evidence!;
      throw new InputError(
        'mixed-decimal',
        `decimal marks disagree${inFile(first.where)}: ${describeCell(first.where)} has '${first.text}' (decimal '${first.mark}') but ${describeCell(this.whereOf(row, col, text))} has '${text}' (decimal '${mark}')`,
        this.whereOf(row, col, text),
        `Set the decimal mark ('.' or ',') explicitly, and fix the cells that do not follow it`,
      );
    }
  }

  private allowThousands(sep: string): boolean {
    const t = this.options.thousands;
    if (t === undefined) return true;
    if (t === '') return false;
    if (t === ' ') return SPACE_SEPS.has(sep) && sep !== "'" && sep !== '\u2019';
    return t === sep;
  }

  /** A number, NaN (not a number), or `NumberReader.PENDING`. `text` is trimmed. */
  read(text: string, row: number, col: number): number {
    const a = analyseNumber(text);
    if (!a) return NaN;
    switch (a.k) {
      case 'plain':
        return a.v;
      case 'decimal':
        this.see(a.mark, row, col, text);
        if (a.mark !== this.decimal) return NaN;
        if (a.sep !== undefined) {
          if (!this.allowThousands(a.sep)) return NaN;
          this.thousandsSeen.add(a.sep);
        }
        return a.v;
      case 'thousands':
        if (a.sep === '.' || a.sep === ',') {
          this.see(OTHER[a.sep], row, col, text);
          if (this.decimal === a.sep) return NaN;
        }
        if (!this.allowThousands(a.sep)) return NaN;
        this.thousandsSeen.add(a.sep);
        return a.v;
      case 'ambiguous':
        if (this.decimal === undefined) {
          this.pending.push({ row, col, text, asDecimal: a.asDecimal, asThousands: a.asThousands, sep: a.sep });
          return NumberReader.PENDING;
        }
        if (a.sep === this.decimal) return a.asDecimal;
        if (!this.allowThousands(a.sep)) return NaN;
        this.thousandsSeen.add(a.sep);
        return a.asThousands;
    }
  }

  /**
   * Decide the waiting cells: each gets its number (or NaN if under the convention it is not
   * one). With no convention in sight, an ambiguous cell is an error.
   */
  settle(): { cell: PendingCell; value: number }[] {
    if (this.decimal === undefined && this.pending.length && this.options.tieBreak && this.pending.every((q) => q.sep === this.options.tieBreak)) {
      const p = this.pending[0]!;
      this.decimal = this.options.tieBreak;
      this.from = 'delimiter';
      this.ambiguousCells = { count: this.pending.length, cell: `${describeCell(this.whereOf(p.row, p.col, p.text))} '${p.text}'` };
    }
    if (this.decimal === undefined) {
      if (this.pending.length) {
        const p = this.pending[0]!;
        const w = this.whereOf(p.row, p.col, p.text);
        throw new InputError(
          'ambiguous-number',
          `${inFile(w).replace(/^ in /, '')}${inFile(w) ? ', ' : ''}${describeCell(w)}: '${p.text}' could be ${p.asThousands} ('${p.sep}' as a thousands separator) or ${p.asDecimal} ('${p.sep}' as the decimal mark), and nothing in the file shows which (${this.pending.length} cell${this.pending.length > 1 ? 's' : ''} like it)`,
          w,
          `Choose the decimal mark: decimal: '.' or decimal: ','`,
        );
      }
      this.decimal = '.';
      this.from = 'default';
    }
    const out: { cell: PendingCell; value: number }[] = [];
    for (const p of this.pending) {
      let v: number;
      if (p.sep === this.decimal) v = p.asDecimal;
      else if (this.allowThousands(p.sep)) {
        this.thousandsSeen.add(p.sep);
        v = p.asThousands;
      } else v = NaN;
      out.push({ cell: p, value: v });
    }
    this.pending.length = 0;
    return out;
  }

  conventions(): NumberConventions {
    const c: NumberConventions = {
      decimal: this.decimal ?? '.',
      decimalFrom: this.decimal === undefined ? 'default' : this.from,
      thousands: this.options.thousands !== undefined ? (this.options.thousands ? [this.options.thousands] : []) : [...this.thousandsSeen],
    };
    if (this.evidence) c.decimalEvidence = `${describeCell(this.evidence.where)} '${this.evidence.text}'`;
    if (this.ambiguousCells) c.ambiguous = { ...this.ambiguousCells };
    return c;
  }
}

function inFile(w: Where): string {
  const parts: string[] = [];
  if (w.file) parts.push(`file ${w.file}`);
  if (w.sheet) parts.push(`sheet '${w.sheet}'`);
  return parts.length ? ` in ${parts.join(', ')}` : '';
}

function describeCell(w: Where): string {
  const parts: string[] = [];
  if (w.cell) parts.push(`cell ${w.cell}`);
  else if (w.row !== undefined) parts.push(`row ${w.row}`);
  return parts.join(' ') || 'a cell';
}

/** Why a text is not a number, for the hint of an error (or undefined when nothing specific can be said). */
export function numberHint(text: string, decimal: DecimalMark | undefined): string | undefined {
  const t = text.trim();
  if (t.startsWith('=')) return 'This is a formula with no saved value: open the file in a spreadsheet program and save it, so that the values are stored';
  if (/^\(\s*[0-9][0-9.,]*\s*\)$/.test(t)) return 'Negative numbers in parentheses are not read; write them with a minus sign';
  if (/%\s*$/.test(t)) return 'Percentages are not read as numbers; give the value itself';
  if (/^[-+]?[$€£¥]|[$€£¥]$/.test(t)) return 'Currency symbols are not read; give the number alone (the currency goes in the table\'s metadata)';
  if (/^[-+]?[0-9][0-9.,]*[*a-zA-Z]+$/.test(t)) return 'A footnote mark or letter follows the number; remove it';
  if (/^[-+\u2212]?[0-9.,]+[eE][-+]?[0-9]+$/.test(t) && !Number.isFinite(Number(t.replace(',', '.').replace('\u2212', '-')))) return 'The number is beyond the range of double precision (about 1.8e308); check the cell';
  if (/^(n\/?a|na|\.\.|\.|-|–|—|x|nil|null|none|\?)$/i.test(t)) return `If '${t}' means zero here, pass it in zeroTexts; if it means unknown, fill in a value`;
  const a = analyseNumber(t);
  if (a && decimal) return `It does not follow the decimal mark '${decimal}' used in this file; set decimal: '${decimal === '.' ? ',' : '.'}' if that is the file's convention`;
  return undefined;
}
