/**
 * From a block (rows and columns with codes, and cells) to the engine's data: which rows and
 * columns are sectors, final demand, value added, imports, totals, output or satellites; the
 * totals checked against the data (never read as data); and the blocks read as matrices, with
 * every empty or text cell in them reported by cell.
 *
 * Classification, in order: the mapping; the ignore patterns; labels that say output or total;
 * a code that names both a row and a column (a sector, whatever pattern it matches); code
 * patterns; label patterns; a unit column; then position (rows before the first non-sector row
 * are sectors, rows after it value added, rows after the output row satellites; columns before
 * the first non-sector column are sectors, after it final demand). In long files, where order
 * means nothing, what is left is a sector.
 *
 * A total is checked against the sums it could be (the sector block, the final-demand or
 * value-added block, everything, the run of lines since the previous total or up to the next);
 * the sum it matches in most lines is reported, and lines that differ by more than the rounding
 * of the data allows are findings naming the cell. A total that matches no sum is reported and
 * left out; if its label also says what it is ('Total value added' alone, with no parts), it is
 * read as that line instead. The sum of everything is the output line when no line is named so.
 */
import { roundingBound } from '../../engine/rounding';
import { InputError, type Where } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import { LeontiefModel } from '../../engine/leontief';
import type { Matrix } from '../../engine/linalg/matrix';
import type { Axis, ClassedAxis, DemandClass, InputClass, Satellite, Table, TableMeta } from '../../engine/table';
import { VALUE_ADDED_CLASSES, validateTable } from '../../engine/table';
import { type Block, DenseBlock, type Entry } from './block';
import { normalizeCode, TEXT } from './grid';
import { maximalRuns, runSubtotals } from './rules/run-subtotals';
import { demandClassOf, inputClassOf } from './rules/classes';
import {
  COLUMN_ROLES,
  type ColumnRole,
  type LayoutMapping,
  type MappedColumn,
  type MappedRow,
  type MappingInput,
  ROW_ROLES,
  type RowRole,
  roleOverrides,
  type TableKind,
  type TotalCheck,
} from './mapping';
import { numberHint } from './numbers';
import { type CompiledPatterns, compilePatterns, type LayoutPatterns, PATTERN_KEYS, resolvePatterns } from './patterns';

export interface AssembleOptions {
  kind: TableKind;
  mapping?: MappingInput;
  /** Empty cells in the blocks read: an error (default) or zero. */
  blanks?: 'error' | 'zero';
  /** Texts read as zero in the blocks, such as '-' or '..' (none by default). */
  zeroTexts?: string[];
  patterns?: MappingInput['patterns'];
}

export interface Classified {
  rowRoles: RowRole[];
  colRoles: ColumnRole[];
  rowWhy: string[];
  colWhy: string[];
  units: (string | undefined)[];
  totals: TotalCheck[];
  findings: Finding[];
}

type RoleWhy<R> = { role: R | undefined; why: string; alt?: R };

function stripTotal(label: string): string {
  return label.replace(/^\s*(grand\s+|sub-?)?totals?\s*(of\s+)?[:\-–]?\s*/i, '').trim();
}

function overrideFor<R>(o: ReturnType<typeof roleOverrides<string>>, e: Entry): { role?: R; unit?: string; label?: string } | undefined {
  return (o.byCode.get(e.code) ?? o.byIndex.get(e.at)) as { role?: R; unit?: string; label?: string } | undefined;
}

