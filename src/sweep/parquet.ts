/**
 * Sweep results as Parquet: one row per unit × sector × measure × effect, with the value and its
 * unit. Written with hyparquet-writer (pure JavaScript, no binary), read back with hyparquet (its
 * reader). test/sweep/duckdb.test.ts checks that DuckDB reads the files and gets the same sums.
 *
 * Columns (every one required, no nulls, but delta):
 *   work_unit INT32   the unit's number in the plan's expansion
 *   table     STRING  the table's name in the plan
 *   scenario  STRING  the scenario's name
 *   household STRING  'off', 'table' or the closure share
 *   cv        DOUBLE  coefficient of variation of the coefficients (0: the table's own)
 *   delta     DOUBLE  the FLQ or AFLQ δ of a regionalised table; null (optional column) otherwise
 *   draw      INT32   the draw number (0 when cv is 0)
 *   sector    STRING  the sector's code
 *   measure   STRING  the measure's code (output, value-added, a satellite row…)
 *   effect    STRING  direct, indirect, induced or total
 *   value     DOUBLE
 *   unit      STRING  the unit of the value (the measure's unit)
 *
 * Files are written whole to a temporary name in the same folder and then renamed, so a file that
 * exists is complete. Nothing here depends on the clock: the same rows give the same bytes.
 */
import { closeSync, mkdirSync, openSync, readFileSync, renameSync, unlinkSync, writeSync, fsyncSync } from 'node:fs';
import { dirname } from 'node:path';
import { ByteWriter, ParquetWriter } from 'hyparquet-writer';
import type { Writer } from 'hyparquet-writer';
import { parquetMetadata, parquetRead } from 'hyparquet';

export const TEXT_COLUMNS = ['table', 'scenario', 'household', 'sector', 'measure', 'effect', 'unit'] as const;
export const COLUMN_ORDER = ['work_unit', 'table', 'scenario', 'household', 'cv', 'delta', 'draw', 'sector', 'measure', 'effect', 'value', 'unit'] as const;

type TextColumn = (typeof TEXT_COLUMNS)[number];

/** Rows gathered column by column before they are written as one row group. */
export class RowBuffer {
  work_unit: number[] = [];
  cv: number[] = [];
  delta: (number | null)[] = [];
  draw: number[] = [];
  value: number[] = [];
  text: Record<TextColumn, string[]> = { table: [], scenario: [], household: [], sector: [], measure: [], effect: [], unit: [] };

  get length(): number {
    return this.value.length;
  }

  /** One row, by position in COLUMN_ORDER (no object per row: a shard writes millions). */
  push(workUnit: number, table: string, scenario: string, household: string, cv: number, delta: number | null, draw: number, sector: string, measure: string, effect: string, value: number, unit: string): void {
    this.work_unit.push(workUnit);
    this.cv.push(cv);
    this.delta.push(delta);
    this.draw.push(draw);
    this.value.push(value);
    const t = this.text;
    t.table.push(table);
    t.scenario.push(scenario);
    t.household.push(household);
    t.sector.push(sector);
    t.measure.push(measure);
    t.effect.push(effect);
    t.unit.push(unit);
  }

  /** Append rows [from, to) of another buffer. */
  append(b: RowBuffer, from = 0, to = b.length): void {
    for (let i = from; i < to; i++) {
      this.work_unit.push(b.work_unit[i]!);
      this.cv.push(b.cv[i]!);
      this.delta.push(b.delta[i] ?? null);
      this.draw.push(b.draw[i]!);
      this.value.push(b.value[i]!);
      for (const k of TEXT_COLUMNS) this.text[k].push(b.text[k][i]!);
    }
  }
}

const SCHEMA = [
  { name: 'root', num_children: COLUMN_ORDER.length },
  ...COLUMN_ORDER.map((name) =>
    name === 'work_unit' || name === 'draw'
      ? { name, type: 'INT32' as const, repetition_type: 'REQUIRED' as const }
      : name === 'cv' || name === 'value'
        ? { name, type: 'DOUBLE' as const, repetition_type: 'REQUIRED' as const }
        : name === 'delta'
          ? { name, type: 'DOUBLE' as const, repetition_type: 'OPTIONAL' as const }
        : { name, type: 'BYTE_ARRAY' as const, converted_type: 'UTF8' as const, repetition_type: 'REQUIRED' as const },
  ),
];

