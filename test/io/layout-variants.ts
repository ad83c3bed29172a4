/**
 * The layout variants of the stress test (layout-stress.test.ts): four small known tables
 * (invented data, balanced by construction) and the sheets that lay them out, as CSV text or as
 * an XLSX workbook, with the table each must read as.
 */
import ExcelJS from 'exceljs';
import type { Table } from '../../engine/table';
import { rng } from '../helpers/random';

// ---------------------------------------------------------------------------------------------
// The known tables (invented).

export interface Named {
  code: string;
  label: string;
}
export interface FdLine extends Named {
  letter: string;
  na: string;
  consumption?: boolean;
  foot?: string;
}
export interface VaLine extends Named {
  letter: string;
  na: string;
  foot?: string;
}
export interface Base {
  name: string;
  sectors: Named[];
  fd: FdLine[];
  va: VaLine[];
  /** In units of 1/divisor: whole numbers, so that every sum is exact. */
  Z: number[][];
  F: number[][];
  V: number[][];
  divisor: 1 | 10;
}

/** Balance a table: x = row sums of Z and F; the last value-added row takes what the others leave. */
function balanced(name: string, sectors: Named[], fd: FdLine[], va: VaLine[], Z: number[][], F: number[][], shares: number[], divisor: 1 | 10): Base {
  const n = sectors.length;
  const x = Z.map((r, i) => r.reduce((a, b) => a + b, 0) + F[i]!.reduce((a, b) => a + b, 0));
  const V: number[][] = va.map(() => new Array(n).fill(0));
  for (let j = 0; j < n; j++) {
    const left = x[j]! - Z.reduce((a, r) => a + r[j]!, 0);
    if (left <= va.length) throw new Error(`table ${name}: column ${j} leaves no value added`);
    let used = 0;
    for (let a = 0; a < va.length - 1; a++) {
      V[a]![j] = Math.round(left * shares[a]!);
      used += V[a]![j]!;
    }
    V[va.length - 1]![j] = left - used;
  }
  return { name, sectors, fd, va, Z, F, V, divisor };
}

/** Whole numbers from a seed, with some zeros. */
function draw(seed: number, rows: number, cols: number, lo: number, hi: number, zeros: number): number[][] {
  const r = rng(seed);
  return Array.from({ length: rows }, () => Array.from({ length: cols }, () => (r() < zeros ? 0 : Math.round(lo + (hi - lo) * r()))));
}

const T3 = balanced(
  't3',
  [
    { code: 'AGR', label: 'Agriculture' },
    { code: 'MAN', label: 'Manufacturing' },
    { code: 'SRV', label: 'Services' },
  ],
  [
    { code: '', label: 'Household consumption', letter: 'F1', na: 'P3_S14', consumption: true },
    { code: '', label: 'Exports', letter: 'F2', na: 'P6', foot: '(a)' },
  ],
  [
    { code: '', label: 'Compensation of employees', letter: 'V1', na: 'D1', foot: '(b)' },
    { code: '', label: 'Operating surplus and mixed income', letter: 'V2', na: 'B2A3G' },
  ],
  [
    [12, 31, 0],
    [18, 64, 27],
    [7, 35, 58],
  ],
  [
    [55, 17],
    [96, 43],
    [121, 19],
  ],
  [0.55],
  1,
);

const T5 = (() => {
  const Z = draw(5, 5, 5, 20, 4200, 0.2);
  const F = draw(55, 5, 6, 300, 9000, 0.1);
  F[2]![4] = -1234; // a fall in inventories
  F[0]![4] = 0;
  return balanced(
    't5',
    [
      { code: 'A01', label: 'Crops and animal production' },
      { code: 'B', label: 'Mining and quarrying' },
      { code: 'C10-12', label: 'Food, beverages and tobacco' },
      { code: 'F', label: 'Construction' },
      { code: 'I', label: 'Accommodation and food services' },
    ],
    [
      { code: '', label: 'Final consumption expenditure by households', letter: 'F1', na: 'P3_S14', consumption: true },
      { code: '', label: 'Final consumption expenditure by NPISH', letter: 'F2', na: 'P3_S15', consumption: true },
      { code: '', label: 'Final consumption expenditure by government', letter: 'F3', na: 'P3_S13', consumption: true },
      { code: '', label: 'Gross fixed capital formation', letter: 'F4', na: 'P51G' },
      { code: '', label: 'Changes in inventories', letter: 'F5', na: 'P52' },
      { code: '', label: 'Exports of goods and services', letter: 'F6', na: 'P6', foot: '(a)' },
    ],
    [
      { code: '', label: 'Compensation of employees', letter: 'V1', na: 'D1', foot: '(b)' },
      { code: '', label: 'Other taxes less subsidies on production', letter: 'V2', na: 'D29X39' },
      { code: '', label: 'Gross operating surplus and mixed income', letter: 'V3', na: 'B2A3G' },
    ],
    Z,
    F,
    [0.56, 0.03],
    10,
  );
})();

