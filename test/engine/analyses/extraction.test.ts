/**
 * Hypothetical extraction, the mixed model and footprints: the identities (a sector with no
 * intermediate flows changes only its own output; the mixed model with nothing fixed is the
 * open model) and every result on random tables against plain dense computations with
 * ml-matrix (source: ml-matrix 6.15.1): matrices with rows and columns removed or zeroed, and
 * inverted directly.
 */
import { describe, expect, it } from 'vitest';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { extractEach, extraction } from '../../../engine/extraction';
import { footprint, footprints } from '../../../engine/footprint';
import { buildModels } from '../../../engine/household';
import { LeontiefModel } from '../../../engine/leontief';
import { measures } from '../../../engine/measures';
import { mixedModel } from '../../../engine/mixed';
import { makeTable } from '../../../engine/table';
import type { Table } from '../../../engine/table';
import { denseA, denseL, randomTable, relErr, rowTimes, timesCol } from './tables';

function implied(t: Table): { f: number[]; v: number[] } {
  const n = t.x.length;
  const f = Array.from(t.x);
  const v = Array.from(t.x);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      f[i]! -= t.Z.data[i * n + j]!;
      v[j]! -= t.Z.data[i * n + j]!;
    }
  }
  return { f, v };
}

/** Dense extraction: the three variants computed from their definitions. */
function denseExtraction(t: Table, S: number[]): { total: number[]; backward: number[]; forward: number[] } {
  const n = t.x.length;
  const A = denseA(t);
  const { f, v } = implied(t);
  const R = [...Array(n).keys()].filter((i) => !S.includes(i));
  const ARR = A.selection(R, R);
  const xR = timesCol(mlInverse(MlMatrix.eye(R.length).sub(ARR)), R.map((i) => f[i]!));
  const total = new Array(n).fill(0);
  R.forEach((i, k) => (total[i] = xR[k]!));
  const Ab = A.clone();
  for (const j of S) for (let i = 0; i < n; i++) Ab.set(i, j, 0);
  const backward = timesCol(mlInverse(MlMatrix.eye(n).sub(Ab)), f);
  const B = new MlMatrix(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) B.set(i, j, S.includes(i) || !(t.x[i]! > 0) ? 0 : t.Z.data[i * n + j]! / t.x[i]!);
  const forward = rowTimes(v, mlInverse(MlMatrix.eye(n).sub(B)));
  return { total, backward, forward };
}

