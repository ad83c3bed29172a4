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
  // Anything else is a bug: say so plainly, with the message, rather than a stack trace.
  const msg = e instanceof Error ? e.message : String(e);
  return { code: 'internal', message: `unexpected error: ${msg}`, exitCode: EXIT_USAGE, hint: 'This is a fault in ripplewise; please report it with the command you ran' };
}
