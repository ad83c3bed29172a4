/**
 * How a command delivers its result: `--out FILE` (repeatable; the format from each extension or
 * `--format`), `--format F` alone for standard output, `--json` for the machine-readable result
 * on standard output, or readable text on a terminal. The outputs are planned (and bad formats
 * refused) before any work is done.
 */
import { normalize } from 'node:path';
import type { CliContext } from './context';
import { styles, useColour } from './context';
import { ResultNotFinite, UsageError } from './errors';
import { infiniteFindings } from './finite';
import type { OutputFormat } from './files';
import { checkOutputTargets, outputFormat, type StagedOutput, stageOutput } from './files';
import { jsonText, terminalSafe } from './text';

// In ./text so that main.ts can print a JSON error without loading the writers.
export { jsonText } from './text';

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
  const named = new Set<string>();
  for (const p of plan) {
    if (p.out === '-') continue;
    const key = normalize(p.out);
    if (named.has(key)) throw new UsageError(`the output file '${p.out}' is given twice`, 'output-twice', 'Give each --out once');
    named.add(key);
  }
  const toStdout = plan.filter((p) => p.out === '-').length;
  if (toStdout > 1) throw new UsageError('only one output can go to standard output', 'two-stdout');
  if (toStdout && o.json) throw new UsageError('--json prints to standard output, so the result cannot also be written there', 'json-and-stdout', 'Give --out FILE, or leave out --json');
  return plan;
}


/**
 * Write the planned outputs, then print the JSON result, the text, or where the files went. Every
 * output is written to its temporary file first; only when all of them succeeded are they put in
 * place, so a failure part-way replaces none of them.
 */
export async function deliver(ctx: CliContext, outcome: Outcome, plan: PlannedOutput[], o: OutputOptions): Promise<number> {
  const written: { file: string; format: OutputFormat; bytes: number }[] = [];
  const body = outcome.json();
  const infinite = infiniteFindings(body);
  if (infinite.length) throw new ResultNotFinite(infinite);
  await checkOutputTargets(
    ctx,
    plan.map((p) => p.out),
  );
  const staged: StagedOutput[] = [];
  try {
    for (const p of plan) {
      const w = outcome.writers[p.format];
      if (!w) throw new UsageError(`this result cannot be written as ${p.format.toUpperCase()}`, 'bad-format');
      const data = await w();
      const s = await stageOutput(ctx, p.out, data, p.format);
      staged.push(s);
      written.push({ file: s.name, format: p.format, bytes: s.bytes });
    }
  } catch (e) {
    await Promise.all(staged.map((s) => s.discard()));
    throw e;
  }
  for (let i = 0; i < staged.length; i++) {
    try {
      await staged[i]!.commit();
    } catch (e) {
      await Promise.all(staged.slice(i + 1).map((s) => s.discard()));
      throw e;
    }
  }
  if (o.json) {
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
