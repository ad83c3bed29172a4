/**
 * Small structural validators for files we define (projects, scenarios, mappings): each failure
 * names the file and the path inside it, such as `scenarios[0].changes[2].amount`, with what was
 * expected and what was found.
 */
import { InputError } from '../../engine/errors';

export class Checker {
  constructor(readonly file: string) {}

  fail(path: string, expected: string, found: unknown): never {
    const shown = found === undefined ? 'nothing' : typeof found === 'string' ? `'${found.length > 60 ? found.slice(0, 60) + '…' : found}'` : JSON.stringify(found)?.slice(0, 60);
    throw new InputError('bad-field', `${this.file}: ${path || 'the document'} should be ${expected}; found ${shown}`, { file: this.file, text: String(shown) });
  }

  object(v: unknown, path: string): Record<string, unknown> {
    if (!v || typeof v !== 'object' || Array.isArray(v)) this.fail(path, 'an object', v);
    return v as Record<string, unknown>;
  }

  array(v: unknown, path: string): unknown[] {
    if (!Array.isArray(v)) this.fail(path, 'a list', v);
    return v;
  }

  string(v: unknown, path: string): string {
    if (typeof v !== 'string') this.fail(path, 'text', v);
    return v;
  }

  number(v: unknown, path: string): number {
    if (typeof v !== 'number' || !Number.isFinite(v)) this.fail(path, 'a finite number', v);
    return v;
  }

  optString(v: unknown, path: string): string | undefined {
    return v === undefined || v === null ? undefined : this.string(v, path);
  }

  optNumber(v: unknown, path: string): number | undefined {
    return v === undefined || v === null ? undefined : this.number(v, path);
  }

  numbers(v: unknown, path: string): number[] {
    return this.array(v, path).map((x, i) => this.number(x, `${path}[${i}]`));
  }

  strings(v: unknown, path: string): string[] {
    return this.array(v, path).map((x, i) => this.string(x, `${path}[${i}]`));
  }

  /** The file's format name and version: newer versions are refused with a clear message. */
  header(o: Record<string, unknown>, format: string, maxVersion: number): number {
    if (o.format !== format) this.fail('format', `'${format}'`, o.format);
    const v = this.number(o.version, 'version');
    if (!Number.isInteger(v) || v < 1) this.fail('version', 'a whole number from 1', v);
    if (v > maxVersion) {
      throw new InputError('newer-version', `${this.file}: this ${format} file is version ${v}, newer than this program reads (up to ${maxVersion})`, { file: this.file }, 'Update Ripplewise to open it');
    }
    return v;
  }
}
