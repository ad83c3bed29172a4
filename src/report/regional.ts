/**
 * Report sections of regional tables: the regionalisation (method, δ, λ, the regional file's
 * SHA-256, quotients by sector, the sectors capped at 1, national and regional output
 * multipliers side by side), the two-region split, and a balancing by RAS or GRAS (iterations,
 * the largest remaining deviation, targets that cannot be met).
 */
import type { Axis } from '../../engine/table';
import type { BalanceResult, Regionalised, TwoRegionSplit } from '../../engine/regional/index';
import { GRAS_ABOUT, METHOD_NAMES, RAS_ABOUT, REGIONAL_CAUTIONS, TWO_REGION_ABOUT } from '../../engine/regional/index';
import type { Cell, Column, NumberStyle, ReportTable, Section } from './model';
import { num } from './model';

const text = (key: string, label: string): Column => ({ key, label, type: 'text' });
const number = (key: string, label: string, unit: string, style: NumberStyle): Column => ({ key, label, type: 'number', unit, style });

export interface RegionalSectionInput {
  result: Regionalised;
  /** Output multipliers (column sums of L) of the national and the regional table. */
  national: Float64Array;
  regional: Float64Array;
}

/** The regionalisation: quotients, capped sectors, multipliers side by side, provenance and cautions. */
export function regionalSection(input: RegionalSectionInput): Section {
  const r = input.result;
  const p = r.provenance;
  const s = r.sectors;
  const b = r.basis;
  const rowMethod = p.method === 'slq' || p.method === 'sdp';
  const cappedCells = new Map(r.capped.map((c) => [c.code, c.cells]));
  const columns: Column[] = [
    text('code', 'Code'),
    text('sector', 'Sector'),
    number('region', `Region (${b.kind})`, b.unit, 'amount'),
    number('nation', `Nation (${b.kind})`, b.unit, 'amount'),
    number('slq', 'SLQ', 'ratio', 'ratio'),
  ];
  if (p.method === 'sdp') columns.push(number('rpc', 'Supply ÷ demand (before the cap)', 'ratio', 'ratio'));
  columns.push(number('local', 'Share of the region’s purchases met inside it', 'ratio', 'ratio'), number('capped', 'Cells capped at 1', 'cells', 'count'), number('multN', 'Output multiplier, national', 'ratio', 'multiplier'), number('multR', 'Output multiplier, regional', 'ratio', 'multiplier'), number('ratio', 'Regional ÷ national', 'ratio', 'ratio'));
  const rows: Cell[][] = s.codes.map((c, i) => {
    const row: Cell[] = [c, s.labels[i]!, num(b.region[i]!), num(b.nation[i]!), num(r.slq[i]!)];
    if (p.method === 'sdp') row.push(num(r.sectorQuotient[i]!));
    row.push(num(r.localShare[i]!), cappedCells.get(c) ?? 0, num(input.national[i]!), num(input.regional[i]!), num(input.national[i]! > 0 ? input.regional[i]! / input.national[i]! : NaN));
    return row;
  });
  const table: ReportTable = {
    id: 'regional-quotients',
    title: `Quotients and multipliers by sector (${METHOD_NAMES[p.method]})`,
    about: 'Each sector’s location quotient, the share of the region’s purchases of its product met inside the region, and the output multipliers of the national and the regional table.',
    columns,
    rows,
    notes: [
      rowMethod ? 'The quotient applies to a whole row: every buyer takes the same share of the product from inside the region.' : 'The quotient applies cell by cell (seller and buyer); “cells capped at 1” counts the cells of the seller’s row where it was above 1.',
      'An output multiplier is the output of all sectors per unit of final demand for the sector’s product (column sums of the Leontief inverse); the regional one counts the region’s own output only.',
    ],
  };
  const paragraphs = [
    `Method: ${METHOD_NAMES[p.method]}${p.delta !== undefined ? `, δ = ${p.delta}, λ = ${p.lambda!.toFixed(6)}` : ''}; basis: ${b.kind} (${b.unit}); the region has ${(p.share * 100).toFixed(2)} % of the nation's ${b.kind}.`,
    p.file ? `Regional file: ${p.file}, SHA-256 ${p.sha256}.` : 'Regional values: given directly, not from a file.',
    p.capped.length ? `Quotient capped at 1 for ${p.capped.length} sector${p.capped.length > 1 ? 's' : ''}: ${p.capped.join(', ')}.` : 'No quotient was capped at 1.',
  ];
  const sumN = input.national.reduce((a, v) => a + v, 0) / Math.max(input.national.length, 1);
  const sumR = input.regional.reduce((a, v) => a + v, 0) / Math.max(input.regional.length, 1);
  return {
    id: 'regional',
    kind: 'regional',
    title: `Regional table: ${b.name ?? 'the region'}`,
    about: r.about,
    sheet: 'Regional',
    paragraphs,
    tables: [table],
    charts: [{ kind: 'multipliers-by-sector', id: 'regional-multipliers-chart', title: 'Output multipliers, national and regional', unit: 'ratio', categories: [...s.labels], series: [{ label: 'National', values: Array.from(input.national, (v) => num(v)) }, { label: `Regional (${p.method.toUpperCase()})`, values: Array.from(input.regional, (v) => num(v)) }], reference: 1 }],
    headlines: [
      { label: 'Mean output multiplier, national', value: num(sumN), unit: 'ratio', style: 'multiplier' },
      { label: `Mean output multiplier, regional (${p.method.toUpperCase()})`, value: num(sumR), unit: 'ratio', style: 'multiplier', note: 'quotient methods tend to overstate it' },
    ],
    cautions: [...REGIONAL_CAUTIONS],
  };
}

