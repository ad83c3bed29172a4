import { readFileSync } from 'node:fs';
import { readXlsx } from './src/io/xlsx';
const b = new Uint8Array(readFileSync('/work/shared/reference/scotland-2016-io/IO2016.xlsx'));
const ts: number[] = [];
for (let k = 0; k < 20; k++) { const t = performance.now(); await readXlsx(b, { file: 'IO2016.xlsx', sheet: 8 }); ts.push(performance.now() - t); }
console.log(ts.map((x) => x.toFixed(0)).join(' '));
