/**
 * State that many panels share, as Svelte 5 runes. Panels read it and call the actions; only the
 * actions change it. Results come from the worker and never reach back into the table.
 */
import type { Finding, PlainTable } from '../../engine/index';
import { EngineClient } from './engine-client';

export type Step = 'open' | 'layout' | 'checks' | 'coefficients' | 'multipliers' | 'linkages' | 'scenarios' | 'results' | 'sensitivity' | 'report';

export const STEPS: { id: Step; label: string }[] = [
  { id: 'open', label: 'Open' },
  { id: 'layout', label: 'Layout' },
  { id: 'checks', label: 'Checks' },
  { id: 'coefficients', label: 'Coefficients' },
  { id: 'multipliers', label: 'Multipliers' },
  { id: 'linkages', label: 'Linkages' },
  { id: 'scenarios', label: 'Scenarios' },
  { id: 'results', label: 'Results' },
  { id: 'sensitivity', label: 'Sensitivity' },
  { id: 'report', label: 'Report' },
];

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
  findings: [] as Finding[],
  busy: null as Busy | null,
  error: '' as string,
  theme: 'system' as 'system' | 'light' | 'dark',
});

let client: EngineClient | undefined;

/** The engine worker, started on first use. */
export function engine(): EngineClient {
  if (!client) {
    client = new EngineClient(() => new Worker(new URL('../worker/engine.worker.ts', import.meta.url), { type: 'module' }));
    client.onRestart = async () => {
      if (app.table) await client!.call('set-table', { table: $state.snapshot(app.table) });
    };
  }
  return client;
}

/** Run one worker call with the busy bar, progress and a cancel button. */
export async function run<T>(label: string, op: string, args: unknown): Promise<T | undefined> {
  const ctl = new AbortController();
  app.busy = { label, fraction: 0, cancel: () => ctl.abort() };
  app.error = '';
  try {
    return await engine().call<T>(op, args, {
      signal: ctl.signal,
      onProgress: (fraction, note) => {
        if (app.busy) app.busy = { ...app.busy, fraction, ...(note ? { note } : {}) };
      },
    });
  } catch (e) {
    const err = e as { name?: string; message?: string };
    app.error = err.name === 'CancelledError' ? 'Cancelled.' : String(err.message ?? e);
    return undefined;
  } finally {
    app.busy = null;
  }
}

/** Make a table the current one: the worker checks it and keeps its model. */
export async function useTable(name: string, table: PlainTable): Promise<void> {
  const r = await run<{ findings: Finding[] }>('Checking the table', 'set-table', { table });
  if (!r) return;
  app.table = table;
  app.tableName = name;
  app.findings = r.findings;
  app.step = 'checks';
}