/** Classify the rows and columns of a block, then check the totals. */
export function classify(block: Block, options: AssembleOptions): Classified {
  const kind = options.kind;
  const patterns: LayoutPatterns = resolvePatterns(options.patterns ?? options.mapping?.patterns);
  const P: CompiledPatterns = compilePatterns(patterns);
  const rowO = roleOverrides(options.mapping?.rows, ROW_ROLES, 'rows');
  const colO = roleOverrides(options.mapping?.columns, COLUMN_ROLES, 'columns');
  const rowCodes = new Set(block.rows.map((e) => e.code));
  const colCodes = new Set(block.cols.map((e) => e.code));
  const findings: Finding[] = [];
  const wide = block.shape === 'wide';
  const plain = kind === 'matrix' || kind === 'make';

  // Unknown codes in the mapping are an error: a typo must not pass silently.
  for (const [o, codes, axis] of [
    [rowO, rowCodes, 'rows'],
    [colO, colCodes, 'columns'],
  ] as const) {
    for (const code of o.byCode.keys()) {
      if (!codes.has(code)) {
        throw new InputError('mapping-unknown-code', `the mapping sets ${axis} '${code}', but the ${axis === 'rows' ? 'rows' : 'columns'} of file ${block.file} have no such code`, { file: block.file }, `Known codes start ${[...codes].slice(0, 8).map((c) => `'${c}'`).join(', ')}`);
      }
    }
  }

  const sheetRole = <R extends string>(e: Entry, roles: readonly R[], axis: string): R | undefined => {
    if (e.role === undefined) return undefined;
    if (!roles.includes(e.role as R)) {
      throw new InputError('bad-role', `file ${block.file}: ${axis} '${e.code}' has role '${e.role}' written in the sheet, which is not one of ${roles.join(', ')}`, e.where ?? { file: block.file }, 'Fix the role, or leave the cell empty to let the reader decide');
    }
    return e.role as R;
  };
  // Where a line has no code of its own (its 'code' is its label), code patterns apply only when no
  // label pattern says what it is: 'Transport and storage' must not pass for a total (T*), nor
  // 'Taxes on products' be judged by its first letter.
  const labelSets = PATTERN_KEYS.map((k) => P[k]);
  const codeOf = (e: Entry, m: CompiledPatterns[keyof CompiledPatterns]): string | undefined => {
    const own = e.code !== e.label && e.code !== normalizeCode(e.label);
    if (!own && (/\s/.test(e.code) || labelSets.some((q) => q.label(e.label)))) return undefined;
    return m.code(e.code);
  };
  // A supply table lists, beside the industries, imports, trade and transport margins and taxes
  // on products: lines of the supply of products that no industry makes.
  const supplyExtra = (e: Entry): string | undefined => {
    let m: string | undefined;
    if ((m = codeOf(e, P.imports)) || (m = P.imports.label(e.label))) return `imports (${m})`;
    if (/^(trade|transport|distribution|wholesale|retail)?[\s,a-z]*margins?\b/i.test(e.label)) return 'margins';
    if (/^total\s+supply\b/i.test(e.label)) return 'total supply (with imports and margins)';
    if (/^(taxes|subsidies)\b.*\bproducts?\b/i.test(e.label) || /^(taxes|subsidies) (less|minus|net of) (taxes|subsidies)\b/i.test(e.label)) return 'taxes less subsidies on products';
    return undefined;
  };
  const colRole = (e: Entry): RoleWhy<ColumnRole> => {
    const o = overrideFor<ColumnRole>(colO, e);
    if (o?.role) return { role: o.role, why: 'mapping' };
    const sr = sheetRole(e, COLUMN_ROLES, 'column');
    if (sr) return { role: sr, why: e.why ?? 'role written in the sheet' };
    let m: string | undefined;
    if ((m = codeOf(e, P.ignore)) || (m = P.ignore.label(e.label))) return { role: 'ignore', why: `ignore pattern ${m}` };
    if (kind === 'make' && (m = supplyExtra(e))) return { role: 'ignore', why: `${m}: part of the supply of products, but made by no industry (not read)` };
    if ((m = P.output.label(e.label))) return { role: 'output', why: `label matches ${m}` };
    if ((m = P.totals.label(e.label))) {
      const r: RoleWhy<ColumnRole> = { role: 'total', why: `label matches ${m}` };
      if (!plain && P.finalDemand.label(stripTotal(e.label))) r.alt = 'final-demand';
      return r;
    }
    if (rowCodes.has(e.code)) {
      // A code that names a row too is a sector, unless it looks like a total (or total output)
      // and the data say it is one.
      if ((m = codeOf(e, P.totals))) return { role: 'total', why: `code matches ${m}`, alt: 'sector' };
      if (!plain && (m = codeOf(e, P.output))) return { role: 'output', why: `code matches ${m}`, alt: 'sector' };
      // Imports named alike as a row (imported inputs) and a column (imports taken off final demand): no industry makes them.
      if (!plain && ((m = codeOf(e, P.imports)) || (m = P.imports.label(e.label)))) return { role: 'final-demand', why: `it matches the imports pattern ${m}: a column of imports, not a sector` };
      return { role: 'sector', why: 'its code names a row too' };
    }
    if ((m = codeOf(e, P.totals))) {
      const r: RoleWhy<ColumnRole> = { role: 'total', why: `code matches ${m}` };
      if (!plain && P.finalDemand.label(stripTotal(e.label))) r.alt = 'final-demand';
      return r;
    }
    if ((m = codeOf(e, P.output))) return { role: 'output', why: `code matches ${m}` };
    if (plain) return { role: 'sector', why: kind === 'make' ? 'a commodity column' : 'a matrix column' };
    if ((m = codeOf(e, P.finalDemand))) return { role: 'final-demand', why: `code matches ${m}` };
    if ((m = P.finalDemand.label(e.label))) return { role: 'final-demand', why: `label matches ${m}` };
    return { role: undefined, why: '' };
  };

  const rowRole = (e: Entry): RoleWhy<RowRole> => {
    const o = overrideFor<RowRole>(rowO, e);
    if (o?.role) return { role: o.role, why: 'mapping' };
    const sr = sheetRole(e, ROW_ROLES, 'row');
    if (sr) return { role: sr, why: e.why ?? 'role written in the sheet' };
    let m: string | undefined;
    if ((m = codeOf(e, P.ignore)) || (m = P.ignore.label(e.label))) return { role: 'ignore', why: `ignore pattern ${m}` };
    if (kind === 'make' && (m = supplyExtra(e))) return { role: 'ignore', why: `${m}: part of the supply of products, but made by no industry (not read)` };
    if ((m = P.output.label(e.label))) return { role: 'output', why: `label matches ${m}` };
    const altOf = (label: string): RowRole | undefined => {
      if (plain) return undefined;
      const s = stripTotal(label);
      if (P.imports.label(s)) return 'imports';
      if (P.valueAdded.label(s)) return 'value-added';
      return undefined;
    };
    if ((m = P.totals.label(e.label))) {
      const r: RoleWhy<RowRole> = { role: 'total', why: `label matches ${m}` };
      const alt = altOf(e.label);
      if (alt) r.alt = alt;
      return r;
    }
    if (colCodes.has(e.code)) {
      if ((m = codeOf(e, P.totals))) return { role: 'total', why: `code matches ${m}`, alt: 'sector' };
      if (!plain && (m = codeOf(e, P.output))) return { role: 'output', why: `code matches ${m}`, alt: 'sector' };
      if (!plain && ((m = codeOf(e, P.imports)) || (m = P.imports.label(e.label)))) return { role: 'imports', why: `it matches the imports pattern ${m}: a row of imports, not a sector` };
      return { role: 'sector', why: 'its code names a column too' };
    }
    if ((m = codeOf(e, P.totals))) {
      const r: RoleWhy<RowRole> = { role: 'total', why: `code matches ${m}` };
      const alt = altOf(e.label);
      if (alt) r.alt = alt;
      return r;
    }
    if ((m = codeOf(e, P.output))) return { role: 'output', why: `code matches ${m}` };
    if (plain) return { role: 'sector', why: kind === 'make' ? 'an industry row' : 'a matrix row' };
    if ((m = codeOf(e, P.valueAdded))) return { role: 'value-added', why: `code matches ${m}` };
    if ((m = codeOf(e, P.imports))) return { role: 'imports', why: `code matches ${m}` };
    if ((m = codeOf(e, P.satellite))) return { role: 'satellite', why: `code matches ${m}` };
    if ((m = P.imports.label(e.label))) return { role: 'imports', why: `label matches ${m}` };
    if ((m = P.valueAdded.label(e.label))) return { role: 'value-added', why: `label matches ${m}` };
    if ((m = P.satellite.label(e.label))) return { role: 'satellite', why: `label matches ${m}` };
    if (e.unit) return { role: 'satellite', why: 'it has a unit' };
    return { role: undefined, why: '' };
  };

  const cr = block.cols.map(colRole);
  const rr = block.rows.map(rowRole);

  // Position for what is left. In a symmetric table a code that names no row (or no column)
  // cannot be a sector: after the sectors it is final demand (or value added).
  const symmetric = kind === 'flows' || kind === 'coefficients';
  if (symmetric) {
    let sectorBefore = false;
    block.cols.forEach((e, j) => {
      const x = cr[j]!;
      if (x.role === undefined && !rowCodes.has(e.code) && sectorBefore) {
        x.role = 'final-demand';
        x.why = BY_POSITION_COL;
      }
      if (rowCodes.has(e.code)) sectorBefore = true;
    });
    let afterOutputRow = false;
    let sectorAbove = false;
    block.rows.forEach((e, i) => {
      const x = rr[i]!;
      if (x.role === 'output') afterOutputRow = true;
      const above = sectorAbove;
      if (colCodes.has(e.code)) sectorAbove = true;
      if (x.role === undefined && !colCodes.has(e.code) && above) {
        x.role = afterOutputRow ? 'satellite' : 'value-added';
        x.why = afterOutputRow ? 'after the output row' : BY_POSITION_ROW;
      }
    });
  }
  {
    let seenOther = false;
    let afterOutput = false;
    for (const x of cr) {
      if (x.role === undefined) {
        if (!wide || !seenOther) x.role = 'sector';
        else if (afterOutput) x.role = 'ignore';
        else x.role = 'final-demand';
        x.why = !wide ? 'not a final-demand or total code' : !seenOther ? 'before the first final-demand or total column' : afterOutput ? 'after the output column' : 'after the sector columns';
        if (afterOutput) x.why += ' (not read)';
      } else if (x.role !== 'sector') seenOther = true;
      if (x.role === 'output') afterOutput = true;
    }
  }
  {
    let seenOther = false;
    let afterOutput = false;
    for (const x of rr) {
      if (x.role === undefined) {
        if (!wide || !seenOther) x.role = 'sector';
        else if (afterOutput) x.role = 'satellite';
        else x.role = 'value-added';
        x.why = !wide ? 'not a value-added or total code' : !seenOther ? 'before the first value-added or total row' : afterOutput ? 'after the output row' : 'after the sector rows';
      } else if (x.role !== 'sector') seenOther = true;
      if (x.role === 'output') afterOutput = true;
    }
  }

  const rowRoles = rr.map((x) => x.role!) as RowRole[];
  const colRoles = cr.map((x) => x.role!) as ColumnRole[];
  const rowWhy = rr.map((x) => x.why);
  const colWhy = cr.map((x) => x.why);
  if (!plain) {
    totalNamedLikeSector(block, rowRoles, colRoles, rowWhy, colWhy, rr, cr);
    findSubtotals(block, rowRoles, colRoles, rowWhy, colWhy, rr, cr);
  }

  let totals = checkTotals(block, rowRoles, colRoles, kind, findings, false);
  // Demote unexplained totals whose label (or code) says what else they are; then promote the sum
  // of everything to output. Each change is checked again.
  const demote = (sectorsOnly = false): boolean => {
    let changed = false;
    const sectors: { axis: 'row' | 'column'; idx: number; was: string; why: string }[] = [];
    for (const t of totals) {
      const list = t.axis === 'row' ? rr : cr;
      const idx = (t.axis === 'row' ? block.rows : block.cols).findIndex((e) => e.code === t.code);
      const x = list[idx]!;
      const roles = t.axis === 'row' ? rowRoles : colRoles;
      const whys = t.axis === 'row' ? rowWhy : colWhy;
      if (!t.sumOf && x.alt && (!sectorsOnly || (x.alt === 'sector' && roles[idx] === 'total')) && !isFixed(x) && (roles[idx] === 'total' || (roles[idx] === 'output' && x.alt === 'sector'))) {
        if (x.alt === 'sector') sectors.push({ axis: t.axis, idx, was: roles[idx]!, why: whys[idx]! });
        roles[idx] = x.alt as never;
        whys[idx] = `${x.why}, but it is the sum of nothing before or after it, so it is read as ${x.alt}`;
        changed = true;
      }
    }
    // A total that names a row and a column (TINT) is the sum of nothing while a sector of a code
    // like a total's (T) is left out of the sector block: with that sector back in, it is tried
    // again as a total and kept so when it now adds up.
    if (sectors.length > 1) {
      for (const d of sectors) {
        const roles: string[] = d.axis === 'row' ? rowRoles : colRoles;
        const whys = d.axis === 'row' ? rowWhy : colWhy;
        const code = (d.axis === 'row' ? block.rows : block.cols)[d.idx]!.code;
        roles[d.idx] = d.was;
        const t = checkTotals(block, rowRoles, colRoles, kind, findings, false).find((c) => c.axis === d.axis && c.code === code);
        if (t?.sumOf && t.matched === t.checked) whys[d.idx] = `${d.why}; it is the sum of ${t.sumOf} once the other codes like it are sectors`;
        else roles[d.idx] = 'sector';
      }
    }
    return changed;
  };
  const promotable = kind === 'flows' || kind === 'use' || kind === 'make';
  const promote = (): boolean => {
    if (!promotable) return false;
    let changed = false;
    for (const axis of ['row', 'column'] as const) {
      const roles = axis === 'row' ? rowRoles : colRoles;
      if (roles.includes('output')) continue;
      const grand = totals.filter((t) => t.axis === axis && t.sumOf === ALL_NAME[axis] && t.matched === t.checked && t.checked > 0);
      const t = grand[grand.length - 1];
      if (!t) continue;
      const idx = (axis === 'row' ? block.rows : block.cols).findIndex((e) => e.code === t.code);
      if (isFixed((axis === 'row' ? rr : cr)[idx]!)) continue;
      roles[idx] = 'output';
      (axis === 'row' ? rowWhy : colWhy)[idx] += `; it is the sum of ${ALL_NAME[axis]}, so it is read as total output`;
      changed = true;
    }
    return changed;
  };
  // Totals known by their code alone (`T*` also matches codes such as TXS for taxes) that are the
  // sum of nothing, between the first sector line and the output line, are tried as data: value
  // added (rows) or final demand (columns). The change is kept only when it makes the output line
  // the sum it should be; otherwise they stay unexplained totals, reported as such.
  const positional = (): boolean => {
    if (!symmetric && kind !== 'use') return false;
    let changed = false;
    for (const axis of ['row', 'column'] as const) {
      const roles: string[] = axis === 'row' ? rowRoles : colRoles;
      const entries = axis === 'row' ? block.rows : block.cols;
      const why = axis === 'row' ? rr : cr;
      const outAt = roles.indexOf('output');
      const firstSector = roles.indexOf('sector');
      if (outAt < 0 || firstSector < 0) continue;
      const score = (list: TotalCheck[]) => {
        const t = list.find((c) => c.axis === axis && c.code === entries[outAt]!.code);
        return t && t.sumOf && t.checked ? t.matched / t.checked : 0;
      };
      const before = score(totals);
      if (before === 1) continue;
      const tried = totals
        .filter((t) => t.axis === axis && !t.sumOf && t.role === 'total')
        .map((t) => entries.findIndex((e) => e.code === t.code))
        .filter((i) => i > firstSector && i < outAt && roles[i] === 'total' && !why[i]!.alt && !isFixed(why[i]!) && why[i]!.why.startsWith('code matches'));
      if (!tried.length) continue;
      const as = axis === 'row' ? 'value-added' : 'final-demand';
      for (const i of tried) roles[i] = as;
      const again = checkTotals(block, rowRoles, colRoles, kind, findings, false);
      const after = score(again);
      if (after >= 0.5 && after > before + 1e-9) {
        for (const i of tried) (axis === 'row' ? rowWhy : colWhy)[i] = `${why[i]!.why}, but it is the sum of nothing and ${entries[outAt]!.code} adds up only with it, so it is read as ${as === 'value-added' ? 'value added' : 'final demand'}`;
        totals = again;
        changed = true;
      } else for (const i of tried) roles[i] = 'total';
    }
    return changed;
  };
  // Totals whose codes name a row and a column (sectors whose codes look like totals, such as T)
  // first; then rows taken for totals by their code (an output line can only be judged with
  // them), then totals whose label says what else they are (and output codes that name a row and
  // a column, OUT), then the sum of everything as output.
  if (demote(true)) totals = checkTotals(block, rowRoles, colRoles, kind, findings, false);
  positional();
  if (demote()) totals = checkTotals(block, rowRoles, colRoles, kind, findings, false);
  // Lines read as data once more (a tax row first taken for a total by its code, T*) may complete
  // the run a subtotal adds up (GVA = TlSPrdn + CoE + GOS): look for subtotals again.
  if (!plain) {
    const was = [...rowRoles, ...colRoles].join('\u0000');
    findSubtotals(block, rowRoles, colRoles, rowWhy, colWhy, rr, cr);
    if ([...rowRoles, ...colRoles].join('\u0000') !== was) totals = checkTotals(block, rowRoles, colRoles, kind, findings, false);
  }
  if (promote()) totals = checkTotals(block, rowRoles, colRoles, kind, findings, false);
  if (positional() && promote()) totals = checkTotals(block, rowRoles, colRoles, kind, findings, false);
  checkTotals(block, rowRoles, colRoles, kind, findings, true, totals);

  const units = block.rows.map((e, i) => {
    const o = overrideFor<RowRole>(rowO, e);
    if (o?.unit) return o.unit;
    if (e.unit) return e.unit;
    if (rowRoles[i] === 'satellite' && e.unitInLabel) return e.unitInLabel;
    return undefined;
  });
  // Labels given in the mapping.
  block.rows.forEach((e) => {
    const o = overrideFor<RowRole>(rowO, e);
    if (o?.label) e.label = o.label;
  });
  block.cols.forEach((e) => {
    const o = overrideFor<ColumnRole>(colO, e);
    if (o?.label) e.label = o.label;
  });
  return { rowRoles, colRoles, rowWhy, colWhy, units, totals, findings };
}

