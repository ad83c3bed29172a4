/**
 * Layout fixtures for codes that differ between rows and columns by an affix, and for code and
 * label in one cell: rows `DOM_01` against columns `D01`, rows `01d` against columns `01`, cells
 * such as `01: Agriculture` or `D01 - Agriculture`, and a domestic block followed by an imported
 * block of the same products (`DOM_01..`, `IMP_01..`, the labels repeated). The numbers are
 * invented (a small balanced table from a seed); only the layout is under test. The layouts are
 * the classes of layout the issue names (common practice in inter-country and national tables
 * that separate domestic and imported use).
 */
import type { Cell } from '../../src/io/grid';

export interface AffixTable {
  /** Sector codes as the table should read them (the common stem). */
  codes: string[];
  labels: string[];
  /** Intermediate use of domestic products, n × n. */
  Z: number[][];
  /** Imported products used by each industry, n × n (row i: product i). */
  M: number[][];
  fdCodes: string[];
  fdLabels: string[];
  /** Final demand for domestic products, n × k. */
  F: number[][];
  vaCodes: string[];
  vaLabels: string[];
  V: number[][];
  x: number[];
}

const LABELS = ['Agriculture', 'Mining and quarrying', 'Manufacturing', 'Electricity and gas', 'Construction', 'Trade', 'Transport', 'Finance', 'Public administration'];

/** A small deterministic generator (mulberry32). */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A balanced invented table of n sectors (whole numbers), codes '01', '02'... or letters. */
export function affixTable(n: number, seed: number, codeStyle: 'digits' | 'letters' = 'digits'): AffixTable {
  const r = rng(seed);
  const int = (lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));
  const codes = Array.from({ length: n }, (_, i) => (codeStyle === 'digits' ? String(i + 1).padStart(2, '0') : String.fromCharCode(65 + i)));
  const labels = codes.map((_, i) => LABELS[i % LABELS.length]! + (i >= LABELS.length ? ` ${Math.floor(i / LABELS.length) + 1}` : ''));
  const Z = codes.map(() => codes.map(() => int(0, 40)));
  const M = codes.map(() => codes.map(() => int(0, 9)));
  const fdCodes = ['HH', 'GOV', 'EXP'];
  const fdLabels = ['Household final consumption', 'Government final consumption', 'Exports'];
  const F = codes.map(() => fdCodes.map(() => int(20, 120)));
  const x = codes.map((_, i) => Z[i]!.reduce((a, v) => a + v, 0) + F[i]!.reduce((a, v) => a + v, 0));
  // Value added closes each column: compensation takes a part, operating surplus the rest.
  const vaCodes = ['CoE', 'GOS'];
  const vaLabels = ['Compensation of employees', 'Gross operating surplus'];
  const inputs = codes.map((_, j) => Z.reduce((a, row) => a + row[j]!, 0) + M.reduce((a, row) => a + row[j]!, 0));
  // Make every column's output exceed its inputs: raise final demand of the row where needed.
  for (let j = 0; j < n; j++) {
    if (x[j]! <= inputs[j]! + 10) {
      const add = inputs[j]! + 10 + int(0, 30) - x[j]!;
      F[j]![0]! += add;
      x[j]! += add;
    }
  }
  const V = [codes.map((_, j) => Math.floor((x[j]! - inputs[j]!) / 2)), codes.map(() => 0)];
  for (let j = 0; j < n; j++) V[1]![j] = x[j]! - inputs[j]! - V[0]![j]!;
  return { codes, labels, Z, M, fdCodes, fdLabels, F, vaCodes, vaLabels, V, x };
}

export type AffixClass =
  /** Rows `DOM_01`, columns `D01`, codes and labels in separate cells. */
  | 'prefix'
  /** Rows `01d`, columns `01`: a suffix on the rows only. */
  | 'suffix'
  /** Rows and columns `01: Agriculture` (code and label in one cell, same codes). */
  | 'colon-cells'
  /** Rows `DOM_01 - Agriculture`, columns `D01 - Agriculture`: a prefix and code with label in one cell. */
  | 'prefix-dash-cells'
  /** Rows `DOM_01..` then `IMP_01..` (labels repeated), columns `D01..`: domestic and imported use. */
  | 'dom-imp'
  /** As 'dom-imp' with code and label in one cell ('DOM_01: Agriculture', 'IMP_01: Agriculture', 'D01: Agriculture'). */
  | 'dom-imp-colon';

export const AFFIX_CLASSES: AffixClass[] = ['prefix', 'suffix', 'colon-cells', 'prefix-dash-cells', 'dom-imp', 'dom-imp-colon'];

/** The cells of a table in one of the affix layouts, with a title row, an output row and column. */
export function affixLayout(t: AffixTable, cls: AffixClass): Cell[][] {
  const n = t.codes.length;
  const imports = cls === 'dom-imp' || cls === 'dom-imp-colon';
  const joined = cls === 'colon-cells' || cls === 'prefix-dash-cells' || cls === 'dom-imp-colon';
  const sep = cls === 'prefix-dash-cells' ? ' - ' : ': ';
  const rowCode = (c: string) => (cls === 'suffix' ? `${c}d` : cls === 'colon-cells' ? c : `DOM_${c}`);
  const colCode = (c: string) => (cls === 'suffix' || cls === 'colon-cells' ? c : `D${c}`);
  const rows: Cell[][] = [];
  rows.push(['Input-output table of domestic and imported use, invented figures for a layout test, millions']);
  rows.push([]);
  const lead = joined ? 1 : 2;
  const pad = (cells: Cell[]) => [...cells, ...Array(Math.max(0, lead - cells.length)).fill(null)];
  const fdTotal = 'Total output';
  if (joined) {
    rows.push(['', ...t.codes.map((c, j) => `${colCode(c)}${sep}${t.labels[j]}`), ...t.fdCodes.map((c, k) => `${c}${sep}${t.fdLabels[k]}`), `OUT${sep}${fdTotal}`]);
  } else {
    rows.push(['Code', 'Description', ...t.codes.map(colCode), ...t.fdCodes, 'OUT']);
    rows.push(['', '', ...t.labels, ...t.fdLabels, fdTotal]);
  }
  const line = (code: string, label: string, values: number[]): Cell[] => (joined ? [`${code}${sep}${label}`, ...values] : [code, label, ...values]);
  for (let i = 0; i < n; i++) rows.push(line(rowCode(t.codes[i]!), t.labels[i]!, [...t.Z[i]!, ...t.F[i]!, t.x[i]!]));
  if (imports) {
    // Imported products: to industries, and (invented) to final demand; no output of their own here.
    for (let i = 0; i < n; i++) rows.push(line(`IMP_${t.codes[i]}`, t.labels[i]!, [...t.M[i]!, ...t.fdCodes.map((_, k) => 3 + ((i + k) % 5))]));
  }
  for (let a = 0; a < t.vaCodes.length; a++) rows.push(line(t.vaCodes[a]!, t.vaLabels[a]!, [...t.V[a]!]));
  if (!imports) {
    // Without an imported block, imports of the industries are one row.
    rows.push(line('IMP', 'Imports', t.codes.map((_, j) => t.M.reduce((s, row) => s + row[j]!, 0))));
  }
  rows.push(line('OUT', 'Total output', [...t.x]));
  return rows.map((r) => (r.length ? pad(r) : r));
}

/** Imports by industry: the column sums of the imported block. */
export function importsOf(t: AffixTable): number[] {
  return t.codes.map((_, j) => t.M.reduce((s, row) => s + row[j]!, 0));
}
