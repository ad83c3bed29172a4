/**
 * Values by code, read from a grid (no Node imports: the command line and the workbench's worker
 * share it). Files of values by code for the regional commands: a regional file (employment, output or
 * earnings by sector, for the region and optionally the nation) and totals files (row or column
 * totals for balancing).
 *
 * The class of layouts read: a code column first, optionally a label column, then one or more
 * columns of numbers, one line per code, under a header row that names the columns (a unit in
 * brackets at the end of a name is kept, as in `Employment (jobs)`). CSV, TSV and XLSX go through
 * src/io's `readGrid` (keyed bulk-download sheets are unpacked there). Codes are matched to the
 * table's sector codes (or labels, ignoring case), or through a concordance that maps the file's
 * codes onto the table's (values are then summed per table code). A line whose code is `Total`
 * is left out with a note. Every bad cell is an `InputError` naming the file, sheet, cell, row,
 * column and the text found.
 */
import { cellRef, InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { Axis, Table } from '../../engine/table';
import { guessJobs } from '../../engine/measures';
import { guessLabourIncomeRow } from '../../engine/household';
import type { BasisKind, RegionalBasis, RegionalMethod, Regionalised } from '../../engine/regional/index';
import { METHOD_NAMES, regionalise, TwoRegionModel } from '../../engine/regional/index';
import type { TwoRegionSplit } from '../../engine/regional/index';
import { checks } from '../../engine/checks';
import { LeontiefModel } from '../../engine/leontief';
import type { ReportSetting } from '../report/model';
import { setting } from '../report/model';
import type { Grid } from '../io/index';
import { EMPTY, NUMBER } from '../io/grid';
import { numberHint } from '../io/numbers';
import { UsageError } from './errors';
import type { InputFile } from './files';

export interface ValueColumn {
  /** The header text (or `value N` without a header). */
  name: string;
  unit?: string;
  /** 1-based column in the sheet. */
  column: number;
  /** By the table's sector order. */
  values: Float64Array;
}

export interface ValuesRead {
  file: InputFile;
  sheet?: string;
  columns: ValueColumn[];
  findings: Finding[];
  concordance?: InputFile;
}

const TOTAL = /^(total|totals|sum|all sectors|all industries)$/i;

/** Columns of numbers by code from a grid, aligned on the table's sectors. */
export function valuesFromGrid(grid: Grid, sectors: Axis, what: string, map?: Map<string, string>): { columns: ValueColumn[]; findings: Finding[] } {
  const file = grid.file;
  const at = (r: number, c: number, text?: string) => ({ file, ...(grid.sheet ? { sheet: grid.sheet } : {}), cell: cellRef(r + 1, c + 1), row: r + 1, column: c + 1, ...(text !== undefined ? { text } : {}) });
  const rows: number[] = [];
  for (let r = 0; r < grid.rowCount; r++) if (!grid.isEmptyRow(r)) rows.push(r);
  if (!rows.length) throw new InputError('empty-file', `file ${file} (${what}) has no lines`, { file });
  // A header: the first line has no number beyond the code column.
  const first = rows[0]!;
  let header = true;
  for (let c = 1; c < grid.colCount; c++) if (grid.kind(first, c) === NUMBER) header = false;
  const data = header ? rows.slice(1) : rows;
  if (!data.length) throw new InputError('empty-file', `file ${file} (${what}) has a header but no lines of values`, { file });
  // A label column: the second column holds text on most lines.
  let textInSecond = 0;
  for (const r of data) if (grid.kind(r, 1) !== NUMBER && grid.kind(r, 1) !== EMPTY) textInSecond++;
  const firstValue = textInSecond * 2 > data.length ? 2 : 1;
  const valueCols: number[] = [];
  for (let c = firstValue; c < grid.colCount; c++) if (data.some((r) => grid.kind(r, c) !== EMPTY) || (header && grid.text(first, c).trim())) valueCols.push(c);
  if (!valueCols.length) throw new InputError('no-values', `file ${file} (${what}) has no column of numbers after the codes${firstValue === 2 ? ' and labels' : ''}`, { file }, 'Give a code column, optionally a label column, then the values');
  const index = new Map<string, number>();
  sectors.codes.forEach((c, i) => index.set(c, i));
  const byLabel = new Map<string, number>();
  sectors.labels.forEach((l, i) => byLabel.set(l.toLowerCase(), i));
  const findings: Finding[] = [];
  const cols: ValueColumn[] = valueCols.map((c, k) => {
    const name = header ? grid.text(first, c).trim() || `value ${k + 1}` : `value ${k + 1}`;
    const m = /[[(]([^\])[(]+)[\])]\s*$/.exec(name);
    const out: ValueColumn = { name, column: c + 1, values: new Float64Array(sectors.codes.length) };
    if (m) out.unit = m[1]!.trim();
    return out;
  });
  const seen = new Map<number, number>();
  const unknown: string[] = [];
  const totals: number[] = [];
  for (const r of data) {
    const raw = grid.text(r, 0).trim();
    if (!raw) throw new InputError('empty-code', `file ${file}, line ${r + 1}: the code is empty`, at(r, 0, ''), 'Give a code on every line');
    if (TOTAL.test(raw) || (firstValue === 2 && TOTAL.test(grid.text(r, 1).trim()))) {
      totals.push(r + 1);
      continue;
    }
    const code = map ? map.get(raw) : raw;
    if (map && code === undefined) {
      unknown.push(raw);
      continue;
    }
    const i = index.get(code!) ?? byLabel.get(code!.toLowerCase());
    if (i === undefined) {
      unknown.push(raw);
      continue;
    }
    if (!map && seen.has(i)) throw new InputError('duplicate-code', `file ${file}: code '${raw}' appears on lines ${seen.get(i)! + 1} and ${r + 1}`, at(r, 0, raw), 'Keep one line per code');
    seen.set(i, r);
    cols.forEach((col, k) => {
      const c = valueCols[k]!;
      const kind = grid.kind(r, c);
      if (kind !== NUMBER) {
        const t = grid.text(r, c);
        const label = firstValue === 2 ? grid.text(r, 1).trim() : raw;
        throw new InputError(
          kind === EMPTY ? 'empty-cell' : 'not-a-number',
          `file ${file}${grid.sheet ? `, sheet '${grid.sheet}'` : ''}, cell ${cellRef(r + 1, c + 1)} (row '${label}', column '${col.name}'): ${kind === EMPTY ? 'the cell is empty where a number belongs' : `text '${t}' where a number belongs`}`,
          { ...at(r, c, t), rowLabel: label, columnLabel: col.name },
          kind === EMPTY ? 'Write 0 where the value is zero' : numberHint(t, undefined),
        );
      }
      col.values[i] = col.values[i]! + grid.num(r, c);
    });
  }
  if (unknown.length) {
    throw new InputError('unknown-sector', `file ${file} (${what}) has ${unknown.length} code${unknown.length > 1 ? 's' : ''} that the table does not${map ? ' (nor the concordance)' : ''}: ${unknown.slice(0, 10).map((c) => `'${c}'`).join(', ')}${unknown.length > 10 ? ', …' : ''}`, { file, sectors: unknown }, map ? 'Map every code of the file in the concordance' : "Use the table's sector codes, or give --concordance FILE that maps the file's codes onto them");
  }
  const covered = new Set(seen.keys());
  const missing = sectors.codes.filter((_, i) => !covered.has(i));
  if (missing.length) {
    throw new InputError('missing-sector', `file ${file} (${what}) has no line for ${missing.length} sector${missing.length > 1 ? 's' : ''} of the table: ${missing.slice(0, 10).map((c) => `'${c}'`).join(', ')}${missing.length > 10 ? ', …' : ''}`, { file, sectors: missing }, 'Give a value (0 if none) for every sector');
  }
  if (totals.length) findings.push({ code: 'total-line-left-out', severity: 'note', message: `file ${file}: line${totals.length > 1 ? 's' : ''} ${totals.join(', ')} (a total) left out`, where: { file } });
  return { columns: cols, findings };
}

/** Choose a column by its name, its name without the unit, or its 1-based number among the value columns. */
export function pickColumn(cols: ValueColumn[], given: string, option: string, file: string): ValueColumn {
  const g = given.trim().toLowerCase();
  const hit = cols.find((c) => c.name.toLowerCase() === g || c.name.replace(/\s*[[(][^\])]*[\])]\s*$/, '').toLowerCase() === g) ?? (/^\d+$/.test(g) ? cols[Number(g) - 1] : undefined);
  if (!hit) throw new UsageError(`${option} '${given}' is not a column of ${file}; its value columns are ${cols.map((c) => `'${c.name}'`).join(', ')}`, 'unknown-column');
  return hit;
}

