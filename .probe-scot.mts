import { readFileSync } from 'node:fs';
import { readTableFile } from '/work/wt/i12/src/io/index';
const b = readFileSync('/work/shared/reference/scotland-2016-io/IO2016.xlsx');
const sheet = process.argv[2];
try {
  const r = await readTableFile(new Uint8Array(b), { file: 'IO2016.xlsx', ...(sheet ? { sheet } : {}) });
  console.log('sheet', r.mapping.sheet, 'n', r.table.sectors.codes.length, 'fd', r.table.finalDemand.codes, 'va', r.table.valueAdded.codes, r.table.valueAdded.classes, 'meta', r.table.meta);
  for (const f of r.findings) console.log(f.severity, f.code, f.message.slice(0, 200));
} catch (e) { console.log('ERR', (e as Error).message); }
const r2 = await readTableFile(new Uint8Array(b), { file: 'IO2016.xlsx', sheet: 'IxI' });
for (const x of r2.mapping.rows.slice(95)) console.log(x.code, x.role, x.why);
for (const x of r2.mapping.columns.slice(97)) console.log(x.code, '|', x.label, x.role, x.why);
console.log(r2.mapping.output, r2.mapping.totals?.map((t: any) => [t.code, t.sumOf, t.matched, t.checked]));
