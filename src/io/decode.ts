/**
 * Bytes to text: a byte-order mark (UTF-8, UTF-16 LE or BE) is honoured and dropped; without
 * one, UTF-8 is tried strictly and, if the bytes are not UTF-8, Windows-1252 (the common
 * single-byte encoding of spreadsheet exports) is used and reported.
 */
import { InputError } from '../../engine/errors';

export type Encoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

export interface Decoded {
  text: string;
  encoding: Encoding;
  bom: boolean;
}

/** The encoding a byte-order mark announces, and the mark's length. */
export function sniffBom(b: Uint8Array): { encoding: Encoding; length: number } | undefined {
  if (b.length >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) return { encoding: 'utf-8', length: 3 };
  if (b.length >= 2 && b[0] === 0xff && b[1] === 0xfe) return { encoding: 'utf-16le', length: 2 };
  if (b.length >= 2 && b[0] === 0xfe && b[1] === 0xff) return { encoding: 'utf-16be', length: 2 };
  return undefined;
}

/** Whether bytes look like a binary file: NUL bytes early on, and not UTF-16 text. */
export function looksBinary(b: Uint8Array): boolean {
  const n = Math.min(b.length, 4096);
  for (let i = 0; i < n; i++) if (b[i] === 0) return utf16Order(b) === undefined;
  return false;
}

/** 'utf-16le' or 'utf-16be' when every other byte is zero (ASCII text in UTF-16 without a mark). */
function utf16Order(b: Uint8Array): Encoding | undefined {
  const n = Math.min(b.length, 4096) & ~1;
  if (n < 2) return undefined;
  let even = 0;
  let odd = 0;
  for (let i = 0; i < n; i += 2) {
    if (b[i] === 0) even++;
    if (b[i + 1] === 0) odd++;
  }
  if (odd > n / 2.5 && even === 0) return 'utf-16le';
  if (even > n / 2.5 && odd === 0) return 'utf-16be';
  return undefined;
}

export function decodeBytes(b: Uint8Array, file: string, encoding?: Encoding): Decoded {
  const bom = sniffBom(b);
  if (bom && (!encoding || encoding === bom.encoding)) {
    return { text: new TextDecoder(bom.encoding).decode(b.subarray(bom.length)), encoding: bom.encoding, bom: true };
  }
  if (encoding) {
    try {
      return { text: new TextDecoder(encoding, { fatal: encoding === 'utf-8' }).decode(b), encoding, bom: false };
    } catch {
      throw new InputError('bad-encoding', `file ${file} is not valid ${encoding}`, { file }, `Pass the file's encoding (for example encoding: 'windows-1252')`);
    }
  }
  const u16 = utf16Order(b);
  if (u16) return { text: new TextDecoder(u16).decode(b), encoding: u16, bom: false };
  if (looksBinary(b)) {
    throw new InputError('not-text', `file ${file} is not a text file (it holds binary bytes)`, { file }, 'Give a CSV or text file, or an .xlsx workbook');
  }
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(b), encoding: 'utf-8', bom: false };
  } catch {
    return { text: new TextDecoder('windows-1252').decode(b), encoding: 'windows-1252', bom: false };
  }
}
