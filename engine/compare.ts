/**
 * Several scenarios side by side. For each measure: the totals of each part (direct,
 * indirect, induced, total) by scenario, the total impact by sector and scenario (n × r), and
 * the same tables as differences against a chosen base scenario (scenario − base; the base's
 * own column is zero).
 */
import { InputError } from './errors';
import type { Models } from './household';
import type { Impact } from './impact';
import { impacts } from './impact';
import type { Matrix } from './linalg/matrix';
import { zeros } from './linalg/matrix';
import type { Measure, MeasureInfo } from './measures';
import { CAUTIONS } from './measures';
import type { ResolvedScenario, Scenario } from './scenario';
import type { Axis } from './table';

export const COMPARE_ABOUT =
  'Scenarios side by side: the impact of each on every measure, and the difference of each from the base scenario (scenario minus base).';

export interface PartTotals {
  /** One value per scenario (length r). */
  direct: Float64Array;
  indirect: Float64Array;
  induced: Float64Array;
  total: Float64Array;
}

export interface MeasureComparison {
  measure: MeasureInfo;
  unit: string;
  /** Totals over sectors of each part, by scenario. */
  totals: PartTotals;
  /** Total impact by sector (rows) and scenario (columns), n × r. */
  bySector: Matrix;
  /** The same tables minus the base scenario's. */
  difference: { totals: PartTotals; bySector: Matrix };
}

export interface Comparison {
  about: string;
  scenarios: string[];
  /** The name and position (from 0) of the base scenario. */
  base: string;
  baseIndex: number;
  sectors: Axis;
  moneyUnit: string;
  measures: MeasureComparison[];
  cautions: readonly string[];
}

/**
 * Compare impacts already computed (all on the same sectors and measures). `base` is a
 * scenario name or position (default: the first).
 */
export function compare(list: readonly Impact[], options: { base?: string | number } = {}): Comparison {
  if (!list.length) throw new InputError('no-scenarios', 'there are no scenarios to compare', {}, 'Give at least one scenario');
  const first = list[0]!;
  const n = first.sectors.codes.length;
  const r = list.length;
  const names = list.map((x) => x.scenario);
  for (const x of list) {
    if (x.sectors.codes.length !== n || x.sectors.codes.some((c, i) => c !== first.sectors.codes[i])) {
      throw new InputError('mismatch', `scenario '${x.scenario}' was computed on other sectors than '${first.scenario}'`);
    }
    if (x.measures.length !== first.measures.length || x.measures.some((m, i) => m.measure.code !== first.measures[i]!.measure.code)) {
      throw new InputError('mismatch', `scenario '${x.scenario}' was computed for other measures than '${first.scenario}'`);
    }
  }
  let b: number;
  if (options.base === undefined) b = 0;
  else if (typeof options.base === 'number') {
    if (!Number.isInteger(options.base) || options.base < 0 || options.base >= r) {
      throw new InputError('unknown-scenario', `there is no scenario at position ${options.base}; there are ${r}`, {}, `Use 0 to ${r - 1}`);
    }
    b = options.base;
  } else {
    b = names.indexOf(options.base);
    if (b < 0) {
      throw new InputError('unknown-scenario', `there is no scenario '${options.base}' to compare against`, { text: options.base }, `Choose one of: ${names.map((s) => `'${s}'`).join(', ')}`);
    }
  }
  const parts = ['direct', 'indirect', 'induced', 'total'] as const;
  const measures: MeasureComparison[] = first.measures.map((m0, mi) => {
    const totals: PartTotals = { direct: new Float64Array(r), indirect: new Float64Array(r), induced: new Float64Array(r), total: new Float64Array(r) };
    const bySector = zeros(n, r);
    list.forEach((x, j) => {
      const mm = x.measures[mi]!;
      for (const p of parts) totals[p][j] = mm.totals[p];
      for (let i = 0; i < n; i++) bySector.data[i * r + j] = mm.total[i]!;
    });
    const dTotals: PartTotals = { direct: new Float64Array(r), indirect: new Float64Array(r), induced: new Float64Array(r), total: new Float64Array(r) };
    for (const p of parts) for (let j = 0; j < r; j++) dTotals[p][j] = totals[p][j]! - totals[p][b]!;
    const dBySector = zeros(n, r);
    for (let i = 0; i < n; i++) for (let j = 0; j < r; j++) dBySector.data[i * r + j] = bySector.data[i * r + j]! - bySector.data[i * r + b]!;
    return { measure: m0.measure, unit: m0.unit, totals, bySector, difference: { totals: dTotals, bySector: dBySector } };
  });
  return {
    about: COMPARE_ABOUT,
    scenarios: names,
    base: names[b]!,
    baseIndex: b,
    sectors: { codes: [...first.sectors.codes], labels: [...first.sectors.labels] },
    moneyUnit: first.moneyUnit,
    measures,
    cautions: CAUTIONS,
  };
}

/** Compute the impacts of several scenarios (one multi-column solve) and compare them. */
export function compareScenarios(
  models: Models,
  scenarios: readonly (Scenario | ResolvedScenario)[],
  measures: readonly Measure[],
  options: { base?: string | number } = {},
): Comparison {
  return compare(impacts(models, scenarios, measures), options);
}
