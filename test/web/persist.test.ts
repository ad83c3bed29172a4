/**
 * Keeping work without a browser: the debounced autosave, the record read back and checked, the
 * view settings in a project's flat settings and back through restoreViews, the project file
 * through src/project's own reader (versioned and validated), and the store actions of the page
 * (startup opening the demo on a first visit or restoring the autosave, start fresh) with an
 * in-memory store standing in for IndexedDB and the worker's handlers standing in for the worker.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import type { PlainTable } from '../../engine/index';
import { readProject } from '../../src/project/project';
import { checkWork, Debouncer, memoryStore, projectText, settingsToViews, viewsToSettings, workFromProject, WORK_VERSION } from '../../web/lib/persist';
import type { Work } from '../../web/lib/persist';
import { defaultViews, draftOf, restoreViews, snapshotViews, viewState } from '../../web/lib/views.svelte';
import type { ViewState } from '../../web/lib/views.svelte';
import { REPO } from '../e2e/helpers';

const demo = () => JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8')) as PlainTable;

function views(): ViewState {
  const v = defaultViews();
  const a = draftOf({ name: 'Plant', changes: [{ sector: 'FOOD', amount: 10, localShare: 0.8 }] }, 'id-a');
  const b = draftOf({ name: 'Hotel', changes: [{ sector: 'HOSP', percent: 5 }] }, 'id-b');
  v.scenarios = [a, b];
  v.activeScenario = 'id-b';
  v.measure = 'JOBS';
  v.household = { use: true, income: ['COE'], consumption: 'HHC', propensity: 0.7 };
  v.results = { shown: 'id-b', base: 'id-a' };
  v.sensitivity = { ...v.sensitivity, target: 'impact', scenario: 'id-a', percent: 20, edits: [{ row: 'FISH', col: 'FOOD', value: 0.3 }] };
  v.multipliers = { show: 'type', sort: 'typeI', descending: false, limit: 12 };
  return v;
}

describe('the autosave', () => {
  it('the debouncer runs once after the last change, flushes at once when asked, and reports a failed save', async () => {
    vi.useFakeTimers();
    const fn = vi.fn();
    const d = new Debouncer(500, fn);
    d.schedule();
    d.schedule();
    vi.advanceTimersByTime(499);
    expect(fn).not.toHaveBeenCalled();
    d.schedule();
    vi.advanceTimersByTime(499);
    expect(fn).not.toHaveBeenCalled();
    vi.advanceTimersByTime(1);
    await Promise.resolve();
    expect(fn).toHaveBeenCalledTimes(1);
    d.schedule();
    await d.flush();
    expect(fn).toHaveBeenCalledTimes(2);
    const errors: unknown[] = [];
    const bad = new Debouncer(10, () => Promise.reject(new Error('quota')), (e) => errors.push(e));
    bad.schedule();
    await bad.flush();
    expect(String(errors[0])).toMatch(/quota/);
    vi.useRealTimers();
  });

  it('a record read back is checked: a wrong version or a broken table is left out with a note, never half-used', () => {
    expect(checkWork(undefined)).toEqual({ notes: [] });
    expect(checkWork({ version: 99 }).notes[0]).toMatch(/version 99/);
    expect(checkWork('x').notes[0]).toMatch(/not a record/);
    const t = demo();
    const ok = checkWork({ version: WORK_VERSION, tableName: 'T', table: t, source: { kind: 'demo', name: 'd', sha256: 'a'.repeat(64) }, views: {}, step: 'results', theme: 'dark', locale: 'de-DE' });
    expect(ok.notes).toEqual([]);
    expect(ok.work!.table).toBe(t);
    expect(ok.work!.theme).toBe('dark');
    const broken = { ...t, Z: t.Z.slice(1) };
    const r = checkWork({ version: WORK_VERSION, tableName: 'T', table: broken, source: { kind: 'csv', name: 'x', sha256: 'b' }, views: {}, theme: 'purple' });
    expect(r.work!.table).toBeNull();
    expect(r.work!.source).toBeNull();
    expect(r.work!.theme).toBe('system');
    expect(r.notes[0]).toMatch(/the saved table could not be used/);
  });

  it('the memory store keeps a copy, not the object itself', async () => {
    const s = memoryStore();
    const w = { version: WORK_VERSION, tableName: 'a' } as Work;
    await s.save(w);
    w.tableName = 'changed';
    expect(((await s.load()) as Work).tableName).toBe('a');
    await s.clear();
    expect(await s.load()).toBeUndefined();
  });
});

describe('view settings and project files', () => {
  it('view settings go into flat settings (scenarios by name) and come back through restoreViews unchanged', () => {
    const v = views();
    const flat = viewsToSettings(v);
    for (const value of Object.values(flat)) expect(['string', 'number', 'boolean'].includes(typeof value) || value === null).toBe(true);
    expect(flat['view.activeScenario']).toBe('Hotel');
    expect(flat['view.sensitivity.scenario']).toBe('Plant');
    expect(JSON.parse(String(flat['view.household:json']))).toEqual(v.household);
    // Back, with new ids for the scenarios (as a project read gives them).
    const drafts = v.scenarios.map((s, i) => ({ ...s, id: `new-${i}` }));
    const { snapshot, notes } = settingsToViews(flat, drafts);
    expect(notes).toEqual([]);
    expect(restoreViews(snapshot)).toEqual([]);
    const got = snapshotViews();
    expect(got.activeScenario).toBe('new-1');
    expect(got.results).toEqual({ shown: 'new-1', base: 'new-0' });
    expect(got.sensitivity).toEqual({ ...v.sensitivity, scenario: 'new-0' });
    expect(got.household).toEqual(v.household);
    expect(got.multipliers).toEqual(v.multipliers);
    expect(got.measure).toBe('JOBS');
    restoreViews(defaultViews());
  });

  it('a malformed setting is named in the notes and the rest restored', () => {
    const flat = { ...viewsToSettings(views()), 'view.household:json': '{not json', 'view.multipliers.limit': 'many' };
    const { snapshot, notes } = settingsToViews(flat, []);
    expect(notes[0]).toMatch(/view\.household:json: not valid JSON/);
    restoreViews(snapshot);
    expect(viewState.multipliers.limit).toBe(30);
    expect(viewState.multipliers.sort).toBe('typeI');
    restoreViews(defaultViews());
  });

  it("the project file is src/project's: read back and validated by readProject, with the source's SHA-256 and mapping", () => {
    const v = views();
    const mapping = { format: 'ripplewise-layout', version: 1, kind: 'flows', shape: 'wide', rows: [], columns: [], output: { from: 'column', code: 'x' }, blanks: 'error' };
    const text = projectText(
      { table: demo(), tableName: 'coast.csv', source: { kind: 'csv', name: 'coast.csv', sha256: 'c'.repeat(64), size: 1234, mapping }, views: v, theme: 'dark', locale: 'fr-FR' },
      v.scenarios.map((d) => ({ name: d.name, changes: d.changes.map((c) => ({ sector: c.sector, ...(c.basis === 'amount' ? { amount: c.value! } : { percent: c.value! }) })) })),
      { name: 'ripplewise', version: '9.9.9' },
      '2026-01-01T00:00:00.000Z',
    );
    const p = readProject(text, 'work.ripplewise.json');
    expect(p.source).toEqual({ name: 'coast.csv', sha256: 'c'.repeat(64), mapping });
    expect(p.scenarios.map((s) => s.name)).toEqual(['Plant', 'Hotel']);
    expect(p.settings['source.bytes']).toBe(1234);
    const drafts = p.scenarios.map((s) => draftOf(s));
    const w = workFromProject(p, 'work.ripplewise.json', drafts);
    expect(w.tableName).toBe('coast.csv');
    expect(w.theme).toBe('dark');
    expect(w.locale).toBe('fr-FR');
    expect(w.source.mapping).toEqual(mapping);
    expect(restoreViews(w.snapshot)).toEqual([]);
    expect(viewState.scenarios.find((s) => s.id === viewState.activeScenario)!.name).toBe('Hotel');
    restoreViews(defaultViews());
    expect(() => readProject(text.replace('"version":1', '"version":2'), 'p.json')).toThrow(/version/);
  });
});

describe('the page actions with an in-memory store and the worker in this process', () => {
  let state: typeof import('../../web/lib/state.svelte');

  beforeAll(async () => {
    // The worker's operations answer the page's calls directly (no Worker in Node).
    const { handlers } = await import('../../web/worker/handlers');
    const { makeContext } = await import('../../web/worker/context');
    const client = await import('../../web/lib/engine-client');
    vi.spyOn(client.EngineClient.prototype, 'call').mockImplementation(async (op: string, args: unknown) => handlers[op]!(args, makeContext(() => {}, () => false, [])) as never);
    vi.stubGlobal('Worker', class {
      postMessage() {}
      terminate() {}
    });
    state = await import('../../web/lib/state.svelte');
  });

  it('a first visit opens the demo; the autosave is written after a change and restored on the next start; start fresh empties it', async () => {
    const store = memoryStore();
    await state.startup(store);
    expect(state.app.tableName).toBe('Vellan Coast (invented demo)');
    expect(state.app.source!.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(state.app.findings.length).toBeGreaterThan(0);
    viewState.measure = 'value-added';
    state.scheduleAutosave();
    await state.flushAutosave();
    const kept = (await store.load()) as Work;
    expect(kept.tableName).toBe('Vellan Coast (invented demo)');
    expect(kept.views.measure).toBe('value-added');
    // Another start with the same store: the work comes back.
    viewState.measure = 'output';
    state.app.table = null;
    await state.startup(store);
    expect(state.app.tableName).toBe('Vellan Coast (invented demo)');
    expect(viewState.measure).toBe('value-added');
    await state.startFresh();
    expect(state.app.table).toBeNull();
    expect(((await store.load()) as Work).table).toBeNull();
    await state.startup(store);
    expect(state.app.table).toBeNull();
    expect(state.app.step).toBe('open');
  });

  it('an error from the worker keeps the current table and names where it is', async () => {
    await state.openDemo();
    const before = state.app.table;
    const ok = await state.useTable('bad', { sectors: { codes: ['A', 'B'] }, Z: [[1]] } as PlainTable);
    expect(ok).toBe(false);
    expect(state.app.table).toBe(before);
    expect(state.app.error).toMatch(/2 sector codes but Z has 1 rows/);
    expect(state.errorText({ message: 'text where a number belongs', where: { file: 'f.csv', sheet: 'S', cell: 'E14', row: 14, column: 5, text: 'n/a' } })).toBe(
      "text where a number belongs\nWhere: file f.csv, sheet 'S', cell E14, row 14, column 5, text found: 'n/a'",
    );
  });
});
