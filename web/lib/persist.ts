/**
 * Keeping work: the autosave (one record in IndexedDB through idb, written a moment after each
 * change and read back after a reload) and the project file (src/project's writeProject and
 * readProject: the table, its source with SHA-256 and confirmed mapping, the scenarios and the
 * view settings). Plain functions over plain data, so that everything but IndexedDB itself is
 * testable without a browser (`memoryStore` stands in for it).
 *
 * View settings go into the project's flat `settings` as `view.<path>` keys (numbers, texts,
 * true/false), with lists and objects as JSON text under `view.<path>:json`; scenarios are named
 * by their names there (ids are the page's own). restoreViews checks every field on the way back.
 */
import { makeTable } from '../../engine/table';
import type { PlainTable } from '../../engine/table';
import type { Finding } from '../../engine/findings';
import type { Scenario } from '../../engine/scenario';
import { writeProject } from '../../src/project/project';
import type { Project, ProjectSource, SettingValue } from '../../src/project/project';
import type { DraftScenario, ViewState } from './views.svelte';
import type { TableEdit } from './history.svelte';

export const WORK_VERSION = 1;

/** Where the current table came from. */
export interface SourceInfo {
  /** How it was opened. */
  kind: 'demo' | 'csv' | 'xlsx' | 'json' | 'project' | 'supply-use';
  /** The file name (the use table's for supply-use tables). */
  name: string;
  sha256: string;
  size?: number;
  sheet?: string;
  /** The confirmed layout mapping (src/io's LayoutMapping as JSON). */
  mapping?: Record<string, unknown>;
  /** Supply-use tables: each file and the options of the derivation. */
  files?: { role: 'make' | 'use'; name: string; sha256: string; size?: number; sheet?: string; mapping?: Record<string, unknown> }[];
  supplyUse?: { kind: string; scrap?: string; technology?: string };
}

/** Everything the autosave keeps. */
export interface Work {
  version: number;
  savedAt: string;
  /** The project's own name (empty: the table's name is shown). */
  name?: string;
  tableName: string;
  table: PlainTable | null;
  source: SourceInfo | null;
  /** Findings of the reader that opened the file (the checks are recomputed). */
  readFindings: Finding[];
  views: ViewState;
  /** The edits made to the table since it was read (web/lib/history.svelte.ts). */
  edits?: TableEdit[];
  step: string;
  theme: 'system' | 'light' | 'dark';
  /** '' for the browser's locale. */
  locale: string;
}

/** A place to keep one piece of work. */
export interface WorkStore {
  load(): Promise<unknown>;
  save(work: Work): Promise<unknown>;
  clear(): Promise<void>;
}

/** A store in memory (tests, and browsers where IndexedDB is refused). */
export function memoryStore(): WorkStore & { saves: number } {
  let kept: Work | undefined;
  const s = {
    saves: 0,
    async load() {
      return kept === undefined ? undefined : structuredClone(kept);
    },
    async save(w: Work) {
      kept = structuredClone(w);
      s.saves++;
    },
    async clear() {
      kept = undefined;
    },
  };
  return s;
}

const DB = 'ripplewise';
const STORE = 'work';
const KEY = 'current';

/** The autosave in IndexedDB (idb loaded when first used). */
export async function idbStore(): Promise<WorkStore> {
  const { openDB } = await import('idb');
  const db = await openDB(DB, 1, {
    upgrade(d) {
      if (!d.objectStoreNames.contains(STORE)) d.createObjectStore(STORE);
    },
  });
  return {
    load: () => db.get(STORE, KEY),
    save: async (w) => {
      await db.put(STORE, w, KEY);
    },
    clear: async () => {
      await db.delete(STORE, KEY);
    },
  };
}

/**
 * Run `fn` once, `ms` after the last `schedule()`; `flush()` runs a pending call at once. Errors
 * go to `onError` (a failed save must not break the page).
 */