const T8 = (() => {
  const Z = draw(8, 8, 8, 100, 90000, 0.15);
  const F = draw(88, 8, 4, 5000, 400000, 0.05);
  F[6]![3] = 1250000; // exports in the millions
  return balanced(
    't8',
    [
      { code: 'A01', label: 'Agriculture' },
      { code: 'D35', label: 'Electricity and gas' },
      { code: 'G46', label: 'Wholesale trade' },
      { code: 'H49', label: 'Land transport' },
      { code: 'T', label: 'Households as employers' },
      { code: 'K64', label: 'Financial services' },
      { code: 'O84', label: 'Government services' },
      { code: 'P85', label: 'Education' },
    ],
    [
      { code: '', label: 'Households', letter: 'F1', na: 'P3_S14', consumption: true },
      { code: '', label: 'General government', letter: 'F2', na: 'P3_S13', consumption: true },
      { code: '', label: 'Gross fixed capital formation', letter: 'F3', na: 'P51G' },
      { code: '', label: 'Exports', letter: 'F4', na: 'P6', foot: '(a)' },
    ],
    [
      { code: '', label: 'Wages and salaries', letter: 'V1', na: 'D1', foot: '(b)' },
      { code: '', label: 'Other net taxes on production', letter: 'V2', na: 'D29X39' },
      { code: '', label: 'Operating surplus, gross', letter: 'V3', na: 'B2A3G' },
    ],
    Z,
    F,
    [0.6, 0.02],
    1,
  );
})();

/** Whole numbers in the thousands, every sum below a million: with one thousands separator, the decimal mark is left undecided. */
const T4 = (() => {
  const Z = draw(4, 4, 4, 150, 6000, 0.1);
  const F = draw(44, 4, 3, 1200, 30000, 0);
  return balanced(
    't4',
    [
      { code: '01', label: 'Farming' },
      { code: '10', label: 'Food industry' },
      { code: '45', label: 'Trade' },
      { code: '90', label: 'Other services' },
    ],
    [
      { code: '', label: 'Private consumption', letter: 'F1', na: 'P3_S14', consumption: true },
      { code: '', label: 'Public consumption', letter: 'F2', na: 'P3_S13', consumption: true },
      { code: '', label: 'Exports', letter: 'F3', na: 'P6', foot: '(a)' },
    ],
    [
      { code: '', label: 'Compensation of employees', letter: 'V1', na: 'D1', foot: '(b)' },
      { code: '', label: 'Gross operating surplus', letter: 'V2', na: 'B2A3G' },
    ],
    Z,
    F,
    [0.58],
    1,
  );
})();

export const BASES = [T3, T4, T5, T8];

// ---------------------------------------------------------------------------------------------
// Variants.

export type Lead = 'code-label' | 'label-code' | 'labels' | 'codes' | 'combined';
export type Style = 'letters' | 'na' | 'none';
export type Format = 'comma' | 'semicolon' | 'tab' | 'xlsx';
export type Numbers = 'plain' | 'thousands' | 'space' | 'nbsp';

