/**
 * "Keep only lines where" for long sheets: the worker's `file-long-fields` operation (the fields
 * besides the codes and the value, with their texts) and the selection it leads to, called here
 * in Node with the worker's own context, and the page's plain helpers (web/lib/select.ts).
 *
 * All data here are invented: a three-sector economy listed for two years in the layout of a
 * statistical download (geo, TIME_PERIOD, prod, induse, OBS_VALUE, OBS_FLAG), with flows made
 * from a formula so that each year's table is known in advance. They prove only that the
 * selection reaches the reader; the reading itself is src/io's, tested in test/io.
 */
import { describe, expect, it } from 'vitest';
import { readProject } from '../../src/project/project';
import { readLongCsv } from '../../src/io/index';
import { handlers } from '../../web/worker/handlers';
import { makeContext } from '../../web/worker/context';
import type { DetectResult, Opened, ReadResult, SheetInfo } from '../../web/worker/ops/files';
import type { LongFields } from '../../web/worker/ops/long-fields';
import { MAX_TEXTS } from '../../web/worker/ops/long-fields';
import { addCondition, changeCondition, conditionsOf, duplicateGuidance, offeredFields, removeCondition, textLabel, textsOf } from '../../web/lib/select';
import { projectText } from '../../web/lib/persist';
import { defaultViews } from '../../web/lib/views.svelte';

async function call<T>(op: string, args: unknown = {}): Promise<T> {
  const ctx = makeContext(() => {}, () => false, []);
  return (await handlers[op]!(args, ctx)) as T;
}

const SECTORS = ['AGR', 'MAN', 'SRV'];
const YEARS = ['2019', '2020'];
/** Invented flows: sector i to sector j in year y; final demand and compensation of employees besides. */
const flow = (y: number, i: number, j: number) => 10 * (i + 1) + j + 100 * y;
const demand = (y: number, i: number) => 500 + 10 * i + 100 * y;
const wages = (y: number, j: number) => 300 + 5 * j + 100 * y;

/** The invented two-year long CSV: one line per (year, row, column), header names as bulk downloads have them. */
function twoYears(opts: { header?: boolean; flags?: boolean } = {}): string {
  const header = opts.header ?? true;
  const lines = header ? ['geo,TIME_PERIOD,prod,induse,OBS_VALUE,OBS_FLAG'] : [];
  YEARS.forEach((year, y) => {
    const flag = (k: number) => (opts.flags && k % 4 === 0 ? 'p' : '');
    SECTORS.forEach((r, i) => {
      SECTORS.forEach((c, j) => lines.push(`XX,${year},${r},${c},${flow(y, i, j)},${flag(i + j)}`));
      lines.push(`XX,${year},${r},P3,${demand(y, i)},${flag(i)}`);
    });
    SECTORS.forEach((c, j) => lines.push(`XX,${year},D1,${c},${wages(y, j)},${flag(j + 1)}`));
  });
  return lines.join('\n') + '\n';
}

async function open(name: string, text: string): Promise<SheetInfo> {
  const o = await call<Opened>('file-open', { name, bytes: new TextEncoder().encode(text) });
  expect(o.type).toBe('sheet');
  return o as SheetInfo;
}