export class Debouncer {
  private timer: ReturnType<typeof setTimeout> | undefined;
  constructor(
    private readonly ms: number,
    private readonly fn: () => Promise<void> | void,
    private readonly onError: (e: unknown) => void = () => {},
  ) {}
  get pending(): boolean {
    return this.timer !== undefined;
  }
  schedule(): void {
    if (this.timer !== undefined) clearTimeout(this.timer);
    this.timer = setTimeout(() => void this.flush(), this.ms);
  }
  async flush(): Promise<void> {
    if (this.timer === undefined) return;
    clearTimeout(this.timer);
    this.timer = undefined;
    try {
      await this.fn();
    } catch (e) {
      this.onError(e);
    }
  }
  cancel(): void {
    if (this.timer !== undefined) clearTimeout(this.timer);
    this.timer = undefined;
  }
}

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Check a record read back from the autosave. Anything malformed is left out with a note; a
 * table that fails the engine's structural checks is dropped (the notes say so).
 */
export function checkWork(o: unknown): { work?: Omit<Work, 'views'> & { views: unknown }; notes: string[] } {
  const notes: string[] = [];
  if (o === undefined || o === null) return { notes };
  if (!isObj(o)) return { notes: ['the saved work is not a record; it was ignored'] };
  if (o.version !== WORK_VERSION) return { notes: [`the saved work is version ${String(o.version)}; this workbench reads version ${WORK_VERSION}, so it was not restored`] };
  let table: PlainTable | null = null;
  if (o.table !== null && o.table !== undefined) {
    try {
      makeTable(o.table as PlainTable);
      table = o.table as PlainTable;
    } catch (e) {
      notes.push(`the saved table could not be used (${(e as Error).message}); open the file again`);
    }
  }
  const theme = o.theme === 'light' || o.theme === 'dark' ? o.theme : 'system';
  const src = isObj(o.source) && typeof o.source.name === 'string' && typeof o.source.sha256 === 'string' ? (o.source as unknown as SourceInfo) : null;
  return {
    work: {
      version: WORK_VERSION,
      savedAt: typeof o.savedAt === 'string' ? o.savedAt : '',
      name: typeof o.name === 'string' ? o.name : '',
      tableName: typeof o.tableName === 'string' ? o.tableName : '',
      table,
      source: table ? src : null,
      readFindings: table && Array.isArray(o.readFindings) ? (o.readFindings as Finding[]) : [],
      views: o.views,
      edits: table && Array.isArray(o.edits) ? (o.edits as TableEdit[]).filter((e) => isObj(e) && typeof e.label === 'string') : [],
      step: typeof o.step === 'string' ? o.step : 'open',
      theme,
      locale: typeof o.locale === 'string' ? o.locale : '',
    },
    notes,
  };
}

// ---------------------------------------------------------------------------------------------
// View settings in a project's flat settings

/** The view settings as flat project settings; scenario ids become scenario names. */
export function viewsToSettings(v: ViewState): Record<string, SettingValue> {
  const nameOf = (id: string | null) => (id === null ? null : (v.scenarios.find((s) => s.id === id)?.name ?? null));
  const plain: Record<string, unknown> = {
    version: v.version,
    measure: v.measure,
    household: v.household,
    rounds: v.rounds,
    activeScenario: nameOf(v.activeScenario),
    multipliers: v.multipliers,
    linkages: v.linkages,
    results: { shown: nameOf(v.results.shown), base: nameOf(v.results.base) },
    sensitivity: { ...v.sensitivity, scenario: nameOf(v.sensitivity.scenario) },
  };
  const out: Record<string, SettingValue> = {};
  const walk = (o: unknown, path: string) => {
    if (o === null || typeof o === 'string' || typeof o === 'number' || typeof o === 'boolean') out[`view.${path}`] = o;
    else if (Array.isArray(o) || !isObj(o) || path === 'household') out[`view.${path}:json`] = JSON.stringify(o);
    else for (const [k, x] of Object.entries(o)) walk(x, path ? `${path}.${k}` : k);
  };
  walk(plain, '');
  return out;
}

/**
 * The view snapshot from a project's settings and its scenarios (as drafts, ids already given),
 * for restoreViews to check. Settings that are not view settings are ignored; JSON that does not
 * parse is named in the notes.
 */
