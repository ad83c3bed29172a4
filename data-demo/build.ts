/**
 * Builds the demo economy: the Vellan Coast, an INVENTED coastal region. Nothing here is real
 * data; the numbers are made up to look plausible and to balance exactly.
 *
 * Run: npx tsx data-demo/build.ts   (writes data-demo/vellan-coast.table.json, and the same table
 * as vellan-coast.csv and vellan-coast.xlsx with the project's own writers in src/io, which the
 * readers read back to the identical table)
 *
 * How it is made: each sector gets an intermediate-input share, an import share and a pattern
 * of purchases; final demand is chosen by sector; output follows from x = (I − A)⁻¹ f; flows are
 * Z = A x̂; value added is what remains of output. All money is rounded to tenths of a million
 * in integer arithmetic, so that rows and columns balance exactly.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { LeontiefModel } from '../engine/leontief';
import type { PlainTable } from '../engine/table';
import { makeTable } from '../engine/table';
import { writeTableCsv, writeTableXlsx } from '../src/io/index';

const here = dirname(fileURLToPath(import.meta.url));

const sectors: [string, string][] = [
  ['AGRI', 'Agriculture and horticulture'],
  ['FISH', 'Fishing and aquaculture'],
  ['FORE', 'Forestry and logging'],
  ['MINE', 'Quarrying and mining'],
  ['FOOD', 'Food and seafood processing'],
  ['WOOD', 'Timber and paper products'],
  ['MANU', 'Machinery and other manufacturing'],
  ['ENER', 'Electricity, gas and water'],
  ['CONS', 'Construction'],
  ['TRAD', 'Wholesale and retail trade'],
  ['HOSP', 'Accommodation and food services'],
  ['TRAN', 'Transport and storage'],
  ['FINA', 'Finance, insurance and real estate'],
  ['PROF', 'Professional and business services'],
  ['PUBL', 'Public administration and education'],
  ['HLTH', 'Health and social care'],
];
const codes = sectors.map((s) => s[0]);
const n = codes.length;
const at = (c: string) => codes.indexOf(c);

// Share of output spent on local intermediate inputs, and on imported ones.
const localShare: Record<string, number> = {
  AGRI: 0.34, FISH: 0.3, FORE: 0.28, MINE: 0.3, FOOD: 0.46, WOOD: 0.42, MANU: 0.36, ENER: 0.4,
  CONS: 0.44, TRAD: 0.3, HOSP: 0.4, TRAN: 0.36, FINA: 0.26, PROF: 0.28, PUBL: 0.22, HLTH: 0.24,
};
const importShare: Record<string, number> = {
  AGRI: 0.12, FISH: 0.14, FORE: 0.08, MINE: 0.16, FOOD: 0.18, WOOD: 0.16, MANU: 0.28, ENER: 0.2,
  CONS: 0.16, TRAD: 0.08, HOSP: 0.12, TRAN: 0.14, FINA: 0.06, PROF: 0.08, PUBL: 0.08, HLTH: 0.1,
};
// Whom each sector buys from (relative weights), on top of a common base of services.
const buys: Record<string, Record<string, number>> = {
  AGRI: { AGRI: 4, MANU: 2, ENER: 2, TRAN: 2, TRAD: 2 },
  FISH: { FISH: 2, MANU: 3, ENER: 2, TRAN: 2, TRAD: 1 },
  FORE: { FORE: 2, MANU: 2, TRAN: 3, ENER: 1 },
  MINE: { MINE: 2, MANU: 3, ENER: 3, TRAN: 2, CONS: 1 },
  FOOD: { AGRI: 6, FISH: 5, FOOD: 2, ENER: 2, TRAN: 2, TRAD: 2 },
  WOOD: { FORE: 7, WOOD: 2, ENER: 2, TRAN: 2 },
  MANU: { MINE: 2, MANU: 4, WOOD: 1, ENER: 2, TRAN: 1 },
  ENER: { MINE: 3, ENER: 4, CONS: 2, MANU: 1 },
  CONS: { MINE: 3, WOOD: 3, MANU: 4, CONS: 3, TRAD: 2 },
  TRAD: { TRAN: 3, ENER: 1, FINA: 2, TRAD: 1 },
  HOSP: { FOOD: 5, AGRI: 1, FISH: 1, TRAD: 3, ENER: 2 },
  TRAN: { MANU: 2, ENER: 3, TRAN: 2, TRAD: 1 },
  FINA: { FINA: 3, PROF: 2, CONS: 1 },
  PROF: { PROF: 3, FINA: 1 },
  PUBL: { CONS: 2, PROF: 2, ENER: 1, TRAD: 1 },
  HLTH: { MANU: 1, TRAD: 2, PROF: 1, ENER: 1, FOOD: 1 },
};
const services = { TRAD: 0.5, TRAN: 0.5, FINA: 0.7, PROF: 0.8, ENER: 0.3 };

const A = { rows: n, cols: n, data: new Float64Array(n * n) };
for (const j of codes) {
  const w = new Map<string, number>(Object.entries(services));
  for (const [i, v] of Object.entries(buys[j]!)) w.set(i, (w.get(i) ?? 0) + v);
  const total = [...w.values()].reduce((a, b) => a + b, 0);
  for (const [i, v] of w) A.data[at(i) * n + at(j)] = (v / total) * localShare[j]!;
}

// Final demand in millions, by category (invented).
const fdCodes = ['HHC', 'GOV', 'GFCF', 'VIS', 'EXP'];
const fdLabels = ['Household consumption', 'Government consumption', 'Investment (gross fixed capital formation)', 'Visitor spending', 'Exports to other regions'];
const fd: Record<string, number[]> = {
  //      HHC    GOV   GFCF  VIS    EXP
  AGRI: [110, 0, 6, 14, 260],
  FISH: [42, 0, 0, 9, 310],
  FORE: [4, 0, 0, 0, 88],
  MINE: [0, 0, 5, 0, 190],
  FOOD: [205, 8, 0, 46, 420],
  WOOD: [18, 0, 12, 0, 150],
  MANU: [60, 10, 85, 4, 240],
  ENER: [140, 20, 0, 12, 30],
  CONS: [30, 75, 390, 0, 20],
  TRAD: [480, 6, 20, 95, 60],
  HOSP: [190, 4, 0, 310, 15],
  TRAN: [95, 12, 4, 70, 120],
  FINA: [520, 10, 40, 6, 55],
  PROF: [85, 40, 60, 10, 95],
  PUBL: [30, 720, 20, 2, 5],
  HLTH: [120, 560, 6, 4, 8],
};
const f = new Float64Array(n);
for (let i = 0; i < n; i++) f[i] = fd[codes[i]!]!.reduce((a, b) => a + b, 0);
const x = new LeontiefModel(A).solve(f);

// Integer tenths of a million, so that every sum below is exact.
const tenth = (v: number) => Math.round(v * 10);
const Z = codes.map((_, i) => codes.map((_, j) => tenth(A.data[i * n + j]! * x[j]!)));
const F = codes.map((c) => fd[c]!.map((v) => tenth(v)));
const X = codes.map((_, i) => Z[i]!.reduce((a, b) => a + b, 0) + F[i]!.reduce((a, b) => a + b, 0));
const IMP = codes.map((c, j) => tenth((importShare[c]! * X[j]!) / 10));
// Value added: compensation of employees, taxes less subsidies, and the rest as operating surplus.
const wageShare: Record<string, number> = {
  AGRI: 0.3, FISH: 0.38, FORE: 0.4, MINE: 0.36, FOOD: 0.55, WOOD: 0.55, MANU: 0.58, ENER: 0.3,
  CONS: 0.62, TRAD: 0.62, HOSP: 0.66, TRAN: 0.6, FINA: 0.26, PROF: 0.72, PUBL: 0.86, HLTH: 0.84,
};
const COE: number[] = [];
const TAX: number[] = [];
const GOS: number[] = [];
for (let j = 0; j < n; j++) {
  let inter = 0;
  for (let i = 0; i < n; i++) inter += Z[i]![j]!;
  const va = X[j]! - inter - IMP[j]!;
  if (va <= 0) throw new Error(`demo: sector ${codes[j]} has no value added`);
  const coe = Math.round(va * wageShare[codes[j]!]!);
  const tax = Math.round(va * (codes[j] === 'PUBL' || codes[j] === 'HLTH' ? 0.01 : 0.04));
  COE.push(coe);
  TAX.push(tax);
  GOS.push(va - coe - tax);
}

const jobsPerMillion: Record<string, number> = {
  AGRI: 9, FISH: 7, FORE: 5, MINE: 2, FOOD: 4, WOOD: 3.5, MANU: 3, ENER: 1.2,
  CONS: 6, TRAD: 10, HOSP: 14, TRAN: 5, FINA: 2, PROF: 6, PUBL: 9, HLTH: 12,
};
const ghgPerMillion: Record<string, number> = {
  AGRI: 900, FISH: 400, FORE: 150, MINE: 600, FOOD: 250, WOOD: 300, MANU: 280, ENER: 1800,
  CONS: 120, TRAD: 40, HOSP: 60, TRAN: 700, FINA: 10, PROF: 15, PUBL: 50, HLTH: 45,
};
const m = (v: number) => v / 10;

const table: PlainTable = {
  sectors: { codes, labels: sectors.map((s) => s[1]) },
  Z: Z.map((r) => r.map(m)),
  finalDemand: { codes: fdCodes, labels: fdLabels, values: F.map((r) => r.map(m)) },
  valueAdded: {
    codes: ['COE', 'GOS', 'TAX'],
    labels: ['Compensation of employees', 'Gross operating surplus and mixed income', 'Taxes less subsidies on production'],
    values: [COE.map(m), GOS.map(m), TAX.map(m)],
  },
  imports: IMP.map(m),
  x: X.map(m),
  satellites: [
    { code: 'JOBS', label: 'Employment', unit: 'FTE jobs', values: codes.map((c, j) => Math.round(jobsPerMillion[c]! * m(X[j]!))) },
    { code: 'GHG', label: 'Greenhouse gas emissions', unit: 't CO2e', values: codes.map((c, j) => Math.round(ghgPerMillion[c]! * m(X[j]!))) },
  ],
  meta: {
    title: 'Vellan Coast regional input-output table, 2025 (invented)',
    currency: 'EUR',
    scale: 1e6,
    scaleLabel: 'millions',
    year: 2025,
    region: 'Vellan Coast (an invented region)',
    priceBasis: 'basic prices',
    source: 'INVENTED DATA for the Ripplewise demo. Not a real region, not real statistics.',
    invented: true,
    notes: [
      'Every number in this table is invented for demonstration. Do not use it for any decision.',
      'Household consumption (HHC) and compensation of employees (COE) are the household closure for Type II multipliers.',
    ],
  },
};

writeFileSync(join(here, 'vellan-coast.table.json'), JSON.stringify(table, null, 1) + '\n');
const built = makeTable(table);
writeFileSync(join(here, 'vellan-coast.csv'), writeTableCsv(built));
writeFileSync(join(here, 'vellan-coast.xlsx'), await writeTableXlsx(built, { sheet: 'Vellan Coast', coefficients: true }));
console.log(`wrote data-demo/vellan-coast.table.json, .csv and .xlsx: ${n} sectors, total output ${m(X.reduce((a, b) => a + b, 0)).toFixed(1)} EUR millions`);
