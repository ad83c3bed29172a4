/**
 * The table readers: a grid (a wide sheet) or a long file to the engine's table, to a labelled
 * matrix, or to the detected layout alone (for a user to confirm or edit before reading).
 */
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { Matrix } from '../../engine/linalg/matrix';
import type { Axis, Table } from '../../engine/table';
import { type AssembleOptions, assembleMatrix, assembleTable, classify, mappingOf } from './assemble';
import { type Block, DenseBlock, type Entry } from './block';
import { Grid } from './grid';
import { cutCodeAndLabel, detectStructure, type WideStructure } from './layout';
import { matchAffixes } from './rules/affix-codes';
import type { LongTable } from './long';
import type { LayoutMapping, MappingInput, TableKind } from './mapping';
import { compilePatterns, resolvePatterns } from './patterns';

/** What a table reader reads: a grid (a wide sheet, from CSV or XLSX) or a long file already read. */
export type TableSource = Grid | LongTable;

export interface ReadTableOptions {
  /** `flows` (default) or `coefficients` (technical coefficients A, with or without total output). */
  kind?: 'flows' | 'coefficients';
  /** A mapping (as reported by a reader, or a part of one) that overrides the detection. */
  mapping?: MappingInput;
  /** Empty cells in the blocks read: an error (default) or zero. */
  blanks?: 'error' | 'zero';
  /** Texts read as zero in the blocks, such as '-' or '..'. */
  zeroTexts?: string[];
  /** Code and label patterns (see patterns.ts); also accepted in the mapping. */
  patterns?: MappingInput['patterns'];
}

export interface TableRead {
  table: Table;
  /** How the file was read; pass it back as `mapping` to read it the same way. */
  mapping: LayoutMapping;
  findings: Finding[];
}

export interface MatrixRead {
  rows: Axis;
  cols: Axis;
  matrix: Matrix;
  title?: string;
  description?: string;
  notes?: string[];
  mapping: LayoutMapping;
  findings: Finding[];
}

export interface SourceBlock {
  block: Block;
  meta: Table['meta'];
  description?: string;
  extra: Partial<LayoutMapping>;
  findings: Finding[];
}

function structureFields(s: WideStructure): Partial<LayoutMapping> {
  const one = (x: number | null) => (x === null ? null : x + 1);
  return {
    shape: 'wide',
    codeColumn: one(s.codeColumn),
    labelColumn: one(s.labelColumn),
    unitColumn: one(s.unitColumn),
    codeRow: one(s.codeRow),
    labelRow: one(s.labelRow),
    titleRows: s.titleRows.map((r) => r + 1),
    headerRows: s.headerRows.map((r) => r + 1),
    noteRows: s.noteRows.map((r) => r + 1),
    ...(s.splitCodes ? { splitCodes: true } : {}),
  };
}

/** The block of a source, with what the layout detection found. */
export function sourceBlock(source: TableSource, mapping?: MappingInput): SourceBlock {
  if (source instanceof Grid) {
    const s = detectStructure(source, mapping);
    const extra = structureFields(s);
    if (source.conventions) extra.conventions = { ...source.conventions };
    const sb: SourceBlock = { block: s.block, meta: s.meta, extra, findings: s.findings };
    if (s.description !== undefined) sb.description = s.description;
    return sb;
  }
  if (!source || typeof source !== 'object' || !('block' in source)) {
    throw new InputError('bad-source', 'a table reader needs a grid (from readCsv or readXlsx) or a long file (from readLongCsv)');
  }
  const { conventions, ...fields } = source.mapping;
  return { block: source.block, meta: {}, extra: { ...fields, conventions: conventions ?? {} }, findings: [...source.findings] };
}

/**
 * A long file whose orientation only the order of its fields decided, read the other way round
 * when its codes say so: more codes that look like final demand among the rows and like value
 * added among the columns than the other way (codes naming both a row and a column are sectors
 * and do not count). The note says why; the mapping records the orientation used.
 */
