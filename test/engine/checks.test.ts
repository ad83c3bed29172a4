/**
 * Checks of a table: each problem gives a typed error or a finding with a clear message, and
 * nothing crashes. The balance identities are common practice (row: intermediate sales plus
 * final demand equal output; column: intermediate purchases plus primary inputs equal output).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { checks } from '../../engine/checks';
import { hasErrors } from '../../engine/findings';
import { makeTable } from '../../engine/table';
import type { PlainTable } from '../../engine/table';
import { InputError } from '../../engine/errors';

/** Miller & Blair (2009), ch. 2, two-sector table (from memory), with its primary inputs and final demand. */
function twoSector(): PlainTable {
  return {
    sectors: { codes: ['AGR', 'MFG'], labels: ['Agriculture', 'Manufacturing'] },
    Z: [
      [150, 500],
      [200, 100],
    ],
    finalDemand: { codes: ['HH'], labels: ['Households'], values: [[350], [1700]] },
    valueAdded: { codes: ['VA'], labels: ['Value added'], values: [[650, 1400]] },
    x: [1000, 2000],
    meta: { currency: 'USD', scale: 1e6 },
  };
}

const codes = (t: PlainTable) => checks(makeTable(t)).map((f) => f.code);

describe('a balanced, productive table', () => {
  it('has no errors or warnings, and notes its Perron root and condition', () => {
    const f = checks(makeTable(twoSector()));
    expect(f.filter((x) => x.severity !== 'note')).toEqual([]);
    const perron = f.find((x) => x.code === 'perron-root')!;
    expect(perron.message).toMatch(/below 1/);
    const cond = f.find((x) => x.code === 'condition')!;
    expect(Number(cond.data!.condition)).toBeGreaterThan(1);
    expect(Number(cond.data!.condition)).toBeLessThan(10);
  });
});

describe('structural errors are typed errors that name the problem', () => {
  it('ragged Z', () => {
    const t = twoSector();
    t.Z = [[150, 500], [200]];
    expect(() => makeTable(t)).toThrow(InputError);
    expect(() => makeTable(t)).toThrow(/row 2 has 1 values where row 1 has 2/);
  });
  it('no sectors', () => {
    expect(() => makeTable({ sectors: { codes: [] }, Z: [] })).toThrow(/no sectors/);
  });
  it('duplicate codes', () => {
    const t = twoSector();
    t.sectors.codes = ['AGR', 'AGR'];
    expect(() => makeTable(t)).toThrow(/sector code 'AGR' appears twice \(positions 1 and 2\)/);
  });
  it('sizes that disagree', () => {
    const t = twoSector();
    t.x = [1000];
    expect(() => makeTable(t)).toThrow(/total output has 1 values for 2 sectors/);
    const u = twoSector();
    u.satellites = [{ code: 'JOBS', unit: 'jobs', values: [1, 2, 3] }];
    expect(() => makeTable(u)).toThrow(/satellite 'JOBS' has 3 values for 2 sectors/);
    const w = twoSector();
    w.satellites = [{ code: 'JOBS', unit: ' ', values: [1, 2] }];
    expect(() => makeTable(w)).toThrow(/has no unit/);
  });
});

