/**
 * The closure bases, households' own purchases, plausibility, zero-output sectors and the rounds
 * of the indirect effect: a handbook example (from memory, marked so), identities between the
 * bases, and fast-check properties on random tables.
 */
import fc from 'fast-check';
import { Matrix as MlMatrix, inverse as mlInverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { conventionLines, conventions } from '../../../engine/conventions';
import type { ClosureBasis } from '../../../engine/household';
import { buildModels, guessHousehold } from '../../../engine/household';
import { impact } from '../../../engine/impact';
import { LeontiefModel } from '../../../engine/leontief';
import { linkages } from '../../../engine/linkages';
import { labourIncomeMeasure, measures, outputMeasure } from '../../../engine/measures';
import { multipliers } from '../../../engine/multipliers';
import { priceModel } from '../../../engine/price';
import type { PlainTable } from '../../../engine/table';
import { makeTable } from '../../../engine/table';

/**
 * Miller & Blair (2009), Input-Output Analysis, 2nd ed., ch. 2 (section 2.5), from memory: the
 * two-sector example closed for households, with households buying 0.05 of their own output
 * (domestic services) per unit of income:
 *   Ā = [.15 .25 .05; .20 .05 .40; .30 .25 .05],
 *   (I − Ā)⁻¹ = [1.3651 .4253 .2509; .5273 1.3481 .5954; .5698 .4890 1.2885] (printed to 4 decimals).
 * Written as a table: x = (1000, 2000), Z = [150 500; 200 100], labour income (300, 500),
 * household purchases (50, 400) and 50 from households, out of a household income of 1000.
 */
const MB: PlainTable = {
  sectors: { codes: ['S1', 'S2'], labels: ['Sector 1', 'Sector 2'] },
  Z: [
    [150, 500],
    [200, 100],
  ],
  finalDemand: { codes: ['HH', 'OTHER'], labels: ['Households', 'Other final demand'], values: [[50, 300], [400, 1300]] },
  valueAdded: { codes: ['LAB', 'OVA'], labels: ['Labour income', 'Other value added'], classes: ['compensation', 'operating-surplus'], values: [[300, 500], [350, 1400]] },
  x: [1000, 2000],
};
const MB_INVERSE = [
  [1.3651, 0.4253, 0.2509],
  [0.5273, 1.3481, 0.5954],
  [0.5698, 0.489, 1.2885],
];

describe('households closed with their own purchases (Miller & Blair (2009), ch. 2, from memory)', () => {
  const t = makeTable(MB);
  const models = buildModels(t, { household: { income: 'LAB', consumption: 'HH', householdIncome: 1000, ownPurchases: 50 } });
  it('the closed coefficients and the closed inverse as printed, to 4 decimals', () => {
    const c = models.closed!;
    const A = c.coefficients();
    const want = [0.15, 0.25, 0.05, 0.2, 0.05, 0.4, 0.3, 0.25, 0.05];
    want.forEach((v, k) => expect(A.data[k]).toBeCloseTo(v, 12));
    const inv = c.inverse();
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(Math.abs(inv.data[i * 3 + j]! - MB_INVERSE[i]![j]!)).toBeLessThan(5e-5);
    // And against a plain inverse of I − Ā with ml-matrix (an independent library).
    const ref = mlInverse(MlMatrix.eye(3).sub(new MlMatrix([[0.15, 0.25, 0.05], [0.2, 0.05, 0.4], [0.3, 0.25, 0.05]])));
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(inv.data[i * 3 + j]).toBeCloseTo(ref.get(i, j), 12);
  });
  it('Type II output multipliers are the column sums over the two sectors (households not counted)', () => {
    const [out] = multipliers(models, [outputMeasure(t)]);
    expect(out!.total![0]).toBeCloseTo(1.3651 + 0.5273, 3);
    expect(out!.total![1]).toBeCloseTo(0.4253 + 1.3481, 3);
    expect(models.closure!.share).toBeCloseTo(0.5, 12); // (50 + 400 + 50) / 1000
    expect(models.closure!.own).toBeCloseTo(0.05, 12);
  });
});

/** A random productive table with nonnegative flows, a labour row and a household column. */
const tableArb = (extraZero = false) =>
  fc.record({
    n: fc.integer({ min: 2, max: 6 }),
    seed: fc.array(fc.double({ min: 0.01, max: 1, noNaN: true }), { minLength: 64, maxLength: 64 }),
    at: fc.integer({ min: 0, max: 6 }),
  }).map(({ n, seed, at }) => {
    let k = 0;
    const r = () => seed[k++ % seed.length]!;
    const x = Array.from({ length: n }, () => 100 + 900 * r());
    // Flows with row and column sums at most 0.6 of output, so final demand and value added are positive.
    const Z = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (0.6 / n) * r() * Math.min(x[i]!, x[j]!)));
    const inputs = x.map((xj, j) => xj - Z.reduce((s, row) => s + row[j]!, 0));
    const lab = inputs.map((v) => v * (0.3 + 0.4 * r()));
    const other = inputs.map((v, j) => v - lab[j]!);
    const sales = x.map((xi, i) => xi - Z[i]!.reduce((s, v) => s + v, 0));
    const hh = sales.map((v) => v * (0.2 + 0.5 * r()));
    const rest = sales.map((v, i) => v - hh[i]!);
    const p: PlainTable = {
      sectors: { codes: x.map((_, i) => `S${i + 1}`) },
      Z,
      finalDemand: { codes: ['HH', 'REST'], values: hh.map((v, i) => [v, rest[i]!]) },
      valueAdded: { codes: ['LAB', 'GOS'], classes: ['compensation', 'operating-surplus'], values: [lab, other] },
      x,
    };
    if (!extraZero) return { plain: p, at: -1 };
    // The same table with a sector of no output inserted at position `at`.
    const z = Math.min(at, n);
    const ins = <T>(a: T[], v: T) => [...a.slice(0, z), v, ...a.slice(z)];
    const q: PlainTable = {
      sectors: { codes: ins(p.sectors.codes, 'NONE') },
      Z: ins(
        p.Z.map((row) => ins(row, 0)),
        new Array(n + 1).fill(0),
      ),
      finalDemand: { codes: ['HH', 'REST'], values: ins(p.finalDemand!.values, [0, 0]) },
      valueAdded: { codes: ['LAB', 'GOS'], classes: ['compensation', 'operating-surplus'], values: p.valueAdded!.values.map((row) => ins(row, 0)) },
      x: ins(x, 0),
    };
    return { plain: p, with: q, at: z };
  });

