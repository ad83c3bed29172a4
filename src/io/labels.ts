/**
 * A list of codes and titles from a separate file (`--labels FILE`), for tables that carry codes
 * only (long files such as the 1997 U.S. make and use tables, whose titles come in codes.txt).
 * Any sheet readGrid reads (CSV, TSV, XLSX): the code in the first filled column, the title in the
 * next; a single column of lines such as '1110 Crop production' is split at the first space. A
 * header row ('code, title') is passed over: its first cell names no code used later.
 */
import { InputError } from '../../engine/errors';
import type { Axis } from '../../engine/table';
import { type Grid, normalizeCode, normalizeLabel } from './grid';

export function readLabelList(grid: Grid): Map<string, string> {
  const out = new Map<string, string>();
  for (let r = 0; r < grid.rowCount; r++) {
    const cells: string[] = [];
    for (let c = 0; c < grid.colCount && cells.length < 2; c++) {
      const t = grid.text(r, c).trim();
      if (t) cells.push(t);
    }
    let code: string | undefined;
    let title: string | undefined;
    if (cells.length >= 2) [code, title] = cells as [string, string];
    else if (cells.length === 1) {
      const m = /^(\S+)\s+(.*\S)\s*$/.exec(cells[0]!);
      if (m) [code, title] = [m[1]!, m[2]!];
    }
    if (code === undefined || title === undefined) continue;
    if (r === 0 && /^(codes?|id)$/i.test(code)) continue;
    out.set(normalizeCode(code), normalizeLabel(title));
  }
  if (!out.size) throw new InputError('no-rows', `file ${grid.file}: no codes and titles were found (a code and a title on each line)`, { file: grid.file }, 'Give a file with a code column and a title column');
  return out;
}

/** An axis with the titles of the list where its labels are only its codes; returns how many were set. */
export function applyLabels(axis: Axis, labels: ReadonlyMap<string, string>): number {
  let n = 0;
  axis.codes.forEach((code, i) => {
    const t = labels.get(code);
    if (t !== undefined && (axis.labels[i] === undefined || axis.labels[i] === code)) {
      axis.labels[i] = t;
      n++;
    }
  });
  return n;
}