const REGION_WORDS = /\b(region|regional|local|area|county|city|state|province)\b/i;
const NATION_WORDS = /\b(nation|national|country|whole|all regions)\b/i;

export interface BasisChoice {
  basis: RegionalBasis;
  /** Where each side came from, for the report settings. */
  regionFrom: string;
  nationFrom: string;
  findings: Finding[];
}

/**
 * The regional and national values: the columns named by the options; else, with one column,
 * that column for the region and the nation's from the table (its jobs satellite for employment,
 * its output for output, its compensation row for earnings); with two or more, the column whose
 * name speaks of a region and the one that speaks of the nation (else the first and second).
 */
export function chooseBasis(t: Table, read: ValuesRead, kind: BasisKind, o: { regionalColumn?: string; nationalColumn?: string; name?: string }): BasisChoice {
  const file = read.file.name;
  const cols = read.columns;
  const findings: Finding[] = [];
  let region: ValueColumn;
  let nation: ValueColumn | undefined;
  if (o.regionalColumn) region = pickColumn(cols, o.regionalColumn, '--regional-column', file);
  else if (cols.length === 1) region = cols[0]!;
  else region = cols.find((c) => REGION_WORDS.test(c.name) && !NATION_WORDS.test(c.name)) ?? cols[0]!;
  if (o.nationalColumn) nation = pickColumn(cols, o.nationalColumn, '--national-column', file);
  else if (cols.length > 1) {
    nation = cols.find((c) => c !== region && NATION_WORDS.test(c.name)) ?? cols.find((c) => c !== region);
    if (!o.regionalColumn && !REGION_WORDS.test(region.name)) findings.push({ code: 'basis-columns-guessed', severity: 'note', message: `file ${file}: column '${region.name}' is read as the region's and '${nation!.name}' as the nation's (no column name says which); give --regional-column and --national-column to choose`, where: { file } });
  }
  if (nation === region) throw new UsageError(`--regional-column and --national-column name the same column '${region.name}'`, 'same-column');
  let nationValues: Float64Array;
  let nationFrom: string;
  if (nation) {
    nationValues = nation.values;
    nationFrom = `${file}, column '${nation.name}'`;
  } else if (kind === 'output') {
    nationValues = Float64Array.from(t.x);
    nationFrom = "the table's total output";
  } else if (kind === 'earnings') {
    const row = guessLabourIncomeRow(t);
    const a = row === undefined ? -1 : t.valueAdded.codes.indexOf(row);
    const classed = t.valueAdded.classes?.findIndex((c) => c === 'compensation') ?? -1;
    const k = classed >= 0 ? classed : a;
    if (k < 0) throw new UsageError(`${file} gives the region's earnings only, and the table has no row of compensation of employees to compare them with`, 'no-national-basis', 'Add a column of national earnings by sector to the file (--national-column)');
    const n = t.sectors.codes.length;
    nationValues = Float64Array.from(t.V.data.subarray(k * n, (k + 1) * n));
    nationFrom = `the table's row '${t.valueAdded.codes[k]}'`;
  } else {
    const jobs = guessJobs(t);
    if (!jobs) throw new UsageError(`${file} gives the region's employment only, and the table has no one satellite row of jobs to compare it with`, 'no-national-basis', 'Add a column of national employment by sector to the file (--national-column), or a jobs satellite to the table');
    nationValues = Float64Array.from(t.satellites.find((s) => s.code === jobs)!.values);
    nationFrom = `the table's satellite '${jobs}'`;
  }
  const unit = region.unit ?? nation?.unit ?? (kind === 'output' ? 'money' : kind === 'earnings' ? 'money' : 'jobs');
  const basis: RegionalBasis = { kind, unit, region: region.values, nation: nationValues };
  if (o.name) basis.name = o.name;
  return { basis, regionFrom: `${file}, column '${region.name}'`, nationFrom, findings };
}

