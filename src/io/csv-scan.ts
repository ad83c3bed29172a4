/**
 * A hand-written CSV scanner over bytes, for large files: no string or object per cell, numbers
 * read straight from the bytes. It follows the same rules as the papaparse path (RFC 4180
 * quoting, a doubled quote inside a quoted field, spaces allowed between a closing quote and
 * the delimiter, `\r\n`, `\n` or `\r` ending a row) and a test checks the two agree.
 *
 * Bytes arrive in chunks of any size; a row cut by a chunk boundary is carried to the next.
 */
import { InputError } from '../../engine/errors';

export const QUOTED = 1;
export const ESCAPED = 2;

export interface FieldSink {
  /**
   * One row of `n` fields: field k is bytes [fields[3k], fields[3k+1]) of buf (without the
   * surrounding quotes), with flags fields[3k+2] (QUOTED, ESCAPED). The arrays are reused.
   */
  row(buf: Uint8Array, fields: Int32Array, n: number): void;
}

export class CsvScanner {
  private carry: Uint8Array | null = null;
  private fs: Int32Array = new Int32Array(3 * 1024);
  /** Rows emitted so far. */
  rows = 0;

  constructor(
    private readonly delim: number,
    private readonly sink: FieldSink,
    private readonly file: string,
    private readonly maxRowBytes = 256 * 1024 * 1024,
  ) {}

  push(chunk: Uint8Array): void {
    let buf = chunk;
    if (this.carry) {
      buf = new Uint8Array(this.carry.length + chunk.length);
      buf.set(this.carry);
      buf.set(chunk, this.carry.length);
      this.carry = null;
    }
    const used = this.scan(buf, false);
    if (used < buf.length) {
      if (buf.length - used > this.maxRowBytes) {
        throw new InputError(
          'row-too-long',
          `file ${this.file}: row ${this.rows + 1} is longer than ${Math.round(this.maxRowBytes / 1048576)} MB (an unclosed quote?)`,
          { file: this.file, row: this.rows + 1 },
          'Check the quotes on that row',
        );
      }
      this.carry = buf.slice(used);
    }
  }

  end(): void {
    if (this.carry) {
      const c = this.carry;
      this.carry = null;
      this.scan(c, true);
    }
  }

  private fail(code: string, message: string): never {
    throw new InputError(code, `file ${this.file}, row ${this.rows + 1}: ${message}`, { file: this.file, row: this.rows + 1 }, 'Check the quotes on that row: a quote inside a quoted field is written twice ("")');
  }

  private emit(nf: number, b: Uint8Array): void {
    this.sink.row(b, this.fs, nf);
    this.rows++;
  }

  /** Scan complete rows of b; returns how many bytes were used (the rest is an unfinished row). */
  private scan(b: Uint8Array, final: boolean): number {
    const n = b.length;
    const d = this.delim;
    let p = 0;
    while (p < n) {
      const rowStart = p;
      let nf = 0;
      for (;;) {
        let s = p;
        let e: number;
        let flags = 0;
        if (b[p] === 34) {
          p++;
          s = p;
          flags = QUOTED;
          for (;;) {
            const q = b.indexOf(34, p);
            if (q < 0) {
              if (!final) return rowStart;
              this.fail('bad-quote', 'a quoted field is never closed');
            }
            if (q + 1 < n && b[q + 1] === 34) {
              flags |= ESCAPED;
              p = q + 2;
              continue;
            }
            if (q + 1 >= n && !final) return rowStart;
            e = q;
            p = q + 1;
            break;
          }
          const closed = p;
          // Blank space between the closing quote and the delimiter or line end is allowed (as papaparse does).
          while (p < n && b[p] !== d && (b[p] === 32 || b[p] === 9 || b[p] === 11 || b[p] === 12)) p++;
          if (p < n) {
            const c = b[p]!;
            if (c !== d && c !== 10 && c !== 13) this.fail('bad-quote', 'a quoted field has text after its closing quote');
          } else if (!final) return rowStart;
          else if (p > closed) this.fail('bad-quote', 'a quoted field has text after its closing quote'); // as papaparse: spaces, then the end
        } else {
          while (p < n) {
            const c = b[p]!;
            if (c === d || c === 10 || c === 13) break;
            p++;
          }
          e = p;
        }
        if (3 * nf + 3 > this.fs.length) {
          const g = new Int32Array(this.fs.length * 2);
          g.set(this.fs);
          this.fs = g;
        }
        this.fs[3 * nf] = s;
        this.fs[3 * nf + 1] = e;
        this.fs[3 * nf + 2] = flags;
        nf++;
        if (p >= n) {
          if (!final) return rowStart;
          this.emit(nf, b);
          return n;
        }
        const c = b[p]!;
        if (c === d) {
          p++;
          if (p >= n) {
            if (!final) return rowStart;
            this.fs[3 * nf] = p;
            this.fs[3 * nf + 1] = p;
            this.fs[3 * nf + 2] = 0;
            nf++;
            this.emit(nf, b);
            return n;
          }
          continue;
        }
        if (c === 13) {
          if (p + 1 < n) p += b[p + 1] === 10 ? 2 : 1;
          else {
            if (!final) return rowStart;
            p++;
          }
        } else p++;
        this.emit(nf, b);
        break;
      }
    }
    return n;
  }
}

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * The common case of a number field in one pass: [-]digits[.digits] with a decimal point and at
 * most 15 significant digits, which converts exactly as m / 10^frac. NaN for anything else (the
 * caller then reads the field in full).
 */
