/**
 * Where the published reference data lives, and a small, independent reader of the agency's
 * long text files for the engine's own tests (the product's readers live in src/io and are
 * tested separately).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

/** The folder of shared reference data: $RIPPLEWISE_REFERENCE, or ../shared/reference from the repo root. */
export const REFERENCE_DIR = process.env.RIPPLEWISE_REFERENCE
  ? resolve(process.env.RIPPLEWISE_REFERENCE)
  : resolve(import.meta.dirname, '../../../shared/reference');

export const BEA_DIR = join(REFERENCE_DIR, 'us-bea-1997-summary');

export const BEA_SOURCE =
  'U.S. Bureau of Economic Analysis, Benchmark Input-Output Accounts of the United States, 1997, summary tables after redefinitions';

export const BEA_WHERE =
  'published by the U.S. Bureau of Economic Analysis (bea.gov, Industry Economic Accounts, benchmark input-output accounts 1997); set RIPPLEWISE_REFERENCE to a folder holding us-bea-1997-summary/';

/**
 * Whether the BEA files are present. Absent on a user's own clone: the tests skip with a message
 * saying where the agency publishes the data. Under CI=true their absence is a failure.
 */
export function beaAvailable(): boolean {
  const ok = existsSync(join(BEA_DIR, 'make.txt'));
  if (!ok) {
    if (process.env.CI === 'true') {
      throw new Error(`reference data missing under CI: ${BEA_DIR} (${BEA_WHERE})`);
    }
    console.warn(`skipping reference tests: ${BEA_DIR} not found; the data is ${BEA_WHERE}`);
  }
  return ok;
}

export interface Triplet {
  row: string;
  col: string;
  value: number;
}

/** Read row code, column code and the value in field `valueField` (1-based) of a comma-separated long file. */
export function readTriplets(file: string, valueField: number): Triplet[] {
  const text = readFileSync(join(BEA_DIR, file), 'utf8');
  const out: Triplet[] = [];
  for (const line of text.split(/\r?\n/)) {
    if (!line.trim()) continue;
    const f = line.split(',').map((s) => s.trim().replace(/^"|"$/g, ''));
    out.push({ row: f[0]!, col: f[1]!, value: Number(f[valueField - 1]) });
  }
  return out;
}

/** A dense matrix from triplets over given row and column codes (missing cells are zero). */
export function dense(t: Triplet[], rows: string[], cols: string[]): { rows: number; cols: number; data: Float64Array } {
  const ri = new Map(rows.map((c, i) => [c, i]));
  const ci = new Map(cols.map((c, i) => [c, i]));
  const data = new Float64Array(rows.length * cols.length);
  for (const { row, col, value } of t) {
    const i = ri.get(row);
    const j = ci.get(col);
    if (i === undefined || j === undefined) continue;
    data[i * cols.length + j] += value;
  }
  return { rows: rows.length, cols: cols.length, data };
}

export function uniq(codes: string[]): string[] {
  return [...new Set(codes)];
}
