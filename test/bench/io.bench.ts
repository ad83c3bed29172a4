/**
 * Reading large tables: a 5,000 × 5,000 wide CSV (about 200 MB) and a long file of 25 million
 * lines (row code, column code, value), both generated into a temporary folder (kept between
 * runs), each read from disk in a child process of its own so that its peak memory is its own.
 * Also a 1,000 × 1,000 wide CSV in memory, through papaparse and through the byte scanner, to
 * show why the large path scans bytes.
 *
 * Targets: at least 40 MB/s from file to table, and peak memory (the whole process's resident
 * set) at most 3 times the final matrices (Z, 200 MB for 5,000 sectors).
 */
import { spawnSync } from 'node:child_process';
import { createWriteStream, existsSync, mkdirSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { peakRssMB, table, target } from './util';

const N = 5000;
const DIR = join(process.env.RIPPLEWISE_BENCH_TMP ?? tmpdir(), 'ripplewise-io-bench');

function codes(n: number): string[] {
  return Array.from({ length: n }, (_, i) => `S${String(i + 1).padStart(4, '0')}`);
}

/** A fast deterministic stream of values with three decimals (a table in millions, rounded). */
function values(seed: number): () => string {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return (s / 4294967296 * 1000).toFixed(3);
  };
}

async function write(path: string, lines: () => Generator<string>): Promise<void> {
  const out = createWriteStream(path);
  for (const chunk of lines()) {
    if (!out.write(chunk)) await new Promise<void>((r) => out.once("drain", () => r()));
  }
  await new Promise<void>((r, j) => out.end((e?: Error | null) => (e ? j(e) : r())));
}

async function makeWide(path: string, n: number): Promise<void> {
  if (existsSync(path)) return;
  const c = codes(n);
  const v = values(1);
  await write(path, function* () {
    yield `code,${c.join(',')}\n`;
    for (let i = 0; i < n; i++) {
      const row = new Array<string>(n + 1);
      row[0] = c[i]!;
      for (let j = 0; j < n; j++) row[j + 1] = v();
      yield row.join(',') + '\n';
    }
  });
}

async function makeLong(path: string, n: number): Promise<void> {
  if (existsSync(path)) return;
  const c = codes(n);
  const v = values(2);
  await write(path, function* () {
    for (let i = 0; i < n; i++) {
      let s = '';
      for (let j = 0; j < n; j++) s += `${c[i]},${c[j]},${v()}\n`;
      yield s;
    }
  });
}

interface Result {
  case: string;
  mb: number;
  readMs: number;
  tableMs: number;
  totalMs: number;
  peakMB: number;
  baseMB: number;
  n: number;
  matrixMB: number;
}

/** The child: read one file, report timings and peak memory as JSON on stdout. */
async function child(kind: string, path: string): Promise<void> {
  const base = peakRssMB();
  const mb = statSync(path).size / 1e6;
  const node = await import('../../src/io/node');
  const { readTable } = await import('../../src/io/tables');
  const { readCsv } = await import('../../src/io/csv');
  let t0 = performance.now();
  let readMs: number;
  let tableMs: number;
  let n: number;
  if (kind === 'wide' || kind === 'long') {
    const src = kind === 'wide' ? (await node.readCsvFile(path)).grid : await node.readLongFile(path);
    readMs = performance.now() - t0;
    t0 = performance.now();
    const r = readTable(src);
    tableMs = performance.now() - t0;
    n = r.table.sectors.codes.length;
  } else {
    const bytes = readFileSync(path);
    const parser = kind === 'small-papaparse' ? 'papaparse' : 'scanner';
    const grid = readCsv(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), { file: 'small.csv', parser }).grid;
    readMs = performance.now() - t0;
    t0 = performance.now();
    n = readTable(grid).table.sectors.codes.length;
    tableMs = performance.now() - t0;
  }
  const res: Result = { case: kind, mb, readMs, tableMs, totalMs: readMs + tableMs, peakMB: peakRssMB(), baseMB: base, n, matrixMB: (n * n * 8) / 1e6 };
  process.stdout.write(JSON.stringify(res) + '\n');
}

function run(kind: string, path: string): Result | undefined {
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--max-old-space-size=16000', fileURLToPath(import.meta.url), '--child', kind, path], {
    encoding: 'utf8',
    maxBuffer: 1 << 20,
  });
  const line = r.stdout.trim().split('\n').pop() ?? '';
  try {
    return JSON.parse(line) as Result;
  } catch {
    console.log(`case ${kind} failed (exit ${r.status ?? r.signal}): ${r.stderr.slice(-2000)}`);
    return undefined;
  }
}

async function main(): Promise<void> {
  mkdirSync(DIR, { recursive: true });
  const wide = join(DIR, `wide-${N}.csv`);
  const long = join(DIR, `long-${N}.csv`);
  const small = join(DIR, 'wide-1000.csv');
  let t = performance.now();
  await makeWide(small, 1000);
  await makeWide(wide, N);
  await makeLong(long, N);
  console.log(`files in ${DIR} (generated or reused in ${((performance.now() - t) / 1000).toFixed(1)} s): wide ${(statSync(wide).size / 1e6).toFixed(0)} MB, long ${(statSync(long).size / 1e6).toFixed(0)} MB (${(N * N / 1e6).toFixed(0)} million lines)\n`);
  const results: Result[] = [];
  for (const [kind, path] of [
    ['small-papaparse', small],
    ['small-scanner', small],
    ['wide', wide],
    ['long', long],
  ] as const) {
    t = performance.now();
    const r = run(kind, path);
    if (r) results.push(r);
  }
  table(
    ['case', 'MB', 'read s', 'table s', 'total s', 'MB/s', 'peak MB', 'start MB', 'matrix MB', 'peak / matrix'],
    results.map((r) => [r.case, r.mb, r.readMs / 1000, r.tableMs / 1000, r.totalMs / 1000, r.mb / (r.totalMs / 1000), r.peakMB, r.baseMB, r.matrixMB, r.peakMB / r.matrixMB]),
  );
  console.log('');
  for (const r of results.filter((x) => x.case === 'wide' || x.case === 'long')) {
    const mbs = r.mb / (r.totalMs / 1000);
    target(`${r.case}: at least 40 MB/s from file to table`, mbs >= 40, `${mbs.toFixed(1)} MB/s`);
    target(`${r.case}: peak memory at most 3× the final matrices`, r.peakMB <= 3 * r.matrixMB, `${r.peakMB.toFixed(0)} MB peak for ${r.matrixMB.toFixed(0)} MB of matrices (${(r.peakMB / r.matrixMB).toFixed(2)}×)`);
  }
}

const argv = process.argv.slice(2);
if (argv[0] === '--child') await child(argv[1]!, argv[2]!);
else await main();