/** Roles a user gave (in a mapping or written in the sheet): never changed by what the data suggest. */
function isFixed(x: RoleWhy<string>): boolean {
  return x.why === 'mapping' || x.why === 'role written in the sheet' || x.why.endsWith('(rule affix-codes)');
}

/** The unit the block's figures seem rounded to (0 when unknown). */
function roundingUnit(block: Block): number {
  return block.decimals === undefined ? 0 : 10 ** -block.decimals;
}

/**
 * How far a line may miss the sum of `parts` lines and still be taken for their subtotal: the
 * rounding of the parts, but never more than 2% of the sum (in a small table of small whole
 * numbers, rounding alone would let chance sums pass for subtotals).
 */
function subtotalTolerance(unit: number, found: number, sum: number, parts: number): number {
  return Math.min(roundingBound(unit, parts), 0.02 * Math.abs(sum)) + 1e-9 * Math.max(Math.abs(found), Math.abs(sum), 1);
}

/**
 * A total named like a sector: the last sector row and the last sector column share a name no
 * pattern knows ('Production', 'Gesamt') and are the sums of everything above and before them.
 * A real sector's row cannot be the sum of all the others in every column, so both are totals
 * (the total checks then take them for output). Roles from a mapping or the sheet are kept.
 */
function totalNamedLikeSector(block: Block, rowRoles: RowRole[], colRoles: ColumnRole[], rowWhy: string[], colWhy: string[], rr: RoleWhy<RowRole>[], cr: RoleWhy<ColumnRole>[]): void {
  const ti = rowRoles.lastIndexOf('sector');
  const tj = colRoles.lastIndexOf('sector');
  if (ti < 0 || tj < 0 || block.rows[ti]!.code !== block.cols[tj]!.code || isFixed(rr[ti]!) || isFixed(cr[tj]!)) return;
  const sectorRows = rowRoles.map((r, i) => (r === 'sector' && i !== ti ? i : -1)).filter((i) => i >= 0);
  const sectorCols = colRoles.map((r, j) => (r === 'sector' && j !== tj ? j : -1)).filter((j) => j >= 0);
  if (sectorRows.length < 2) return;
  const unit = roundingUnit(block);
  const close = (found: number, sum: number, parts: number) => Math.abs(found - sum) <= subtotalTolerance(unit, found, sum, parts);
  const num = (v: number) => (v === v ? v : 0);
  // The row: over the other sector columns, the sum of the sector and value-added rows above it.
  const above = rowRoles.map((r, i) => (i < ti && (r === 'sector' || r === 'value-added' || r === 'imports') ? i : -1)).filter((i) => i >= 0);
  const tv = block.values(ti);
  let nonzero = 0;
  for (const j of sectorCols) {
    const pos = block.cols[j]!.pos;
    let sum = 0;
    let parts = 0;
    for (const i of above) {
      const v = num(block.values(i)[pos]!);
      sum += v;
      if (v !== 0) parts++;
    }
    const found = num(tv[pos]!);
    if (!close(found, sum, parts)) return;
    if (found !== 0) nonzero++;
  }
  if (nonzero * 2 <= sectorCols.length) return;
  // The column: in the other sector rows, the sum of the sector and final-demand columns before it.
  const before = colRoles.map((r, j) => (j < tj && (r === 'sector' || r === 'final-demand') ? j : -1)).filter((j) => j >= 0);
  nonzero = 0;
  for (const i of sectorRows) {
    const v = block.values(i);
    let sum = 0;
    let parts = 0;
    for (const j of before) {
      const x = num(v[block.cols[j]!.pos]!);
      sum += x;
      if (x !== 0) parts++;
    }
    const found = num(v[block.cols[tj]!.pos]!);
    if (!close(found, sum, parts)) return;
    if (found !== 0) nonzero++;
  }
  if (nonzero * 2 <= sectorRows.length) return;
  rowRoles[ti] = 'total';
  colRoles[tj] = 'total';
  rowWhy[ti] = `${rowWhy[ti]}, but it is the sum of every row above it, and its column the sum of every column before it, so both are totals`;
  colWhy[tj] = `${colWhy[tj]}, but it is the sum of every column before it, and its row the sum of every row above it, so both are totals`;
}

/**
 * Subtotals that do not say so: a value-added (or imports) row that is the sum of the two or
 * more such rows right before it, or right after it ('Gross value added' under its parts), and a
 * final-demand column that is the sum of the final-demand columns next to it ('Final
 * consumption' beside households, non-profit institutions and government). Such a line is read
 * as a total (and checked as one), not as data that would count its parts twice. A line is a
 * subtotal only when it matches in every sector line (within the rounding of the data) and is
 * not zero in most of them; roles from a mapping or the sheet are kept.
 */
function findSubtotals(block: Block, rowRoles: RowRole[], colRoles: ColumnRole[], rowWhy: string[], colWhy: string[], rr: RoleWhy<RowRole>[], cr: RoleWhy<ColumnRole>[]): void {
  const unit = roundingUnit(block);
  const tol = (found: number, sum: number, parts: number) => subtotalTolerance(unit, found, sum, parts);
  const sectorCols = colRoles.map((r, j) => (r === 'sector' ? block.cols[j]!.pos : -1)).filter((p) => p >= 0);
  const sectorRows = rowRoles.map((r, i) => (r === 'sector' ? i : -1)).filter((i) => i >= 0);
  if (!sectorCols.length || !sectorRows.length) return;
  // Rows: values across the sector columns.
  const rowVals = new Map<number, Float64Array>();
  const valuesOf = (i: number) => {
    let v = rowVals.get(i);
    if (!v) rowVals.set(i, (v = block.values(i)));
    return v;
  };
  const primary = ['value-added', 'imports'];
  for (const [a, b] of maximalRuns(rowRoles, primary)) {
    const found = runSubtotals({
      count: b - a + 1,
      positions: sectorCols.length,
      at: (l, k) => valuesOf(a + l)[sectorCols[k]!]!,
      unit,
      tol,
      judged: (l) => !isFixed(rr[a + l]!),
    });
    for (const s of found) {
      const t = a + s.line;
      rowRoles[t] = 'total';
      rowWhy[t] = `${rowWhy[t]}, but it is the sum of rows ${block.rows[a + s.lo]!.code}..${block.rows[a + s.hi]!.code} in every sector column, so it is read as a subtotal`;
    }
  }
  // Columns: values down the sector rows.
  for (const [a, b] of maximalRuns(colRoles, ['final-demand'])) {
    const found = runSubtotals({
      count: b - a + 1,
      positions: sectorRows.length,
      at: (l, k) => valuesOf(sectorRows[k]!)[block.cols[a + l]!.pos]!,
      unit,
      tol,
      judged: (l) => !isFixed(cr[a + l]!),
    });
    for (const s of found) {
      const t = a + s.line;
      colRoles[t] = 'total';
      colWhy[t] = `${colWhy[t]}, but it is the sum of columns ${block.cols[a + s.lo]!.code}..${block.cols[a + s.hi]!.code} in every sector row, so it is read as a subtotal`;
    }
  }

  // A value-added row (or final-demand column) that is the sum of every line before it is total
  // output under a code no pattern knows (such as OUT): a total, which the total checks then
  // take for output. One pass each way over the rows' values, keeping running sums.
  const nc = sectorCols.length;
  const cum = new Float64Array(nc);
  const cumN = new Int32Array(nc);
  let lines = 0;
  for (let t = 0; t < rowRoles.length; t++) {
    const r = rowRoles[t]!;
    if (r !== 'sector' && !primary.includes(r)) continue;
    const v = block.values(t);
    if (r !== 'sector' && !isFixed(rr[t]!) && lines >= 2) {
      let ok = true;
      let nonzero = 0;
      for (let k = 0; k < nc && ok; k++) {
        let found = v[sectorCols[k]!]!;
        if (found !== found) found = 0;
        if (Math.abs(found - cum[k]!) > tol(found, cum[k]!, cumN[k]!)) ok = false;
        if (found !== 0) nonzero++;
      }
      if (ok && nonzero * 2 > nc) {
        rowRoles[t] = 'total';
        rowWhy[t] = `${rowWhy[t]}, but it is the sum of every row above it in every sector column, so it is read as a total`;
        continue;
      }
    }
    lines++;
    for (let k = 0; k < nc; k++) {
      const x = v[sectorCols[k]!]!;
      if (x === x && x !== 0) {
        cum[k] += x;
        cumN[k]++;
      }
    }
  }
  const fdCols = colRoles.map((r, j) => (r === 'final-demand' ? j : -1)).filter((j) => j >= 0);
  if (!fdCols.length) return;
  // Per sector row, the running sum across the columns before each final-demand column.
  const nr = sectorRows.length;
  const order = colRoles.map((r, j) => (r === 'sector' || r === 'final-demand' ? j : -1)).filter((j) => j >= 0);
  const checkAt = new Map<number, number>(); // column → its place in `order`
  order.forEach((j, q) => checkAt.set(j, q));
  const sums2 = new Float64Array(nr * fdCols.length);
  const counts2 = new Int32Array(nr * fdCols.length);
  const found2 = new Float64Array(nr * fdCols.length);
  for (let k = 0; k < nr; k++) {
    const v = block.values(sectorRows[k]!);
    let s2 = 0;
    let n2 = 0;
    let f = 0;
    for (const j of order) {
      const x0 = v[block.cols[j]!.pos]!;
      const x = x0 === x0 ? x0 : 0;
      if (colRoles[j] === 'final-demand') {
        sums2[k * fdCols.length + f] = s2;
        counts2[k * fdCols.length + f] = n2;
        found2[k * fdCols.length + f] = x;
        f++;
      }
      s2 += x;
      if (x !== 0) n2++;
    }
  }
  // Columns marked as totals here leave the running sums of those after them too high; a second
  // such column in one table is rare, so each is judged against the sums with all before it.
  fdCols.forEach((t, f) => {
    if (isFixed(cr[t]!) || (checkAt.get(t) ?? 0) < 2) return;
    let nonzero = 0;
    for (let k = 0; k < nr; k++) {
      const found = found2[k * fdCols.length + f]!;
      const sum = sums2[k * fdCols.length + f]!;
      if (Math.abs(found - sum) > tol(found, sum, counts2[k * fdCols.length + f]!)) return;
      if (found !== 0) nonzero++;
    }
    if (nonzero * 2 > nr) {
      colRoles[t] = 'total';
      colWhy[t] = `${colWhy[t]}, but it is the sum of every column before it in every sector row, so it is read as a total`;
    }
  });
}

