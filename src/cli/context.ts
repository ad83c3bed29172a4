/**
 * What a command runs against: its streams, environment and working folder. `main` takes one so
 * that tests can run commands in-process with captured output; `processContext()` is the real one.
 */
import { resolve } from 'node:path';

export interface OutStream {
  write(chunk: string | Uint8Array): unknown;
  isTTY?: boolean;
  columns?: number;
}

export interface InStream extends AsyncIterable<Uint8Array | string> {
  isTTY?: boolean;
}

export interface CliContext {
  stdout: OutStream;
  stderr: OutStream;
  stdin: InStream;
  env: Readonly<Record<string, string | undefined>>;
  cwd: string;
  /** The clock (reports carry their date); SOURCE_DATE_EPOCH overrides it. */
  now(): Date;
}

let pipeGuard = false;

export function processContext(): CliContext {
  // A reader that stops early (`| head`) closes the pipe: stop quietly rather than crash.
  if (!pipeGuard) {
    pipeGuard = true;
    for (const s of [process.stdout, process.stderr]) {
      s.on('error', (e: NodeJS.ErrnoException) => {
        if (e.code === 'EPIPE') process.exit(typeof process.exitCode === 'number' ? process.exitCode : 0);
        throw e;
      });
    }
  }
  return {
    stdout: process.stdout,
    stderr: process.stderr,
    stdin: process.stdin,
    env: process.env,
    cwd: process.cwd(),
    now: () => new Date(),
  };
}

/**
 * Colour on a stream: only when it is a terminal and NO_COLOR is unset or empty (no-color.org);
 * FORCE_COLOR=0 turns it off too.
 */
export function useColour(ctx: CliContext, stream: OutStream): boolean {
  const no = ctx.env.NO_COLOR;
  if (no !== undefined && no !== '') return false;
  if (ctx.env.FORCE_COLOR === '0' || ctx.env.FORCE_COLOR === 'false') return false;
  return stream.isTTY === true && ctx.env.TERM !== 'dumb';
}

/** The date a report is stamped with: SOURCE_DATE_EPOCH (seconds) when set, for reproducible files. */
export function reportDate(ctx: CliContext): Date {
  const epoch = ctx.env.SOURCE_DATE_EPOCH;
  if (epoch !== undefined && /^\d+$/.test(epoch.trim())) return new Date(Number(epoch.trim()) * 1000);
  return ctx.now();
}

export function absolute(ctx: CliContext, file: string): string {
  return resolve(ctx.cwd, file);
}

/** ANSI styles that collapse to nothing without colour. */
/**
 * The mark of the program's own colours in text on its way to a terminal: a private-use
 * character and a random word drawn once per process, which data read from a file cannot know.
 * `terminalSafe` (text.ts) escapes every control character of the text and then turns these
 * marks, and only these, into escape sequences.
 */
export const COLOUR_MARK = `\ue000${Math.random().toString(36).slice(2, 10)}`;

export function styles(on: boolean) {
  const wrap = (open: number, close: number) => (s: string) => (on ? `${COLOUR_MARK}${open}m${s}${COLOUR_MARK}${close}m` : s);
  return {
    bold: wrap(1, 22),
    dim: wrap(2, 22),
    red: wrap(31, 39),
    yellow: wrap(33, 39),
    green: wrap(32, 39),
    cyan: wrap(36, 39),
  };
}
