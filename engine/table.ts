/**
 * The accounting table: the symmetric input-output table that every model starts from.
 *
 * - `sectors`: n codes and labels (rows and columns of the intermediate square).
 * - `Z`: intermediate flows, n × n; zᵢⱼ is what sector j buys from sector i.
 * - `finalDemand` and `F`: k named final-demand columns, F is n × k.
 * - `valueAdded` and `V`: m named value-added rows (primary inputs), V is m × n.
 * - `imports`: an optional row of imported intermediate inputs by using sector (length n);
 *   like a value-added row it is a primary input in the column balance.
 * - `x`: total output by sector.
 * - `satellites`: rows of non-monetary quantities by sector (jobs, emissions, water), each
 *   with its unit.
 * - `meta`: currency, unit scale, year, region, price basis, source.
 *
 * Rows of V are the primary inputs. Each may carry a class (`valueAdded.classes`), the trade's
 * class of that row: compensation of employees, operating surplus and mixed income, other taxes
 * less subsidies on production (together value added at basic prices), or a primary input that
 * is not value added: imports, taxes less subsidies on products, sales by final buyers. A row
 * without a class counts as value added, as before classes existed. Final-demand columns may
 * carry a class too (`finalDemand.classes`): households, government, non-profit institutions
 * serving households, investment, inventories, exports.
 *
 * Balances (common practice): row i, Σⱼ zᵢⱼ + Σ fᵢ = xᵢ; column j, Σᵢ zᵢⱼ + Σ vⱼ (+ importsⱼ) = xⱼ.
 *
 * A table read from technical coefficients without outputs carries `meta.outputAssumed`:
 * x is 1 for every sector, so Z holds A itself and value-added rows hold coefficients.
 */
import { InputError } from './errors';
import type { Matrix } from './linalg/matrix';
import { fromRows, zeros } from './linalg/matrix';

export interface Axis {
  codes: string[];
  labels: string[];
}

/**
 * The class of a primary-input row (common practice; the 2008 SNA's breakdown of value added
 * at basic prices and of the other rows between intermediate use and output):
 * - `compensation`: compensation of employees (D1), the usual labour income;
 * - `operating-surplus`: gross operating surplus and mixed income (B2g, B3g);
 * - `production-taxes`: other taxes less subsidies on production (D29 − D39);
 * - `value-added`: value added or a part of it whose component is not known;
 * - `product-taxes`: taxes less subsidies on products (D21 − D31), not value added;
 * - `imports`: imported intermediate inputs by origin or kind, with their duties, not value added;
 * - `final-buyers`: sales by final buyers and other purchases adjustments, not value added;
 * - `other`: any other primary input, not value added.
 */
export type InputClass =
  | 'compensation'
  | 'operating-surplus'
  | 'production-taxes'
  | 'value-added'
  | 'product-taxes'
  | 'imports'
  | 'final-buyers'
  | 'other';

export const INPUT_CLASSES: readonly InputClass[] = [
  'compensation',
  'operating-surplus',
  'production-taxes',
  'value-added',
  'product-taxes',
  'imports',
  'final-buyers',
  'other',
];

/** The classes whose rows make value added at basic prices (a row without a class counts too). */
export const VALUE_ADDED_CLASSES: readonly InputClass[] = ['compensation', 'operating-surplus', 'production-taxes', 'value-added'];

/**
 * The class of a final-demand column (common practice; 2008 SNA P3 by sector, P5, P6):
 * households (P3 S14), government (P3 S13), non-profit institutions serving households
 * (P3 S15), investment (gross fixed capital formation, P51g), inventories (changes in
 * inventories and valuables, P52, P53), exports (P6), other.
 */
export type DemandClass = 'households' | 'government' | 'npish' | 'investment' | 'inventories' | 'exports' | 'other';

export const DEMAND_CLASSES: readonly DemandClass[] = ['households', 'government', 'npish', 'investment', 'inventories', 'exports', 'other'];

/** An axis whose entries may each carry a class (`undefined` where none is known). */
export interface ClassedAxis<C extends string> extends Axis {
  classes?: (C | undefined)[];
}

/** True when primary-input row `a` of the table counts as value added (its class, or no class). */
export function isValueAddedRow(t: { valueAdded: ClassedAxis<InputClass> }, a: number): boolean {
  const c = t.valueAdded.classes?.[a];
  return c === undefined || VALUE_ADDED_CLASSES.includes(c);
}

