/**
 * Linkages, the Ghosh model and the Leontief price model: the identities (G = x̂⁻¹ L x̂; prices
 * stay at 1 when value added per unit is 1 minus the column sums of A) and every result on
 * random tables against plain dense computations with ml-matrix (source: ml-matrix 6.15.1).
 */
import { describe, expect, it } from 'vitest';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { InputError } from '../../../engine/errors';
import { allocationCoefficients, GhoshModel, ghoshImpact, primaryInputs } from '../../../engine/ghosh';
import { LeontiefModel } from '../../../engine/leontief';
import { linkages } from '../../../engine/linkages';
import { priceModel } from '../../../engine/price';
import { makeTable } from '../../../engine/table';
import { colSum, denseA, denseL, ml, randomTable, relErr, rowSum, rowTimes } from './tables';

function denseB(t: ReturnType<typeof randomTable>): MlMatrix {
  const n = t.x.length;
  const B = new MlMatrix(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) B.set(i, j, t.Z.data[i * n + j]! / t.x[i]!);
  return B;
}

describe('Ghosh model', () => {
  for (const [n, seed] of [
    [5, 31],
    [40, 32],
  ] as const) {
    it(`G = x̂⁻¹ L x̂ and supply-driven outputs match a dense computation at n = ${n} (source: ml-matrix inverse; identity: common practice)`, () => {
      const t = randomTable({ n, seed });
      const g = GhoshModel.fromTable(t);
      const G = g.inverse();
      const L = denseL(denseA(t));
      const xh = MlMatrix.diag(Array.from(t.x));
      const xhInv = MlMatrix.diag(Array.from(t.x, (v) => 1 / v));
      const ref = xhInv.mmul(L).mmul(xh);
      let err = 0;
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) err = Math.max(err, Math.abs(G.data[i * n + j]! - ref.get(i, j)) / Math.max(1, Math.abs(ref.get(i, j))));
      expect(err).toBeLessThan(1e-11);
      // And G is the dense inverse of I − B.
      const Gd = mlInverse(MlMatrix.eye(n).sub(denseB(t)));
      expect(Math.abs(ml(G).sub(Gd).abs().max())).toBeLessThan(1e-10);
      expect(Math.abs(ml(allocationCoefficients(t)).sub(denseB(t)).abs().max())).toBeLessThan(1e-15);
      // Primary inputs give back x: v′G = x′.
      expect(relErr(g.outputs(primaryInputs(t)), t.x)).toBeLessThan(1e-11);
      // A change in primary inputs.
      const res = ghoshImpact(t, g, [
        { sector: 'S01', amount: 10 },
        { sector: 'S03', amount: -4 },
      ]);
      const dv = new Array(n).fill(0);
      dv[0] = 10;
      dv[2] = -4;
      expect(relErr(res.output, rowTimes(dv, Gd))).toBeLessThan(1e-11);
      expect(res.totalOutput).toBeCloseTo(rowTimes(dv, Gd).reduce((a, b) => a + b, 0), 9);
      expect(res.about).toMatch(/implausible/);
      expect(res.cautions[0]).toMatch(/implausible/);
      expect(() => ghoshImpact(t, g, [{ sector: 'NOPE', amount: 1 }])).toThrow(/no sector 'NOPE'/);
    });
  }
});

describe('linkages', () => {
  it('match dense computations on a random table (source: ml-matrix inverse; Rasmussen–Hirschman indices, common practice)', () => {
    const n = 30;
    const t = randomTable({ n, seed: 41, density: 0.5 });
    const model = LeontiefModel.fromTable(t);
    const lk = linkages(t, model);
    const A = denseA(t);
    const L = denseL(A);
    const G = mlInverse(MlMatrix.eye(n).sub(denseB(t)));
    const cl = colSum(L);
    const rg = rowSum(G);
    const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;
    expect(relErr(lk.directBackward, colSum(A))).toBeLessThan(1e-13);
    expect(relErr(lk.directForward, rowSum(denseB(t)))).toBeLessThan(1e-13);
    expect(relErr(lk.totalBackward, cl)).toBeLessThan(1e-11);
    expect(relErr(lk.totalForward, rg)).toBeLessThan(1e-11);
    expect(relErr(lk.power, cl.map((v) => v / mean(cl)))).toBeLessThan(1e-11);
    expect(relErr(lk.sensitivity, rg.map((v) => v / mean(rg)))).toBeLessThan(1e-11);
    expect(mean(Array.from(lk.power))).toBeCloseTo(1, 12);
    expect(mean(Array.from(lk.sensitivity))).toBeCloseTo(1, 12);
    // Coefficients of variation with n − 1.
    const cv = (v: number[]) => {
      const m = mean(v);
      return Math.sqrt(v.reduce((s, x) => s + (x - m) ** 2, 0) / (v.length - 1)) / m;
    };
    for (let j = 0; j < n; j++) {
      expect(lk.variationBackward![j]).toBeCloseTo(cv(L.getColumn(j)), 10);
      expect(lk.variationForward![j]).toBeCloseTo(cv(G.getRow(j)), 10);
    }
    // Groups.
    for (let j = 0; j < n; j++) {
      const want = lk.power[j]! > 1 ? (lk.sensitivity[j]! > 1 ? 'key' : 'backward') : lk.sensitivity[j]! > 1 ? 'forward' : 'weak';
      expect(lk.group[j]).toBe(want);
      expect(lk.groups[want]).toContain(t.sectors.codes[j]);
    }
    const sizes = Object.values(lk.groups).reduce((s, g) => s + g.length, 0);
    expect(sizes).toBe(n);
    // The Ghosh route gives the same forward index.
    const viaGhosh = linkages(t, model, { ghosh: GhoshModel.fromTable(t) });
    expect(relErr(viaGhosh.sensitivity, lk.sensitivity)).toBeLessThan(1e-11);
    expect(relErr(viaGhosh.variationForward!, lk.variationForward!)).toBeLessThan(1e-10);
    expect(linkages(t, model, { variation: false }).variationBackward).toBeUndefined();
  });
  it('leave a sector with no output out of the Ghosh row sums, the averages and the coefficients of variation, and say so', () => {
    const t = makeTable({
      sectors: { codes: ['A', 'B', 'Z'] },
      Z: [
        [20, 30, 0],
        [40, 10, 0],
        [0, 0, 0],
      ],
      finalDemand: { codes: ['F'], values: [[50], [150], [0]] },
      valueAdded: { codes: ['VA'], values: [[40, 160, 0]] },
    });
    const model = LeontiefModel.fromTable(t);
    const lk = linkages(t, model);
    const B = new MlMatrix([
      [0.2, 0.3, 0],
      [0.2, 0.05, 0],
      [0, 0, 0],
    ]);
    const G = mlInverse(MlMatrix.eye(3).sub(B));
    const g = rowSum(G);
    expect(relErr(lk.totalForward.subarray(0, 2), g.slice(0, 2))).toBeLessThan(1e-12);
    expect(lk.totalForward[2]).toBeNaN();
    expect(lk.power[2]).toBeNaN();
    expect(lk.group[2]).toBe('no-output');
    // The indices average 1 over the two sectors with output.
    expect(lk.sensitivity[0]! + lk.sensitivity[1]!).toBeCloseTo(2, 12);
    expect(lk.findings[0]!.code).toBe('zero-output');
    expect(lk.findings[0]!.message).toContain("'Z'");
    const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;
    const cv = (v: number[]) => Math.sqrt(v.reduce((s, x) => s + (x - mean(v)) ** 2, 0) / (v.length - 1)) / mean(v);
    for (let i = 0; i < 2; i++) expect(lk.variationForward![i]).toBeCloseTo(cv(G.getRow(i).slice(0, 2)), 12);
    expect(lk.variationForward![2]).toBeNaN();
  });
});

