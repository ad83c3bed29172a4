/**
 * Files of values by code for the regional commands: a regional file (employment, output or
 * earnings by sector, for the region and optionally the nation) and totals files (row or column
 * totals for balancing). The reading of the values and the choice of columns are in
 * `regional-values.ts` (no Node imports: the workbench's worker uses the same code); this file
 * reads the files from the command line's inputs.
 */
import type { BasisKind, RegionalMethod } from '../../engine/regional/index';
import { BASIS_KINDS, REGIONAL_METHODS } from '../../engine/regional/index';
import type { Axis, Table } from '../../engine/table';
import { readConcordanceGrid, readConcordanceJson, readGrid } from '../io/index';
import type { ReportInputFile } from '../report/model';
import { numberOption } from './common';
import type { CliContext } from './context';
import { UsageError } from './errors';
import { readInput, reportInput } from './files';
import type { InputFile } from './files';
import { sheetOption } from './table-input';
import { regionalFromValues, valuesFromGrid } from './regional-values';
import type { RegionalEstimate, ValuesRead } from './regional-values';

export { valuesFromGrid, pickColumn, chooseBasis, regionalSettings, regionalFromValues } from './regional-values';
export type { ValueColumn, ValuesRead, BasisChoice } from './regional-values';

/** Read a file of values by code (and an optional concordance) for the table's sectors. */
export async function readValues(ctx: CliContext, name: string, role: string, sectors: Axis, o: { sheet?: string; concordance?: string; concordanceSheet?: string } = {}): Promise<ValuesRead> {
  const file = await readInput(ctx, name, role);
  const sheet = sheetOption(o.sheet);
  const g = await readGrid(file.bytes, { file: file.name === '-' ? 'standard input' : file.name, ...(sheet !== undefined ? { sheet } : {}) });
  let map: Map<string, string> | undefined;
  let concordance: InputFile | undefined;
  const findings = [...g.findings];
  if (o.concordance) {
    concordance = await readInput(ctx, o.concordance, 'concordance');
    const text = new TextDecoder('utf-8').decode(concordance.bytes);
    const con = /^\s*[{[]/.test(text.slice(0, 64)) ? readConcordanceJson(text, concordance.name) : readConcordanceGrid((await readGrid(concordance.bytes, { file: concordance.name, ...(o.concordanceSheet ? { sheet: o.concordanceSheet } : {}) })).grid);
    map = new Map(con.concordance.from.map((f, k) => [f, con.concordance.to[k]!]));
    findings.push(...con.findings);
  }
  const v = valuesFromGrid(g.grid, sectors, role, map);
  const out: ValuesRead = { file, columns: v.columns, findings: [...findings, ...v.findings] };
  if (o.sheet !== undefined) out.sheet = o.sheet;
  if (concordance) out.concordance = concordance;
  return out;
}

/** The options of a regionalisation, shared by `regionalise` and `report`. */
export interface RegionalFlags {
  regional?: string;
  regionalSheet?: string;
  method?: string;
  delta?: string;
  basis?: string;
  regionalColumn?: string;
  nationalColumn?: string;
  region?: string;
  concordance?: string;
}

/** Add the regionalisation options to a command (`--regional` itself is added by the caller, required or not). */
export { regionalOptions } from './options';

/** The method, basis kind and δ of the options, checked (before any file is read). */
export function regionalChoices(f: RegionalFlags): { method: RegionalMethod; kind: BasisKind; delta: number | undefined } {
  const method = (f.method ?? 'flq').toLowerCase() as RegionalMethod;
  if (!REGIONAL_METHODS.includes(method)) throw new UsageError(`--method must be one of ${REGIONAL_METHODS.join(', ')}; got '${f.method}'`, 'bad-method');
  const kind = (f.basis ?? 'employment').toLowerCase() as BasisKind;
  if (!BASIS_KINDS.includes(kind)) throw new UsageError(`--basis must be one of ${BASIS_KINDS.join(', ')}; got '${f.basis}'`, 'bad-basis');
  const delta = numberOption(f.delta, '--delta', { min: 0, max: 1 });
  if (delta !== undefined && method !== 'flq' && method !== 'aflq') throw new UsageError(`--delta applies to FLQ and AFLQ, not ${method.toUpperCase()}`, 'delta-not-used');
  return { method, kind, delta };
}

/** A regionalisation from the options (`findings` also holds the reader's). */
export interface RegionalRun extends RegionalEstimate {
  method: RegionalMethod;
  kind: BasisKind;
  delta: number | undefined;
  read: ValuesRead;
  /** The regional file (and concordance) as report inputs. */
  inputs: ReportInputFile[];
}

/** Read the regional file of the options and regionalise the national table; the report's settings and inputs with it. */
export async function regionalRun(ctx: CliContext, nat: Table, f: RegionalFlags): Promise<RegionalRun> {
  const { method, kind, delta } = regionalChoices(f);
  if (!f.regional) throw new UsageError('a regional table needs --regional FILE', 'missing-option');
  const read = await readValues(ctx, f.regional, 'regional file', nat.sectors, { ...(f.regionalSheet ? { sheet: f.regionalSheet } : {}), ...(f.concordance ? { concordance: f.concordance } : {}) });
  const e = regionalFromValues(nat, read, { method, kind, delta, regionalColumn: f.regionalColumn, nationalColumn: f.nationalColumn, region: f.region, source: { file: reportInput(read.file, 'regional').name, sha256: read.file.sha256 } }, { method: !!f.method, basis: !!f.basis });
  const inputs = [reportInput(read.file, 'regional', read.sheet), ...(read.concordance ? [reportInput(read.concordance, 'concordance')] : [])];
  return { method, kind, delta, read, ...e, findings: [...read.findings, ...e.findings], inputs };
}
