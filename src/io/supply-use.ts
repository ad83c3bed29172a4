/**
 * Supply-use (make and use) tables, as wide sheets or long files, to the aligned input of the
 * engine's `supplyUse`, with the final-demand and value-added blocks of the use table.
 *
 * The make table is industries × commodities (its transpose, commodities × industries, is
 * recognised from the codes and reported); the use table is commodities × industries with
 * final-demand columns, value-added rows and totals, which are checked and never read as data.
 * Industries are the make table's rows and must be the use table's industry columns; every
 * commodity the make table lists must be a row of the use table (long files, which leave out
 * zero cells, are allowed to miss rows or columns that would be zero). Commodities that only
 * the use table lists (noncomparable imports, for example) are kept: no industry makes them.
 */
import { proposeScrap } from './rules/scrap';
import { applyLabels } from './labels';
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { Matrix } from '../../engine/linalg/matrix';
import type { SupplyUseInput, Technology } from '../../engine/supply-use';
import type { Axis } from '../../engine/table';
import { type AssembleOptions, blankNote, classifyPart, mappingOf, readCells, type SupplyUsePart } from './assemble';
import type { LayoutMapping, MappingInput } from './mapping';
import { sourceBlock, type TableSource } from './tables';

export interface SupplyUseOptions {
  /** The code of the scrap (used and second-hand goods) commodity, passed to the engine; 'none' for no adjustment; default: proposed. */
  scrap?: string;
  /** Titles by code (readLabelList), for tables that carry codes only. */
  labels?: ReadonlyMap<string, string>;
  technology?: Technology;
  /** Mappings for each table (as reported, or parts of them). */
  makeMapping?: MappingInput;
  useMapping?: MappingInput;
  /** Empty cells in the blocks read: an error (default) or zero. Applies to both tables unless a mapping says otherwise. */
  blanks?: 'error' | 'zero';
  zeroTexts?: string[];
  patterns?: MappingInput['patterns'];
  /** The make table's orientation, when the codes do not show it. */
  makeOrientation?: 'industries-by-commodities' | 'commodities-by-industries';
}

export interface SupplyUseRead {
  /** Ready for the engine's `supplyUse`. */
  input: SupplyUseInput;
  /** Final demand by commodity: commodities × k. */
  finalDemand: { axis: Axis; F: Matrix };
  /** Value added by industry: m × industries. */
  valueAdded: { axis: Axis; V: Matrix };
  /** Industry output from the use table's total row, when it has one (the engine takes g from the make table). */
  industryOutput?: Float64Array;
  /** Commodity output from the use table's total column, when it has one. */
  commodityOutput?: Float64Array;
  mappings: { make: LayoutMapping; use: LayoutMapping };
  findings: Finding[];
}

function opts(kind: 'make' | 'use', mapping: MappingInput | undefined, o: SupplyUseOptions): AssembleOptions {
  const a: AssembleOptions = { kind };
  if (mapping) a.mapping = mapping;
  const blanks = mapping?.blanks ?? o.blanks;
  if (blanks) a.blanks = blanks;
  const zt = mapping?.zeroTexts ?? o.zeroTexts;
  if (zt) a.zeroTexts = zt;
  const p = mapping?.patterns ?? o.patterns;
  if (p) a.patterns = p;
  return a;
}

function codesOf(part: SupplyUsePart, axis: 'rows' | 'cols', idx: number[]): string[] {
  return idx.map((i) => part.block[axis][i]!.code);
}

function listCodes(codes: string[]): string {
  return codes.slice(0, 8).map((c) => `'${c}'`).join(', ') + (codes.length > 8 ? `, and ${codes.length - 8} more` : '');
}

