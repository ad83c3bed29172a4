// Starts a worker thread on a TypeScript entry: registers tsx's loader in this thread first
// (a worker does not inherit the parent's loader, and `execArgv: ['--import', 'tsx']` does not
// reach the entry module on Node 20), then imports the entry given in workerData.entry.
// A compiled .js entry is imported as it is.
import { workerData } from 'node:worker_threads';

const entry = workerData && workerData.entry;
if (typeof entry !== 'string') throw new Error('worker-boot needs workerData.entry, the URL of the worker module');
if (/\.[cm]?ts$/.test(entry)) {
  const { register } = await import('tsx/esm/api');
  register();
}
await import(entry);
