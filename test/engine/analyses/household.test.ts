/**
 * Measures and the household closure, against plain dense computations with ml-matrix
 * (source: ml-matrix 6.15.1) and the bordered-matrix form of the closed model (common practice:
 * households as an extra row and column of A).
 */
import { describe, expect, it } from 'vitest';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { InputError } from '../../../engine/errors';
import { buildModels, ClosedModel, guessHousehold, guessHouseholdColumn, guessLabourIncomeRow, householdClosure } from '../../../engine/household';
import { LeontiefModel } from '../../../engine/leontief';
import { labourIncomeMeasure, measures, outputMeasure, satelliteMeasure, valueAddedMeasure } from '../../../engine/measures';
import { makeTable } from '../../../engine/table';
import { denseA, denseL, ml, randomTable, relErr, rowTimes } from './tables';

describe('measures', () => {
  const t = randomTable({ n: 9, seed: 3 });

  it('are coefficients per unit of output, with the unit of the table or of the satellite', () => {
    const list = measures(t);
    expect(list.map((m) => m.code)).toEqual(['output', 'value-added', 'labour-income', 'JOBS', 'GHG']);
    const [out, va, li, jobs, ghg] = list;
    expect(out!.unit).toBe('USD millions');
    expect(Array.from(out!.coefficients)).toEqual(new Array(9).fill(1));
    for (let j = 0; j < 9; j++) {
      const v = t.V.data[j]! + t.V.data[9 + j]! + t.V.data[18 + j]!;
      expect(va!.coefficients[j]).toBeCloseTo(v / t.x[j]!, 14);
      expect(li!.coefficients[j]).toBeCloseTo(t.V.data[j]! / t.x[j]!, 14);
      expect(jobs!.coefficients[j]).toBeCloseTo(t.satellites[0]!.values[j]! / t.x[j]!, 12);
    }
    expect(li!.from).toEqual(['COE']);
    expect(jobs!.kind).toBe('jobs');
    expect(jobs!.unit).toBe('FTE jobs');
    expect(jobs!.perUnit).toBe('FTE jobs per USD millions of output');
    expect(ghg!.unit).toBe('t CO2e');
    expect(ghg!.kind).toBe('satellite');
    for (const m of list) expect(m.about.length).toBeGreaterThan(10);
  });

  it('chosen value-added rows add up, and a row that does not exist is a clear error', () => {
    const m = valueAddedMeasure(t, ['COE', 'TAX']);
    expect(m.coefficients[2]).toBeCloseTo((t.V.data[2]! + t.V.data[20]!) / t.x[2]!, 14);
    expect(() => labourIncomeMeasure(t, 'WAGES')).toThrow(InputError);
    try {
      labourIncomeMeasure(t, 'WAGES');
    } catch (e) {
      const err = e as InputError;
      expect(err.code).toBe('unknown-value-added-row');
      expect(err.where.rowLabel).toBe('WAGES');
      expect(err.message).toContain("'WAGES'");
      expect(err.message).toContain("'COE'");
    }
    expect(() => satelliteMeasure(t, 'WATER')).toThrow(/no satellite row 'WATER'/);
    expect(outputMeasure(t).perUnit).toBe('USD millions per USD millions of output');
  });
});

