/**
 * The Leontief price model (cost push). Prices are indices, 1 in the table's year; each
 * sector's price covers its intermediate inputs at their prices and its primary cost per unit
 * of output:
 *
 *   p′ = p′A + v′        so  p′ = v′L       (one transposed solve)
 *   Δp′ = Δv′L
 *
 * where v is value added per unit of output (all value-added rows, plus imported inputs per
 * unit when the table has an imports row). In a balanced table v′ = i′ − i′A, so p′ = i′: the
 * base prices are 1 (when a table has no value-added rows the base is taken as 1 − i′A).
 *
 * Shocks, added into Δv:
 * - value added: a percentage rise of one value-added row (a wage rise) or of all of them, in
 *   one sector or every sector, or an absolute change per unit of output (a tax of 0.02 per
 *   unit of output);
 * - imports (when the table has an imports row): a percentage rise in the price of imported
 *   inputs, the same for every using sector or by sector: Δvⱼ = π (importsⱼ / xⱼ).
 *
 * Quantities and margins are held fixed: the model passes costs on in full and says nothing
 * about demand falling as prices rise.
 */
import { InputError } from './errors';
import { noOutputSectors } from './multipliers';
import type { Finding } from './findings';
import type { LeontiefModel } from './leontief';
import { axisCopy, CAUTIONS, valueAddedIndex } from './measures';
import type { Axis, Table } from './table';
import { sectorIndex } from './table';

export const PRICE_ABOUT =
  'Leontief price model: how much each sector\'s price index (1 in the table\'s year) rises when primary costs per unit of output rise, with the costs passed on in full through the supply chain and quantities held fixed.';

export interface ValueAddedChange {
  /** A sector code (or label); absent: every sector. */
  sector?: string;
  /** A value-added row (code or label); absent: all value-added rows. */
  row?: string;
  /** A percentage rise of that value added: 5 means +5 % (give this or `perUnit`). */
  percent?: number;
  /** An absolute change in value added per unit of output (give this or `percent`). */
  perUnit?: number;
}

export interface ImportPriceChange {
  sector: string;
  /** The rise in the price of that sector's imported inputs, in percent. */
  percent: number;
}

export interface PriceShock {
  valueAdded?: ValueAddedChange[];
  /** The rise in the price of imported inputs in percent: one number for every using sector, or by sector. */
  importPrice?: number | ImportPriceChange[];
}

export interface PriceResult {
  about: string;
  sectors: Axis;
  /** Δv: the change in primary cost per unit of output, by sector. */
  costChange: Float64Array;
  /** Base price indices p′ = v′L (1 in a balanced table). */
  base: Float64Array;
  /** Δp′ = Δv′L: the change in each price index (index points). */
  change: Float64Array;
  /** base + change. */
  index: Float64Array;
  /** 100 Δp ÷ base: the percentage rise of each price. */
  percent: Float64Array;
  findings: Finding[];
  cautions: readonly string[];
}

