/**
 * The page's side of the engine worker: `call(op, args)` returns a promise, with progress
 * callbacks and cancellation. A request that does not stop within `graceMs` of a cancel is ended
 * by restarting the worker; `onRestart` lets the caller re-send the current table.
 */
import type { FromWorker, WorkerError } from '../worker/protocol';

export interface CallOptions {
  onProgress?: (fraction: number, note?: string) => void;
  signal?: AbortSignal;
  transfer?: Transferable[];
}

export class EngineCallError extends Error {
  readonly code: string | undefined;
  readonly where: Record<string, unknown> | undefined;
  constructor(e: WorkerError) {
    super(e.message);
    this.name = e.name;
    this.code = e.code;
    this.where = e.where;
  }
}

interface Pending {
  resolve: (v: unknown) => void;
  reject: (e: unknown) => void;
  onProgress?: (fraction: number, note?: string) => void;
}

export class EngineClient {
  private worker: Worker;
  private next = 1;
  private pending = new Map<number, Pending>();

  constructor(
    private readonly create: () => Worker,
    private readonly graceMs = 800,
    public onRestart?: () => Promise<void> | void,
  ) {
    this.worker = this.spawn();
  }

  private spawn(): Worker {
    const w = this.create();
    w.onmessage = (ev: MessageEvent<FromWorker>) => {
      const m = ev.data;
      const p = this.pending.get(m.id);
      if (!p) return;
      if (m.kind === 'progress') p.onProgress?.(m.fraction, m.note);
      else {
        this.pending.delete(m.id);
        if (m.kind === 'result') p.resolve(m.value);
        else p.reject(new EngineCallError(m.error));
      }
    };
    w.onerror = (ev) => {
      const err = new EngineCallError({ name: 'WorkerError', message: ev.message || 'the engine worker failed' });
      for (const p of this.pending.values()) p.reject(err);
      this.pending.clear();
    };
    return w;
  }

  call<T = unknown>(op: string, args: unknown = {}, options: CallOptions = {}): Promise<T> {
    const id = this.next++;
    return new Promise<T>((resolve, reject) => {
      const entry: Pending = { resolve: resolve as (v: unknown) => void, reject };
      if (options.onProgress) entry.onProgress = options.onProgress;
      this.pending.set(id, entry);
      if (options.signal) {
        if (options.signal.aborted) {
          this.pending.delete(id);
          reject(new EngineCallError({ name: 'CancelledError', code: 'cancelled', message: 'the work was cancelled' }));
          return;
        }
        options.signal.addEventListener('abort', () => this.cancel(id), { once: true });
      }
      this.worker.postMessage({ kind: 'request', id, op, args }, options.transfer ?? []);
    });
  }

  private cancel(id: number): void {
    if (!this.pending.has(id)) return;
    this.worker.postMessage({ kind: 'cancel', id });
    setTimeout(() => {
      const p = this.pending.get(id);
      if (!p) return;
      // The work did not stop by itself: end the worker and start a fresh one.
      this.worker.terminate();
      const cancelled = new EngineCallError({ name: 'CancelledError', code: 'cancelled', message: 'the work was cancelled' });
      for (const q of this.pending.values()) q.reject(cancelled);
      this.pending.clear();
      this.worker = this.spawn();
      void this.onRestart?.();
    }, this.graceMs);
  }

  terminate(): void {
    this.worker.terminate();
  }
}
