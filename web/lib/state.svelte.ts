/**
 * State that many panels share, as Svelte 5 runes. Panels read it and call the actions; only the
 * actions change it. Results come from the worker and never reach back into the table.
 *
 * The flow: `openFiles` sends each file's bytes to the worker; a project or a JSON table is used
 * at once, a sheet waits in `layout` for the user to confirm its layout (`confirmLayout`); the
 * table read is checked by the worker (`useTable`). A file that cannot be read leaves the current
 * table, its views and the autosave as they were, and the error names the file, sheet, row,
 * column and text. `startup` restores the autosave, or opens the demo on a first visit;
 * `saveProject`, `startFresh` keep or drop the work.
 */
import type { Finding, PlainTable, Technology } from '../../engine/index';
import type { LayoutMapping, MappingInput } from '../../src/io/index';
import type { Project } from '../../src/project/project';
import { digestHex } from '../../src/report/sha256';
import type { DetectResult, Opened, ReadConventions, ReadResult, SheetInfo, SupplyUseResult } from '../worker/ops/files';
import type { SymmetricKind } from '../worker/ops/symmetric';
import { version } from '../../package.json';
import { EngineClient } from './engine-client';
import { DEMO_NAME, demoTable } from './demo';
import { checkWork, Debouncer, idbKV, isQuotaError, memoryStore, ProjectStore, projectText, WORK_VERSION, workFromProject } from './persist';
import type { ProjectSummary, SourceFile, SourceInfo, Work, WorkStore } from './persist';
import { defaultViews, draftOf, restoreViews, scenariosForProject, snapshotViews } from './views.svelte';
import { setNumberLocale } from './numbers';
import { record, resetHistory, setHistoryHost } from './history.svelte';
import type { Snapshot, TableEdit } from './history.svelte';

export type Step = 'open' | 'projects' | 'layout' | 'checks' | 'edit' | 'coefficients' | 'inverse' | 'multipliers' | 'linkages' | 'scenarios' | 'results' | 'sensitivity' | 'compare' | 'report' | 'regional' | 'balance';

export const STEPS: { id: Step; label: string }[] = [
  { id: 'open', label: 'Open' },
  { id: 'projects', label: 'Projects' },
  { id: 'layout', label: 'Layout' },
  { id: 'checks', label: 'Checks' },
  { id: 'edit', label: 'Edit table' },
  { id: 'regional', label: 'Regionalise' },
  { id: 'balance', label: 'Balance' },
  { id: 'coefficients', label: 'Coefficients' },
  { id: 'inverse', label: 'Leontief inverse' },
  { id: 'multipliers', label: 'Multipliers' },
  { id: 'linkages', label: 'Linkages' },
  { id: 'scenarios', label: 'Scenarios' },
  { id: 'results', label: 'Results' },
  { id: 'sensitivity', label: 'Sensitivity' },
  { id: 'compare', label: 'Compare projects' },
  { id: 'report', label: 'Report' },
];

export const TOOL = { name: 'ripplewise', version } as const;

export interface Busy {
  label: string;
  fraction: number;
  note?: string;
  cancel?: () => void;
}

export const app = $state({
  step: 'open' as Step,
  tableName: '' as string,
  table: null as PlainTable | null,
  /** Findings of the engine's checks of the current table. */
  findings: [] as Finding[],
  /** Findings of the reader that opened the file (layout, conventions). */
  readFindings: [] as Finding[],
  source: null as SourceInfo | null,
  busy: null as Busy | null,
  error: '' as string,
  /** Notes of the last restore (autosave or project): settings that could not be restored. */
  notes: [] as string[],
  theme: 'system' as 'system' | 'light' | 'dark',
  /** '' for the browser's locale. */
  locale: '' as string,
  /** 'off' until the autosave is read; then 'saved', 'pending' or 'unavailable'; 'full' when the browser's storage is full. */
  autosave: 'off' as 'off' | 'saved' | 'pending' | 'unavailable' | 'failed' | 'full',
  /** The current project's own name ('' shows the table's name). */
  projectName: '' as string,
  /** Whether opening a file starts a new project (the default) or replaces the current one's table. */
  openInto: 'new' as 'new' | 'replace',
  /** The edits made to the table since it was read (the project keeps them; a report lists them). */
  edits: [] as TableEdit[],
  /** A note about the browser's storage (eviction, the source file not kept). */
  storageNote: '' as string,
  /** True once startup is done (the autosave restored, or the demo opened). */
  ready: false,
  /** True on a first visit (nothing kept in this browser): the guide may show. */
  firstVisit: false,
});

