/**
 * Layout detection on a wide sheet: where the codes and labels are, which rows are titles,
 * headers and notes, and which rows and columns hold the table.
 *
 * The key is the intermediate square: sector codes name both rows and columns. The reader
 * looks, among the first rows and columns, for the pair (a header row, a code column) whose
 * texts match most; that pair is the code row and code column. A neighbouring text column and
 * row are the labels (either order), a leading column headed `unit` holds units. Rows above are
 * titles (their words give the year, the unit scale and the price basis) or group headers
 * (merged cells); rows below the table with text only are notes. Without any match (a use table
 * whose product and industry codes differ), the last text row above the numbers and the first
 * text column are taken, and the choice is reported.
 *
 * Every choice can be given instead, through the mapping (1-based rows and columns).
 */
import { InputError, type Where } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { TableMeta } from '../../engine/table';
import { type Entry, GridBlock } from './block';
import { EMPTY, type Grid, NUMBER, normalizeCode, normalizeLabel, TEXT } from './grid';
import type { MappingInput } from './mapping';

export interface WideStructure {
  /** 0-based; null when absent. */
  codeColumn: number | null;
  labelColumn: number | null;
  unitColumn: number | null;
  roleColumn: number | null;
  roleRow: number | null;
  codeRow: number | null;
  labelRow: number | null;
  titleRows: number[];
  headerRows: number[];
  noteRows: number[];
  meta: TableMeta;
  /** A 'description' row above the header (matrix files). */
  description?: string;
  /** Codes and labels were written in one cell and split ('A01 Crops'). */
  splitCodes?: boolean;
  block: GridBlock;
  findings: Finding[];
}

const MAX_LEAD_COLS = 10;
const MAX_HEAD_ROWS = 80;

const META_KEYS: Record<string, keyof TableMeta> = {
  title: 'title',
  currency: 'currency',
  scale: 'scale',
  'scale label': 'scaleLabel',
  unit: 'scaleLabel',
  year: 'year',
  region: 'region',
  'price basis': 'priceBasis',
  prices: 'priceBasis',
  source: 'source',
  'output assumed': 'outputAssumed',
  'rounded to': 'rounding',
  'invented data': 'invented',
  invented: 'invented',
};

interface Pair {
  row: number;
  col: number;
  /** Distinct codes that name both a column (in this row) and a row (in this column, below). */
  score: number;
  /** Of those, how many are not numbers (a header of numbers could be a row of data). */
  textScore: number;
  meanLen: number;
  /** The first matched row below, and the first matched column to the right. */
  firstRow: number;
  firstCol: number;
  /** The cell where the code row and code column cross says 'code'. */
  headed: boolean;
}

function codeAt(g: Grid, r: number, c: number): string {
  return normalizeCode(g.text(r, c));
}

/** The best (header row, code column) pairs by matched codes. */
function matchPairs(g: Grid): Pair[] {
  const R = g.rowCount;
  const C = g.colCount;
  const leadCols = Math.min(C, MAX_LEAD_COLS);
  // The header is above the numbers: look no further than a few rows past the first row of numbers.
  let firstNumbers = R;
  for (let r = 0; r < Math.min(R, MAX_HEAD_ROWS); r++) {
    const row = g.rows[r]!;
    let k = 0;
    for (let c = 0; c < row.kinds.length && k < 2; c++) if (row.kinds[c] === NUMBER) k++;
    if (k >= 2) {
      firstNumbers = r;
      break;
    }
  }
  const headRows = Math.min(R, MAX_HEAD_ROWS, firstNumbers + 4);
  const rowTexts: string[][] = [];
  for (let h = 0; h < headRows; h++) {
    const t: string[] = new Array(C);
    for (let j = 0; j < C; j++) t[j] = g.kind(h, j) === EMPTY ? '' : codeAt(g, h, j);
    rowTexts.push(t);
  }
  const pairs: Pair[] = [];
  for (let c = 0; c < leadCols; c++) {
    const rowsOf = new Map<string, number[]>();
    for (let r = 0; r < R; r++) {
      if (g.kind(r, c) === EMPTY) continue;
      const t = codeAt(g, r, c);
      // A code has a letter or a digit: '-', '..' or '…' in the cells are zeros or gaps, not codes.
      if (!t || !/[\p{L}\p{N}]/u.test(t)) continue;
      const l = rowsOf.get(t);
      if (l) l.push(r);
      else rowsOf.set(t, [r]);
    }
    if (rowsOf.size < 1) continue;
    for (let h = 0; h < headRows; h++) {
      const t = rowTexts[h]!;
      const seen = new Set<string>();
      let len = 0;
      let text = 0;
      let firstRow = Infinity;
      let firstCol = Infinity;
      for (let j = c + 1; j < C; j++) {
        const s = t[j]!;
        if (!s || seen.has(s)) continue;
        // A number is a code only as a whole number such as 1100 (never 0, a sign or a fraction):
        // values that happen to appear in a row and a column are data, not codes.
        if (g.kind(h, j) === NUMBER && !/^[1-9]\d*$/.test(s)) continue;
        const rs = rowsOf.get(s);
        if (!rs) continue;
        const below = rs.find((r) => r > h);
        if (below === undefined) continue;
        seen.add(s);
        len += s.length;
        if (g.kind(h, j) === TEXT) text++;
        if (below < firstRow) firstRow = below;
        if (j < firstCol) firstCol = j;
      }
      if (!seen.size) continue;
      if (text === 0) {
        // Numbers alone: whole-number codes (1100, 2300) match across most of a header row; a
        // few values that happen to appear in a data row and a data column do not.
        let numbers = 0;
        for (let j = c + 1; j < C; j++) if (g.kind(h, j) === NUMBER) numbers++;
        if (seen.size < 3 || seen.size * 2 < numbers) continue;
        // Codes lead their rows: a column with numbers to its left in the rows it would name is
        // data (fixture: test/helpers/affix-layouts.ts 'dom-imp-colon', where no text code matches).
        let numbersLeft = false;
        for (let k = 0; k < c && !numbersLeft; k++) if (g.kind(firstRow, k) === NUMBER) numbersLeft = true;
        if (numbersLeft) continue;
      }
      pairs.push({ row: h, col: c, score: seen.size, textScore: text, meanLen: len / seen.size, firstRow, firstCol, headed: /^codes?$/i.test(codeAt(g, h, c)) });
    }
  }
  pairs.sort((a, b) => Number(b.headed) - Number(a.headed) || b.textScore - a.textScore || b.score - a.score || a.meanLen - b.meanLen || a.row - b.row || a.col - b.col);
  return pairs;
}