export interface Satellite {
  code: string;
  label: string;
  /** The unit of one value, such as `jobs`, `FTE`, `t CO2e`, `ML`. */
  unit: string;
  /** The quantity by sector (length n), in `unit`. */
  values: Float64Array;
}

export interface TableMeta {
  title?: string;
  /** An ISO 4217 code such as `USD`, or any currency name. */
  currency?: string;
  /** The factor every money value is multiplied by: 1e6 for a table in millions. */
  scale?: number;
  /** The scale in words: `millions`, `thousands`. */
  scaleLabel?: string;
  year?: number;
  region?: string;
  /** Basic prices, producers' prices, purchasers' prices... */
  priceBasis?: string;
  source?: string;
  /** True when the table came from coefficients without outputs (x = 1 per sector). */
  outputAssumed?: boolean;
  /**
   * The unit the published figures are rounded to (0.1 for one decimal, 1 for whole numbers).
   * When absent, the checks find it from the figures themselves; balances that miss by no more
   * than the rounding of their parts allows are not flagged.
   */
  rounding?: number;
  /** True for invented data (the demo). */
  invented?: boolean;
  notes?: string[];
}

export interface Table {
  sectors: Axis;
  Z: Matrix;
  finalDemand: ClassedAxis<DemandClass>;
  F: Matrix;
  /** The primary-input rows: value added and, when classed so, imports, product taxes and the like. */
  valueAdded: ClassedAxis<InputClass>;
  V: Matrix;
  imports?: Float64Array;
  x: Float64Array;
  satellites: Satellite[];
  meta: TableMeta;
}

/** A table written as plain arrays (tests, JSON, the demo). */
export interface PlainTable {
  sectors: { codes: string[]; labels?: string[] };
  Z: number[][];
  finalDemand?: { codes: string[]; labels?: string[]; classes?: (DemandClass | null)[]; values: number[][] };
  valueAdded?: { codes: string[]; labels?: string[]; classes?: (InputClass | null)[]; values: number[][] };
  imports?: number[];
  /** When absent, x is taken as the row totals Σⱼ zᵢⱼ + Σ fᵢ. */
  x?: number[];
  satellites?: { code: string; label?: string; unit: string; values: number[] }[];
  meta?: TableMeta;
}

/** Build a table from plain arrays, with the structural checks of `validateTable`. */
export function makeTable(p: PlainTable): Table {
  const n = p.sectors.codes.length;
  const Z = fromRows(p.Z, 'intermediate flows Z');
  const fd = p.finalDemand ?? { codes: [], values: p.Z.map(() => []) };
  const va = p.valueAdded ?? { codes: [], values: [] };
  const F = fd.codes.length === 0 ? zeros(Z.rows, 0) : fromRows(fd.values, 'final demand F');
  const V = va.codes.length === 0 ? zeros(0, Z.cols) : fromRows(va.values, 'value added V');
  let x: Float64Array;
  if (p.x) x = Float64Array.from(p.x);
  else {
    x = new Float64Array(Z.rows);
    for (let i = 0; i < Z.rows; i++) {
      let s = 0;
      for (let j = 0; j < Z.cols; j++) s += Z.data[i * Z.cols + j]!;
      for (let j = 0; j < F.cols; j++) s += F.data[i * F.cols + j]!;
      x[i] = s;
    }
  }
  const t: Table = {
    sectors: { codes: [...p.sectors.codes], labels: p.sectors.labels ? [...p.sectors.labels] : [...p.sectors.codes] },
    Z,
    finalDemand: { codes: [...fd.codes], labels: fd.labels ? [...fd.labels] : [...fd.codes] },
    F,
    valueAdded: { codes: [...va.codes], labels: va.labels ? [...va.labels] : [...va.codes] },
    V,
    x,
    satellites: (p.satellites ?? []).map((s) => ({
      code: s.code,
      label: s.label ?? s.code,
      unit: s.unit,
      values: Float64Array.from(s.values),
    })),
    meta: { ...(p.meta ?? {}) },
  };
  if (p.imports) t.imports = Float64Array.from(p.imports);
  if (fd.classes) t.finalDemand.classes = fd.classes.map((c) => c ?? undefined);
  if (va.classes) t.valueAdded.classes = va.classes.map((c) => c ?? undefined);
  if (n !== Z.rows) {
    throw new InputError('bad-size', `there are ${n} sector codes but Z has ${Z.rows} rows`);
  }
  validateTable(t);
  return t;
}

