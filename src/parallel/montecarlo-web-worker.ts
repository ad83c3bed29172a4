/** The Web Worker of a Monte Carlo run (see montecarlo-protocol.ts). */
import type { FromWorker, ToWorker } from './montecarlo-protocol';
import { createWorkerHandler } from './montecarlo-protocol';

interface WorkerScope {
  postMessage(message: FromWorker, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<ToWorker>) => void) | null;
}

const scope = self as unknown as WorkerScope;
const handle = createWorkerHandler((message, transfer) => scope.postMessage(message, transfer));
scope.onmessage = (event) => handle(event.data);