export interface Variant {
  base: Base;
  lead: Lead;
  /** With a code row and a label row: which is on top. */
  codesFirst: boolean;
  heading: boolean;
  /** With a code row and a label row: the heading in the lower one instead of the top one. */
  headingLow: boolean;
  units: 'none' | 'lead' | 'across';
  groups: 'none' | 'once' | 'repeat';
  titles: boolean;
  blankRows: boolean;
  blankCol: boolean;
  sections: boolean;
  notes: boolean;
  footnotes: boolean;
  /** Code and label in one cell joined by ' ', ' - ' or ': '. */
  joiner: number;
  /** How a footnote is marked: '(a)', '1)' or '*'. */
  footStyle: number;
  intCol: boolean;
  fdCol: boolean;
  outCol: boolean;
  intRow: boolean;
  outRow: boolean;
  /** Total rows filled under the final-demand columns too. */
  fullRows: boolean;
  gva: 'none' | 'before' | 'after';
  fc: 'none' | 'before' | 'after';
  totalCodes: 'T' | 'na' | 'none';
  fdCodes: Style;
  vaCodes: Style;
  format: Format;
  numbers: Numbers;
  /** XLSX: zero cells left empty. */
  zerosEmpty: boolean;
  /** XLSX: a contents sheet before the table. */
  contents: boolean;
  outLabel: number;
}

export const DEFAULT: Omit<Variant, 'base'> = {
  lead: 'code-label',
  codesFirst: true,
  heading: false,
  headingLow: false,
  units: 'none',
  groups: 'none',
  titles: false,
  blankRows: false,
  blankCol: false,
  sections: false,
  notes: false,
  footnotes: false,
  joiner: 0,
  footStyle: 0,
  intCol: false,
  fdCol: false,
  outCol: true,
  intRow: false,
  outRow: false,
  fullRows: true,
  gva: 'none',
  fc: 'none',
  totalCodes: 'T',
  fdCodes: 'letters',
  vaCodes: 'letters',
  format: 'comma',
  numbers: 'plain',
  zerosEmpty: false,
  contents: false,
  outLabel: 0,
};

/** Make a variant consistent: codes only needs a code on every line; a consumption subtotal needs two parts. */
export function settle(v: Variant): Variant {
  const o = { ...v };
  if (o.lead === 'codes') {
    if (o.fdCodes === 'none') o.fdCodes = 'na';
    if (o.vaCodes === 'none') o.vaCodes = 'letters';
    if (o.totalCodes === 'none') o.totalCodes = 'T';
  }
  if (o.base.fd.filter((f) => f.consumption).length < 2) o.fc = 'none';
  if (o.lead !== 'combined') o.joiner = 0;
  if (!o.footnotes) o.footStyle = 0;
  if (!o.heading) o.headingLow = false;
  if (o.format !== 'xlsx') {
    o.zerosEmpty = false;
    o.contents = false;
  }
  return o;
}

function pickOne<T>(r: () => number, list: readonly T[]): T {
  return list[Math.floor(r() * list.length)]!;
}

/** Hand-picked combinations, each applied to every table. */
export const FIXED: Partial<Variant>[] = [
  {},
  { lead: 'label-code', codesFirst: false, heading: true, format: 'semicolon' },
  { lead: 'labels', fdCodes: 'none', vaCodes: 'none', totalCodes: 'none', intCol: true, fdCol: true, intRow: true, outRow: true },
  { lead: 'codes', fdCodes: 'na', vaCodes: 'na', totalCodes: 'na', intRow: true, outRow: true, gva: 'after', fc: 'after' },
  { lead: 'combined', heading: true, groups: 'once', format: 'xlsx', zerosEmpty: true },
  { lead: 'combined', fdCodes: 'na', vaCodes: 'na', totalCodes: 'na', outRow: true, gva: 'before', fc: 'before', format: 'tab' },
  { heading: true, codesFirst: false, units: 'across', groups: 'repeat', titles: true, notes: true, footnotes: true },
  { heading: true, units: 'lead', groups: 'once', format: 'xlsx', titles: true, sections: true, blankRows: true, contents: true },
  { numbers: 'thousands', format: 'comma', intCol: true, fdCol: true, outRow: true, fullRows: false },
  { numbers: 'thousands', format: 'semicolon', gva: 'after', fc: 'before', totalCodes: 'none' },
  { numbers: 'space', format: 'semicolon', blankCol: true, sections: true, footnotes: true },
  { numbers: 'space', format: 'tab', lead: 'labels', fdCodes: 'none', vaCodes: 'none', outCol: false, outRow: true },
  { outCol: false, outRow: false },
  { lead: 'codes', units: 'across', outCol: false, outRow: true, totalCodes: 'na', fdCodes: 'na', vaCodes: 'letters' },
];