function textShare(g: Grid, rows: number[], c: number): { text: number; filled: number; distinct: number; meanLen: number; spaces: number } {
  let text = 0;
  let filled = 0;
  let len = 0;
  let spaces = 0;
  const seen = new Set<string>();
  for (const r of rows) {
    const k = g.kind(r, c);
    if (k === EMPTY) continue;
    filled++;
    const s = normalizeCode(g.text(r, c));
    if (k === TEXT) text++;
    len += s.length;
    if (/\s/.test(s)) spaces++;
    seen.add(s);
  }
  return { text, filled, distinct: seen.size, meanLen: filled ? len / filled : 0, spaces };
}

/** Rows with at least two numbers. */
function numericRows(g: Grid, from: number): number[] {
  const out: number[] = [];
  for (let r = from; r < g.rowCount; r++) {
    const row = g.rows[r]!;
    let n = 0;
    for (let c = 0; c < row.kinds.length && n < 2; c++) if (row.kinds[c] === NUMBER) n++;
    if (n >= 2) out.push(r);
  }
  return out;
}

function given(v: number | null | undefined, what: string, max: number): number | null | undefined {
  if (v === undefined) return undefined;
  if (v === null) return null;
  if (!Number.isInteger(v) || v < 1 || v > max) {
    throw new InputError('bad-mapping', `mapping ${what} is ${v}, outside the sheet (1 to ${max})`, {}, `Give a ${what.endsWith('Row') ? 'row' : 'column'} number within the sheet`);
  }
  return v - 1;
}

