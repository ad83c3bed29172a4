/**
 * The layout mapping: how a sheet or a long file was read, as plain JSON. The readers report
 * the mapping they detected; the same object (or any part of it, edited) passed back in as
 * `mapping` overrides the guesses, so that a user can confirm or correct a reading once and
 * reuse it.
 *
 * Rows and columns are 1-based, as a spreadsheet shows them. Roles may be given by code, either
 * as the list the reader reported (`rows: [{ code: 'S003', role: 'sector' }]`), or as a record
 * (`rows: { S003: 'sector', EMP: { role: 'satellite', unit: 'jobs' } }`); an entry without a
 * code may name its `row` (or `column`) number instead.
 */
import { InputError } from '../../engine/errors';
import type { TableMeta } from '../../engine/table';
import type { LayoutPatterns, PatternSet } from './patterns';
import { PATTERN_KEYS } from './patterns';

/** What a sheet or file holds. */
export type TableKind = 'flows' | 'coefficients' | 'make' | 'use' | 'matrix';
export const TABLE_KINDS: readonly TableKind[] = ['flows', 'coefficients', 'make', 'use', 'matrix'];

export type RowRole = 'sector' | 'value-added' | 'imports' | 'total' | 'output' | 'satellite' | 'ignore';
export type ColumnRole = 'sector' | 'final-demand' | 'total' | 'output' | 'ignore';
export const ROW_ROLES: readonly RowRole[] = ['sector', 'value-added', 'imports', 'total', 'output', 'satellite', 'ignore'];
export const COLUMN_ROLES: readonly ColumnRole[] = ['sector', 'final-demand', 'total', 'output', 'ignore'];

export interface MappedRow {
  code: string;
  label: string;
  role: RowRole;
  /** The 1-based row in the sheet (wide) or the position of the code (long). */
  row: number;
  unit?: string;
  /** Why the reader chose the role. */
  why?: string;
}

export interface MappedColumn {
  code: string;
  label: string;
  role: ColumnRole;
  /** The 1-based column in the sheet (wide) or the position of the code (long). */
  column: number;
  why?: string;
}

/** What a total row or column was found to be the sum of, and how well it matched. */
export interface TotalCheck {
  axis: 'row' | 'column';
  code: string;
  label: string;
  role: 'total' | 'output';
  /** In words, such as `the sector columns` or `F010..F050`; empty when no sum explains it. */
  sumOf: string;
  /** Lines checked (rows for a total column), lines that matched, and the tolerance used. */
  checked: number;
  matched: number;
  /** The largest gap found, with its cell. */
  worst?: { cell?: string; line: string; found: number; sum: number };
}

export interface LayoutMapping {
  format: 'ripplewise-layout';
  version: 1;
  kind: TableKind;
  shape: 'wide' | 'long';
  file?: string;
  sheet?: string;
  /** Wide sheets. */
  titleRows?: number[];
  headerRows?: number[];
  noteRows?: number[];
  codeColumn?: number | null;
  labelColumn?: number | null;
  unitColumn?: number | null;
  codeRow?: number | null;
  labelRow?: number | null;
  /**
   * Wide sheets: codes and labels written in one cell ('A01 Crops') are split into a code and a
   * label (reported as true when the reader did so); false keeps each text whole.
   */
  splitCodes?: boolean;
  /** Rule affix-codes: false keeps row and column codes as written, even when they differ only by an affix. */
  affixCodes?: boolean;
  /**
   * Codes renamed before anything else is read: { "from": "to" }, for the rows and columns that
   * carry the code (sectors, final demand, value added alike); a row code can so be made equal
   * to a column code. A code that names no row or column is an error.
   */
  rename?: Record<string, string>;
  /** Long files: the 1-based fields of the row code, the column code and the value, and the header line if any. */
  rowCodeField?: number;
  columnCodeField?: number;
  valueField?: number;
  headerLine?: number | null;
  /** Long files: true when the first code field names the column (the file lists column, row, value). */
  transposed?: boolean;
  /**
   * Long files: keep only the lines whose fields hold these values, by header name or 1-based
   * field number, such as { "TIME_PERIOD": "2020", "geo": "XX" } (a download of several years or
   * regions).
   */
  select?: Record<string, string>;
  rows: MappedRow[];
  columns: MappedColumn[];
  /** Where total output came from: a total column, a total row, the row sums, or assumed 1 (coefficients without outputs). */
  output: { from: 'column' | 'row' | 'row-sums' | 'final-demand' | 'assumed' | 'none'; code?: string };
  /** Empty cells in the blocks read: an error, or zero. */
  blanks: 'error' | 'zero';
  /** Texts read as zero in the blocks, such as '-' or '..'. */
  zeroTexts?: string[];
  /** Make tables: whether the sheet was industries × commodities or the transpose. */
  makeOrientation?: 'industries-by-commodities' | 'commodities-by-industries';
  conventions?: Record<string, unknown>;
  patterns?: Partial<Record<keyof LayoutPatterns, Partial<PatternSet>>>;
  meta?: TableMeta;
  /** Reported only (ignored when passed back in). */
  totals?: TotalCheck[];
}