export function settingsToViews(settings: Record<string, SettingValue>, drafts: DraftScenario[]): { snapshot: Record<string, unknown>; notes: string[] } {
  const notes: string[] = [];
  const snap: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(settings)) {
    if (!key.startsWith('view.')) continue;
    let path = key.slice(5);
    let v: unknown = value;
    if (path.endsWith(':json')) {
      path = path.slice(0, -5);
      try {
        v = JSON.parse(String(value));
      } catch {
        notes.push(`setting ${key}: not valid JSON; left out`);
        continue;
      }
    }
    const parts = path.split('.');
    let o = snap;
    for (const p of parts.slice(0, -1)) {
      if (!isObj(o[p])) o[p] = {};
      o = o[p] as Record<string, unknown>;
    }
    o[parts[parts.length - 1]!] = v;
  }
  const idOf = (name: unknown) => (typeof name === 'string' ? (drafts.find((d) => d.name === name)?.id ?? null) : null);
  snap.scenarios = drafts;
  snap.activeScenario = idOf(snap.activeScenario);
  if (isObj(snap.results)) snap.results = { shown: idOf(snap.results.shown), base: idOf(snap.results.base) };
  if (isObj(snap.sensitivity)) snap.sensitivity = { ...snap.sensitivity, scenario: idOf(snap.sensitivity.scenario) };
  return { snapshot: snap, notes };
}

/** The project file's text for a piece of work: src/project's writeProject. */
export function projectText(w: Pick<Work, 'table' | 'tableName' | 'source' | 'views' | 'theme' | 'locale' | 'edits'>, scenarios: Scenario[], tool: { name: string; version: string }, savedAt?: string): string {
  if (!w.table) throw new Error('there is no table to save yet: open a file or the demo first');
  const settings: Record<string, SettingValue> = { 'workbench.tableName': w.tableName, 'workbench.theme': w.theme, 'workbench.locale': w.locale, ...viewsToSettings(w.views) };
  // The edits made in the workbench, so that a report made from the project still lists them.
  if (w.edits?.length) settings['workbench.edits:json'] = JSON.stringify(w.edits);
  const s = w.source;
  let source: ProjectSource | undefined;
  if (s) {
    source = { name: s.name, sha256: s.sha256 };
    const mapping: Record<string, unknown> = {};
    if (s.mapping) Object.assign(mapping, s.mapping);
    if (s.files) mapping.files = s.files;
    if (s.supplyUse) mapping.supplyUse = s.supplyUse;
    if (s.kind === 'demo' || s.kind === 'json' || s.kind === 'supply-use') mapping.openedAs = s.kind;
    if (Object.keys(mapping).length) source.mapping = mapping;
    if (s.size !== undefined) settings['source.bytes'] = s.size;
    if (s.sheet !== undefined) settings['source.sheet'] = s.sheet;
  }
  return writeProject({ tool, table: w.table, ...(source ? { source } : {}), scenarios, settings, ...(savedAt ? { savedAt } : {}) });
}

/** What a project gives back to the workbench (the views' snapshot to be restored with restoreViews). */
export function workFromProject(p: Project, fileName: string, drafts: DraftScenario[]): { tableName: string; table: PlainTable; source: SourceInfo; theme?: Work['theme']; locale?: string; edits: TableEdit[]; snapshot: Record<string, unknown>; notes: string[] } {
  const { snapshot, notes } = settingsToViews(p.settings, drafts);
  const st = p.settings;
  const src: SourceInfo = { kind: 'project', name: p.source?.name ?? fileName, sha256: p.source?.sha256 ?? '' };
  const m = p.source?.mapping;
  if (m) {
    const { files, supplyUse, openedAs, ...rest } = m as Record<string, unknown>;
    if (Object.keys(rest).length) src.mapping = rest;
    if (Array.isArray(files)) src.files = files as SourceInfo['files'];
    if (isObj(supplyUse)) src.supplyUse = supplyUse as SourceInfo['supplyUse'];
    if (typeof openedAs === 'string') notes.push(`the table was first opened as ${openedAs}`);
  }
  if (typeof st['source.bytes'] === 'number') src.size = st['source.bytes'];
  if (typeof st['source.sheet'] === 'string') src.sheet = st['source.sheet'];
  const out: ReturnType<typeof workFromProject> = {
    tableName: typeof st['workbench.tableName'] === 'string' && st['workbench.tableName'] ? st['workbench.tableName'] : (p.table.meta?.title ?? fileName),
    table: p.table,
    source: src,
    edits: [],
    snapshot,
    notes,
  };
  const ed = st['workbench.edits:json'];
  if (typeof ed === 'string') {
    try {
      const list = JSON.parse(ed) as unknown;
      if (Array.isArray(list)) out.edits = list.filter((e): e is TableEdit => isObj(e) && typeof e.label === 'string');
    } catch {
      notes.push('setting workbench.edits:json: not valid JSON; the list of edits was left out');
    }
  }
  const th = st['workbench.theme'];
  if (th === 'light' || th === 'dark' || th === 'system') out.theme = th;
  if (typeof st['workbench.locale'] === 'string') out.locale = st['workbench.locale'];
  return out;
}

