/**
 * Files in and out: an input is a path or `-` (standard input), read whole (src/io's `readPath`,
 * with its size limit), with its SHA-256 (node:crypto) for the report, or, for a large table
 * (`openInput`), streamed in chunks that are hashed as they pass; an output is a path or `-` (standard output), its format from
 * the extension or `--format`.
 *
 * Outputs are never written in place: each is written whole to a temporary file in its own
 * folder (`.NAME.PID-RANDOM.tmp`), then renamed over the target (a rename within a folder is
 * atomic), so a kill or a failure leaves the old file as it was; such a file left by a run that
 * was killed is removed, with a note, by the next run writing the same output once its process
 * has ended. An output that is one of the
 * inputs read (the same file, by device and inode, through any name or link) is refused, and so
 * is one path given twice.
 */
import { createHash, randomBytes } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { chmod, mkdir, open, readdir, rename, stat, unlink, writeFile } from 'node:fs/promises';
import { basename, dirname, extname, join } from 'node:path';
import { checkBytes, limitsOf } from '../io/limits';
import { readPath } from '../io/node';
import type { ReportInputFile } from '../report/model';
import type { CliContext } from './context';
import { absolute } from './context';
import { UsageError } from './errors';
import { terminalSafe } from './text';

export interface InputFile {
  /** The name as given (`-` for standard input). */
  name: string;
  /** The absolute path, or undefined for standard input. */
  path?: string;
  /** The file's bytes; for a file read as a stream (`streamInput`), its first bytes only. */
  bytes: Uint8Array;
  sha256: string;
  /** The file's size, where `bytes` holds only its first bytes. */
  size?: number;
}

interface InputSeen {
  name: string;
  role: string;
  path: string;
  dev: number;
  ino: number;
}

/** The files each run has read, to refuse an output that would replace one of them. */
const inputsRead = new WeakMap<CliContext, InputSeen[]>();

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** Read an input file whole (or standard input for `-`), with a clear error for a missing file. */
export async function readInput(ctx: CliContext, name: string, role: string): Promise<InputFile> {
  if (name === '-') {
    if (ctx.stdin.isTTY) throw stdinIsTerminal(role);
    const chunks: Uint8Array[] = [];
    const max = limitsOf(undefined).maxBytes;
    let total = 0;
    for await (const c of ctx.stdin) {
      const b = asBytes(c);
      total += b.length;
      checkBytes(total, max, 'standard input');
      chunks.push(b);
    }
    const bytes = concat(chunks);
    if (!bytes.length) throw new UsageError(`the ${role} on standard input is empty`, 'empty-input');
    return { name, bytes, sha256: sha256Hex(bytes) };
  }
  const { path } = await statInput(ctx, name, role);
  const bytes = await readPath(path);
  return { name, path, bytes, sha256: sha256Hex(bytes) };
}

/** A path input's folder entry (with a clear error for a missing file or a folder), noted as read. */
async function statInput(ctx: CliContext, name: string, role: string): Promise<{ path: string; size: number }> {
  const path = absolute(ctx, name);
  let info;
  try {
    info = await stat(path);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') {
      throw new UsageError(`the ${role} file '${name}' does not exist`, 'missing-file', `Check the name and the folder (looked in ${dirname(path)})`);
    }
    throw e;
  }
  if (info.isDirectory()) throw new UsageError(`the ${role} '${name}' is a folder, not a file`, 'not-a-file');
  const read = inputsRead.get(ctx) ?? [];
  if (!read.some((r) => r.dev === info.dev && r.ino === info.ino && r.role === role)) read.push({ name, role, path, dev: info.dev, ino: info.ino });
  inputsRead.set(ctx, read);
  return { path, size: info.size };
}

/** The size of a streamed input's first part (what decides how to read it, and its encoding and delimiter). */
export const HEAD_BYTES = 65536;

/** An input that can be read as a stream: its first bytes, and `read` to stream it whole, once. */
export interface StreamableInput {
  /** The input, with its first bytes (at most HEAD_BYTES) in `bytes`; `sha256` and `size` are set once `read` has finished. */
  file: InputFile;
  /** Stream the whole input through `reader`, chunk by chunk, hashing the chunks as they pass (once only). */
  read<T>(reader: (chunks: AsyncIterable<Uint8Array>) => Promise<T>): Promise<T>;
}

/**
 * An input to be read as a stream when it is larger than `minBytes` (one pass, never held whole,
 * its SHA-256 computed from the same chunks the reader sees): a file by its size, standard input
 * once more than `minBytes` have come. A smaller input is read whole, as readInput reads it.
 */
