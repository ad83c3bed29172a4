/**
 * A helper thread of the parallel kernel in the browser (a module Web Worker). Same protocol as
 * the Node helper (see kernel-protocol.ts): on `init` it instantiates the shared-memory kernels, posts
 * `ready`, then serves jobs from its slot of the control block until OP_STOP.
 */
import type { KernelExports } from '../../engine/linalg/kernel';
import type { InitMessage } from './kernel-protocol';
import { serveKernel } from './kernel-protocol';

const scope = self as unknown as { onmessage: ((e: MessageEvent<InitMessage>) => void) | null; postMessage(m: unknown): void };

scope.onmessage = (e) => {
  const { module, memory, control, slot } = e.data;
  const ex = new WebAssembly.Instance(module, { env: { memory } }).exports as unknown as KernelExports;
  scope.onmessage = null;
  scope.postMessage({ type: 'ready', slot });
  serveKernel(control, slot, ex);
};