// ---------------------------------------------------------------------------------------------
// Several projects in the browser

/** A key-value place (IndexedDB through idb in the browser, a Map in tests). */
export interface KeyValue {
  get(key: string): Promise<unknown>;
  put(key: string, value: unknown): Promise<void>;
  del(key: string): Promise<void>;
  keys(): Promise<string[]>;
}

/** A key-value place in memory; `failWith` makes every put throw (a full disk, in tests). */
export function memoryKV(): KeyValue & { data: Map<string, unknown>; failWith?: Error } {
  const data = new Map<string, unknown>();
  const kv: KeyValue & { data: Map<string, unknown>; failWith?: Error } = {
    data,
    async get(k) {
      return data.has(k) ? structuredClone(data.get(k)) : undefined;
    },
    async put(k, v) {
      if (kv.failWith) throw kv.failWith;
      data.set(k, structuredClone(v));
    },
    async del(k) {
      data.delete(k);
    },
    async keys() {
      return [...data.keys()];
    },
  };
  return kv;
}

/** The workbench's IndexedDB (database `ripplewise`, store `work`), as a key-value place. */
export async function idbKV(): Promise<KeyValue> {
  const { openDB } = await import('idb');
  const db = await openDB(DB, 1, {
    upgrade(d) {
      if (!d.objectStoreNames.contains(STORE)) d.createObjectStore(STORE);
    },
  });
  return {
    get: (k) => db.get(STORE, k),
    put: async (k, v) => {
      await db.put(STORE, v, k);
    },
    del: async (k) => {
      await db.delete(STORE, k);
    },
    keys: async () => (await db.getAllKeys(STORE)).map(String),
  };
}

/** The source file kept with a project, so that a finding can show its cell after a reload. */
export interface SourceFile {
  name: string;
  bytes: Uint8Array;
  sheet?: string;
}

/** One line of the project list. */
export interface ProjectSummary {
  id: string;
  /** The project's own name (by default the table's). */
  name: string;
  tableName: string;
  sectors: number;
  /** ISO time of the last change saved. */
  savedAt: string;
  /** Bytes kept in the browser: the work as JSON and the source file. */
  size: number;
  /** Whether the source file is kept (false when it was too big for the space left). */
  sourceKept: boolean;
  sourceSize: number;
}

/** Whether an error from a store is the browser's storage being full. */
export function isQuotaError(e: unknown): boolean {
  const n = (e as { name?: string })?.name;
  return n === 'QuotaExceededError' || n === 'NS_ERROR_DOM_QUOTA_REACHED' || /quota/i.test(String((e as Error)?.message ?? ''));
}

const P_META = 'projects:current';
const pWork = (id: string) => `project:${id}:work`;
const pSource = (id: string) => `project:${id}:source`;
const pSummary = (id: string) => `project:${id}:summary`;

function newId(): string {
  const c = (globalThis as { crypto?: { randomUUID?: () => string } }).crypto;
  return c?.randomUUID ? c.randomUUID() : `p${Date.now().toString(36)}${Math.random().toString(36).slice(2, 8)}`;
}

/**
 * Several projects in one key-value place: each project's work (`project:<id>:work`), its
 * source file (`project:<id>:source`) and a summary for the list (`project:<id>:summary`, so that
 * the list never reads the tables); `projects:current` names the open one. A record of the
 * single-work autosave (key `current`) becomes the first project. As a `WorkStore` it loads and
 * saves the current project.
 */
export class ProjectStore implements WorkStore {
  private constructor(
    private readonly kv: KeyValue,
    public current: string,
  ) {}