function orient(sb: SourceBlock, source: TableSource, options: ReadTableOptions): SourceBlock {
  if (source instanceof Grid || source.orientation !== 'order') return sb;
  const P = compilePatterns(resolvePatterns(options.patterns ?? options.mapping?.patterns));
  const b = sb.block;
  const rowCodes = new Set(b.rows.map((e) => e.code));
  const colCodes = new Set(b.cols.map((e) => e.code));
  const is = (e: Entry, m: typeof P.finalDemand) => !!(m.code(e.code) || (e.label !== e.code && m.label(e.label)));
  const primary = (e: Entry) => is(e, P.valueAdded) || is(e, P.imports);
  const rowsOnly = b.rows.filter((e) => !colCodes.has(e.code));
  const colsOnly = b.cols.filter((e) => !rowCodes.has(e.code));
  const right = rowsOnly.filter(primary).length + colsOnly.filter((e) => is(e, P.finalDemand)).length;
  const fdRows = rowsOnly.filter((e) => is(e, P.finalDemand));
  const vaCols = colsOnly.filter(primary);
  const wrong = fdRows.length + vaCols.length;
  if (wrong <= right) return sb;
  const nr = b.rows.length;
  const nc = b.cols.length;
  const d = (b as DenseBlock).data;
  const t = new Float64Array(nr * nc);
  for (let i = 0; i < nr; i++) for (let j = 0; j < nc; j++) t[j * nr + i] = d[i * nc + j]!;
  const copy = (e: Entry): Entry => ({ ...e });
  const block = new DenseBlock(b.file, b.cols.map(copy), b.rows.map(copy), t, b.sheet);
  // The mapping names the code fields in the file's order and says whether they are swapped.
  const extra = { ...sb.extra, transposed: !sb.extra.transposed };
  const sample = (es: Entry[]) => es.slice(0, 3).map((e) => `'${e.code}'`).join(', ');
  const why = [fdRows.length ? `${fdRows.length} row code${fdRows.length > 1 ? 's' : ''} look like final demand (${sample(fdRows)})` : '', vaCols.length ? `${vaCols.length} column code${vaCols.length > 1 ? 's' : ''} look like value added (${sample(vaCols)})` : ''].filter(Boolean).join(' and ');
  const note: Finding = {
    code: 'long-transposed',
    severity: 'note',
    message: `file ${b.file}: the second field of codes is read as the rows and the first as the columns, because ${why}; set "transposed" in a mapping (the command line: --mapping FILE) to choose`,
    where: { file: b.file },
  };
  return { ...sb, block, extra, findings: [...sb.findings, note] };
}

/**
 * Rule affix-codes (rules/affix-codes.ts) on the block of a symmetric table, unless the mapping
 * turns it off (`affixCodes: false`): rows `DOM_01` and columns `D01` are one sector '01'; an
 * `IMP_` block of the same products is imports. Supply and use tables keep their codes.
 */
function affixes(sb: SourceBlock, options: ReadTableOptions): SourceBlock {
  if (options.mapping?.affixCodes === false) return sb;
  const b = ownEntries(sb.block);
  const r = matchAffixes(b, cutCodeAndLabel);
  if (!r) return sb;
  const extra = r.split && b.shape === 'wide' ? { ...sb.extra, splitCodes: true } : sb.extra;
  return { ...sb, block: b, extra, findings: [...sb.findings, r.finding] };
}

/** A block whose entries the rules may change: a long file's block (kept by its source) is copied; a sheet's is new each read. */
function ownEntries(b: Block): Block {
  return b instanceof DenseBlock ? new DenseBlock(b.file, b.rows.map((e) => ({ ...e })), b.cols.map((e) => ({ ...e })), b.data, b.sheet) : b;
}

/**
 * The mapping's `rename` ({ from: to }) applied to the block's rows and columns before the rules
 * read them; each renamed line says so in its why. A code that names no row and no column is a
 * `mapping-unknown-code` error naming the file and the code.
 */
function renamed(sb: SourceBlock, options: ReadTableOptions): SourceBlock {
  const rename = options.mapping?.rename;
  if (!rename || !Object.keys(rename).length) return sb;
  const b = ownEntries(sb.block);
  const known = new Set([...b.rows, ...b.cols].map((e) => e.code));
  for (const from of Object.keys(rename)) {
    if (!known.has(from)) {
      throw new InputError(
        'mapping-unknown-code',
        `file ${b.file}${b.sheet ? `, sheet '${b.sheet}'` : ''}: the mapping renames '${from}', but no row or column has that code`,
        { file: b.file, text: from },
        `Known codes start ${[...known].slice(0, 8).map((c) => `'${c}'`).join(', ')}; rename a code as the mapping reports it without rename`,
      );
    }
  }
  for (const e of [...b.rows, ...b.cols]) {
    const to = rename[e.code];
    if (to === undefined) continue;
    e.why = `code '${e.code}' renamed '${to}' by the mapping`;
    if (e.label === e.code) e.label = to;
    e.code = to;
  }
  return { ...sb, block: b, extra: { ...sb.extra, rename: { ...rename } } };
}

function optionsOf(kind: TableKind, options: ReadTableOptions): AssembleOptions {
  const o: AssembleOptions = { kind };
  if (options.mapping) o.mapping = options.mapping;
  const blanks = options.blanks ?? options.mapping?.blanks;
  if (blanks) o.blanks = blanks;
  const zt = options.zeroTexts ?? options.mapping?.zeroTexts;
  if (zt) o.zeroTexts = zt;
  const p = options.patterns ?? options.mapping?.patterns;
  if (p) o.patterns = p;
  return o;
}

function kindOf(options: ReadTableOptions): 'flows' | 'coefficients' {
  const k = options.kind ?? options.mapping?.kind ?? 'flows';
  if (k === 'make' || k === 'use') throw new InputError('bad-option', `a ${k} table is read with its partner by readSupplyUse, not as a symmetric table`);
  if (k === 'matrix') throw new InputError('bad-option', 'a plain matrix is read by readMatrix');
  if (k !== 'flows' && k !== 'coefficients') throw new InputError('bad-option', `kind must be 'flows' or 'coefficients'; got '${String(k)}'`);
  return k;
}