/** A role given for a row or a column: a role word, or an object with the role and, for satellites, the unit. */
export type RoleGiven<R> = R | { role?: R; unit?: string; label?: string };

/** The mapping as a caller may give it: any part of a `LayoutMapping`, roles by list or by record. */
export type MappingInput = Partial<Omit<LayoutMapping, 'rows' | 'columns' | 'format' | 'version'>> & {
  format?: string;
  version?: number;
  rows?: Partial<MappedRow>[] | Record<string, RoleGiven<RowRole>>;
  columns?: Partial<MappedColumn>[] | Record<string, RoleGiven<ColumnRole>>;
};

/** Roles given by code and by position, normalised from either form. */
export interface RoleOverrides<R> {
  byCode: Map<string, { role?: R; unit?: string; label?: string }>;
  byIndex: Map<number, { role?: R; unit?: string; label?: string }>;
}

export function roleOverrides<R extends string>(given: MappingInput['rows'] | MappingInput['columns'], roles: readonly R[], axis: 'rows' | 'columns'): RoleOverrides<R> {
  const out: RoleOverrides<R> = { byCode: new Map(), byIndex: new Map() };
  if (given === undefined || given === null) return out;
  const check = (role: unknown, where: string): R | undefined => {
    if (role === undefined) return undefined;
    if (typeof role !== 'string' || !roles.includes(role as R)) {
      throw new InputError('bad-mapping', `mapping ${axis}: ${where} has role '${String(role)}', which is not one of ${roles.join(', ')}`, {}, 'Fix the role in the mapping');
    }
    return role as R;
  };
  if (Array.isArray(given)) {
    given.forEach((e, i) => {
      if (typeof e !== 'object' || e === null) throw new InputError('bad-mapping', `mapping ${axis}[${i}] must be an object`);
      const o = e as Record<string, unknown>;
      const role = check(o.role, `entry ${i + 1}${o.code ? ` ('${String(o.code)}')` : ''}`);
      const v: { role?: R; unit?: string; label?: string } = {};
      if (role) v.role = role;
      if (typeof o.unit === 'string') v.unit = o.unit;
      if (typeof o.label === 'string') v.label = o.label;
      const idx = axis === 'rows' ? o.row : o.column;
      if (typeof o.code === 'string' && o.code.trim()) out.byCode.set(o.code.trim(), v);
      else if (typeof idx === 'number') out.byIndex.set(idx, v);
      else throw new InputError('bad-mapping', `mapping ${axis}[${i}] needs a code or a ${axis === 'rows' ? 'row' : 'column'} number`);
    });
    return out;
  }
  if (typeof given !== 'object') throw new InputError('bad-mapping', `mapping ${axis} must be a list or an object by code`);
  for (const [code, v] of Object.entries(given)) {
    if (typeof v === 'string') out.byCode.set(code.trim(), { role: check(v, `'${code}'`)! });
    else if (typeof v === 'object' && v !== null) {
      const o = v as Record<string, unknown>;
      const e: { role?: R; unit?: string; label?: string } = {};
      const role = check(o.role, `'${code}'`);
      if (role) e.role = role;
      if (typeof o.unit === 'string') e.unit = o.unit;
      if (typeof o.label === 'string') e.label = o.label;
      out.byCode.set(code.trim(), e);
    } else throw new InputError('bad-mapping', `mapping ${axis}: '${code}' must be a role or an object with a role`);
  }
  return out;
}

const NUMBER_FIELDS = ['codeColumn', 'labelColumn', 'unitColumn', 'codeRow', 'labelRow', 'rowCodeField', 'columnCodeField', 'valueField', 'headerLine'] as const;
const LIST_FIELDS = ['titleRows', 'headerRows', 'noteRows'] as const;

/**
 * Parse and check a mapping given as JSON text (a mapping file) or as an object. Every problem
 * is an `InputError` that names the field.
 */
