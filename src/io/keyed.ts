/**
 * Keyed sheets: the first column packs several codes into one field and one column follows per
 * period, as bulk downloads of statistical offices lay them out:
 *
 *     unit,induse,prod_na,geo\TIME_PERIOD   2019      2020
 *     MIO_EUR,A01,A01,XX                    95.8 p    97.1
 *
 * The header's first field names the packed codes (before the backslash) and the periods (after
 * it). Values may carry a flag after a space (`95.8 p`: provisional, `e`: estimated, `c`:
 * confidential...) and `:` marks a value not available. `unpackKeyed` turns such a sheet into a
 * plain long sheet, one line per code and period, with the fields named by the header, the
 * period, the value and the flag, so the long reader reads it (and `select` chooses a period).
 * A value not available becomes an empty cell, so the usual rule for empty cells applies.
 */
import type { Finding } from '../../engine/findings';
import { type Cell, type Grid, gridFromRows } from './grid';

const HEAD = /^\s*([^\\,]+(?:,[^\\,]+)+)\\([^\\]+?)\s*$/;
/** A number, then optionally a space and a flag of letters. */
const FLAGGED = /^\s*([-+]?[\d.,' \u00a0]*\d)\s*([a-z]{1,3})?\s*$/i;

export interface Unpacked {
  grid: Grid;
  /** The names of the packed codes, then the period field's name. */
  fields: string[];
  periods: string[];
}

/** The long sheet of a keyed sheet, or undefined when the sheet is not keyed. */
export function unpackKeyed(g: Grid): Unpacked | undefined {
  if (g.rowCount < 2 || g.colCount < 2) return undefined;
  const m = HEAD.exec(g.text(0, 0));
  if (!m) return undefined;
  const names = m[1]!.split(',').map((s) => s.trim());
  const periodName = m[2]!.trim();
  const periods: string[] = [];
  const periodCols: number[] = [];
  for (let c = 1; c < g.colCount; c++) {
    const t = g.text(0, c).trim();
    if (t) {
      periods.push(t);
      periodCols.push(c);
    }
  }
  if (!periods.length) return undefined;
  const rows: Cell[][] = [[...names, periodName, 'value', 'flag']];
  for (let r = 1; r < g.rowCount; r++) {
    const key = g.text(r, 0).trim();
    if (!key) continue;
    const codes = key.split(',').map((s) => s.trim());
    periodCols.forEach((c, k) => {
      const raw = g.text(r, c).trim();
      let value: Cell = null;
      let flag = '';
      if (raw && raw !== ':') {
        const f = FLAGGED.exec(raw);
        if (f) {
          value = f[1]!.trim();
          flag = f[2] ?? '';
        } else if (/^:\s*[a-z]{1,3}$/i.test(raw)) flag = raw.slice(1).trim();
        else value = raw; // left as it is: the long reader names the cell if it is not a number
      } else if (raw.startsWith(':')) flag = raw.slice(1).trim();
      rows.push([...codes, periods[k]!, value, flag]);
    });
  }
  return { grid: gridFromRows(rows, g.file, g.sheet), fields: [...names, periodName], periods };
}

/** The sheet itself, or its long form when it is keyed (with a note saying so). */
export function unpackIfKeyed<T extends { grid: Grid; findings: Finding[] }>(read: T): T {
  const k = unpackKeyed(read.grid);
  if (!k) return read;
  const p = k.periods;
  const note: Finding = {
    code: 'keyed-sheet',
    severity: 'note',
    message: `file ${read.grid.file}${read.grid.sheet ? `, sheet '${read.grid.sheet}'` : ''}: the first column packs the codes ${k.fields.slice(0, -1).join(', ')} and each further column is a ${k.fields.at(-1)} (${p.slice(0, 4).join(', ')}${p.length > 4 ? ', ...' : ''}); it is read as a long file, one line per code and ${k.fields.at(-1)}, with the flags after the values set apart and ':' read as an empty cell (line numbers in messages count the lines of that long form)`,
    where: { file: read.grid.file },
    data: { periods: p.length, field: k.fields.at(-1)!, latest: [...p].sort().at(-1)! },
  };
  return { ...read, grid: k.grid, findings: [...read.findings, note] };
}
