/**
 * Regionalisation by quotients: SLQ, CILQ, FLQ, AFLQ and the supply-demand pool, the regional
 * table, and the two-region model.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { InputError } from '../../../engine/errors';
import { LeontiefModel } from '../../../engine/leontief';
import { multipliers } from '../../../engine/multipliers';
import { buildModels } from '../../../engine/household';
import { measures } from '../../../engine/measures';
import { makeTable } from '../../../engine/table';
import type { Table } from '../../../engine/table';
import { checks } from '../../../engine/checks';
import { aflq, cilq, flq, flqLambda, regionalCoefficients, regionalise, slq, TwoRegionModel } from '../../../engine/regional/index';
import type { RegionalBasis, RegionalMethod } from '../../../engine/regional/index';
import { randomCoefficients, rng } from '../../helpers/random';

const METHODS: RegionalMethod[] = ['slq', 'cilq', 'flq', 'aflq', 'sdp'];

/**
 * The hand example: national coefficients A and employment E = [100, 300, 600] (1000 jobs), a
 * region with e = [20, 20, 60] (100 jobs, a share of 0.1). SLQ = (0.2/0.1, 0.2/0.3, 0.6/0.6)
 * = [2, 2/3, 1]. The formulas are those of Miller & Blair (2009), ch. 8 (from memory: the book's
 * own numbers are not recalled, so this example is worked by hand instead).
 */
const A0 = [
  [0.2, 0.1, 0.1],
  [0.3, 0.3, 0.2],
  [0.1, 0.2, 0.1],
];
const X0 = [1000, 2000, 1000];
function handTable(): Table {
  // Flows Z = A x̂, final demand closing each row, value added closing each column.
  const Z = A0.map((row) => row.map((a, j) => a * X0[j]!));
  const fd = Z.map((row, i) => [X0[i]! - row.reduce((s, v) => s + v, 0)]);
  const va = [X0.map((x, j) => x - Z.reduce((s, row) => s + row[j]!, 0))];
  return makeTable({ sectors: { codes: ['AGR', 'MAN', 'SRV'] }, Z, finalDemand: { codes: ['FD'], values: fd }, valueAdded: { codes: ['VA'], values: va }, x: X0 });
}
const handBasis: RegionalBasis = { kind: 'employment', unit: 'jobs', region: Float64Array.of(20, 20, 60), nation: Float64Array.of(100, 300, 600), name: 'Hand region' };

function rows(m: { rows: number; cols: number; data: Float64Array }): number[][] {
  return Array.from({ length: m.rows }, (_, i) => Array.from(m.data.subarray(i * m.cols, (i + 1) * m.cols)));
}
function expectClose(got: number[][], want: number[][], tol: number): void {
  got.forEach((row, i) => row.forEach((v, j) => expect(v, `cell (${i + 1}, ${j + 1})`).toBeCloseTo(want[i]![j]!, -Math.log10(tol))));
}

