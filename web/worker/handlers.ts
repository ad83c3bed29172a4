/**
 * Every operation the worker offers, gathered from the files in ./ops (one file per area, so
 * that areas grow independently). Names must not clash; a clash fails at start-up.
 */
import type { Handler } from './context';
import { tableOps } from './ops/table';
import { analysisOps } from './ops/analyses';
import { sensitivityOps } from './ops/sensitivity';
import { fileOps } from './ops/files';
import { reportOps } from './ops/report';
import { editOps } from './ops/edit';
import { regionalOps } from './ops/regional';

const groups: Record<string, Handler>[] = [
  tableOps,
  analysisOps,
  sensitivityOps,
  fileOps,
  reportOps,
  editOps,
  regionalOps,
];

export const handlers: Record<string, Handler> = {};
for (const g of groups) {
  for (const [name, h] of Object.entries(g)) {
    if (handlers[name]) throw new Error(`two worker operations are named '${name}'`);
    handlers[name] = h;
  }
}