function isNum(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

export function priceModel(t: Table, model: LeontiefModel, shock: PriceShock = {}): PriceResult {
  const n = t.x.length;
  if (model.n !== n) throw new InputError('bad-size', `the model has ${model.n} sectors but the table has ${n}`);
  const findings: Finding[] = [];
  const m = t.V.rows;
  // Base primary cost per unit of output.
  const v = new Float64Array(n);
  if (m > 0 || t.imports) {
    for (let j = 0; j < n; j++) {
      if (!(t.x[j]! > 0)) continue;
      let s = 0;
      for (let r = 0; r < m; r++) s += t.V.data[r * n + j]!;
      if (t.imports) s += t.imports[j]!;
      v[j] = s / t.x[j]!;
    }
  } else {
    for (let j = 0; j < n; j++) {
      let s = 1;
      for (let i = 0; i < n; i++) s -= model.A.data[i * n + j]!;
      v[j] = s;
    }
    findings.push({ code: 'implied-value-added', severity: 'note', message: 'the table has no value-added or imports rows, so the base prices take value added per unit as 1 minus the column sums of A' });
  }
  const dv = new Float64Array(n);
  (shock.valueAdded ?? []).forEach((c, k) => {
    const at = `value-added change ${k + 1}`;
    const hasP = c.percent !== undefined;
    const hasU = c.perUnit !== undefined;
    if (hasP === hasU) throw new InputError('percent-or-per-unit', `${at}: give either a percentage or a change per unit of output, ${hasP ? 'not both' : 'one of them'}`, c.sector ? { sector: c.sector } : {});
    const val = hasP ? c.percent : c.perUnit;
    if (!isNum(val)) throw new InputError('bad-amount', `${at}: ${JSON.stringify(val)} is not a finite number`, { text: String(val) });
    const sectors = c.sector === undefined ? [...Array(n).keys()] : [sectorIndex(t, c.sector)];
    if (hasP) {
      if (!m) throw new InputError('no-value-added', `${at}: the table has no value-added rows to raise by a percentage`, {}, 'Give the change per unit of output instead');
      const rows = c.row === undefined ? [...Array(m).keys()] : [valueAddedIndex(t, c.row)];
      for (const j of sectors) {
        if (!(t.x[j]! > 0)) continue;
        let s = 0;
        for (const r of rows) s += t.V.data[r * n + j]!;
        dv[j] += ((val / 100) * s) / t.x[j]!;
      }
    } else {
      if (c.row !== undefined) valueAddedIndex(t, c.row);
      for (const j of sectors) dv[j] += val;
    }
  });
  if (shock.importPrice !== undefined) {
    if (!t.imports) {
      throw new InputError('no-imports', 'the table has no imports row, so a price shock on imported inputs cannot be passed on', {}, 'Add a row of imported intermediate inputs by using sector to the table');
    }
    const pi = new Float64Array(n);
    if (typeof shock.importPrice === 'number') {
      if (!isNum(shock.importPrice)) throw new InputError('bad-percent', `the import price rise ${shock.importPrice} is not a finite number`);
      pi.fill(shock.importPrice / 100);
    } else {
      shock.importPrice.forEach((c, k) => {
        if (!isNum(c.percent)) throw new InputError('bad-percent', `import price change ${k + 1} ('${c.sector}'): ${JSON.stringify(c.percent)} is not a finite number`, { sector: c.sector });
        pi[sectorIndex(t, c.sector)] += c.percent / 100;
      });
    }
    for (let j = 0; j < n; j++) if (t.x[j]! > 0) dv[j] += (pi[j]! * t.imports[j]!) / t.x[j]!;
  }
  const base = model.weighted(v);
  const change = model.weighted(dv);
  const index = new Float64Array(n);
  const percent = new Float64Array(n);
  let worst = 0;
  let worstAt = 0;
  const none = noOutputSectors(t.x);
  for (const j of none) base[j] = change[j] = NaN;
  for (let j = 0; j < n; j++) {
    index[j] = base[j]! + change[j]!;
    percent[j] = base[j]! !== 0 ? (100 * change[j]!) / base[j]! : 0;
    if (t.x[j] === 0) continue;
    const gap = Math.abs(base[j]! - 1);
    if (gap > worst) {
      worst = gap;
      worstAt = j;
    }
  }
  if (worst > 1e-6) {
    findings.push({
      code: 'base-price',
      severity: 'warning',
      message: `the base price index is not 1 in every sector (worst: '${t.sectors.codes[worstAt]}' ${base[worstAt]!.toPrecision(6)}): the columns of the table do not balance, so value added plus imports per unit differs from 1 minus the column sums of A`,
      where: { sector: t.sectors.codes[worstAt]! },
      data: { worst },
    });
  }
  if (none.length) {
    findings.push({
      code: 'no-output',
      severity: 'note',
      message: `no output in ${none.length} sector${none.length > 1 ? 's' : ''} (${none
        .slice(0, 10)
        .map((j) => `'${t.sectors.codes[j]}'`)
        .join(', ')}${none.length > 10 ? ', …' : ''}): no costs per unit of output, so no price index; left blank and out of the balance check`,
      where: { sectors: none.map((j) => t.sectors.codes[j]!) },
    });
  }
  return { about: PRICE_ABOUT, sectors: axisCopy(t.sectors), costChange: dv, base, change, index, percent, findings, cautions: CAUTIONS };
}
