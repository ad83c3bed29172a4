/**
 * Supply-use derivations: identities of the model (from the agency's own derivation, source:
 * U.S. Bureau of Economic Analysis, "Mathematical derivation of the total requirements tables",
 * equations (1)–(11), in ../shared/reference/us-bea-1997-summary/layouts/agency-method.txt),
 * and each formula against an independent computation with ml-matrix (source: ml-matrix 6.15.1).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Matrix as MlMatrix, inverse as mlInverse } from 'ml-matrix';
import { supplyUse } from '../../engine/supply-use';
import type { Matrix } from '../../engine/linalg/matrix';
import { matVec, toRows, zeros } from '../../engine/linalg/matrix';
import { InputError } from '../../engine/errors';
import { rng } from '../helpers/random';

const ml = (m: Matrix) => new MlMatrix(toRows(m));
const axis = (p: string, n: number) => {
  const codes = Array.from({ length: n }, (_, i) => `${p}${i + 1}`);
  return { codes, labels: codes };
};

/** Random consistent make and use tables: ni industries, nc commodities, use columns summing below output. */
function randomSupplyUse(ni: number, nc: number, seed: number, withScrap: boolean) {
  const r = rng(seed);
  const make = zeros(ni, nc);
  const made = withScrap ? nc - 1 : nc; // scrap is never anyone's main product
  for (let i = 0; i < ni; i++) {
    for (let c = 0; c < nc; c++) make.data[i * nc + c] = (i % made === c ? 50 : 0) + (r() < 0.4 ? r() * 10 : 0);
  }
  const scrapIdx = withScrap ? nc - 1 : -1;
  if (withScrap) for (let i = 0; i < ni; i++) make.data[i * nc + scrapIdx] = r() * 2;
  const g = new Float64Array(ni);
  for (let i = 0; i < ni; i++) for (let c = 0; c < nc; c++) g[i] += make.data[i * nc + c]!;
  const use = zeros(nc, ni);
  for (let i = 0; i < ni; i++) {
    const share = 0.2 + 0.5 * r();
    const w = Array.from({ length: nc }, () => r());
    const s = w.reduce((a, b) => a + b, 0);
    for (let c = 0; c < nc; c++) use.data[c * ni + i] = (w[c]! / s) * share * g[i]!;
  }
  return { make, use, g, scrap: withScrap ? `C${nc}` : undefined };
}

describe('industry technology, market shares and scrap', () => {
  it('W (I − BW)⁻¹ e reproduces industry output g for the final demand e = q − U i (agency equation 11)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 9 }), fc.integer({ min: 0, max: 3 }), fc.integer({ min: 1, max: 1e9 }), fc.boolean(), (ni, extra, seed, withScrap) => {
        const nc = ni + extra;
        const { make, use, g, scrap } = randomSupplyUse(ni, nc, seed, withScrap);
        const m = supplyUse({ industries: axis('I', ni), commodities: axis('C', nc), make, use, ...(scrap ? { scrap } : {}) });
        // e = q − U i, with q the commodity output excluding scrap, as the agency defines it.
        const e = new Float64Array(nc);
        for (let c = 0; c < nc; c++) {
          let s = 0;
          for (let i = 0; i < ni; i++) s += use.data[c * ni + i]!;
          e[c] = m.q[c]! - s;
        }
        const gBack = matVec(m.requirements('industry-by-commodity'), e);
        for (let i = 0; i < ni; i++) expect(Math.abs(gBack[i]! - g[i]!) / g[i]!).toBeLessThan(1e-10);
      }),
      { numRuns: 80 },
    );
  });

  it('agrees with the formulas computed independently with ml-matrix', () => {
    const ni = 6;
    const nc = 8;
    const { make, use, g, scrap } = randomSupplyUse(ni, nc, 42, true);
    const m = supplyUse({ industries: axis('I', ni), commodities: axis('C', nc), make, use, scrap: scrap! });
    const V = ml(make);
    const U = ml(use);
    const ghatInv = MlMatrix.diag(Array.from(g, (v) => 1 / v));
    const B = U.mmul(ghatInv);
    const h = V.getColumn(nc - 1);
    const Vbar = V.clone();
    for (let i = 0; i < ni; i++) Vbar.set(i, nc - 1, 0);
    const q = Array.from({ length: nc }, (_, c) => Vbar.getColumn(c).reduce((a, b) => a + b, 0));
    const D = Vbar.mmul(MlMatrix.diag(q.map((v) => (v > 0 ? 1 / v : 0))));
    const W = MlMatrix.diag(h.map((hv, i) => 1 / (1 - hv / g[i]!))).mmul(D);
    const Lcc = mlInverse(MlMatrix.eye(nc).sub(B.mmul(W)));
    const Lic = W.mmul(Lcc);
    const Lii = mlInverse(MlMatrix.eye(ni).sub(W.mmul(B)));
    const close = (a: Matrix, b: MlMatrix) => {
      for (let i = 0; i < a.rows; i++) for (let j = 0; j < a.cols; j++) expect(a.data[i * a.cols + j]).toBeCloseTo(b.get(i, j), 11);
    };
    close(m.requirements('direct'), B);
    close(m.W, W);
    close(m.requirements('commodity-by-commodity'), Lcc);
    close(m.requirements('industry-by-commodity'), Lic);
    close(m.requirements('industry-by-industry'), Lii);
    close(m.coefficients('industry-by-industry'), W.mmul(B));
  });
});

