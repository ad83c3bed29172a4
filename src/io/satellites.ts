/**
 * Satellite rows by sector (jobs, emissions, water...) with their units, from a sheet of their
 * own, and attached to a table by sector code.
 *
 * Either orientation: satellites down and sectors across (a unit column headed `unit`, or the
 * unit in brackets at the end of each label, such as `Employment (jobs)`), or sectors down and
 * satellites across (a row headed `unit` under the header). Given the table's sectors, the
 * orientation is the one whose codes match them; totals rows and columns are checked and left
 * out, as in tables.
 */
import { InputError } from '../../engine/errors';
import type { Finding } from '../../engine/findings';
import type { Axis, Satellite, Table } from '../../engine/table';
import { validateTable } from '../../engine/table';
import { classify, mappingOf, readCells } from './assemble';
import type { Block } from './block';
import { EMPTY, type Grid, NUMBER, normalizeCode, normalizeLabel } from './grid';
import { detectStructure } from './layout';
import type { LayoutMapping, MappingInput } from './mapping';
import { roleOverrides, ROW_ROLES } from './mapping';

export interface SatelliteOptions {
  /** The table's sectors, to find the orientation and check the codes. */
  sectors?: Axis;
  orientation?: 'sectors-across' | 'sectors-down';
  mapping?: MappingInput;
  blanks?: 'error' | 'zero';
  zeroTexts?: string[];
}

export interface SatelliteRead {
  /** Values by the sheet's sectors (`sectors`), each with its unit. */
  satellites: Satellite[];
  sectors: Axis;
  orientation: 'sectors-across' | 'sectors-down';
  mapping: LayoutMapping;
  findings: Finding[];
}

/**
 * A unit named by the words of a heading when none is written apart ('employed_persons_fte',
 * 'Employment (FTE)', 'jobs', 'CO2 emissions, tonnes'): full-time equivalents, persons, jobs,
 * tonnes. Undefined when the words name none.
 */
export function unitFromWords(label: string): string | undefined {
  const w = label.toLowerCase().replace(/[_\-]+/g, ' ');
  if (/\bfte\b|\bfull time equivalent/.test(w)) return 'FTE';
  if (/\bjobs?\b/.test(w)) return 'jobs';
  if (/\b(persons?|people|employees|workers|headcount)\b/.test(w)) return 'persons';
  if (/\bkt\b|\bkilotonnes?\b/.test(w)) return 'kt';
  if (/\btonnes?\b|\bt co2/.test(w)) return 't';
  return undefined;
}

/**
 * A satellite file as the simplest agencies and analysts write it (rule satellite-columns;
 * fixture: the ABS 5246.0 employment table, `code,employed_persons_fte`): a header row, a column
 * of sector codes (the one naming most of the table's sectors), and one or more value columns,
 * each with its unit in the heading's words or brackets. Used when the sheet has too few numbers
 * per row for the table layout.
 */