describe('location quotients on a hand example (formulas: Miller & Blair 2009, ch. 8, from memory; numbers by hand)', () => {
  it('SLQ is the regional share over the national share', () => {
    const s = slq(handBasis);
    expect(Array.from(s)).toEqual([2, 0.2 / 0.3, 1].map((v) => expect.closeTo(v, 12)));
    // Row i is scaled by min(1, SLQ_i): only MAN (2/3) loses; AGR (2) is capped at 1.
    const r = regionalCoefficients(handTable(), handBasis, { method: 'slq' });
    expectClose(rows(r.A), [[0.2, 0.1, 0.1], [0.3 * (2 / 3), 0.3 * (2 / 3), 0.2 * (2 / 3)], [0.1, 0.2, 0.1]], 1e-12);
    expect(r.capped.map((c) => c.code)).toEqual(['AGR']);
  });

  it('CILQ is SLQ_i / SLQ_j off the diagonal and SLQ_i on it (Smith & Morrison 1974, from memory)', () => {
    expectClose(rows(cilq(handBasis)), [[2, 3, 2], [1 / 3, 2 / 3, 2 / 3], [0.5, 1.5, 1]], 1e-12);
    const r = regionalCoefficients(handTable(), handBasis, { method: 'cilq' });
    // by hand: row AGR all capped; MAN × [1/3, 2/3, 2/3]; SRV × [1/2, 1 (capped), 1]
    expectClose(rows(r.A), [[0.2, 0.1, 0.1], [0.1, 0.2, 0.2 * (2 / 3)], [0.05, 0.2, 0.1]], 1e-12);
    expect(r.capped.map((c) => [c.code, c.cells])).toEqual([['AGR', 3], ['SRV', 1]]);
  });

  it('FLQ: λ = [log2(1 + regional/national employment)]^δ, by hand', () => {
    // by hand: log2(1.1) = 0.1375035; 0.1375035^0.3 = exp(0.3 × ln 0.1375035) = exp(−0.595231) = 0.551435
    expect(flqLambda(0.1, 0.3)).toBeCloseTo(0.551435, 6);
    // a region half the nation: log2(1.5) = 0.5849625; ^0.3 = 0.851. δ = 0 gives 1; a whole nation gives 1.
    expect(flqLambda(0.5, 0.3)).toBeCloseTo(0.851, 3);
    expect(flqLambda(0.1, 0)).toBe(1);
    expect(flqLambda(1, 0.7)).toBe(1);
    const { Q, lambda } = flq(handBasis, 0.3);
    expect(lambda).toBeCloseTo(0.551435, 6);
    const L = 0.551435;
    expectClose(rows(Q), [[2 * L, 3 * L, 2 * L], [L / 3, (2 / 3) * L, (2 / 3) * L], [0.5 * L, 1.5 * L, L]], 1e-5);
    const r = regionalCoefficients(handTable(), handBasis, { method: 'flq', delta: 0.3 });
    // by hand: AGR row capped (1.103, 1.654, 1.103); MAN 0.3 × 0.183812, 0.3 × 0.367623, 0.2 × 0.367623;
    // SRV 0.1 × 0.275717, 0.2 × 0.827152, 0.1 × 0.551435
    expectClose(rows(r.A), [[0.2, 0.1, 0.1], [0.0551436, 0.110287, 0.0735247], [0.0275717, 0.16543, 0.0551435]], 1e-5);
  });

  it('AFLQ multiplies the buyer’s column by log2(1 + SLQ_j) where SLQ_j > 1 (Flegg & Webber 2000, from memory), by hand', () => {
    const { Q } = aflq(handBasis, 0.3);
    const L = 0.551435;
    const f = Math.log2(3); // SLQ_AGR = 2; 1.5849625
    expectClose(rows(Q), [[2 * L * f, 3 * L, 2 * L], [(L / 3) * f, (2 / 3) * L, (2 / 3) * L], [0.5 * L * f, 1.5 * L, L]], 1e-5);
    const r = regionalCoefficients(handTable(), handBasis, { method: 'aflq', delta: 0.3 });
    // by hand: MAN→AGR 0.3 × 0.291335 = 0.0874005; SRV→AGR 0.1 × 0.437002 = 0.0437002
    expect(r.A.data[3]).toBeCloseTo(0.0874005, 6);
    expect(r.A.data[6]).toBeCloseTo(0.0437002, 6);
  });

  it('SDP: the regional purchase coefficient is regional output over regional demand, at most 1, by hand', () => {
    const t = handTable();
    const r = regionalCoefficients(t, handBasis, { method: 'sdp' });
    // xᴿ = x · e/E = [200, 133.33, 100]; final demand FD = x − Z i = [500, 900, 400], × 0.1 = [50, 90, 40];
    // demand AGR = 0.2·200 + 0.1·133.33 + 0.1·100 + 50 = 113.33 → 200/113.33 = 1.764706 (capped at 1);
    // MAN = 0.3·200 + 0.3·133.33 + 0.2·100 + 90 = 210 → 133.33/210 = 0.634921; SRV = 20 + 26.667 + 10 + 40 = 96.667 → 1.034483 (capped)
    expect(Array.from(r.xR)).toEqual([200, 2000 / 15, 100].map((v) => expect.closeTo(v, 10)));
    expect(r.sectorQuotient[0]).toBeCloseTo(1.764706, 6);
    expect(r.sectorQuotient[1]).toBeCloseTo(0.634921, 6);
    expect(r.sectorQuotient[2]).toBeCloseTo(1.034483, 6);
    expect(r.A.data[3]).toBeCloseTo(0.3 * 0.634921, 6);
    expect(r.A.data[0]).toBe(0.2);
    expect(r.capped.map((c) => c.code)).toEqual(['AGR', 'SRV']);
  });
});

