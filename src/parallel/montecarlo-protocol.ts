/**
 * The message protocol, the worker side and the scheduler shared by the Node (worker_threads)
 * and browser (Web Worker) Monte Carlo runners.
 *
 * Main → worker: `init` once with the plain spec, then `run` tasks, each a range of draws.
 * Worker → main: `progress` (throttled to about one message every 50 ms per task), then `block`
 * (the engine's `DrawBlock`, its typed arrays transferred), or `error`.
 *
 * The scheduler checks the spec in the calling thread first (so bad input fails fast with the
 * engine's own `InputError`), cuts the draws into tasks, keeps every worker busy with one task
 * at a time, and merges the blocks with `mergeDrawBlocks`. Every draw depends only on the seed
 * and its index, so the merged result equals the single-thread `monteCarlo` for the same spec,
 * whatever the number of workers or the task size. Cancellation terminates the workers and
 * rejects with `CancelledError`.
 */
import type { Where } from '../../engine/errors';
import { CancelledError, InputError } from '../../engine/errors';
import type { CancelSignal, DrawBlock, MonteCarloResult, MonteCarloSpec, PreparedMonteCarlo } from '../../engine/uncertainty';
import { mergeDrawBlocks, prepareMonteCarlo, runDraws } from '../../engine/uncertainty';

export type ToWorker = { type: 'init'; spec: MonteCarloSpec } | { type: 'run'; task: number; start: number; end: number };

export interface WireError {
  name: string;
  message: string;
  code?: string;
  where?: Where;
}

export type FromWorker =
  | { type: 'progress'; task: number; done: number }
  | { type: 'block'; task: number; block: DrawBlock }
  | { type: 'error'; task: number; error: WireError };

/** Post a message with the buffers to transfer. */
export type Post = (message: FromWorker, transfer: ArrayBuffer[]) => void;

function toWire(e: unknown): WireError {
  if (e instanceof InputError) return { name: e.name, message: e.message, code: e.code, where: e.where };
  if (e instanceof Error) return { name: e.name, message: e.message };
  return { name: 'Error', message: String(e) };
}

function fromWire(w: WireError): Error {
  if (w.name === 'InputError') {
    const e = new InputError(w.code ?? 'worker', '', w.where ?? {});
    e.message = w.message;
    return e;
  }
  if (w.name === 'CancelledError') return new CancelledError(w.message);
  const e = new Error(`a Monte Carlo worker failed: ${w.message}`);
  e.name = w.name;
  return e;
}

/** The worker side: returns the handler for incoming messages. */
export function createWorkerHandler(post: Post): (message: ToWorker) => void {
  let prepared: PreparedMonteCarlo | null = null;
  return (m) => {
    const task = m.type === 'run' ? m.task : -1;
    try {
      if (m.type === 'init') {
        prepared = prepareMonteCarlo(m.spec);
        return;
      }
      if (m.type !== 'run') throw new Error(`unknown message type '${(m as { type: unknown }).type}'`);
      if (!prepared) throw new Error('a run arrived before init');
      let last = Date.now();
      const block = runDraws(prepared, m.start, m.end, {
        onProgress: (done, total) => {
          const now = Date.now();
          if (done < total && now - last >= 50) {
            last = now;
            post({ type: 'progress', task: m.task, done }, []);
          }
        },
      });
      post({ type: 'block', task: m.task, block }, [
        block.samples.buffer as ArrayBuffer,
        block.accepted.buffer as ArrayBuffer,
        block.rejectedByColumn.buffer as ArrayBuffer,
      ]);
    } catch (e) {
      post({ type: 'error', task, error: toWire(e) }, []);
    }
  };
}

/** What the scheduler needs of a worker, in Node or in a browser. */
export interface WorkerPort {
  post(message: ToWorker): void;
  listen(onMessage: (message: FromWorker) => void, onError: (error: Error) => void): void;
  terminate(): void;
}

