/** Operations on the current table itself. */
import { coefficients, LeontiefModel, makeTable } from '../../../engine/index';
import type { PlainTable } from '../../../engine/index';
import type { Handler } from '../context';
import { current, openModel, setTable } from './session';

export const tableOps: Record<string, Handler> = {
  /** Make a plain table the current one; returns its findings. */
  'set-table': (args: { table: PlainTable }, ctx) => {
    ctx.progress(0, 'checking the table');
    const s = setTable(args.table);
    ctx.progress(1);
    return { findings: s.findings, n: s.table.sectors.codes.length };
  },

  /** Output multipliers (column sums of L) by one transposed solve. */
  'output-multipliers': () => {
    const s = current();
    const om = openModel().outputMultipliers();
    return { codes: s.table.sectors.codes, values: Array.from(om) };
  },

  /** The Leontief inverse L = (I − A)⁻¹ of the open model (a copy, transferred; the model keeps its own). */
  'leontief-inverse': (_args, ctx) => {
    const L = openModel().inverse();
    const data = Float64Array.from(L.data);
    ctx.transfer(data.buffer as ArrayBuffer);
    return { rows: L.rows, cols: L.cols, data };
  },

  /**
   * Simple output multipliers (column sums of L) of the current table and of another one given
   * (another project's), without changing the current table: two projects side by side.
   */
  'compare-multipliers': (args: { other: PlainTable }) => {
    const s = current();
    const other = makeTable(args.other);
    const om = (m: LeontiefModel) => Array.from(m.outputMultipliers());
    return {
      current: { codes: [...s.table.sectors.codes], labels: [...s.table.sectors.labels], values: om(openModel()) },
      other: { codes: [...other.sectors.codes], labels: [...other.sectors.labels], values: om(LeontiefModel.fromTable(other)) },
    };
  },

  /** The technical coefficients A, for the heat map (the buffer is transferred, not copied). */
  coefficients: (_args, ctx) => {
    const s = current();
    const A = coefficients(s.table);
    ctx.transfer(A.data.buffer as ArrayBuffer);
    return { rows: A.rows, cols: A.cols, data: A.data };
  },
};
