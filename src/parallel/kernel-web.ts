/**
 * The parallel kernel in the browser: helper threads are module Web Workers running
 * kernel-web-worker.ts. Shared memory needs a cross-origin isolated page (served with
 * `Cross-Origin-Opener-Policy: same-origin` and `Cross-Origin-Embedder-Policy: require-corp`);
 * and the caller must itself be a worker, because the kernel waits with `Atomics.wait`, which
 * the page's main thread may not do. Where either is missing, `startBrowserKernel` rejects and
 * the engine's single-thread kernel is the one to use.
 *
 * @example (inside the engine's worker)
 * const kernel = await startBrowserKernel({ threads: navigator.hardwareConcurrency });
 * setKernel(kernel);
 */
import type { Helper, InitMessage, ParallelOptions } from './kernel-protocol';
import { ParallelKernel } from './kernel-protocol';

export function startBrowserKernel(options: ParallelOptions & { workerUrl?: URL } = {}): Promise<ParallelKernel> {
  const g = globalThis as unknown as { crossOriginIsolated?: boolean; navigator?: { hardwareConcurrency?: number } };
  if (g.crossOriginIsolated === false) {
    return Promise.reject(new Error('the page is not cross-origin isolated, so threads cannot share memory'));
  }
  const threads = options.threads ?? Math.max(1, g.navigator?.hardwareConcurrency ?? 1);
  const spawn = (): Helper => {
    // Written inline so that Vite finds and bundles the worker.
    const w = options.workerUrl
      ? new Worker(options.workerUrl, { type: 'module' })
      : new Worker(new URL('./kernel-web-worker.ts', import.meta.url), { type: 'module' });
    const ready = new Promise<void>((res, rej) => {
      w.onmessage = (e: MessageEvent<{ type: string }>) => (e.data.type === 'ready' ? res() : rej(new Error(`unexpected message ${e.data.type}`)));
      w.onerror = (e) => rej(new Error(e.message));
    });
    return { post: (m: InitMessage) => w.postMessage(m), ready, terminate: () => w.terminate() };
  };
  return ParallelKernel.start(spawn, { maximumPages: 16384, ...options, threads });
}
