/**
 * Sweep benchmark: 10,000 scenarios on a 400-sector table (a seeded synthetic table of 4 regions
 * × 100 sectors, engine/synthetic.ts), run as 2 local shards one after the other (each its own
 * process, as a scheduler would start them), then merged; against today's single
 * `ripplewise impact` run of the same 10,000 scenarios (which may run out of memory: that is
 * reported, not hidden; it runs with a 4 GB heap limit so that it cannot take the whole machine). Prints wall time, peak memory per process (GNU time's maximum resident
 * set size, where /usr/bin/time exists) and output sizes. Target: peak memory of each shard at
 * most 1 GB.
 *
 * Options through the environment: SWEEP_BENCH_SCENARIOS (default 10000), SWEEP_BENCH_SECTORS
 * per region (default 100, 4 regions), SWEEP_BENCH_IMPACT=0 to leave out the single impact run.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { syntheticTable } from '../../engine/synthetic';
import { writeTableJson } from '../../src/io/index';
import { writeScenarios } from '../../src/project/scenarios';
import { table } from './util';

const ROOT = resolve(import.meta.dirname, '../..');
const BIN = join(ROOT, 'bin/ripplewise.mjs');
const S = Number(process.env.SWEEP_BENCH_SCENARIOS ?? 10_000);
const PER = Number(process.env.SWEEP_BENCH_SECTORS ?? 100);
const dir = mkdtempSync(join(tmpdir(), 'ripplewise-sweep-bench-'));
const t = syntheticTable({ regions: 4, sectors: PER, seed: 5 });
const n = t.sectors.codes.length;
writeFileSync(join(dir, 'table.json'), writeTableJson(t));
let seed = 12345;
const rand = () => ((seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 2 ** 32);
writeFileSync(
  join(dir, 'scenarios.json'),
  writeScenarios(Array.from({ length: S }, (_, k) => ({ name: `s${k + 1}`, changes: [{ sector: t.sectors.codes[Math.floor(rand() * n)]!, amount: Math.round(1 + rand() * 100) }, { sector: t.sectors.codes[Math.floor(rand() * n)]!, amount: Math.round(1 + rand() * 50) }] }))),
);
writeFileSync(
  join(dir, 'plan.json'),
  JSON.stringify({ format: 'ripplewise-sweep', version: 1, name: 'benchmark', seed: 1, tables: [{ name: 'synthetic', file: 'table.json' }], scenarios: [{ file: 'scenarios.json' }], parameters: { household: ['off'], cv: [0] } }),
);
const hasTime = existsSync('/usr/bin/time');

function timed(args: string[], env: Record<string, string> = {}): { seconds: number; peakMB: number | null; status: string; stderr: string } {
  const start = performance.now();
  const cmd = hasTime ? '/usr/bin/time' : process.execPath;
  const argv = hasTime ? ['-f', 'PEAK_KB %M', process.execPath, BIN, ...args] : [BIN, ...args];
  const r = spawnSync(cmd, argv, { cwd: dir, encoding: 'utf8', maxBuffer: 1 << 30, env: { ...process.env, CI: 'true', ...env } });
  const seconds = (performance.now() - start) / 1000;
  const m = /PEAK_KB (\d+)/.exec(r.stderr ?? '');
  const status = r.status === 0 ? 'ok' : `exit ${r.status ?? r.signal}`;
  return { seconds, peakMB: m ? Number(m[1]) / 1024 : null, status, stderr: (r.stderr ?? '').replace(/PEAK_KB \d+\n?/, '').trim().slice(-300) };
}

function size(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.size;
  return readdirSync(path).reduce((a, f) => a + size(join(path, f)), 0);
}

const MB = (b: number) => b / 1e6;
const rows: (string | number)[][] = [];
console.log(`${S} scenarios × ${n} sectors; folder ${dir}`);
const s1 = timed(['sweep', 'plan.json', '--out', 'results', '--shard', '1/2']);
rows.push(['sweep shard 1/2', s1.seconds, s1.peakMB ?? 'n/a', MB(size(join(dir, 'results', 'shard-0001-of-0002'))), s1.status]);
const s2 = timed(['sweep', 'plan.json', '--out', 'results', '--shard', '2/2']);
rows.push(['sweep shard 2/2', s2.seconds, s2.peakMB ?? 'n/a', MB(size(join(dir, 'results', 'shard-0002-of-0002'))), s2.status]);
const m = timed(['sweep', 'merge', 'results', '--out', 'all.parquet']);
rows.push(['sweep merge', m.seconds, m.peakMB ?? 'n/a', MB(size(join(dir, 'all.parquet'))), m.status]);
rows.push(['  its reports (HTML + XLSX)', '', '', MB(size(join(dir, 'all.html')) + size(join(dir, 'all.xlsx'))), '']);
if (process.env.SWEEP_BENCH_IMPACT !== '0') {
  // A heap limit of 4 GB, so that a run that would need far more fails instead of taking the machine.
  const im = timed(['impact', 'table.json', '--scenario', 'scenarios.json', '--no-household', '--out', 'impact.json'], { NODE_OPTIONS: '--max-old-space-size=4096' });
  rows.push(['single impact run (JSON, 4 GB heap)', im.seconds, im.peakMB ?? 'n/a', MB(size(join(dir, 'impact.json'))), im.status]);
  if (im.status !== 'ok') console.log(`impact: ${im.stderr}`);
}
for (const x of [s1, s2, m]) if (x.status !== 'ok') console.log(x.stderr);
table(['run', 'seconds', 'peak MB', 'output MB', 'status'], rows);
const peak = Math.max(s1.peakMB ?? Infinity, s2.peakMB ?? Infinity);
const ran = s1.status === 'ok' && s2.status === 'ok';
console.log(`target: peak memory of each shard ≤ 1024 MB: ${!ran ? 'not measured (a shard failed)' : peak <= 1024 ? 'met' : peak === Infinity ? 'not measured (no /usr/bin/time)' : 'missed'} (${Number.isFinite(peak) ? peak.toFixed(0) : 'n/a'} MB)`);
rmSync(dir, { recursive: true, force: true });