describe('properties of the closure bases (fast-check)', () => {
  it('each basis gives the same multipliers as the propensity basis at the share it implies', () => {
    fc.assert(
      fc.property(tableArb(), ({ plain }) => {
        const t = makeTable(plain);
        const list = [outputMeasure(t), labourIncomeMeasure(t, 'LAB')];
        const totalLab = plain.valueAdded!.values[0]!.reduce((a, b) => a + b, 0);
        const bases: { basis: ClosureBasis; householdIncome?: number }[] = [{ basis: 'labour-income' }, { basis: 'consumption-total' }, { basis: 'household-income', householdIncome: totalLab * 1.7 }];
        for (const b of bases) {
          const m = buildModels(t, { household: { income: 'LAB', consumption: 'HH', ...b } });
          const share = m.closure!.share;
          if (share > 1) continue;
          const p = buildModels(t, { household: { income: 'LAB', consumption: 'HH', propensity: share } });
          const [a1, a2] = multipliers(m, list);
          const [b1, b2] = multipliers(p, list);
          for (let j = 0; j < t.x.length; j++) {
            expect(a1!.total![j]).toBeCloseTo(b1!.total![j]!, 10);
            expect(a2!.typeII![j]).toBeCloseTo(b2!.typeII![j]!, 10);
          }
        }
      }),
      { numRuns: 60, seed: 13 },
    );
  });

  it('Type II ≥ Type I, total ≥ simple and induced ≥ 0 whenever spending is nonnegative and the closure productive', () => {
    fc.assert(
      fc.property(tableArb(), fc.double({ min: 0.05, max: 1, noNaN: true }), ({ plain }, p) => {
        const t = makeTable(plain);
        const m = buildModels(t, { household: { income: 'LAB', consumption: 'HH', propensity: p } });
        for (const mu of multipliers(m, measures(t))) {
          for (let j = 0; j < t.x.length; j++) {
            // Within rounding: 1e-10 relative.
            expect(mu.total![j]! - mu.simple[j]!).toBeGreaterThanOrEqual(-1e-10 * Math.abs(mu.simple[j]!));
            expect(mu.induced![j]!).toBeGreaterThanOrEqual(-1e-10 * Math.abs(mu.simple[j]!));
            if (Number.isFinite(mu.typeI[j]!)) expect(mu.typeII![j]! - mu.typeI[j]!).toBeGreaterThanOrEqual(-1e-10 * Math.abs(mu.typeI[j]!));
          }
        }
      }),
      { numRuns: 60, seed: 14 },
    );
  });

  it("leaving out a sector with no output leaves the other sectors' normalised linkages unchanged", () => {
    fc.assert(
      fc.property(tableArb(true), (c) => {
        const t0 = makeTable(c.plain);
        const t1 = makeTable(c.with!);
        const a = linkages(t0, LeontiefModel.fromTable(t0));
        const b = linkages(t1, LeontiefModel.fromTable(t1));
        const keys = ['power', 'sensitivity', 'directBackwardIndex', 'directForwardIndex', 'variationBackward', 'variationForward'] as const;
        const n = t0.x.length;
        for (const k of keys) {
          for (let j = 0; j < n; j++) {
            const jj = j < c.at ? j : j + 1;
            expect(b[k]![jj]).toBeCloseTo(a[k]![j]!, 10);
          }
          expect(b[k]![c.at]).toBeNaN();
        }
        expect(b.group[c.at]).toBe('no-output');
        expect(b.group.filter((g) => g !== 'no-output')).toEqual(a.group);
      }),
      { numRuns: 60, seed: 15 },
    );
  });
});