describe('price model', () => {
  it('keeps every price at 1 when value added per unit is 1 minus the column sums of A (common practice)', () => {
    const t = randomTable({ n: 25, seed: 51 });
    const r = priceModel(t, LeontiefModel.fromTable(t));
    for (let j = 0; j < 25; j++) {
      expect(r.base[j]).toBeCloseTo(1, 12);
      expect(r.index[j]).toBeCloseTo(1, 12);
      expect(r.change[j]).toBe(0);
    }
    expect(r.findings).toEqual([]);
  });

  it('passes a wage rise, a tax per unit and an import price shock on as a dense computation does (source: ml-matrix inverse)', () => {
    const n = 18;
    const t = randomTable({ n, seed: 52 });
    const model = LeontiefModel.fromTable(t);
    const r = priceModel(t, model, {
      valueAdded: [
        { sector: 'S04', row: 'COE', percent: 10 },
        { row: 'TAX', percent: 5 },
        { sector: 'S09', perUnit: 0.02 },
      ],
      importPrice: 20,
    });
    const L = denseL(denseA(t));
    const dv = new Array(n).fill(0);
    dv[3] += (0.1 * t.V.data[3]!) / t.x[3]!;
    for (let j = 0; j < n; j++) dv[j] += (0.05 * t.V.data[2 * n + j]!) / t.x[j]!;
    dv[8] += 0.02;
    for (let j = 0; j < n; j++) dv[j] += (0.2 * t.imports![j]!) / t.x[j]!;
    expect(relErr(r.costChange, dv)).toBeLessThan(1e-13);
    const dp = rowTimes(dv, L);
    expect(relErr(r.change, dp)).toBeLessThan(1e-11);
    for (let j = 0; j < n; j++) {
      expect(r.percent[j]).toBeCloseTo(100 * dp[j]!, 9);
      expect(r.change[j]!).toBeGreaterThan(0);
    }
    // Import shocks by using sector.
    const r2 = priceModel(t, model, { importPrice: [{ sector: 'S02', percent: 50 }] });
    const dv2 = new Array(n).fill(0);
    dv2[1] = (0.5 * t.imports![1]!) / t.x[1]!;
    expect(relErr(r2.change, rowTimes(dv2, L))).toBeLessThan(1e-11);
  });

  it('says clearly when a shock cannot be applied', () => {
    const t = randomTable({ n: 4, seed: 53, imports: false });
    const m = LeontiefModel.fromTable(t);
    expect(() => priceModel(t, m, { importPrice: 10 })).toThrow(/no imports row/);
    expect(() => priceModel(t, m, { valueAdded: [{ row: 'WAGES', percent: 3 }] })).toThrow(/no value-added row 'WAGES'/);
    expect(() => priceModel(t, m, { valueAdded: [{ sector: 'X1', percent: 3 }] })).toThrow(InputError);
    expect(() => priceModel(t, m, { valueAdded: [{ percent: 3, perUnit: 0.1 }] })).toThrow(/not both/);
  });

  it('warns when the table does not balance, so base prices are not 1', () => {
    const t = makeTable({
      sectors: { codes: ['A', 'B'] },
      Z: [
        [10, 20],
        [30, 40],
      ],
      finalDemand: { codes: ['F'], values: [[70], [130]] },
      valueAdded: { codes: ['VA'], values: [[50, 140]] },
    });
    const r = priceModel(t, LeontiefModel.fromTable(t));
    expect(r.findings[0]!.code).toBe('base-price');
    expect(r.base[0]).not.toBeCloseTo(1, 3);
  });
});
