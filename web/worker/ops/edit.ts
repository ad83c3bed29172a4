/**
 * Editing the table in the worker: sectors merged into groups with a concordance (engine/
 * aggregate.ts, the same code as the command line's `aggregate`), and a concordance file read
 * as `aggregate --concordance` reads it (src/io/concordance.ts: a sheet of code, group and
 * optional label, or JSON).
 */
import { aggregate } from '../../../engine/aggregate';
import type { Concordance } from '../../../engine/aggregate';
import { toPlain } from '../../../engine/table';
import type { PlainTable } from '../../../engine/index';
import { readConcordanceGrid, readConcordanceJson, readGrid } from '../../../src/io/index';
import type { ConcordanceRead } from '../../../src/io/concordance';
import type { Handler } from '../context';
import { current } from './session';

export const editOps: Record<string, Handler> = {
  /** The current table with its sectors merged by the concordance (codes not named stay as they are). */
  'table-aggregate': (args: { concordance: Concordance }): { table: PlainTable } => {
    const t = current().table;
    const c = args.concordance;
    const from = [...c.from];
    const to = [...c.to];
    for (const code of t.sectors.codes) if (!from.includes(code)) (from.push(code), to.push(code));
    const groups = c.groups ? { codes: [...c.groups.codes], labels: [...c.groups.labels] } : undefined;
    if (groups)
      for (const [i, code] of t.sectors.codes.entries())
        if (!c.from.includes(code) && !groups.codes.includes(code)) (groups.codes.push(code), groups.labels.push(t.sectors.labels[i]!));
    return { table: toPlain(aggregate(t, { from, to, ...(groups ? { groups } : {}) })) };
  },

  /** A concordance file, read as the command line's `aggregate --concordance` reads it. */
  'concordance-read': async (args: { name: string; bytes: ArrayBuffer; sheet?: string }): Promise<ConcordanceRead> => {
    const bytes = new Uint8Array(args.bytes);
    const text = new TextDecoder('utf-8').decode(bytes.subarray(0, 64));
    if (/^\s*[{[]/.test(text)) return readConcordanceJson(new TextDecoder('utf-8').decode(bytes), args.name);
    return readConcordanceGrid((await readGrid(bytes, { file: args.name, ...(args.sheet ? { sheet: args.sheet } : {}) })).grid);
  },
};
