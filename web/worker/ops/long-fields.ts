/**
 * The fields of a long sheet that a selection could keep one text of (a year, a region, a
 * price basis): every field besides the row code, the column code and the value, with its
 * header name (or "field N") and its distinct texts, so that the Layout step can offer them
 * under "Keep only lines where".
 *
 * The code and value fields are found the way src/io's long reader finds them, from its own
 * sample of the first lines: that sample is read with repeated pairs summed, so that a file of
 * several years (whose pairs repeat) still tells its fields. The texts are then counted over
 * every line, one field at a time; a field is dropped from the count once it has more than
 * MAX_TEXTS texts (codes and labels), so a big file costs one pass and little memory.
 */
import { InputError } from '../../../engine/index';
import { EMPTY, Grid, NUMBER, SAMPLE_LINES, latestPeriod, readLongGrid } from '../../../src/io/index';
import type { MappingInput } from '../../../src/io/index';
import type { Finding } from '../../../engine/index';

/** At most this many texts of a field are listed; a field with more is reported as having many. */
export const MAX_TEXTS = 50;

export interface LongFieldText {
  text: string;
  /** Lines holding it. */
  lines: number;
}

export interface LongField {
  /** 1-based, as in the mapping's rowCodeField and the command line's --select 3=... */
  field: number;
  /** The header text, or "field N" without a header line. */
  name: string;
  /** What names the field in `select`: the header name when it is one of a kind, else the field number. */
  key: string;
  /** The distinct texts in the order of the file (all of them when `more` is false), '' for empty cells. */
  values: LongFieldText[];
  /** More than MAX_TEXTS distinct texts: `values` is left empty. */
  more: boolean;
}

export interface LongFields {
  /** The fields src/io reads the codes and values from (1-based), when they could be told. */
  rowCodeField?: number;
  columnCodeField?: number;
  valueField?: number;
  header: boolean;
  /** Data lines counted (without the header and empty lines). */
  lines: number;
  fields: LongField[];
  /** The selection in force: the mapping's, with the latest period of a keyed sheet when none is chosen. */
  select: Record<string, string>;
  /** Why the code fields could not be told (the fields are then all listed but those given). */
  problem?: string;
}

/** The structure src/io would choose for this grid and mapping: fields and header line, or the problem. */
function structureOf(grid: Grid, mapping: MappingInput, select: Record<string, string>): { row?: number; col?: number; value?: number; header?: boolean; problem?: string } {
  const sample = grid.rowCount > SAMPLE_LINES ? new Grid(grid.file, grid.rows.slice(0, SAMPLE_LINES), grid.sheet, grid.merges) : grid;
  const tries: MappingInput[] = [{ ...mapping, ...(Object.keys(select).length ? { select } : {}) }];
  // A selection that no sample line meets (a year listed only further down) still leaves the fields to be found.
  if (Object.keys(select).length) {
    const { select: _s, ...rest } = mapping;
    tries.push(rest);
  }
  let problem = '';
  for (const m of tries) {
    try {
      const t = readLongGrid(sample, { mapping: m, duplicates: 'sum' });
      const tm = t.mapping;
      return { row: tm.rowCodeField!, col: tm.columnCodeField!, value: tm.valueField!, header: tm.headerLine != null };
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      problem ||= e.message;
    }
  }
  const out: { row?: number; col?: number; value?: number; header?: boolean; problem?: string } = { problem };
  if (mapping.rowCodeField) out.row = mapping.rowCodeField;
  if (mapping.columnCodeField) out.col = mapping.columnCodeField;
  if (mapping.valueField) out.value = mapping.valueField;
  if (mapping.headerLine !== undefined) out.header = mapping.headerLine !== null;
  return out;
}

/** The first line that is not empty (the header line when there is one), or -1. */
function firstLine(grid: Grid): number {
  for (let r = 0; r < grid.rowCount; r++) if (!grid.isEmptyRow(r)) return r;
  return -1;
}

/** The fields of a long sheet that a selection could use, with their texts (see the file's comment). */
export function longFields(grid: Grid, mapping: MappingInput = {}, readFindings: readonly Finding[] = []): LongFields {
  const select = latestPeriod(readFindings, grid.file, mapping.select ?? {})?.select ?? { ...(mapping.select ?? {}) };
  const s = structureOf(grid, mapping, select);
  const first = firstLine(grid);
  let header = s.header;
  if (header === undefined) {
    // Without a reading to go by: a header is a first line of texts only.
    header = first >= 0 && grid.rows[first]!.kinds.every((k) => k !== NUMBER);
  }
  const names: string[] = [];
  for (let c = 0; c < grid.colCount; c++) names.push(header && first >= 0 ? grid.text(first, c).trim() : '');
  const skip = new Set([s.row, s.col, s.value].filter((x): x is number => x !== undefined).map((x) => x - 1));
  const fields = [...Array(grid.colCount).keys()].filter((c) => !skip.has(c));
  const counts = fields.map(() => new Map<string, number>() as Map<string, number> | null);
  let lines = 0;
  for (let r = first + (header ? 1 : 0); r < grid.rowCount; r++) {
    if (r < 0 || grid.isEmptyRow(r)) continue;
    lines++;
    const kinds = grid.rows[r]!.kinds;
    for (let i = 0; i < fields.length; i++) {
      const m = counts[i];
      if (!m) continue;
      const c = fields[i]!;
      const t = c < kinds.length && kinds[c] !== EMPTY ? grid.text(r, c).trim() : '';
      const n = m.get(t);
      if (n !== undefined) m.set(t, n + 1);
      else if (m.size >= MAX_TEXTS) counts[i] = null;
      else m.set(t, 1);
    }
  }
  const lower = names.map((n) => n.toLowerCase());
  const out: LongFields = {
    header,
    lines,
    select,
    fields: fields.map((c, i) => {
      const name = names[c] || `field ${c + 1}`;
      // A header name selects its field when no other field has it and it cannot be read as a field number.
      const unique = !!names[c] && !/^\d+$/.test(names[c]!) && lower.indexOf(lower[c]!) === c && lower.lastIndexOf(lower[c]!) === c;
      const m = counts[i];
      return { field: c + 1, name, key: unique ? names[c]! : String(c + 1), values: m ? [...m].map(([text, n]) => ({ text, lines: n })) : [], more: !m };
    }),
  };
  if (s.row !== undefined) out.rowCodeField = s.row;
  if (s.col !== undefined) out.columnCodeField = s.col;
  if (s.value !== undefined) out.valueField = s.value;
  if (s.problem && (s.row === undefined || s.col === undefined || s.value === undefined)) out.problem = s.problem;
  return out;
}
