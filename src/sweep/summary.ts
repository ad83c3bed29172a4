/**
 * The summary of a merged sweep: for every table, scenario, closure setting, cv, measure and
 * effect, the total over sectors of each draw, then across the draws the mean, the 5th, 50th and
 * 95th percentiles (linear between order statistics, the engine's `percentileSorted`), the least
 * and the greatest. Gathered row by row while the merge streams the results: one number per unit,
 * measure and effect is kept, never the rows.
 */
import { percentileSorted, UNCERTAINTY_CAUTIONS } from '../../engine/uncertainty';
import type { Cell, Column, Section } from '../report/model';
import { num } from '../report/model';
import type { RowBuffer } from './parquet';

export const SUMMARY_ABOUT =
  'Totals over sectors of every unit of the sweep, and their spread across the Monte Carlo draws: the 5th percentile, the median and the 95th percentile of each scenario, closure setting and coefficient of variation.';

/** At most this many rows go to the report's summary table; the combined Parquet file has every unit. */
export const MAX_SUMMARY_ROWS = 5000;

interface Group {
  table: string;
  scenario: string;
  household: string;
  cv: number;
  measure: string;
  effect: string;
  unit: string;
  values: number[];
}

export interface SummaryRow extends Omit<Group, 'values'> {
  draws: number;
  mean: number;
  p5: number;
  p50: number;
  p95: number;
  min: number;
  max: number;
}

export class SweepSummary {
  private groups = new Map<string, Group>();
  private unit = -1;
  private current = new Map<string, { g: Group; sum: number }>();
  units = 0;
  rows = 0;

  /** Add rows (in unit order). */
  add(b: RowBuffer): void {
    const t = b.text;
    for (let r = 0; r < b.length; r++) {
      const u = b.work_unit[r]!;
      if (u !== this.unit) this.close(u);
      const key = `${t.measure[r]}\u0000${t.effect[r]}`;
      let c = this.current.get(key);
      if (!c) {
        const gk = [t.table[r], t.scenario[r], t.household[r], b.cv[r], t.measure[r], t.effect[r]].join('\u0000');
        let g = this.groups.get(gk);
        if (!g) {
          g = { table: t.table[r]!, scenario: t.scenario[r]!, household: t.household[r]!, cv: b.cv[r]!, measure: t.measure[r]!, effect: t.effect[r]!, unit: t.unit[r]!, values: [] };
          this.groups.set(gk, g);
        }
        c = { g, sum: 0 };
        this.current.set(key, c);
      }
      c.sum += b.value[r]!;
      this.rows++;
    }
  }

  private close(next: number): void {
    for (const { g, sum } of this.current.values()) g.values.push(sum);
    this.current.clear();
    if (next >= 0) this.units++;
    this.unit = next;
  }

  /** The rows of the summary, in the order first seen. */
  finish(): SummaryRow[] {
    this.close(-1);
    return [...this.groups.values()].map((g) => {
      const s = Float64Array.from(g.values).sort();
      let mean = 0;
      for (const v of g.values) mean += v;
      mean /= g.values.length;
      const { values: _v, ...rest } = g;
      return { ...rest, draws: s.length, mean, p5: percentileSorted(s, 0.05), p50: percentileSorted(s, 0.5), p95: percentileSorted(s, 0.95), min: s[0]!, max: s[s.length - 1]! };
    });
  }
}

const text = (key: string, label: string): Column => ({ key, label, type: 'text' });
const number = (key: string, label: string): Column => ({ key, label, type: 'number', unit: 'as in the Unit column', style: 'amount' });

/** The summary as a report section. */
export function summarySection(rows: readonly SummaryRow[], o: { units: number; rejected: number; shards: number }): Section {
  const shown = rows.slice(0, MAX_SUMMARY_ROWS);
  const anyDraws = rows.some((r) => r.cv > 0);
  const body: Cell[][] = shown.map((r) => [r.table, r.scenario, r.household, num(r.cv), r.measure, r.effect, r.unit, num(r.draws), num(r.mean), num(r.p5), num(r.p50), num(r.p95), num(r.min), num(r.max)]);
  const notes = ['Each row is in the unit given in its Unit column.', 'Household: off is the open model (no induced effects); table is the closure with the share of income spent from the table; a number is the share given.'];
  if (rows.length > shown.length) notes.push(`The first ${shown.length} of ${rows.length} rows are shown; the combined Parquet file holds every unit, sector, measure and effect.`);
  return {
    id: 'sweep-summary',
    kind: 'uncertainty',
    title: 'Sweep: totals across the draws',
    about: SUMMARY_ABOUT,
    sheet: 'Sweep',
    paragraphs: [
      `${o.units} units merged from ${o.shards} shard${o.shards === 1 ? '' : 's'}${o.rejected ? `; ${o.rejected} unit${o.rejected === 1 ? ' was' : 's were'} left out because the drawn coefficients broke productivity or made the model singular (listed in the notes)` : ''}.`,
      'With a coefficient of variation above 0, each unit is one Monte Carlo draw of the technical coefficients (independent multiplicative log-normal noise, mean 1); every scenario and closure setting uses the same draws.',
    ],
    tables: [
      {
        id: 'sweep-summary-totals',
        title: 'Totals over sectors, across the draws',
        about: 'One row per table, scenario, closure setting, coefficient of variation, measure and effect.',
        columns: [
          text('table', 'Table'),
          text('scenario', 'Scenario'),
          text('household', 'Household'),
          { key: 'cv', label: 'cv', type: 'number', unit: 'ratio', style: 'ratio' },
          text('measure', 'Measure'),
          text('effect', 'Effect'),
          text('unit', 'Unit'),
          { key: 'draws', label: 'Draws', type: 'number', unit: 'count', style: 'count' },
          number('mean', 'Mean'),
          number('p5', '5th percentile'),
          number('p50', 'Median'),
          number('p95', '95th percentile'),
          number('min', 'Least'),
          number('max', 'Greatest'),
        ],
        rows: body,
        notes,
      },
    ],
    charts: [],
    headlines: [],
    cautions: anyDraws ? UNCERTAINTY_CAUTIONS.filter((c) => !/qualified economist|fixed coefficients/i.test(c)) : [],
  };
}
