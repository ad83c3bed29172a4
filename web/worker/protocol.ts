/**
 * Messages between the page and the engine worker. Every request has an id; the worker answers
 * with progress messages (optional) and exactly one result or error. A `cancel` message asks the
 * worker to stop a request; work that cannot stop in time is ended by restarting the worker.
 */

export interface Request {
  kind: 'request';
  id: number;
  op: string;
  args: unknown;
}

export interface Cancel {
  kind: 'cancel';
  id: number;
}

export interface Progress {
  kind: 'progress';
  id: number;
  /** 0 to 1. */
  fraction: number;
  note?: string;
}

export interface Result {
  kind: 'result';
  id: number;
  value: unknown;
}

/** An error as plain data: the worker cannot send class instances. */
export interface WorkerError {
  name: string;
  code?: string;
  message: string;
  where?: Record<string, unknown>;
}

export interface Failure {
  kind: 'error';
  id: number;
  error: WorkerError;
}

export type ToWorker = Request | Cancel;
export type FromWorker = Progress | Result | Failure;

/** Turn any thrown value into plain data that keeps the code and the location. */
export function toWorkerError(e: unknown): WorkerError {
  if (e && typeof e === 'object') {
    const o = e as { name?: unknown; code?: unknown; message?: unknown; where?: unknown };
    const out: WorkerError = { name: String(o.name ?? 'Error'), message: String(o.message ?? e) };
    if (typeof o.code === 'string') out.code = o.code;
    if (o.where && typeof o.where === 'object') out.where = o.where as Record<string, unknown>;
    return out;
  }
  return { name: 'Error', message: String(e) };
}