describe('household closure', () => {
  const t = randomTable({ n: 12, seed: 11 });
  const open = LeontiefModel.fromTable(t);
  const closure = householdClosure(t, open, { income: 'COE', consumption: 'HH' });
  const closed = new ClosedModel(open, closure);

  it('builds the household row and column from the chosen row and column', () => {
    const n = 12;
    let income = 0;
    for (let j = 0; j < n; j++) income += t.V.data[j]!;
    expect(closure.totalIncome).toBeCloseTo(income, 9);
    for (let j = 0; j < n; j++) {
      expect(closure.income[j]).toBeCloseTo(t.V.data[j]! / t.x[j]!, 14);
      expect(closure.consumption[j]).toBeCloseTo(t.F.data[j * 3]! / income, 14);
    }
    expect(closure.productive).toBe(true);
    expect(closure.findings[0]!.code).toBe('household-closure');
  });

  it('gives the closed inverse that ml-matrix gives for the bordered matrix (source: ml-matrix inverse)', () => {
    const n = 12;
    const A = denseA(t);
    const Abar = new MlMatrix(n + 1, n + 1);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) Abar.set(i, j, A.get(i, j));
      Abar.set(i, n, closure.consumption[i]!);
      Abar.set(n, i, closure.income[i]!);
    }
    const Lbar = mlInverse(MlMatrix.eye(n + 1).sub(Abar));
    const ours = closed.inverse();
    let err = 0;
    for (let i = 0; i <= n; i++) for (let j = 0; j <= n; j++) err = Math.max(err, Math.abs(ours.data[i * (n + 1) + j]! - Lbar.get(i, j)));
    expect(err).toBeLessThan(1e-11);
    // Solve and weighted agree with the dense inverse as well.
    const d = Array.from({ length: n }, (_, i) => (i % 3) - 0.5);
    const { x, income } = closed.solve(d);
    const ref = Lbar.mmul(MlMatrix.columnVector([...d, 0])).getColumn(0);
    expect(relErr(x, ref.slice(0, n))).toBeLessThan(1e-11);
    expect(income).toBeCloseTo(ref[n]!, 10);
    const c = Array.from({ length: n }, (_, i) => i + 1);
    const w = closed.weighted(c, 0.5);
    const refW = rowTimes([...c, 0.5], Lbar);
    expect(relErr(w.sectors, refW.slice(0, n))).toBeLessThan(1e-11);
    expect(w.household).toBeCloseTo(refW[n]!, 10);
    // The Schur complement equals 1 − hᵣ′ L h꜀ computed densely.
    const L = denseL(A);
    const hl = rowTimes(closure.income, L);
    const loop = hl.reduce((s, v, i) => s + v * closure.consumption[i]!, 0);
    expect(closure.schur).toBeCloseTo(1 - loop, 12);
    expect(Math.abs(ml(closed.coefficients()).sub(Abar).max())).toBeLessThan(1e-15);
  });

  it('refuses a closure that is not productive, with a finding and a clear error', () => {
    // Households that spend far more than they earn: propensity cannot exceed 1, so inflate
    // consumption in the table instead.
    const p = {
      sectors: { codes: ['A', 'B'] },
      Z: [
        [10, 20],
        [20, 10],
      ],
      finalDemand: { codes: ['HH'], labels: ['Household consumption'], values: [[170], [270]] },
      valueAdded: { codes: ['COE'], labels: ['Compensation of employees'], values: [[170, 270]] },
    };
    // Income is 440 and consumption 440, but A's column sums are small: hᵣ′L h꜀ = 1 only if
    // every unit spent comes back as income; here labour income is all value added, so the
    // loop is exactly 1 (no leakage) and the closure is not productive.
    const t2 = makeTable(p);
    const m = LeontiefModel.fromTable(t2);
    const cl = householdClosure(t2, m, { income: 'COE', consumption: 'HH' });
    expect(cl.productive).toBe(false);
    const f = cl.findings.find((x) => x.code === 'household-not-productive')!;
    expect(f.severity).toBe('error');
    expect(f.message).toContain("'COE'");
    expect(f.message).toContain("'HH'");
    expect(() => new ClosedModel(m, cl)).toThrow(InputError);
    expect(() => buildModels(t2, { household: { income: 'COE', consumption: 'HH' } })).toThrow(/not productive/);
    // With households keeping a tenth of their income, it is productive again.
    const ok = householdClosure(t2, m, { income: 'COE', consumption: 'HH', propensity: 0.9 });
    expect(ok.productive).toBe(true);
    expect(ok.schur).toBeCloseTo(0.1, 12);
  });

  it('names a value-added row or final-demand column that does not exist', () => {
    expect(() => householdClosure(t, open, { income: 'WAGES', consumption: 'HH' })).toThrow(/no value-added row 'WAGES'/);
    expect(() => householdClosure(t, open, { income: 'COE', consumption: 'PCE' })).toThrow(/no final-demand column 'PCE'/);
    expect(() => householdClosure(t, open, { income: 'COE', consumption: 'HH', propensity: 1.5 })).toThrow(/from 0 to 1/);
    try {
      householdClosure(t, open, { income: 'WAGES', consumption: 'HH' });
    } catch (e) {
      expect((e as InputError).code).toBe('unknown-value-added-row');
    }
  });

  it('guesses the household column and the labour-income row from labels, and says nothing when unsure', () => {
    expect(guessHousehold(t)).toEqual({ income: 'COE', consumption: 'HH' });
    const mk = (fd: [string, string][], va: [string, string][]) =>
      makeTable({
        sectors: { codes: ['A'] },
        Z: [[1]],
        finalDemand: { codes: fd.map((c) => c[0]), labels: fd.map((c) => c[1]), values: [fd.map(() => 1)] },
        valueAdded: { codes: va.map((c) => c[0]), labels: va.map((c) => c[1]), values: va.map(() => [1]) },
      });
    // Labels as national statistical offices and the U.S. agency write them (common practice).
    const a = mk(
      [
        ['P3_S14', "Households' final consumption expenditure"],
        ['P3_S15', 'Final consumption expenditure of non-profit institutions serving households'],
        ['P3_S13', 'Government final consumption expenditure'],
      ],
      [
        ['D1', 'Compensation of employees'],
        ['D29X39', 'Other taxes less subsidies on production'],
      ],
    );
    expect(guessHouseholdColumn(a)).toBe('P3_S14');
    expect(guessLabourIncomeRow(a)).toBe('D1');
    const b = mk(
      [
        ['F010', 'Personal consumption expenditures'],
        ['F020', 'Private fixed investment'],
      ],
      [
        ['V001', 'Compensation of employees'],
        ['V002', 'Indirect business tax and nontax liability'],
        ['V003', 'Other value added'],
      ],
    );
    expect(guessHousehold(b)).toEqual({ income: 'V001', consumption: 'F010' });
    const c = mk(
      [
        ['H1', 'Household consumption, residents'],
        ['H2', 'Household consumption, visitors'],
      ],
      [
        ['W', 'Wages and salaries'],
        ['S', 'Employers social contributions'],
      ],
    );
    expect(guessHouseholdColumn(c)).toBeUndefined();
    expect(guessLabourIncomeRow(c)).toBe('W');
    expect(guessHousehold(c)).toBeUndefined();
    // Codes alone, as long downloads give them: the 2008 SNA codes P3_S14 (household final
    // consumption) and D1 (compensation of employees), and the abbreviation HFCE (common practice).
    const e = mk(
      [
        ['P3_S13', 'P3_S13'],
        ['P3_S14', 'P3_S14'],
        ['P51G', 'P51G'],
      ],
      [
        ['D1', 'D1'],
        ['B2A3G', 'B2A3G'],
      ],
    );
    expect(guessHousehold(e)).toEqual({ income: 'D1', consumption: 'P3_S14' });
    expect(guessHouseholdColumn(mk([['HFCE', 'HFCE'], ['GGFC', 'GGFC']], [['VALU', 'VALU']]))).toBe('HFCE');
    const d = mk([['X', 'Exports']], [['GOS', 'Gross operating surplus']]);
    expect(guessHouseholdColumn(d)).toBeUndefined();
    expect(guessLabourIncomeRow(d)).toBeUndefined();
  });
});