const ALL_NAME = { row: 'all sector, value-added and imports rows', column: 'all sector and final-demand columns' } as const;

interface Candidate {
  name: string;
  /** Which parts: a block, or a range of the parts in order. */
  block?: 'sector' | 'other' | 'imports' | 'primary' | 'all';
  from?: number;
  to?: number;
  /** Rows summed one by one: a run of value-added rows next to a total row, from `start` stepping by `dir`. */
  run?: { start: number; dir: number; len: number };
}

/**
 * The runs of two or more lines of the given roles right before and right after line t, nearest
 * first (every length from 2 up), as their first and last index and the direction they grow in:
 * the parts a subtotal such as 'Gross value added' or 'Final consumption expenditure' may add up.
 * Ranges, never lists, so that a run of 20,000 lines costs 20,000 entries, not 200 million.
 */
function adjacentRuns(roles: readonly string[], t: number, kinds: readonly string[]): { lo: number; hi: number; dir: number; len: number }[] {
  const out: { lo: number; hi: number; dir: number; len: number }[] = [];
  for (const dir of [-1, 1]) {
    let len = 0;
    for (let u = t + dir; u >= 0 && u < roles.length && kinds.includes(roles[u]!); u += dir) {
      len++;
      if (len >= 2) out.push({ lo: Math.min(t + dir, u), hi: Math.max(t + dir, u), dir, len });
    }
  }
  return out;
}

interface Stat {
  checked: number;
  matched: number;
  /** By block of the lines (0 sector, 1 value added or final demand, 2 imports): totals present, and missing where the parts are not zero. */
  present: number[];
  missingBy: number[];
  firstMissingBy: number[];
  missing: number;
  worstGap: number;
  worstLine: number;
  worstFound: number;
  worstSum: number;
  firstMissing: number;
  mismatches: number[];
}

function newStat(): Stat {
  return { checked: 0, matched: 0, present: [0, 0, 0], missingBy: [0, 0, 0], firstMissingBy: [-1, -1, -1], missing: 0, worstGap: -1, worstLine: -1, worstFound: 0, worstSum: 0, firstMissing: -1, mismatches: [] };
}

/**
 * Check every total line against its candidate sums. With `report`, turn the given checks into
 * findings (mismatched cells, missing totals, totals that match no sum).
 */
function checkTotals(block: Block, rowRoles: RowRole[], colRoles: ColumnRole[], kind: TableKind, findings: Finding[], report: boolean, done?: TotalCheck[]): TotalCheck[] {
  if (report) {
    reportTotals(block, done!, rowRoles, colRoles, findings);
    return done!;
  }
  const out: TotalCheck[] = [];
  const unit = roundingUnit(block);
  // Rounding of the parts: each is off by at most half a unit, and their errors add like independent
  // uniform errors (six standard deviations, capped by the worst case), plus the total's own half unit.
  const tolOf = (found: number, sum: number, nz: number) => roundingBound(unit, nz) + 1e-9 * Math.max(Math.abs(found), Math.abs(sum), 1);

  // Column totals: parts are sector and final-demand columns; lines are sector, value-added and imports rows.
  {
    const tIdx = colRoles.map((r, j) => (r === 'total' || r === 'output' ? j : -1)).filter((j) => j >= 0);
    if (tIdx.length) {
      const parts: number[] = [];
      const partKind: number[] = []; // 1 sector, 2 final demand
      const before: number[] = new Array(block.cols.length).fill(0);
      for (let j = 0; j < block.cols.length; j++) {
        before[j] = parts.length;
        if (colRoles[j] === 'sector' || colRoles[j] === 'final-demand') {
          parts.push(block.cols[j]!.pos);
          partKind.push(colRoles[j] === 'sector' ? 1 : 2);
        }
      }
      const cands = tIdx.map((t, q) => candidatesFor(t, q, tIdx, before, parts.length, block.cols, 'column', kind));
      if (kind !== 'matrix' && kind !== 'make') {
        tIdx.forEach((t, q) => {
          for (const { lo, hi } of adjacentRuns(colRoles, t, ['final-demand'])) {
            cands[q]!.push({ name: `${block.cols[lo]!.code}..${block.cols[hi]!.code}`, from: before[lo]!, to: before[hi]! + 1 });
          }
        });
      }
      const stats = cands.map((cs) => cs.map(newStat));
      const lines = rowRoles.map((r, i) => (r === 'sector' || r === 'value-added' || r === 'imports' ? i : -1)).filter((i) => i >= 0);
      const P = new Float64Array(parts.length + 1);
      const N = new Int32Array(parts.length + 1);
      for (const i of lines) {
        const v = block.values(i);
        const lineBlock = rowRoles[i] === 'sector' ? 0 : rowRoles[i] === 'value-added' ? 1 : 2;
        let s1 = 0;
        let s2 = 0;
        let n1 = 0;
        let n2 = 0;
        for (let k = 0; k < parts.length; k++) {
          let x = v[parts[k]!]!;
          if (x !== x) x = 0;
          P[k + 1] = P[k]! + x;
          N[k + 1] = N[k]! + (x !== 0 ? 1 : 0);
          if (partKind[k] === 1) {
            s1 += x;
            if (x !== 0) n1++;
          } else {
            s2 += x;
            if (x !== 0) n2++;
          }
        }
        tIdx.forEach((t, q) => {
          const found = v[block.cols[t]!.pos]!;
          cands[q]!.forEach((c, ci) => {
            const st = stats[q]![ci]!;
            let sum: number;
            let nz: number;
            if (c.block === 'sector') [sum, nz] = [s1, n1];
            else if (c.block === 'other') [sum, nz] = [s2, n2];
            else if (c.block === 'all') [sum, nz] = [s1 + s2, n1 + n2];
            else [sum, nz] = [P[c.to!]! - P[c.from!]!, N[c.to!]! - N[c.from!]!];
            tally(st, i, lineBlock, found, sum, nz, tolOf);
          });
        });
      }
      tIdx.forEach((t, q) => out.push(best(block.cols[t]!, 'column', colRoles[t] as 'total' | 'output', cands[q]!, stats[q]!)));
    }
  }

  // Row totals: parts are sector, value-added and imports rows; lines are sector and final-demand columns.
  {
    const tIdx = rowRoles.map((r, i) => (r === 'total' || r === 'output' ? i : -1)).filter((i) => i >= 0);
    if (tIdx.length) {
      const lines = colRoles.map((r, j) => (r === 'sector' || r === 'final-demand' ? j : -1)).filter((j) => j >= 0);
      const L = lines.length;
      const pos = lines.map((j) => block.cols[j]!.pos);
      const zero = () => ({ s: new Float64Array(L), n: new Int32Array(L) });
      const cum = zero();
      const sec = zero();
      const va = zero();
      const imp = zero();
      const snaps: { s: Float64Array; n: Int32Array }[] = [];
      const before: number[] = new Array(block.rows.length).fill(0);
      let partCount = 0;
      for (let i = 0; i < block.rows.length; i++) {
        before[i] = partCount;
        const r = rowRoles[i];
        if (r === 'total' || r === 'output') {
          snaps.push({ s: cum.s.slice(), n: cum.n.slice() });
          continue;
        }
        if (r !== 'sector' && r !== 'value-added' && r !== 'imports') continue;
        partCount++;
        const v = block.values(i);
        const target = r === 'sector' ? sec : r === 'value-added' ? va : imp;
        for (let k = 0; k < L; k++) {
          let x = v[pos[k]!]!;
          if (x !== x) x = 0;
          cum.s[k] += x;
          target.s[k] += x;
          if (x !== 0) {
            cum.n[k]++;
            target.n[k]++;
          }
        }
      }
      const cands = tIdx.map((t, q) => candidatesFor(t, q, tIdx, before, partCount, block.rows, 'row', kind));
      if (kind !== 'matrix' && kind !== 'make') {
        tIdx.forEach((t, q) => {
          for (const { lo, hi, dir, len } of adjacentRuns(rowRoles, t, ['value-added', 'imports'])) {
            cands[q]!.push({ name: `${block.rows[lo]!.code}..${block.rows[hi]!.code}`, run: { start: dir < 0 ? hi : lo, dir, len } });
          }
        });
      }
      // Sums of the runs next to a total, grown one row at a time (the runs of each direction come
      // nearest first, so each row is added once per total and direction).
      const runAcc = new Map<number, { a: { s: Float64Array; n: Int32Array }; len: number }>();
      const runSums = (run: { start: number; dir: number; len: number }) => {
        const key = run.start * 2 + (run.dir > 0 ? 1 : 0);
        let r = runAcc.get(key);
        if (!r || r.len > run.len) runAcc.set(key, (r = { a: zero(), len: 0 }));
        for (; r.len < run.len; r.len++) {
          const v = block.values(run.start + run.dir * r.len);
          for (let k = 0; k < L; k++) {
            const x = v[pos[k]!]!;
            if (x === x && x !== 0) {
              r.a.s[k] += x;
              r.a.n[k]++;
            }
          }
        }
        return r.a;
      };
      const snapAt = (q: number) => (q < 0 ? zero() : q >= snaps.length ? cum : snaps[q]!);
      tIdx.forEach((t, q) => {
        const v = block.values(t);
        const st = cands[q]!.map(newStat);
        cands[q]!.forEach((c, ci) => {
          let a: { s: Float64Array; n: Int32Array };
          let b: { s: Float64Array; n: Int32Array } | undefined;
          if (c.block === 'sector') a = sec;
          else if (c.block === 'other') a = va;
          else if (c.block === 'imports') a = imp;
          else if (c.block === 'primary') {
            a = { s: va.s.map((x, k) => x + imp.s[k]!), n: va.n.map((x, k) => x + imp.n[k]!) };
          } else if (c.block === 'all') a = cum;
          else if (c.run) a = runSums(c.run);
          else {
            // Ranges are between snapshots: from = index of the total that opens the run (-1 for the start).
            a = snapAt(c.to!);
            b = snapAt(c.from!);
          }
          for (let k = 0; k < L; k++) {
            const sum = b ? a.s[k]! - b.s[k]! : a.s[k]!;
            const nz = b ? a.n[k]! - b.n[k]! : a.n[k]!;
            tally(st[ci]!, lines[k]!, colRoles[lines[k]!] === 'sector' ? 0 : 1, v[pos[k]!]!, sum, nz, tolOf);
          }
        });
        out.push(best(block.rows[t]!, 'row', rowRoles[t] as 'total' | 'output', cands[q]!, st));
      });
    }
  }
  return out;
}