export async function openInput(ctx: CliContext, name: string, role: string, minBytes: number): Promise<InputFile | StreamableInput> {
  const max = limitsOf(undefined).maxBytes;
  if (name !== '-') {
    const { path, size } = await statInput(ctx, name, role);
    if (size <= minBytes) return readInput(ctx, name, role);
    checkBytes(size, max, name);
    return streamOf({ name, path, bytes: await readHead(path, HEAD_BYTES), sha256: '', size }, () => createReadStream(path, { highWaterMark: 1 << 20 }) as AsyncIterable<Uint8Array>);
  }
  if (ctx.stdin.isTTY) throw stdinIsTerminal(role);
  const it = ctx.stdin[Symbol.asyncIterator]();
  const first: Uint8Array[] = [];
  let total = 0;
  while (total <= minBytes) {
    const next = await it.next();
    if (next.done) {
      const bytes = concat(first);
      if (!bytes.length) throw new UsageError(`the ${role} on standard input is empty`, 'empty-input');
      return { name, bytes, sha256: sha256Hex(bytes) };
    }
    const b = asBytes(next.value);
    total += b.length;
    checkBytes(total, max, 'standard input');
    first.push(b);
  }
  const head = concat(first);
  return streamOf({ name, bytes: head.slice(0, HEAD_BYTES), sha256: '' }, async function* () {
    yield head;
    for (let next = await it.next(); !next.done; next = await it.next()) yield asBytes(next.value);
  });
}

/** A streamed input read whole after all (it is not a CSV file). */
export async function wholeInput(s: StreamableInput): Promise<InputFile> {
  const parts: Uint8Array[] = [];
  await s.read(async (chunks) => {
    for await (const c of chunks) parts.push(c);
  });
  const { name, path, sha256 } = s.file;
  return path === undefined ? { name, bytes: concat(parts), sha256 } : { name, path, bytes: concat(parts), sha256 };
}

function streamOf(file: InputFile, source: () => AsyncIterable<Uint8Array>): StreamableInput {
  let used = false;
  const label = file.name === '-' ? 'standard input' : file.name;
  return {
    file,
    async read(reader) {
      if (used) throw new Error(`${label} was read as a stream already`);
      used = true;
      const hash = createHash('sha256');
      let seen = 0;
      async function* chunks(): AsyncIterable<Uint8Array> {
        for await (const c of source()) {
          seen += c.length;
          checkBytes(seen, limitsOf(undefined).maxBytes, label);
          hash.update(c);
          yield c;
        }
      }
      const result = await reader(chunks());
      file.sha256 = hash.digest('hex');
      file.size = seen;
      return result;
    },
  };
}

function asBytes(c: Uint8Array | string): Uint8Array {
  return typeof c === 'string' ? new TextEncoder().encode(c) : c;
}

function stdinIsTerminal(role: string): UsageError {
  return new UsageError(`the ${role} is '-' (standard input), but standard input is a terminal`, 'stdin-tty', 'Pipe the file in, as in: ripplewise check - < table.csv');
}

async function readHead(path: string, n: number): Promise<Uint8Array> {
  const h = await open(path, 'r');
  try {
    const b = new Uint8Array(n);
    const { bytesRead } = await h.read(b, 0, n, 0);
    return b.subarray(0, bytesRead);
  } finally {
    await h.close();
  }
}

function concat(chunks: Uint8Array[]): Uint8Array {
  let n = 0;
  for (const c of chunks) n += c.length;
  const out = new Uint8Array(n);
  let o = 0;
  for (const c of chunks) {
    out.set(c, o);
    o += c.length;
  }
  return out;
}

/** An input as a report states it. */
export function reportInput(f: InputFile, role: string, sheet?: string): ReportInputFile {
  const r: ReportInputFile = { role, name: f.name === '-' ? '(standard input)' : basename(f.name), sha256: f.sha256, bytes: f.size ?? f.bytes.length };
  if (sheet !== undefined) r.sheet = sheet;
  return r;
}

export type OutputFormat = 'csv' | 'tsv' | 'xlsx' | 'json' | 'html';
export const OUTPUT_FORMATS: readonly OutputFormat[] = ['csv', 'tsv', 'xlsx', 'json', 'html'];

const EXTENSIONS: Record<string, OutputFormat> = { '.csv': 'csv', '.tsv': 'tsv', '.txt': 'csv', '.xlsx': 'xlsx', '.json': 'json', '.html': 'html', '.htm': 'html' };

/** The format of an output: `--format` when given, else from the file's extension. */
export function outputFormat(out: string | undefined, format: string | undefined, allowed: readonly OutputFormat[]): OutputFormat {
  if (format !== undefined) {
    const f = format.toLowerCase() as OutputFormat;
    if (!allowed.includes(f)) throw new UsageError(`--format ${format} is not available here; choose one of ${allowed.join(', ')}`, 'bad-format');
    return f;
  }
  if (out === undefined || out === '-') throw new UsageError('writing to standard output needs --format', 'no-format', `Add --format ${allowed.join('|')}`);
  const ext = extname(out).toLowerCase();
  const f = EXTENSIONS[ext];
  if (!f) throw new UsageError(`cannot tell the format of '${out}' from its extension '${ext || '(none)'}'`, 'bad-format', `Use a file ending in ${allowed.map((a) => `.${a}`).join(', ')}, or give --format`);
  if (!allowed.includes(f)) throw new UsageError(`'${out}': ${f.toUpperCase()} output is not available here; choose one of ${allowed.join(', ')}`, 'bad-format');
  return f;
}

