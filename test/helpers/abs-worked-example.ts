/**
 * The ABS worked example (Australian Bureau of Statistics, Information Paper: Australian National
 * Accounts: Introduction to Input-Output Multipliers, cat. no. 5246.0 (1995), Tables 1, 3 and 5,
 * as transcribed in ../shared/reference/abs-5246-worked-example/) read into a table with its
 * primary-input rows classed as the paper describes, and its printed Table 5. Shared by the
 * reference test and the workbench's browser test. Absent data skips (fails under CI=true).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { InputClass, PlainTable } from '../../engine/table';
import { makeTable } from '../../engine/table';
import { REFERENCE_DIR } from './reference';

export const ABS_DIR = join(REFERENCE_DIR, 'abs-5246-worked-example');
const WHERE = 'published by the Australian Bureau of Statistics (abs.gov.au, cat. no. 5246.0, 1995); set RIPPLEWISE_REFERENCE to a folder holding abs-5246-worked-example/';
export function absAvailable(): boolean {
  const ok = existsSync(join(ABS_DIR, 'flows-1989-90.csv'));
  if (!ok) {
    if (process.env.CI === 'true') throw new Error(`reference data missing under CI: ${ABS_DIR} (${WHERE})`);
    console.warn(`skipping the ABS worked-example tests: ${ABS_DIR} not found; the data is ${WHERE}`);
  }
  return ok;
}

/** A plain CSV reader for these hand-transcribed files (quoted fields without embedded quotes). */
function csv(file: string): string[][] {
  return readFileSync(join(ABS_DIR, file), 'utf8')
    .split(/\r?\n/)
    .filter((l) => l.trim())
    .map((l) => (l.match(/("[^"]*"|[^,]*)(,|$)/g) ?? []).map((f) => f.replace(/,$/, '').replace(/^"|"$/g, '')));
}

const CLASSES: Record<string, InputClass> = { WSS: 'compensation', GOS: 'operating-surplus', CTX: 'product-taxes', ITX: 'production-taxes', SFB: 'final-buyers', CMI: 'imports', DCM: 'imports', CPI: 'imports', DCP: 'imports' };

export function loadAbs(): { plain: PlainTable; table: ReturnType<typeof makeTable>; published: AbsPublished[] } {
  const rows = csv('flows-1989-90.csv');
  const head = rows[0]!;
  const n = 7;
  const sectors = rows.slice(1, 1 + n);
  const va = rows.filter((r) => r[0]! in CLASSES);
  const out = rows.find((r) => r[0] === 'OUT')!;
  const fd = ['FCE', 'GFCE', 'STK', 'EXP'].map((c) => head.indexOf(c));
  const emp = new Map(csv('employment-1989-90.csv').slice(1).map((r) => [r[0]!, Number(r[1])]));
  const plain: PlainTable = {
    sectors: { codes: sectors.map((r) => r[0]!), labels: sectors.map((r) => r[1]!) },
    Z: sectors.map((r) => r.slice(2, 2 + n).map(Number)),
    finalDemand: { codes: ['FCE', 'GFCE', 'STK', 'EXP'], values: sectors.map((r) => fd.map((k) => Number(r[k]))) },
    valueAdded: { codes: va.map((r) => r[0]!), labels: va.map((r) => r[1]!), classes: va.map((r) => CLASSES[r[0]!]!), values: va.map((r) => r.slice(2, 2 + n).map(Number)) },
    x: out.slice(2, 2 + n).map(Number),
    satellites: [{ code: 'EMP', label: 'Employed persons', unit: 'persons (FTE)', values: sectors.map((r) => emp.get(r[0]!)!) }],
    meta: { title: 'Australia 1989-90 (ABS 5246.0 worked example)', currency: 'AUD', scale: 1e6, scaleLabel: 'millions', year: 1990 },
  };
  const published: AbsPublished[] = csv('published-multipliers.csv')
    .slice(1)
    .map((r) => ({ code: r[0]!, first: Number(r[2]), support: Number(r[3]), simple: Number(r[4]), incomeInitial: Number(r[5]), incomeSimple: Number(r[6]), empInitial: Number(r[7]), empSimple: Number(r[8]) }));
  return { plain, table: makeTable(plain), published };
}

// Half a unit in the 4th decimal, with a little room for the transcription's own rounding (README: within 8e-5).

export interface AbsPublished {
  code: string;
  first: number;
  support: number;
  simple: number;
  incomeInitial: number;
  incomeSimple: number;
  empInitial: number;
  empSimple: number;
}
