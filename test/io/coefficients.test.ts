/**
 * Tables of technical coefficients: recognised without being told, read with outputs derived
 * from their final demand where they have one. The identities are the open model's
 * (common practice: Z = A x̂, x = (I − A)⁻¹ f), checked against ml-matrix (source: ml-matrix 6.15.1).
 */
import { describe, expect, it } from 'vitest';
import { Matrix as MlMatrix, solve } from 'ml-matrix';
import { readCsv, readTable } from '../../src/io';

const A = [
  [0.15, 0.05, 0.01],
  [0.2, 0.25, 0.08],
  [0.1, 0.15, 0.2],
];
const va = [
  [0.3, 0.28, 0.45],
  [0.25, 0.27, 0.26],
];
const f = [
  [20, 80],
  [30, 120],
  [150, 40],
];
const codes = ['AG', 'MF', 'SV'];

function csv(title: string, withDemand: boolean): string {
  const head = ['code', 'sector', ...codes, ...(withDemand ? ['Household consumption', 'Exports'] : [])];
  const lines = [title, head.join(',')];
  codes.forEach((c, i) => lines.push([c, `Sector ${c}`, ...A[i]!, ...(withDemand ? f[i]! : [])].join(',')));
  lines.push(['COE', 'Compensation of employees', ...va[0]!, ...(withDemand ? ['', ''] : [])].join(','));
  lines.push(['GOS', 'Gross operating surplus', ...va[1]!, ...(withDemand ? ['', ''] : [])].join(','));
  return lines.join('\n') + '\n';
}

describe('coefficient tables', () => {
  it('are recognised from their title, with output taken as 1 when they have no final demand', () => {
    const g = readCsv(csv('"Direct requirements per dollar of output, region X"', false), { file: 'a.csv' });
    const r = readTable(g.grid);
    expect(r.findings.find((x) => x.code === 'read-as-coefficients')?.message).toMatch(/its title speaks of coefficients/);
    expect(r.table.meta.outputAssumed).toBe(true);
    expect(Array.from(r.table.Z.data)).toEqual(A.flat());
  });

  it('are recognised from column sums of 1, and their output is x = (I − A)⁻¹ f', () => {
    const g = readCsv(csv('Region X, 2020', true), { file: 'b.csv' });
    const r = readTable(g.grid);
    expect(r.findings.find((x) => x.code === 'read-as-coefficients')?.message).toMatch(/every column of inputs sums to 1/);
    const demand = f.map((row) => row[0]! + row[1]!);
    const x = solve(MlMatrix.eye(3).sub(new MlMatrix(A)), MlMatrix.columnVector(demand)).getColumn(0);
    for (let j = 0; j < 3; j++) {
      expect(r.table.x[j]).toBeCloseTo(x[j]!, 9);
      for (let i = 0; i < 3; i++) expect(r.table.Z.data[i * 3 + j]).toBeCloseTo(A[i]![j]! * x[j]!, 9);
      expect(r.table.V.data[j]).toBeCloseTo(va[0]![j]! * x[j]!, 9);
    }
    expect(r.table.meta.outputAssumed).toBeFalsy();
    expect(r.mapping.output.from).toBe('final-demand');
  });

  it('are read as flows when told so', () => {
    const g = readCsv(csv('Direct requirements', false), { file: 'c.csv' });
    const r = readTable(g.grid, { kind: 'flows' });
    expect(r.findings.some((x) => x.code === 'read-as-coefficients')).toBe(false);
    expect(r.table.meta.outputAssumed).toBeFalsy();
  });

  it('a flows table with a total output column is never taken for coefficients', () => {
    const text = 'code,sector,AG,MF,Total output\nAG,Ag,0.1,0.2,1\nMF,Mf,0.3,0.1,1\nVA,Value added,0.6,0.7,\n';
    const r = readTable(readCsv(text, { file: 'd.csv' }).grid);
    expect(r.findings.some((x) => x.code === 'read-as-coefficients')).toBe(false);
  });
});

describe('coefficients by content (no value-added rows)', () => {
  it('reads A with final demand in levels as coefficients, and flows in small units as flows', () => {
    // Invented: A = [[0.1, 0.3], [0.2, 0.25]], final demand 100 and 50; x = (I − A)⁻¹ f checked with ml-matrix.
    const r = readTable(readCsv('code,A,B,FD\nA,0.1,0.3,100\nB,0.2,0.25,50\n', { file: 'a.csv' }).grid);
    expect(r.mapping.kind).toBe('coefficients');
    expect(r.findings.find((f) => f.code === 'read-as-coefficients')?.message).toMatch(/every column sums below 1/);
    const x = solve(new MlMatrix([[0.9, -0.3], [-0.2, 0.75]]), MlMatrix.columnVector([100, 50])).to1DArray();
    expect(r.table.x[0]).toBeCloseTo(x[0]!, 9);
    expect(r.table.x[1]).toBeCloseTo(x[1]!, 9);
    // Final demand as small as the intermediate block: flows in large units, not coefficients.
    const f = readTable(readCsv('code,A,B,FD\nA,0.1,0.3,0.5\nB,0.2,0.25,0.4\n', { file: 'f.csv' }).grid);
    expect(f.mapping.kind).toBe('flows');
  });
});
