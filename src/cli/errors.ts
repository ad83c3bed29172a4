/**
 * Exit codes and the errors that set them: 0 success, 1 the table failed its checks, 2 a usage
 * or input error (a bad option, a missing or unreadable file, bad data).
 */
import { describeWhere, InputError, SingularMatrixError, CancelledError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';

export const EXIT_OK = 0;
export const EXIT_CHECKS = 1;
export const EXIT_USAGE = 2;

/** A bad option or argument. */
export class UsageError extends Error {
  override name = 'UsageError';
  constructor(
    message: string,
    readonly code = 'usage',
    readonly hint?: string,
  ) {
    super(message);
  }
}

/** The table failed its checks (error findings): results from it cannot be trusted. */
export class ChecksFailed extends Error {
  override name = 'ChecksFailed';
  readonly code = 'checks-failed';
  constructor(
    readonly file: string,
    readonly findings: readonly Finding[],
  ) {
    const errors = findings.filter((f) => f.severity === 'error');
    super(`${file}: the table failed ${errors.length} check${errors.length === 1 ? '' : 's'}: ${errors.map((f) => f.message).join('; ')}`);
  }
}

/** A result with infinities in it (an overflow): it is not delivered (exit 1). */
export class ResultNotFinite extends Error {
  override name = 'ResultNotFinite';
  readonly code = 'non-finite-result';
  constructor(readonly findings: readonly Finding[]) {
    super(`the result is not finite: ${findings.map((f) => f.message).join('; ')}`);
  }
}

export interface ErrorReport {
  code: string;
  message: string;
  hint?: string;
  where?: Record<string, unknown>;
  exitCode: number;
  findings?: Finding[];
}

/** What to print and which exit code for an error thrown by a command. */
export function errorReport(e: unknown): ErrorReport {
  if (e instanceof ChecksFailed) {
    return { code: e.code, message: e.message, exitCode: EXIT_CHECKS, findings: [...e.findings], hint: `Run 'ripplewise check ${e.file}' for every finding` };
  }
  if (e instanceof ResultNotFinite) {
    return { code: e.code, message: e.message, exitCode: EXIT_CHECKS, findings: [...e.findings], hint: 'Check the table for amounts near the largest number (1e308), or a scale far too large' };
  }
  if (e instanceof UsageError) {
    const r: ErrorReport = { code: e.code, message: e.message, exitCode: EXIT_USAGE };
    if (e.hint) r.hint = e.hint;
    return r;
  }
  if (e instanceof InputError) {
    const where = describeWhere(e.where);
    // The readers name their options as a program calls them; say how the command line spells them.
    let message = e.message.replace(/read it with blanks: 'zero'/, 'give --blanks zero').replace(/pass it in zeroTexts/g, 'give --zero-text (or zeroTexts in a mapping)').replace(/([Pp])ass the file's encoding( \(for example encoding: 'windows-1252'\))?/, (_m, p: string) => `${p === 'P' ? 'G' : 'g'}ive the file's encoding (--encoding windows-1252, for example)`).replace(/\bGive valueField \(1-based\)/, 'Give the value field, counted from 1 (valueField in a --mapping file; for requirements, --make-value-column or --use-value-column)');
    let hint: string | undefined;
    if (e.hint && /^Choose the decimal mark/.test(e.hint)) {
      hint = 'Choose the decimal mark: --decimal . or --decimal ,';
      message = message.replace(`. ${e.hint}`, '');
    }
    const r: ErrorReport = { code: e.code, message: where && !message.includes(where) && !e.where.file ? `${message} (${where})` : message, exitCode: EXIT_USAGE };
    if (hint) r.hint = hint;
    if (Object.keys(e.where).length) r.where = { ...e.where };
    return r;
  }
  if (e instanceof SingularMatrixError) {
    return { code: e.code, message: `${e.message}: the Leontief inverse does not exist for this table`, exitCode: EXIT_CHECKS, hint: "Run 'ripplewise check' on the table" };
  }
  if (e instanceof CancelledError) return { code: e.code, message: e.message, exitCode: EXIT_USAGE };
  const err = e as NodeJS.ErrnoException;
  if (err && typeof err === 'object' && typeof err.code === 'string' && err.syscall) {
    const path = err.path ?? '';
    const what: Record<string, string> = {
      ENOENT: `no such file: ${path}`,
      EACCES: `permission denied: ${path}`,
      EISDIR: `${path} is a folder, not a file`,
      ENOTDIR: `a part of ${path} is not a folder`,
      EEXIST: `${path} exists already`,
    };
    return { code: err.code.toLowerCase(), message: what[err.code] ?? `${err.syscall} ${path}: ${err.message}`, exitCode: EXIT_USAGE, where: { file: path } };
  }
  return faultReport(e);
}

/**
 * What is left: memory or stack exhausted while building a result (V8's RangeErrors), said as a
 * size problem with exit 2; anything else is a fault in the program, said as "internal error"
 * with a short id (from the message and the first frame of the stack, so one fault keeps one id)
 * and never with the stack itself.
 */
export function faultReport(e: unknown): ErrorReport {
  const msg = e instanceof Error ? e.message : String(e);
  if (e instanceof RangeError && /Invalid string length|Invalid array length|Invalid typed array length|Array buffer allocation failed|allocation failed/i.test(msg)) {
    return {
      code: 'too-large-result',
      message: `the result is too large to build in this process's memory (${msg})`,
      exitCode: EXIT_USAGE,
      hint: 'Ask for fewer scenarios or sectors at once, or a leaner format (CSV rather than HTML or XLSX)',
    };
  }
  if (e instanceof RangeError && /call stack/i.test(msg)) {
    return { code: 'too-deep', message: `the input is nested too deeply to follow (${msg})`, exitCode: EXIT_USAGE, hint: 'Check the file; the formats of this program nest a few levels deep' };
  }
  return { code: 'internal', message: `internal error ${faultId(e)}: ${msg}`, exitCode: EXIT_USAGE, hint: 'This is a fault in ripplewise, not in your data; please report it with this id and the command you ran' };
}

/** A short id for a fault: 8 hex digits of an FNV-1a hash of its kind, message and first stack frame. */
export function faultId(e: unknown): string {
  const err = e instanceof Error ? e : undefined;
  const frame = err?.stack?.split('\n').find((l) => /^\s+at /.test(l))?.replace(/:\d+:\d+\)?$/, '') ?? '';
  const text = `${err?.name ?? typeof e}|${err ? err.message : String(e)}|${frame.trim()}`;
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 0x01000193);
  return (h >>> 0).toString(16).padStart(8, '0');
}
