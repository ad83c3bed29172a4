/**
 * The agency's own results as a cross-check. When a workbook holds, beside the table, the
 * agency's published Leontief inverse or multipliers (sheets named so: 'Leontief type I',
 * 'Type I multipliers'), they are compared with ours and the largest difference is reported:
 * "the published Type I inverse in sheet 'Leontief type I', printed × 1000, agrees within 4e-10".
 *
 * How a published sheet is read (rule published-by-codes): the header row and the lead column
 * that name most of the table's sectors hold the codes; an inverse is a block of those codes
 * both ways, scaled by the power of ten its diagonal shows (agencies print × 1000); a multipliers
 * sheet has a column headed 'output multiplier' (rows of the table's year when a Year column
 * holds several). Type II sheets (a household row and column) are listed but not compared here:
 * their closure is a convention of the agency's, stated in its notes. Fixture: the Scottish
 * workbook IO2016.xlsx.
 */
import type { Finding } from '../../engine/findings';
import type { Matrix } from '../../engine/linalg/matrix';
import type { Table } from '../../engine/table';
import { type Grid, NUMBER, normalizeCode } from './grid';
import { readGrid } from './open';

const INVERSE_NAME = /leontief|inverse|total requirements/i;
const MULTIPLIER_NAME = /multipliers?/i;
const TYPE_II = /type\s*(ii|2)\b|closed|induced/i;

export interface PublishedComparison {
  sheet: string;
  what: 'inverse' | 'output multipliers';
  /** The factor the sheet's figures are printed at (1000: × 1000). */
  scale: number;
  compared: number;
  worst: number;
  /** Row and column code (inverse) or sector code (multipliers) of the largest difference. */
  at: string;
}

/** The row and column of the grid that name most of the sectors, with each code's place. */
function codesOf(g: Grid, sectors: Set<string>): { rows: Map<string, number>; cols: Map<string, number> } {
  let bestRow = -1;
  let bestRowN = 0;
  for (let r = 0; r < Math.min(g.rowCount, 80); r++) {
    let n = 0;
    for (let c = 0; c < g.colCount; c++) if (sectors.has(normalizeCode(g.text(r, c)))) n++;
    if (n > bestRowN) [bestRowN, bestRow] = [n, r];
  }
  let bestCol = -1;
  let bestColN = 0;
  for (let c = 0; c < Math.min(g.colCount, 12); c++) {
    let n = 0;
    for (let r = 0; r < g.rowCount; r++) if (sectors.has(normalizeCode(g.text(r, c)))) n++;
    if (n > bestColN) [bestColN, bestCol] = [n, c];
  }
  const cols = new Map<string, number>();
  if (bestRow >= 0) for (let c = 0; c < g.colCount; c++) {
    const t = normalizeCode(g.text(bestRow, c));
    if (sectors.has(t) && !cols.has(t) && c !== bestCol) cols.set(t, c);
  }
  const rows = new Map<string, number>();
  if (bestCol >= 0) for (let r = 0; r < g.rowCount; r++) {
    const t = normalizeCode(g.text(r, bestCol));
    if (sectors.has(t) && r !== bestRow && g.rows[r]!.kinds.some((k) => k === NUMBER)) rows.set(t, r); // the last row of a code: the latest year when years run down
  }
  return { rows, cols };
}

const num = (g: Grid, r: number, c: number) => (g.kind(r, c) === NUMBER ? g.rows[r]!.values[c]! : NaN);

function compareInverse(g: Grid, t: Table, L: Matrix, sheet: string): PublishedComparison | undefined {
  const n = t.sectors.codes.length;
  const { rows, cols } = codesOf(g, new Set(t.sectors.codes));
  if (rows.size < n * 0.9 || cols.size < n * 0.9) return undefined;
  // The printed scale: the power of ten that brings the diagonal to ours.
  const ratios: number[] = [];
  t.sectors.codes.forEach((code, i) => {
    const r = rows.get(code);
    const c = cols.get(code);
    if (r !== undefined && c !== undefined) ratios.push(num(g, r, c) / L.data[i * n + i]!);
  });
  const finite = ratios.filter((x) => Number.isFinite(x) && x > 0).sort((a, b) => a - b);
  if (!finite.length) return undefined;
  const scale = 10 ** Math.round(Math.log10(finite[finite.length >> 1]!));
  let worst = 0;
  let at = '';
  let compared = 0;
  t.sectors.codes.forEach((rc, i) => {
    const r = rows.get(rc);
    if (r === undefined) return;
    t.sectors.codes.forEach((cc, j) => {
      const c = cols.get(cc);
      if (c === undefined) return;
      const p = num(g, r, c);
      if (Number.isNaN(p)) return;
      const d = Math.abs(p / scale - L.data[i * n + j]!);
      compared++;
      if (d > worst || Number.isNaN(d)) [worst, at] = [d, `${rc}, ${cc}`];
    });
  });
  return { sheet, what: 'inverse', scale, compared, worst, at };
}

