/**
 * `npm run bench [-- name ...]`: runs each benchmark file test/bench/<name>.bench.ts in its own
 * child process, one after another (so timings and peak memory are not mixed up), and prints
 * what each prints. Benchmarks measure; they never fail a build. Each file prints a table of
 * its timings, the ratios against its reference, and its targets with "met" or "missed".
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const wanted = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => wanted.length === 0 || wanted.some((w) => f.startsWith(w)))
  .sort();
if (!files.length) {
  console.error(`no benchmark matches ${wanted.join(', ')}; known: ${readdirSync(here).filter((f) => f.endsWith('.bench.ts')).join(', ')}`);
  process.exit(2);
}
for (const f of files) {
  console.log(`\n## ${f.replace('.bench.ts', '')}\n`);
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--expose-gc', '--max-old-space-size=16000', join(here, f)], {
    stdio: 'inherit',
    env: { ...process.env, OPENBLAS_NUM_THREADS: '1' },
  });
  if (r.status !== 0) console.log(`(benchmark ${f} exited with ${r.status ?? r.signal})`);
}