const statsOf = new WeakMap<TotalCheck, { stat: Stat; partsOf: string }>();

function decimalsOf(x: number): number {
  const ax = Math.abs(x);
  let d = 0;
  while (d < 9 && Math.abs(ax * 10 ** d - Math.round(ax * 10 ** d)) > 1e-7 * Math.max(1, ax * 10 ** d)) d++;
  return d;
}

function tally(st: Stat, line: number, lineBlock: number, found: number, sum: number, nz: number, tolOf: (f: number, s: number, n: number) => number): void {
  if (found !== found) {
    if (Math.abs(sum) > tolOf(0, sum, nz)) {
      st.missingBy[lineBlock]++;
      if (st.firstMissingBy[lineBlock]! < 0) st.firstMissingBy[lineBlock] = line;
    }
    return;
  }
  st.present[lineBlock]++;
  st.checked++;
  const gap = Math.abs(found - sum);
  // The parts' rounding, and the total's own (a total may be rounded to fewer decimals than its parts).
  if (gap <= tolOf(found, sum, nz) || gap <= tolOf(found, sum, nz) + 0.5 * 10 ** -decimalsOf(found)) st.matched++;
  else if (st.mismatches.length < 50) st.mismatches.push(line);
  if (gap > st.worstGap) {
    st.worstGap = gap;
    st.worstLine = line;
    st.worstFound = found;
    st.worstSum = sum;
  }
}

/** Missing totals count only in blocks of lines where the total has some values (a total of the sector rows is empty under final demand by design). */
function settleMissing(st: Stat): void {
  st.missing = 0;
  st.firstMissing = -1;
  for (let b = 0; b < 3; b++) {
    if (!st.present[b]) continue;
    st.missing += st.missingBy[b]!;
    if (st.firstMissing < 0 && st.firstMissingBy[b]! >= 0) st.firstMissing = st.firstMissingBy[b]!;
  }
}

function candidatesFor(t: number, q: number, tIdx: number[], before: number[], nParts: number, entries: Entry[], axis: 'row' | 'column', kind: TableKind): Candidate[] {
  const plain = kind === 'matrix' || kind === 'make';
  const cands: Candidate[] = [];
  const sectorName = axis === 'column' ? 'the sector columns' : 'the sector rows';
  cands.push({ name: sectorName, block: 'sector' });
  if (!plain) {
    cands.push({ name: axis === 'column' ? 'the final-demand columns' : 'the value-added rows', block: 'other' });
    if (axis === 'row') {
      cands.push({ name: 'the imports rows', block: 'imports' });
      cands.push({ name: 'the value-added and imports rows', block: 'primary' });
    }
    cands.push({ name: ALL_NAME[axis], block: 'all' });
  }
  // Runs between totals, in parts order (columns) or between snapshots (rows).
  const start = q > 0 ? before[tIdx[q - 1]!]! : 0;
  const here = before[t]!;
  const end = q + 1 < tIdx.length ? before[tIdx[q + 1]!]! : nParts;
  const codeRange = (from: number, to: number): string => {
    // Names of the first and last part in the range.
    const names: string[] = [];
    let k = 0;
    for (let i = 0; i < entries.length && names.length < 2; i++) {
      if (before[i] === undefined) continue;
      const isPart = i + 1 < entries.length ? before[i + 1]! > before[i]! : nParts > before[i]!;
      if (!isPart) continue;
      if (k === from) names.push(entries[i]!.code);
      if (k === to - 1) names.push(entries[i]!.code);
      k++;
    }
    return names.length === 2 && names[0] !== names[1] ? `${names[0]}..${names[1]}` : names[0] ?? '';
  };
  if (axis === 'column') {
    if (here > start) cands.push({ name: codeRange(start, here), from: start, to: here });
    if (end > here) cands.push({ name: codeRange(here, end), from: here, to: end });
    if (here > 0 && start > 0) cands.push({ name: `everything before ${entries[t]!.code}`, from: 0, to: here });
  } else {
    // Rows: snapshot q is taken at total q; ranges are differences of snapshots.
    if (here > start) cands.push({ name: codeRange(start, here), from: q - 1, to: q });
    if (end > here) cands.push({ name: codeRange(here, end), from: q, to: q + 1 });
    if (here > 0 && start > 0) cands.push({ name: `everything before ${entries[t]!.code}`, from: -1, to: q });
  }
  return cands;
}

function best(e: Entry, axis: 'row' | 'column', role: 'total' | 'output', cands: Candidate[], stats: Stat[]): TotalCheck {
  for (const s of stats) settleMissing(s);
  let bi = -1;
  let bs = -1;
  stats.forEach((s, i) => {
    const score = s.checked ? s.matched / s.checked : 0;
    if (score > bs + 1e-12) {
      bs = score;
      bi = i;
    }
  });
  const s = stats[bi]!;
  const recognised = s.checked > 0 && s.matched / s.checked >= 0.5;
  const t: TotalCheck = { axis, code: e.code, label: e.label, role, sumOf: recognised ? cands[bi]!.name : '', checked: s.checked, matched: recognised ? s.matched : 0 };
  if (s.worstLine >= 0 && recognised && s.worstGap > 0) t.worst = { line: String(s.worstLine), found: s.worstFound, sum: s.worstSum };
  statsOf.set(t, { stat: s, partsOf: recognised ? cands[bi]!.name : '' });
  return t;
}

