/** Operations on the current table itself. */
import { coefficients, LeontiefModel, makeTable, moneyUnit, multipliers } from '../../../engine/index';
import type { PlainTable } from '../../../engine/index';
import type { Handler } from '../context';
import { current, openModel, setTable } from './session';
import { analysisFor, analysisModels } from './models';
import type { HouseholdChoice } from './models';

/** One table's multipliers of every measure, for a comparison (plain arrays: small, copied). */
export interface CompareSide {
  codes: string[];
  labels: string[];
  moneyUnit: string;
  /** Whether Type II and total multipliers exist, and if not why. */
  household: { used: boolean; problem?: string };
  measures: { code: string; label: string; unit: string; simple: number[]; typeI: number[]; total?: number[]; typeII?: number[] }[];
}

function side(a: ReturnType<typeof analysisModels>): CompareSide {
  const t = a.models.table;
  const list = multipliers(a.models, a.measures);
  const arr = (v: Float64Array | undefined) => (v ? Array.from(v) : undefined);
  return {
    codes: [...t.sectors.codes],
    labels: [...t.sectors.labels],
    moneyUnit: moneyUnit(t.meta),
    household: a.household.problem ? { used: a.household.used, problem: a.household.problem } : { used: a.household.used },
    measures: list.map((m, k) => ({ code: a.measures[k]!.code, label: a.measures[k]!.label, unit: m.unit, simple: Array.from(m.simple), typeI: Array.from(m.typeI), total: arr(m.total), typeII: arr(m.typeII) })),
  };
}

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

  /**
   * Multipliers of every measure (simple, Type I and, with a household closure, total and Type II)
   * of the current table and of another one (another project's), each with its own household
   * choice, without changing the current table.
   */
  'compare-all': (args: { other: PlainTable; household?: HouseholdChoice; otherHousehold?: HouseholdChoice }) => {
    const other = makeTable(args.other);
    return { current: side(analysisModels(args.household ?? 'guess')), other: side(analysisFor(other, args.otherHousehold ?? 'guess', LeontiefModel.fromTable(other))) };
  },

  /** The technical coefficients A, for the heat map (the buffer is transferred, not copied). */
  coefficients: (_args, ctx) => {
    const s = current();
    const A = coefficients(s.table);
    ctx.transfer(A.data.buffer as ArrayBuffer);
    return { rows: A.rows, cols: A.cols, data: A.data };
  },
};