/** The two-region split of one unit of final demand for each sector of the region. */
export function twoRegionSection(sectors: Axis, splits: readonly TwoRegionSplit['totals'][]): Section {
  const columns: Column[] = [text('code', 'Code'), text('sector', 'Sector'), number('intra', 'Intraregional', 'ratio', 'multiplier'), number('feedback', 'Interregional feedback', 'ratio', 'multiplier'), number('spill', 'Spillover to the rest of the nation', 'ratio', 'multiplier'), number('nation', 'Whole nation', 'ratio', 'multiplier')];
  const rows: Cell[][] = sectors.codes.map((c, j) => [c, sectors.labels[j]!, num(splits[j]!.intraregional), num(splits[j]!.feedback), num(splits[j]!.spillover), num(splits[j]!.nation)]);
  return {
    id: 'two-region',
    kind: 'regional',
    title: 'Two regions: the region and the rest of the nation',
    about: TWO_REGION_ABOUT,
    sheet: 'Two regions',
    paragraphs: ['For one unit of final demand for each sector’s product in the region: output in the region without trade back (intraregional), the extra regional output that comes back through the rest of the nation (feedback), and the output raised in the rest of the nation (spillover). The whole nation’s output equals the national model’s (Miller & Blair 2009, ch. 3).'],
    tables: [{ id: 'two-region-split', title: 'Output per unit of regional final demand, by part', columns, rows, notes: ['The rest of the nation is estimated by the same method as the region, from the national values less the regional ones.'] }],
    charts: [],
    headlines: [],
    cautions: [...REGIONAL_CAUTIONS],
  };
}

/** A balancing by RAS or GRAS: what was reached, and the targets that cannot be met. */
export function balanceSection(b: BalanceResult, rows: Axis, cols: Axis): Section {
  const paragraphs = [
    `${b.method.toUpperCase()}: ${b.converged ? 'converged' : 'did not converge'} in ${b.iterations} iteration${b.iterations === 1 ? '' : 's'}; the largest remaining relative deviation of a row or column sum from its target is ${b.maxDeviation.toExponential(2)} (${b.worst.axis} '${b.worst.code}'), against a tolerance of ${b.tolerance}.`,
  ];
  const tables: ReportTable[] = [];
  if (b.infeasible.length) {
    tables.push({
      id: 'balance-infeasible',
      title: 'Targets that cannot be met',
      columns: [text('axis', 'Row or column'), text('code', 'Code'), text('kind', 'Why'), text('message', 'Message')],
      rows: b.infeasible.map((f) => [f.axis, f.code, f.kind, f.message]),
      notes: ['Change these targets (or the cells held fixed) and balance again; nothing was scaled.'],
    });
  }
  const mult = (v: Float64Array, axis: Axis, id: string, title: string): ReportTable => ({ id, title, columns: [text('code', 'Code'), text('label', 'Title'), number('factor', 'Factor', 'ratio', 'ratio')], rows: axis.codes.map((c, i) => [c, axis.labels[i] ?? c, num(v[i]!)]), notes: [b.method === 'gras' ? 'Positive cells are multiplied by rᵢsⱼ and negative ones by 1/(rᵢsⱼ).' : 'Every cell is multiplied by rᵢsⱼ.'] });
  if (!b.infeasible.length) tables.push(mult(b.r, rows, 'balance-r', 'Row factors r'), mult(b.s, cols, 'balance-s', 'Column factors s'));
  return {
    id: 'balance',
    kind: 'balance',
    title: `Balanced by ${b.method.toUpperCase()}`,
    about: b.method === 'gras' ? GRAS_ABOUT : RAS_ABOUT,
    sheet: 'Balance',
    paragraphs,
    tables,
    charts: [],
    headlines: [],
    cautions: ['A balanced table is an estimate: scaling keeps the old structure where the new totals do not say otherwise; survey data on the cells are better where they exist.'],
  };
}