export function parseMapping(input: string | unknown, file = 'mapping'): MappingInput {
  let o: unknown = input;
  if (typeof input === 'string') {
    try {
      o = JSON.parse(input);
    } catch (e) {
      throw new InputError('bad-mapping', `file ${file} is not valid JSON: ${(e as Error).message}`, { file }, 'Fix the JSON, or start from the mapping a reader reports');
    }
  }
  if (typeof o !== 'object' || o === null || Array.isArray(o)) throw new InputError('bad-mapping', `file ${file}: a mapping must be a JSON object`, { file });
  const m = o as Record<string, unknown>;
  if (m.format !== undefined && m.format !== 'ripplewise-layout') throw new InputError('bad-mapping', `file ${file}: format is '${String(m.format)}', not 'ripplewise-layout'`, { file });
  if (m.version !== undefined && m.version !== 1) throw new InputError('bad-mapping', `file ${file}: version ${String(m.version)} is not known (this program reads version 1)`, { file });
  if (m.kind !== undefined && !TABLE_KINDS.includes(m.kind as TableKind)) {
    throw new InputError('bad-mapping', `file ${file}: kind '${String(m.kind)}' is not one of ${TABLE_KINDS.join(', ')}`, { file });
  }
  if (m.shape !== undefined && m.shape !== 'wide' && m.shape !== 'long') throw new InputError('bad-mapping', `file ${file}: shape must be 'wide' or 'long'`, { file });
  for (const f of NUMBER_FIELDS) {
    const v = m[f];
    if (v !== undefined && v !== null && !(typeof v === 'number' && Number.isInteger(v) && v >= 1)) {
      throw new InputError('bad-mapping', `file ${file}: ${f} must be a whole number from 1 (or null); got ${JSON.stringify(v)}`, { file });
    }
  }
  for (const f of LIST_FIELDS) {
    const v = m[f];
    if (v !== undefined && !(Array.isArray(v) && v.every((x) => typeof x === 'number' && Number.isInteger(x) && x >= 1))) {
      throw new InputError('bad-mapping', `file ${file}: ${f} must be a list of row numbers from 1`, { file });
    }
  }
  if (m.select !== undefined && !(typeof m.select === 'object' && m.select !== null && !Array.isArray(m.select) && Object.values(m.select).every((v) => typeof v === 'string'))) {
    throw new InputError('bad-mapping', `file ${file}: select must be an object of field names (or numbers) and the texts to keep, such as { "TIME_PERIOD": "2020" }`, { file });
  }
  if (m.splitCodes !== undefined && typeof m.splitCodes !== 'boolean') throw new InputError('bad-mapping', `file ${file}: splitCodes must be true or false`, { file });
  if (m.affixCodes !== undefined && typeof m.affixCodes !== 'boolean') throw new InputError('bad-mapping', `file ${file}: affixCodes must be true or false`, { file });
  if (m.rename !== undefined) {
    const r = m.rename;
    if (typeof r !== 'object' || r === null || Array.isArray(r) || !Object.entries(r).every(([k, v]) => k.trim() !== '' && typeof v === 'string' && v.trim() !== '')) {
      throw new InputError('bad-mapping', `file ${file}: rename must be an object of codes as written and the codes to read them as, such as { "DOM_01": "01" }; got ${JSON.stringify(r)}`, { file });
    }
  }
  if (m.blanks !== undefined && m.blanks !== 'error' && m.blanks !== 'zero') throw new InputError('bad-mapping', `file ${file}: blanks must be 'error' or 'zero'`, { file });
  if (m.zeroTexts !== undefined && !(Array.isArray(m.zeroTexts) && m.zeroTexts.every((x) => typeof x === 'string'))) {
    throw new InputError('bad-mapping', `file ${file}: zeroTexts must be a list of texts`, { file });
  }
  if (m.output !== undefined) {
    const out = m.output as Record<string, unknown>;
    if (typeof out !== 'object' || out === null || !['column', 'row', 'row-sums', 'final-demand', 'assumed', 'none'].includes(String(out.from))) {
      throw new InputError('bad-mapping', `file ${file}: output must be { "from": "column" | "row" | "row-sums" | "assumed", "code"?: ... }`, { file });
    }
  }
  if (m.patterns !== undefined) {
    if (typeof m.patterns !== 'object' || m.patterns === null) throw new InputError('bad-mapping', `file ${file}: patterns must be an object`, { file });
    for (const k of Object.keys(m.patterns)) {
      if (!PATTERN_KEYS.includes(k as keyof LayoutPatterns)) throw new InputError('bad-mapping', `file ${file}: patterns.${k} is not known; the pattern sets are ${PATTERN_KEYS.join(', ')}`, { file });
    }
  }
  roleOverrides(m.rows as MappingInput['rows'], ROW_ROLES, 'rows');
  roleOverrides(m.columns as MappingInput['columns'], COLUMN_ROLES, 'columns');
  return m as MappingInput;
}
