/**
 * Scenarios: named sets of changes in final demand, and their validation against a table.
 *
 * A demand change names one sector and either an `amount` (in the table's money unit) or a
 * `percent` of that sector's final demand (of the `category` when one is named, else of all
 * its final demand). `localShare` (0 to 1, default 1) is the part bought inside the table's
 * economy: only amount × localShare reaches its producers. Changes may be negative (a
 * closure) and several may name the same sector; they add up.
 *
 * `checkScenario` lists every problem as findings (for an editor); `resolveScenario` throws
 * an `InputError` for the first one and otherwise returns the demand vectors.
 */
import { InputError } from './errors';
import type { Where } from './errors';
import type { Finding } from './findings';
import { finalDemandIndex } from './measures';
import type { Table } from './table';
import { moneyUnit, sectorIndex } from './table';

export const SCENARIO_ABOUT = 'A scenario: a named set of changes in final demand, each for one sector, as an amount or a percentage, with the share bought locally.';

export interface DemandChange {
  /** A sector code (or its label). */
  sector: string;
  /** The change in final demand, in the table's money unit (give this or `percent`). */
  amount?: number;
  /** The change as a percentage of the sector's final demand: 10 means +10 % (give this or `amount`). */
  percent?: number;
  /** The share bought from producers inside the economy, from 0 to 1 (default 1). */
  localShare?: number;
  /** A final-demand category (code or label): the base of a percentage, and a label for the change. */
  category?: string;
  note?: string;
}

export interface Scenario {
  name: string;
  description?: string;
  changes: DemandChange[];
}

export interface ResolvedChange {
  /** Position in the scenario, from 1. */
  position: number;
  sector: string;
  sectorIndex: number;
  category?: string;
  /** The change as given or computed from the percentage, before the local share (money units). */
  amount: number;
  localShare: number;
  /** amount × localShare: what reaches local producers. */
  local: number;
}

export interface ResolvedScenario {
  name: string;
  description?: string;
  /** The money unit of every amount. */
  unit: string;
  changes: ResolvedChange[];
  /** Δd: the local change in final demand by sector (length n), the input of every impact. */
  demand: Float64Array;
  /** The change before local shares, by sector (length n). */
  gross: Float64Array;
  /** Σ gross and Σ local. */
  totalGross: number;
  totalLocal: number;
}

interface Problem {
  code: string;
  message: string;
  where: Where;
  hint?: string;
}