describe('findings', () => {
  it('NaN and Infinity are errors that name the row and column', () => {
    const t = twoSector();
    t.Z[0]![1] = NaN;
    t.finalDemand!.values[1]![0] = Infinity;
    const f = checks(makeTable(t));
    const nf = f.filter((x) => x.code === 'non-finite');
    expect(nf).toHaveLength(2);
    expect(nf[0]!.message).toMatch(/row 'Agriculture', column 'Manufacturing': NaN/);
    expect(nf[0]!.cells).toEqual([{ block: 'Z', row: 0, col: 1 }]);
    expect(nf[1]!.message).toMatch(/final demand.*'Manufacturing', column 'Households': Infinity/);
    expect(hasErrors(f)).toBe(true);
  });

  it('negative flows are warnings in Z and notes elsewhere, naming the cells', () => {
    const t = twoSector();
    t.Z[1]![0] = -5;
    t.finalDemand!.values[0]![0] = 555; // keep row 2 imbalanced only
    const f = checks(makeTable(t));
    const neg = f.find((x) => x.code === 'negative-flow')!;
    expect(neg.severity).toBe('warning');
    expect(neg.message).toMatch(/'Manufacturing' → 'Agriculture' -5/);
    const u = twoSector();
    u.finalDemand = { codes: ['HH', 'INV'], labels: ['Households', 'Change in inventories'], values: [[360, -10], [1700, 0]] };
    const g = checks(makeTable(u)).find((x) => x.code === 'negative-flow')!;
    expect(g.severity).toBe('note');
    expect(g.message).toMatch(/changes in inventories/);
  });

  it('row and column imbalances list the worst sectors', () => {
    const t = twoSector();
    t.finalDemand!.values[1]![0] = 1600; // row 2 sums to 1900 against 2000
    const f = checks(makeTable(t)).find((x) => x.code === 'row-imbalance')!;
    expect(f.severity).toBe('warning');
    expect(f.message).toMatch(/'Manufacturing' 1900.00 against 2000.00 \(5.00%\)/);
    expect(f.where?.sectors).toEqual(['MFG']);
    const u = twoSector();
    u.valueAdded!.values[0]![0] = 600;
    expect(codes(u)).toContain('column-imbalance');
    const w = twoSector();
    w.valueAdded!.values[0]![0] = 650.05; // 0.005%, within the default 0.01%
    expect(codes(w)).not.toContain('column-imbalance');
  });

  it('a balance that misses by no more than the rounding of its figures is a note, not a warning (common practice: published tables are rounded, and totals are rounded apart from their parts)', () => {
    // Figures to one decimal: row 1 sums to 1.5 + 5.0 + 3.3 = 9.8 against 10.0; three rounded
    // parts and a rounded total may be off by 4 × 0.05 = 0.2 at worst.
    const t: PlainTable = {
      sectors: { codes: ['A', 'B'], labels: ['Alpha', 'Beta'] },
      Z: [
        [1.5, 5.0],
        [2.0, 1.0],
      ],
      finalDemand: { codes: ['HH'], labels: ['Households'], values: [[3.3], [17.0]] },
      valueAdded: { codes: ['VA'], labels: ['Value added'], values: [[6.5, 14.0]] },
      x: [10.0, 20.0],
    };
    const f = checks(makeTable(t));
    expect(f.map((x) => x.code)).not.toContain('row-imbalance');
    const note = f.find((x) => x.code === 'balance-within-rounding')!;
    expect(note.severity).toBe('note');
    expect(note.message).toMatch(/1 row miss.* rounding of the figures \(to 0.1\) allows; the largest: 'Alpha' 9.80000 against 10.0000/);
    // Off by 0.5: beyond what rounding to 0.1 explains.
    const u = structuredClone(t);
    u.finalDemand!.values[0]![0] = 3.0;
    expect(codes(u)).toContain('row-imbalance');
    // The same gap is within rounding when the table says its figures are rounded to whole units.
    u.meta = { rounding: 1 };
    expect(codes(u)).not.toContain('row-imbalance');
    expect(codes(u)).toContain('balance-within-rounding');
    // Figures with many decimals are computed, not rounded: the relative tolerance alone applies.
    const w = structuredClone(t);
    w.Z[0]![0] = 1.5 + 1e-7;
    expect(codes(w)).toContain('row-imbalance');
  });

  it('a zero-output sector is a warning and a negative output an error', () => {
    const t = twoSector();
    t.sectors = { codes: ['AGR', 'MFG', 'EMPTY'] };
    t.Z = [[150, 500, 0], [200, 100, 0], [0, 0, 0]];
    t.finalDemand!.values = [[350], [1700], [0]];
    t.valueAdded!.values = [[650, 1400, 0]];
    t.x = [1000, 2000, 0];
    const f = checks(makeTable(t));
    const z = f.find((x) => x.code === 'zero-output')!;
    expect(z.severity).toBe('warning');
    expect(z.where?.sectors).toEqual(['EMPTY']);
    expect(hasErrors(f)).toBe(false);
    const u = twoSector();
    u.x = [1000, -2000];
    expect(checks(makeTable(u)).find((x) => x.code === 'negative-output')?.severity).toBe('error');
  });

  it('a coefficient column sum of 1 or more is an error naming the sector', () => {
    const t = twoSector();
    t.Z = [[600, 500], [500, 100]]; // agriculture buys 1100 to make 1000
    const f = checks(makeTable(t)).find((x) => x.code === 'coefficient-sum')!;
    expect(f.severity).toBe('error');
    expect(f.message).toMatch(/'Agriculture' \(1.1000\)/);
  });

  it('a singular I − A names the sectors of its null vector', () => {
    // Sectors 1 and 2 each need exactly one unit of the other: a closed loop with Perron root 1.
    const t = makeTable({
      sectors: { codes: ['A', 'B', 'C'] },
      Z: [[0, 1, 0.1], [1, 0, 0.1], [0, 0, 0.2]],
      x: [1, 1, 1],
      meta: { outputAssumed: true },
    });
    const f = checks(t);
    const s = f.find((x) => x.code === 'singular')!;
    expect(s.severity).toBe('error');
    expect(s.where?.sectors).toEqual(['A', 'B']);
    expect(f.find((x) => x.code === 'not-productive')?.where?.sectors).toEqual(['A', 'B']);
  });

  it('warns when I − A is ill-conditioned', () => {
    const e = 1e-12;
    const t = makeTable({
      sectors: { codes: ['A', 'B'] },
      Z: [[0.5, 0.5 - e], [0.5 - e, 0.5]],
      x: [1, 1],
      meta: { outputAssumed: true },
    });
    const f = checks(t);
    expect(f.find((x) => x.code === 'ill-conditioned')?.severity).toBe('warning');
  });

  it('never throws on arbitrary finite or non-finite numbers (fast-check)', () => {
    const num = fc.oneof(fc.double(), fc.constant(NaN), fc.constant(Infinity), fc.constant(0), fc.constant(-1));
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5 }).chain((n) => fc.tuple(fc.constant(n), fc.array(num, { minLength: n * n, maxLength: n * n }), fc.array(num, { minLength: n, maxLength: n }))), ([n, z, x]) => {
        const Z: number[][] = [];
        for (let i = 0; i < n; i++) Z.push(z.slice(i * n, i * n + n));
        const t = makeTable({ sectors: { codes: Array.from({ length: n }, (_, i) => `c${i}`) }, Z, x });
        const f = checks(t);
        for (const g of f) {
          expect(typeof g.message).toBe('string');
          expect(g.message).not.toMatch(/undefined/);
        }
      }),
      { numRuns: 300 },
    );
  });
});