/** A writer that appends to an open file descriptor, flushing every megabyte. */
function fdWriter(fd: number): Writer {
  const w = new ByteWriter();
  const flush = () => {
    if (w.index) writeSync(fd, new Uint8Array(w.buffer, 0, w.index));
    w.index = 0;
  };
  const grow = w.ensure.bind(w);
  w.ensure = (size: number) => {
    if (w.index > 1_000_000) flush();
    grow(size);
  };
  w.finish = () => {
    flush();
  };
  return w;
}

/**
 * A Parquet file written one row group at a time to `path` (through a temporary name, renamed
 * on `close`). `meta` goes into the file's key-value metadata.
 */
export class ResultsFile {
  private readonly tmp: string;
  private readonly fd: number;
  private readonly writer: ParquetWriter;
  rows = 0;
  groups = 0;

  constructor(
    readonly path: string,
    meta: Record<string, string>,
    createdBy: string,
  ) {
    mkdirSync(dirname(path), { recursive: true });
    this.tmp = `${path}.tmp-${process.pid}`;
    this.fd = openSync(this.tmp, 'w');
    this.writer = new ParquetWriter({
      writer: fdWriter(this.fd),
      schema: SCHEMA,
      kvMetadata: Object.entries(meta).map(([key, value]) => ({ key, value })),
      createdBy,
    });
  }

  /** Write the buffer as one row group (nothing for an empty buffer). */
  writeGroup(b: RowBuffer): void {
    const n = b.length;
    if (!n) return;
    const columnData = COLUMN_ORDER.map((name) => {
      if (name === 'work_unit' || name === 'draw') return { name, data: Int32Array.from(b[name]) };
      if (name === 'cv' || name === 'value') return { name, data: Float64Array.from(b[name]) };
      if (name === 'delta') return { name, data: b.delta };
      return { name, data: b.text[name] };
    });
    void this.writer.write({ columnData, rowGroupSize: n });
    this.rows += n;
    this.groups++;
  }

  /** Finish the file and put it in place. */
  close(): void {
    void this.writer.finish();
    fsyncSync(this.fd);
    closeSync(this.fd);
    renameSync(this.tmp, this.path);
  }

  /** Give up: remove the temporary file. */
  abandon(): void {
    try {
      closeSync(this.fd);
    } catch {
      /* already closed */
    }
    try {
      unlinkSync(this.tmp);
    } catch {
      /* already gone */
    }
  }
}

function asyncBufferOf(bytes: Uint8Array) {
  const ab = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  return { byteLength: ab.byteLength, slice: (start: number, end?: number) => ab.slice(start, end) };
}

/** The key-value metadata of a results file. */
export function resultsMeta(path: string): Record<string, string> {
  const bytes = readFileSync(path);
  const meta = parquetMetadata(asyncBufferOf(bytes).slice(0));
  const out: Record<string, string> = {};
  for (const kv of meta.key_value_metadata ?? []) out[kv.key] = kv.value ?? '';
  return out;
}

/** Read a results file one row group at a time, each as a row buffer. */
export async function* readResults(path: string): AsyncGenerator<RowBuffer> {
  const file = asyncBufferOf(readFileSync(path));
  const metadata = parquetMetadata(file.slice(0));
  let start = 0;
  for (const g of metadata.row_groups) {
    const n = Number(g.num_rows);
    const end = start + n;
    const cols: Record<string, unknown[]> = {};
    for (const name of COLUMN_ORDER) cols[name] = new Array(n);
    await parquetRead({
      file,
      metadata,
      columns: [...COLUMN_ORDER],
      rowStart: start,
      rowEnd: end,
      onChunk: (c) => {
        const into = cols[c.columnName]!;
        const from = Math.max(c.rowStart, start);
        const to = Math.min(c.rowEnd, end);
        for (let r = from; r < to; r++) into[r - start] = c.columnData[r - c.rowStart];
      },
    });
    const b = new RowBuffer();
    b.work_unit = cols.work_unit as number[];
    b.cv = cols.cv as number[];
    b.delta = (cols.delta as (number | null | undefined)[]).map((v) => (v === undefined || v === null ? null : Number(v)));
    b.draw = cols.draw as number[];
    b.value = cols.value as number[];
    for (const k of TEXT_COLUMNS) b.text[k] = cols[k] as string[];
    yield b;
    start = end;
  }
}