function reportTotals(block: Block, totals: TotalCheck[], rowRoles: RowRole[], colRoles: ColumnRole[], findings: Finding[]): void {
  for (const t of totals) {
    const info = statsOf.get(t)!;
    const s = info.stat;
    const isCol = t.axis === 'column';
    const idx = (isCol ? block.cols : block.rows).findIndex((e) => e.code === t.code);
    const role = isCol ? colRoles[idx] : rowRoles[idx];
    if (role !== 'total' && role !== 'output') continue;
    const what = `${t.axis} ${t.code}${t.label !== t.code ? ` ('${t.label}')` : ''}`;
    const whereOf = (line: number): Where => (isCol ? block.where(line, idx) : block.where(idx, line));
    if (t.worst) {
      const w = whereOf(Number(t.worst.line));
      t.worst.line = isCol ? block.rows[Number(t.worst.line)]!.code : block.cols[Number(t.worst.line)]!.code;
      if (w.cell) t.worst.cell = w.cell;
    }
    if (!t.sumOf) {
      findings.push({
        code: 'total-unexplained',
        severity: 'warning',
        message: `${what} of file ${block.file} is read as a ${t.role === 'output' ? 'total output line' : 'total'}, but it is not the sum of the sector block, the ${isCol ? 'final-demand' : 'value-added'} block, everything, or the ${isCol ? 'columns' : 'rows'} next to it${s.checked === 0 ? ' (it is empty)' : ''}; it was not read as data${t.role === 'output' ? '' : '. If it holds data, set its role in the mapping'}`,
        where: (isCol ? block.cols[idx] : block.rows[idx])!.where ?? { file: block.file },
        data: { checked: s.checked },
      });
      continue;
    }
    const bad = t.checked - t.matched;
    if (bad > 0) {
      const w = whereOf(s.mismatches[0] ?? s.worstLine);
      const ww = whereOf(s.worstLine);
      findings.push({
        code: 'total-mismatch',
        severity: 'warning',
        message: `${what} of file ${block.file} is the sum of ${t.sumOf} in ${t.matched} of ${t.checked} ${isCol ? 'rows' : 'columns'}; in ${bad} it differs by more than rounding, the most at cell ${ww.cell ?? describeCode(ww)}: ${fmt(s.worstFound)} found, ${fmt(s.worstSum)} summed (first at ${w.cell ?? describeCode(w)})`,
        where: ww,
        data: { mismatches: bad, found: s.worstFound, sum: s.worstSum },
      });
    }
    if (s.missing > 0) {
      const w = whereOf(s.firstMissing);
      findings.push({
        code: 'total-missing',
        severity: 'warning',
        message: `${what} of file ${block.file} is empty in ${s.missing} ${isCol ? 'row' : 'column'}${s.missing > 1 ? 's' : ''} that have data, first at cell ${w.cell ?? describeCode(w)}`,
        where: w,
        data: { missing: s.missing },
      });
    }
  }
}

function describeCode(w: Where): string {
  return `(row '${w.rowLabel ?? ''}', column '${w.columnLabel ?? ''}')`;
}

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toPrecision(10).replace(/\.?0+$/, '');
}

/**
 * How empty cells in a block are read: as the options or the mapping say; otherwise as zero in a
 * spreadsheet (agencies leave zero cells of their workbooks empty) and as an error in a text file.
 */
export function blankMode(block: Block, options: AssembleOptions): 'error' | 'zero' {
  return options.blanks ?? options.mapping?.blanks ?? (block.sheet !== undefined ? 'zero' : 'error');
}

/** A note when empty spreadsheet cells are read as zero by default, so that the choice is visible. */
export function blankNote(block: Block, options: AssembleOptions): Finding | undefined {
  if (options.blanks ?? options.mapping?.blanks) return undefined;
  if (block.sheet === undefined) return undefined;
  return {
    code: 'blanks-as-zero',
    severity: 'note',
    message: `file ${block.file}, sheet '${block.sheet}': empty cells inside the table are read as zero, the usual convention of agency spreadsheets; read with blanks: 'error' (the command line: --blanks error) to refuse them`,
    where: { file: block.file, sheet: block.sheet },
  };
}

/** x = (I − A)⁻¹ Σ F for coefficients A (row-major n × n) and final demand F (n × k); undefined when that fails or gives x ≤ 0. */
function outputFromDemand(A: Float64Array, F: Float64Array, n: number, k: number): Float64Array | undefined {
  const f = new Float64Array(n);
  for (let i = 0; i < n; i++) for (let j = 0; j < k; j++) f[i] += F[i * k + j]!;
  try {
    const x = new LeontiefModel({ rows: n, cols: n, data: A.slice() }).solve(f);
    for (let i = 0; i < n; i++) if (!(x[i]! > 0)) return undefined;
    return x;
  } catch {
    return undefined;
  }
}

/** Read cells of a block into a row-major matrix; empty and text cells follow the options, else an error naming the first and counting all. */
export function readCells(block: Block, rows: number[], cols: number[], what: string, options: AssembleOptions): Float64Array {
  const nr = rows.length;
  const nc = cols.length;
  // A long file's dense block read whole, in order: no copy.
  if (block instanceof DenseBlock && nr === block.rows.length && nc === block.cols.length && rows.every((i, a) => i === a && block.rows[i]!.pos === a) && cols.every((j, b) => j === b && block.cols[j]!.pos === b)) {
    return block.data;
  }
  const out = new Float64Array(nr * nc);
  const zeroBlank = blankMode(block, options) === 'zero';
  const zeroTexts = new Set((options.zeroTexts ?? options.mapping?.zeroTexts ?? []).map((t) => t.trim()));
  const pos = cols.map((j) => block.cols[j]!.pos);
  // Columns side by side in the source: copy each row at once, then look for holes.
  const run = nc > 0 && pos.every((p, b) => p === pos[0]! + b) ? pos[0]! : -1;
  let blank = 0;
  let firstBlank: [number, number] | undefined;
  let text = 0;
  let firstText: [number, number] | undefined;
  for (let a = 0; a < nr; a++) {
    const i = rows[a]!;
    const v = block.values(i);
    const o = a * nc;
    if (run >= 0) {
      out.set(v.subarray(run, run + nc), o);
      let holes = false;
      for (let b = o; b < o + nc; b++) {
        const x = out[b]!;
        if (x !== x) {
          holes = true;
          break;
        }
      }
      if (!holes) continue;
    }
    for (let b = 0; b < nc; b++) {
      const x = v[pos[b]!]!;
      if (x === x) {
        out[o + b] = x;
        continue;
      }
      const k = block.kind(i, cols[b]!);
      if (k !== TEXT) {
        if (zeroBlank) out[o + b] = 0;
        else {
          blank++;
          firstBlank ??= [i, cols[b]!];
        }
      } else {
        const t = block.text(i, cols[b]!).trim();
        if (zeroTexts.has(t)) out[o + b] = 0;
        else {
          text++;
          firstText ??= [i, cols[b]!];
        }
      }
    }
  }
  if (firstText) {
    const w = block.where(firstText[0], firstText[1]);
    const hint = numberHint(w.text ?? '', undefined);
    throw new InputError(
      'not-a-number',
      `${locate(w)}: text '${w.text ?? ''}' where a number belongs in the ${what}${text > 1 ? ` (${text} cells like it)` : ''}`,
      w,
      hint ?? 'Give a number; if such a text means zero here, pass it in zeroTexts',
    );
  }
  if (firstBlank) {
    const w = block.where(firstBlank[0], firstBlank[1]);
    throw new InputError(
      'blank-cell',
      `${locate(w)} is empty, in the ${what}${blank > 1 ? ` (${blank} empty cells)` : ''}`,
      w,
      `If empty cells mean zero in this file, read it with blanks: 'zero'`,
    );
  }
  return out;
}

/** `file f, sheet 's', cell C4 (row '...', column '...')`. */
export function locate(w: Where): string {
  const parts: string[] = [];
  if (w.file) parts.push(`file ${w.file}`);
  if (w.sheet) parts.push(`sheet '${w.sheet}'`);
  let s = parts.join(', ');
  const labels: string[] = [];
  if (w.rowLabel) labels.push(`row '${w.rowLabel}'`);
  if (w.columnLabel) labels.push(`column '${w.columnLabel}'`);
  if (w.cell) s += `${s ? ', ' : ''}cell ${w.cell}`;
  if (labels.length) s += ` (${labels.join(', ')})`;
  return s;
}

/** Entries of one role, in order, with duplicates reported by cell. */
function pick(entries: Entry[], roles: string[], role: string, what: string, file: string): number[] {
  const out: number[] = [];
  const seen = new Map<string, number>();
  roles.forEach((r, i) => {
    if (r !== role) return;
    const e = entries[i]!;
    const prev = seen.get(e.code);
    if (prev !== undefined) {
      const p = entries[prev]!;
      throw new InputError(
        'duplicate-code',
        `file ${file}: ${what} code '${e.code}' appears twice, ${describeEntry(p)} and ${describeEntry(e)}`,
        { ...(e.where ?? { file }), sector: e.code },
        'Each code must be unique; merge the two or give one a new code',
      );
    }
    seen.set(e.code, i);
    out.push(i);
  });
  return out;
}

function describeEntry(e: Entry): string {
  return e.where?.cell ? `in cell ${e.where.cell}` : `at position ${e.at}`;
}

function axisOf(entries: Entry[], idx: number[]): Axis {
  return { codes: idx.map((i) => entries[i]!.code), labels: idx.map((i) => entries[i]!.label) };
}

/** The mapping as reported. */
/** A line's why with the reason a rule gave its code (affix-codes), unless that is the why already. */
function withRuleWhy(why: string, e: Entry): string {
  return e.why && !why.includes(e.why) ? `${why}; ${e.why}` : why;
}

export function mappingOf(block: Block, c: Classified, kind: TableKind, options: AssembleOptions, extra: Partial<LayoutMapping>): LayoutMapping {
  const rows: MappedRow[] = block.rows.map((e, i) => {
    const m: MappedRow = { code: e.code, label: e.label, role: c.rowRoles[i]!, row: e.at, why: withRuleWhy(c.rowWhy[i]!, e) };
    const u = c.units[i];
    if (u !== undefined && (c.rowRoles[i] === 'satellite' || e.unit)) m.unit = u;
    return m;
  });
  const columns: MappedColumn[] = block.cols.map((e, j) => ({ code: e.code, label: e.label, role: c.colRoles[j]!, column: e.at, why: withRuleWhy(c.colWhy[j]!, e) }));
  const m: LayoutMapping = {
    format: 'ripplewise-layout',
    version: 1,
    kind,
    shape: block.shape,
    file: block.file,
    rows,
    columns,
    output: { from: 'none' },
    blanks: blankMode(block, options),
    totals: c.totals,
    ...extra,
  };
  if (block.sheet !== undefined) m.sheet = block.sheet;
  const zt = options.zeroTexts ?? options.mapping?.zeroTexts;
  if (zt?.length) m.zeroTexts = [...zt];
  const pats = options.patterns ?? options.mapping?.patterns;
  if (pats) m.patterns = pats;
  return m;
}

