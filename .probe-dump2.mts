import { readFileSync } from 'node:fs';
import { readGrid } from '/work/wt/i12/src/io/open';
const b = readFileSync('/work/shared/reference/scotland-2016-io/IO2016.xlsx');
const g = (await readGrid(new Uint8Array(b), { file: 'x.xlsx', sheet: 'IxI' })).grid;
for (const r of [5, 6, 115, 116]) { const out: string[] = []; for (let c = 0; c < g.colCount; c++) { const t = g.text(r, c); if (t) out.push(`${c + 1}:${t.replace(/\n/g, ' ').slice(0, 30)}`); } console.log(r + 1, out.join(' | ')); }
const row = (code: string) => { for (let r = 0; r < g.rowCount; r++) if (g.text(r, 1) === code) return r; return -1; };
const gva = row('GVA'), coe = row('CoE'), gos = row('GOS'), tp = row('TlSPrdn');
let worst = 0; for (let c = 3; c < 101; c++) { const d = g.rows[gva]!.values[c]! - g.rows[coe]!.values[c]! - g.rows[gos]!.values[c]! - g.rows[tp]!.values[c]!; worst = Math.max(worst, Math.abs(d)); } console.log('gva gap', worst);
