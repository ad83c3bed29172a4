/**
 * Layout recognition on long runs of final-demand columns and value-added rows (3 sectors, 20,000
 * adjacent lines and their subtotal), and on a long file whose first 20,000 lines are one sector's
 * row. Target: each read in a few seconds (it used to take minutes: runs cost the cube of their
 * length). Also 5,000 and 10,000, to show the growth is near-linear.
 */
import { readTableFile } from '../../src/io';
import { longOneRowFirst, wideFinalDemand, wideValueAdded } from '../helpers/layout-scale';
import { peakRssMB, table, target } from './util';

const bytes = (s: string) => new TextEncoder().encode(s);
const rows: (string | number)[][] = [];
let worst20k = 0;
for (const n of [5000, 10000, 20000]) {
  for (const [name, text] of [
    ['wide, final-demand columns', wideFinalDemand(n).text],
    ['wide, value-added rows', wideValueAdded(n).text],
    ['long, one row first', longOneRowFirst(n)],
  ] as const) {
    const t0 = performance.now();
    await readTableFile(bytes(text), { file: 'bench.csv' });
    const ms = performance.now() - t0;
    if (n === 20000) worst20k = Math.max(worst20k, ms);
    rows.push([name, n, (text.length / 1e6).toFixed(2), ms.toFixed(0)]);
  }
}
table(['layout', 'lines in the run', 'MB', 'ms'], rows);
console.log(`peak RSS ${peakRssMB().toFixed(0)} MB`);
target('20,000 adjacent lines read in under 10 s', worst20k < 10_000, `${(worst20k / 1000).toFixed(1)} s at worst`);