function readSatelliteColumns(grid: Grid, sectors: Axis): SatelliteRead {
  const file = grid.file;
  const known = new Set(sectors.codes);
  let codeCol = -1;
  let best = 0;
  for (let c = 0; c < grid.colCount; c++) {
    let n = 0;
    for (let r = 0; r < grid.rowCount; r++) if (known.has(normalizeCode(grid.text(r, c)))) n++;
    if (n > best) [best, codeCol] = [n, c];
  }
  if (codeCol < 0) throw new InputError('no-rows', `file ${file}: no column of the satellite file holds the table's sector codes (such as '${sectors.codes[0] ?? ''}')`, { file }, "Put the table's sector codes in one column");
  const rows: number[] = [];
  for (let r = 0; r < grid.rowCount; r++) if (known.has(normalizeCode(grid.text(r, codeCol)))) rows.push(r);
  const head = rows[0]! - 1;
  const satellites: Satellite[] = [];
  for (let c = 0; c < grid.colCount; c++) {
    if (c === codeCol || !rows.every((r) => grid.kind(r, c) === NUMBER || grid.kind(r, c) === EMPTY) || !rows.some((r) => grid.kind(r, c) === NUMBER)) continue;
    const label = head >= 0 ? normalizeLabel(grid.text(head, c)) : `column ${c + 1}`;
    const m = /[[(]([^\])[(]+)[\])]\s*$/.exec(label);
    const unit = m?.[1]?.trim() ?? unitFromWords(label);
    if (!unit) throw new InputError('no-unit', `file ${file}: satellite column '${label}' has no unit`, grid.where(Math.max(head, 0), c), "Write the unit in brackets at the end of the heading, such as 'Employment (FTE)', or name it in the heading's words (jobs, persons, FTE, tonnes)");
    const values = Float64Array.from(rows, (r) => (grid.kind(r, c) === NUMBER ? grid.rows[r]!.values[c]! : 0));
    satellites.push({ code: normalizeCode(label) || `C${c + 1}`, label, unit, values });
  }
  if (!satellites.length) throw new InputError('no-rows', `file ${file}: no column of numbers beside the sector codes`, { file }, 'Give one or more value columns beside the codes');
  const codes = rows.map((r) => normalizeCode(grid.text(r, codeCol)));
  return {
    satellites,
    sectors: { codes, labels: codes },
    orientation: 'sectors-down',
    mapping: { format: 'ripplewise-layout', version: 1, kind: 'matrix', shape: 'wide', file, rows: [], columns: [], output: { from: 'assumed' }, blanks: 'zero' } as LayoutMapping,
    findings: [{ code: 'satellite-columns', severity: 'note', message: `file ${file}: sector codes read from column ${codeCol + 1}, values from ${satellites.map((x) => `'${x.label}' (unit ${x.unit})`).join(', ')}`, where: { file } }],
  };
}