export function plainDecimal(b: Uint8Array, s: number, e: number): number {
  let p = s;
  const neg = b[p] === 45;
  if (neg) p++;
  let m = 0;
  let sig = 0;
  let frac = 0;
  let digits = 0;
  let c = 0;
  while (p < e) {
    c = b[p]!;
    if (c < 48 || c > 57) break;
    if (m !== 0 || c !== 48) {
      m = m * 10 + (c - 48);
      sig++;
    }
    digits++;
    p++;
  }
  if (p < e && c === 46) {
    p++;
    const f0 = p;
    while (p < e) {
      c = b[p]!;
      if (c < 48 || c > 57) break;
      if (m !== 0 || c !== 48) {
        m = m * 10 + (c - 48);
        sig++;
      }
      p++;
    }
    frac = p - f0;
    if (frac === 0) return NaN;
    digits += frac;
  }
  if (p !== e || digits === 0 || sig > 15 || frac > 22) return NaN;
  const v = frac ? m / POW10[frac]! : m;
  return neg ? -v : v;
}

/** Result flags of `scanNumber`, read from `numberScan` after a call. */
export const numberScan = { decimalSeen: false, ambiguous: false };

/**
 * A plain number from ASCII bytes [s, e) (already trimmed): sign, digits, one decimal mark `dec`
 * (46 '.' or 44 ','), digits, an optional exponent. Returns NaN when the bytes are anything else
 * (the caller then reads the text the slow way). Exactly rounded: the mantissa is an integer
 * below 2^53 and the power of ten is at most 10^22 (Clinger's fast path); otherwise the text
 * goes to `Number`. Sets `numberScan.decimalSeen` when a decimal mark was read, and
 * `numberScan.ambiguous` when the text has the shape `1.234` (one to three digits, not starting
 * with 0, the mark, three digits), which under an undecided convention is left to the caller.
 */
