/**
 * The parallel kernel in Node: helper threads are worker_threads running kernel-worker.mjs.
 *
 * @example
 * const kernel = await startNodeKernel({ threads: 2 });
 * const lu = new LU(a, { kernel });   // or setKernel(kernel) for every LU
 * kernel.close();
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { Helper, InitMessage, ParallelOptions } from './kernel-protocol';
import { ARGS, DONE, ERROR, OP, OP_GEMM, OP_STOP, ParallelKernel, SEQ, SLOT } from './kernel-protocol';

export const LAYOUT = { SLOT, SEQ, DONE, OP, ERROR, ARGS, OP_GEMM, OP_STOP };

function spawn(): Helper {
  const w = new Worker(new URL('./kernel-worker.mjs', import.meta.url));
  w.unref();
  let ready!: () => void;
  let failed!: (e: Error) => void;
  const p = new Promise<void>((res, rej) => {
    ready = res;
    failed = rej;
  });
  w.once('message', (m: { type: string }) => (m.type === 'ready' ? ready() : failed(new Error(`unexpected message ${m.type}`))));
  w.once('error', (e) => failed(e));
  return {
    post: (message: InitMessage) => w.postMessage({ ...message, layout: LAYOUT }),
    ready: p,
    terminate: () => void w.terminate(),
  };
}

/** Start the kernel with `threads` in all (default: the cores available). */
export function startNodeKernel(options: ParallelOptions = {}): Promise<ParallelKernel> {
  const threads = options.threads ?? Math.max(1, availableParallelism());
  return ParallelKernel.start(spawn, { ...options, threads });
}