  static async open(kv: KeyValue): Promise<ProjectStore> {
    let current = await kv.get(P_META);
    const legacy = await kv.get(KEY);
    if (legacy !== undefined) {
      // The autosave of a workbench that kept one piece of work: it becomes a project.
      const id = newId();
      const s = new ProjectStore(kv, id);
      if (isObj(legacy)) await s.save(legacy as unknown as Work);
      await kv.del(KEY);
      current = id;
    }
    if (typeof current !== 'string' || !current) {
      const ids = await new ProjectStore(kv, '').ids();
      current = ids[0] ?? newId();
    }
    await kv.put(P_META, current);
    return new ProjectStore(kv, current as string);
  }

  private async ids(): Promise<string[]> {
    const out: string[] = [];
    for (const k of await this.kv.keys()) {
      const m = /^project:(.+):summary$/.exec(k);
      if (m) out.push(m[1]!);
    }
    return out;
  }

  load(): Promise<unknown> {
    return this.kv.get(pWork(this.current));
  }

  async loadSource(): Promise<SourceFile | undefined> {
    const s = await this.kv.get(pSource(this.current));
    return isObj(s) && typeof s.name === 'string' && s.bytes instanceof Uint8Array ? (s as unknown as SourceFile) : undefined;
  }

  /**
   * Save the current project's work and, when given, its source file (`null` drops a kept one).
   * When the browser's storage is full the work is saved without the source file and
   * `sourceKept` is false; when even that fails the quota error is thrown.
   */
  async save(work: Work, source?: SourceFile | null): Promise<{ sourceKept: boolean }> {
    const id = this.current;
    const json = JSON.stringify(work);
    let sourceKept = false;
    let sourceSize = 0;
    if (source) {
      try {
        await this.kv.put(pSource(id), { name: source.name, bytes: source.bytes, ...(source.sheet !== undefined ? { sheet: source.sheet } : {}) });
        sourceKept = true;
        sourceSize = source.bytes.length;
      } catch (e) {
        if (!isQuotaError(e)) throw e;
        await this.kv.del(pSource(id));
        sourceKept = false;
      }
    } else if (source === null) {
      await this.kv.del(pSource(id));
      sourceKept = false;
    } else {
      // Unchanged: the file kept before (if any) stays; its summary says how big it is.
      const before = await this.kv.get(pSummary(id));
      if (isObj(before) && before.sourceKept === true) {
        sourceKept = true;
        sourceSize = typeof before.sourceSize === 'number' ? before.sourceSize : 0;
      }
    }
    await this.kv.put(pWork(id), work);
    const summary: ProjectSummary = {
      id,
      name: work.name || work.tableName || 'Untitled',
      tableName: work.tableName,
      sectors: work.table?.sectors?.codes?.length ?? 0,
      savedAt: work.savedAt,
      size: json.length + sourceSize,
      sourceKept,
      sourceSize,
    };
    await this.kv.put(pSummary(id), summary);
    await this.kv.put(P_META, id);
    return { sourceKept };
  }

  /** Empty the current project (it stays in the list, without a table). */
  async clear(): Promise<void> {
    await this.kv.del(pWork(this.current));
    await this.kv.del(pSource(this.current));
  }

  /** Every project, the latest change first. */
  async list(): Promise<ProjectSummary[]> {
    const out: ProjectSummary[] = [];
    for (const id of await this.ids()) {
      const s = await this.kv.get(pSummary(id));
      if (isObj(s)) out.push(s as unknown as ProjectSummary);
    }
    return out.sort((a, b) => (a.savedAt < b.savedAt ? 1 : a.savedAt > b.savedAt ? -1 : 0));
  }

  /** A new project becomes the current one (it is listed once its work is saved). */
  async create(): Promise<string> {
    this.current = newId();
    await this.kv.put(P_META, this.current);
    return this.current;
  }

  /** Make another project the current one. */
  async select(id: string): Promise<void> {
    if (!(await this.ids()).includes(id)) throw new Error(`there is no project ${id} in this browser`);
    this.current = id;
    await this.kv.put(P_META, id);
  }

  /** Delete a project; deleting the current one leaves a new, empty current project. */
  async remove(id: string): Promise<void> {
    await this.kv.del(pWork(id));
    await this.kv.del(pSource(id));
    await this.kv.del(pSummary(id));
    if (id === this.current) await this.create();
  }

  /** Read another project's work without opening it (two projects side by side). */
  loadOther(id: string): Promise<unknown> {
    return this.kv.get(pWork(id));
  }
}