export function scanNumber(b: Uint8Array, s: number, e: number, dec: number): number {
  numberScan.decimalSeen = false;
  numberScan.ambiguous = false;
  let p = s;
  let neg = false;
  let c = b[p];
  if (c === 45) {
    neg = true;
    p++;
  } else if (c === 43) p++;
  let m = 0;
  let digits = 0;
  let sig = 0;
  let intDigits = 0;
  let firstDigit = -1;
  while (p < e) {
    c = b[p]!;
    if (c < 48 || c > 57) break;
    if (firstDigit < 0) firstDigit = c - 48;
    if (m !== 0 || c !== 48) {
      m = m * 10 + (c - 48);
      sig++;
    }
    digits++;
    intDigits++;
    p++;
  }
  let frac = 0;
  if (p < e && b[p] === dec) {
    p++;
    numberScan.decimalSeen = true;
    const f0 = p;
    while (p < e) {
      c = b[p]!;
      if (c < 48 || c > 57) break;
      if (m !== 0 || c !== 48) {
        m = m * 10 + (c - 48);
        sig++;
      }
      p++;
    }
    frac = p - f0;
    if (frac === 0) return NaN;
    digits += frac;
  }
  if (digits === 0) return NaN;
  let exp = 0;
  let hasExp = false;
  if (p < e && (b[p] === 101 || b[p] === 69)) {
    hasExp = true;
    p++;
    let eneg = false;
    if (p < e && (b[p] === 45 || b[p] === 43)) {
      eneg = b[p] === 45;
      p++;
    }
    const e0 = p;
    while (p < e) {
      c = b[p]!;
      if (c < 48 || c > 57) break;
      exp = exp * 10 + (c - 48);
      if (exp > 100000) exp = 100000;
      p++;
    }
    if (p === e0) return NaN;
    if (eneg) exp = -exp;
  }
  if (p !== e) return NaN;
  if (numberScan.decimalSeen && !hasExp && frac === 3 && intDigits >= 1 && intDigits <= 3 && firstDigit !== 0) numberScan.ambiguous = true;
  let v: number;
  const e10 = exp - frac;
  if (sig <= 15 && e10 >= -22 && e10 <= 22) v = e10 < 0 ? m / POW10[-e10]! : m * POW10[e10]!;
  else {
    let t = '';
    for (let i = s; i < e; i++) t += String.fromCharCode(b[i] === dec ? 46 : b[i]!);
    v = Number(t);
    // Beyond the range of doubles ('1e400'): not a number, so that the cell is read as text and reported.
    return Number.isFinite(v) ? v : NaN;
  }
  return neg ? -v : v;
}

const utf8 = new TextDecoder('utf-8', { fatal: true });

/** The text of bytes [s, e): ASCII directly, otherwise through the decoder. Doubled quotes are undone when `escaped`. */
export function fieldText(b: Uint8Array, s: number, e: number, escaped: boolean, decoder: TextDecoder = utf8): string {
  let t: string;
  let ascii = e - s <= 256;
  if (ascii) for (let i = s; i < e; i++) if (b[i]! >= 128) { ascii = false; break; }
  if (ascii) {
    t = '';
    for (let i = s; i < e; i++) t += String.fromCharCode(b[i]!);
  } else t = decoder.decode(b.subarray(s, e));
  if (escaped) t = t.replace(/""/g, '"');
  if (t.indexOf('\r') >= 0) t = t.replace(/\r\n?/g, '\n');
  return t;
}

/**
 * Whether the text of a plain number (bytes [s, e), already read by `scanNumber` with a '.'
 * mark) is exactly how JavaScript writes that number, so that it need not be kept: no sign but
 * '-', no exponent, no leading or trailing zeros, at most 15 significant digits, and a size
 * JavaScript writes without an exponent. When unsure, false.
 */
export function isShortestText(b: Uint8Array, s: number, e: number): boolean {
  let p = s;
  if (b[p] === 45) p++;
  if (p >= e) return false;
  if (b[p] === 48 && p + 1 < e && b[p + 1] !== 46) return false; // a leading zero
  let dot = -1;
  let sig = 0;
  let lead = true;
  for (let i = p; i < e; i++) {
    const c = b[i]!;
    if (c === 46) {
      if (dot >= 0) return false;
      dot = i;
      continue;
    }
    if (c < 48 || c > 57) return false;
    if (lead && c === 48) continue;
    lead = false;
    sig++;
  }
  if (sig > 15) return false;
  if (dot >= 0) {
    if (dot === e - 1 || dot === p || b[e - 1] === 48) return false; // '5.', '.5', '1.50'
    // JavaScript writes numbers below 1e-6 with an exponent.
    let zeros = 0;
    if (b[p] === 48) for (let i = dot + 1; i < e && b[i] === 48; i++) zeros++;
    if (zeros >= 6) return false;
  } else if (e - p > 21) return false;
  return true;
}
