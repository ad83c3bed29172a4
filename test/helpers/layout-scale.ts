/**
 * Invented tables for the layout scale test and benchmark: 3 sectors with a long run of
 * final-demand columns or value-added rows (and their subtotal), or a long file whose first lines
 * are all one sector's row. Whole numbers, balanced by construction.
 */
export const SECTORS = ['A', 'B', 'C'];
export const Z = [
  [1, 2, 3],
  [2, 1, 2],
  [3, 2, 1],
];

/** 3 sectors, n final-demand columns F1..Fn, then a subtotal column (the sum of F1..Fn) and an output column. */
export function wideFinalDemand(n: number): { text: string; fd: number[][]; x: number[] } {
  const head = ['code', ...SECTORS, ...Array.from({ length: n }, (_, i) => `F${i + 1}`), 'FSUM', 'X'];
  const lines = [head.join(',')];
  const fd: number[][] = [];
  const x: number[] = [];
  for (let i = 0; i < 3; i++) {
    const f = Array.from({ length: n }, (_, j) => ((i * 7 + j * 3) % 5) + 1);
    const fsum = f.reduce((a, b) => a + b, 0);
    x.push(Z[i]!.reduce((a, b) => a + b, 0) + fsum);
    fd.push(f);
    lines.push([SECTORS[i], ...Z[i]!, ...f, fsum, x[i]].join(','));
  }
  return { text: lines.join('\n') + '\n', fd, x };
}

/** 3 sectors, one final-demand column, n value-added rows V1..Vn, a subtotal row (their sum), an output row. */
export function wideValueAdded(n: number): { text: string; va: number[][]; x: number[] } {
  const lines = [['code', ...SECTORS, 'FD', 'X'].join(',')];
  const va = Array.from({ length: n }, (_, r) => SECTORS.map((_, j) => ((r * 3 + j * 5) % 7) + 1));
  const x = SECTORS.map((_, j) => Z.reduce((a, row) => a + row[j]!, 0) + va.reduce((a, row) => a + row[j]!, 0));
  for (let i = 0; i < 3; i++) {
    const fd = x[i]! - Z[i]!.reduce((a, b) => a + b, 0);
    lines.push([SECTORS[i], ...Z[i]!, fd, x[i]].join(','));
  }
  va.forEach((row, r) => lines.push([`V${r + 1}`, ...row, '', ''].join(',')));
  lines.push(['VSUM', ...SECTORS.map((_, j) => va.reduce((a, row) => a + row[j]!, 0)), '', ''].join(','));
  lines.push(['X', ...x, '', ''].join(','));
  return { text: lines.join('\n') + '\n', va, x };
}

/** A long file (row, column, value): sector A's row across n final-demand columns first, then B's, then C's. */
export function longOneRowFirst(n: number): string {
  const lines = ['row,column,value'];
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) lines.push(`${SECTORS[i]},${SECTORS[j]},${Z[i]![j]}`);
    for (let j = 0; j < n; j++) lines.push(`${SECTORS[i]},F${j + 1},${((i + j) % 5) + 1}`);
  }
  return lines.join('\n') + '\n';
}