function compareOutputMultipliers(g: Grid, t: Table, L: Matrix, sheet: string): PublishedComparison | undefined {
  const n = t.sectors.codes.length;
  let head = -1;
  let col = -1;
  for (let r = 0; r < Math.min(g.rowCount, 80) && col < 0; r++) {
    for (let c = 0; c < g.colCount; c++) {
      if (/^output\s+multipliers?\b/i.test(g.text(r, c).replace(/\s+/g, ' ').trim())) {
        [head, col] = [r, c];
        break;
      }
    }
  }
  if (col < 0) return undefined;
  const { rows } = codesOf(g, new Set(t.sectors.codes));
  if (rows.size < n * 0.9) return undefined;
  let worst = 0;
  let at = '';
  let compared = 0;
  t.sectors.codes.forEach((code, j) => {
    const r = rows.get(code);
    if (r === undefined || r <= head || !(t.x[j]! > 0)) return; // no output: agencies print a placeholder
    const p = num(g, r, col);
    if (Number.isNaN(p)) return;
    let s = 0;
    for (let i = 0; i < n; i++) s += L.data[i * n + j]!;
    const d = Math.abs(p - s);
    compared++;
    if (d > worst) [worst, at] = [d, code];
  });
  return { sheet, what: 'output multipliers', scale: 1, compared, worst, at };
}

/**
 * Compare the published inverses and output multipliers of a workbook with the table's own
 * Leontief inverse L. Returns the comparisons and a finding for each (a note when within
 * `tolerance`, a warning otherwise), and a note naming Type II sheets left out.
 */
export async function crossCheckPublished(bytes: Uint8Array, file: string, t: Table, L: Matrix, tableSheet: string | undefined, tolerance = 1e-6): Promise<{ comparisons: PublishedComparison[]; findings: Finding[] }> {
  const comparisons: PublishedComparison[] = [];
  const findings: Finding[] = [];
  let sheets: string[] | undefined;
  try {
    sheets = (await readGrid(bytes, { file, ...(tableSheet ? { sheet: tableSheet } : {}) })).sheets;
  } catch {
    return { comparisons, findings };
  }
  if (!sheets) return { comparisons, findings };
  const skipped: string[] = [];
  for (const sheet of sheets) {
    if (sheet === tableSheet) continue;
    const inverse = INVERSE_NAME.test(sheet);
    const mult = MULTIPLIER_NAME.test(sheet);
    if (!inverse && !mult) continue;
    if (TYPE_II.test(sheet)) {
      skipped.push(sheet);
      continue;
    }
    const g = (await readGrid(bytes, { file, sheet })).grid;
    const c = inverse ? compareInverse(g, t, L, sheet) : compareOutputMultipliers(g, t, L, sheet);
    if (!c) continue;
    comparisons.push(c);
    const ok = c.worst <= tolerance;
    const what = c.what === 'inverse' ? 'Type I inverse' : 'Type I output multipliers';
    findings.push({
      code: ok ? 'published-agrees' : 'published-differs',
      severity: ok ? 'note' : 'warning',
      message: `file ${file}: the published ${what} in sheet '${sheet}'${c.scale !== 1 ? `, printed × ${c.scale}` : ''}, ${ok ? (c.what === 'inverse' ? 'agrees' : 'agree') : c.what === 'inverse' ? 'differs' : 'differ'} ${ok ? 'within' : 'by up to'} ${c.worst.toExponential(1)} (${c.compared} figures compared${ok ? '' : `, the most at ${c.at}`})`,
      where: { file, sheet },
      data: { ...c },
    });
  }
  if (skipped.length) findings.push({ code: 'published-not-compared', severity: 'note', message: `file ${file}: the published Type II figures in ${skipped.map((s) => `'${s}'`).join(', ')} are not compared: their household closure is the agency's convention`, where: { file } });
  return { comparisons, findings };
}