export function randomVariant(seed: number): Variant {
  const r = rng(seed);
  const b = () => r() < 0.5;
  const v: Variant = {
    base: pickOne(r, BASES),
    lead: pickOne(r, ['code-label', 'label-code', 'labels', 'codes', 'combined'] as const),
    codesFirst: b(),
    heading: b(),
    headingLow: r() < 0.3,
    units: pickOne(r, ['none', 'none', 'lead', 'across'] as const),
    groups: pickOne(r, ['none', 'once', 'repeat'] as const),
    titles: b(),
    blankRows: b(),
    blankCol: r() < 0.25,
    sections: b(),
    notes: b(),
    footnotes: b(),
    joiner: r() < 0.6 ? 0 : Math.floor(r() * 3),
    footStyle: Math.floor(r() * 3),
    intCol: b(),
    fdCol: b(),
    outCol: r() < 0.7,
    intRow: b(),
    outRow: b(),
    fullRows: b(),
    gva: pickOne(r, ['none', 'before', 'after'] as const),
    fc: pickOne(r, ['none', 'before', 'after'] as const),
    totalCodes: pickOne(r, ['T', 'na', 'none'] as const),
    fdCodes: pickOne(r, ['letters', 'na', 'none'] as const),
    vaCodes: pickOne(r, ['letters', 'na', 'none'] as const),
    format: pickOne(r, ['comma', 'semicolon', 'tab', 'comma', 'semicolon', 'tab', 'xlsx'] as const),
    numbers: pickOne(r, ['plain', 'thousands', 'thousands', 'space', 'nbsp'] as const),
    zerosEmpty: b(),
    contents: b(),
    outLabel: Math.floor(r() * 4),
  };
  return settle(v);
}

export function describeVariant(v: Variant): string {
  const on = (Object.keys(DEFAULT) as (keyof typeof DEFAULT)[]).filter((k) => v[k] !== DEFAULT[k]).map((k) => `${k}=${String(v[k])}`);
  return `${v.base.name} ${on.join(' ')}`.trim();
}

// ---------------------------------------------------------------------------------------------
// The sheet of a variant: logical cells (numbers as numbers), merges, and the table expected.

export type Cell = string | number | null;

/** A line of the sheet: which base rows (or columns) it adds up; `null` for a blank or heading line. */
interface Line {
  code: string;
  label: string;
  parts: string[] | null;
  /** 'S', 'F', 'V' for data lines, 'T' for totals. */
  kind: 'S' | 'F' | 'V' | 'T' | 'blank' | 'heading';
}

export interface Sheet {
  rows: Cell[][];
  merges: [number, number, number, number][];
  expected: Table;
}

const JOIN = [' ', ' - ', ': '];
const OUT_COL_LABELS = ['Total output', 'Total use', 'Output at basic prices', 'Total'];
const OUT_ROW_LABELS = ['Total output', 'Output at basic prices', 'Total inputs', 'Total'];