/** The report settings of a regionalisation: which were given and which were defaults or guesses. */
export function regionalSettings(r: Regionalised, choice: Pick<BasisChoice, 'basis' | 'regionFrom' | 'nationFrom'>, given: { method?: boolean; delta?: boolean; basis?: boolean; regionalColumn?: boolean; nationalColumn?: boolean }): ReportSetting[] {
  const method = r.provenance.method;
  return [
    setting('method', 'Regionalisation method', METHOD_NAMES[method], given.method ? 'given' : 'default'),
    ...(r.delta !== undefined ? [setting('delta', 'δ (FLQ, AFLQ)', r.delta, given.delta ? 'given' : 'default', 'a common default, not measured for this region')] : []),
    ...(r.lambda !== undefined ? [setting('lambda', 'λ = [log2(1 + regional/national)]^δ', r.lambda, 'default', 'computed')] : []),
    setting('basis', 'Basis', `${choice.basis.kind} (${choice.basis.unit})`, given.basis ? 'given' : 'default'),
    setting('regionValues', "The region's values", choice.regionFrom, given.regionalColumn ? 'given' : 'guessed'),
    setting('nationValues', "The nation's values", choice.nationFrom, given.nationalColumn ? 'given' : 'guessed'),
    setting('share', "The region's share of the nation", r.share, 'default', 'computed'),
  ];
}

