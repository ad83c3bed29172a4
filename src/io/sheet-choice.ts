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

export interface SheetChoice<S extends SheetPeek = SheetPeek> {
  sheet: S;
  why: string;
  /** Other sheets that hold such a block, with their shared codes. */
  others: { name: string; codes: number; kind: string }[];
}

/** The sheet with the symmetric flow table, or undefined when no sheet shares at least 2 codes between a row and a column. */
export function chooseSheet<S extends SheetPeek>(sheets: readonly S[]): SheetChoice<S> | undefined {
  const scored = sheets.map((w) => {
    const kind = RESULT_NAME.test(w.name) ? 'results' : SUPPLY_USE_NAME.test(w.name) ? 'supply or use' : 'flows';
    return { w, codes: w.rows.some((r) => r.kinds.length > 0) ? sharedCodes(w) : 0, kind };
  });
  const ok = scored.filter((s) => s.codes >= 2);
  if (!ok.length) return undefined;
  const pool = ok.some((s) => s.kind === 'flows') ? ok.filter((s) => s.kind === 'flows') : ok;
  const best = pool.reduce((a, b) => (b.codes > a.codes ? b : a));
  return {
    sheet: best.w,
    why: `its header row and lead column share ${best.codes} codes, the largest such block${best.kind === 'flows' && ok.length > pool.length ? ' among sheets not named as results or supply and use tables' : ''}`,
    others: ok.filter((s) => s !== best).map((s) => ({ name: s.w.name, codes: s.codes, kind: s.kind })),
  };
}