/** The projects kept in this browser (the list is read again after each save). */
export const projects = $state({ list: [] as ProjectSummary[], current: '' as string });

/** One file waiting for its layout to be confirmed. */
export interface PendingSheet {
  info: SheetInfo;
  /** The detected (and edited) mapping; null while none could be found. */
  mapping: LayoutMapping | null;
  problem: { message: string; code?: string; where?: Record<string, unknown> } | null;
  findings: Finding[];
  /** What the user set by hand, passed back to the detection on every change. */
  given: MappingInput;
}

/** The layout step's state: one sheet (a table) or two (make and use). */
export const layout = $state({
  mode: 'table' as 'table' | 'supply-use',
  sheets: [] as PendingSheet[],
  /** The sheet shown in the preview. */
  active: 0,
  kind: 'flows' as 'flows' | 'coefficients',
  /** Whether the user chose the kind; until then the reader proposes it (coefficients by content). */
  kindChosen: false,
  /** Supply-use tables: which sheet is the make table (the other is the use table). */
  makeIndex: 0,
  suKind: 'industry-by-industry' as SymmetricKind,
  scrap: '',
  technology: 'industry' as Technology,
});

/** The sheet whose cells the Checks panel can show (the file of the current table, while it is open in the worker). */
export const sourceSheet = $state({ id: '' as string, mapping: null as LayoutMapping | null, rowCount: 0, colCount: 0 });

/** Files kept on the page while their layout is confirmed (to open another sheet of the same workbook). */
const files = new Map<string, File>();

let client: EngineClient | undefined;

/** The engine worker, started on first use. */
export function engine(): EngineClient {
  if (!client) {
    client = new EngineClient(() => new Worker(new URL('../worker/engine.worker.ts', import.meta.url), { type: 'module' }));
    client.onRestart = async () => {
      // A restarted worker has lost the open sheets too.
      sourceSheet.id = '';
      if (app.table) await client!.call('set-table', { table: $state.snapshot(app.table) });
    };
  }
  return client;
}

/** An error as a person reads it: the message, then where it is (file, sheet, cell, row, column, text found). */
export function errorText(e: unknown): string {
  const err = e as { name?: string; message?: string; where?: Record<string, unknown> };
  if (err?.name === 'CancelledError') return 'Cancelled.';
  const msg = String(err?.message ?? e);
  const w = err?.where;
  if (!w || typeof w !== 'object') return msg;
  const parts: string[] = [];
  if (w.file !== undefined) parts.push(`file ${String(w.file)}`);
  if (w.sheet !== undefined) parts.push(`sheet '${String(w.sheet)}'`);
  if (w.cell !== undefined) parts.push(`cell ${String(w.cell)}`);
  if (w.row !== undefined) parts.push(`row ${String(w.row)}`);
  if (w.column !== undefined) parts.push(`column ${String(w.column)}`);
  if (w.sector !== undefined) parts.push(`sector ${String(w.sector)}`);
  if (w.text !== undefined) parts.push(`text found: '${String(w.text)}'`);
  return parts.length ? `${msg}\nWhere: ${parts.join(', ')}` : msg;
}

