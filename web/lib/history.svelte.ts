/**
 * Undo and redo for the work of a project: table edits, layout changes, settings and scenario
 * edits, each step named ("undo: FOOD → HOSP flow 12.3 → 14.0").
 *
 * A step holds the state before and after it: the table (by reference: edits make a new table
 * object and share the rows they leave alone), the edit log, the views' settings and the layout
 * step's hand settings. Table edits push their step with their own name (`record`); changes of
 * the views and the layout are noticed a moment after they settle (`observe`, called by
 * App.svelte on every change) and named from the difference (`describeViews`, `describeGiven`).
 * Undo puts the state before back (the table is checked again by the worker); a new change after
 * an undo drops the steps that were undone. Opening another table or project starts afresh.
 */
import type { PlainTable } from '../../engine/index';
import type { MappingInput } from '../../src/io/index';
import type { DraftScenario, ViewState } from './views.svelte';

/** One recorded edit of the table (the project keeps the list; a report lists them). */
export interface TableEdit {
  /** What was changed, as a person reads it: "FOOD → HOSP flow 12.3 → 14.0". */
  label: string;
  kind: 'flow' | 'final-demand' | 'value-added' | 'coefficient' | 'output' | 'rename' | 'meta' | 'merge';
  /** The cell changed (codes), for cell edits. */
  row?: string;
  col?: string;
  before?: number | string | null;
  after?: number | string | null;
  at: string;
}

export interface Snapshot {
  table: PlainTable | null;
  edits: TableEdit[];
  views: ViewState;
  /** The layout step's hand settings, one per pending sheet. */
  given: MappingInput[];
}

export interface Step {
  label: string;
  before: Snapshot;
  after: Snapshot;
}

/** Steps kept (each table edit keeps a copy of the table). */
const LIMIT = 50;

export const history = $state({
  undo: [] as Step[],
  redo: [] as Step[],
  /** The last step undone or redone, said in a status line. */
  said: '' as string,
});

/** Where the page's state is read and put back (state.svelte.ts gives these, so that this module does not import it). */
export interface HistoryHost {
  current(): Snapshot;
  /** Put a snapshot back: the table through the worker's checks, the views, the layout. */
  apply(s: Snapshot): Promise<void>;
}

let host: HistoryHost | undefined;
let last: Snapshot | undefined;
let timer: ReturnType<typeof setTimeout> | undefined;
let applying = false;

export function setHistoryHost(h: HistoryHost): void {
  host = h;
}

/** Start afresh (another table or project): no steps, the current state as the base. */
export function resetHistory(): void {
  if (timer !== undefined) clearTimeout(timer);
  timer = undefined;
  history.undo = [];
  history.redo = [];
  history.said = '';
  last = host?.current();
}

function push(step: Step): void {
  history.undo = [...history.undo.slice(-(LIMIT - 1)), step];
  history.redo = [];
}

/** Notice a change of views or layout now (rather than a moment later). */
export function settle(): void {
  if (timer !== undefined) clearTimeout(timer);
  timer = undefined;
  if (!host || applying) return;
  const now = host.current();
  if (!last) {
    last = now;
    return;
  }
  const label = describeViews(last.views, now.views) || describeGiven(last.given, now.given);
  if (label && last.table === now.table) push({ label, before: last, after: now });
  last = now;
}

/** Called after every change of views or layout: a step is made once the changes settle (typing is one step). */
export function observe(ms = 400): void {
  if (!host || applying) return;
  if (timer !== undefined) clearTimeout(timer);
  timer = setTimeout(settle, ms);
}

/** Record a table edit made by the page: `change` makes the new state (the worker has checked the table). */
export async function record(label: string, change: () => Promise<boolean>): Promise<boolean> {
  settle();
  const before = host?.current();
  const ok = await change();
  if (!ok || !host || !before) return ok;
  const after = host.current();
  push({ label, before, after });
  last = after;
  return ok;
}

async function go(from: 'undo' | 'redo'): Promise<void> {
  settle();
  const list = history[from];
  const step = list[list.length - 1];
  if (!step || !host) return;
  applying = true;
  try {
    await host.apply(from === 'undo' ? step.before : step.after);
  } finally {
    applying = false;
  }
  last = host.current();
  if (from === 'undo') {
    history.undo = history.undo.slice(0, -1);
    history.redo = [...history.redo, step];
    history.said = `Undone: ${step.label}`;
  } else {
    history.redo = history.redo.slice(0, -1);
    history.undo = [...history.undo, step];
    history.said = `Redone: ${step.label}`;
  }
}