describe('the regional table', () => {
  it('balances its columns, carries its provenance and the cautions, and passes the checks', () => {
    const t = handTable();
    const R = regionalise(t, handBasis, { method: 'flq', delta: 0.3, source: { file: 'region.csv', sha256: 'ab'.repeat(32) } });
    expect(R.provenance).toMatchObject({ method: 'flq', delta: 0.3, basis: 'employment', file: 'region.csv', sha256: 'ab'.repeat(32), capped: ['AGR'], region: 'Hand region' });
    expect(R.provenance.lambda).toBeCloseTo(0.551435, 6);
    const f = checks(R.table);
    expect(f.filter((x) => x.severity === 'error')).toEqual([]);
    expect(f.some((x) => x.code === 'column-imbalance' || x.code === 'row-imbalance')).toBe(false);
    expect(R.cautions.join(' ')).toMatch(/overstate regional multipliers/);
    expect(R.cautions.join(' ')).toMatch(/survey-based or hybrid/);
    expect(R.cautions.join(' ')).toMatch(/local guidance/i);
    expect(R.table.meta.region).toBe('Hand region');
    expect(R.table.imports).toBeDefined();
  });

  it('quotient methods give regional output multipliers no larger than the national ones, SLQ the largest of them (common practice)', () => {
    const t = handTable();
    const nat = new LeontiefModel(regionalCoefficients(t, handBasis, { method: 'slq' }).national).outputMultipliers();
    const of = (method: RegionalMethod) => new LeontiefModel(regionalCoefficients(t, handBasis, { method, delta: 0.3 }).A).outputMultipliers();
    const [s, c, fl] = [of('slq'), of('cilq'), of('flq')];
    for (let j = 0; j < 3; j++) {
      expect(s[j]!).toBeLessThanOrEqual(nat[j]! + 1e-12);
      expect(c[j]!).toBeLessThanOrEqual(s[j]! + 1e-12);
      expect(fl[j]!).toBeLessThanOrEqual(c[j]! + 1e-12);
    }
  });

  it('refuses a region with employment where the nation has none, naming the sector', () => {
    const b = { ...handBasis, nation: Float64Array.of(100, 0, 600) };
    expect(() => regionalise(handTable(), b, { method: 'slq' })).toThrow(/'MAN'/);
    expect(() => regionalise(handTable(), handBasis, { method: 'flq', delta: 1.5 })).toThrow(InputError);
    expect(() => regionalise(handTable(), { ...handBasis, region: Float64Array.of(1, -2, 3) }, { method: 'slq' })).toThrow(/sector 'MAN' is -2/);
  });
});

/** A random productive table of n sectors with value added and one final-demand column. */
function randomTable(n: number, seed: number): Table {
  const A = randomCoefficients(n, seed, 0.7, 0.7);
  const r = rng(seed + 1);
  const x = Array.from({ length: n }, () => 50 + 1000 * r());
  const Z = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => A.data[i * n + j]! * x[j]!));
  // x = Z i + f needs f ≥ 0: make x the output of a positive final demand instead.
  const f = Array.from({ length: n }, () => 10 + 500 * r());
  const xx = new LeontiefModel(A).solve(f);
  const ZZ = Z.map((row, i) => row.map((_, j) => A.data[i * n + j]! * xx[j]!));
  const va = [Array.from(xx, (xj, j) => xj - ZZ.reduce((s, row) => s + row[j]!, 0))];
  return makeTable({ sectors: { codes: Array.from({ length: n }, (_, i) => `S${i + 1}`) }, Z: ZZ, finalDemand: { codes: ['FD'], values: f.map((v) => [v]) }, valueAdded: { codes: ['VA'], values: va }, x: Array.from(xx), satellites: [{ code: 'JOBS', unit: 'jobs', values: Array.from(xx, (v) => v * (0.5 + r())) }] });
}

const tables = fc.record({ n: fc.integer({ min: 1, max: 9 }), seed: fc.integer({ min: 1, max: 2 ** 30 }) });
const regionOf = (t: Table, seed: number): RegionalBasis => {
  const r = rng(seed);
  const nation = Float64Array.from(t.satellites[0]!.values);
  return { kind: 'employment', unit: 'jobs', nation, region: nation.map((v) => v * (0.02 + 0.9 * r())) };
};