export interface RegionalEstimate {
  choice: BasisChoice;
  result: Regionalised;
  /** Output multipliers of the national and the regional table. */
  national: Float64Array;
  regional: Float64Array;
  /** The basis's and the regionalisation's findings, and the regional table's checks. */
  findings: Finding[];
  settings: ReportSetting[];
}

/** Regionalise the national table from values read (a file's, or typed): the basis chosen, the regional table, both tables' multipliers, the settings. */
export function regionalFromValues(
  nat: Table,
  read: Pick<ValuesRead, 'columns'> & { file: { name: string } },
  o: { method: RegionalMethod; kind: BasisKind; delta?: number | undefined; regionalColumn?: string | undefined; nationalColumn?: string | undefined; region?: string | undefined; source?: { file: string; sha256: string } },
  given: { method?: boolean; basis?: boolean } = {},
): RegionalEstimate {
  const choice = chooseBasis(nat, read as ValuesRead, o.kind, { ...(o.regionalColumn ? { regionalColumn: o.regionalColumn } : {}), ...(o.nationalColumn ? { nationalColumn: o.nationalColumn } : {}), ...(o.region ? { name: o.region } : {}) });
  const result = regionalise(nat, choice.basis, { method: o.method, ...(o.delta !== undefined ? { delta: o.delta } : {}), ...(o.source ? { source: o.source } : {}) });
  const findings = [...choice.findings, ...result.findings, ...checks(result.table)];
  const national = new LeontiefModel(result.national).outputMultipliers();
  const regional = new LeontiefModel(result.A).outputMultipliers();
  const settings = regionalSettings(result, choice, { ...given, delta: o.delta !== undefined, regionalColumn: !!o.regionalColumn, nationalColumn: !!o.nationalColumn });
  return { choice, result, national, regional, findings, settings };
}

/** The two-region split of one unit of the region's final demand for each sector's product in turn (Miller & Blair 2009, ch. 3). */
export function twoRegionSplits(nat: Table, basis: RegionalBasis, method: RegionalMethod, delta?: number): TwoRegionSplit['totals'][] {
  const two = new TwoRegionModel(nat, basis, { method, ...(delta !== undefined ? { delta } : {}) });
  const n = nat.sectors.codes.length;
  return nat.sectors.codes.map((_, j) => {
    const d = new Float64Array(n);
    d[j] = 1;
    return two.split(d).totals;
  });
}