/**
 * Read a symmetric input-output table (intermediate flows with final demand, value added,
 * imports, total output and satellites; or technical coefficients with or without outputs).
 */
export function readTable(source: TableSource, options: ReadTableOptions = {}): TableRead {
  const kind = kindOf(options);
  const sb = affixes(renamed(orient(sourceBlock(source, options.mapping), source, options), options), options);
  const r = assembleTable(sb.block, optionsOf(kind, options), sb.meta, sb.extra);
  if (options.kind === undefined && options.mapping?.kind === undefined) {
    const why = looksLikeCoefficients(r);
    if (why) {
      const c = assembleTable(sb.block, optionsOf('coefficients', options), sb.meta, sb.extra);
      const note: Finding = {
        code: 'read-as-coefficients',
        severity: 'note',
        message: `file ${r.mapping.file}: read as technical coefficients (${why}); give the kind 'flows' (the command line: --table-kind flows) to read the numbers as flows`,
        where: { file: r.mapping.file },
      };
      return { table: c.table, mapping: c.mapping, findings: [...sb.findings, note, ...c.findings] };
    }
  }
  return { table: r.table, mapping: r.mapping, findings: [...sb.findings, ...r.findings] };
}

const COEFFICIENT_WORDS = /\b(coefficients?|direct requirements|input structure|per (unit|dollar|euro|pound|\$|€|£)( of output)?)\b/i;

/**
 * Whether a table read as flows is really a table of technical coefficients: it has no total
 * output row or column, every intermediate value lies in [0, 1), and either its title says so or
 * every column of intermediate and primary inputs sums to 1 (within 1%).
 */
function looksLikeCoefficients(r: TableRead): string | undefined {
  if (r.mapping.output?.from !== 'row-sums') return undefined;
  const t = r.table;
  const n = t.sectors.codes.length;
  const z = t.Z.data;
  for (let k = 0; k < z.length; k++) if (!(z[k]! >= 0 && z[k]! < 1)) return undefined;
  const words = [t.meta.title ?? '', ...(t.meta.notes ?? [])].join(' ');
  if (COEFFICIENT_WORDS.test(words)) return 'its title speaks of coefficients';
  if (t.V.rows === 0) {
    // Rule coefficients-by-content: no primary-input rows, every column of the intermediate block
    // sums below 1, and final demand (if any) is in levels (some value of 1 or more): flows in
    // such small units would have final demand as small.
    let fdMax = 0;
    for (const v of t.F.data) fdMax = Math.max(fdMax, Math.abs(v));
    if (t.F.cols > 0 && fdMax < 1) return undefined;
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += z[i * n + j]!;
      if (!(s < 1)) return undefined;
    }
    return 'every value of the intermediate block lies in [0, 1), every column sums below 1, and there is no total output or value added';
  }
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += z[i * n + j]!;
    for (let i = 0; i < t.V.rows; i++) s += t.V.data[i * n + j]!;
    if (t.imports) s += t.imports[j]!;
    if (Math.abs(s - 1) > 0.01) return undefined;
  }
  return 'every column of inputs sums to 1 and there is no total output';
}

/** Read a plain labelled matrix (such as total requirements): every row and column that is not a total or ignored. */
export function readMatrix(source: TableSource, options: Omit<ReadTableOptions, 'kind'> = {}): MatrixRead {
  const sb = sourceBlock(source, options.mapping);
  const r = assembleMatrix(sb.block, optionsOf('matrix', options), sb.extra);
  const out: MatrixRead = { rows: r.rows, cols: r.cols, matrix: r.matrix, mapping: r.mapping, findings: [...sb.findings, ...r.findings] };
  if (sb.meta.title !== undefined) out.title = sb.meta.title;
  if (sb.description !== undefined) out.description = sb.description;
  if (sb.meta.notes) out.notes = sb.meta.notes;
  return out;
}

/**
 * The layout a reader would use, without reading the cells (so it works even where a cell is
 * bad): for a user to confirm or edit, then pass back as `mapping`.
 */
export function detectLayout(source: TableSource, options: ReadTableOptions & { kind?: TableKind } = {}): { mapping: LayoutMapping; findings: Finding[] } {
  const kind = options.kind ?? options.mapping?.kind ?? 'flows';
  const sb = kind === 'flows' || kind === 'coefficients' ? affixes(renamed(orient(sourceBlock(source, options.mapping), source, options), options), options) : sourceBlock(source, options.mapping);
  const o = optionsOf(kind, options);
  const c = classify(sb.block, o);
  const mapping = mappingOf(sb.block, c, kind, o, { ...sb.extra, meta: { ...sb.meta, ...(options.mapping?.meta ?? {}) } });
  const outCol = c.colRoles.lastIndexOf('output');
  const outRow = c.rowRoles.lastIndexOf('output');
  if (outCol >= 0) mapping.output = { from: 'column', code: sb.block.cols[outCol]!.code };
  else if (outRow >= 0) mapping.output = { from: 'row', code: sb.block.rows[outRow]!.code };
  else mapping.output = { from: kind === 'coefficients' ? 'assumed' : 'row-sums' };
  return { mapping, findings: [...sb.findings, ...c.findings] };
}
