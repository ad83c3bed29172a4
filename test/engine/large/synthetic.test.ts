/**
 * The synthetic multi-regional generator: reproducible, balanced (common practice: rows
 * Σⱼ zᵢⱼ + Σ fᵢ = xᵢ and columns Σᵢ zᵢⱼ + Σ vⱼ = xⱼ), shaped as asked, and accepted by the
 * engine's own checks without errors. Invented data: these tests prove the generator, not any
 * analysis.
 */
import { describe, expect, it } from 'vitest';
import { syntheticCoefficients, syntheticTable } from '../../../engine/synthetic';
import { checks } from '../../../engine/checks';
import { hasErrors } from '../../../engine/findings';
import { density } from '../../../engine/linalg/sparse';
import { InputError } from '../../../engine/errors';

describe('syntheticTable', () => {
  const opts = { regions: 4, sectors: 30, seed: 11, density: 0.08 };
  const t = syntheticTable(opts);
  const n = 120;

  it('is reproducible from its seed, and another seed gives another table', () => {
    const again = syntheticTable(opts);
    expect(again.Z.data).toEqual(t.Z.data);
    expect(again.x).toEqual(t.x);
    expect(again.F.data).toEqual(t.F.data);
    expect(again.V.data).toEqual(t.V.data);
    expect(again.satellites[0]!.values).toEqual(t.satellites[0]!.values);
    const other = syntheticTable({ ...opts, seed: 12 });
    expect(other.Z.data).not.toEqual(t.Z.data);
  });

  it('passes the engine checks without errors', () => {
    const f = checks(t);
    expect(hasErrors(f)).toBe(false);
    expect(f.filter((x) => x.code.includes('imbalance'))).toEqual([]);
    for (const seed of [1, 2, 3]) expect(hasErrors(checks(syntheticTable({ regions: 3, sectors: 15, seed })))).toBe(false);
  });

  it('balances its rows and columns to rounding', () => {
    for (let i = 0; i < n; i++) {
      let row = 0;
      let col = 0;
      for (let j = 0; j < n; j++) {
        row += t.Z.data[i * n + j]!;
        col += t.Z.data[j * n + i]!;
      }
      for (let c = 0; c < t.F.cols; c++) row += t.F.data[i * t.F.cols + c]!;
      for (let r = 0; r < t.V.rows; r++) col += t.V.data[r * n + i]!;
      expect(Math.abs(row - t.x[i]!)).toBeLessThan(1e-10 * t.x[i]!);
      expect(Math.abs(col - t.x[i]!)).toBeLessThan(1e-10 * t.x[i]!);
    }
    for (const v of t.F.data) expect(v).toBeGreaterThan(0);
    for (const v of t.V.data) expect(v).toBeGreaterThan(0);
  });

  it('has dense own-region blocks, sparse and weaker trade, and about the density asked', () => {
    const S = 30;
    let inCells = 0, inNz = 0, inSum = 0, outCells = 0, outNz = 0, outSum = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const v = t.Z.data[i * n + j]!;
        if (Math.floor(i / S) === Math.floor(j / S)) {
          inCells++;
          if (v) inNz++;
          inSum += v;
        } else {
          outCells++;
          if (v) outNz++;
          outSum += v;
        }
      }
    }
    expect(inNz / inCells).toBeGreaterThan(0.2);
    expect(outNz / outCells).toBeLessThan(inNz / inCells / 3);
    expect(outSum).toBeLessThan(inSum / 2);
    expect(density(t.Z)).toBeGreaterThan(0.05);
    expect(density(t.Z)).toBeLessThan(0.11);
  });

  it('names regions and sectors, marks itself invented, and keeps column sums of A in range', () => {
    expect(t.sectors.codes[0]).toBe('R1-S01');
    expect(t.sectors.codes[n - 1]).toBe('R4-S30');
    expect(t.meta.invented).toBe(true);
    expect(t.satellites[0]!.unit).toBe('jobs');
    const A = syntheticCoefficients({ regions: 2, sectors: 10, seed: 3, coefficientSum: [0.4, 0.5] });
    const col = new Float64Array(20);
    for (let i = 0; i < 20; i++) for (let q = A.rowPtr[i]!; q < A.rowPtr[i + 1]!; q++) col[A.colIdx[q]!] += A.values[q]!;
    for (const s of col) {
      expect(s).toBeGreaterThanOrEqual(0.4 - 1e-12);
      expect(s).toBeLessThanOrEqual(0.5 + 1e-12);
    }
  });

  it('refuses impossible options', () => {
    expect(() => syntheticTable({ regions: 0, sectors: 5 })).toThrow(InputError);
    expect(() => syntheticTable({ regions: 2, sectors: 5, coefficientSum: [0.5, 1.2] })).toThrow(/between/);
    expect(() => syntheticTable({ regions: 2, sectors: 5, density: 2 })).toThrow(/density/);
  });
});
