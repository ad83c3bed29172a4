/**
 * Long files whose code fields are not the first two: a region and a year before the codes, a
 * flag after the value (common practice in statistical agencies' download files).
 */
import { describe, expect, it } from 'vitest';
import { guessShape, readCsv, readLongCsv, readTable } from '../../src/io';

const Z = [
  [10, 20],
  [30, 5],
];
function file(header: string | null): string {
  const lines: string[] = header ? [header] : [];
  const codes = ['A', 'B'];
  codes.forEach((r, i) => {
    codes.forEach((c, j) => lines.push(`XX,2021,${r},${c},${Z[i]![j]},`));
    lines.push(`XX,2021,${r},F_HH,${50 + i},p`);
  });
  codes.forEach((c, j) => lines.push(`XX,2021,V_VA,${c},${40 + j},`));
  return lines.join('\n') + '\n';
}

describe('long files with leading constant fields', () => {
  for (const header of ['geo,year,row_code,col_code,obs_value,flag', 'reg,yr,a,b,obs,flag', null]) {
    it(`finds the code and value fields (${header ?? 'no header'})`, () => {
      const text = file(header);
      expect(guessShape(readCsv(text, { file: 'l.csv' }).grid)).toBe('long');
      const long = readLongCsv(text, { file: 'l.csv' });
      expect(long.mapping.rowCodeField).toBe(3);
      expect(long.mapping.columnCodeField).toBe(4);
      expect(long.mapping.valueField).toBe(5);
      const t = readTable(long).table;
      expect(t.sectors.codes).toEqual(['A', 'B']);
      expect(Array.from(t.Z.data)).toEqual([10, 20, 30, 5]);
      expect(t.finalDemand.codes).toEqual(['F_HH']);
      expect(t.valueAdded.codes).toEqual(['V_VA']);
    });
  }
});