/** Run one worker call with the busy bar, progress and a cancel button; the time is recorded as a performance measure `rw:<op>`. */
export async function run<T>(label: string, op: string, args: unknown, transfer?: Transferable[]): Promise<T | undefined> {
  const ctl = new AbortController();
  app.busy = { label, fraction: 0, cancel: () => ctl.abort() };
  app.error = '';
  const start = performance.now();
  try {
    const v = await engine().call<T>(op, args, {
      signal: ctl.signal,
      onProgress: (fraction, note) => {
        if (app.busy) app.busy = { ...app.busy, fraction, ...(note ? { note } : {}) };
      },
      ...(transfer ? { transfer } : {}),
    });
    performance.measure(`rw:${op}`, { start, end: performance.now() });
    return v;
  } catch (e) {
    app.error = errorText(e);
    return undefined;
  } finally {
    app.busy = null;
  }
}

interface UseOptions {
  /** Start a new project for this table (opening a file), unless the user chose to replace the current one. */
  newProject?: boolean;
  /** The source file's bytes, kept with the project (a sheet's, so that findings can show their cells after a reload). */
  sourceFile?: SourceFile | null;
  source?: SourceInfo | null;
  readFindings?: Finding[];
  step?: Step;
  /** A views snapshot to restore (autosave or project); its notes go to app.notes. */
  views?: unknown;
  /** The edits made to the table so far (a restored project's). */
  edits?: TableEdit[];
  notes?: string[];
}

/** Make a table the current one: the worker checks it and keeps its model. Nothing changes when the worker refuses it. */
export async function useTable(name: string, table: PlainTable, o: UseOptions = {}): Promise<boolean> {
  const r = await run<{ findings: Finding[] }>('Checking the table', 'set-table', { table });
  if (!r) return false;
  if (o.newProject && app.openInto === 'new' && app.table && store instanceof ProjectStore) {
    // The work so far stays in its project; this table starts one of its own.
    await saver.flush();
    await store.create();
    projects.current = store.current;
    app.projectName = '';
    if (o.views === undefined) restoreViews(defaultViews());
  }
  if (o.sourceFile !== undefined) pendingSource = o.sourceFile;
  app.table = table;
  app.tableName = name;
  app.findings = r.findings;
  app.readFindings = o.readFindings ?? [];
  app.source = o.source ?? null;
  const notes = [...(o.notes ?? [])];
  if (o.views !== undefined) notes.push(...restoreViews(o.views));
  app.edits = o.edits ?? [];
  app.notes = notes;
  app.step = o.step ?? 'checks';
  resetHistory();
  return true;
}

// ---------------------------------------------------------------------------------------------
// Editing the table, and undo

/** Check an edited table in the worker and make it current (the views, source and project stay). */
async function setEditedTable(table: PlainTable): Promise<boolean> {
  const r = await run<{ findings: Finding[] }>('Checking the table', 'set-table', { table });
  if (!r) return false;
  app.table = table;
  app.findings = r.findings;
  return true;
}

/**
 * Make an edit of the table: `edit` gets a plain copy of the current table to change, and says
 * what it changed (or throws a message for the user). The edited table is checked again, the
 * edit is logged in the project, and it becomes one step of undo.
 */
export async function editTable(edit: (t: PlainTable) => Omit<TableEdit, 'at'>, then?: () => void): Promise<boolean> {
  if (!app.table) return false;
  const t = structuredClone($state.snapshot(app.table)) as PlainTable;
  let e: Omit<TableEdit, 'at'>;
  try {
    e = edit(t);
  } catch (err) {
    app.error = errorText(err);
    return false;
  }
  return record(e.label, async () => {
    const ok = await setEditedTable(t);
    if (ok) {
      app.edits = [...app.edits, { ...e, at: new Date().toISOString() }];
      // Changes that follow the edit (a renamed code in the scenarios) belong to the same undo step.
      then?.();
    }
    return ok;
  });
}

setHistoryHost({
  current: (): Snapshot => ({
    table: app.table,
    edits: app.edits,
    views: snapshotViews(),
    given: layout.sheets.map((s) => $state.snapshot(s.given) as MappingInput),
  }),
  apply: async (s) => {
    if (s.table !== app.table && s.table) {
      if (!(await setEditedTable($state.snapshot(s.table) as PlainTable))) return;
      app.table = s.table;
    }
    app.edits = s.edits;
    restoreViews(s.views);
    for (const [i, g] of s.given.entries()) {
      const p = layout.sheets[i];
      if (p && JSON.stringify($state.snapshot(p.given)) !== JSON.stringify(g)) {
        p.given = structuredClone(g);
        await detect(i);
      }
    }
  },
});