function isNum(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

function problems(t: Table, s: Scenario): { list: Problem[]; resolved?: ResolvedScenario } {
  const list: Problem[] = [];
  const name = typeof s?.name === 'string' && s.name.trim() ? s.name : '';
  const label = name ? `scenario '${name}'` : 'the scenario';
  if (!name) list.push({ code: 'scenario-name', message: 'a scenario needs a name', where: {}, hint: 'Give the scenario a short name' });
  if (!s || !Array.isArray(s.changes)) {
    list.push({ code: 'scenario-changes', message: `${label} has no list of demand changes`, where: {} });
    return { list };
  }
  if (!s.changes.length) list.push({ code: 'scenario-empty', message: `${label} has no demand changes`, where: {}, hint: 'Add at least one change: a sector and an amount or a percentage' });
  const n = t.x.length;
  const k = t.F.cols;
  const demand = new Float64Array(n);
  const gross = new Float64Array(n);
  const changes: ResolvedChange[] = [];
  s.changes.forEach((c, idx) => {
    const pos = idx + 1;
    const at = `change ${pos} of ${label}`;
    const before = list.length;
    let si = -1;
    try {
      if (typeof c?.sector !== 'string' || !c.sector.trim()) throw new InputError('unknown-sector', 'no sector was named', {}, 'Name the sector by its code');
      si = sectorIndex(t, c.sector);
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      list.push({ code: 'unknown-sector', message: `${at}: ${e.message}`, where: { sector: c?.sector, text: c?.sector } });
    }
    let ci = -1;
    if (c?.category !== undefined) {
      try {
        ci = finalDemandIndex(t, c.category);
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        list.push({ code: 'unknown-final-demand-column', message: `${at}: ${e.message}`, where: { columnLabel: c.category, text: c.category } });
      }
    }
    const hasAmount = c?.amount !== undefined;
    const hasPercent = c?.percent !== undefined;
    if (hasAmount === hasPercent) {
      list.push({
        code: 'amount-or-percent',
        message: `${at}${si >= 0 ? ` ('${t.sectors.codes[si]}')` : ''}: give either an amount or a percentage, ${hasAmount ? 'not both' : 'one of them'}`,
        where: si >= 0 ? { sector: t.sectors.codes[si]! } : {},
      });
    }
    if (hasAmount && !isNum(c.amount)) {
      list.push({ code: 'bad-amount', message: `${at}: the amount ${JSON.stringify(c.amount)} is not a finite number`, where: { text: String(c.amount) } });
    }
    if (hasPercent && !isNum(c.percent)) {
      list.push({ code: 'bad-percent', message: `${at}: the percentage ${JSON.stringify(c.percent)} is not a finite number`, where: { text: String(c.percent) } });
    }
    const share = c?.localShare ?? 1;
    if (!isNum(share) || share < 0 || share > 1) {
      list.push({
        code: 'bad-local-share',
        message: `${at}: the local share ${JSON.stringify(c?.localShare)} must be a number from 0 to 1`,
        where: { text: String(c?.localShare) },
        hint: 'A local share of 0.6 means 60 % of the spending is bought from producers in the region',
      });
    }
    if (list.length > before || si < 0) return;
    let amount = c.amount ?? 0;
    if (hasPercent) {
      if (k === 0) {
        list.push({ code: 'percent-of-zero', message: `${at}: a percentage needs final demand, and the table has no final-demand columns`, where: { sector: t.sectors.codes[si]! }, hint: 'Give the change as an amount' });
        return;
      }
      let base = 0;
      if (ci >= 0) base = t.F.data[si * k + ci]!;
      else for (let j = 0; j < k; j++) base += t.F.data[si * k + j]!;
      if (base === 0) {
        const of = ci >= 0 ? `its final demand in '${t.finalDemand.codes[ci]}'` : 'its final demand';
        list.push({
          code: 'percent-of-zero',
          message: `${at}: ${c.percent} % of the final demand of '${t.sectors.codes[si]}' is undefined, because ${of} is zero`,
          where: { sector: t.sectors.codes[si]!, ...(ci >= 0 ? { columnLabel: t.finalDemand.codes[ci]! } : {}) },
          hint: 'Give the change as an amount, or choose a category in which the sector has final demand',
        });
        return;
      }
      if (!Number.isFinite(base)) {
        list.push({ code: 'non-finite', message: `${at}: the final demand of '${t.sectors.codes[si]}' is ${base}`, where: { sector: t.sectors.codes[si]! } });
        return;
      }
      amount = (c.percent! / 100) * base;
    }
    const local = amount * share;
    demand[si] += local;
    gross[si] += amount;
    const r: ResolvedChange = { position: pos, sector: t.sectors.codes[si]!, sectorIndex: si, amount, localShare: share, local };
    if (ci >= 0) r.category = t.finalDemand.codes[ci]!;
    changes.push(r);
  });
  if (list.length) return { list };
  let totalGross = 0;
  let totalLocal = 0;
  for (let i = 0; i < n; i++) {
    totalGross += gross[i]!;
    totalLocal += demand[i]!;
  }
  const resolved: ResolvedScenario = { name, unit: moneyUnit(t.meta), changes, demand, gross, totalGross, totalLocal };
  if (s.description !== undefined) resolved.description = s.description;
  return { list, resolved };
}

/** Every problem of a scenario against a table, as error findings (empty when it can be used). */
export function checkScenario(t: Table, s: Scenario): Finding[] {
  return problems(t, s).list.map((p) => {
    const f: Finding = { code: p.code, severity: 'error', message: p.hint ? `${p.message}. ${p.hint}` : p.message, where: p.where };
    return f;
  });
}

/** The demand vectors of a scenario; an `InputError` for the first problem found. */
export function resolveScenario(t: Table, s: Scenario): ResolvedScenario {
  const { list, resolved } = problems(t, s);
  if (list.length || !resolved) {
    const p = list[0]!;
    const more = list.length > 1 ? ` (and ${list.length - 1} more problem${list.length > 2 ? 's' : ''})` : '';
    throw new InputError(p.code, `${p.message}${more}`, p.where, p.hint);
  }
  return resolved;
}
