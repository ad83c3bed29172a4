/**
 * A guard on XLSX archives before they are opened: the zip's central directory is read here
 * (ZIP and ZIP64) and the sizes it declares are held to the limits: the total expanded size,
 * and the ratio of expanded to compressed size of each large part. Then, where the platform
 * has `DecompressionStream`, each deflated part is inflated once, counting bytes and stopping
 * as soon as it produces more than it declared, so that an archive that lies about its sizes
 * cannot expand past the limit either.
 *
 * The ratio is held for each part larger than 1 MiB and for the archive as a whole (every part
 * counted, however small), so that many small parts that each expand a thousand times cannot
 * pass one by one. `inflatePart` streams one part through fflate in slices, counting what it
 * produces against what the directory declares: the streaming XLSX reader inflates only the
 * parts it reads, and never more than they declared.
 */
import { Inflate } from 'fflate';
import { InputError } from '../../engine/errors';
import { limitOption, sizeText } from './limits';

export interface ZipEntry {
  name: string;
  method: number;
  compressedSize: number;
  size: number;
  localOffset: number;
}

function bad(file: string, what: string): InputError {
  return new InputError('bad-xlsx', `file ${file} is not a readable XLSX workbook: ${what}`, { file }, 'Open it in a spreadsheet program and save it again as .xlsx, or export the sheet as CSV');
}

