/**
 * Regional tables and balancing in the workbench's worker: the same code as the command line's
 * `regionalise` and `balance` (src/cli/regional-values.ts and src/cli/balance-part.ts, both free
 * of Node), on the current table.
 *
 * - `regional-values`: a file of values by code (a code column, optionally labels, then columns
 *   of numbers under a header), read by src/io's `readGrid` and matched to the current table's
 *   sectors, or to the rows or columns of a part to balance.
 * - `regionalise`: the regional table by SLQ, CILQ, FLQ, AFLQ or SDP from values read or typed,
 *   the quotients per sector and the national and regional output multipliers side by side.
 * - `balance`: RAS or GRAS of the intermediate flows or the whole table to new row and column
 *   totals, cells optionally held fixed; iterations, the largest remaining deviation, the
 *   targets that cannot be met by row or column, and the rebalanced table.
 * - `regionalReportParts` gives the report's sections of both (the Report step sends the
 *   requests again; the result does not depend on anything the worker keeps).
 */
import { InputError, makeTable, toPlain } from '../../../engine/index';
import type { Finding, PlainTable, Table } from '../../../engine/index';
import type { BalanceMethod, BalanceResult, BasisKind, RegionalMethod, TwoRegionSplit } from '../../../engine/regional/index';
import { BASIS_KINDS, gras, ras, REGIONAL_CAUTIONS, REGIONAL_METHODS } from '../../../engine/regional/index';
import { readGrid } from '../../../src/io/index';
import { balancedTable, balancePart } from '../../../src/cli/balance-part';
import type { BalancePartName } from '../../../src/cli/balance-part';
import { regionalFromValues, twoRegionSplits, valuesFromGrid } from '../../../src/cli/regional-values';
import type { RegionalEstimate } from '../../../src/cli/regional-values';
import type { ReportInputFile, ReportSetting, Section } from '../../../src/report/model';
import { setting } from '../../../src/report/model';
import { balanceSection, regionalSection, twoRegionSection } from '../../../src/report/regional';
import { digestHex } from '../../../src/report/sha256';
import type { Handler } from '../context';
import { current } from './session';

/** One column of values by the table's sector order (or a part's rows or columns). */
export interface ValuesColumn {
  name: string;
  unit?: string;
  values: number[];
}

export interface ValuesFile {
  name: string;
  sha256: string;
  size: number;
  sheet?: string;
  columns: ValuesColumn[];
  findings: Finding[];
}

export interface RegionalRequest {
  /** The values: a file's columns, or one typed column. */
  columns: ValuesColumn[];
  /** The file they came from (its name and SHA-256); absent when typed. */
  file?: { name: string; sha256: string; size?: number; sheet?: string };
  method: RegionalMethod;
  delta?: number;
  kind: BasisKind;
  regionalColumn?: string;
  nationalColumn?: string;
  region?: string;
  /** Also the two-region model (the region and the rest of the nation): each sector's split into intraregional, feedback and spillover. */
  twoRegion?: boolean;
  /** The national table, when it is no longer the current one (the regional table was put in its place). */
  national?: PlainTable;
}

export interface RegionalView {
  codes: string[];
  labels: string[];
  region: number[];
  nation: number[];
  slq: number[];
  /** The sector's quotient as applied (SDP: supply ÷ demand before the cap). */
  quotient: number[];
  localShare: number[];
  cappedCells: number[];
  national: number[];
  regional: number[];
  share: number;
  delta?: number;
  lambda?: number;
  capped: string[];
  regionFrom: string;
  nationFrom: string;
  unit: string;
  findings: Finding[];
  cautions: string[];
  settings: ReportSetting[];
  /** The two-region split per unit of the region's final demand for each sector, when asked. */
  twoRegion?: TwoRegionSplit['totals'][];
  /** The regional table, ready to be used as a project's table. */
  table: PlainTable;
}

export interface BalanceRequest {
  part: BalancePartName;
  rowTotals: number[];
  columnTotals: number[];
  /** Cells held at their values, by row and column code. */
  fixed?: { row: string; col: string }[];
  /** Default: RAS, or GRAS when the part has negative entries. */
  method?: BalanceMethod;
  tolerance?: number;
  maxIterations?: number;
  /** The files the totals came from, for the report. */
  files?: { role: string; name: string; sha256: string; size?: number }[];
  /** The table balanced, when it is no longer the current one. */
  source?: PlainTable;
}

