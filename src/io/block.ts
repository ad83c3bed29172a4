/**
 * A block: the rows and columns of a table with their codes and labels, and the cells between
 * them, whether it came from a wide sheet or a long file. Classification and assembly (which
 * rows are sectors, value added, totals...) work on blocks, so that wide and long files are read
 * the same way.
 */
import type { Where } from '../../engine/errors';
import { EMPTY, type Grid, NUMBER } from './grid';

export interface Entry {
  code: string;
  label: string;
  /** Index into a row's value array (columns) or into the block's rows (rows). */
  pos: number;
  /** 1-based sheet row or column (wide), or the code's position (long). */
  at: number;
  /** A unit for the row, from a unit column. */
  unit?: string;
  /** The bracketed end of the row's label, such as 'jobs' in 'Employment (jobs)': the unit if the row is a satellite. */
  unitInLabel?: string;
  /** A role written in the sheet itself (a column or row headed 'role'). */
  role?: string;
  /** The group header over a column ('Final consumption expenditure' over 'Households'). */
  group?: string;
  /** Where the code sits, for messages. */
  where?: Where;
  /** A rule's reason for the code or role it gave the line (rule affix-codes), added to the mapping's why. */
  why?: string;
}

export interface Block {
  file: string;
  sheet?: string;
  shape: 'wide' | 'long';
  rows: Entry[];
  cols: Entry[];
  /** The values of row entry i, indexed by a column entry's `pos`; NaN where empty or text. */
  values(i: number): Float64Array;
  /** EMPTY, NUMBER or TEXT of the cell at row entry i, column entry j. */
  kind(i: number, j: number): number;
  text(i: number, j: number): string;
  /** Where the cell is (A1 cell with row and column labels for sheets; codes for long files). */
  where(i: number, j: number): Where;
  /** The number of decimals the values seem to be rounded to (for total checks), or undefined. */
  decimals?: number;
}

function labelOf(e: Entry): string {
  return e.label && e.label !== e.code ? `${e.code} ${e.label}` : e.code;
}

/** A block over a grid: rows and columns are grid positions. */
export class GridBlock implements Block {
  readonly shape = 'wide' as const;
  readonly file: string;
  readonly sheet?: string;
  private padded = new Map<number, Float64Array>();
  decimals?: number;

  constructor(
    readonly grid: Grid,
    readonly rows: Entry[],
    readonly cols: Entry[],
  ) {
    this.file = grid.file;
    if (grid.sheet !== undefined) this.sheet = grid.sheet;
    this.decimals = sampleDecimals(this);
  }

  values(i: number): Float64Array {
    const r = this.rows[i]!.pos;
    const row = this.grid.rows[r];
    const need = this.grid.colCount;
    if (row && row.values.length >= need) return row.values;
    let p = this.padded.get(r);
    if (!p) {
      p = new Float64Array(need).fill(NaN);
      if (row) p.set(row.values);
      this.padded.set(r, p);
    }
    return p;
  }

  kind(i: number, j: number): number {
    return this.grid.kind(this.rows[i]!.pos, this.cols[j]!.pos);
  }

  text(i: number, j: number): string {
    return this.grid.text(this.rows[i]!.pos, this.cols[j]!.pos);
  }

  where(i: number, j: number): Where {
    const r = this.rows[i]!;
    const c = this.cols[j]!;
    return this.grid.where(r.pos, c.pos, { rowLabel: labelOf(r), columnLabel: labelOf(c), sector: r.code });
  }
}

/** A block over a dense matrix (long files): every cell is a number, missing pairs are zero. */
export class DenseBlock implements Block {
  readonly shape = 'long' as const;
  decimals?: number;
  constructor(
    readonly file: string,
    readonly rows: Entry[],
    readonly cols: Entry[],
    readonly data: Float64Array,
    readonly sheet?: string,
  ) {
    this.decimals = sampleDecimals(this);
  }
  values(i: number): Float64Array {
    const n = this.cols.length;
    const r = this.rows[i]!.pos;
    return this.data.subarray(r * n, (r + 1) * n);
  }
  kind(): number {
    return NUMBER;
  }
  text(i: number, j: number): string {
    return String(this.values(i)[this.cols[j]!.pos]);
  }
  where(i: number, j: number): Where {
    const w: Where = { file: this.file, rowLabel: labelOf(this.rows[i]!), columnLabel: labelOf(this.cols[j]!), sector: this.rows[i]!.code };
    if (this.sheet !== undefined) w.sheet = this.sheet;
    return w;
  }
}

/** The most decimals among a sample of the block's numbers (0 to 9), for rounding tolerances. */
function sampleDecimals(b: Block): number | undefined {
  let best = -1;
  let seen = 0;
  const rs = Math.max(1, Math.floor(b.rows.length / 40));
  const cs = Math.max(1, Math.floor(b.cols.length / 40));
  for (let i = 0; i < b.rows.length; i += rs) {
    const v = b.values(i);
    for (let j = 0; j < b.cols.length; j += cs) {
      const x = v[b.cols[j]!.pos]!;
      if (!Number.isFinite(x) || x === 0) continue;
      seen++;
      let d = 0;
      const ax = Math.abs(x);
      while (d < 9 && Math.abs(ax * 10 ** d - Math.round(ax * 10 ** d)) > 1e-7 * Math.max(1, ax * 10 ** d)) d++;
      if (d > best) best = d;
      if (best >= 9) return 9;
    }
  }
  return seen ? best : undefined;
}

export { EMPTY };