/** An output written to its temporary file, waiting to be put in place (or discarded). */
export interface StagedOutput {
  name: string;
  bytes: number;
  /** Rename the temporary file over the target (or write standard output). */
  commit(): Promise<void>;
  /** Remove the temporary file. */
  discard(): Promise<void>;
}

/** Write an output to a temporary file in its folder (creating the folder); nothing is replaced yet. */
export async function stageOutput(ctx: CliContext, out: string, data: string | Uint8Array, format: OutputFormat): Promise<StagedOutput> {
  const bytes = typeof data === 'string' ? new TextEncoder().encode(data) : data;
  if (out === '-') {
    if (format === 'xlsx' && ctx.stdout.isTTY) throw new UsageError('will not write an XLSX workbook to a terminal', 'binary-to-tty', 'Give --out FILE.xlsx, or redirect standard output to a file');
    return { name: '-', bytes: bytes.length, commit: async () => void ctx.stdout.write(bytes), discard: async () => {} };
  }
  const path = absolute(ctx, out);
  const dir = dirname(path);
  await mkdir(dir, { recursive: true });
  await removeLeftovers(ctx, dir, basename(path));
  const temp = join(dir, `.${basename(path)}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`);
  try {
    await writeFile(temp, bytes, { flag: 'wx' });
    // A file replaced keeps its permissions.
    const old = await stat(path).catch(() => undefined);
    if (old?.isFile()) await chmod(temp, old.mode & 0o7777);
  } catch (e) {
    await unlink(temp).catch(() => {});
    throw e;
  }
  return {
    name: out,
    bytes: bytes.length,
    commit: () => rename(temp, path),
    discard: () => unlink(temp).catch(() => {}),
  };
}

/**
 * Remove the temporary files of this output that a run killed while writing left behind
 * (`.NAME.PID-RANDOM.tmp`, as stageOutput names them), with a note: only those of the same NAME
 * whose process has ended. A file whose process is alive (another run writing now, or a reused
 * process number) is left alone, and so is anything that does not follow the pattern exactly.
 */
async function removeLeftovers(ctx: CliContext, dir: string, name: string): Promise<void> {
  const entries = await readdir(dir).catch(() => [] as string[]);
  const prefix = `.${name}.`;
  for (const e of entries) {
    if (!e.startsWith(prefix)) continue;
    const m = /^(\d+)-[0-9a-f]{8}\.tmp$/.exec(e.slice(prefix.length));
    if (!m) continue;
    const pid = Number(m[1]);
    if (pid === process.pid || processAlive(pid)) continue;
    try {
      await unlink(join(dir, e));
      ctx.stderr.write(`note: removed ${terminalSafe(e)}, a temporary file left in ${terminalSafe(dir)} by a run that ended while writing (process ${pid})\n`);
    } catch {
      /* removed by another run meanwhile, or not ours to remove: left as it is */
    }
  }
}

/** Whether a process of this number exists (EPERM: it exists, under another user). */
function processAlive(pid: number): boolean {
  if (!Number.isSafeInteger(pid) || pid <= 0) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code !== 'ESRCH';
  }
}

/** Write text or bytes to a file (through a temporary file, then renamed) or to standard output for `-`. */
export async function writeOutput(ctx: CliContext, out: string, data: string | Uint8Array, format: OutputFormat): Promise<{ name: string; bytes: number }> {
  const staged = await stageOutput(ctx, out, data, format);
  await staged.commit();
  return { name: staged.name, bytes: staged.bytes };
}

/**
 * Refuse outputs that would replace an input read by this run (the same file through any name,
 * link or hard link) and a file named twice among the outputs.
 */
export async function checkOutputTargets(ctx: CliContext, outs: readonly string[]): Promise<void> {
  const seen: { out: string; path: string; dev?: number; ino?: number }[] = [];
  const inputs = inputsRead.get(ctx) ?? [];
  for (const out of outs) {
    if (out === '-') continue;
    const path = absolute(ctx, out);
    const info = await stat(path).catch(() => undefined);
    const same = (o: { path: string; dev?: number; ino?: number }) => o.path === path || (info !== undefined && o.dev === info.dev && o.ino === info.ino);
    const input = inputs.find(same);
    if (input) {
      throw new UsageError(`the output '${out}' is the ${input.role} file '${input.name}' this command reads; writing it would replace the input`, 'output-is-input', 'Give the output another file name');
    }
    const twice = seen.find(same);
    if (twice) throw new UsageError(`the output file '${out}' is given twice${twice.out !== out ? ` (also as '${twice.out}')` : ''}`, 'output-twice', 'Give each --out once');
    seen.push(info ? { out, path, dev: info.dev, ino: info.ino } : { out, path });
  }
}
