/**
 * Running the command in-process (main(argv, ctx) with captured streams) for the many small
 * checks, and in a child process (node bin/ripplewise.mjs) for the few end-to-end ones.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { CliContext, OutStream } from '../../src/cli/context';
import { main } from '../../src/cli/main';

export const ROOT = resolve(import.meta.dirname, '../..');
export const BIN = join(ROOT, 'bin/ripplewise.mjs');

export interface RunResult {
  code: number;
  stdout: string;
  stderr: string;
  stdoutBytes: Uint8Array;
}

class Capture implements OutStream {
  chunks: Uint8Array[] = [];
  constructor(readonly isTTY = false) {}
  columns = 100;
  write(c: string | Uint8Array): boolean {
    this.chunks.push(typeof c === 'string' ? new TextEncoder().encode(c) : c);
    return true;
  }
  // What readline's cursor functions call on a TTY stream.
  cursorTo(_x: number, _y?: number, cb?: () => void): boolean {
    cb?.();
    return true;
  }
  moveCursor(_dx: number, _dy: number, cb?: () => void): boolean {
    cb?.();
    return true;
  }
  clearLine(_d: number, cb?: () => void): boolean {
    cb?.();
    return true;
  }
  on() {
    return this;
  }
  bytes(): Uint8Array {
    const n = this.chunks.reduce((a, c) => a + c.length, 0);
    const out = new Uint8Array(n);
    let o = 0;
    for (const c of this.chunks) {
      out.set(c, o);
      o += c.length;
    }
    return out;
  }
}

export interface RunOptions {
  stdin?: string | Uint8Array;
  stdinTTY?: boolean;
  env?: Record<string, string | undefined>;
  cwd?: string;
  stdoutTTY?: boolean;
  stderrTTY?: boolean;
}

/** main() with captured output; the clock fixed through SOURCE_DATE_EPOCH unless given. */
export async function run(argv: string[], o: RunOptions = {}): Promise<RunResult> {
  const out = new Capture(o.stdoutTTY);
  const err = new Capture(o.stderrTTY);
  const input = o.stdin === undefined ? new Uint8Array() : typeof o.stdin === 'string' ? new TextEncoder().encode(o.stdin) : o.stdin;
  const stdin = {
    isTTY: o.stdinTTY ?? false,
    async *[Symbol.asyncIterator]() {
      if (input.length) yield input;
    },
  };
  const ctx: CliContext = {
    stdout: out,
    stderr: err,
    stdin,
    env: { SOURCE_DATE_EPOCH: '1767225600', ...(o.env ?? {}) },
    cwd: o.cwd ?? ROOT,
    now: () => new Date('2026-01-01T00:00:00Z'),
  };
  const code = await main(argv, ctx);
  const bytes = out.bytes();
  return { code, stdout: new TextDecoder().decode(bytes), stderr: new TextDecoder().decode(err.bytes()), stdoutBytes: bytes };
}

/** node bin/ripplewise.mjs in a child process. */
export function spawnCli(argv: string[], o: { stdin?: string | Uint8Array; cwd?: string; env?: Record<string, string> } = {}): Promise<RunResult> {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(process.execPath, [BIN, ...argv], { cwd: o.cwd ?? ROOT, env: { ...process.env, SOURCE_DATE_EPOCH: '1767225600', NO_COLOR: '1', ...(o.env ?? {}) }, stdio: ['pipe', 'pipe', 'pipe'] });
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    child.stdout.on('data', (c: Buffer) => out.push(c));
    child.stderr.on('data', (c: Buffer) => err.push(c));
    child.on('error', reject);
    child.on('close', (code) => {
      const b = Buffer.concat(out);
      resolvePromise({ code: code ?? -1, stdout: b.toString('utf8'), stderr: Buffer.concat(err).toString('utf8'), stdoutBytes: new Uint8Array(b) });
    });
    if (o.stdin !== undefined) child.stdin.end(o.stdin);
    else child.stdin.end();
  });
}

export function tempDir(): string {
  return mkdtempSync(join(tmpdir(), 'ripplewise-cli-'));
}