export interface BalanceView {
  method: BalanceMethod;
  methodGiven: boolean;
  part: BalancePartName;
  rows: { codes: string[]; labels: string[] };
  cols: { codes: string[]; labels: string[] };
  iterations: number;
  converged: boolean;
  maxDeviation: number;
  worst: BalanceResult['worst'];
  infeasible: BalanceResult['infeasible'];
  findings: Finding[];
  tolerance: number;
  /** Row sums and column sums of the balanced part, against the targets. */
  rowSums: number[];
  colSums: number[];
  /** The balanced part, row-major. */
  X: number[];
  /** The table with the balanced part in place (only when the totals were met). */
  table?: PlainTable;
}

/** Row and column sums of a matrix. */
function sumsOf(X: { rows: number; cols: number; data: Float64Array }): { rowSums: number[]; colSums: number[] } {
  const rowSums = new Array<number>(X.rows).fill(0);
  const colSums = new Array<number>(X.cols).fill(0);
  for (let i = 0; i < X.rows; i++)
    for (let j = 0; j < X.cols; j++) {
      const v = X.data[i * X.cols + j]!;
      rowSums[i] += v;
      colSums[j] += v;
    }
  return { rowSums, colSums };
}

function axisOf(t: Table, axis: 'sectors' | 'rows' | 'cols', part?: BalancePartName) {
  if (axis === 'sectors') return t.sectors;
  const p = balancePart(t, part ?? 'intermediate');
  return axis === 'rows' ? p.rows : p.cols;
}

/** The regional estimate of a request, on its national table (the current one unless given). */
export function estimateOf(req: RegionalRequest): { nat: Table; e: RegionalEstimate } {
  if (!REGIONAL_METHODS.includes(req.method)) throw new InputError('bad-method', `the method must be one of ${REGIONAL_METHODS.join(', ')}; got '${String(req.method)}'`);
  if (!BASIS_KINDS.includes(req.kind)) throw new InputError('bad-basis', `the basis must be one of ${BASIS_KINDS.join(', ')}; got '${String(req.kind)}'`);
  if (req.delta !== undefined && (!(req.delta >= 0) || req.delta > 1)) throw new InputError('bad-delta', `δ must be from 0 to 1; got '${String(req.delta)}'`);
  const nat = req.national ? makeTable(req.national) : current().table;
  const n = nat.sectors.codes.length;
  if (!req.columns?.length) throw new InputError('no-values', "give the region's values by sector (a file, or typed)");
  const columns = req.columns.map((c, k) => {
    if (c.values.length !== n) throw new InputError('bad-size', `column '${c.name}' has ${c.values.length} values for ${n} sectors`);
    c.values.forEach((v, i) => {
      if (!Number.isFinite(v)) throw new InputError('not-a-number', `column '${c.name}', sector ${nat.sectors.codes[i]}: '${String(v)}' is not a number`, { row: i + 1, column: k + 1, sector: nat.sectors.codes[i], text: String(v) });
    });
    return { name: c.name, column: k + 1, values: Float64Array.from(c.values), ...(c.unit ? { unit: c.unit } : {}) };
  });
  const usesDelta = req.method === 'flq' || req.method === 'aflq';
  const e = regionalFromValues(
    nat,
    { file: { name: req.file?.name ?? 'values typed in the workbench' }, columns },
    { method: req.method, kind: req.kind, delta: usesDelta ? req.delta : undefined, regionalColumn: req.regionalColumn, nationalColumn: req.nationalColumn, region: req.region, ...(req.file ? { source: { file: req.file.name, sha256: req.file.sha256 } } : {}) },
    { method: true, basis: true },
  );
  return { nat, e };
}