describe('hypothetical extraction', () => {
  const n = 16;
  const t = randomTable({ n, seed: 61, density: 0.6 });
  const model = LeontiefModel.fromTable(t);

  for (const group of [['S04'], ['S02', 'S09', 'S13']]) {
    it(`of ${group.join(', ')} matches the dense definitions (source: ml-matrix inverse)`, () => {
      const S = group.map((c) => t.sectors.codes.indexOf(c));
      const r = extraction(t, model, group);
      const ref = denseExtraction(t, S);
      const xTotal = Array.from(t.x).reduce((a, b) => a + b, 0);
      expect(r.baselineTotal).toBeCloseTo(xTotal, 9);
      for (const k of ['total', 'backward', 'forward'] as const) {
        expect(relErr(r[k].output, ref[k])).toBeLessThan(1e-10);
        const loss = xTotal - ref[k].reduce((a, b) => a + b, 0);
        expect(r[k].loss).toBeCloseTo(loss, 7);
        expect(r[k].lossPercent).toBeCloseTo((100 * loss) / xTotal, 9);
        expect(r[k].loss).toBeGreaterThan(0);
      }
      expect(r.extracted).toEqual(group);
      expect(r.unit).toBe('USD millions');
    });
  }

  it('of every sector in turn agrees with extracting each alone', () => {
    const rank = extractEach(t, model);
    for (let j = 0; j < n; j++) {
      const one = extraction(t, model, t.sectors.codes[j]!);
      expect(rank.total[j]).toBeCloseTo(one.total.loss, 7);
      expect(rank.backward[j]).toBeCloseTo(one.backward.loss, 7);
      expect(rank.forward[j]).toBeCloseTo(one.forward.loss, 7);
      expect(rank.totalPercent[j]).toBeCloseTo(one.total.lossPercent, 9);
    }
  });

  it('of a sector with no intermediate flows changes only its own output (common practice)', () => {
    // Sector C neither buys from nor sells to other sectors.
    const t2 = makeTable({
      sectors: { codes: ['A', 'B', 'C'] },
      Z: [
        [20, 30, 0],
        [40, 10, 0],
        [0, 0, 0],
      ],
      finalDemand: { codes: ['F'], values: [[50], [150], [75]] },
      valueAdded: { codes: ['VA'], values: [[40, 160, 75]] },
    });
    const r = extraction(t2, LeontiefModel.fromTable(t2), 'C');
    expect(r.total.lossBySector[0]).toBeCloseTo(0, 10);
    expect(r.total.lossBySector[1]).toBeCloseTo(0, 10);
    expect(r.total.lossBySector[2]).toBeCloseTo(75, 10);
    expect(r.total.loss).toBeCloseTo(75, 9);
    expect(r.backward.loss).toBeCloseTo(0, 9);
    expect(r.forward.loss).toBeCloseTo(0, 9);
  });

  it('of every sector in turn falls back on the Ghosh inverse when a sector has no output', () => {
    const t2 = makeTable({
      sectors: { codes: ['A', 'B', 'Z'] },
      Z: [
        [20, 30, 0],
        [40, 10, 0],
        [0, 0, 0],
      ],
      finalDemand: { codes: ['F'], values: [[50], [150], [0]] },
      valueAdded: { codes: ['VA'], values: [[40, 160, 0]] },
    });
    const m2 = LeontiefModel.fromTable(t2);
    const rank = extractEach(t2, m2);
    for (let j = 0; j < 3; j++) {
      const ref = denseExtraction(t2, [j]);
      const loss = (v: number[]) => 300 - v.reduce((a, b) => a + b, 0);
      expect(rank.total[j]).toBeCloseTo(loss(ref.total), 9);
      expect(rank.backward[j]).toBeCloseTo(loss(ref.backward), 9);
      expect(rank.forward[j]).toBeCloseTo(loss(ref.forward), 9);
    }
    expect(rank.total[2]).toBe(0);
  });

  it('names unknown, repeated or all sectors', () => {
    expect(() => extraction(t, model, 'NOPE')).toThrow(/no sector 'NOPE'/);
    expect(() => extraction(t, model, ['S01', 'S01'])).toThrow(/named twice/);
    expect(() => extraction(t, model, t.sectors.codes)).toThrow(/every sector/);
    expect(() => extraction(t, model, [])).toThrow(/no sector was named/);
  });
});

