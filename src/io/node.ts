/**
 * The Node-only side of the readers: files by path (CSV streamed from disk, so that a 200 MB
 * table never sits in memory as text), standard input, and writing files. Everything else in
 * src/io takes bytes and runs unchanged in the browser.
 */
import { createReadStream } from 'node:fs';
import { readFile, stat, writeFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { InputError } from '../../engine/errors';
import { type CsvOptions, type CsvRead, readCsv, readCsvStream } from './csv';
import { type LongOptions, type LongTable, readLongCsvStream } from './long';
import { checkBytes, limitsOf } from './limits';
import { guessShape, type ReadFileOptions, readGrid, readTableFile, sniffFile, type GridRead } from './open';
import { readTable, type TableRead } from './tables';

const CHUNK = 1 << 20;

async function sizeOf(path: string): Promise<number> {
  try {
    const s = await stat(path);
    if (!s.isFile()) throw new InputError('not-a-file', `${path} is not a file`, { file: path });
    return s.size;
  } catch (e) {
    if (e instanceof InputError) throw e;
    throw new InputError('no-file', `cannot open ${path}: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'there is no such file' : (e as Error).message}`, { file: path }, 'Check the path');
  }
}

/** A file's bytes, after checking its size against the limit. */
export async function readPath(path: string, maxBytes = limitsOf(undefined).maxBytes): Promise<Uint8Array> {
  const size = await sizeOf(path);
  checkBytes(size, maxBytes, basename(path));
  const b = await readFile(path);
  return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
}

function chunks(path: string): AsyncIterable<Uint8Array> {
  return createReadStream(path, { highWaterMark: CHUNK }) as AsyncIterable<Uint8Array>;
}

/** Read a CSV file from disk, streaming it through the byte scanner. */
export async function readCsvFile(path: string, options: Partial<CsvOptions> = {}): Promise<CsvRead> {
  const file = options.file ?? basename(path);
  const size = await sizeOf(path);
  checkBytes(size, limitsOf(options.limits).maxBytes, file);
  if (size === 0) throw new InputError('empty-file', `file ${file} is empty`, { file }, 'Give a file with a table in it');
  return readCsvStream(chunks(path), { ...options, file });
}

/** Read a long (triplet) CSV file from disk, streaming it. */
export async function readLongFile(path: string, options: Partial<LongOptions> = {}): Promise<LongTable> {
  const file = options.file ?? basename(path);
  const size = await sizeOf(path);
  checkBytes(size, limitsOf(options.limits).maxBytes, file);
  if (size === 0) throw new InputError('empty-file', `file ${file} is empty`, { file }, 'Give a file with a table in it');
  return readLongCsvStream(chunks(path), { ...options, file });
}

/** Read a CSV or XLSX file from disk into a grid (CSV streamed). */
export async function readGridFile(path: string, options: Partial<ReadFileOptions> = {}): Promise<GridRead> {
  const file = options.file ?? basename(path);
  const head = await readHead(path);
  if (sniffFile(head, file) === 'csv') {
    const c = await readCsvFile(path, { ...options, file });
    return { grid: c.grid, kind: 'csv', conventions: { ...c.conventions }, findings: c.findings };
  }
  return readGrid(await readPath(path, limitsOf(options.limits).maxXlsxBytes), { ...options, file });
}

async function readHead(path: string): Promise<Uint8Array> {
  await sizeOf(path);
  const s = createReadStream(path, { start: 0, end: 65535 });
  const parts: Uint8Array[] = [];
  for await (const c of s as AsyncIterable<Uint8Array>) parts.push(c);
  const out = new Uint8Array(parts.reduce((a, p) => a + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

/**
 * Read a table from a file on disk: JSON, XLSX, or CSV (wide or long, found from the first
 * lines; both streamed from disk).
 */
export async function readTablePath(path: string, options: Partial<ReadFileOptions> = {}): Promise<TableRead & { shape: 'wide' | 'long' | 'json' }> {
  const file = options.file ?? basename(path);
  const head = await readHead(path);
  const kind = sniffFile(head, file);
  if (kind !== 'csv') return readTableFile(await readPath(path, limitsOf(options.limits).maxBytes), { ...options, file });
  let shape = options.shape ?? options.mapping?.shape;
  if (!shape) {
    // Decide from the first lines (a whole number of them).
    const cut = head.lastIndexOf(10);
    const sample = cut > 0 ? head.subarray(0, cut + 1) : head;
    try {
      shape = guessShape(readCsv(sample, { ...options, file, parser: 'papaparse' }).grid);
    } catch {
      shape = 'wide';
    }
  }
  if (shape === 'long') {
    const lo: Partial<LongOptions> = { ...options, ...(options.long ?? {}), file };
    const long = await readLongFile(path, lo);
    const r = readTable(long, options);
    return { ...r, findings: [...r.findings], shape };
  }
  const c = await readCsvFile(path, { ...options, file });
  const r = readTable(c.grid, options);
  r.mapping.conventions = { ...c.conventions };
  return { ...r, findings: [...c.findings, ...r.findings], shape };
}

/** Standard input as bytes (with the size limit). */
export async function readStdin(maxBytes = limitsOf(undefined).maxBytes): Promise<Uint8Array> {
  const parts: Uint8Array[] = [];
  let total = 0;
  for await (const c of process.stdin as AsyncIterable<Uint8Array>) {
    total += c.length;
    checkBytes(total, maxBytes, 'standard input');
    parts.push(c);
  }
  const out = new Uint8Array(total);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

/** Write text or bytes to a file. */
export async function writePath(path: string, data: string | Uint8Array): Promise<void> {
  await writeFile(path, data);
}
