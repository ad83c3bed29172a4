/**
 * The tidy CSV of the impacts, built in the worker from the demo table (invented) and read back
 * with papaparse 5.7.1 (a general-purpose CSV reader, not ours): one line per scenario, sector,
 * measure and effect; direct + indirect + induced = total on every sector; the total output
 * effect of an open-model scenario equal to (I − A)⁻¹ Δd from ml-matrix 6.15.1's inverse (an
 * independent library); texts that could run as formulas neutralised; the cautions kept in the
 * note lines.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { inverse as mlInverse, Matrix as MlMatrix } from 'ml-matrix';
import { makeTable } from '../../engine/index';
import type { PlainTable } from '../../engine/index';
import { handlers } from '../../web/worker/handlers';
import { makeContext } from '../../web/worker/context';
import type { ReportFile } from '../../web/worker/ops/report';
import { TIDY_COLUMNS, writeTidyCsv } from '../../src/report/tidy-csv';
import { REPO } from '../e2e/helpers';

async function call<T>(op: string, args: unknown = {}): Promise<T> {
  return (await handlers[op]!(args, makeContext(() => {}, () => false, []))) as T;
}

/** The data lines of a tidy CSV (note lines dropped), as papaparse reads them. */
function readTidy(text: string): Record<string, string>[] {
  const r = Papa.parse<Record<string, string>>(text, { header: true, comments: '#', skipEmptyLines: true });
  expect(r.errors).toEqual([]);
  expect(r.meta.fields).toEqual([...TIDY_COLUMNS]);
  return r.data;
}

describe('the tidy CSV of the impacts', () => {
  it('lists every scenario, sector, measure and effect; the parts add up; output totals match an independent inverse', async () => {
    const table = JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable;
    await call('set-table', { table });
    const scenarios = [
      { name: 'Plant', changes: [{ sector: 'FOOD', amount: 10 }] },
      { name: '=HYPERLINK("x")', changes: [{ sector: 'HOSP', amount: 4, localShare: 0.5 }] },
    ];
    const r = await call<{ files: ReportFile[]; cautions: string[] }>('report-export', { source: [], scenarios, household: 'none', tornado: false, formats: ['tidy-csv'] });
    expect(r.files.map((f) => [f.format, f.name])).toEqual([['tidy-csv', 'impacts-of-2-scenarios.tidy.csv']]);
    const text = r.files[0]!.data as string;
    // Cautions in the note lines.
    expect(text.split('\n').filter((l) => l.startsWith('#')).join(' ')).toMatch(/not a forecast/i);
    const rows = readTidy(text);
    const t = makeTable(table);
    const n = t.x.length;
    const measures = new Set(rows.map((x) => x.measure));
    expect(measures.has('output')).toBe(true);
    expect(rows.length).toBe(2 * n * measures.size * 4);
    // The formula-like scenario name is written with a leading quote.
    expect(new Set(rows.map((x) => x.scenario))).toEqual(new Set(['Plant', `'=HYPERLINK("x")`]));
    // direct + indirect + induced = total, for every scenario, sector and measure.
    const key = (x: Record<string, string>) => `${x.scenario}|${x.sector}|${x.measure}`;
    const by = new Map<string, Record<string, number>>();
    for (const x of rows) {
      const o = by.get(key(x)) ?? {};
      o[x.effect!] = Number(x.value);
      by.set(key(x), o);
    }
    for (const o of by.values()) expect(Math.abs(o.direct! + o.indirect! + o.induced! - o.total!)).toBeLessThan(1e-9 * Math.max(1, Math.abs(o.total!)));
    // Total output by sector for 'Plant' against ml-matrix: (I − A)⁻¹ Δd.
    const M = new MlMatrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M.set(i, j, (i === j ? 1 : 0) - t.Z.data[i * n + j]! / t.x[j]!);
    const L = mlInverse(M);
    const food = t.sectors.codes.indexOf('FOOD');
    for (let i = 0; i < n; i++) {
      const v = by.get(`Plant|${t.sectors.codes[i]}|output`)!.total!;
      expect(Math.abs(v - 10 * L.get(i, food))).toBeLessThan(1e-9);
    }
    // Every number carries its unit.
    expect(rows.every((x) => x.unit && x.unit.length > 0)).toBe(true);
  });

  it('keeps blanks for numbers that are not defined and puts a note line on one line', () => {
    const text = writeTidyCsv(
      [{ scenario: 'S', sectors: { codes: ['A'] }, measures: [{ measure: { code: 'output' } as never, unit: 'EUR m', direct: Float64Array.of(1), indirect: Float64Array.of(NaN), induced: Float64Array.of(0), total: Float64Array.of(-0) }] }],
      { title: 'Two\nlines', cautions: ['c'] },
    );
    expect(text.split('\n').slice(0, 3)).toEqual(['# Two lines', '# One line per scenario, sector, measure and effect; lines beginning with # are notes.', '# Caution: c']);
    const rows = readTidy(text);
    expect(rows.map((x) => x.value)).toEqual(['1', '', '0', '0']);
  });
});
