/**
 * A module Web Worker that runs one large-table case (see large-case.ts) and posts the timings:
 * the browser side of the n = 5,000 target (at most 15 s from the table in memory to both
 * answers).
 *
 * @example (in a page or a test driving Chromium)
 * const w = new Worker(new URL('../src/parallel/large-web-worker.ts', import.meta.url), { type: 'module' });
 * w.postMessage({ type: 'large-case', regions: 10, sectors: 500, density: 0.12 });
 * w.onmessage = (e) => console.log(e.data.totalMs, e.data.multipliers.method);
 */
import type { LargeCaseRequest } from './large-case';
import { runLargeCase } from './large-case';

const scope = self as unknown as { onmessage: ((e: MessageEvent<LargeCaseRequest>) => void) | null; postMessage(m: unknown): void };

scope.onmessage = (e) => {
  if (e.data?.type !== 'large-case') return;
  try {
    scope.postMessage(runLargeCase(e.data));
  } catch (err) {
    scope.postMessage({ type: 'large-case-error', message: err instanceof Error ? err.message : String(err) });
  }
};
