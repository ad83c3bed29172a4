/**
 * Monte Carlo across worker_threads in Node. Each worker runs the engine's `runDraws` on ranges
 * of draws; the blocks are merged so that the result equals the single-thread `monteCarlo` for
 * the same seed. Workers run the TypeScript sources through tsx (see worker-boot.mjs), under
 * tsx and under vitest alike.
 *
 * @example
 * const r = await monteCarloInWorkers({ A, cv: 0.1, draws: 2000, seed: 7 }, { workers: 2, onProgress: (d, n) => bar.update(d) });
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { MonteCarloResult, MonteCarloSpec } from '../../engine/uncertainty';
import type { FromWorker, ParallelOptions, WorkerPort } from './montecarlo-protocol';
import { runOnPorts } from './montecarlo-protocol';

export interface NodeParallelOptions extends ParallelOptions {
  /** Number of worker threads (default: the available parallelism, at least 1). */
  workers?: number;
}

declare const RIPPLEWISE_COMPILED: boolean | undefined;

function nodePort(): WorkerPort {
  // The compiled command (scripts/build-cli.mjs) has the worker bundled beside it.
  const w =
    typeof RIPPLEWISE_COMPILED !== 'undefined' && RIPPLEWISE_COMPILED
      ? new Worker(new URL('./montecarlo-worker.mjs', import.meta.url))
      : new Worker(new URL('./worker-boot.mjs', import.meta.url), { workerData: { entry: new URL('./montecarlo-node-worker.ts', import.meta.url).href } });
  let alive = true;
  return {
    post: (m) => w.postMessage(m),
    listen(onMessage, onError) {
      w.on('message', (m: FromWorker) => onMessage(m));
      w.on('error', (e) => onError(e instanceof Error ? e : new Error(String(e))));
      w.on('exit', (code) => {
        if (alive && code !== 0) onError(new Error(`a Monte Carlo worker stopped with exit code ${code}`));
      });
    },
    terminate() {
      alive = false;
      void w.terminate();
    },
  };
}

export function monteCarloInWorkers(spec: MonteCarloSpec, options: NodeParallelOptions = {}): Promise<MonteCarloResult> {
  const workers = options.workers ?? Math.max(1, availableParallelism());
  return runOnPorts(spec, (count) => Array.from({ length: count }, nodePort), workers, options);
}