export const undo = (): Promise<void> => go('undo');
export const redo = (): Promise<void> => go('redo');

// ---------------------------------------------------------------------------------------------
// Naming a change

const q = (v: unknown) => (typeof v === 'string' ? `'${v}'` : v === null || v === undefined ? '(empty)' : typeof v === 'object' ? JSON.stringify(v) : String(v));

function changeLabel(s: DraftScenario, k: number): string {
  const c = s.changes[k];
  return `scenario '${s.name}' change ${k + 1}${c ? ` (${c.sector})` : ''}`;
}

function describeScenarios(a: DraftScenario[], b: DraftScenario[]): string {
  const ids = (l: DraftScenario[]) => l.map((s) => s.id);
  const added = b.filter((s) => !ids(a).includes(s.id));
  const removed = a.filter((s) => !ids(b).includes(s.id));
  if (added.length) return added.length === 1 ? `add scenario '${added[0]!.name}'` : `add ${added.length} scenarios`;
  if (removed.length) return removed.length === 1 ? `delete scenario '${removed[0]!.name}'` : `delete ${removed.length} scenarios`;
  for (const sb of b) {
    const sa = a.find((s) => s.id === sb.id)!;
    if (sa.name !== sb.name) return `rename scenario '${sa.name}' → '${sb.name}'`;
    if (sa.description !== sb.description) return `scenario '${sb.name}' description`;
    if (sb.changes.length > sa.changes.length) return `scenario '${sb.name}': add a change for ${sb.changes[sb.changes.length - 1]!.sector}`;
    if (sb.changes.length < sa.changes.length) {
      const gone = sa.changes.findIndex((c, k) => JSON.stringify(c) !== JSON.stringify(sb.changes[k]));
      return `scenario '${sb.name}': remove change ${gone + 1} (${sa.changes[gone]!.sector})`;
    }
    for (let k = 0; k < sb.changes.length; k++) {
      const ca = sa.changes[k]!;
      const cb = sb.changes[k]!;
      for (const f of ['sector', 'basis', 'value', 'localShare', 'category', 'note'] as const) {
        if (ca[f] !== cb[f]) {
          const name = f === 'value' ? (cb.basis === 'percent' ? 'percentage' : 'amount') : f === 'localShare' ? 'local share' : f;
          return `${changeLabel(sa, k)} ${name} ${q(ca[f])} → ${q(cb[f])}`;
        }
      }
    }
  }
  return '';
}

/** Paths of the settings that differ (the scenario shown and the results shown are places, not settings). */
function diffPaths(a: unknown, b: unknown, path: string, out: string[]): void {
  if (JSON.stringify(a) === JSON.stringify(b)) return;
  if (a && b && typeof a === 'object' && typeof b === 'object' && !Array.isArray(a) && !Array.isArray(b)) {
    for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) diffPaths((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], path ? `${path}.${k}` : k, out);
    return;
  }
  out.push(path);
}

const IGNORED = new Set(['activeScenario', 'results.shown', 'version']);

/** The name of the change between two states of the views, or '' when nothing that is a setting changed. */
export function describeViews(a: ViewState, b: ViewState): string {
  const s = describeScenarios(a.scenarios, b.scenarios);
  if (s) return s;
  const paths: string[] = [];
  diffPaths({ ...a, scenarios: [] }, { ...b, scenarios: [] }, '', paths);
  const real = paths.filter((p) => !IGNORED.has(p));
  if (!real.length) return '';
  const p = real[0]!;
  const get = (o: unknown) => p.split('.').reduce<unknown>((x, k) => (x && typeof x === 'object' ? (x as Record<string, unknown>)[k] : undefined), o);
  if (p === 'measure') return `measure ${q(a.measure)} → ${q(b.measure)}`;
  if (p.startsWith('household')) return 'household closure settings';
  if (p.startsWith('sensitivity.edits')) return 'what-if coefficient edits';
  return `setting ${p} ${q(get(a))} → ${q(get(b))}${real.length > 1 ? ` (and ${real.length - 1} more)` : ''}`;
}

/** The name of a change of the layout's hand settings, or ''. */
export function describeGiven(a: MappingInput[], b: MappingInput[]): string {
  if (a.length !== b.length) return '';
  for (let i = 0; i < b.length; i++) {
    const paths: string[] = [];
    diffPaths(a[i], b[i], '', paths);
    if (paths.length) {
      const p = paths[0]!.split('.')[0]!;
      const x = (a[i] as Record<string, unknown>)[p];
      const y = (b[i] as Record<string, unknown>)[p];
      return `layout: ${p} ${q(x)} → ${q(y)}`;
    }
  }
  return '';
}
