import { readFileSync } from 'node:fs';
import { readGrid } from '/work/wt/i12/src/io/open';
const b = readFileSync(process.argv[2]!);
const g = (await readGrid(new Uint8Array(b), { file: 'x.xlsx', sheet: process.argv[3] })).grid;
const [r0, r1, c0, c1] = process.argv.slice(4).map(Number);
console.log('rows', g.rowCount, 'cols', g.colCount, 'merges', JSON.stringify((g as any).merges?.slice?.(0, 20)));
for (let r = r0!; r < Math.min(r1!, g.rowCount); r++) {
  const cells: string[] = [];
  for (let c = c0!; c < Math.min(c1!, g.colCount); c++) cells.push(g.text(r, c).slice(0, 22));
  console.log(r + 1, '|', cells.join(' | '));
}
