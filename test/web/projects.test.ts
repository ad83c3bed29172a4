/**
 * Several projects in one browser store, without a browser: `ProjectStore` over an in-memory
 * key-value place (IndexedDB's stand-in), and the page's actions (a file opened starts a new
 * project, the first stays as it was; switching back restores its table and scenarios; replace
 * keeps one project; a full storage is said and nothing is lost). The worker's handlers answer in
 * this process. The demo economy is invented; the second table is the demo CSV read by src/io.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { memoryKV, ProjectStore, projectText, WORK_VERSION, workFromProject } from '../../web/lib/persist';
import { readProject } from '../../src/project/project';
import type { Work } from '../../web/lib/persist';
import { defaultViews, loadScenarios, demoScenarioList, viewState } from '../../web/lib/views.svelte';
import { readTableFile } from '../../src/io/index';
import { toPlain } from '../../engine/table';
import { REPO } from '../e2e/helpers';

function work(name: string, over: Partial<Work> = {}): Work {
  return { version: WORK_VERSION, savedAt: new Date().toISOString(), tableName: name, table: null, source: null, readFindings: [], views: defaultViews(), step: 'open', theme: 'system', locale: '', ...over };
}

describe('ProjectStore', () => {
  it('keeps projects apart, lists them latest first with their size, and selects and removes them', async () => {
    const kv = memoryKV();
    const s = await ProjectStore.open(kv);
    const first = s.current;
    await s.save(work('one', { savedAt: '2026-01-01T00:00:00.000Z' }), { name: 'one.csv', bytes: new Uint8Array(1000) });
    const second = await s.create();
    expect(second).not.toBe(first);
    await s.save(work('two', { savedAt: '2026-02-01T00:00:00.000Z' }));
    const list = await s.list();
    expect(list.map((p) => p.tableName)).toEqual(['two', 'one']);
    const one = list.find((p) => p.id === first)!;
    expect(one.sourceKept).toBe(true);
    expect(one.size).toBe(JSON.stringify(work('one', { savedAt: '2026-01-01T00:00:00.000Z' })).length + 1000);
    expect(list.find((p) => p.id === second)!.sourceKept).toBe(false);
    // A later save without a source keeps the file saved before.
    await s.select(first);
    await s.save(work('one', { savedAt: '2026-03-01T00:00:00.000Z' }));
    expect((await s.loadSource())!.bytes.length).toBe(1000);
    expect(((await s.load()) as Work).tableName).toBe('one');
    // Opening the store again finds the same current project.
    expect((await ProjectStore.open(kv)).current).toBe(first);
    await s.remove(first);
    expect((await s.list()).map((p) => p.id)).toEqual([second]);
    expect(s.current).not.toBe(first);
    await expect(s.select('nope')).rejects.toThrow(/no project nope/);
  });

  it('turns the single autosave of earlier versions into the first project', async () => {
    const kv = memoryKV();
    await kv.put('current', work('legacy'));
    const s = await ProjectStore.open(kv);
    expect(((await s.load()) as Work).tableName).toBe('legacy');
    expect(await kv.get('current')).toBeUndefined();
    expect((await s.list()).length).toBe(1);
  });

  it('saves the work without the source file when the storage is full, and throws when even that fails', async () => {
    const kv = memoryKV();
    const s = await ProjectStore.open(kv);
    const quota = Object.assign(new Error('The quota has been exceeded.'), { name: 'QuotaExceededError' });
    const put = kv.put.bind(kv);
    kv.put = async (k, v) => {
      if (k.endsWith(':source')) throw quota;
      return put(k, v);
    };
    expect(await s.save(work('big'), { name: 'big.csv', bytes: new Uint8Array(10) })).toEqual({ sourceKept: false });
    expect(((await s.load()) as Work).tableName).toBe('big');
    kv.put = async () => {
      throw quota;
    };
    await expect(s.save(work('bigger'))).rejects.toThrow(/quota/);
    expect(((await s.load()) as Work).tableName).toBe('big');
  });
});

describe('the edit log in a project file', () => {
  it('travels in the settings of src/project\'s file and comes back as it was', () => {
    const table = JSON.parse(readFileSync(join(REPO, 'data-demo/vellan-coast.table.json'), 'utf8'));
    const edits = [{ kind: 'flow' as const, label: 'FOOD → HOSP flow 12.3 → 14', row: 'FOOD', col: 'HOSP', before: 12.3, after: 14, at: '2026-01-01T00:00:00.000Z' }];
    const text = projectText({ ...work('demo'), table, edits }, [], { name: 'ripplewise', version: 't' });
    const back = workFromProject(readProject(text, 'p.json'), 'p.json', []);
    expect(back.edits).toEqual(edits);
    expect(back.notes).toEqual([]);
  });
});

describe('projects on the page (worker handlers in this process)', () => {
  let state: typeof import('../../web/lib/state.svelte');

  beforeAll(async () => {
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

  it('a second table starts a second project; switching back restores the first with its scenarios; replace keeps one', async () => {
    const store = await ProjectStore.open(memoryKV());
    await state.startup(store);
    expect(state.app.tableName).toBe('Vellan Coast (invented demo)');
    loadScenarios(demoScenarioList());
    const scenarios = viewState.scenarios.map((s) => s.name);
    expect(scenarios.length).toBeGreaterThan(0);
    state.scheduleAutosave();
    await state.flushAutosave();
    const demoId = store.current;

    // A JSON table opened: a new project, with no scenarios of its own.
    const csv = await readTableFile(new Uint8Array(readFileSync(join(REPO, 'data-demo/vellan-coast.csv'))), { file: 'vellan-coast.csv' });
    const file = new File([JSON.stringify(toPlain(csv.table))], 'coast.json', { type: 'application/json' });
    await state.openFiles([file]);
    expect(state.app.error).toBe('');
    expect(state.app.tableName).toBe('coast.json');
    expect(store.current).not.toBe(demoId);
    expect(viewState.scenarios).toEqual([]);
    state.scheduleAutosave();
    await state.flushAutosave();
    expect(state.projects.list.map((p) => p.tableName).sort()).toEqual(['Vellan Coast (invented demo)', 'coast.json']);

    await state.switchProject(demoId);
    expect(state.app.tableName).toBe('Vellan Coast (invented demo)');
    expect(viewState.scenarios.map((s) => s.name)).toEqual(scenarios);

    // Replace: the table changes, the project (and its scenarios) stay.
    state.app.openInto = 'replace';
    await state.openFiles([file]);
    expect(store.current).toBe(demoId);
    expect(state.app.tableName).toBe('coast.json');
    expect(viewState.scenarios.map((s) => s.name)).toEqual(scenarios);
    state.app.openInto = 'new';
    state.scheduleAutosave();
    await state.flushAutosave();
    expect(state.projects.list.length).toBe(2);

    // Delete the other project: one is left.
    const other = state.projects.list.find((p) => p.id !== demoId)!.id;
    await state.deleteProject(other);
    expect(state.projects.list.map((p) => p.id)).toEqual([demoId]);
  });
});
