/**
 * Scenarios, impacts and comparisons: validation and bad input; direct + indirect + induced
 * equal the closed model's output; every part against plain dense computations with ml-matrix
 * (source: ml-matrix 6.15.1).
 */
import { describe, expect, it } from 'vitest';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { compare, compareScenarios } from '../../../engine/compare';
import { InputError } from '../../../engine/errors';
import { buildModels } from '../../../engine/household';
import { impact, impacts } from '../../../engine/impact';
import { measures } from '../../../engine/measures';
import { checkScenario, resolveScenario } from '../../../engine/scenario';
import type { Scenario } from '../../../engine/scenario';
import { makeTable } from '../../../engine/table';
import { denseA, denseL, randomTable, relErr, timesCol } from './tables';

const n = 20;
const t = randomTable({ n, seed: 21 });

function bordered(): MlMatrix {
  const A = denseA(t);
  const Abar = new MlMatrix(n + 1, n + 1);
  let income = 0;
  for (let j = 0; j < n; j++) income += t.V.data[j]!;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) Abar.set(i, j, A.get(i, j));
    Abar.set(i, n, t.F.data[i * 3]! / income);
    Abar.set(n, i, t.V.data[i]! / t.x[i]!);
  }
  return mlInverse(MlMatrix.eye(n + 1).sub(Abar));
}

describe('scenarios', () => {
  it('turn amounts, percentages and local shares into the local demand change', () => {
    const s: Scenario = {
      name: 'Plant opening',
      changes: [
        { sector: 'S03', amount: 100, localShare: 0.6 },
        { sector: 'S03', amount: -10 },
        { sector: 'S05', percent: 10 },
        { sector: 'S07', percent: -50, category: 'GOV', localShare: 0.5 },
        { sector: 'Sector 9', amount: 5 },
      ],
    };
    const r = resolveScenario(t, s);
    expect(r.demand[2]).toBeCloseTo(60 - 10, 12);
    expect(r.gross[2]).toBeCloseTo(90, 12);
    const f5 = t.F.data[4 * 3]! + t.F.data[4 * 3 + 1]! + t.F.data[4 * 3 + 2]!;
    expect(r.demand[4]).toBeCloseTo(0.1 * f5, 12);
    expect(r.demand[6]).toBeCloseTo(-0.5 * t.F.data[6 * 3 + 1]! * 0.5, 12);
    expect(r.demand[8]).toBe(5);
    expect(r.changes[3]!.category).toBe('GOV');
    expect(r.unit).toBe('USD millions');
    expect(r.totalLocal).toBeCloseTo(50 + 0.1 * f5 - 0.25 * t.F.data[6 * 3 + 1]! + 5, 10);
    expect(checkScenario(t, s)).toEqual([]);
  });

  it('reject an unknown sector, naming it', () => {
    const s: Scenario = { name: 'x', changes: [{ sector: 'S99', amount: 1 }] };
    expect(() => resolveScenario(t, s)).toThrow(InputError);
    try {
      resolveScenario(t, s);
    } catch (e) {
      const err = e as InputError;
      expect(err.code).toBe('unknown-sector');
      expect(err.where.sector).toBe('S99');
      expect(err.message).toContain("change 1 of scenario 'x'");
      expect(err.message).toContain("'S99'");
    }
  });

  it('reject a percentage of a zero final demand', () => {
    const t0 = makeTable({
      sectors: { codes: ['A', 'B'] },
      Z: [
        [10, 20],
        [30, 40],
      ],
      finalDemand: { codes: ['HH', 'EXP'], values: [[70, 0], [0, 0]] },
    });
    const f = checkScenario(t0, { name: 'y', changes: [{ sector: 'B', percent: 5 }, { sector: 'A', percent: 5, category: 'EXP' }, { sector: 'A', percent: 5 }] });
    expect(f.map((x) => x.code)).toEqual(['percent-of-zero', 'percent-of-zero']);
    expect(f[0]!.severity).toBe('error');
    expect(f[0]!.message).toContain("'B'");
    expect(f[1]!.message).toContain("'EXP'");
    expect(() => resolveScenario(t0, { name: 'y', changes: [{ sector: 'B', percent: 5 }] })).toThrow(/final demand of 'B' is undefined, because its final demand is zero/);
  });

  it('reject other bad changes, each with what and where', () => {
    const codes = checkScenario(t, {
      name: 'bad',
      changes: [
        { sector: 'S01', amount: 1, percent: 2 },
        { sector: 'S01' },
        { sector: 'S01', amount: Number.NaN },
        { sector: 'S01', amount: 1, localShare: 1.2 },
        { sector: 'S01', amount: 1, category: 'TOURISM' },
      ],
    }).map((f) => f.code);
    expect(codes).toEqual(['amount-or-percent', 'amount-or-percent', 'bad-amount', 'bad-local-share', 'unknown-final-demand-column']);
    expect(checkScenario(t, { name: '', changes: [] }).map((f) => f.code)).toEqual(['scenario-name', 'scenario-empty']);
  });
});