/** The plain form of a table (for JSON and project files). */
export function toPlain(t: Table): PlainTable {
  const rows = (m: Matrix) => {
    const out: number[][] = [];
    for (let i = 0; i < m.rows; i++) out.push(Array.from(m.data.subarray(i * m.cols, (i + 1) * m.cols)));
    return out;
  };
  const p: PlainTable = {
    sectors: { codes: [...t.sectors.codes], labels: [...t.sectors.labels] },
    Z: rows(t.Z),
    finalDemand: { codes: [...t.finalDemand.codes], labels: [...t.finalDemand.labels], values: rows(t.F) },
    valueAdded: { codes: [...t.valueAdded.codes], labels: [...t.valueAdded.labels], values: rows(t.V) },
    x: Array.from(t.x),
    satellites: t.satellites.map((s) => ({ code: s.code, label: s.label, unit: s.unit, values: Array.from(s.values) })),
    meta: { ...t.meta },
  };
  if (t.imports) p.imports = Array.from(t.imports);
  if (t.finalDemand.classes) p.finalDemand!.classes = t.finalDemand.classes.map((c) => c ?? null);
  if (t.valueAdded.classes) p.valueAdded!.classes = t.valueAdded.classes.map((c) => c ?? null);
  return p;
}

/**
 * Structural checks that make a table unusable if they fail: sizes that disagree, no sectors,
 * duplicate or empty codes. Each failure is an `InputError` that names what is wrong. (Numeric
 * problems such as NaN, imbalance or non-productivity are findings of `checks`.)
 */
export function validateTable(t: Table): void {
  const n = t.sectors.codes.length;
  if (n === 0) throw new InputError('empty', 'the table has no sectors', {}, 'A table needs at least one sector row and column');
  if (t.sectors.labels.length !== n) {
    throw new InputError('bad-size', `there are ${n} sector codes but ${t.sectors.labels.length} labels`);
  }
  uniqueCodes(t.sectors.codes, 'sector');
  if (t.Z.rows !== n || t.Z.cols !== n) {
    throw new InputError('bad-size', `Z must be ${n} × ${n} for ${n} sectors; it is ${t.Z.rows} × ${t.Z.cols}`);
  }
  const k = t.finalDemand.codes.length;
  if (t.finalDemand.labels.length !== k) throw new InputError('bad-size', `there are ${k} final-demand codes but ${t.finalDemand.labels.length} labels`);
  uniqueCodes(t.finalDemand.codes, 'final-demand');
  if (t.F.rows !== n || t.F.cols !== k) {
    throw new InputError('bad-size', `final demand must be ${n} × ${k}; it is ${t.F.rows} × ${t.F.cols}`);
  }
  const m = t.valueAdded.codes.length;
  if (t.valueAdded.labels.length !== m) throw new InputError('bad-size', `there are ${m} value-added codes but ${t.valueAdded.labels.length} labels`);
  uniqueCodes(t.valueAdded.codes, 'value-added');
  if (t.V.rows !== m || t.V.cols !== n) {
    throw new InputError('bad-size', `value added must be ${m} × ${n}; it is ${t.V.rows} × ${t.V.cols}`);
  }
  checkClasses(t.finalDemand, DEMAND_CLASSES, 'final-demand');
  checkClasses(t.valueAdded, INPUT_CLASSES, 'value-added');
  if (t.x.length !== n) throw new InputError('bad-size', `total output has ${t.x.length} values for ${n} sectors`);
  if (t.imports && t.imports.length !== n) throw new InputError('bad-size', `the imports row has ${t.imports.length} values for ${n} sectors`);
  const satCodes: string[] = [];
  for (const s of t.satellites) {
    if (s.values.length !== n) {
      throw new InputError('bad-size', `satellite '${s.code}' has ${s.values.length} values for ${n} sectors`, { rowLabel: s.label });
    }
    if (!s.unit || !s.unit.trim()) {
      throw new InputError('no-unit', `satellite '${s.code}' has no unit`, { rowLabel: s.label }, 'Give every satellite row a unit, such as jobs or t CO2e');
    }
    satCodes.push(s.code);
  }
  uniqueCodes(satCodes, 'satellite');
}