/** Detect the structure of a wide sheet (or apply the one given in the mapping). */
export function detectStructure(g: Grid, mapping: MappingInput = {}): WideStructure {
  const R = g.rowCount;
  const C = g.colCount;
  const findings: Finding[] = [];
  const gw = (extra: Partial<Where> = {}): Where => {
    const w: Where = { file: g.file, ...extra };
    if (g.sheet !== undefined) w.sheet = g.sheet;
    return w;
  };
  if (R === 0 || C === 0) throw new InputError('empty-file', `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''} has no cells`, gw());

  let codeColumn = given(mapping.codeColumn, 'codeColumn', C);
  let codeRow = given(mapping.codeRow, 'codeRow', R);
  let labelColumn = given(mapping.labelColumn, 'labelColumn', C);
  let labelRow = given(mapping.labelRow, 'labelRow', R);
  let unitColumn = given(mapping.unitColumn, 'unitColumn', C);

  if (codeColumn === undefined || codeRow === undefined) {
    const pairs = matchPairs(g);
    const fits = (p: Pair) => (codeColumn === undefined || p.col === codeColumn) && (codeRow === undefined || p.row === codeRow);
    let best = pairs.find(fits);
    if (best) {
      // A neighbouring pair in the header zone (another row and another column) with at least
      // half as many matches and shorter texts is the code pair (codes rather than labels); the
      // first is then the label pair. Lines without a code of their own (totals named by their
      // label alone) match by label only, so the code pair may match fewer.
      const b0 = best;
      const partners = pairs.filter((p) => fits(p) && p !== b0 && p.score >= Math.max(2, b0.score * 0.5) && p.row < b0.firstRow && p.col < b0.firstCol && Math.abs(p.row - b0.row) <= 3 && Math.abs(p.col - b0.col) <= 3 && p.row !== b0.row && p.col !== b0.col);
      const shorter = partners.filter((p) => p.meanLen < b0.meanLen).sort((a, b) => a.meanLen - b.meanLen || b.score - a.score)[0];
      if (shorter && !b0.headed) {
        best = shorter;
        if (labelColumn === undefined) labelColumn = b0.col;
        if (labelRow === undefined) labelRow = b0.row;
      }
      // A nearby header row whose first cell says 'code' is the code row (the pair's row is then the labels).
      if (codeRow === undefined) {
        for (let r = Math.max(0, best.row - 3); r < Math.min(best.firstRow, best.row + 4); r++) {
          if (r === best.row) continue;
          let c = 0;
          while (c < Math.min(C, MAX_LEAD_COLS) && g.kind(r, c) === EMPTY) c++;
          // ... provided its texts name the rows of the column under the heading: a 'Code' heading
          // over the leading columns of a row of labels (above or below the row of codes) does not
          // make that row the codes.
          if (c < Math.min(C, MAX_LEAD_COLS) && /^codes?$/i.test(codeAt(g, r, c)) && pairs.some((p) => p.row === r && p.col === c && fits(p) && p.score >= best!.score * 0.5)) {
            if (labelRow === undefined) labelRow = best.row;
            if (codeColumn === undefined && labelColumn === undefined && best.col !== c) labelColumn = best.col;
            codeRow = r;
            if (codeColumn === undefined) codeColumn = c;
            break;
          }
        }
      }
      if (codeColumn === undefined) codeColumn = best.col;
      if (codeRow === undefined) codeRow = best.row;
    } else {
      // No code names both a row and a column: fall back on position.
      const nr = numericRows(g, 0);
      if (!nr.length) {
        throw new InputError('no-numbers', `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''} has no rows of numbers, so no table was found`, gw(), 'Check that this is the right file and sheet; numbers stored as text with a different decimal mark need the decimal option');
      }
      const first = nr[0]!;
      // A header row whose first cell says 'code' is the code row (as the writers write it).
      if (codeRow === undefined) {
        for (let r = 0; r < Math.min(first, MAX_HEAD_ROWS); r++) {
          for (let c = 0; c < Math.min(C, MAX_LEAD_COLS); c++) {
            if (g.kind(r, c) !== EMPTY && /^codes?$/i.test(codeAt(g, r, c))) {
              codeRow = r;
              if (codeColumn === undefined) codeColumn = c;
              break;
            }
            if (g.kind(r, c) !== EMPTY) break;
          }
          if (codeRow !== undefined) break;
        }
      }
      if (codeRow === undefined) {
        codeRow = null;
        for (let r = first - 1; r >= 0; r--) {
          const row = g.rows[r]!;
          let t = 0;
          for (let c = 0; c < row.kinds.length; c++) if (row.kinds[c] !== EMPTY) t++;
          if (t >= 2) {
            codeRow = r;
            break;
          }
        }
      }
      if (codeColumn === undefined) {
        codeColumn = null;
        const body = nr.slice(0, 200);
        for (let c = 0; c < Math.min(C, MAX_LEAD_COLS); c++) {
          const s = textShare(g, body, c);
          if (s.filled >= body.length * 0.5 && s.distinct >= s.filled * 0.9 && s.text >= s.filled * 0.5) {
            codeColumn = c;
            break;
          }
        }
      }
      findings.push({
        code: 'layout-by-position',
        severity: 'warning',
        message: `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''}: no code names both a row and a column, so the ${codeRow !== null ? `header row ${codeRow + 1}` : 'header row'} and ${codeColumn !== null ? `column ${codeColumn + 1}` : 'code column'} were chosen by position; check the mapping`,
        where: gw(),
      });
    }
  }

  const headTop = codeRow ?? -1;
  // Body rows for the partner search: rows below the code row with a code and a number to its
  // right (notes, headings and a units line below the header are not the body); any row with a
  // code when none has numbers.
  const probeRows: number[] = [];
  const hasNumber = (r: number) => {
    const k = g.rows[r]!.kinds;
    for (let c = (codeColumn ?? 0) + 1; c < k.length; c++) if (k[c] === NUMBER) return true;
    return false;
  };
  for (let r = headTop + 1; r < R && probeRows.length < 400; r++) if (codeColumn !== null && g.kind(r, codeColumn!) !== EMPTY && hasNumber(r)) probeRows.push(r);
  // The first row below the code row with a code ('Code' over the code column in a row of labels
  // below the codes is a heading, not a code).
  let firstCoded = -1;
  for (let r = headTop + 1; r < R && codeColumn !== null; r++) if (g.kind(r, codeColumn) !== EMPTY && !/^codes?$/i.test(codeAt(g, r, codeColumn))) {
    firstCoded = r;
    break;
  }
  if (!probeRows.length) for (let r = headTop + 1; r < R && probeRows.length < 400; r++) if (codeColumn !== null && g.kind(r, codeColumn!) !== EMPTY) probeRows.push(r);

  // The first data column: the first column right of the leading ones with a header code.
  const firstCodeCol = (() => {
    if (codeRow === null) return (codeColumn ?? -1) + 1;
    for (let j = (codeColumn ?? -1) + 1; j < C; j++) if (g.kind(codeRow!, j) !== EMPTY && !/^(codes?|labels?|units?|roles?|names?|titles?|descriptions?)$/i.test(codeAt(g, codeRow!, j))) {
      const numbersBelow = probeRows.slice(0, 50).some((r) => g.kind(r, j) === NUMBER);
      const textBelow = probeRows.slice(0, 50).filter((r) => g.kind(r, j) === TEXT).length;
      if (numbersBelow || textBelow < Math.max(1, probeRows.slice(0, 50).length * 0.5)) return j;
    }
    return C;
  })();

  if (labelColumn === undefined && codeRow !== null) {
    // A leading column headed 'label' (or 'name', 'title', 'description') holds the labels.
    for (let c = 0; c < Math.min(firstCodeCol, MAX_LEAD_COLS); c++) {
      if (c !== codeColumn && /^(labels?|names?|titles?|descriptions?)$/i.test(codeAt(g, codeRow, c))) {
        labelColumn = c;
        break;
      }
    }
  }
  if (labelColumn === undefined) {
    labelColumn = null;
    let bestScore = 0;
    for (let c = 0; c < Math.min(firstCodeCol, MAX_LEAD_COLS); c++) {
      if (c === codeColumn) continue;
      const s = textShare(g, probeRows, c);
      if (!probeRows.length || s.text < probeRows.length * 0.5) continue;
      if (codeRow !== null && /^units?$|^unit of measure|^roles?$/i.test(codeAt(g, codeRow, c))) continue;
      const score = s.text / probeRows.length + (codeColumn !== null && Math.abs(c - codeColumn) === 1 ? 0.1 : 0) + s.distinct / Math.max(1, s.filled) * 0.2;
      if (score > bestScore) {
        bestScore = score;
        labelColumn = c;
      }
    }
  }
  if (unitColumn === undefined) {
    unitColumn = null;
    for (let c = 0; c < Math.min(firstCodeCol, MAX_LEAD_COLS); c++) {
      if (c === codeColumn || c === labelColumn) continue;
      for (const h of [codeRow, labelRow].filter((x): x is number => typeof x === 'number')) {
        if (/^units?$|^unit of measure|^units? \(/i.test(codeAt(g, h, c))) unitColumn = c;
      }
    }
  }

  // A column headed 'role' (and a row whose first cell is 'role') carry roles written in the sheet.
  let roleColumn: number | null = null;
  for (let c = 0; c < Math.min(firstCodeCol, MAX_LEAD_COLS); c++) {
    if (c === codeColumn || c === labelColumn || c === unitColumn) continue;
    for (const h of [codeRow, labelRow].filter((x): x is number => typeof x === 'number')) if (/^roles?$/i.test(codeAt(g, h, c))) roleColumn = c;
  }
  const leadMax = Math.max(codeColumn ?? -1, labelColumn ?? -1, unitColumn ?? -1, roleColumn ?? -1);
  // Data columns: right of the leading ones.
  const dataCols: number[] = [];
  for (let j = leadMax + 1; j < C; j++) dataCols.push(j);

  if (labelRow === undefined) {
    labelRow = null;
    if (codeRow !== null) {
      const codeCols = dataCols.filter((j) => g.kind(codeRow!, j) !== EMPTY);
      const labelHeadings = [...Array(leadMax + 1).keys()].filter((c) => c !== codeColumn);
      let bestD = Infinity;
      for (let h = Math.max(0, codeRow - 3); h <= Math.min(R - 1, codeRow + 3); h++) {
        if (h === codeRow) continue;
        if (h > codeRow && firstCoded >= 0 && h >= firstCoded && g.kind(h, codeColumn ?? 0) !== EMPTY) continue;
        if (/^roles?$/i.test(codeAt(g, h, codeColumn ?? 0))) continue;
        let text = 0;
        let nums = 0;
        let merged = 0;
        const distinct = new Set<string>();
        for (const j of codeCols) {
          if (g.kind(h, j) === NUMBER) nums++;
          else if (g.text(h, j)) text++;
          if (g.kind(h, j) !== EMPTY) distinct.add(codeAt(g, h, j));
          const m = g.mergeAt(h, j);
          if (m && m.right > m.left) merged++;
        }
        // Labels name each column; a group header merged over several columns does not, nor one
        // written out over each column of its block ('Intermediate use' five times), nor a row of
        // units ('EUR million' in every column): their texts repeat.
        const headedRow = codeColumn !== null && /^codes?$/i.test(codeAt(g, codeRow, codeColumn)) && h === codeRow + 1;
        // (Under a code row headed 'code | label', as the writers write it, the labels may repeat.)
        const labelHeaded = headedRow && labelHeadings.some((c) => /^(labels?|names?|descriptions?)$/i.test(codeAt(g, codeRow!, c)));
        const repeats = text + nums >= 3 && (distinct.size === 1 || (!labelHeaded && distinct.size < (text + nums) * 0.75));
        if (codeCols.length && text + nums >= codeCols.length * 0.5 && (nums <= text || headedRow) && merged < 2 && !repeats) {
          const d = Math.abs(h - codeRow);
          if (d < bestD) {
            bestD = d;
            labelRow = h;
          }
        }
      }
    }
  }

  // Codes or labels? If the code column reads like labels and the label column like codes, swap.
  const headedCode = (c: number | null) => c !== null && [codeRow, labelRow].some((h) => typeof h === 'number' && /^codes?$/i.test(codeAt(g, h, c)));
  if (mapping.codeColumn === undefined && mapping.labelColumn === undefined && codeColumn !== null && labelColumn !== null && !headedCode(codeColumn)) {
    const a = textShare(g, probeRows, codeColumn);
    const b = textShare(g, probeRows, labelColumn);
    if (a.meanLen > b.meanLen * 1.5 && a.spaces > a.filled * 0.5 && b.spaces < b.filled * 0.2 && b.distinct >= b.filled * 0.95) {
      [codeColumn, labelColumn] = [labelColumn, codeColumn];
    }
  }
  if (mapping.codeRow === undefined && mapping.labelRow === undefined && codeRow !== null && labelRow !== null && !(codeColumn !== null && /^codes?$/i.test(codeAt(g, codeRow, codeColumn)))) {
    const lens = (h: number) => {
      let len = 0;
      let n = 0;
      let sp = 0;
      for (const j of dataCols) {
        const t = codeAt(g, h, j);
        if (!t) continue;
        n++;
        len += t.length;
        if (/\s/.test(t)) sp++;
      }
      return { mean: n ? len / n : 0, sp, n };
    };
    const a = lens(codeRow);
    const b = lens(labelRow);
    if (a.mean > b.mean * 1.5 && a.sp > a.n * 0.5 && b.sp < b.n * 0.2) [codeRow, labelRow] = [labelRow, codeRow];
  }

  let roleRow: number | null = null;
  if (codeRow !== null) {
    const kc = codeColumn ?? labelColumn ?? 0;
    for (let h = Math.max(0, codeRow - 3); h <= Math.min(R - 1, codeRow + 3); h++) if (h !== codeRow && h !== labelRow && /^roles?$/i.test(codeAt(g, h, kc))) roleRow = h;
  }
  const headerTop = Math.min(codeRow ?? Infinity, labelRow ?? Infinity, roleRow ?? Infinity);
  const headerBottom = Math.max(codeRow ?? -1, labelRow ?? -1, roleRow ?? -1);
  const keyCol = codeColumn ?? labelColumn;

  // Rows: body rows have a code (or label) and at least one cell in the data columns, or a code
  // that names a column. Text-only rows after the table are notes.
  const colCodes = new Set<string>();
  if (codeRow !== null) for (const j of dataCols) {
    const t = codeAt(g, codeRow, j);
    if (t) colCodes.add(t);
  }
  if (labelRow !== null) for (const j of dataCols) {
    const t = normalizeCode(g.mergedText(labelRow, j));
    if (t) colCodes.add(t);
  }
  const rowEntries: Entry[] = [];
  const noteRows: number[] = [];
  const notes: string[] = [];
  const unlabelled: number[] = [];
  for (let r = headerBottom + 1; r < R; r++) {
    if (g.isEmptyRow(r)) continue;
    const code = codeColumn !== null ? codeAt(g, r, codeColumn) : '';
    const label = labelColumn !== null ? normalizeLabel(g.text(r, labelColumn)) : '';
    let data = 0;
    const row = g.rows[r]!;
    for (let j = leadMax + 1; j < row.kinds.length && data === 0; j++) if (row.kinds[j] !== EMPTY) data++;
    const key = code || normalizeCode(label);
    // A note written as a key and its text ('note', '...').
    if (keyCol !== null && /^notes?:?$/i.test(key) && data === 0) {
      noteRows.push(r);
      notes.push(normalizeLabel(labelColumn !== null && labelColumn !== keyCol ? g.text(r, labelColumn) : rowText(g, r).replace(/^notes?:?\s*/i, '')));
      continue;
    }
    if (!key) {
      if (data > 0 && [...Array(row.kinds.length).keys()].some((j) => j > leadMax && row.kinds[j] === NUMBER)) unlabelled.push(r);
      else {
        noteRows.push(r);
        notes.push(rowText(g, r));
      }
      continue;
    }
    if (data === 0 && !colCodes.has(key)) {
      // A row of text alone: a heading inside the table, or a note below it (decided below).
      noteRows.push(r);
      notes.push(rowText(g, r));
      continue;
    }
    let unit: string | undefined;
    if (unitColumn !== null) {
      const u = normalizeLabel(g.text(r, unitColumn));
      if (u) unit = u;
    }
    const e: Entry = { code: key, label: label || key, pos: r, at: r + 1, where: g.where(r, keyCol ?? 0) };
    if (roleColumn !== null) {
      const role = codeAt(g, r, roleColumn).toLowerCase();
      if (role) e.role = role;
    }
    if (unit !== undefined) e.unit = unit;
    else {
      const m = /[[(]([^\])[(]+)[\])]\s*$/.exec(label || code);
      if (m) e.unitInLabel = m[1]!.trim();
    }
    rowEntries.push(e);
  }
  // Notes must come after the last body row; text rows before it are headings.
  const lastBody = rowEntries.length ? rowEntries[rowEntries.length - 1]!.pos : -1;
  const keptNotes: number[] = [];
  const keptText: string[] = [];
  noteRows.forEach((r, i) => {
    if (r > lastBody) {
      keptNotes.push(r);
      keptText.push(notes[i]!);
    }
  });
  for (const r of unlabelled) {
    findings.push({
      code: 'row-without-code',
      severity: 'warning',
      message: `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''}: row ${r + 1} has numbers but no code or label, so it is not read; give it a code, or set it in the mapping`,
      where: gw({ row: r + 1 }),
    });
  }

  const groups = groupHeadersInCodeRow(g, dataCols, codeRow, labelRow, new Set(rowEntries.map((e) => e.code)));
  const colEntries: Entry[] = [];
  for (const j of dataCols) {
    const group = groups.get(j);
    const code = codeRow !== null && group === undefined ? codeAt(g, codeRow, j) : '';
    const label = labelRow !== null ? normalizeLabel(g.mergedText(labelRow, j)) : '';
    const key = code || normalizeCode(label);
    if (!key) {
      const hasNumbers = rowEntries.some((e) => g.kind(e.pos, j) === NUMBER);
      if (hasNumbers) {
        const e = rowEntries.find((x) => g.kind(x.pos, j) === NUMBER)!;
        findings.push({
          code: 'column-without-code',
          severity: 'warning',
          message: `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''}: column ${j + 1} has numbers (such as cell ${g.where(e.pos, j).cell}) but no code or label in its header, so it is not read; give it a code, or set it in the mapping`,
          where: g.where(e.pos, j),
        });
      }
      continue;
    }
    const ce: Entry = { code: key, label: label || key, pos: j, at: j + 1, where: g.where(codeRow ?? labelRow ?? 0, j) };
    if (group !== undefined) ce.group = group;
    if (roleRow !== null) {
      const role = codeAt(g, roleRow, j).toLowerCase();
      if (role) ce.role = role;
    }
    colEntries.push(ce);
  }

  // Code and label in one cell ('A01 Crops'), in rows and header alike: split into the two.
  const split = splitCodes(rowEntries, colEntries, labelColumn === null && codeColumn !== null, labelRow === null && codeRow !== null, mapping.splitCodes);
  if (split) {
    // Codes split from labels that now name rows and columns confirm the layout chosen by position.
    const colSet = new Set(colEntries.map((e) => e.code));
    const both = rowEntries.filter((e) => colSet.has(e.code)).length;
    const k = findings.findIndex((f) => f.code === 'layout-by-position' && f.severity === 'warning');
    if (k >= 0 && both >= 2) findings[k] = { ...findings[k]!, severity: 'note', message: `${findings[k]!.message.replace(/; check the mapping$/, '')}; once the codes are split from the labels written with them, ${both} codes name both a row and a column` };
  }

  // Titles, group headers, key/value rows above the header.
  const titleRows: number[] = [];
  const headerRows: number[] = [];
  const meta: TableMeta = {};
  const titleTexts: string[] = [];
  let description: string | undefined;
  for (let r = 0; r < Math.min(headerTop === Infinity ? 0 : headerTop, R); r++) {
    if (g.isEmptyRow(r)) continue;
    const row = g.rows[r]!;
    const filled: number[] = [];
    for (let c = 0; c < row.kinds.length; c++) if (row.kinds[c] !== EMPTY) filled.push(c);
    const inData = filled.filter((c) => c > leadMax).length;
    const key = filled.length === 2 ? g.text(r, filled[0]!).trim().replace(/:$/, '').toLowerCase() : '';
    if (key === 'description') {
      titleRows.push(r);
      description = g.text(r, filled[1]!).trim();
      continue;
    }
    const kv = key ? META_KEYS[key] : undefined;
    if (kv) {
      titleRows.push(r);
      setMeta(meta, kv, g.text(r, filled[1]!).trim());
      continue;
    }
    if (inData >= 2 || g.merges.some((m) => m.top === r && m.right > m.left)) headerRows.push(r);
    else {
      titleRows.push(r);
      titleTexts.push(rowText(g, r));
    }
  }
  for (const m of g.merges) if (m.top > headerTop && m.top < headerBottom && !headerRows.includes(m.top) && m.top !== codeRow && m.top !== labelRow) headerRows.push(m.top);
  const fromTitles = metaFromTitles(titleTexts);
  for (const [k, v] of Object.entries(fromTitles)) if ((meta as Record<string, unknown>)[k] === undefined) (meta as Record<string, unknown>)[k] = v;
  // A Year column (rule year-column; fixture: the Scottish IxI sheet, 'Year' on every row): when
  // it holds one year, that is the table's year, whatever the title's range says.
  for (let c = 0; c <= leadMax; c++) {
    const head = [codeRow, labelRow].find((h) => h !== null && /^(year|period|time)$/i.test(codeAt(g, h!, c)));
    if (head === undefined) continue;
    const seen = new Set(rowEntries.map((e) => codeAt(g, e.pos, c)).filter(Boolean));
    if (seen.size === 1) {
      const y = Number([...seen][0]);
      if (Number.isInteger(y) && y >= 1900 && y <= 2100) {
        if (meta.year !== undefined && meta.year !== y) findings.push({ code: 'year-from-column', severity: 'note', message: `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''}: the year is ${y}, from the '${codeAt(g, head!, c)}' column, not ${meta.year} from the title`, where: gw() });
        meta.year = y;
      }
    }
    break;
  }
  if (keptText.length) {
    const src = keptText.find((t) => /^sources?\s*:/i.test(t));
    if (src && meta.source === undefined) meta.source = src.replace(/^sources?\s*:\s*/i, '');
    meta.notes = keptText.filter((t) => t !== src);
    if (!meta.notes.length) delete meta.notes;
  }

  if (!rowEntries.length) throw new InputError('no-rows', `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''}: no table rows were found below the header${codeRow !== null ? ` (row ${codeRow + 1})` : ''}`, gw(), 'Check the file, or give codeRow and codeColumn in the mapping');
  if (!colEntries.length) throw new InputError('no-columns', `file ${g.file}${g.sheet ? `, sheet '${g.sheet}'` : ''}: no table columns with codes were found${codeRow !== null ? ` in row ${codeRow + 1}` : ''}`, gw(), 'Check the file, or give codeRow and codeColumn in the mapping');

  const block = new GridBlock(g, rowEntries, colEntries);
  const out: WideStructure = {
    codeColumn,
    labelColumn,
    unitColumn,
    roleColumn,
    roleRow,
    codeRow,
    labelRow,
    titleRows,
    headerRows: headerRows.sort((a, b) => a - b),
    noteRows: keptNotes,
    meta,
    block,
    findings,
  };
  if (description !== undefined) out.description = description;
  if (split) out.splitCodes = true;
  return out;
}

/**
 * Group headers written in the code row (rule two-row-header; fixture: the Scottish IxI sheet,
 * 'Final consumption expenditure' over Households, NPISHs, Central and Local government): a text
 * in the code row that names no row, reads as words (it has small letters), and is followed by
 * columns with a label but nothing in the code row is the header of those columns, not a code.
 * The columns under it take their labels as codes and the group as `group`. Returns column → group.
 */
function groupHeadersInCodeRow(g: Grid, dataCols: number[], codeRow: number | null, labelRow: number | null, rowCodes: Set<string>): Map<number, string> {
  const out = new Map<number, string>();
  if (codeRow === null || labelRow === null) return out;
  for (let q = 0; q < dataCols.length; q++) {
    const j = dataCols[q]!;
    const t = codeAt(g, codeRow, j);
    if (!t || rowCodes.has(t) || !/\p{Ll}/u.test(t) || !normalizeLabel(g.mergedText(labelRow, j))) continue;
    const span = [j];
    for (let r = q + 1; r < dataCols.length; r++) {
      const k = dataCols[r]!;
      if (codeAt(g, codeRow, k) || !normalizeLabel(g.mergedText(labelRow, k))) break;
      span.push(k);
    }
    if (span.length < 2) continue;
    const group = normalizeLabel(g.text(codeRow, j));
    for (const k of span) out.set(k, group);
  }
  return out;
}

/** A code written before its label in one cell: a code-like word (capitals, digits, '.', '-', '_', '/'), a space, a label with a letter. */
const CODE_AND_LABEL = /^([A-Z0-9][A-Z0-9._\-\u2013/]{0,11})(?:\s+[-\u2013\u2014:]\s+|:\s+|\s+)([\p{L}\p{N}(].*\p{L}.*)$/u;
/**
 * Code and label with an explicit separator ('CoE: Compensation of employees', 'TlSPrdn - Taxes
 * on production'): the code may then have small letters, when it still looks like a code (a
 * digit, '_' or '.', or a capital after a small letter), so that 'Trade - Wholesale' stays whole.
 */
const CODE_COLON_LABEL = /^([\p{L}\p{N}][\p{L}\p{N}._\-\u2013/]{0,11})(?::\s+|\s+[-\u2013\u2014]\s+)([\p{L}\p{N}(].*\p{L}.*)$/u;
const CODE_LIKE = /[\d_.]|\p{Ll}\p{Lu}|^[^\p{Ll}]+$/u;

/** A cell holding code and label taken apart ('A01 Crops', 'A01 - Crops', 'CoE: Compensation'), or null. */
export function cutCodeAndLabel(text: string): { code: string; label: string } | null {
  let m = CODE_AND_LABEL.exec(text);
  if (m && !/[\d._\-\u2013/]/.test(m[1]!) && !/\p{Ll}/u.test(m[2]!)) m = null;
  if (!m) {
    m = CODE_COLON_LABEL.exec(text);
    if (m && !CODE_LIKE.test(m[1]!)) m = null;
  }
  return m ? { code: m[1]!, label: m[2]!.trim() } : null;
}

/**
 * Code and label written in one cell ('A01 Crops', 'P3_S14 Final consumption of households'),
 * with no label column (rows) or label row (columns) beside them. The cells are split when most
 * texts that name both a row and a column (the sectors; at least two) start with a code-like
 * word followed by a label ('A01 Crops', 'A01 - Crops', 'A01: Crops'), and those words are
 * distinct: then the words are the codes. The other lines of a split axis are split too where
 * they have that shape with a label that starts with a capital or a digit ('TINT Total
 * intermediate use', not 'NPISH final consumption'), unless a code would come out twice; lines
 * without it keep their text as code and label. `given` (the mapping's splitCodes) decides
 * instead of the sectors. Returns whether anything was split.
 */
function splitCodes(rows: Entry[], cols: Entry[], rowsAlone: boolean, colsAlone: boolean, given: boolean | undefined): boolean {
  if (given === false || (!rowsAlone && !colsAlone)) return false;
  // 'FOOD PRODUCTS' is a label in capitals, not the code FOOD: a code of letters alone needs a
  // label with small letters after it (cutCodeAndLabel).
  const cut = (e: Entry) => {
    const p = e.label === e.code ? cutCodeAndLabel(e.code) : null;
    return p ? ['', p.code, p.label] : null;
  };
  const colKeys = new Set(cols.map((e) => e.code));
  const rowKeys = new Set(rows.map((e) => e.code));
  const shared = new Set(rows.filter((e) => colKeys.has(e.code)).map((e) => e.code));
  /** The sectors (texts naming a row and a column) mostly start with distinct code-like words. */
  const bySectors = (): boolean => {
    const heads = new Set<string>();
    for (const e of rows) {
      if (!shared.has(e.code)) continue;
      const m = cut(e);
      if (!m) continue;
      if (heads.has(m[1]!)) return false;
      heads.add(m[1]!);
    }
    // Most of them: a total named alike in a row and a column ('Total output') has no code.
    return heads.size >= 2 && heads.size * 2 > shared.size;
  };
  /**
   * Or one axis joins code and label while the other has them apart ('A01 Crops' across, a code
   * column 'A01' and a label column 'Crops' down): most of its code-like words name lines of the
   * other axis, two at least, each once.
   */
  const byOtherAxis = (): boolean => {
    for (const [list, alone, other] of [
      [rows, rowsAlone, colKeys],
      [cols, colsAlone, rowKeys],
    ] as const) {
      if (!alone) continue;
      const words = list.map(cut).filter((m): m is string[] => !!m).map((m) => m[1]!);
      const matched = words.filter((w) => other.has(w));
      const hits = new Set(matched);
      if (hits.size >= 2 && hits.size === matched.length && hits.size * 2 > words.length) return true;
    }
    return false;
  };
  if (given !== true && !bySectors() && !byOtherAxis()) return false;
  let any = false;
  for (const [list, alone] of [
    [rows, rowsAlone],
    [cols, colsAlone],
  ] as const) {
    if (!alone) continue;
    const parts = list.map((e) => {
      const m = cut(e);
      if (!m) return undefined;
      if (!shared.has(e.code) && !/^[\p{Lu}\p{N}]/u.test(m[2]!)) return undefined;
      return { code: m[1]!, label: m[2]!.trim() };
    });
    // No code may come out twice, nor as the whole text of another line.
    const keys = new Map<string, number>();
    list.forEach((e, i) => {
      const k = parts[i]?.code ?? e.code;
      keys.set(k, (keys.get(k) ?? 0) + 1);
    });
    list.forEach((e, i) => {
      const p = parts[i];
      if (!p || keys.get(p.code)! > 1) return;
      e.code = p.code;
      e.label = p.label;
      any = true;
    });
  }
  return any;
}

function rowText(g: Grid, r: number): string {
  const parts: string[] = [];
  const row = g.rows[r]!;
  for (let c = 0; c < row.kinds.length; c++) if (row.kinds[c] !== EMPTY) parts.push(g.text(r, c).trim());
  return parts.join(' ');
}

function setMeta(meta: TableMeta, key: keyof TableMeta, value: string): void {
  const m = meta as Record<string, unknown>;
  if (key === 'scale' || key === 'year' || key === 'rounding') {
    const v = Number(value);
    if (Number.isFinite(v)) m[key] = v;
  } else if (key === 'outputAssumed' || key === 'invented') m[key] = /^(true|yes|1)$/i.test(value);
  else m[key] = value;
}

/** Year, unit scale and price basis from title lines. */
export function metaFromTitles(lines: string[]): TableMeta {
  const meta: TableMeta = {};
  if (!lines.length) return meta;
  meta.title = lines[0]!;
  const all = lines.join(' ');
  // 'millions', 'USD million', '$ thousand', "'000", 'bn', 'mn'.
  const scale = /\b(thousands?|millions?|billions?|bn|mn)\b|'000\b|’000\b/i.exec(all);
  if (scale) {
    const w = (scale[1] ?? 'thousand').toLowerCase();
    const k = w.startsWith('th') ? 'thousands' : w.startsWith('m') ? 'millions' : 'billions';
    meta.scaleLabel = k;
    meta.scale = k === 'thousands' ? 1e3 : k === 'millions' ? 1e6 : 1e9;
  }
  // The table's year, not a range of years ('Input-Output Tables 1998-2016' names a series):
  // a year that is not part of a range, else the last year of the range.
  const years = [...all.matchAll(/\b(19[0-9]{2}|20[0-9]{2})\b(\s*[-\u2013\u2014]\s*(?:19|20)[0-9]{2}\b)?/g)];
  // Years of a classification ('SIC 2007', 'NACE Rev. 2', 'NAICS 2017', 'SNA 2008') are not the table's.
  const classification = (m: RegExpExecArray | RegExpMatchArray) => /\b(SIC|NACE|ISIC|NAICS|ANZSIC|CPA|CPC|SNA|ESA|BPM)\s*(rev\.?\s*\d*\s*)?$/i.test(all.slice(0, m.index));
  const single = years.find((m) => !m[2] && !/[-\u2013\u2014]\s*$/.test(all.slice(0, m.index)) && !classification(m));
  if (single) meta.year = Number(single[1]);
  else {
    const ranges = years.filter((m) => !classification(m));
    if (ranges.length) meta.year = Number(/(?:19|20)[0-9]{2}$/.exec(ranges[ranges.length - 1]![0])![0]);
  }
  const price = /\b(basic|producers['’]?|purchasers['’]?|market)\s+prices?\b/i.exec(all);
  if (price) meta.priceBasis = price[0]!.toLowerCase().replace('’', "'");
  const cur = /\b(USD|EUR|GBP|JPY|CNY|AUD|CAD|CHF|SEK|NOK|DKK|NZD|ZAR|INR|BRL|MXN|KRW)\b/.exec(all);
  if (cur) meta.currency = cur[1]!;
  else {
    // A symbol or a word, read as the currency as written (the unit, not a guess at the country).
    const sym = /(€|£|¥|\$)|\b(euros?|pounds sterling|pounds|yen|dollars)\b/i.exec(all);
    if (sym) meta.currency = (sym[1] ?? sym[2]!).toLowerCase() === 'euros' ? 'euro' : (sym[1] ?? sym[2]!);
  }
  return meta;
}
