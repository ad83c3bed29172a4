/// <reference lib="webworker" />
/**
 * The engine worker: all heavy work happens here so that the page never blocks. It keeps the
 * current table and its model between requests; see handlers.ts for the operations.
 */
import { handlers } from './handlers';
import { makeContext } from './context';
import type { FromWorker, ToWorker } from './protocol';
import { toWorkerError } from './protocol';

const cancelled = new Set<number>();
const post = (m: FromWorker, transfer: Transferable[] = []) => (self as unknown as DedicatedWorkerGlobalScope).postMessage(m, transfer);

self.onmessage = async (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (msg.kind === 'cancel') {
    cancelled.add(msg.id);
    return;
  }
  const { id, op, args } = msg;
  const handler = handlers[op];
  if (!handler) {
    post({ kind: 'error', id, error: { name: 'InputError', code: 'unknown-op', message: `the worker has no operation '${op}'` } });
    return;
  }
  const transfers: ArrayBuffer[] = [];
  const ctx = makeContext((p) => post({ kind: 'progress', id, ...p }), () => cancelled.has(id), transfers);
  try {
    const value = await handler(args, ctx);
    post({ kind: 'result', id, value }, transfers);
  } catch (e) {
    post({ kind: 'error', id, error: toWorkerError(e) });
  } finally {
    cancelled.delete(id);
  }
};