let demoSha: string | undefined;

/** Open the invented demo economy. */
export async function openDemo(o: { newProject?: boolean } = {}): Promise<boolean> {
  demoSha ??= await digestHex(new TextEncoder().encode(JSON.stringify(demoTable)));
  sourceSheet.id = '';
  return useTable(DEMO_NAME, demoTable, { source: { kind: 'demo', name: 'vellan-coast.table.json', sha256: demoSha }, sourceFile: null, ...o });
}

// ---------------------------------------------------------------------------------------------
// Opening files

async function openOne(file: File, options?: ReadConventions): Promise<Opened | undefined> {
  const buf = await file.arrayBuffer();
  return run<Opened>(`Reading ${file.name}`, 'file-open', { name: file.name, bytes: buf, ...(options ? { options } : {}) }, [buf]);
}

/** Detect (or re-detect with the user's settings) the layout of a pending sheet. */
export async function detect(i: number): Promise<void> {
  const p = layout.sheets[i];
  if (!p) return;
  const kind = layout.mode === 'supply-use' ? (i === layout.makeIndex ? 'make' : 'use') : layout.kind;
  const given = $state.snapshot(p.given) as MappingInput;
  // Until the user picks a kind, the reader proposes one (a coefficients table is read as such, with its reason).
  const proposed = layout.mode === 'table' && !layout.kindChosen && given.kind === undefined;
  const r = await run<DetectResult>('Finding the layout', 'file-detect', proposed ? { id: p.info.id, mapping: given } : { id: p.info.id, mapping: { ...given, kind }, kind });
  if (!r) return;
  if (proposed && r.mapping?.kind === 'coefficients') layout.kind = 'coefficients';
  p.mapping = r.mapping ?? null;
  p.problem = r.problem ?? null;
  p.findings = r.findings;
}

function pendingOf(info: SheetInfo): PendingSheet {
  return { info, mapping: null, problem: null, findings: [], given: {} };
}

/**
 * Open what the user chose or dropped: one file (a table sheet, a project, a JSON table) or two
 * (make and use tables). On any error the current work stays as it is.
 */
export async function openFiles(list: File[]): Promise<void> {
  app.error = '';
  if (!list.length) return;
  if (list.length > 2) {
    app.error = `choose one file (a table or a project), or two (make and use tables); ${list.length} were given`;
    return;
  }
  const opened: { file: File; r: Opened }[] = [];
  for (const f of list) {
    const r = await openOne(f);
    if (!r) return;
    opened.push({ file: f, r });
  }
  if (opened.length === 1) {
    const { file, r } = opened[0]!;
    if (r.type === 'project') return applyProject(r.project, file.name, { newProject: true });
    if (r.type === 'table') {
      sourceSheet.id = '';
      await useTable(file.name, r.table, { source: { kind: 'json', name: file.name, sha256: r.sha256, size: r.size }, newProject: true, sourceFile: null });
      return;
    }
    files.clear();
    files.set(r.id, file);
    layout.mode = 'table';
    layout.kind = 'flows';
    layout.kindChosen = false;
    layout.sheets = [pendingOf(r)];
    layout.active = 0;
    await detect(0);
    app.step = 'layout';
    return;
  }
  const sheets = opened.map((o) => o.r).filter((r): r is SheetInfo => r.type === 'sheet');
  if (sheets.length !== 2) {
    app.error = 'two files are read as make and use tables: both must be sheets (CSV, TSV, text or XLSX), not projects or JSON tables';
    return;
  }
  files.clear();
  opened.forEach((o) => files.set((o.r as SheetInfo).id, o.file));
  layout.mode = 'supply-use';
  // The make table is the file whose name says so; otherwise the first.
  layout.makeIndex = /use/i.test(sheets[0]!.name) && !/use/i.test(sheets[1]!.name) ? 1 : 0;
  layout.sheets = sheets.map(pendingOf);
  layout.active = 0;
  await detect(0);
  await detect(1);
  app.step = 'layout';
}