describe('impacts', () => {
  const models = buildModels(t, { household: { income: 'COE', consumption: 'HH' } });
  const list = measures(t);
  const scenario: Scenario = { name: 'A', changes: [{ sector: 'S02', amount: 50, localShare: 0.8 }, { sector: 'S11', percent: 3 }] };

  it('split into direct, indirect and induced that add up to the closed model (source: ml-matrix inverse of the bordered matrix)', () => {
    const res = impact(models, scenario, list);
    const d = resolveScenario(t, scenario).demand;
    const L = denseL(denseA(t));
    const Lbar = bordered().subMatrix(0, n - 1, 0, n - 1);
    const open = timesCol(L, d);
    const closed = timesCol(Lbar, d);
    expect(relErr(res.openOutput, open)).toBeLessThan(1e-11);
    expect(relErr(res.output, closed)).toBeLessThan(1e-11);
    expect(res.closed).toBe(true);
    expect(res.residual).toBeLessThan(1e-13);
    for (const [k, mi] of res.measures.entries()) {
      const c = list[k]!.coefficients;
      for (let i = 0; i < n; i++) {
        expect(mi.direct[i]).toBeCloseTo(c[i]! * d[i]!, 10);
        expect(mi.indirect[i]).toBeCloseTo(c[i]! * (open[i]! - d[i]!), 9);
        expect(mi.induced[i]).toBeCloseTo(c[i]! * (closed[i]! - open[i]!), 9);
        // total = direct + indirect + induced = c ⊙ L̄ Δd.
        expect(mi.direct[i]! + mi.indirect[i]! + mi.induced[i]!).toBeCloseTo(c[i]! * closed[i]!, 9);
        expect(mi.total[i]).toBeCloseTo(c[i]! * closed[i]!, 9);
      }
      const sum = (v: Float64Array) => v.reduce((a, b) => a + b, 0);
      expect(mi.totals.total).toBeCloseTo(sum(mi.direct) + sum(mi.indirect) + sum(mi.induced), 8);
      expect(mi.unit).toBe(list[k]!.unit);
    }
    expect(res.measures[0]!.totals.total).toBeCloseTo(closed.reduce((a, b) => a + b, 0), 8);
    // Household income in the closed model is the bordered solution's last entry.
    const full = timesCol(bordered(), [...d, 0]);
    expect(res.householdIncome).toBeCloseTo(full[n]!, 9);
    expect(res.cautions.some((c) => /not a forecast/i.test(c))).toBe(true);
  });

  it('have no induced part without a closure', () => {
    const openOnly = buildModels(t);
    const res = impact(openOnly, scenario, list);
    expect(res.closed).toBe(false);
    for (const mi of res.measures) {
      expect(mi.totals.induced).toBe(0);
      expect(mi.totals.total).toBeCloseTo(mi.totals.direct + mi.totals.indirect, 9);
    }
  });

  it('of many scenarios at once equal one by one, and compare against a base', () => {
    const s2: Scenario = { name: 'B', changes: [{ sector: 'S05', amount: 80 }] };
    const s3: Scenario = { name: 'C', changes: [{ sector: 'S02', amount: 50, localShare: 0.8 }, { sector: 'S11', percent: 3 }, { sector: 'S20', amount: -5 }] };
    const all = impacts(models, [scenario, s2, s3], list);
    for (const [j, s] of [scenario, s2, s3].entries()) {
      const one = impact(models, s, list);
      expect(relErr(all[j]!.output, one.output)).toBeLessThan(1e-12);
      expect(all[j]!.measures[2]!.totals.total).toBeCloseTo(one.measures[2]!.totals.total, 9);
    }
    const cmp = compare(all, { base: 'A' });
    expect(cmp.scenarios).toEqual(['A', 'B', 'C']);
    expect(cmp.baseIndex).toBe(0);
    const jobs = cmp.measures.find((m) => m.measure.code === 'JOBS')!;
    expect(jobs.unit).toBe('FTE jobs');
    expect(jobs.totals.total[1]).toBeCloseTo(all[1]!.measures[3]!.totals.total, 9);
    expect(jobs.difference.totals.total[0]).toBe(0);
    expect(jobs.difference.totals.total[2]).toBeCloseTo(all[2]!.measures[3]!.totals.total - all[0]!.measures[3]!.totals.total, 9);
    for (let i = 0; i < n; i++) {
      expect(jobs.bySector.data[i * 3 + 1]).toBe(all[1]!.measures[3]!.total[i]);
      expect(jobs.difference.bySector.data[i * 3 + 2]).toBeCloseTo(all[2]!.measures[3]!.total[i]! - all[0]!.measures[3]!.total[i]!, 10);
    }
    // The difference of C from A is the impact of C's extra change alone (linearity).
    const extra = impact(models, { name: 'extra', changes: [{ sector: 'S20', amount: -5 }] }, list);
    expect(jobs.difference.totals.total[2]).toBeCloseTo(extra.measures[3]!.totals.total, 9);
    const byPos = compareScenarios(models, [scenario, s2, s3], list, { base: 2 });
    expect(byPos.base).toBe('C');
    expect(() => compare(all, { base: 'Z' })).toThrow(/no scenario 'Z'/);
    expect(() => compare([])).toThrow(InputError);
  });
});