export interface AssembledTable {
  table: Table;
  mapping: LayoutMapping;
  findings: Finding[];
}

/**
 * A symmetric table (flows, or coefficients with or without outputs) from a block. Sector rows
 * and columns must carry the same codes (in any order; columns follow the rows).
 */
export function assembleTable(block: Block, options: AssembleOptions, meta: TableMeta, extra: Partial<LayoutMapping>): AssembledTable {
  const kind = options.kind;
  const c = classify(block, options);
  const findings = [...c.findings];
  const file = block.file;
  mismatchedSector(block, c);
  const sr = pick(block.rows, c.rowRoles, 'sector', 'sector row', file);
  const scRaw = pick(block.cols, c.colRoles, 'sector', 'sector column', file);
  const fd = pick(block.cols, c.colRoles, 'final-demand', 'final-demand', file);
  const va = pick(block.rows, c.rowRoles, 'value-added', 'value-added', file);
  const imp = pick(block.rows, c.rowRoles, 'imports', 'imports', file);
  const sat = pick(block.rows, c.rowRoles, 'satellite', 'satellite', file);
  if (!sr.length) throw new InputError('no-sectors', `file ${file}: no sector rows were found`, { file }, 'Check the layout the reader reports, or set the roles of rows in the mapping');

  // Match columns to rows by code.
  const colByCode = new Map(scRaw.map((j) => [block.cols[j]!.code, j]));
  const rowCodes = new Set(sr.map((i) => block.rows[i]!.code));
  for (const i of sr) {
    const e = block.rows[i]!;
    if (!colByCode.has(e.code)) {
      throw new InputError(
        'row-without-column',
        `file ${file}: sector row '${e.code}'${e.label !== e.code ? ` ('${e.label}')` : ''} ${describeEntry(e)} has no column with the same code; a symmetric table needs each sector as a row and as a column`,
        { ...(e.where ?? { file }), sector: e.code },
        kind === 'flows' || kind === 'coefficients' ? 'If this is a use table (commodities by industries), read it with the make table as supply-use tables; otherwise add the column, or set the row\'s role in the mapping' : undefined,
      );
    }
  }
  for (const j of scRaw) {
    const e = block.cols[j]!;
    if (!rowCodes.has(e.code)) {
      throw new InputError(
        'column-without-row',
        `file ${file}: sector column '${e.code}'${e.label !== e.code ? ` ('${e.label}')` : ''} ${describeEntry(e)} has no row with the same code; a symmetric table needs each sector as a row and as a column`,
        { ...(e.where ?? { file }), sector: e.code },
        'Add the row, or set the column\'s role in the mapping (final-demand, total, ignore)',
      );
    }
  }
  const sc = sr.map((i) => colByCode.get(block.rows[i]!.code)!);
  const bn = blankNote(block, options);
  if (bn) findings.push(bn);
  if (sc.some((j, k) => k > 0 && j < sc[k - 1]!)) {
    findings.push({ code: 'columns-reordered', severity: 'note', message: `file ${file}: the sector columns are in a different order from the rows; they were put in the order of the rows`, where: { file } });
  }
  const n = sr.length;
  const sectors = axisOf(block.rows, sr);
  let Zd = readCells(block, sr, sc, 'intermediate block', options);
  if (kind === 'coefficients' && block instanceof DenseBlock && Zd === block.data) Zd = Zd.slice();
  const Fd = readCells(block, sr, fd, 'final-demand block', options);
  const Vd = readCells(block, va, sc, 'value-added block', options);

  // Output.
  const outCols = c.colRoles.map((r, j) => (r === 'output' ? j : -1)).filter((j) => j >= 0);
  const outRows = c.rowRoles.map((r, i) => (r === 'output' ? i : -1)).filter((i) => i >= 0);
  const want = options.mapping?.output;
  let x: Float64Array;
  let from: LayoutMapping['output'];
  const colOutput = (j: number) => {
    const e = block.cols[j]!;
    x = readOutput(block, sr, j, 'column', Zd, n);
    from = { from: 'column', code: e.code };
  };
  const rowOutput = (i: number) => {
    const e = block.rows[i]!;
    x = readOutput(block, sc, i, 'row', Zd, n);
    from = { from: 'row', code: e.code };
  };
  if (want?.from === 'assumed') {
    x = new Float64Array(n).fill(1);
    from = { from: 'assumed' };
  } else if (want?.from === 'column' || want?.from === 'row') {
    const list = want.from === 'column' ? outCols : outRows;
    const entries = want.from === 'column' ? block.cols : block.rows;
    const hit = want.code ? (want.from === 'column' ? block.cols : block.rows).findIndex((e) => e.code === want.code) : list[0];
    if (hit === undefined || hit < 0) {
      throw new InputError('missing-total', `file ${file}: the mapping takes total output from a ${want.from}${want.code ? ` coded '${want.code}'` : ''}, but there is no such ${want.from}`, { file }, `Known ${want.from} codes: ${entries.slice(0, 10).map((e) => e.code).join(', ')}`);
    }
    if (want.from === 'column') colOutput(hit);
    else rowOutput(hit);
  } else if (want?.from === 'row-sums') {
    x = rowSums(Zd, Fd, n, fd.length, block.decimals);
    from = { from: 'row-sums' };
  } else if (outCols.length && outRows.length && promotedOutput(c.colWhy[outCols[outCols.length - 1]!]!) && !promotedOutput(c.rowWhy[outRows[outRows.length - 1]!]!)) {
    // An output row named so (TOut, 'Total output at basic prices') before a column that is output
    // only as the sum of everything ('Total use for industry output'): the agency's own output.
    rowOutput(outRows[outRows.length - 1]!);
    findings.push({ code: 'output-row-chosen', severity: 'note', message: `file ${file}: total output is read from row ${block.rows[outRows[outRows.length - 1]!]!.code}, named output, not from column ${block.cols[outCols[outCols.length - 1]!]!.code}, which is output only as the sum of the columns`, where: { file } });
  } else if (outCols.length) colOutput(outCols[outCols.length - 1]!);
  else if (outRows.length) rowOutput(outRows[outRows.length - 1]!);
  else if (kind === 'coefficients' && fd.length) {
    // Coefficients with final demand in levels: output is what that demand requires, x = (I − A)⁻¹ f.
    const solved = outputFromDemand(Zd, Fd, n, fd.length);
    if (solved) {
      x = solved;
      from = { from: 'final-demand' };
    } else {
      x = new Float64Array(n).fill(1);
      from = { from: 'assumed' };
      findings.push({ code: 'output-not-derived', severity: 'warning', message: `file ${file}: total output could not be derived from the final demand (I − A is singular or gives a non-positive output), so every sector's output is taken as 1 and the final-demand columns are not consistent with it`, where: { file } });
    }
  } else if (kind === 'coefficients') {
    x = new Float64Array(n).fill(1);
    from = { from: 'assumed' };
  } else {
    x = rowSums(Zd, Fd, n, fd.length, block.decimals);
    from = { from: 'row-sums' };
    findings.push({ code: 'output-from-row-sums', severity: 'note', message: `file ${file} has no total output column or row; total output is taken as the row sums (intermediate use plus final demand)`, where: { file } });
  }
  x = x!;
  from = from!;

  const tmeta: TableMeta = { ...meta, ...(options.mapping?.meta ?? {}) };
  let Z: Matrix = { rows: n, cols: n, data: Zd };
  let V: Matrix = { rows: va.length, cols: n, data: Vd };
  let importsData: Float64Array | undefined;
  if (imp.length) {
    const I = readCells(block, imp, sc, 'imports row', options);
    importsData = new Float64Array(n);
    for (let a = 0; a < imp.length; a++) for (let j = 0; j < n; j++) importsData[j] += I[a * n + j]!;
    if (imp.length > 1) {
      findings.push({ code: 'imports-summed', severity: 'note', message: `file ${file}: ${imp.length} imports rows (${imp.map((i) => `'${block.rows[i]!.code}'`).join(', ')}) were added into one imports row`, where: { file } });
    }
  }
  const satellites: Satellite[] = sat.map((i) => {
    const e = block.rows[i]!;
    const unit = c.units[i];
    if (!unit) {
      throw new InputError(
        'no-unit',
        `file ${file}: satellite row '${e.code}'${e.label !== e.code ? ` ('${e.label}')` : ''} ${describeEntry(e)} has no unit`,
        { ...(e.where ?? { file }), rowLabel: e.label },
        "Add a unit column (headed 'unit'), or write the unit in brackets at the end of the label, such as 'Employment (jobs)', or give it in the mapping",
      );
    }
    return { code: e.code, label: e.label, unit, values: readCells(block, [i], sc, `satellite row '${e.code}'`, options) };
  });

  if (kind === 'coefficients') {
    if (from.from === 'assumed') tmeta.outputAssumed = true;
    else {
      // Z = A x̂, V = Vc x̂; satellites given per unit of output likewise.
      scaleColumns(Zd, n, n, x);
      scaleColumns(Vd, va.length, n, x);
      if (importsData) for (let j = 0; j < n; j++) importsData[j] *= x[j]!;
      for (const s of satellites) for (let j = 0; j < n; j++) s.values[j] *= x[j]!;
      const whence = from.from === 'final-demand' ? 'derived from the final-demand columns as x = (I − A)⁻¹ f' : `from the ${from.from}${from.code ? ` '${from.code}'` : ''}`;
      findings.push({ code: 'coefficients-scaled', severity: 'note', message: `file ${file}: coefficients were multiplied by total output (${whence}) to give flows`, where: { file } });
    }
    Z = { rows: n, cols: n, data: Zd };
    V = { rows: va.length, cols: n, data: Vd };
  }

  const fdAxis = axisOf(block.cols, fd);
  const vaAxis = axisOf(block.rows, va);
  setClasses(block, c, fd, va, fdAxis, vaAxis);
  const table: Table = {
    sectors,
    Z,
    finalDemand: fdAxis,
    F: { rows: n, cols: fd.length, data: Fd },
    valueAdded: vaAxis,
    V,
    x,
    satellites,
    meta: tmeta,
  };
  if (importsData) table.imports = importsData;
  validateTable(table);
  const mapping = mappingOf(block, c, kind, options, { ...extra, output: from, meta: tmeta });
  return { table, mapping, findings };
}