export function build(v: Variant): Sheet {
  const B = v.base;
  const n = B.sectors.length;
  const mark = (f: string) => (v.footStyle === 1 ? `${f === '(a)' ? 1 : 2})` : v.footStyle === 2 ? (f === '(a)' ? '*' : '**') : f);
  const foot = (l: { label: string; foot?: string }) => (v.footnotes && l.foot ? `${l.label} ${mark(l.foot)}` : l.label);
  const fdCode = (f: FdLine) => (v.fdCodes === 'letters' ? f.letter : v.fdCodes === 'na' ? f.na : '');
  const vaCode = (a: VaLine) => (v.vaCodes === 'letters' ? a.letter : v.vaCodes === 'na' ? a.na : '');
  const tc = (t: string, na: string) => (v.totalCodes === 'T' ? t : v.totalCodes === 'na' ? na : '');

  const allS = B.sectors.map((_, i) => `S${i}`);
  const allF = B.fd.map((_, k) => `F${k}`);
  const allV = B.va.map((_, a) => `V${a}`);

  // Columns.
  const cols: Line[] = B.sectors.map((s, j) => ({ code: s.code, label: s.label, parts: [`S${j}`], kind: 'S' }));
  if (v.intCol) cols.push({ code: tc('TINT', 'P2'), label: 'Total intermediate use', parts: allS, kind: 'T' });
  if (v.blankCol) cols.push({ code: '', label: '', parts: null, kind: 'blank' });
  const firstFd = cols.length;
  const fcLine: Line = { code: tc('TFC', 'P3'), label: 'Final consumption expenditure', parts: B.fd.flatMap((f, k) => (f.consumption ? [`F${k}`] : [])), kind: 'T' };
  B.fd.forEach((f, k) => {
    if (v.fc === 'before' && k === 0) cols.push(fcLine);
    cols.push({ code: fdCode(f), label: foot(f), parts: [`F${k}`], kind: 'F' });
    if (v.fc === 'after' && f.consumption && !B.fd[k + 1]?.consumption) cols.push(fcLine);
  });
  if (v.fdCol) cols.push({ code: tc('TFD', v.lead === 'codes' ? 'TFU' : ''), label: 'Total final uses', parts: allF, kind: 'T' });
  const lastFd = cols.length - 1;
  if (v.outCol) cols.push({ code: tc('TOUT', 'P1'), label: OUT_COL_LABELS[v.outLabel]!, parts: [...allS, ...allF], kind: 'T' });

  // Rows.
  const rows: Line[] = B.sectors.map((s, i) => ({ code: s.code, label: s.label, parts: [`S${i}`], kind: 'S' }));
  if (v.intRow) rows.push({ code: tc('TINT', 'P2'), label: 'Total intermediate consumption', parts: allS, kind: 'T' });
  if (v.blankRows) rows.push({ code: '', label: '', parts: null, kind: 'blank' });
  if (v.sections) rows.push({ code: '', label: 'Primary inputs', parts: null, kind: 'heading' });
  const gvaLine: Line = { code: tc('TVA', 'B1G'), label: 'Gross value added', parts: allV, kind: 'T' };
  if (v.gva === 'before') rows.push(gvaLine);
  B.va.forEach((a, k) => rows.push({ code: vaCode(a), label: foot(a), parts: [`V${k}`], kind: 'V' }));
  if (v.gva === 'after') rows.push(gvaLine);
  if (v.outRow) {
    if (v.blankRows) rows.push({ code: '', label: '', parts: null, kind: 'blank' });
    rows.push({ code: tc('TOUT', 'P1'), label: OUT_ROW_LABELS[v.outLabel]!, parts: [...allS, ...allV], kind: 'T' });
  }

  const base = (r: string, c: string): number | null => {
    const i = Number(r.slice(1));
    const j = Number(c.slice(1));
    if (r[0] === 'S') return c[0] === 'S' ? B.Z[i]![j]! : B.F[i]![j]!;
    return c[0] === 'S' ? B.V[i]![j]! : null;
  };
  const value = (row: Line, col: Line): Cell => {
    if (!row.parts || !col.parts) return null;
    if (row.kind === 'T' && !v.fullRows && col.parts.some((p) => p[0] === 'F')) return null;
    let s = 0;
    let any = false;
    for (const r of row.parts)
      for (const c of col.parts) {
        const x = base(r, c);
        if (x !== null) {
          s += x;
          any = true;
        }
      }
    return any ? s / B.divisor : null;
  };

  // Leading cells of a line.
  const leadOf = (l: Line): Cell[] => {
    const label = l.label || null;
    const code = l.code || null;
    switch (v.lead) {
      case 'code-label':
        return [code, label];
      case 'label-code':
        return [label, code];
      case 'labels':
        return [label];
      case 'codes':
        return [l.kind === 'heading' || l.kind === 'blank' ? label : code];
      case 'combined':
        return [code && label ? `${code}${JOIN[v.joiner]}${label}` : label ?? code];
    }
  };
  const leadWidth = v.lead === 'code-label' || v.lead === 'label-code' ? 2 : 1;
  const headingCells = (): Cell[] => {
    if (!v.heading) return new Array(leadWidth).fill(null);
    switch (v.lead) {
      case 'code-label':
        return ['Code', 'Description'];
      case 'label-code':
        return ['Description', 'Code'];
      case 'labels':
      case 'combined':
        return [v.headingLow ? 'Description' : 'Products'];
      case 'codes':
        return ['Code'];
    }
  };

  const out: Cell[][] = [];
  const merges: [number, number, number, number][] = [];
  if (v.titles) {
    out.push([`Symmetric input-output table, product by product, 2019 (invented data)`]);
    out.push(['EUR million, basic prices']);
    out.push([]);
  }
  const blankLead = () => new Array(leadWidth).fill(null) as Cell[];
  if (v.groups !== 'none') {
    const g: Cell[] = blankLead();
    cols.forEach((c, j) => {
      const inInt = c.kind === 'S';
      const inFd = j >= firstFd && j <= lastFd;
      const text = inInt ? 'Intermediate use' : inFd ? 'Final uses' : null;
      const first = (inInt && j === 0) || (inFd && j === firstFd);
      g.push(v.groups === 'repeat' && v.format !== 'xlsx' ? text : first ? text : null);
    });
    out.push(g);
    if (v.format === 'xlsx' && v.groups === 'once') {
      const r = out.length;
      merges.push([r, leadWidth + 1, r, leadWidth + n]);
      merges.push([r, leadWidth + firstFd + 1, r, leadWidth + lastFd + 1]);
    }
  }
  const codeCells = cols.map((c) => c.code || null);
  const labelCells = cols.map((c) => c.label || null);
  if (v.lead === 'code-label' || v.lead === 'label-code') {
    // The heading sits in the top header row.
    const [top, below] = v.codesFirst ? [codeCells, labelCells] : [labelCells, codeCells];
    if (v.headingLow) out.push([...blankLead(), ...top], [...headingCells(), ...below]);
    else out.push([...headingCells(), ...top], [...blankLead(), ...below]);
  } else if (v.lead === 'labels') out.push([...headingCells(), ...cols.map((c) => c.label || null)]);
  else if (v.lead === 'codes') out.push([...headingCells(), ...cols.map((c) => c.code || null)]);
  else out.push([...headingCells(), ...cols.map((c) => (c.kind === 'blank' ? null : c.code && c.label ? `${c.code}${JOIN[v.joiner]}${c.label}` : c.label))]);
  if (v.units === 'lead') out.push(['EUR million']);
  if (v.units === 'across') out.push([...blankLead(), ...cols.map((c) => (c.kind === 'blank' ? null : 'EUR million'))]);
  if (v.blankRows) out.push([]);
  for (const r of rows) {
    if (r.kind === 'blank') {
      out.push([]);
      continue;
    }
    if (r.kind === 'heading') {
      const lead = leadOf(r);
      out.push(lead);
      continue;
    }
    out.push([...leadOf(r), ...cols.map((c) => value(r, c))]);
  }
  if (v.notes) {
    out.push([]);
    if (v.footnotes) out.push([`${mark('(a)')} Including re-exports.`], [`${mark('(b)')} Wages and salaries with employers' social contributions.`]);
    out.push(['Note: the figures are invented for testing.']);
    out.push(['Source: invented for this test.']);
  }

  // The table expected back.
  const codeOf = (code: string, label: string) => (v.lead === 'labels' ? label : v.lead === 'codes' ? code : code || label);
  const labelOf = (code: string, label: string) => (v.lead === 'codes' ? code : label);
  const axis = (ls: Line[]) => ({ codes: ls.map((l) => codeOf(l.code, l.label)), labels: ls.map((l) => labelOf(l.code, l.label)) });
  const dv = (x: number) => x / B.divisor;
  const fdLines = cols.filter((c) => c.kind === 'F');
  const vaLines = rows.filter((r) => r.kind === 'V');
  const x = B.Z.map((r, i) => (r.reduce((a, b) => a + b, 0) + B.F[i]!.reduce((a, b) => a + b, 0)) / B.divisor);
  const expected: Table = {
    sectors: axis(cols.filter((c) => c.kind === 'S')),
    Z: { rows: n, cols: n, data: Float64Array.from(B.Z.flat().map(dv)) },
    finalDemand: axis(fdLines),
    F: { rows: n, cols: B.fd.length, data: Float64Array.from(B.F.flat().map(dv)) },
    valueAdded: axis(vaLines),
    V: { rows: B.va.length, cols: n, data: Float64Array.from(B.V.flat().map(dv)) },
    x: Float64Array.from(x),
    satellites: [],
    meta: {},
  };
  return { rows: out, merges, expected };
}

