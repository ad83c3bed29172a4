/**
 * The scheduler templates, run where they can be:
 * - GNU parallel (Debian's `parallel`): the printed command line runs a 4-shard sweep and the
 *   merge, which gives the bytes of a 1-shard run. Skipped with a message when `parallel` is
 *   absent and CI is not set (under CI=true its absence fails; .ci/run installs it).
 * - Slurm: the printed script is parsed (#SBATCH --array=1-N) and run with bash once per array
 *   task, with the variables Slurm sets (SLURM_ARRAY_TASK_ID, _COUNT, _MIN).
 * - Kubernetes: the printed manifest is parsed as YAML (yaml 2.9.1): an Indexed Job of N
 *   completions whose container command, run with JOB_COMPLETION_INDEX 0 … N−1, makes the shards.
 * - Dockerfile: Node 20 slim; every folder it copies exists; every package that the command's
 *   code imports at run time is a dependency (so `npm ci --omit=dev` is enough).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { BIN, ROOT, run } from '../cli/harness';
import { sweepFolder } from './setup';

const PROGRAM = `${process.execPath} ${BIN}`;

async function templateText(kind: string, f: { dir: string; plan: string }, extra: string[] = []): Promise<string> {
  const r = await run(['sweep', 'template', kind, '--plan', f.plan, '--out', join(f.dir, 'results'), '--shards', '4', '--program', PROGRAM, ...extra]);
  expect(r.code, r.stderr).toBe(0);
  return r.stdout;
}

async function reference(f: { dir: string; plan: string }): Promise<Buffer> {
  expect((await run(['sweep', f.plan, '--out', join(f.dir, 'one')])).code).toBe(0);
  expect((await run(['sweep', 'merge', join(f.dir, 'one'), '--out', join(f.dir, 'one.parquet')])).code).toBe(0);
  return readFileSync(join(f.dir, 'one.parquet'));
}

async function mergeResults(f: { dir: string }): Promise<Buffer> {
  const r = await run(['sweep', 'merge', join(f.dir, 'results'), '--out', join(f.dir, 'results.parquet')]);
  expect(r.code, r.stderr).toBe(0);
  return readFileSync(join(f.dir, 'results.parquet'));
}

const hasParallel = spawnSync('parallel', ['--version'], { stdio: 'ignore' }).status === 0;
if (!hasParallel && process.env.CI !== 'true') console.warn('GNU parallel is not installed: the parallel template test is skipped (apt-get install parallel)');

describe('scheduler templates', () => {
  it.skipIf(!hasParallel && process.env.CI !== 'true')('GNU parallel: the printed command runs 4 shards and the merge', async () => {
    const f = sweepFolder();
    const line = (await templateText('parallel', f, ['--jobs', '2'])).split('\n').filter((l) => l && !l.startsWith('#'));
    expect(line).toHaveLength(1);
    expect(line[0]).toMatch(/^parallel --quote --jobs 2 .* --shard \{\}\/4 ::: 1 2 3 4 && /);
    execFileSync('bash', ['-c', line[0]!], { cwd: f.dir, stdio: 'pipe', env: { ...process.env, SOURCE_DATE_EPOCH: '1767225600' } });
    expect(readdirSync(join(f.dir, 'results')).filter((d) => d.startsWith('shard-')).sort()).toEqual(['shard-0001-of-0004', 'shard-0002-of-0004', 'shard-0003-of-0004', 'shard-0004-of-0004']);
    expect(existsSync(join(f.dir, 'results.parquet'))).toBe(true);
    expect(readFileSync(join(f.dir, 'results.parquet')).equals(await reference(f))).toBe(true);
  }, 120_000);

  it('Slurm: the script, run as each array task, makes the shards', async () => {
    const f = sweepFolder();
    const script = await templateText('slurm', f);
    expect(script.startsWith('#!/bin/bash\n')).toBe(true);
    const array = /^#SBATCH --array=(\d+)-(\d+)$/m.exec(script);
    expect(array).not.toBeNull();
    const [lo, hi] = [Number(array![1]), Number(array![2])];
    expect(hi - lo + 1).toBe(4);
    const path = join(f.dir, 'sweep.sh');
    writeFileSync(path, script);
    for (let id = lo; id <= hi; id++) {
      execFileSync('bash', [path], { cwd: f.dir, stdio: 'pipe', env: { ...process.env, SLURM_ARRAY_TASK_ID: String(id), SLURM_ARRAY_TASK_COUNT: String(hi - lo + 1), SLURM_ARRAY_TASK_MIN: String(lo), SLURM_ARRAY_TASK_MAX: String(hi) } });
    }
    expect((await mergeResults(f)).equals(await reference(f))).toBe(true);
  }, 120_000);

  it('Kubernetes: an Indexed Job whose command, run for each index, makes the shards', async () => {
    const f = sweepFolder();
    const doc = parse(await templateText('kubernetes', f, ['--image', 'registry.example/ripplewise:0.1.0'])) as {
      apiVersion: string;
      kind: string;
      spec: { completionMode: string; completions: number; parallelism: number; template: { spec: { restartPolicy: string; containers: { image: string; command: string[]; workingDir: string }[] } } };
    };
    expect(doc.apiVersion).toBe('batch/v1');
    expect(doc.kind).toBe('Job');
    expect(doc.spec.completionMode).toBe('Indexed');
    expect(doc.spec.completions).toBe(4);
    const c = doc.spec.template.spec.containers[0]!;
    expect(c.image).toBe('registry.example/ripplewise:0.1.0');
    for (let i = 0; i < doc.spec.completions; i++) {
      execFileSync(c.command[0]!, c.command.slice(1), { cwd: f.dir, stdio: 'pipe', env: { ...process.env, JOB_COMPLETION_INDEX: String(i) } });
    }
    expect((await mergeResults(f)).equals(await reference(f))).toBe(true);
  }, 120_000);

  it('Dockerfile: Node 20 slim, copies what exists, and needs only the runtime dependencies', async () => {
    const r = await run(['sweep', 'template', 'dockerfile']);
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n').filter((l) => l && !l.startsWith('#'));
    expect(lines[0]).toBe('FROM node:20-slim');
    expect(lines).toContain('RUN npm ci --omit=dev --ignore-scripts && npm cache clean --force');
    for (const l of lines.filter((x) => x.startsWith('COPY '))) {
      for (const src of l.split(/\s+/).slice(1, -1)) expect(existsSync(join(ROOT, src)), src).toBe(true);
    }
    // Every bare import under engine/ and src/ (outside the workbench) is a runtime dependency or node's own.
    const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { dependencies: Record<string, string> };
    const seen = new Set<string>();
    const walk = (dir: string) => {
      for (const e of readdirSync(dir, { withFileTypes: true })) {
        const p = join(dir, e.name);
        if (e.isDirectory()) walk(p);
        else if (/\.(ts|mjs)$/.test(e.name)) {
          for (const m of readFileSync(p, 'utf8').matchAll(/^\s*(?:import|export)\s[^'"]*?from\s+'([^'.][^']*)'|import\('([^'.][^']*)'\)/gm)) {
            const spec = m[1] ?? m[2]!;
            if (/^import type/.test(m[0].trim())) continue;
            if (spec.startsWith('node:')) continue;
            seen.add(spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!);
          }
        }
      }
    };
    for (const d of ['bin', 'engine', 'src/cli', 'src/sweep', 'src/io', 'src/report', 'src/project']) walk(join(ROOT, d));
    for (const name of seen) expect(pkg.dependencies[name], `${name} is imported at run time`).toBeDefined();
    expect(seen.has('hyparquet-writer')).toBe(true);
  });

  it('refuses an unknown kind', async () => {
    const r = await run(['sweep', 'template', 'pbs']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/there is no template 'pbs'; choose one of slurm, kubernetes, parallel, dockerfile/);
  });
});