/** Read make and use tables and align them on industry and commodity codes. */
export function readSupplyUse(makeSource: TableSource, useSource: TableSource, options: SupplyUseOptions = {}): SupplyUseRead {
  const mk = sourceBlock(makeSource, options.makeMapping);
  const us = sourceBlock(useSource, options.useMapping);
  const mo = opts('make', options.makeMapping, options);
  const uo = opts('use', options.useMapping, options);
  const make = classifyPart(mk.block, mo);
  const use = classifyPart(us.block, uo);
  const findings: Finding[] = [...mk.findings, ...make.classified.findings, ...us.findings, ...use.classified.findings];
  const mf = mk.block.file;
  const uf = us.block.file;

  const useInd = codesOf(use, 'cols', use.sectorCols);
  const useCom = codesOf(use, 'rows', use.sectorRows);
  const mkRows = codesOf(make, 'rows', make.sectorRows);
  const mkCols = codesOf(make, 'cols', make.sectorCols);
  if (!useInd.length) throw new InputError('no-sectors', `file ${uf}: the use table has no industry columns`, { file: uf }, 'Check the layout the reader reports, or set the roles of columns in the mapping');
  if (!useCom.length) throw new InputError('no-sectors', `file ${uf}: the use table has no commodity rows`, { file: uf }, 'Check the layout the reader reports, or set the roles of rows in the mapping');

  // Orientation of the make table.
  const indSet = new Set(useInd);
  const comSet = new Set(useCom);
  const overlap = (a: string[], s: Set<string>) => a.filter((x) => s.has(x)).length;
  const asIs = overlap(mkRows, indSet) + overlap(mkCols, comSet);
  const flipped = overlap(mkRows, comSet) + overlap(mkCols, indSet);
  const transposed = options.makeOrientation ? options.makeOrientation === 'commodities-by-industries' : flipped > asIs;
  if (transposed && !options.makeOrientation) {
    findings.push({ code: 'make-transposed', severity: 'note', message: `file ${mf}: the make table lists commodities down and industries across (its codes match the use table that way), so it was read transposed`, where: { file: mf } });
  }
  const mkInd = transposed ? mkCols : mkRows;
  const mkCom = transposed ? mkRows : mkCols;
  const useLong = us.block.shape === 'long';

  // Industries: the make table's, and the use table's industry columns.
  const mkIndSet = new Set(mkInd);
  let useOnlyInd = useInd.filter((c) => !mkIndSet.has(c));
  // Rule use-columns-as-final-demand (fixture: numeric final-use codes in a use table): columns of
  // the use table that are not industries of the make table (and not value added) are final
  // demand, with a note naming them; the make table says which industries there are.
  // Only when every industry of the make table has its column: otherwise a column coded otherwise
  // (I3 for I2) is more likely a typo, and the disagreement is an error.
  if (useOnlyInd.length && mkInd.length && useOnlyInd.length < useInd.length && mkInd.every((c) => indSet.has(c))) {
    const moved = new Set(useOnlyInd);
    const cols = use.sectorCols.filter((j) => moved.has(use.block.cols[j]!.code));
    for (const j of cols) {
      use.classified.colRoles[j] = 'final-demand';
      use.classified.colWhy[j] = `${use.classified.colWhy[j]}, but the make table has no such industry, so it is read as final demand`;
    }
    use.sectorCols = use.sectorCols.filter((j) => !moved.has(use.block.cols[j]!.code));
    use.finalDemand = [...use.finalDemand, ...cols].sort((a, b) => a - b);
    useInd.splice(0, useInd.length, ...codesOf(use, 'cols', use.sectorCols));
    indSet.clear();
    for (const c of useInd) indSet.add(c);
    findings.push({ code: 'use-columns-final-demand', severity: 'note', message: `file ${uf}: ${useOnlyInd.length} column${useOnlyInd.length > 1 ? 's' : ''} of the use table ${useOnlyInd.length > 1 ? 'are' : 'is'} not an industry of the make table (file ${mf}), so ${useOnlyInd.length > 1 ? 'they are' : 'it is'} read as final demand: ${listCodes(useOnlyInd)}; set ${useOnlyInd.length > 1 ? 'their roles' : 'its role'} in the use mapping if not`, where: { file: uf } });
    useOnlyInd = [];
  }
  const makeOnlyInd = mkInd.filter((c) => !indSet.has(c));
  if (useOnlyInd.length) {
    const j = use.sectorCols[useInd.indexOf(useOnlyInd[0]!)]!;
    throw new InputError(
      'codes-disagree',
      `the make and use tables disagree on industries: ${useOnlyInd.length} industr${useOnlyInd.length > 1 ? 'ies' : 'y'} of the use table (file ${uf}) ${useOnlyInd.length > 1 ? 'are' : 'is'} not in the make table (file ${mf}): ${listCodes(useOnlyInd)}`,
      { ...(use.block.cols[j]!.where ?? { file: uf }), sector: useOnlyInd[0]! },
      'Use the same industry codes in both tables, or set the role of a column that is not an industry in the use mapping',
    );
  }
  if (makeOnlyInd.length) {
    if (useLong) {
      findings.push({ code: 'industry-without-inputs', severity: 'note', message: `${makeOnlyInd.length} industr${makeOnlyInd.length > 1 ? 'ies' : 'y'} of the make table ha${makeOnlyInd.length > 1 ? 've' : 's'} no lines in the use table (file ${uf}), so no intermediate inputs: ${listCodes(makeOnlyInd)}`, where: { file: uf } });
    } else {
      const i = transposed ? make.sectorCols[mkInd.indexOf(makeOnlyInd[0]!)]! : make.sectorRows[mkInd.indexOf(makeOnlyInd[0]!)]!;
      const e = transposed ? make.block.cols[i]! : make.block.rows[i]!;
      throw new InputError(
        'codes-disagree',
        `the make and use tables disagree on industries: ${makeOnlyInd.length} industr${makeOnlyInd.length > 1 ? 'ies' : 'y'} of the make table (file ${mf}) ${makeOnlyInd.length > 1 ? 'have' : 'has'} no column in the use table (file ${uf}): ${listCodes(makeOnlyInd)}`,
        { ...(e.where ?? { file: mf }), sector: makeOnlyInd[0]! },
        'Use the same industry codes in both tables',
      );
    }
  }
  // Commodities: the use table's rows, then any the make table adds (long files only).
  const makeOnlyCom = mkCom.filter((c) => !comSet.has(c));
  if (makeOnlyCom.length && !useLong) {
    const j = transposed ? make.sectorRows[mkCom.indexOf(makeOnlyCom[0]!)]! : make.sectorCols[mkCom.indexOf(makeOnlyCom[0]!)]!;
    const e = transposed ? make.block.rows[j]! : make.block.cols[j]!;
    throw new InputError(
      'codes-disagree',
      `the make and use tables disagree on commodities: ${makeOnlyCom.length} commodit${makeOnlyCom.length > 1 ? 'ies' : 'y'} of the make table (file ${mf}) ${makeOnlyCom.length > 1 ? 'have' : 'has'} no row in the use table (file ${uf}): ${listCodes(makeOnlyCom)}`,
      { ...(e.where ?? { file: mf }), sector: makeOnlyCom[0]! },
      'Use the same commodity codes in both tables',
    );
  }
  if (makeOnlyCom.length) {
    findings.push({ code: 'commodity-not-used', severity: 'note', message: `${makeOnlyCom.length} commodit${makeOnlyCom.length > 1 ? 'ies' : 'y'} of the make table ha${makeOnlyCom.length > 1 ? 've' : 's'} no lines in the use table (file ${uf}): ${listCodes(makeOnlyCom)}`, where: { file: uf } });
  }

  // Labels: the use table's first, then the make table's; a label that only repeats the code gives way.
  const labelsFrom = (...lists: [SupplyUsePart, 'rows' | 'cols', number[]][]) => {
    const out = new Map<string, string>();
    for (const [part, axis, idx] of lists) {
      for (const i of idx) {
        const e = part.block[axis][i]!;
        const had = out.get(e.code);
        if (had === undefined || (had === e.code && e.label !== e.code)) out.set(e.code, e.label);
      }
    }
    return out;
  };
  const indLabels = labelsFrom([use, 'cols', use.sectorCols], transposed ? [make, 'cols', make.sectorCols] : [make, 'rows', make.sectorRows]);
  const comLabels = labelsFrom([use, 'rows', use.sectorRows], transposed ? [make, 'rows', make.sectorRows] : [make, 'cols', make.sectorCols]);
  const indCodes = [...mkInd];
  const comCodes = [...useCom, ...makeOnlyCom];
  const industries: Axis = { codes: indCodes, labels: indCodes.map((c) => pickLabel(c, indLabels)) };
  const commodities: Axis = { codes: comCodes, labels: comCodes.map((c) => pickLabel(c, comLabels)) };
  if (options.labels) {
    const n = applyLabels(industries, options.labels) + applyLabels(commodities, options.labels);
    findings.push({ code: 'labels-attached', severity: 'note', message: `${n} industry and commodity titles taken from the list of codes and titles`, where: {} });
  }
  const ni = indCodes.length;
  const nc = comCodes.length;
  const indIdx = new Map(indCodes.map((c, i) => [c, i]));
  const comIdx = new Map(comCodes.map((c, i) => [c, i]));

  // Empty spreadsheet cells read as zero by default: say so.
  for (const [part, o] of [[make, mo], [use, uo]] as const) {
    const note = blankNote(part.block, o);
    if (note) findings.push(note);
  }
  // Make: industries × commodities.
  const mkCells = readCells(make.block, make.sectorRows, make.sectorCols, 'make table', mo);
  const makeM = new Float64Array(ni * nc);
  const mr = make.sectorRows.length;
  const mc = make.sectorCols.length;
  for (let a = 0; a < mr; a++) {
    for (let b = 0; b < mc; b++) {
      const v = mkCells[a * mc + b]!;
      const i = indIdx.get(transposed ? mkCols[b]! : mkRows[a]!)!;
      const c = comIdx.get(transposed ? mkRows[a]! : mkCols[b]!)!;
      makeM[i * nc + c] = v;
    }
  }
  // Use: commodities × industries (intermediate only).
  const usCells = readCells(use.block, use.sectorRows, use.sectorCols, 'intermediate block of the use table', uo);
  const useM = new Float64Array(nc * ni);
  const ur = use.sectorRows.length;
  const uc = use.sectorCols.length;
  const colToInd = use.sectorCols.map((j) => indIdx.get(use.block.cols[j]!.code)!);
  for (let a = 0; a < ur; a++) {
    const c = comIdx.get(useCom[a]!)!;
    for (let b = 0; b < uc; b++) useM[c * ni + colToInd[b]!] = usCells[a * uc + b]!;
  }
  // Final demand: commodities × k; value added: m × industries.
  const k = use.finalDemand.length;
  const fdCells = readCells(use.block, use.sectorRows, use.finalDemand, 'final-demand block of the use table', uo);
  const F = new Float64Array(nc * k);
  for (let a = 0; a < ur; a++) {
    const c = comIdx.get(useCom[a]!)!;
    for (let b = 0; b < k; b++) F[c * k + b] = fdCells[a * k + b]!;
  }
  const m = use.valueAdded.length;
  const vaCells = readCells(use.block, use.valueAdded, use.sectorCols, 'value-added block of the use table', uo);
  const V = new Float64Array(m * ni);
  for (let a = 0; a < m; a++) for (let b = 0; b < uc; b++) V[a * ni + colToInd[b]!] = vaCells[a * uc + b]!;

  const input: SupplyUseInput = {
    industries,
    commodities,
    make: { rows: ni, cols: nc, data: makeM },
    use: { rows: nc, cols: ni, data: useM },
  };
  if (options.scrap !== undefined && options.scrap.toLowerCase() !== 'none') input.scrap = options.scrap;
  if (options.technology) input.technology = options.technology;
  if (options.scrap === undefined) {
    // No scrap given: propose it from its title or the make table's structure, and adopt it.
    const p = proposeScrap(commodities, makeM, ni);
    if (p) {
      input.scrap = p.code;
      findings.push({ code: 'scrap-commodity', severity: 'note', message: `commodity '${p.code}' is taken for scrap (rule scrap-proposal, by ${p.rule}: ${p.why}), and its output is taken out of the market shares; give scrap: 'none' (the command line: --scrap none) to leave it in, or another code`, where: { sector: p.code }, data: { scrap: p.code, rule: p.rule } });
    }
  } else if (options.scrap.toLowerCase() === 'none') {
    findings.push({ code: 'scrap-none', severity: 'note', message: 'no scrap adjustment, as asked (scrap: none)', where: {} });
  }

  // In supply and use tables rows and columns are different classifications, so no code names
  // both: the layout chosen by position is the usual case, and the codes of the two tables, which
  // agree, confirm it.
  for (let i = 0; i < findings.length; i++) {
    const f = findings[i]!;
    if (f.code === 'layout-by-position' && f.severity === 'warning') {
      findings[i] = { ...f, severity: 'note', message: `${f.message.replace(/; check the mapping$/, '')}, as usual in supply and use tables (products and industries are different classifications); the industry and commodity codes of the two tables agree` };
    }
  }

  const out: SupplyUseRead = {
    input,
    finalDemand: { axis: { codes: use.finalDemand.map((j) => use.block.cols[j]!.code), labels: use.finalDemand.map((j) => use.block.cols[j]!.label) }, F: { rows: nc, cols: k, data: F } },
    valueAdded: { axis: { codes: use.valueAdded.map((i) => use.block.rows[i]!.code), labels: use.valueAdded.map((i) => use.block.rows[i]!.label) }, V: { rows: m, cols: ni, data: V } },
    mappings: {
      make: mappingOf(make.block, make.classified, 'make', mo, { ...mk.extra, makeOrientation: transposed ? 'commodities-by-industries' : 'industries-by-commodities', meta: mk.meta }),
      use: mappingOf(use.block, use.classified, 'use', uo, { ...us.extra, meta: us.meta }),
    },
    findings,
  };

  // Industry output from the use table's output row, checked against the make table's row sums.
  if (use.outputRow !== undefined) {
    const row = readCells(use.block, [use.outputRow], use.sectorCols, 'total industry output row of the use table', { ...uo, blanks: 'zero' });
    const g = new Float64Array(ni);
    for (let b = 0; b < uc; b++) g[colToInd[b]!] = row[b]!;
    out.industryOutput = g;
    const unit = make.block.decimals === undefined ? 0 : 10 ** -make.block.decimals;
    let bad = 0;
    let worst = -1;
    let worstGap = 0;
    for (let i = 0; i < ni; i++) {
      let s = 0;
      let nz = 0;
      for (let c = 0; c < nc; c++) {
        const v = makeM[i * nc + c]!;
        s += v;
        if (v !== 0) nz++;
      }
      const gap = Math.abs(s - g[i]!);
      const uunit = use.block.decimals === undefined ? 0 : 10 ** -use.block.decimals;
      if (gap > 0.5 * unit * (nz + 1) + 0.5 * uunit + 1e-9 * Math.max(1, Math.abs(s))) {
        bad++;
        if (gap > worstGap) {
          worstGap = gap;
          worst = i;
        }
      }
    }
    if (bad) {
      const code = use.block.rows[use.outputRow]!.code;
      findings.push({
        code: 'industry-output-differs',
        severity: 'warning',
        message: `industry output in the use table (row ${code}) differs from the make table's row sums for ${bad} industr${bad > 1 ? 'ies' : 'y'}, most for '${indCodes[worst]}': ${g[worst]} in the use table, ${sumRow(makeM, worst, nc)} summed from the make table; the engine takes industry output from the make table`,
        where: { file: uf, sector: indCodes[worst]! },
      });
    }
  }
  if (use.outputCol !== undefined) {
    const col = readCells(use.block, use.sectorRows, [use.outputCol], 'total commodity output column of the use table', { ...uo, blanks: 'zero' });
    const q = new Float64Array(nc);
    for (let a = 0; a < ur; a++) q[comIdx.get(useCom[a]!)!] = col[a]!;
    out.commodityOutput = q;
  }
  return out;
}

function sumRow(m: Float64Array, i: number, n: number): number {
  let s = 0;
  for (let c = 0; c < n; c++) s += m[i * n + c]!;
  return Math.round(s * 1e6) / 1e6;
}

function pickLabel(code: string, labels: Map<string, string>): string {
  return labels.get(code) ?? code;
}