describe('commodity technology and the fixed industry-sales structure', () => {
  it('B C⁻¹ and C⁻¹ B agree with ml-matrix, and U = (B C⁻¹) V′ holds (the assumption itself)', () => {
    const n = 5;
    const { make, use, g } = randomSupplyUse(n, n, 7, false);
    const m = supplyUse({ industries: axis('I', n), commodities: axis('C', n), make, use, technology: 'commodity' });
    const C = ml(make).transpose().mmul(MlMatrix.diag(Array.from(g, (v) => 1 / v)));
    const B = ml(use).mmul(MlMatrix.diag(Array.from(g, (v) => 1 / v)));
    const Acc = B.mmul(mlInverse(C));
    const Aii = mlInverse(C).mmul(B);
    const Acc2 = m.coefficients('commodity-by-commodity');
    const Aii2 = m.coefficients('industry-by-industry');
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        expect(Acc2.data[i * n + j]).toBeCloseTo(Acc.get(i, j), 11);
        expect(Aii2.data[i * n + j]).toBeCloseTo(Aii.get(i, j), 11);
      }
    }
    // Each industry's inputs are the commodity recipes weighted by what it makes: U = A V′.
    const Uback = Acc.mmul(ml(make).transpose());
    for (let c = 0; c < n; c++) for (let i = 0; i < n; i++) expect(Uback.get(c, i)).toBeCloseTo(use.data[c * n + i]!, 9);
    // Industry-by-commodity total requirements: C⁻¹ (I − B C⁻¹)⁻¹.
    const Lic = mlInverse(C).mmul(mlInverse(MlMatrix.eye(n).sub(Acc)));
    const Lic2 = m.requirements('industry-by-commodity');
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(Lic2.data[i * n + j]).toBeCloseTo(Lic.get(i, j), 10);
  });

  it('reports negative coefficients as findings (a secondary product made with a very different recipe)', () => {
    // Industry 1 makes only commodity 1, using 0.5 of commodity 1 per unit. Industry 2 makes 40 of
    // commodity 1 and 60 of commodity 2 but buys only 5 of commodity 1, less than the 20 that
    // commodity 1's recipe implies: commodity 2's derived recipe needs −15/60 of commodity 1.
    const make = { rows: 2, cols: 2, data: Float64Array.of(100, 0, 40, 60) };
    const use = { rows: 2, cols: 2, data: Float64Array.of(50, 5, 10, 10) };
    const m = supplyUse({ industries: axis('I', 2), commodities: axis('C', 2), make, use, technology: 'commodity' });
    const A = m.coefficients('commodity-by-commodity');
    expect(A.data[1]).toBeCloseTo(-0.25, 12);
    const f = m.findings.find((x) => x.code === 'negative-coefficient')!;
    expect(f.severity).toBe('warning');
    expect(f.message).toMatch(/negative commodity-by-commodity coefficient/);
  });

  it('with one commodity per industry, every assumption gives A = U ĝ⁻¹ (common practice)', () => {
    const n = 4;
    const r = rng(3);
    const make = zeros(n, n);
    for (let i = 0; i < n; i++) make.data[i * n + i] = 100 + 50 * r();
    const use = zeros(n, n);
    for (let k = 0; k < n * n; k++) use.data[k] = 10 * r();
    const base = { industries: axis('I', n), commodities: axis('C', n), make, use };
    const ref = supplyUse(base).requirements('direct');
    for (const technology of ['industry', 'commodity'] as const) {
      const m = supplyUse({ ...base, technology });
      for (const kind of ['commodity-by-commodity', 'industry-by-industry'] as const) {
        const A = m.coefficients(kind);
        for (let k = 0; k < n * n; k++) expect(A.data[k]).toBeCloseTo(ref.data[k]!, 12);
      }
    }
  });
});

describe('bad input', () => {
  const make = { rows: 2, cols: 3, data: Float64Array.of(10, 1, 0, 0, 9, 1) };
  const use = { rows: 3, cols: 2, data: Float64Array.of(1, 1, 1, 1, 0, 0) };
  const base = { industries: axis('I', 2), commodities: axis('C', 3), make, use };
  it('commodity technology on a non-square classification says why and what to do', () => {
    const m = supplyUse({ ...base, technology: 'commodity' });
    expect(() => m.coefficients('commodity-by-commodity')).toThrow(/needs as many industries as commodities; these tables have 2 industries and 3 commodities/);
  });
  it('an unknown scrap code, wrong sizes and NaN are typed errors', () => {
    expect(() => supplyUse({ ...base, scrap: 'S004' })).toThrow(/scrap commodity 'S004' is not among the commodities/);
    expect(() => supplyUse({ ...base, use: { rows: 2, cols: 2, data: new Float64Array(4) } })).toThrow(InputError);
    const bad = { rows: 2, cols: 3, data: Float64Array.of(10, NaN, 0, 0, 9, 1) };
    expect(() => supplyUse({ ...base, make: bad })).toThrow(/make table: row 'I1', column 'C2' is NaN/);
    expect(() => supplyUse({ ...base, industries: axis('I', 0) })).toThrow(/need industries and commodities/);
  });
});