// ---------------------------------------------------------------------------------------------
// Writing a sheet.

const DELIM: Record<Exclude<Format, 'xlsx'>, string> = { comma: ',', semicolon: ';', tab: '\t' };

function group(int: string, sep: string): string {
  return int.replace(/\B(?=(\d{3})+(?!\d))/g, sep);
}

/** A number as the variant writes it. */
export function numberText(x: number, v: Variant): string {
  const s = String(x);
  const neg = s.startsWith('-');
  const [int, frac] = (neg ? s.slice(1) : s).split('.') as [string, string | undefined];
  // Semicolon files take a decimal comma; tab files too with space separators.
  const dec = v.format === 'semicolon' || (v.format === 'tab' && (v.numbers === 'space' || v.numbers === 'nbsp')) ? ',' : '.';
  let sep = '';
  if (v.numbers === 'thousands') sep = dec === ',' ? '.' : ',';
  if (v.numbers === 'space') sep = ' ';
  if (v.numbers === 'nbsp') sep = '\u00a0';
  return `${neg ? '-' : ''}${group(int, sep)}${frac !== undefined ? dec + frac : ''}`;
}

export function toCsv(rows: Cell[][], v: Variant): string {
  const d = DELIM[v.format as Exclude<Format, 'xlsx'>];
  return rows
    .map((r) =>
      r
        .map((c) => {
          if (c === null || c === undefined) return '';
          const t = typeof c === 'number' ? numberText(c, v) : c;
          return t.includes(d) || /["\n\r]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t;
        })
        .join(d),
    )
    .join('\r\n');
}

export async function toXlsx(s: Sheet, v: Variant): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  if (v.contents) {
    const c = wb.addWorksheet('Contents');
    c.addRow(['Contents']);
    c.addRow(['Table 1', 'Symmetric input-output table (invented data)']);
  }
  const ws = wb.addWorksheet('Table 1');
  // Numbers as number cells, or (with thousands separators) as text, as some workbooks store them.
  for (const r of s.rows) ws.addRow(r.map((c) => (c === null || (v.zerosEmpty && c === 0) ? undefined : typeof c === 'number' && v.numbers !== 'plain' ? numberText(c, v) : c)));
  for (const [t, l, b, r] of s.merges) ws.mergeCells(t, l, b, r);
  return new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer);
}

export async function bytesOf(v: Variant): Promise<{ bytes: Uint8Array; file: string; sheet: Sheet }> {
  const sheet = build(v);
  if (v.format === 'xlsx') return { bytes: await toXlsx(sheet, v), file: 'stress.xlsx', sheet };
  const file = v.format === 'tab' ? 'stress.tsv' : 'stress.csv';
  return { bytes: new TextEncoder().encode(toCsv(sheet.rows, v)), file, sheet };
}

/**
 * Whether the written numbers leave the decimal mark undecided: whole numbers, one '.' or ','
 * thousands separator at most in each (below a million), nothing that shows a decimal mark, and
 * (in comma files) quoted, so that the reader's rule for unquoted cells does not apply.
 */
export function ambiguous(v: Variant): boolean {
  if (v.numbers !== 'thousands' || v.base.divisor !== 1) return false;
  const sheet = build(v);
  let grouped = false;
  for (const r of sheet.rows)
    for (const c of r) {
      if (typeof c !== 'number') continue;
      if (Math.abs(c) >= 1e6) return false;
      if (Math.abs(c) >= 1e3) grouped = true;
    }
  return grouped;
}
