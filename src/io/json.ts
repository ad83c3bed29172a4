/**
 * JSON tables and matrices, as the writers write them (`{ format: 'ripplewise-table', version: 1,
 * table: { sectors, Z, finalDemand, valueAdded, imports, x, satellites, meta } }`, or a plain
 * table object without the wrapper). Every value is checked: a missing block, a row of the wrong
 * length or a value that is not a finite number is an error naming where it is.
 */
import { InputError } from '../../engine/errors';
import type { PlainTable, Table } from '../../engine/table';
import { makeTable } from '../../engine/table';
import { checkJsonDepth } from './limits';
import type { LabelledMatrix } from './write';

function parse(text: string, file: string): unknown {
  const t = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (!t.trim()) throw new InputError('empty-file', `file ${file} is empty`, { file }, 'Give a file with a table in it');
  checkJsonDepth(t, file);
  try {
    return JSON.parse(t);
  } catch (e) {
    throw new InputError('bad-json', `file ${file} is not valid JSON: ${(e as Error).message}`, { file }, 'Fix the JSON, or write the table again');
  }
}

function fail(file: string, what: string, hint?: string): never {
  throw new InputError('bad-json', `file ${file}: ${what}`, { file }, hint);
}

function codes(v: unknown, file: string, what: string): string[] {
  if (!Array.isArray(v) || v.some((c) => typeof c !== 'string')) fail(file, `${what} must be a list of texts`);
  return v as string[];
}

function numbers(v: unknown, file: string, what: string, n: number): number[] {
  if (!Array.isArray(v)) fail(file, `${what} must be a list of ${n} numbers`);
  if (v.length !== n) fail(file, `${what} has ${v.length} values; ${n} are needed`);
  v.forEach((x, j) => {
    if (typeof x !== 'number' || !Number.isFinite(x)) fail(file, `${what}, value ${j + 1}: ${JSON.stringify(x)} where a number belongs`);
  });
  return v as number[];
}

function rowsOf(v: unknown, file: string, what: string, r: number, c: number, rowNames: string[]): number[][] {
  if (!Array.isArray(v)) fail(file, `${what} must be a list of ${r} rows`);
  if (v.length !== r) fail(file, `${what} has ${v.length} rows; ${r} are needed`);
  return v.map((row, i) => numbers(row, file, `${what} row ${i + 1} ('${rowNames[i] ?? i + 1}')`, c));
}

/** Read a table written by `writeTableJson` (or a plain table object). */
export function readTableJson(text: string, file = 'table.json'): Table {
  const o = parse(text, file) as Record<string, unknown>;
  if (typeof o !== 'object' || o === null || Array.isArray(o)) fail(file, 'a table must be a JSON object');
  if (o.format !== undefined && o.format !== 'ripplewise-table') fail(file, `format is '${String(o.format)}', not 'ripplewise-table'`, o.format === 'ripplewise-matrix' ? 'This file holds a matrix: read it with readMatrixJson' : undefined);
  if (o.version !== undefined && o.version !== 1) fail(file, `version ${String(o.version)} is not known (this program reads version 1)`);
  const p = (o.format ? o.table : o) as Record<string, unknown>;
  if (typeof p !== 'object' || p === null) fail(file, 'the table is missing');
  const sectors = p.sectors as Record<string, unknown> | undefined;
  if (!sectors || typeof sectors !== 'object') fail(file, "the table has no 'sectors'");
  const sc = codes(sectors.codes, file, 'sectors.codes');
  const n = sc.length;
  const plain: PlainTable = { sectors: { codes: sc }, Z: rowsOf(p.Z, file, 'Z', n, n, sc) };
  if (sectors.labels !== undefined) plain.sectors.labels = codes(sectors.labels, file, 'sectors.labels');
  for (const key of ['finalDemand', 'valueAdded'] as const) {
    const b = p[key] as Record<string, unknown> | undefined;
    if (b === undefined) continue;
    if (typeof b !== 'object' || b === null) fail(file, `${key} must be an object with codes and values`);
    const c = codes(b.codes, file, `${key}.codes`);
    const block: { codes: string[]; labels?: string[]; values: number[][] } = {
      codes: c,
      values: key === 'finalDemand' ? rowsOf(b.values, file, `${key}.values`, n, c.length, sc) : rowsOf(b.values, file, `${key}.values`, c.length, n, c),
    };
    if (b.labels !== undefined) block.labels = codes(b.labels, file, `${key}.labels`);
    if (b.classes !== undefined) {
      if (!Array.isArray(b.classes) || b.classes.some((x) => x !== null && typeof x !== 'string')) fail(file, `${key}.classes must be a list of texts (or null where no class is known)`);
      (block as { classes?: (string | null)[] }).classes = b.classes as (string | null)[];
    }
    (plain as unknown as Record<string, unknown>)[key] = block;
  }
  if (p.imports !== undefined) plain.imports = numbers(p.imports, file, 'imports', n);
  if (p.x !== undefined) plain.x = numbers(p.x, file, 'x', n);
  if (p.satellites !== undefined) {
    if (!Array.isArray(p.satellites)) fail(file, 'satellites must be a list');
    plain.satellites = (p.satellites as Record<string, unknown>[]).map((s, i) => {
      if (typeof s !== 'object' || s === null || typeof s.code !== 'string') fail(file, `satellite ${i + 1} needs a code`);
      if (typeof s.unit !== 'string') fail(file, `satellite '${s.code}' needs a unit`);
      const out: { code: string; label?: string; unit: string; values: number[] } = { code: s.code, unit: s.unit, values: numbers(s.values, file, `satellite '${s.code}'`, n) };
      if (typeof s.label === 'string') out.label = s.label;
      return out;
    });
  }
  if (p.meta !== undefined) {
    if (typeof p.meta !== 'object' || p.meta === null) fail(file, 'meta must be an object');
    plain.meta = p.meta as PlainTable['meta'] & object;
  }
  try {
    return makeTable(plain);
  } catch (e) {
    if (e instanceof InputError) throw new InputError(e.code, `file ${file}: ${e.message}`, { ...e.where, file });
    throw e;
  }
}

/** Read a matrix written by `writeMatrixJson`. */
export function readMatrixJson(text: string, file = 'matrix.json'): LabelledMatrix {
  const o = parse(text, file) as Record<string, unknown>;
  if (typeof o !== 'object' || o === null || o.format !== 'ripplewise-matrix') fail(file, "a matrix file has format 'ripplewise-matrix'");
  const axis = (v: unknown, what: string) => {
    const a = v as Record<string, unknown>;
    if (!a || typeof a !== 'object') fail(file, `${what} must be an object with codes and labels`);
    const c = codes(a.codes, file, `${what}.codes`);
    const l = a.labels === undefined ? [...c] : codes(a.labels, file, `${what}.labels`);
    if (l.length !== c.length) fail(file, `${what} has ${c.length} codes and ${l.length} labels`);
    return { codes: c, labels: l };
  };
  const rows = axis(o.rows, 'rows');
  const cols = axis(o.cols, 'cols');
  const values = rowsOf(o.values, file, 'values', rows.codes.length, cols.codes.length, rows.codes);
  const data = new Float64Array(rows.codes.length * cols.codes.length);
  values.forEach((r, i) => data.set(r, i * cols.codes.length));
  const m: LabelledMatrix = { rows, cols, matrix: { rows: rows.codes.length, cols: cols.codes.length, data } };
  if (typeof o.title === 'string') m.title = o.title;
  if (typeof o.description === 'string') m.description = o.description;
  if (Array.isArray(o.notes)) m.notes = codes(o.notes, file, 'notes');
  return m;
}
