/**
 * Strongly connected components of the directed graph of a square matrix (an edge i → j
 * wherever a[i][j] ≠ 0), by Tarjan's algorithm, iteratively so that large tables cannot
 * overflow the call stack.
 *
 * Components come out in reverse topological order (a component is listed before any component
 * that can reach it). Each is an ascending list of 0-based indices.
 *
 * @example stronglyConnected(fromRows([[0, 1], [1, 0]])) // [[0, 1]]
 */
import type { Matrix } from './matrix';

export function stronglyConnected(a: Matrix): number[][] {
  const n = a.rows;
  const { data } = a;
  const index = new Int32Array(n).fill(-1);
  const low = new Int32Array(n);
  const onStack = new Uint8Array(n);
  const stack: number[] = [];
  const out: number[][] = [];
  const next = new Int32Array(n); // next column to look at, per vertex on the call path
  let counter = 0;
  const call: number[] = [];
  for (let s = 0; s < n; s++) {
    if (index[s] !== -1) continue;
    call.push(s);
    index[s] = low[s] = counter++;
    stack.push(s);
    onStack[s] = 1;
    next[s] = 0;
    while (call.length) {
      const v = call[call.length - 1]!;
      let pushed = false;
      const o = v * n;
      for (let w = next[v]!; w < n; w++) {
        if (data[o + w] === 0) continue;
        if (index[w] === -1) {
          next[v] = w + 1;
          index[w] = low[w] = counter++;
          stack.push(w);
          onStack[w] = 1;
          next[w] = 0;
          call.push(w);
          pushed = true;
          break;
        } else if (onStack[w]) {
          if (index[w]! < low[v]!) low[v] = index[w]!;
        }
      }
      if (pushed) continue;
      next[v] = n;
      call.pop();
      if (call.length) {
        const u = call[call.length - 1]!;
        if (low[v]! < low[u]!) low[u] = low[v]!;
      }
      if (low[v] === index[v]) {
        const comp: number[] = [];
        let w: number;
        do {
          w = stack.pop()!;
          onStack[w] = 0;
          comp.push(w);
        } while (w !== v);
        comp.sort((x, y) => x - y);
        out.push(comp);
      }
    }
  }
  return out;
}