/** Run a balance request on its table (the current one unless given). */
export function balanceOf(req: BalanceRequest, onIteration?: (k: number) => void): { t: Table; result: BalanceResult; rows: ReturnType<typeof balancePart>['rows']; cols: ReturnType<typeof balancePart>['cols']; method: BalanceMethod } {
  const part = req.part;
  if (part !== 'intermediate' && part !== 'whole') throw new InputError('bad-part', `the part must be intermediate or whole; got '${String(part)}'`);
  const t = req.source ? makeTable(req.source) : current().table;
  const { rows, cols, A } = balancePart(t, part);
  if (req.rowTotals.length !== rows.codes.length) throw new InputError('bad-size', `${req.rowTotals.length} row totals for ${rows.codes.length} rows of the ${part} part`);
  if (req.columnTotals.length !== cols.codes.length) throw new InputError('bad-size', `${req.columnTotals.length} column totals for ${cols.codes.length} columns of the ${part} part`);
  let fixed: Uint8Array | undefined;
  for (const f of req.fixed ?? []) {
    const i = rows.codes.indexOf(f.row);
    const j = cols.codes.indexOf(f.col);
    if (i < 0) throw new InputError('bad-fix', `a cell held fixed names row '${f.row}', which the ${part} part does not have`, { text: f.row });
    if (j < 0) throw new InputError('bad-fix', `a cell held fixed names column '${f.col}', which the ${part} part does not have`, { text: f.col });
    fixed ??= new Uint8Array(A.rows * A.cols);
    fixed[i * A.cols + j] = 1;
  }
  const method: BalanceMethod = req.method ?? (A.data.some((x) => x < 0) ? 'gras' : 'ras');
  const o = { tolerance: req.tolerance ?? 1e-10, maxIterations: req.maxIterations ?? 10000, rowCodes: rows.codes, colCodes: cols.codes, ...(fixed ? { fixed } : {}), ...(onIteration ? { onIteration } : {}) };
  const result = method === 'gras' ? gras(A, req.rowTotals, req.columnTotals, o) : ras(A, req.rowTotals, req.columnTotals, o);
  return { t, result, rows, cols, method };
}

/** The report's sections, settings and inputs of a regionalisation and a balancing done in the workbench. */
export function regionalReportParts(regional?: RegionalRequest, balance?: BalanceRequest): { sections: Section[]; settings: ReportSetting[]; inputs: ReportInputFile[]; findings: Finding[] } {
  const out = { sections: [] as Section[], settings: [] as ReportSetting[], inputs: [] as ReportInputFile[], findings: [] as Finding[] };
  if (regional) {
    const { nat, e } = estimateOf(regional);
    out.sections.push(regionalSection({ result: e.result, national: e.national, regional: e.regional }));
    if (regional.twoRegion) out.sections.push(twoRegionSection(e.result.sectors, twoRegionSplits(nat, e.choice.basis, regional.method, e.result.delta)));
    out.settings.push(...e.settings.map((x) => ({ ...x, key: `regional.${x.key}`, label: `Regional table: ${x.label}` })));
    if (regional.file) out.inputs.push({ role: 'regional', name: regional.file.name, sha256: regional.file.sha256, ...(regional.file.size !== undefined ? { bytes: regional.file.size } : {}), ...(regional.file.sheet ? { sheet: regional.file.sheet } : {}) });
    out.findings.push(...e.findings);
  }
  if (balance) {
    const b = balanceOf(balance);
    out.sections.push(balanceSection(b.result, b.rows, b.cols));
    out.settings.push(
      setting('balance.method', 'Balancing: method', b.method.toUpperCase(), balance.method ? 'given' : 'guessed'),
      setting('balance.part', 'Balancing: part', balance.part, 'given'),
      setting('balance.fixed', 'Balancing: cells held fixed', (balance.fixed ?? []).map((f) => `${f.row}:${f.col}`).join(', ') || 'none', 'given'),
    );
    for (const f of balance.files ?? []) out.inputs.push({ role: f.role, name: f.name, sha256: f.sha256, ...(f.size !== undefined ? { bytes: f.size } : {}) });
    out.findings.push(...b.result.findings);
  }
  return out;
}