describe('properties (fast-check)', () => {
  it('FLQ with δ = 0 equals CILQ capped at 1', () => {
    fc.assert(
      fc.property(tables, ({ n, seed }) => {
        const t = randomTable(n, seed);
        const b = regionOf(t, seed + 7);
        const f = regionalCoefficients(t, b, { method: 'flq', delta: 0 });
        const c = regionalCoefficients(t, b, { method: 'cilq' });
        expect(Array.from(f.A.data)).toEqual(Array.from(c.A.data));
        expect(Array.from(f.applied.data)).toEqual(Array.from(cilq(b).data, (q) => Math.min(1, q)));
      }),
      { numRuns: 60 },
    );
  });

  it('a region that is the whole nation gets the national table back, by every method', () => {
    fc.assert(
      fc.property(tables, fc.constantFrom(...METHODS), fc.constantFrom('employment' as const, 'output' as const), ({ n, seed }, method, kind) => {
        const t = randomTable(n, seed);
        const nation = kind === 'output' ? Float64Array.from(t.x) : Float64Array.from(t.satellites[0]!.values);
        const R = regionalise(t, { kind, unit: 'u', nation, region: Float64Array.from(nation) }, { method, delta: 0.3 });
        const close = (a: ArrayLike<number>, b: ArrayLike<number>) => Array.from(a).forEach((v, k) => expect(v).toBeCloseTo(b[k]!, 9));
        close(R.table.Z.data, t.Z.data);
        close(R.table.x, t.x);
        close(R.table.V.data, t.V.data);
        close(R.table.F.data, t.F.data);
        expect(R.table.finalDemand.codes).toEqual(t.finalDemand.codes);
        expect(R.table.imports).toBeUndefined();
        expect(R.capped).toEqual([]);
      }),
      { numRuns: 60 },
    );
  });

  it('the two-region model’s total output equals the national model’s, and its split adds up', () => {
    fc.assert(
      fc.property(tables, fc.constantFrom(...METHODS), fc.integer({ min: 0, max: 2 ** 30 }), ({ n, seed }, method, dseed) => {
        const t = randomTable(n, seed);
        const b = regionOf(t, seed + 3);
        const two = new TwoRegionModel(t, b, { method, delta: 0.3 });
        const r = rng(dseed);
        const dR = Array.from({ length: n }, () => r() * 100);
        const dS = Array.from({ length: n }, () => r() * 100);
        const x2 = two.solve(dR, dS);
        const xN = new LeontiefModel(regionalCoefficients(t, b, { method }).national).solve(dR.map((v, i) => v + dS[i]!));
        for (let i = 0; i < n; i++) expect(x2.region[i]! + x2.rest[i]!).toBeCloseTo(xN[i]!, 8);
        const sp = two.split(dR);
        for (let i = 0; i < n; i++) expect(sp.intraregional[i]! + sp.feedback[i]!).toBeCloseTo(sp.region[i]!, 9);
        expect(sp.totals.feedback).toBeGreaterThanOrEqual(-1e-9);
        expect(sp.totals.spillover).toBeGreaterThanOrEqual(-1e-9);
        const natTotal = new LeontiefModel(regionalCoefficients(t, b, { method }).national).solve(dR).reduce((s, v) => s + v, 0);
        expect(sp.totals.nation).toBeCloseTo(natTotal, 7);
      }),
      { numRuns: 50 },
    );
  });

  it('regional tables by every method pass the checks and their multipliers do not exceed the national ones', () => {
    fc.assert(
      fc.property(tables, fc.constantFrom(...METHODS), ({ n, seed }, method) => {
        const t = randomTable(n, seed);
        const R = regionalise(t, regionOf(t, seed + 5), { method, delta: 0.3 });
        expect(checks(R.table).filter((f) => f.severity === 'error')).toEqual([]);
        const mR = multipliers(buildModels(R.table, {}), measures(R.table).slice(0, 1))[0]!;
        const mN = multipliers(buildModels(t, {}), measures(t).slice(0, 1))[0]!;
        for (let j = 0; j < n; j++) expect(mR.simple[j]!).toBeLessThanOrEqual(mN.simple[j]! + 1e-9);
      }),
      { numRuns: 40 },
    );
  });
});