describe('mixed model', () => {
  const n = 14;
  const t = randomTable({ n, seed: 71 });
  const model = LeontiefModel.fromTable(t);

  it('with nothing fixed is the open model', () => {
    const r = mixedModel(t, model, []);
    expect(relErr(r.output, t.x)).toBeLessThan(1e-11);
    const d = Array.from({ length: n }, (_, i) => (i % 4) * 3 - 2);
    const r2 = mixedModel(t, model, [], { finalDemand: d });
    expect(relErr(r2.output, model.solve(d))).toBeLessThan(1e-13);
    expect(relErr(r2.output, timesCol(denseL(denseA(t)), d))).toBeLessThan(1e-11);
    expect(r2.finalDemand).toEqual(Float64Array.from(d));
  });

  it('matches the partitioned formulas x_E = (I − A_EE)⁻¹(f_E + A_EX x_X), f_X = (I − A_XX)x_X − A_XE x_E (source: ml-matrix inverse)', () => {
    const fixed = [
      { sector: 'S03', output: 0.8 * t.x[2]! },
      { sector: 'S10', output: 1.1 * t.x[9]! },
    ];
    const X = [2, 9];
    const Eidx = [...Array(n).keys()].filter((i) => !X.includes(i));
    const r = mixedModel(t, model, fixed);
    const A = denseA(t);
    const { f } = implied(t);
    const xX = fixed.map((c) => c.output);
    const rhs = timesCol(A.selection(Eidx, X), xX).map((v, k) => v + f[Eidx[k]!]!);
    const xE = timesCol(mlInverse(MlMatrix.eye(Eidx.length).sub(A.selection(Eidx, Eidx))), rhs);
    const fX = timesCol(MlMatrix.eye(2).sub(A.selection(X, X)), xX).map((v, k) => v - timesCol(A.selection(X, Eidx), xE)[k]!);
    Eidx.forEach((i, k) => expect(r.output[i]).toBeCloseTo(xE[k]!, 8));
    X.forEach((i, k) => {
      expect(r.output[i]).toBe(xX[k]);
      expect(r.finalDemand[i]).toBeCloseTo(fX[k]!, 8);
      expect(r.isFixed[i]).toBe(true);
    });
    expect(r.fixed).toEqual(['S03', 'S10']);
    expect(r.residual).toBeLessThan(1e-13);
  });

  it('warns when a fixed output cannot cover the other sectors, and refuses bad input', () => {
    const r = mixedModel(t, model, [{ sector: 'S05', output: 0 }]);
    expect(r.finalDemand[4]!).toBeLessThan(0);
    expect(r.findings[0]!.code).toBe('fixed-output-short');
    expect(r.findings[0]!.message).toContain("'S05'");
    expect(() => mixedModel(t, model, [{ sector: 'S05', output: 1 }, { sector: 'S05', output: 2 }])).toThrow(/fixed twice/);
    expect(() => mixedModel(t, model, [{ sector: 'Q', output: 1 }])).toThrow(/no sector 'Q'/);
    expect(() => mixedModel(t, model, [{ sector: 'S01', output: Number.NaN }])).toThrow(/not a finite number/);
  });
});

describe('footprints', () => {
  it('attribute e′L f to final-demand categories and sectors as a dense computation does (source: ml-matrix inverse)', () => {
    const n = 22;
    const t = randomTable({ n, seed: 81 });
    const models = buildModels(t);
    const ghg = measures(t).find((m) => m.code === 'GHG')!;
    const fp = footprint(t, models.open, ghg);
    const L = denseL(denseA(t));
    const m = rowTimes(ghg.coefficients, L);
    const k = 3;
    for (let c = 0; c < k; c++) {
      const col = Array.from({ length: n }, (_, i) => t.F.data[i * k + c]!);
      expect(fp.byCategory[c]).toBeCloseTo(m.reduce((s, v, i) => s + v * col[i]!, 0), 7);
    }
    const f = Array.from({ length: n }, (_, i) => t.F.data[i * k]! + t.F.data[i * k + 1]! + t.F.data[i * k + 2]!);
    const lf = timesCol(L, f);
    for (let i = 0; i < n; i++) {
      expect(fp.bySector[i]).toBeCloseTo(m[i]! * f[i]!, 8);
      expect(fp.byOrigin[i]).toBeCloseTo(ghg.coefficients[i]! * lf[i]!, 8);
      expect(fp.bySectorAndCategory.data[i * k + 1]).toBeCloseTo(m[i]! * t.F.data[i * k + 1]!, 8);
    }
    const total = m.reduce((s, v, i) => s + v * f[i]!, 0);
    expect(fp.total).toBeCloseTo(total, 6);
    // In a balanced table the consumption-based total equals the production-based one.
    const prod = t.satellites[1]!.values.reduce((a, b) => a + b, 0);
    expect(fp.production).toBeCloseTo(prod, 6);
    expect(fp.total / prod).toBeCloseTo(1, 11);
    expect(fp.byOrigin.reduce((a, b) => a + b, 0) / prod).toBeCloseTo(1, 11);
    expect(fp.unit).toBe('t CO2e');
    const all = footprints(models, measures(t));
    expect(all[4]!.total).toBeCloseTo(fp.total, 9);
  });
});