/** A cancellation signal; an AbortSignal fits (its abort event is used when present). */
export type ParallelSignal = CancelSignal & {
  addEventListener?: (type: 'abort', listener: () => void) => void;
  removeEventListener?: (type: 'abort', listener: () => void) => void;
};

export interface ParallelOptions {
  /** Called as draws complete, with the draws done and N. */
  onProgress?: (done: number, total: number) => void;
  signal?: ParallelSignal;
  /** Draws per task (default: about eight tasks per worker, at most 500 draws). */
  chunk?: number;
}

/** Task ranges [start, end) covering 0 … draws − 1. */
export function taskRanges(draws: number, workers: number, chunk?: number): [number, number][] {
  const size = chunk ?? Math.max(1, Math.min(500, Math.ceil(draws / (workers * 8))));
  if (!Number.isInteger(size) || size < 1) throw new InputError('bad-option', `the chunk size must be a whole number of at least 1; got ${size}`);
  const out: [number, number][] = [];
  for (let s = 0; s < draws; s += size) out.push([s, Math.min(draws, s + size)]);
  return out;
}

/**
 * Run a Monte Carlo spec on the given workers and merge. The workers are terminated at the end
 * (success, failure or cancellation).
 */
export function runOnPorts(spec: MonteCarloSpec, makePorts: (count: number) => WorkerPort[], workers: number, options: ParallelOptions = {}): Promise<MonteCarloResult> {
  let prepared: PreparedMonteCarlo;
  try {
    if (!Number.isInteger(workers) || workers < 1) {
      throw new InputError('bad-workers', `the number of workers must be a whole number of at least 1; got ${workers}`, { text: String(workers) });
    }
    prepared = prepareMonteCarlo(spec);
    if (options.signal?.aborted) throw new CancelledError('the Monte Carlo run was cancelled before it started');
  } catch (e) {
    return Promise.reject(e);
  }
  const tasks = taskRanges(prepared.draws, workers, options.chunk);
  const count = Math.min(workers, tasks.length);
  return new Promise<MonteCarloResult>((resolve, reject) => {
    const ports = makePorts(count);
    const blocks: DrawBlock[] = [];
    const doneByTask = new Float64Array(tasks.length);
    let doneTotal = 0;
    let next = 0;
    let finished = 0;
    let settled = false;
    const onAbort = () => fail(new CancelledError(`the Monte Carlo run was cancelled after ${doneTotal} of ${prepared.draws} draws`));
    const cleanup = () => {
      settled = true;
      options.signal?.removeEventListener?.('abort', onAbort);
      for (const p of ports) p.terminate();
    };
    const fail = (e: Error) => {
      if (settled) return;
      cleanup();
      reject(e);
    };
    const progress = (task: number, done: number) => {
      doneTotal += done - doneByTask[task]!;
      doneByTask[task] = done;
      options.onProgress?.(doneTotal, prepared.draws);
    };
    const dispatch = (port: WorkerPort) => {
      if (next >= tasks.length) return;
      const t = next++;
      const [start, end] = tasks[t]!;
      port.post({ type: 'run', task: t, start, end });
    };
    options.signal?.addEventListener?.('abort', onAbort);
    ports.forEach((port) => {
      port.listen(
        (m) => {
          if (settled) return;
          if (options.signal?.aborted) return onAbort();
          if (m.type === 'progress') progress(m.task, m.done);
          else if (m.type === 'error') fail(fromWire(m.error));
          else if (m.type === 'block') {
            blocks.push(m.block);
            progress(m.task, m.block.end - m.block.start);
            finished++;
            if (finished === tasks.length) {
              cleanup();
              try {
                resolve(mergeDrawBlocks(prepared, blocks));
              } catch (e) {
                reject(e);
              }
            } else dispatch(port);
          }
        },
        (e) => fail(e),
      );
      port.post({ type: 'init', spec });
      dispatch(port);
    });
  });
}
