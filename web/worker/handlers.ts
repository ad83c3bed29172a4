/**
 * The operations the worker offers. The worker holds one session: the current table and the
 * model built from it (factored once, reused by every question until the table changes).
 */
import { LeontiefModel, checks, coefficients, makeTable } from '../../engine/index';
import type { Finding, PlainTable, Table } from '../../engine/index';
import type { Handler } from './context';

interface Session {
  table: Table;
  findings: Finding[];
  model?: LeontiefModel;
}

let session: Session | undefined;

function current(): Session {
  if (!session) throw Object.assign(new Error('no table is open yet: open a file or the demo first'), { name: 'InputError', code: 'no-table' });
  return session;
}

function model(s: Session): LeontiefModel {
  if (!s.model) s.model = LeontiefModel.fromTable(s.table);
  return s.model;
}

export const handlers: Record<string, Handler> = {
  /** Make a plain table the current one; returns its findings. */
  'set-table': (args: { table: PlainTable }, ctx) => {
    ctx.progress(0, 'checking the table');
    const table = makeTable(args.table);
    const findings = checks(table);
    session = { table, findings };
    ctx.progress(1);
    return { findings, n: table.sectors.codes.length };
  },

  /** Output multipliers (column sums of L) by one transposed solve. */
  'output-multipliers': () => {
    const s = current();
    const om = model(s).outputMultipliers();
    return { codes: s.table.sectors.codes, values: Array.from(om) };
  },

  /** The technical coefficients A, for the heat map (the buffer is transferred, not copied). */
  coefficients: (_args, ctx) => {
    const s = current();
    const A = s.model ? s.model.A : coefficients(s.table);
    const data = A.data.slice();
    ctx.transfer(data.buffer);
    return { rows: A.rows, cols: A.cols, data };
  },
};