/** Read a pending sheet again with other conventions (sheet, delimiter, decimal mark); the roles set by hand are dropped. */
export async function reread(i: number, options: ReadConventions): Promise<void> {
  const p = layout.sheets[i];
  if (!p) return;
  const r = await run<SheetInfo>('Reading the cells again', 'file-reread', { id: p.info.id, options });
  if (!r) return;
  p.info = r;
  p.given = keepStructure(p.given, true);
  await detect(i);
}

/** The user's settings without the roles (after a change of structure the codes may be others). */
export function keepStructure(g: MappingInput, dropStructure = false): MappingInput {
  const { rows: _r, columns: _c, output: _o, ...rest } = g;
  if (!dropStructure) return rest;
  const { codeColumn: _a, labelColumn: _b, codeRow: _d, labelRow: _e, titleRows: _f, headerRows: _h, noteRows: _n, unitColumn: _u, ...kept } = rest;
  return kept;
}

/** Use a second sheet of the workbook already open as the other table (make and use in one workbook). */
export async function addSheetOfSameFile(sheet: string): Promise<void> {
  const first = layout.sheets[0];
  const file = first && files.get(first.info.id);
  if (!first || !file) return;
  const r = await openOne(file, { sheet });
  if (!r || r.type !== 'sheet') return;
  files.set(r.id, file);
  layout.mode = 'supply-use';
  layout.sheets = [first, pendingOf(r)];
  layout.makeIndex = 0;
  await detect(0);
  await detect(1);
  layout.active = 1;
}

/** Add a second file as the other table of a supply-use pair. */
export async function addSecondFile(file: File): Promise<void> {
  const first = layout.sheets[0];
  if (!first) return;
  const r = await openOne(file);
  if (!r) return;
  if (r.type !== 'sheet') {
    app.error = `file ${file.name} is not a sheet of cells, so it cannot be the other supply-use table`;
    return;
  }
  files.set(r.id, file);
  layout.mode = 'supply-use';
  layout.sheets = [first, pendingOf(r)];
  await detect(0);
  await detect(1);
  layout.active = 1;
}

/** Back to one table: forget the second sheet. */
export async function singleTable(): Promise<void> {
  layout.mode = 'table';
  layout.sheets = layout.sheets.slice(0, 1);
  layout.active = 0;
  layout.makeIndex = 0;
  await detect(0);
}

/**
 * The mapping to read with: the one shown, except the blank rule when the user did not choose it
 * (src/io then applies its default and says so in a note, as the command line does).
 */
function confirmed(p: PendingSheet): LayoutMapping {
  const m = $state.snapshot(p.mapping) as LayoutMapping;
  if (p.given.blanks === undefined) delete (m as Partial<LayoutMapping>).blanks;
  return m;
}