/** Read satellite rows from a sheet. */
export function readSatellites(grid: Grid, options: SatelliteOptions = {}): SatelliteRead {
  let s: ReturnType<typeof detectStructure>;
  try {
    s = detectStructure(grid, options.mapping);
  } catch (e) {
    if (e instanceof InputError && e.code === 'no-numbers' && options.sectors && !options.mapping) return readSatelliteColumns(grid, options.sectors);
    throw e;
  }
  const block = s.block;
  const file = grid.file;
  const unitRow = block.rows.findIndex((e) => /^units?$/i.test(e.code));
  let orientation = options.orientation;
  if (!orientation) {
    if (options.sectors) {
      const set = new Set(options.sectors.codes);
      const across = block.cols.filter((e) => set.has(e.code)).length;
      const down = block.rows.filter((e) => set.has(e.code)).length;
      orientation = across >= down ? 'sectors-across' : 'sectors-down';
    } else orientation = unitRow >= 0 ? 'sectors-down' : 'sectors-across';
  }
  const base = { kind: 'matrix' as const, ...(options.mapping ? { mapping: options.mapping } : {}), ...(options.blanks ? { blanks: options.blanks } : {}), ...(options.zeroTexts ? { zeroTexts: options.zeroTexts } : {}) };
  const unitTexts = new Map<number, string>();
  let rows = block.rows;
  if (unitRow >= 0) {
    for (let j = 0; j < block.cols.length; j++) {
      const t = block.text(unitRow, j).trim();
      if (t) unitTexts.set(j, t);
    }
    rows = block.rows.filter((_, i) => i !== unitRow);
  }
  const b: Block = rows === block.rows ? block : Object.assign(Object.create(Object.getPrototypeOf(block)), block, { rows });
  const c = classify(b, base);
  const sr = c.rowRoles.map((r, i) => (r === 'sector' ? i : -1)).filter((i) => i >= 0);
  const sc = c.colRoles.map((r, j) => (r === 'sector' ? j : -1)).filter((j) => j >= 0);
  const rowO = roleOverrides(options.mapping?.rows, ROW_ROLES, 'rows');
  const satellites: Satellite[] = [];
  let sectors: Axis;
  const noUnit = (code: string, label: string, where: object) =>
    new InputError('no-unit', `file ${file}: satellite '${code}'${label !== code ? ` ('${label}')` : ''} has no unit`, { file, ...where }, "Add a unit column headed 'unit' (or a row headed 'unit'), write the unit in brackets at the end of the label, such as 'Employment (jobs)', or give it in the mapping");
  if (orientation === 'sectors-across') {
    sectors = { codes: sc.map((j) => b.cols[j]!.code), labels: sc.map((j) => b.cols[j]!.label) };
    for (const i of sr) {
      const e = b.rows[i]!;
      const unit = rowO.byCode.get(e.code)?.unit ?? e.unit ?? e.unitInLabel ?? unitFromWords(e.label);
      if (!unit) throw noUnit(e.code, e.label, e.where ?? {});
      satellites.push({ code: e.code, label: e.label, unit, values: readCells(b, [i], sc, `satellite row '${e.code}'`, base) });
    }
  } else {
    sectors = { codes: sr.map((i) => b.rows[i]!.code), labels: sr.map((i) => b.rows[i]!.label) };
    for (const j of sc) {
      const e = b.cols[j]!;
      const m = /[[(]([^\])[(]+)[\])]\s*$/.exec(e.label);
      const unit = unitTexts.get(j) ?? m?.[1]?.trim() ?? unitFromWords(e.label);
      if (!unit) throw noUnit(e.code, e.label, e.where ?? {});
      satellites.push({ code: e.code, label: e.label, unit, values: readCells(b, sr, [j], `satellite column '${e.code}'`, base) });
    }
  }
  if (!satellites.length) throw new InputError('no-rows', `file ${file}: no satellite rows were found`, { file }, 'Check the sheet, or give the layout in the mapping');
  return { satellites, sectors, orientation, mapping: mappingOf(b, c, 'matrix', base, { shape: 'wide' }), findings: [...s.findings, ...c.findings] };
}

/** A table with satellite rows added, aligned on sector codes. */
export function attachSatellites(t: Table, read: Pick<SatelliteRead, 'satellites' | 'sectors'>): Table {
  const index = new Map(t.sectors.codes.map((c, i) => [c, i]));
  const unknown = read.sectors.codes.filter((c) => !index.has(c));
  if (unknown.length) {
    throw new InputError('unknown-sector', `the satellite sheet has ${unknown.length} sector code${unknown.length > 1 ? 's' : ''} that the table does not: ${unknown.slice(0, 10).map((c) => `'${c}'`).join(', ')}`, { sectors: unknown }, 'Use the table\'s sector codes in the satellite sheet, or aggregate it first');
  }
  const have = new Set(read.sectors.codes);
  const missing = t.sectors.codes.filter((c) => !have.has(c));
  if (missing.length) {
    throw new InputError('missing-sector', `the satellite sheet has no values for ${missing.length} sector${missing.length > 1 ? 's' : ''} of the table: ${missing.slice(0, 10).map((c) => `'${c}'`).join(', ')}`, { sectors: missing }, 'Give a value (zero if none) for every sector');
  }
  const existing = new Set(t.satellites.map((s) => s.code));
  const added = read.satellites.map((s) => {
    if (existing.has(s.code)) throw new InputError('duplicate-code', `the table already has a satellite '${s.code}'`, { sector: s.code }, 'Give the new satellite another code');
    const values = new Float64Array(t.sectors.codes.length);
    read.sectors.codes.forEach((c, k) => (values[index.get(c)!] = s.values[k]!));
    return { code: s.code, label: s.label, unit: s.unit, values };
  });
  const out: Table = { ...t, satellites: [...t.satellites, ...added] };
  validateTable(out);
  return out;
}