/** The entries of a zip's central directory; throws a clear error for anything that is not a zip. */
export function zipEntries(b: Uint8Array, file: string): ZipEntry[] {
  if (b.length >= 8 && b[0] === 0xd0 && b[1] === 0xcf && b[2] === 0x11 && b[3] === 0xe0) {
    throw new InputError('xls-not-supported', `file ${file} is an old Excel 97-2003 workbook (.xls), which is not read`, { file }, 'Save it as .xlsx (Excel workbook) or export the sheet as CSV');
  }
  if (b.length < 22 || b[0] !== 0x50 || b[1] !== 0x4b) {
    throw new InputError('not-xlsx', `file ${file} is not an XLSX workbook (it does not start as a zip archive does)`, { file }, 'Give an .xlsx workbook, or read the file as CSV');
  }
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  let eocd = -1;
  for (let i = b.length - 22; i >= Math.max(0, b.length - 22 - 65535); i--) {
    if (dv.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw bad(file, 'the zip directory is missing (the file may be cut short)');
  let count = dv.getUint16(eocd + 10, true);
  let cdSize = dv.getUint32(eocd + 12, true);
  let cdOffset = dv.getUint32(eocd + 16, true);
  if (count === 0xffff || cdSize === 0xffffffff || cdOffset === 0xffffffff) {
    const loc = eocd - 20;
    if (loc < 0 || dv.getUint32(loc, true) !== 0x07064b50) throw bad(file, 'a ZIP64 directory is announced but missing');
    const z = Number(dv.getBigUint64(loc + 8, true));
    if (z < 0 || z + 56 > b.length || dv.getUint32(z, true) !== 0x06064b50) throw bad(file, 'the ZIP64 directory is damaged');
    count = Number(dv.getBigUint64(z + 32, true));
    cdSize = Number(dv.getBigUint64(z + 40, true));
    cdOffset = Number(dv.getBigUint64(z + 48, true));
  }
  if (cdOffset + cdSize > b.length) throw bad(file, 'the zip directory points past the end of the file (the file may be cut short)');
  const out: ZipEntry[] = [];
  let p = cdOffset;
  for (let k = 0; k < count; k++) {
    if (p + 46 > b.length || dv.getUint32(p, true) !== 0x02014b50) throw bad(file, `entry ${k + 1} of the zip directory is damaged`);
    const method = dv.getUint16(p + 10, true);
    let compressedSize = dv.getUint32(p + 20, true);
    let size = dv.getUint32(p + 24, true);
    const nameLen = dv.getUint16(p + 28, true);
    const extraLen = dv.getUint16(p + 30, true);
    const commentLen = dv.getUint16(p + 32, true);
    let localOffset = dv.getUint32(p + 42, true);
    if (p + 46 + nameLen + extraLen > b.length) throw bad(file, `entry ${k + 1} of the zip directory is cut short`);
    const name = new TextDecoder().decode(b.subarray(p + 46, p + 46 + nameLen));
    if (size === 0xffffffff || compressedSize === 0xffffffff || localOffset === 0xffffffff) {
      // ZIP64 extended information: the 64-bit values appear in this order, only for fields set to 0xffffffff.
      let q = p + 46 + nameLen;
      const end = q + extraLen;
      while (q + 4 <= end) {
        const id = dv.getUint16(q, true);
        const len = dv.getUint16(q + 2, true);
        if (id === 0x0001) {
          let r = q + 4;
          if (size === 0xffffffff && r + 8 <= q + 4 + len) {
            size = Number(dv.getBigUint64(r, true));
            r += 8;
          }
          if (compressedSize === 0xffffffff && r + 8 <= q + 4 + len) {
            compressedSize = Number(dv.getBigUint64(r, true));
            r += 8;
          }
          if (localOffset === 0xffffffff && r + 8 <= q + 4 + len) localOffset = Number(dv.getBigUint64(r, true));
          break;
        }
        q += 4 + len;
      }
    }
    out.push({ name, method, compressedSize, size, localOffset });
    p += 46 + nameLen + extraLen + commentLen;
  }
  return out;
}

export interface ZipLimits {
  maxExpandedBytes: number;
  maxCompressionRatio: number;
}

/** Hold the declared sizes to the limits. */
export function checkZipSizes(entries: ZipEntry[], file: string, limits: ZipLimits): void {
  let total = 0;
  let packed = 0;
  for (const e of entries) {
    total += e.size;
    packed += e.compressedSize;
    if (total > limits.maxExpandedBytes) {
      throw new InputError(
        'xlsx-expands-too-far',
        `file ${file} would expand to more than ${sizeText(limits.maxExpandedBytes)} when opened (the limit); its part '${e.name}' alone is ${sizeText(e.size)}`,
        { file },
        `Raise the limit (${limitOption('maxExpandedBytes')}) if the workbook is genuine, or export the sheet as CSV`,
      );
    }
    if (e.size > 1024 * 1024 && e.size / Math.max(1, e.compressedSize) > limits.maxCompressionRatio) {
      throw new InputError(
        'xlsx-expands-too-far',
        `file ${file}: its part '${e.name}' expands ${Math.round(e.size / Math.max(1, e.compressedSize))} times (${sizeText(e.compressedSize)} to ${sizeText(e.size)}), more than the limit of ${limits.maxCompressionRatio} times; this is how a zip bomb looks`,
        { file },
        `Raise the limit (${limitOption('maxCompressionRatio')}) if the workbook is genuine, or export the sheet as CSV`,
      );
    }
  }
  // Every part counted: a thousand small parts that each expand a thousand times are one bomb.
  if (total > 1024 * 1024 && total / Math.max(1, packed) > limits.maxCompressionRatio) {
    throw new InputError(
      'xlsx-expands-too-far',
      `file ${file}: its ${entries.length} parts expand ${Math.round(total / Math.max(1, packed))} times together (${sizeText(packed)} to ${sizeText(total)}), more than the limit of ${limits.maxCompressionRatio} times; this is how a zip bomb looks`,
      { file },
      `Raise the limit (${limitOption('maxCompressionRatio')}) if the workbook is genuine, or export the sheet as CSV`,
    );
  }
}

/** Thrown by an `inflatePart` consumer to stop reading a part early (it has what it needs). */
export const STOP_PART: unique symbol = Symbol('stop reading this part');

/** Where a part's compressed bytes are in the archive. */
export function partRange(b: Uint8Array, e: ZipEntry, file: string): { start: number; end: number } {
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  const h = e.localOffset;
  if (h + 30 > b.length || dv.getUint32(h, true) !== 0x04034b50) throw bad(file, `part '${e.name}' is damaged`);
  const start = h + 30 + dv.getUint16(h + 26, true) + dv.getUint16(h + 28, true);
  const end = start + e.compressedSize;
  if (end > b.length) throw bad(file, `part '${e.name}' is cut short`);
  return { start, end };
}

function expandsPast(file: string, e: ZipEntry): InputError {
  return new InputError(
    'xlsx-expands-too-far',
    `file ${file}: its part '${e.name}' expands past the ${sizeText(e.size)} its directory declares; the archive is not what it says it is`,
    { file },
    'Open it in a spreadsheet program and save it again as .xlsx, or export the sheet as CSV',
  );
}

/** The first slice of compressed bytes inflated. */
const FIRST_SLICE = 16 * 1024;

/**
 * Stream one part's bytes to `onChunk`, inflating deflated parts in slices of compressed bytes
 * that start at 16 KiB and double up to `slice`, so a consumer that stops early (a sheet's first
 * rows, its first cell) inflates little more than it reads; stops with an error as soon as the
 * part produces more than its declared size. The consumer may throw STOP_PART to end early;
 * returns false then, true when the part was read whole.
 */
export function inflatePart(b: Uint8Array, e: ZipEntry, file: string, onChunk: (chunk: Uint8Array) => void, slice = 256 * 1024): boolean {
  const { start, end } = partRange(b, e, file);
  let got = 0;
  try {
    if (e.method === 0) {
      if (e.compressedSize !== e.size) throw bad(file, `part '${e.name}' is stored with two different sizes`);
      for (let p = start; p < end; p += slice) onChunk(b.subarray(p, Math.min(end, p + slice)));
      return true;
    }
    if (e.method !== 8) throw bad(file, `part '${e.name}' is compressed by a method this reader does not know (${e.method})`);
    const inf = new Inflate((chunk) => {
      got += chunk.length;
      if (got > e.size) throw expandsPast(file, e);
      if (chunk.length) onChunk(chunk);
    });
    for (let p = start, step = Math.min(slice, FIRST_SLICE); p < end; p += step, step = Math.min(slice, step * 2)) {
      const q = Math.min(end, p + step);
      try {
        inf.push(b.subarray(p, q), q === end);
      } catch (x) {
        if (x === STOP_PART || x instanceof InputError) throw x;
        throw bad(file, `part '${e.name}' does not inflate (${(x as Error).message})`);
      }
    }
    if (start === end) inf.push(new Uint8Array(0), true);
    return true;
  } catch (x) {
    if (x === STOP_PART) return false;
    throw x;
  }
}

/**
 * Inflate each deflated part once, counting bytes, and stop as soon as a part produces more
 * than it declared. Skipped where the platform has no `DecompressionStream('deflate-raw')`.
 */
export async function verifyZipSizes(b: Uint8Array, entries: ZipEntry[], file: string): Promise<boolean> {
  const DS = (globalThis as { DecompressionStream?: new (format: string) => TransformStream<Uint8Array, Uint8Array> }).DecompressionStream;
  if (!DS) return false;
  try {
    new DS('deflate-raw');
  } catch {
    return false;
  }
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  for (const e of entries) {
    if (e.method === 0) {
      if (e.compressedSize !== e.size) throw bad(file, `part '${e.name}' is stored with two different sizes`);
      continue;
    }
    if (e.method !== 8) continue;
    const h = e.localOffset;
    if (h + 30 > b.length || dv.getUint32(h, true) !== 0x04034b50) throw bad(file, `part '${e.name}' is damaged`);
    const start = h + 30 + dv.getUint16(h + 26, true) + dv.getUint16(h + 28, true);
    const end = start + e.compressedSize;
    if (end > b.length) throw bad(file, `part '${e.name}' is cut short`);
    const stream = new Blob([b.subarray(start, end) as Uint8Array<ArrayBuffer>]).stream().pipeThrough(new DS('deflate-raw'));
    const reader = stream.getReader();
    let got = 0;
    for (;;) {
      let r: ReadableStreamReadResult<Uint8Array>;
      try {
        r = await reader.read();
      } catch {
        throw bad(file, `part '${e.name}' does not inflate`);
      }
      if (r.done) break;
      got += r.value.length;
      if (got > e.size) {
        await reader.cancel();
        throw new InputError(
          'xlsx-expands-too-far',
          `file ${file}: its part '${e.name}' expands past the ${sizeText(e.size)} its directory declares; the archive is not what it says it is`,
          { file },
          'Open it in a spreadsheet program and save it again as .xlsx, or export the sheet as CSV',
        );
      }
    }
  }
  return true;
}