describe('keep only the lines of one year of a long sheet', () => {
  it('offers the fields besides the codes and the value, with their texts and lines; the pair given twice leads to the control', async () => {
    const s = await open('two-years.csv', twoYears({ flags: true }));
    expect(s.shape).toBe('long');
    const d = await call<DetectResult>('file-detect', { id: s.id });
    expect(d.mapping).toBeUndefined();
    expect(d.problem!.code).toBe('duplicate-entry');
    expect(d.problem!.message).toMatch(/two-years\.csv, line \d+: row 'AGR', column 'AGR' is given a second time/);

    const f = await call<LongFields>('file-long-fields', { id: s.id });
    expect([f.rowCodeField, f.columnCodeField, f.valueField]).toEqual([3, 4, 5]);
    expect(f.header).toBe(true);
    expect(f.lines).toBe(30);
    expect(f.select).toEqual({});
    expect(f.fields.map((x) => [x.field, x.name, x.key])).toEqual([
      [1, 'geo', 'geo'],
      [2, 'TIME_PERIOD', 'TIME_PERIOD'],
      [6, 'OBS_FLAG', 'OBS_FLAG'],
    ]);
    const time = f.fields.find((x) => x.name === 'TIME_PERIOD')!;
    expect(time.values).toEqual([
      { text: '2019', lines: 15 },
      { text: '2020', lines: 15 },
    ]);
    expect(time.more).toBe(false);
    expect(f.fields[0]!.values).toEqual([{ text: 'XX', lines: 30 }]);
    const flags = f.fields[2]!.values;
    expect(flags.map((v) => v.text).sort()).toEqual(['', 'p']);
    expect(flags.reduce((a, v) => a + v.lines, 0)).toBe(30);

    // The page: the fields worth a condition (one text only is not), and what the alert adds.
    expect(offeredFields(f.fields, {}).map((x) => x.name)).toEqual(['TIME_PERIOD', 'OBS_FLAG']);
    expect(duplicateGuidance(d.problem, f.fields, {})).toBe("Choose one TIME_PERIOD under 'Keep only lines where' below.");
    // A condition added keeps the latest year (not the flags, which never make a pair repeat).
    expect(addCondition({}, f.fields)).toEqual({ TIME_PERIOD: '2020' });
    expect(textsOf(time).map(textLabel)).toEqual(['2019 (15 lines)', '2020 (15 lines)']);
  });

  it('a year chosen gives that year’s table, as src/io reads the file with the same selection; the mapping saved with the project keeps it', async () => {
    const text = twoYears();
    const s = await open('two-years.csv', text);
    for (const [y, year] of YEARS.entries()) {
      const d = await call<DetectResult>('file-detect', { id: s.id, mapping: { select: { TIME_PERIOD: year } } });
      expect(d.problem).toBeUndefined();
      expect(d.mapping!.select).toEqual({ TIME_PERIOD: year });
      expect(d.mapping!.rows.filter((r) => r.role === 'sector').map((r) => r.code)).toEqual(SECTORS);
      const r = await call<ReadResult>('file-read', { id: s.id, mapping: d.mapping });
      expect(r.table.sectors.codes).toEqual(SECTORS);
      expect(r.table.Z).toEqual(SECTORS.map((_, i) => SECTORS.map((_, j) => flow(y, i, j))));
      expect(r.table.finalDemand!.codes).toEqual(['P3']);
      expect(r.table.finalDemand!.values).toEqual(SECTORS.map((_, i) => [demand(y, i)]));
      expect(r.table.valueAdded!.codes).toEqual(['D1']);
      expect(r.table.valueAdded!.values).toEqual([SECTORS.map((_, j) => wages(y, j))]);
      expect(r.findings.find((x) => x.code === 'long-fields')!.message).toContain(`only lines with TIME_PERIOD = '${year}' are read`);
      // The same lines through src/io's own long reader.
      const direct = readLongCsv(text, { file: 'two-years.csv', select: { TIME_PERIOD: year } });
      expect(Array.from(direct.matrix.data.subarray(0, 3))).toEqual(r.table.Z[0]);
      // The confirmed mapping is what the project file keeps as the source's mapping.
      expect(r.mapping.select).toEqual({ TIME_PERIOD: year });
      const project = projectText(
        { table: r.table, tableName: 'two-years.csv', source: { kind: 'csv', name: 'two-years.csv', sha256: s.sha256, size: s.size, mapping: r.mapping as unknown as Record<string, unknown> }, views: defaultViews(), theme: 'system', locale: '' },
        [],
        { name: 'ripplewise', version: '0' },
      );
      expect((readProject(project, 'p.json').source!.mapping as { select?: unknown }).select).toEqual({ TIME_PERIOD: year });
    }
    // The fields are still told with a selection in force, and it is reported back.
    const f = await call<LongFields>('file-long-fields', { id: s.id, mapping: { select: { time_period: '2019' } } });
    expect(f.select).toEqual({ time_period: '2019' });
    expect(conditionsOf(f.select, f.fields).map((c) => [c.key, c.value, c.field?.name])).toEqual([['time_period', '2019', 'TIME_PERIOD']]);
  });

  it('without a header line the fields are named by number and selected by number', async () => {
    const s = await open('no-header.csv', twoYears({ header: false }));
    // Without names, the first two fields that change are taken as the codes (the year among them)...
    const guessed = await call<LongFields>('file-long-fields', { id: s.id });
    expect(guessed.header).toBe(false);
    expect([guessed.rowCodeField, guessed.columnCodeField]).toEqual([2, 3]);
    expect(guessed.fields.map((x) => x.field)).not.toContain(2);
    // ...so the code fields are given, and the year is then offered.
    const fieldsGiven = { shape: 'long' as const, rowCodeField: 3, columnCodeField: 4, valueField: 5 };
    const f = await call<LongFields>('file-long-fields', { id: s.id, mapping: fieldsGiven });
    expect([f.rowCodeField, f.columnCodeField, f.valueField]).toEqual([3, 4, 5]);
    const time = f.fields.find((x) => x.field === 2)!;
    expect([time.name, time.key]).toEqual(['field 2', '2']);
    const select = addCondition(undefined, f.fields)!;
    expect(select).toEqual({ '2': '2020' });
    const d = await call<DetectResult>('file-detect', { id: s.id, mapping: { ...fieldsGiven, select } });
    expect(d.problem).toBeUndefined();
    const r = await call<ReadResult>('file-read', { id: s.id, mapping: d.mapping });
    expect(r.table.Z[2]).toEqual(SECTORS.map((_, j) => flow(1, 2, j)));
  });

  it('a field of many texts is reported as having many, not listed; a big file is counted in one pass', async () => {
    // Invented: 60 sectors with a label field (60 texts, more than the list holds), two years.
    const codes = Array.from({ length: 60 }, (_, i) => `S${String(i + 1).padStart(2, '0')}`);
    const lines = ['TIME_PERIOD,prod,prod_label,induse,OBS_VALUE'];
    for (const year of YEARS) for (const [i, r] of codes.entries()) for (const c of codes) lines.push(`${year},${r},Sector ${i + 1},${c},${i + 1}`);
    const s = await open('many.csv', lines.join('\n'));
    const f = await call<LongFields>('file-long-fields', { id: s.id });
    expect(f.lines).toBe(2 * 60 * 60);
    expect([f.rowCodeField, f.columnCodeField, f.valueField]).toEqual([2, 4, 5]);
    const label = f.fields.find((x) => x.name === 'prod_label')!;
    expect(label.more).toBe(true);
    expect(label.values).toEqual([]);
    expect(60).toBeGreaterThan(MAX_TEXTS);
    expect(f.fields.find((x) => x.name === 'TIME_PERIOD')!.values).toEqual([
      { text: '2019', lines: 3600 },
      { text: '2020', lines: 3600 },
    ]);
    expect(offeredFields(f.fields, undefined).map((x) => x.name)).toEqual(['TIME_PERIOD']);
  });

  it('the page helpers edit the selection in place: another field, another text, a condition removed', () => {
    const fields: LongFields['fields'] = [
      { field: 1, name: 'geo', key: 'geo', values: [{ text: 'XX', lines: 4 }, { text: 'YY', lines: 4 }], more: false },
      { field: 2, name: 'TIME_PERIOD', key: 'TIME_PERIOD', values: [{ text: '2020', lines: 4 }, { text: '2019', lines: 4 }], more: false },
    ];
    let sel = addCondition(undefined, fields)!;
    expect(sel).toEqual({ geo: 'YY' });
    sel = addCondition(sel, fields)!;
    expect(sel).toEqual({ geo: 'YY', TIME_PERIOD: '2020' });
    expect(addCondition(sel, fields)).toBeUndefined();
    sel = changeCondition(sel, 'geo', { value: 'XX' });
    expect(sel).toEqual({ geo: 'XX', TIME_PERIOD: '2020' });
    expect(Object.keys(changeCondition({ geo: 'XX' }, 'geo', { field: fields[1]! }))).toEqual(['TIME_PERIOD']);
    expect(removeCondition(sel, 'geo')).toEqual({ TIME_PERIOD: '2020' });
    expect(removeCondition({ geo: 'XX' }, 'geo')).toBeUndefined();
    // A text chosen elsewhere (a mapping file) stays in the list.
    expect(textsOf(fields[1], '2018').map((v) => v.text)).toEqual(['2019', '2020', '2018']);
    // Only a pair given twice adds guidance; both fields named when the message names both.
    expect(duplicateGuidance({ message: 'no line has geo', code: 'select-nothing' }, fields, {})).toBe('');
    expect(duplicateGuidance({ message: "x is given a second time. The lines differ in geo ('XX', 'YY') and TIME_PERIOD ('2020', '2019'): keep one", code: 'duplicate-entry' }, fields, {})).toBe(
      "Choose one geo and one TIME_PERIOD under 'Keep only lines where' below.",
    );
    expect(duplicateGuidance({ message: "x is given a second time. The lines differ in TIME_PERIOD ('2020', '2019')", code: 'duplicate-entry' }, fields, { geo: 'XX' })).toBe("Choose one TIME_PERIOD under 'Keep only lines where' below.");
    expect(duplicateGuidance({ message: 'x is given a second time', code: 'duplicate-entry' }, [], {})).toBe("Choose the lines to keep under 'Keep only lines where' below.");
  });
});
