/** The Node worker of a Monte Carlo run (see montecarlo-protocol.ts). */
import { parentPort } from 'node:worker_threads';
import type { ToWorker } from './montecarlo-protocol';
import { createWorkerHandler } from './montecarlo-protocol';

if (!parentPort) throw new Error('montecarlo-node-worker must run in a worker thread');
const port = parentPort;
const handle = createWorkerHandler((message, transfer) => port.postMessage(message, transfer));
port.on('message', (m: ToWorker) => handle(m));
