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
import type { Grid } from './grid';
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

/** Read satellite rows from a sheet. */
export function readSatellites(grid: Grid, options: SatelliteOptions = {}): SatelliteRead {
  const s = detectStructure(grid, options.mapping);
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
      const unit = rowO.byCode.get(e.code)?.unit ?? e.unit ?? e.unitInLabel;
      if (!unit) throw noUnit(e.code, e.label, e.where ?? {});
      satellites.push({ code: e.code, label: e.label, unit, values: readCells(b, [i], sc, `satellite row '${e.code}'`, base) });
    }
  } else {
    sectors = { codes: sr.map((i) => b.rows[i]!.code), labels: sr.map((i) => b.rows[i]!.label) };
    for (const j of sc) {
      const e = b.cols[j]!;
      const m = /[[(]([^\])[(]+)[\])]\s*$/.exec(e.label);
      const unit = unitTexts.get(j) ?? m?.[1]?.trim();
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