/** Read the table with the confirmed layout and make it current (the views follow). */
export async function confirmLayout(): Promise<void> {
  if (layout.mode === 'table') {
    const p = layout.sheets[0];
    if (!p?.mapping) {
      app.error = 'no layout was found for this sheet yet: set the code row and column, or the roles, first';
      return;
    }
    const mapping = confirmed(p);
    const r = await run<ReadResult>('Reading the table', 'file-read', { id: p.info.id, mapping });
    if (!r) return;
    const info = p.info;
    const source: SourceInfo = { kind: info.kind, name: info.name, sha256: info.sha256, size: info.size, mapping: r.mapping as unknown as Record<string, unknown> };
    if (info.sheet !== undefined) source.sheet = info.sheet;
    const file = files.get(info.id);
    const sourceFile: SourceFile | null = file ? { name: info.name, bytes: new Uint8Array(await file.arrayBuffer()), ...(info.sheet !== undefined ? { sheet: info.sheet } : {}) } : null;
    const ok = await useTable(info.name + (info.sheet && (info.sheets?.length ?? 0) > 1 ? ` (${info.sheet})` : ''), r.table, { source, readFindings: r.findings, newProject: true, sourceFile });
    if (ok) Object.assign(sourceSheet, { id: info.id, mapping: r.mapping, rowCount: info.rowCount, colCount: info.colCount });
    return;
  }
  const mk = layout.sheets[layout.makeIndex];
  const us = layout.sheets[1 - layout.makeIndex];
  if (!mk?.mapping || !us?.mapping) {
    app.error = 'the layout of the make or the use table was not found yet: adjust it first';
    return;
  }
  const r = await run<SupplyUseResult>('Reading the make and use tables', 'file-read-supply-use', {
    make: mk.info.id,
    use: us.info.id,
    makeMapping: confirmed(mk),
    useMapping: confirmed(us),
    kind: layout.suKind,
    technology: layout.technology,
    ...(layout.scrap.trim() ? { scrap: layout.scrap.trim() } : {}),
  });
  if (!r) return;
  const fileOf = (p: PendingSheet, role: 'make' | 'use', m: LayoutMapping) => ({ role, name: p.info.name, sha256: p.info.sha256, size: p.info.size, ...(p.info.sheet !== undefined ? { sheet: p.info.sheet } : {}), mapping: m as unknown as Record<string, unknown> });
  const source: SourceInfo = {
    kind: 'supply-use',
    name: us.info.name,
    sha256: us.info.sha256,
    size: us.info.size,
    files: [fileOf(mk, 'make', r.mappings.make), fileOf(us, 'use', r.mappings.use)],
    supplyUse: { kind: layout.suKind, technology: layout.technology, ...(layout.scrap.trim() ? { scrap: layout.scrap.trim() } : {}) },
  };
  const name = mk.info.name === us.info.name ? `${mk.info.name} (${mk.info.sheet ?? 'make'} + ${us.info.sheet ?? 'use'})` : `${mk.info.name} + ${us.info.name}`;
  const ok = await useTable(name, r.table, { source, readFindings: r.findings, newProject: true, sourceFile: null });
  if (ok) sourceSheet.id = '';
}

// ---------------------------------------------------------------------------------------------
// Projects and the autosave

/** Use a project read (and validated) by the worker: its table, scenarios and view settings. */
export async function applyProject(p: Project, fileName: string, o: { newProject?: boolean } = {}): Promise<void> {
  const drafts = p.scenarios.map((s) => draftOf(s));
  const w = workFromProject(p, fileName, drafts);
  sourceSheet.id = '';
  const ok = await useTable(w.tableName, w.table, { source: w.source, views: w.snapshot, notes: w.notes, edits: w.edits, sourceFile: null, ...o });
  if (!ok) return;
  if (w.theme) app.theme = w.theme;
  if (w.locale !== undefined) app.locale = w.locale;
}

/** The project file's text for the current work. */
export function currentProjectText(): string {
  return projectText(
    {
      table: app.table ? ($state.snapshot(app.table) as PlainTable) : null,
      tableName: app.tableName,
      source: app.source ? ($state.snapshot(app.source) as SourceInfo) : null,
      views: snapshotViews(),
      theme: app.theme,
      locale: app.locale,
      edits: $state.snapshot(app.edits) as TableEdit[],
    },
    scenariosForProject(),
    { ...TOOL },
  );
}

