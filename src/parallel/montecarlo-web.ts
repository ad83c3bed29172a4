/**
 * Monte Carlo across Web Workers in the browser: the same protocol, scheduler and merge as the
 * Node runner (montecarlo-protocol.ts), so the result equals the single-thread `monteCarlo` for
 * the same seed. The worker module is bundled by Vite from the `new URL(..., import.meta.url)`
 * below.
 */
import type { MonteCarloResult, MonteCarloSpec } from '../../engine/uncertainty';
import type { FromWorker, ParallelOptions, WorkerPort } from './montecarlo-protocol';
import { runOnPorts } from './montecarlo-protocol';

export interface WebParallelOptions extends ParallelOptions {
  /** Number of Web Workers (default: navigator.hardwareConcurrency, at least 1). */
  workers?: number;
}

function webPort(): WorkerPort {
  const w = new Worker(new URL('./montecarlo-web-worker.ts', import.meta.url), { type: 'module' });
  return {
    post: (m) => w.postMessage(m),
    listen(onMessage, onError) {
      w.onmessage = (e: MessageEvent<FromWorker>) => onMessage(e.data);
      w.onerror = (e: ErrorEvent) => onError(new Error(`a Monte Carlo worker failed: ${e.message}`));
    },
    terminate: () => w.terminate(),
  };
}

export function monteCarloInWebWorkers(spec: MonteCarloSpec, options: WebParallelOptions = {}): Promise<MonteCarloResult> {
  const workers = options.workers ?? Math.max(1, globalThis.navigator?.hardwareConcurrency ?? 1);
  return runOnPorts(spec, (count) => Array.from({ length: count }, webPort), workers, options);
}