export const regionalOps: Record<string, Handler> = {
  /** The rows and columns of a part of the current table, with their sums now (the Balance tool's starting targets). */
  'balance-part': (args: { part: BalancePartName }) => {
    const { rows, cols, A } = balancePart(current().table, args.part === 'whole' ? 'whole' : 'intermediate');
    return { rows: { codes: [...rows.codes], labels: [...rows.labels] }, cols: { codes: [...cols.codes], labels: [...cols.labels] }, ...sumsOf(A), negative: A.data.some((x) => x < 0) };
  },

  /** A file of values by code, matched to the current table's sectors (or a part's rows or columns). */
  'regional-values': async (args: { name: string; bytes: ArrayBuffer; sheet?: string; axis?: 'sectors' | 'rows' | 'cols'; part?: BalancePartName }): Promise<ValuesFile> => {
    const bytes = new Uint8Array(args.bytes);
    const sha256 = await digestHex(bytes);
    const g = await readGrid(bytes, { file: args.name, ...(args.sheet ? { sheet: args.sheet } : {}) });
    const axis = axisOf(current().table, args.axis ?? 'sectors', args.part);
    const v = valuesFromGrid(g.grid, axis, args.axis === 'rows' ? 'row totals' : args.axis === 'cols' ? 'column totals' : 'regional file');
    const out: ValuesFile = { name: args.name, sha256, size: bytes.length, columns: v.columns.map((c) => ({ name: c.name, ...(c.unit ? { unit: c.unit } : {}), values: Array.from(c.values) })), findings: [...g.findings, ...v.findings] };
    if (g.grid.sheet) out.sheet = g.grid.sheet;
    return out;
  },

  /** The regional table of the request, its quotients and both tables' output multipliers. */
  regionalise: (args: RegionalRequest, ctx): RegionalView => {
    ctx.progress(0, 'quotients');
    const { nat, e } = estimateOf(args);
    const r = e.result;
    const twoRegion = args.twoRegion ? twoRegionSplits(nat, e.choice.basis, args.method, r.delta) : undefined;
    const capped = new Map(r.capped.map((c) => [c.code, c.cells]));
    ctx.progress(1);
    return {
      codes: [...r.sectors.codes],
      labels: [...r.sectors.labels],
      region: Array.from(r.basis.region),
      nation: Array.from(r.basis.nation),
      slq: Array.from(r.slq),
      quotient: Array.from(r.sectorQuotient),
      localShare: Array.from(r.localShare),
      cappedCells: r.sectors.codes.map((c) => capped.get(c) ?? 0),
      national: Array.from(e.national),
      regional: Array.from(e.regional),
      share: r.share,
      ...(r.delta !== undefined ? { delta: r.delta } : {}),
      ...(r.lambda !== undefined ? { lambda: r.lambda } : {}),
      capped: [...r.provenance.capped],
      regionFrom: e.choice.regionFrom,
      nationFrom: e.choice.nationFrom,
      unit: e.choice.basis.unit,
      findings: e.findings,
      cautions: [...REGIONAL_CAUTIONS],
      settings: e.settings,
      ...(twoRegion ? { twoRegion } : {}),
      table: toPlain(r.table),
    };
  },

  /** RAS or GRAS of the request; the rebalanced table when the totals were met. */
  balance: async (args: BalanceRequest, ctx): Promise<BalanceView> => {
    const max = args.maxIterations ?? 10000;
    const b = balanceOf(args, (k) => ctx.progress(Math.min(1, k / max), `iteration ${k}`));
    const X = b.result.X;
    const { rowSums, colSums } = sumsOf(X);
    const out: BalanceView = {
      method: b.method,
      methodGiven: !!args.method,
      part: args.part,
      rows: { codes: [...b.rows.codes], labels: [...b.rows.labels] },
      cols: { codes: [...b.cols.codes], labels: [...b.cols.labels] },
      iterations: b.result.iterations,
      converged: b.result.converged,
      maxDeviation: b.result.maxDeviation,
      worst: b.result.worst,
      infeasible: b.result.infeasible,
      findings: b.result.findings,
      tolerance: b.result.tolerance,
      rowSums,
      colSums,
      X: Array.from(X.data),
    };
    if (b.result.converged) out.table = toPlain(balancedTable(b.t, args.part, X, b.method));
    return out;
  },
};
