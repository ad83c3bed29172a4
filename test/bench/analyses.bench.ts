/**
 * Analyses on large random tables: the cost of each analysis once the open model is factored.
 * Targets: every analysis that needs only solves (multipliers for five measures with a
 * household closure, ten scenario impacts, footprints, price model, the mixed model with five
 * fixed sectors, extraction of a group of three) costs less than the factorisation itself.
 */
import { LeontiefModel } from '../../engine/leontief';
import { buildModels } from '../../engine/household';
import { measures } from '../../engine/measures';
import { multipliers } from '../../engine/multipliers';
import { impacts } from '../../engine/impact';
import { footprints } from '../../engine/footprint';
import { priceModel } from '../../engine/price';
import { mixedModel } from '../../engine/mixed';
import { extraction, extractEach } from '../../engine/extraction';
import { linkages } from '../../engine/linkages';
import { GhoshModel } from '../../engine/ghosh';
import { makeTable } from '../../engine/table';
import type { Scenario } from '../../engine/scenario';
import { randomCoefficients, rng } from '../helpers/random';
import { table, target, timeMedian } from './util';

function bigTable(n: number, seed: number) {
  const A = randomCoefficients(n, seed, 0.7, 0.3);
  const r = rng(seed + 1);
  const F = Array.from({ length: n }, () => [50 + 100 * r(), 20 * r()]);
  const f = F.map((row) => row[0]! + row[1]!);
  const x = new LeontiefModel(A).solve(f);
  const Z = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => A.data[i * n + j]! * x[j]!));
  const v = Array.from({ length: n }, (_, j) => {
    let s = x[j]!;
    for (let i = 0; i < n; i++) s -= Z[i]![j]!;
    return s;
  });
  return makeTable({
    sectors: { codes: Array.from({ length: n }, (_, i) => `S${i}`) },
    Z,
    finalDemand: { codes: ['HH', 'EXP'], labels: ['Household consumption', 'Exports'], values: F },
    valueAdded: { codes: ['COE', 'GOS'], labels: ['Compensation of employees', 'Surplus'], values: [v.map((a) => 0.55 * a), v.map((a) => 0.3 * a)] },
    imports: v.map((a) => 0.15 * a),
    x: Array.from(x),
    satellites: [
      { code: 'JOBS', label: 'Employment', unit: 'jobs', values: Array.from(x, (a) => a * 3 * r()) },
      { code: 'GHG', label: 'Emissions', unit: 't CO2e', values: Array.from(x, (a) => a * 10 * r()) },
    ],
  });
}

const rows: (string | number)[][] = [];
for (const n of [500, 1500]) {
  const t = bigTable(n, 9);
  const factor = timeMedian(() => LeontiefModel.fromTable(t), 3);
  const models = buildModels(t, { household: { income: 'COE', consumption: 'HH' } });
  const list = measures(t);
  const scen: Scenario[] = Array.from({ length: 10 }, (_, k) => ({ name: `s${k}`, changes: [{ sector: `S${k}`, amount: 10 }, { sector: `S${k + 20}`, percent: 5 }] }));
  const mult = timeMedian(() => multipliers(models, list));
  const imp = timeMedian(() => impacts(models, scen, list));
  const fp = timeMedian(() => footprints(models, list));
  const pr = timeMedian(() => priceModel(t, models.open, { valueAdded: [{ row: 'COE', percent: 3 }], importPrice: 10 }));
  const mx = timeMedian(() => mixedModel(t, models.open, [0, 1, 2, 3, 4].map((i) => ({ sector: `S${i}`, output: t.x[i]! * 0.9 }))));
  const ghosh = GhoshModel.fromTable(t);
  const ex = timeMedian(() => extraction(t, models.open, ['S1', 'S2', 'S3'], { ghosh }));
  const lk = timeMedian(() => linkages(t, models.open, { variation: false }));
  const lkv = timeMedian(() => linkages(t, LeontiefModel.fromTable(t), { variation: true }), 1);
  const each = timeMedian(() => extractEach(t, LeontiefModel.fromTable(t), { ghosh }), 1);
  rows.push(
    [n, 'factor I − A', factor, 1],
    [n, `multipliers, ${list.length} measures, closed`, mult, mult / factor],
    [n, 'impacts, 10 scenarios', imp, imp / factor],
    [n, `footprints, ${list.length} measures`, fp, fp / factor],
    [n, 'price model', pr, pr / factor],
    [n, 'mixed model, 5 fixed', mx, mx / factor],
    [n, 'extraction of 3 (Ghosh model given)', ex, ex / factor],
    [n, 'linkages without variation', lk, lk / factor],
    [n, 'linkages with variation (forms L; factor included)', lkv, lkv / factor],
    [n, 'extract each sector (forms L; factor included)', each, each / factor],
  );
  const solveOnly = Math.max(mult, imp, fp, pr, mx, ex, lk);
  target(`n = ${n}: each solve-only analysis costs less than one factorisation`, solveOnly < factor, `slowest ${solveOnly.toFixed(1)} ms against ${factor.toFixed(1)} ms`);
}
table(['n', 'analysis', 'ms (median)', '× factor'], rows);