function checkClasses<C extends string>(axis: ClassedAxis<C>, known: readonly C[], what: string): void {
  if (!axis.classes) return;
  if (axis.classes.length !== axis.codes.length) {
    throw new InputError('bad-size', `there are ${axis.codes.length} ${what} codes but ${axis.classes.length} classes`);
  }
  axis.classes.forEach((c, i) => {
    if (c !== undefined && !known.includes(c)) {
      throw new InputError('unknown-class', `${what} '${axis.codes[i]}' has the class '${String(c)}', which is not known`, { text: String(c) }, `Use one of: ${known.join(', ')}`);
    }
  });
}

function uniqueCodes(codes: string[], what: string): void {
  const seen = new Map<string, number>();
  codes.forEach((c, i) => {
    if (typeof c !== 'string' || c.trim() === '') {
      throw new InputError('empty-code', `${what} ${i + 1} has an empty code`, { row: i + 1 });
    }
    const prev = seen.get(c);
    if (prev !== undefined) {
      throw new InputError('duplicate-code', `${what} code '${c}' appears twice (positions ${prev + 1} and ${i + 1})`, {
        sector: c,
      }, 'Each code must be unique; merge the two or give one a new code');
    }
    seen.set(c, i);
  });
}

/** The index of a sector code, or an `InputError` naming the unknown code and the nearest known ones. */
export function sectorIndex(t: { sectors: Axis }, code: string): number {
  const i = t.sectors.codes.indexOf(code);
  if (i >= 0) return i;
  const j = t.sectors.labels.findIndex((l) => l.toLowerCase() === code.toLowerCase());
  if (j >= 0) return j;
  throw new InputError('unknown-sector', `there is no sector '${code}' in the table`, { sector: code }, suggest(code, t.sectors.codes));
}

/** The index of a code on any axis, or an `InputError` that lists what exists. */
export function axisIndex(axis: Axis, code: string, what: string): number {
  const i = axis.codes.indexOf(code);
  if (i >= 0) return i;
  const j = axis.labels.findIndex((l) => l.toLowerCase() === code.toLowerCase());
  if (j >= 0) return j;
  const list = axis.codes.length ? `the table has: ${axis.codes.slice(0, 12).join(', ')}${axis.codes.length > 12 ? ', …' : ''}` : `the table has no ${what} rows or columns`;
  throw new InputError(`unknown-${what.replace(/\s+/g, '-')}`, `there is no ${what} '${code}'`, {}, list);
}

function suggest(code: string, codes: string[]): string {
  const lc = code.toLowerCase();
  const near = codes.filter((c) => c.toLowerCase().startsWith(lc.slice(0, 2))).slice(0, 5);
  return near.length ? `Did you mean ${near.map((c) => `'${c}'`).join(', ')}?` : `Known codes start with ${codes.slice(0, 5).map((c) => `'${c}'`).join(', ')}`;
}

/** Technical coefficients A = Z x̂⁻¹ (column j divided by xⱼ; a zero-output column stays zero). */
export function coefficients(t: Pick<Table, 'Z' | 'x'>): Matrix {
  const n = t.x.length;
  const A = zeros(n, n);
  const inv = new Float64Array(n);
  for (let j = 0; j < n; j++) inv[j] = t.x[j]! > 0 ? 1 / t.x[j]! : 0;
  const z = t.Z.data;
  for (let i = 0; i < n; i++) {
    const o = i * n;
    for (let j = 0; j < n; j++) A.data[o + j] = z[o + j]! * inv[j]!;
  }
  return A;
}

/** Per-unit-of-output coefficients of any row vector over sectors: vⱼ ÷ xⱼ (0 where xⱼ = 0). */
export function perUnit(values: ArrayLike<number>, x: ArrayLike<number>): Float64Array {
  const out = new Float64Array(x.length);
  for (let j = 0; j < x.length; j++) out[j] = x[j]! > 0 ? values[j]! / x[j]! : 0;
  return out;
}

/** A label for the money unit of a table, such as `USD millions`. */
export function moneyUnit(meta: TableMeta): string {
  const cur = meta.currency ?? 'currency units';
  if (meta.scaleLabel) return `${cur} ${meta.scaleLabel}`;
  if (meta.scale && meta.scale !== 1) {
    const words: Record<number, string> = { 1e3: 'thousands', 1e6: 'millions', 1e9: 'billions' };
    return `${cur} ${words[meta.scale] ?? `× ${meta.scale}`}`;
  }
  return cur;
}
