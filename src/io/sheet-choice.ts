/**
 * Sheet choice by content (rule sheet-by-codes; fixture: the Scottish workbook, which opens with a
 * classification list, then supply and use, then the industry-by-industry table, then the
 * published inverses and multipliers). The sheet that holds the symmetric flow table is the one
 * where a header row and a lead column share the most codes (sector codes name both rows and
 * columns). Sheets whose names say they hold results (Leontief, inverse, multipliers, effects,
 * coefficients) or supply and use tables are taken only when no other sheet has such a block: their
 * codes match too, but they are not the table of flows. Ties go to the first sheet.
 */
import type { GridRow } from './grid';
import { NUMBER, TEXT } from './grid';

/** A sheet as the chooser sees it: its name and its first rows (BODY_ROWS are enough). */
export interface SheetPeek {
  name: string;
  rows: readonly GridRow[];
}

const HEAD_ROWS = 80;
const LEAD_COLS = 12;
/** Rows of each sheet the chooser looks at. */
export const BODY_ROWS = 400;
const RESULT_NAME = /leontief|inverse|multiplier|effects?\b|coefficient|requirement|\btype\s*(i|ii|1|2)\b/i;
const SUPPLY_USE_NAME = /\b(combined\s+)?(use|supply|make)\b|\bsupply\b/i;

function cellText(row: GridRow, c: number): string {
  const k = row.kinds[c];
  if (k === TEXT) return (row.texts?.get(c) ?? '').trim();
  if (k === NUMBER) {
    const v = row.values[c]!;
    return Number.isInteger(v) ? String(v) : '';
  }
  return '';
}

/** The most codes one header row and one lead column of the sheet share. */
export function sharedCodes(sheet: SheetPeek): number {
  const rows = Math.min(sheet.rows.length, BODY_ROWS);
  const colSets: Set<string>[] = Array.from({ length: LEAD_COLS }, () => new Set());
  const rowSets: Set<string>[] = [];
  for (let r = 0; r < rows; r++) {
    const row = sheet.rows[r]!;
    const here = new Set<string>();
    for (let c = 0; c < row.kinds.length; c++) {
      const t = cellText(row, c);
      if (!t) continue;
      if (c < LEAD_COLS) colSets[c]!.add(t);
      if (r < HEAD_ROWS) here.add(t);
    }
    if (r < HEAD_ROWS) rowSets.push(here);
  }
  let best = 0;
  for (const rs of rowSets) {
    if (rs.size < 2) continue;
    for (const cs of colSets) {
      let n = 0;
      for (const t of rs) if (cs.has(t)) n++;
      if (n > best) best = n;
    }
  }
  return best;
}

export interface SheetChoice<S extends { name: string }> {
  sheet: S;
  why: string;
  /** Other sheets that hold such a block, with their shared codes. */
  others: { name: string; codes: number; kind: string }[];
}

/** What a sheet's name says it holds: results, a supply or use table, or (by default) flows. */
export function sheetKind(name: string): 'results' | 'supply or use' | 'flows' {
  return RESULT_NAME.test(name) ? 'results' : SUPPLY_USE_NAME.test(name) ? 'supply or use' : 'flows';
}

/**
 * The sheet with the symmetric flow table, or undefined when no sheet shares at least 2 codes
 * between a row and a column. `rowsOf` gives a sheet's first rows and is called only for the
 * sheets looked at: those not named as results or supply and use tables first, the others only
 * when none of those holds such a block (reading fewer sheets is most of the cost of choosing).
 */
export function chooseSheet<S extends { name: string }>(sheets: readonly S[], rowsOf: (s: S) => readonly GridRow[]): SheetChoice<S> | undefined {
  const score = (list: readonly S[]) =>
    list
      .map((w) => {
        const rows = rowsOf(w);
        return { w, codes: rows.some((r) => r.kinds.length > 0) ? sharedCodes({ name: w.name, rows }) : 0, kind: sheetKind(w.name) };
      })
      .filter((x) => x.codes >= 2);
  const named = sheets.filter((w) => sheetKind(w.name) !== 'flows');
  let ok = score(sheets.filter((w) => sheetKind(w.name) === 'flows'));
  const skipped = ok.length ? named.length : 0;
  if (!ok.length) ok = score(named);
  if (!ok.length) return undefined;
  const best = ok.reduce((a, b) => (b.codes > a.codes ? b : a));
  return {
    sheet: best.w,
    why: `its header row and lead column share ${best.codes} codes, the largest such block${skipped ? ` among sheets not named as results or supply and use tables (${skipped} such sheet${skipped > 1 ? 's were' : ' was'} not looked at)` : ''}`,
    others: ok.filter((x) => x !== best).map((x) => ({ name: x.w.name, codes: x.codes, kind: x.kind })),
  };
}
