/** Small helpers shared by the benchmarks. */

/** Median wall time in milliseconds of `runs` calls of f (after one warm-up call). */
export function timeMedian(f: () => unknown, runs = 3, warmup = 1): number {
  for (let i = 0; i < warmup; i++) f();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    f();
    t.push(performance.now() - s);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)]!;
}

export async function timeMedianAsync(f: () => Promise<unknown>, runs = 3, warmup = 1): Promise<number> {
  for (let i = 0; i < warmup; i++) await f();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    await f();
    t.push(performance.now() - s);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)]!;
}

/** Peak resident memory of this process so far, in MB. */
export function peakRssMB(): number {
  return process.resourceUsage().maxRSS / 1024;
}

/** Print rows as an aligned plain-text table. */
export function table(header: string[], rows: (string | number)[][]): void {
  const cells = [header, ...rows.map((r) => r.map((c) => (typeof c === 'number' ? fmt(c) : c)))];
  const w = header.map((_, j) => Math.max(...cells.map((r) => String(r[j] ?? '').length)));
  for (const [i, r] of cells.entries()) {
    console.log(r.map((c, j) => String(c).padStart(w[j]!)).join('  '));
    if (i === 0) console.log(w.map((x) => '-'.repeat(x)).join('  '));
  }
}

function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (Math.abs(x) >= 100) return x.toFixed(0);
  if (Math.abs(x) >= 10) return x.toFixed(1);
  return x.toFixed(2);
}

export function target(label: string, met: boolean, detail: string): void {
  console.log(`target: ${label}: ${met ? 'met' : 'MISSED'} (${detail})`);
}
