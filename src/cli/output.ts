/**
 * How a command delivers its result: `--out FILE` (repeatable; the format from each extension or
 * `--format`), `--format F` alone for standard output, `--json` for the machine-readable result
 * on standard output, or readable text on a terminal. The outputs are planned (and bad formats
 * refused) before any work is done.
 */
import type { CliContext } from './context';
import { styles, useColour } from './context';
import { UsageError } from './errors';
import type { OutputFormat } from './files';
import { outputFormat, writeOutput } from './files';
import { terminalSafe } from './text';

export type Writer = () => Promise<string | Uint8Array> | string | Uint8Array;

export interface Outcome {
  /** The machine-readable result (`--json`). */
  json(): unknown;
  /** The result as text for a person. */
  text(colour: boolean): string;
  /** The file formats this result can be written in. */
  writers: Partial<Record<OutputFormat, Writer>>;
  /** A non-zero exit code for a result that is itself a failure (a table that failed its checks). */
  exitCode?: number;
}

export interface OutputOptions {
  out?: string[];
  format?: string;
  json?: boolean;
}

export interface PlannedOutput {
  out: string;
  format: OutputFormat;
}

/** Check the outputs before any work: every format must be one the command can write. */
export function planOutputs(o: OutputOptions, allowed: readonly OutputFormat[]): PlannedOutput[] {
  const outs = o.out && o.out.length ? o.out : o.format !== undefined ? ['-'] : [];
  const plan = outs.map((out) => ({ out, format: outputFormat(out, o.format, allowed) }));
  const toStdout = plan.filter((p) => p.out === '-').length;
  if (toStdout > 1) throw new UsageError('only one output can go to standard output', 'two-stdout');
  if (toStdout && o.json) throw new UsageError('--json prints to standard output, so the result cannot also be written there', 'json-and-stdout', 'Give --out FILE, or leave out --json');
  return plan;
}

/** JSON with NaN and infinities as null and typed arrays as lists. */
export function jsonText(v: unknown): string {
  return (
    JSON.stringify(
      v,
      (_k, x) => {
        if (typeof x === 'number' && !Number.isFinite(x)) return null;
        if (ArrayBuffer.isView(x) && !(x instanceof DataView)) return Array.from(x as unknown as ArrayLike<number>, (y) => (Number.isFinite(y) ? y : null));
        return x;
      },
      2,
    ) + '\n'
  );
}

/** Write the planned outputs, then print the JSON result, the text, or where the files went. */
export async function deliver(ctx: CliContext, outcome: Outcome, plan: PlannedOutput[], o: OutputOptions): Promise<number> {
  const written: { file: string; format: OutputFormat; bytes: number }[] = [];
  for (const p of plan) {
    const w = outcome.writers[p.format];
    if (!w) throw new UsageError(`this result cannot be written as ${p.format.toUpperCase()}`, 'bad-format');
    const data = await w();
    const r = await writeOutput(ctx, p.out, data, p.format);
    written.push({ file: r.name, format: p.format, bytes: r.bytes });
  }
  if (o.json) {
    const body = outcome.json();
    const doc = written.length && body && typeof body === 'object' && !Array.isArray(body) ? { ...(body as object), written } : body;
    ctx.stdout.write(jsonText(doc));
  } else if (!plan.length) {
    ctx.stdout.write(terminalSafe(outcome.text(useColour(ctx, ctx.stdout))));
  } else {
    const s = styles(useColour(ctx, ctx.stderr));
    for (const w of written) if (w.file !== '-') ctx.stderr.write(`${s.green('wrote')} ${terminalSafe(w.file)} (${w.format.toUpperCase()}, ${w.bytes.toLocaleString('en')} bytes)\n`);
  }
  return outcome.exitCode ?? 0;
}