/** Offer bytes or text as a downloaded file. */
export function download(name: string, data: string | Uint8Array, mime: string): void {
  const blob = new Blob([data as BlobPart], { type: mime });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** Save the work as a project file (downloaded). */
export function saveProject(): void {
  try {
    const text = currentProjectText();
    const stem = (app.tableName || 'work').replace(/\.[a-z0-9]+$/i, '').replace(/[^\w-]+/g, '-').replace(/^-+|-+$/g, '').toLowerCase() || 'work';
    download(`${stem}.ripplewise.json`, text, 'application/json');
  } catch (e) {
    app.error = errorText(e);
  }
}

let store: WorkStore | undefined;
let tableSnap: { ref: unknown; plain: PlainTable | null } = { ref: undefined, plain: null };
/** The source file to keep with the current project at the next save (undefined: unchanged; null: none). */
let pendingSource: SourceFile | null | undefined;

/** The work as the autosave keeps it (the table's plain copy is made once per table). */
export function currentWork(): Work {
  if (tableSnap.ref !== app.table) tableSnap = { ref: app.table, plain: app.table ? ($state.snapshot(app.table) as PlainTable) : null };
  return {
    version: WORK_VERSION,
    savedAt: new Date().toISOString(),
    name: app.projectName,
    tableName: app.tableName,
    table: tableSnap.plain,
    source: app.source ? ($state.snapshot(app.source) as SourceInfo) : null,
    readFindings: $state.snapshot(app.readFindings) as Finding[],
    views: snapshotViews(),
    edits: $state.snapshot(app.edits) as TableEdit[],
    step: app.step === 'layout' ? (app.table ? 'checks' : 'open') : app.step,
    theme: app.theme,
    locale: app.locale,
  };
}

const QUOTA_NOTE = "This browser's storage is full: the work is not saved here. Delete projects you no longer need (Projects), or save a project file.";

/** Save the current work (and the source file when it changed); a full storage is said, not thrown. */
async function saveNow(): Promise<void> {
  if (!store) return;
  const work = currentWork();
  try {
    if (store instanceof ProjectStore) {
      const src = pendingSource;
      pendingSource = undefined;
      const r = await store.save(work, src);
      if (src && !r.sourceKept) app.storageNote = `The source file ${src.name} is too big for the space left in this browser: it is not kept, so findings cannot show their cells after a reload.`;
      await refreshProjects();
    } else await store.save(work);
    app.autosave = 'saved';
    if (app.storageNote === QUOTA_NOTE) app.storageNote = '';
  } catch (e) {
    if (!isQuotaError(e)) throw e;
    app.autosave = 'full';
    app.storageNote = QUOTA_NOTE;
  }
}

const saver = new Debouncer(500, saveNow, () => (app.autosave = 'failed'));

/** Ask for an autosave a moment from now (called by App.svelte after each change). */
export function scheduleAutosave(): void {
  if (!store || !app.ready) return;
  app.autosave = 'pending';
  saver.schedule();
}

/** Write a pending autosave now (before the page is hidden). */
export function flushAutosave(): Promise<void> {
  return saver.flush();
}

/** Read the project list again. */
export async function refreshProjects(): Promise<void> {
  if (!(store instanceof ProjectStore)) return;
  projects.list = await store.list();
  projects.current = store.current;
}

/** Open the source file kept with the project in the worker again, so that findings show their cells. */
async function reopenSource(src: SourceFile | undefined, info: SourceInfo | null): Promise<void> {
  sourceSheet.id = '';
  if (!src || !info?.mapping || info.kind === 'supply-use') return;
  const bytes = src.bytes.slice().buffer as ArrayBuffer;
  try {
    const r = await engine().call<Opened>('file-open', { name: src.name, bytes, ...(src.sheet !== undefined ? { options: { sheet: src.sheet } } : {}) }, { transfer: [bytes] });
    if (r.type === 'sheet') Object.assign(sourceSheet, { id: r.id, mapping: info.mapping as unknown as LayoutMapping, rowCount: r.rowCount, colCount: r.colCount });
  } catch {
    // The cells are a help, not the work: without them the findings still name their cells.
  }
}

/** Put a saved piece of work on the page (startup, or another project chosen). */
async function restoreWork(raw: unknown, extraNotes: string[] = []): Promise<void> {
  const { work, notes } = checkWork(raw);
  notes.unshift(...extraNotes);
  layout.sheets = [];
  if (work) {
    app.theme = work.theme;
    app.locale = work.locale;
    app.projectName = work.name ?? '';
    setNumberLocale(work.locale || undefined);
    if (work.table) {
      const ok = await useTable(work.tableName, work.table, { source: work.source, readFindings: work.readFindings, step: (work.step as Step) || 'checks', views: work.views, notes, edits: work.edits ?? [] });
      if (!ok) app.step = 'open';
      else if (store instanceof ProjectStore) await reopenSource(await store.loadSource(), work.source);
      return;
    }
    restoreViews(work.views);
  } else restoreViews(defaultViews());
  clearTable();
  app.notes = notes;
  app.step = 'open';
}

function clearTable(): void {
  app.edits = [];
  app.table = null;
  app.tableName = '';
  app.findings = [];
  app.readFindings = [];
  app.source = null;
  sourceSheet.id = '';
  resetHistory();
}

/**
 * On load: restore the current project, or open the demo economy on a first visit. A store that
 * cannot be opened (private windows may refuse IndexedDB) leaves the autosave off, said so.
 */
export async function startup(s?: WorkStore): Promise<void> {
  try {
    store = s ?? (await ProjectStore.open(await idbKV()));
  } catch {
    store = memoryStore();
    app.autosave = 'unavailable';
  }
  let raw: unknown;
  try {
    raw = await store!.load();
  } catch {
    raw = undefined;
    app.autosave = 'unavailable';
  }
  await refreshProjects();
  if (raw !== undefined && raw !== null) await restoreWork(raw);
  else {
    const { notes } = checkWork(raw);
    app.notes = notes;
    if (projects.list.length) {
      // Projects are kept but the current one is gone: show the list rather than the demo.
      app.step = 'projects';
    } else {
      app.firstVisit = true;
      await openDemo();
    }
  }
  if (app.autosave === 'off') app.autosave = 'saved';
  app.ready = true;
  void askPersistence();
}

/** Ask the browser to keep the projects when space runs low; say so when it may clear them. */
async function askPersistence(): Promise<void> {
  if (typeof navigator === 'undefined' || !(store instanceof ProjectStore)) return;
  const st = (navigator as Navigator & { storage?: StorageManager }).storage;
  if (!st?.persist) return;
  try {
    const kept = (await st.persisted?.()) || (await st.persist());
    if (!kept && !app.storageNote) app.storageNote = 'This browser may clear the projects kept here when its space runs low (it did not grant lasting storage): save project files of work you need.';
  } catch {
    // Not offered: nothing to say.
  }
}

/** Switch to another project kept in this browser (the current one is saved first). */
export async function switchProject(id: string): Promise<void> {
  if (!(store instanceof ProjectStore) || id === store.current) return;
  await saver.flush();
  await store.select(id);
  projects.current = id;
  pendingSource = undefined;
  await restoreWork(await store.load());
}

/** A new, empty project (the current one is saved first). */
export async function newProject(): Promise<void> {
  if (!(store instanceof ProjectStore)) return;
  await saver.flush();
  await store.create();
  projects.current = store.current;
  pendingSource = undefined;
  app.projectName = '';
  app.notes = [];
  clearTable();
  restoreViews(defaultViews());
  app.step = 'open';
}

/** Delete a project kept in this browser (after a confirmation on the page). */
export async function deleteProject(id: string): Promise<void> {
  if (!(store instanceof ProjectStore)) return;
  const wasCurrent = id === store.current;
  if (wasCurrent) saver.cancel();
  await store.remove(id);
  await refreshProjects();
  if (wasCurrent) {
    const next = projects.list[0];
    if (next) {
      await store.select(next.id);
      projects.current = next.id;
      await restoreWork(await store.load());
    } else {
      clearTable();
      restoreViews(defaultViews());
      app.projectName = '';
      app.step = 'open';
    }
  }
}

/** Read another project's work without opening it (side by side). */
export async function otherProjectWork(id: string): Promise<Work | undefined> {
  if (!(store instanceof ProjectStore)) return undefined;
  const { work } = checkWork(await store.loadOther(id));
  return work?.table ? (work as Work) : undefined;
}

/** Drop the current project's work: the table, the views, its autosave. The next visit starts empty (not with the demo). */
export async function startFresh(): Promise<void> {
  saver.cancel();
  clearTable();
  app.error = '';
  app.notes = [];
  layout.sheets = [];
  files.clear();
  pendingSource = null;
  restoreViews(defaultViews());
  app.step = 'open';
  void engine().call('file-close', {});
  if (store) {
    await store.clear();
    await saveNow();
  }
}