/** Whether a line is output only because it is the sum of everything (not by its name). */
function promotedOutput(why: string): boolean {
  return /so it is read as total output$/.test(why);
}

/**
 * Classes of the final-demand columns and primary-input rows (src/io/rules/classes.ts), with the
 * rule and reason added to each line's why. Imports, product taxes and sales by final buyers kept
 * on the primary-input axis are then not value added (engine isValueAddedRow).
 */
function setClasses(block: Block, c: Classified, fd: number[], va: number[], fdAxis: ClassedAxis<DemandClass>, vaAxis: ClassedAxis<InputClass>): void {
  const dc = fd.map((j) => {
    const e = block.cols[j]!;
    const f = demandClassOf(e.code, e.label, e.group);
    if (f) c.colWhy[j] = `${c.colWhy[j]}; ${f.why}`;
    return f?.cls;
  });
  // The demand classes are set on the table only where they settle what the words alone would not:
  // a column whose label says households but whose class is another ('Non-resident households' is
  // exports, 'NPISHs serving households'), so that the one household column is still found for
  // Type II (engine onlyClassed). Otherwise they stay in the mapping's why: the table writers do not
  // write them, and a written table must read back identical.
  if (dc.some((x, k) => x !== undefined && x !== 'households' && HOUSEHOLD_WORD.test(block.cols[fd[k]!]!.label))) fdAxis.classes = dc;
  const vc = va.map((i) => {
    const e = block.rows[i]!;
    const f = inputClassOf(e.code, e.label);
    if (f) c.rowWhy[i] = `${c.rowWhy[i]}; ${f.why}`;
    return f?.cls;
  });
  // Only when some row is then not value added: otherwise every row counts, as without classes.
  if (vc.some((x) => x !== undefined && !VALUE_ADDED_CLASSES.includes(x))) vaAxis.classes = vc;
}

/** A label that names households (the households class rule's word). */
const HOUSEHOLD_WORD = /\bhouseholds?\b/i;

const BY_POSITION_ROW = 'its code names no column, after the sector rows';
const BY_POSITION_COL = 'its code names no row, after the sector columns';

/**
 * A row and a column placed by position alone (value added, final demand: their codes name no
 * column and no row) that carry the same label are one sector whose code differs between the row
 * and the column (a typo, or another classification's code): reading them as value added and
 * final demand would change the table without a word, so it is an error naming both cells.
 */
function mismatchedSector(block: Block, c: Classified): void {
  // Only lines where a sector could stand: among the sector lines or right after them, with no
  // other line between (a row and a column of 'Statistical discrepancy' at the ends of the
  // value-added and final-demand blocks are not a sector).
  const nearSectors = (roles: readonly string[], i: number): boolean => {
    for (let u = i + 1; u < roles.length; u++) if (roles[u] === 'sector') return true;
    for (let u = i - 1; u >= 0; u--) {
      if (roles[u] === 'sector') return true;
      if (roles[u] !== 'ignore') return false;
    }
    return false;
  };
  const cols = new Map<string, number>();
  block.cols.forEach((e, j) => {
    if (c.colWhy[j] === BY_POSITION_COL && e.label !== e.code && /\p{L}/u.test(e.label) && nearSectors(c.colRoles, j)) cols.set(e.label.toLowerCase(), j);
  });
  if (!cols.size) return;
  block.rows.forEach((e, i) => {
    if (c.rowWhy[i] !== BY_POSITION_ROW || e.label === e.code || !nearSectors(c.rowRoles, i)) return;
    const j = cols.get(e.label.toLowerCase());
    if (j === undefined) return;
    const col = block.cols[j]!;
    throw new InputError(
      'code-mismatch',
      `file ${block.file}: row '${e.code}' (${describeEntry(e)}) and column '${col.code}' (${describeEntry(col)}) are both labelled '${e.label}' but have different codes, so neither is read as a sector`,
      { ...(e.where ?? { file: block.file }), rowLabel: e.label, sector: e.code },
      `Give the row and the column the same code, or set their roles in the mapping (rows: { "${e.code}": "value-added" }, columns: { "${col.code}": "final-demand" }) if they are not a sector`,
    );
  });
}

function scaleColumns(d: Float64Array, rows: number, cols: number, x: Float64Array): void {
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) d[i * cols + j] *= x[j]!;
}

/**
 * Total output as the row sums of Z and F. Numbers of at most d decimals add up to a number of at
 * most d decimals, so when every part has at most 6 (the block's sample says how many to expect;
 * each value is checked), the sums are rounded to d decimals: 2164.6, not 2164.6000000000004.
 */
function rowSums(Z: Float64Array, F: Float64Array, n: number, k: number, decimals?: number): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = 0; j < n; j++) s += Z[i * n + j]!;
    for (let j = 0; j < k; j++) s += F[i * k + j]!;
    x[i] = s;
  }
  let d = Math.min(Math.max(decimals ?? 0, 0), 6);
  let p = 10 ** d;
  for (const a of [Z, F]) {
    for (let q = 0; q < a.length; q++) {
      const v = a[q]!;
      let t = v * p;
      while (Math.abs(t - Math.round(t)) > 1e-9 * Math.abs(t) + 1e-9) {
        if (++d > 6 || !Number.isFinite(v)) return x;
        p = 10 ** d;
        t = v * p;
      }
    }
  }
  for (let i = 0; i < n; i++) {
    const t = x[i]! * p;
    if (Math.abs(t) < 2 ** 52) x[i] = Math.round(t) / p;
  }
  return x;
}

/** Total output from a total column (over the sector rows) or row (over the sector columns); empty cells where a sector has flows are an error. */
function readOutput(block: Block, lines: number[], at: number, axis: 'row' | 'column', Z: Float64Array, n: number): Float64Array {
  const x = new Float64Array(lines.length);
  const e = axis === 'column' ? block.cols[at]! : block.rows[at]!;
  let firstMissing = -1;
  let missing = 0;
  let firstText = -1;
  for (let k = 0; k < lines.length; k++) {
    const i = axis === 'column' ? lines[k]! : at;
    const j = axis === 'column' ? at : lines[k]!;
    const v = block.values(i)[block.cols[j]!.pos]!;
    if (v === v) {
      x[k] = v;
      continue;
    }
    const kind = block.kind(i, j);
    if (kind === TEXT) {
      if (firstText < 0) firstText = k;
      continue;
    }
    let flows = 0;
    for (let t = 0; t < n; t++) flows += Math.abs(axis === 'column' ? Z[k * n + t]! : Z[t * n + k]!);
    if (flows > 0) {
      missing++;
      if (firstMissing < 0) firstMissing = k;
    }
    x[k] = 0;
  }
  const cellOf = (k: number) => (axis === 'column' ? block.where(lines[k]!, at) : block.where(at, lines[k]!));
  if (firstText >= 0) {
    const w = cellOf(firstText);
    throw new InputError('not-a-number', `${locate(w)}: text '${w.text ?? ''}' where total output belongs`, w, numberHint(w.text ?? '', undefined) ?? 'Give a number');
  }
  if (firstMissing >= 0) {
    const w = cellOf(firstMissing);
    throw new InputError(
      'missing-total',
      `${locate(w)}: total output (${axis} '${e.code}') is empty for a sector with flows${missing > 1 ? ` (${missing} sectors like it)` : ''}`,
      w,
      `Fill in total output, or take it from the row sums with mapping output: { from: 'row-sums' }`,
    );
  }
  return x;
}

export interface AssembledMatrix {
  rows: Axis;
  cols: Axis;
  matrix: Matrix;
  mapping: LayoutMapping;
  findings: Finding[];
}

/** A plain labelled matrix (requirements, coefficients by themselves): every row and column that is not a total or ignored. */
export function assembleMatrix(block: Block, options: AssembleOptions, extra: Partial<LayoutMapping>): AssembledMatrix {
  const o = { ...options, kind: 'matrix' as const };
  const c = classify(block, o);
  const r = pick(block.rows, c.rowRoles, 'sector', 'row', block.file);
  const k = pick(block.cols, c.colRoles, 'sector', 'column', block.file);
  const data = readCells(block, r, k, 'matrix', o);
  return {
    rows: axisOf(block.rows, r),
    cols: axisOf(block.cols, k),
    matrix: { rows: r.length, cols: k.length, data },
    mapping: mappingOf(block, c, 'matrix', o, extra),
    findings: c.findings,
  };
}

/** The parts of a make or use table, for the supply-use reader. */
export interface SupplyUsePart {
  kind: 'make' | 'use';
  block: Block;
  classified: Classified;
  sectorRows: number[];
  sectorCols: number[];
  finalDemand: number[];
  valueAdded: number[];
  outputRow?: number;
  outputCol?: number;
}

export function classifyPart(block: Block, options: AssembleOptions): SupplyUsePart {
  const c = classify(block, options);
  const file = block.file;
  const kind = options.kind as 'make' | 'use';
  const rowWhat = kind === 'make' ? 'industry' : 'commodity';
  const colWhat = kind === 'make' ? 'commodity' : 'industry';
  const part: SupplyUsePart = {
    kind,
    block,
    classified: c,
    sectorRows: pick(block.rows, c.rowRoles, 'sector', `${rowWhat} row`, file),
    sectorCols: pick(block.cols, c.colRoles, 'sector', `${colWhat} column`, file),
    finalDemand: pick(block.cols, c.colRoles, 'final-demand', 'final-demand', file),
    valueAdded: pick(block.rows, c.rowRoles, 'value-added', 'value-added', file),
  };
  const oc = c.colRoles.lastIndexOf('output');
  const or = c.rowRoles.lastIndexOf('output');
  if (oc >= 0) part.outputCol = oc;
  if (or >= 0) part.outputRow = or;
  return part;
}
