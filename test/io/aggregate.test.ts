/**
 * Concordances (read from CSV, XLSX-like grids and JSON) and the aggregation of a table with
 * them (engine/aggregate.ts), checked against an independent computation of S′ Z S, S′ F, V S
 * and S′ x with ml-matrix (source: ml-matrix 6.15.1), and for the carried-over balances
 * (common practice: sums of balanced rows and columns balance).
 */
import { Matrix as MlMatrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { aggregate } from '../../engine/aggregate';
import { makeTable } from '../../engine/table';
import { readConcordanceGrid, readConcordanceJson } from '../../src/io/concordance';
import { readCsv } from '../../src/io/csv';
import { gridFromRows } from '../../src/io/grid';
import { rng } from '../helpers/random';

function randomTable(n: number, k: number, m: number, seed: number) {
  const next = rng(seed);
  const r = { next };
  const Z = Array.from({ length: n }, () => Array.from({ length: n }, () => Math.round(r.next() * 1000) / 10));
  const F = Array.from({ length: n }, () => Array.from({ length: k }, () => Math.round(r.next() * 1000) / 10));
  const x = Z.map((row, i) => row.reduce((a, b) => a + b, 0) + F[i]!.reduce((a, b) => a + b, 0));
  // Value added closes each column: total output minus intermediate inputs, split in m rows.
  const V = Array.from({ length: m }, (_, a) => x.map((xj, j) => ((xj - Z.reduce((s, row) => s + row[j]!, 0)) * (a + 1)) / ((m * (m + 1)) / 2)));
  return makeTable({
    sectors: { codes: Array.from({ length: n }, (_, i) => `S${i}`) },
    Z,
    finalDemand: { codes: Array.from({ length: k }, (_, q) => `F${q}`), values: F },
    valueAdded: { codes: Array.from({ length: m }, (_, a) => `V${a}`), values: V },
    imports: x.map((xj) => xj / 100),
    x,
    satellites: [{ code: 'EMP', unit: 'jobs', values: x.map((xj) => xj / 10) }],
  });
}

describe('concordances', () => {
  it('from a CSV with a header and group labels, from a headerless grid, and from JSON in three forms', () => {
    const csv = readConcordanceGrid(readCsv('sector,group,group label\n1110,AGR,Agriculture\n1120,AGR,Agriculture\n3110,MAN,Manufacturing\n', { file: 'c.csv' }).grid);
    expect(csv.concordance).toEqual({ from: ['1110', '1120', '3110'], to: ['AGR', 'AGR', 'MAN'], groups: { codes: ['AGR', 'MAN'], labels: ['Agriculture', 'Manufacturing'] } });
    const bare = readConcordanceGrid(gridFromRows([['1110 ', 'AGR'], ['3110', 'MAN']], 'b.xlsx'));
    expect(bare.concordance.from).toEqual(['1110', '3110']);
    const forms = [
      '{"map": {"1110": "AGR", "3110": "MAN"}, "labels": {"AGR": "Agriculture"}}',
      '[{"from": "1110", "to": "AGR", "label": "Agriculture"}, {"from": "3110", "to": "MAN"}]',
      '{"groups": {"AGR": ["1110"], "MAN": ["3110"]}, "labels": {"AGR": "Agriculture"}}',
    ];
    for (const f of forms) {
      const c = readConcordanceJson(f, 'c.json').concordance;
      expect(c.from).toEqual(['1110', '3110']);
      expect(c.to).toEqual(['AGR', 'MAN']);
      expect(c.groups).toEqual({ codes: ['AGR', 'MAN'], labels: ['Agriculture', 'MAN'] });
    }
  });

  it('the same pair twice is a note, not an error', () => {
    const r = readConcordanceGrid(gridFromRows([['A', 'G'], ['A', 'G']], 'c.csv'));
    expect(r.concordance.from).toEqual(['A']);
    expect(r.findings[0]!.code).toBe('concordance-repeat');
  });
});

describe('aggregation (engine/aggregate.ts)', () => {
  it('Z, final demand, value added, imports, output and satellites summed by group, as S′ Z S with ml-matrix (source: ml-matrix 6.15.1)', () => {
    const t = randomTable(12, 3, 2, 7);
    const groupOf = [0, 1, 2, 0, 1, 2, 3, 3, 0, 1, 2, 3];
    const N = 4;
    const c = { from: t.sectors.codes, to: groupOf.map((g) => `G${g}`), groups: { codes: ['G0', 'G1', 'G2', 'G3'], labels: ['Zero', 'One', 'Two', 'Three'] } };
    const a = aggregate(t, c);
    const S = MlMatrix.zeros(12, N);
    groupOf.forEach((g, i) => S.set(i, g, 1));
    const ml = (d: Float64Array, r: number, k: number) => new MlMatrix(Array.from({ length: r }, (_, i) => Array.from(d.subarray(i * k, (i + 1) * k))));
    const Zs = S.transpose().mmul(ml(t.Z.data, 12, 12)).mmul(S);
    const Fs = S.transpose().mmul(ml(t.F.data, 12, 3));
    const Vs = ml(t.V.data, 2, 12).mmul(S);
    const xs = S.transpose().mmul(new MlMatrix([Array.from(t.x)]).transpose());
    const close = (got: Float64Array, want: number[]) => want.forEach((w, i) => expect(got[i]).toBeCloseTo(w, 9));
    close(a.Z.data, Zs.to1DArray());
    close(a.F.data, Fs.to1DArray());
    close(a.V.data, Vs.to1DArray());
    close(a.x, xs.to1DArray());
    close(a.imports!, new MlMatrix([Array.from(t.imports!)]).mmul(S).to1DArray());
    close(a.satellites[0]!.values, new MlMatrix([Array.from(t.satellites[0]!.values)]).mmul(S).to1DArray());
    expect(a.sectors).toEqual({ codes: ['G0', 'G1', 'G2', 'G3'], labels: ['Zero', 'One', 'Two', 'Three'] });
    expect(a.finalDemand).toEqual(t.finalDemand);
    expect(a.meta.notes?.at(-1)).toMatch(/Aggregated from 12 to 4 sectors/);
  });

  it('balances carry over: row and column sums of the groups still equal their output (common practice)', () => {
    const t = randomTable(9, 2, 3, 11);
    const a = aggregate(t, { from: t.sectors.codes, to: t.sectors.codes.map((_, i) => `G${i % 3}`) });
    const N = a.sectors.codes.length;
    for (let g = 0; g < N; g++) {
      let row = 0;
      let col = 0;
      for (let h = 0; h < N; h++) {
        row += a.Z.data[g * N + h]!;
        col += a.Z.data[h * N + g]!;
      }
      for (let q = 0; q < a.F.cols; q++) row += a.F.data[g * a.F.cols + q]!;
      for (let v = 0; v < a.V.rows; v++) col += a.V.data[v * N + g]!;
      expect(row).toBeCloseTo(a.x[g]!, 8);
      expect(col).toBeCloseTo(a.x[g]!, 8);
    }
    expect(a.sectors.codes).toEqual(['G0', 'G1', 'G2']);
  });

  it('the concordance read from a file drives the aggregation; an unknown or unmapped code is a clear error', () => {
    const t = randomTable(3, 1, 1, 3);
    const c = readConcordanceGrid(readCsv('from,to\nS0,A\nS1,A\nS2,B\n', { file: 'c.csv' }).grid).concordance;
    expect(aggregate(t, c).sectors.codes).toEqual(['A', 'B']);
    expect(() => aggregate(t, { from: ['S0', 'S1'], to: ['A', 'A'] })).toThrow(/1 sector of the table is not in the concordance: 'S2'/);
    expect(() => aggregate(t, { from: ['S0', 'S1', 'S2', 'S9'], to: ['A', 'A', 'B', 'B'] })).toThrow(/not a sector of the table: 'S9'/);
  });
});