describe('sectors with no output, plausibility and conventions', () => {
  const plain: PlainTable = {
    sectors: { codes: ['A', 'B', 'Z'] },
    Z: [
      [20, 30, 0],
      [40, 10, 0],
      [0, 0, 0],
    ],
    finalDemand: { codes: ['HH', 'EXP'], labels: ['Household consumption', 'Exports'], values: [[40, 10], [100, 50], [0, 0]] },
    valueAdded: { codes: ['COE', 'GOS'], labels: ['Compensation of employees', 'Gross operating surplus'], values: [[30, 100, 0], [10, 60, 0]] },
  };
  const t = makeTable(plain);
  it('multipliers are blank for a sector with no output, with a note naming it; the price model says no output', () => {
    const models = buildModels(t, { household: guessHousehold(t)! });
    const [out] = multipliers(models, [outputMeasure(t)]);
    expect(out!.simple[2]).toBeNaN();
    expect(out!.typeII![2]).toBeNaN();
    expect(out!.simple[0]).toBeGreaterThan(1);
    const f = out!.findings.find((x) => x.code === 'no-output')!;
    expect(f.message).toContain("'Z'");
    const p = priceModel(t, models.open);
    expect(p.findings.map((x) => x.code)).toContain('no-output');
    expect(p.findings.map((x) => x.code)).not.toContain('base-price');
    expect(p.base[0]).toBeCloseTo(1, 12);
  });
  it('a spending share above 1 is a warning, and so are induced effects above indirect ones for most sectors', () => {
    // Households spend 140 out of a labour income of 130: share 1.077.
    const models = buildModels(t, { household: { income: 'COE', consumption: 'HH' } });
    const codes = models.closure!.findings.map((x) => x.code);
    expect(models.closure!.share).toBeCloseTo(140 / 130, 12);
    expect(codes).toContain('household-share-high');
    expect(codes).toContain('induced-exceeds-indirect');
    // With a low household income given, the share is low and flagged too.
    const low = buildModels(t, { household: { income: 'COE', consumption: 'HH', householdIncome: 2000 } });
    expect(low.closure!.findings.map((x) => x.code)).toContain('household-share-low');
  });
  it('a closure that is not productive is an error finding naming the sectors and a remedy', () => {
    expect(() => buildModels(t, { household: { income: 'COE', consumption: 'HH', householdIncome: 10 } })).toThrow(/not productive.*'B'/);
  });
  it('conventions say what total sums, the basis and share, and why Type II is null without a closure', () => {
    const models = buildModels(t, { household: { income: 'COE', consumption: 'HH', householdIncome: 400 } });
    const c = conventions(models, measures(t), { typeII: 'closed' });
    expect(c.closure.basis).toBe('household-income');
    expect(c.closure.share).toBeCloseTo(140 / 400, 12);
    expect(c.noOutput).toEqual(['Z']);
    const lines = conventionLines(c, { linkages: true }).join('\n');
    expect(lines).toMatch(/household row .* not counted/);
    expect(lines).toMatch(/mean over the sectors with output/);
    const off = conventions(buildModels(t), measures(t), { typeII: 'off' });
    expect(off.closure.whyNoTypeII).toMatch(/open model was chosen/);
  });
  it('an impact split into rounds adds up: first round + later rounds = indirect', () => {
    const models = buildModels(t);
    const im = impact(models, { name: 's', changes: [{ sector: 'A', amount: 10 }] }, [outputMeasure(t)], { rounds: true });
    const m = im.measures[0]!;
    // First round: A Δd = column A of A × 10 = (20/100, 40/100) × 10.
    expect(m.firstRound![0]).toBeCloseTo(2, 12);
    expect(m.firstRound![1]).toBeCloseTo(4, 12);
    for (let i = 0; i < 3; i++) expect(m.firstRound![i]! + m.laterRounds![i]!).toBeCloseTo(m.indirect[i]!, 12);
  });
});
