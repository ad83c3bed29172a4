/**
 * Which shard this process runs, and which units a shard holds.
 *
 * The shard comes from, in this order: `--shard I/N` (I from 1 to N); a Slurm job array
 * (`SLURM_ARRAY_TASK_ID`, `SLURM_ARRAY_TASK_COUNT`, and `SLURM_ARRAY_TASK_MIN` for arrays that
 * do not start at 0); a Kubernetes Indexed Job (`JOB_COMPLETION_INDEX`, from 0, with the count
 * given by `--shards N`, since Kubernetes does not put the completion count in the
 * environment); otherwise the whole plan as shard 1 of 1.
 *
 * Shard I of N holds the contiguous units [⌊(I−1)U/N⌋, ⌊IU/N⌋): contiguous, so that units that
 * share a perturbed coefficient matrix mostly land in one shard. The units a shard holds change
 * with N; a unit's result never does.
 */

export interface ShardChoice {
  /** From 0. */
  index: number;
  count: number;
  /** Where the choice came from, for messages and the manifest. */
  source: 'option' | 'slurm' | 'kubernetes' | 'default';
}

export class ShardError extends Error {
  constructor(message: string, readonly hint?: string) {
    super(message);
  }
}

function whole(v: string, what: string, min: number): number {
  const x = Number(v.trim());
  if (!v.trim() || !Number.isSafeInteger(x) || x < min) throw new ShardError(`${what} must be a whole number from ${min}; got '${v}'`);
  return x;
}

export function chooseShard(o: { shard?: string; shards?: string }, env: Readonly<Record<string, string | undefined>>): ShardChoice {
  if (o.shard !== undefined) {
    const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(o.shard);
    if (!m) throw new ShardError(`--shard must be I/N, such as 2/4 (shard 2 of 4); got '${o.shard}'`);
    const i = Number(m[1]);
    const n = Number(m[2]);
    if (n < 1 || i < 1 || i > n) throw new ShardError(`--shard ${o.shard}: I must be from 1 to N`);
    if (o.shards !== undefined && whole(o.shards, '--shards', 1) !== n) throw new ShardError(`--shard ${o.shard} and --shards ${o.shards} disagree on the number of shards`);
    return { index: i - 1, count: n, source: 'option' };
  }
  const sid = env.SLURM_ARRAY_TASK_ID;
  if (sid !== undefined && sid !== '') {
    const count = env.SLURM_ARRAY_TASK_COUNT;
    if (count === undefined || count === '') throw new ShardError('SLURM_ARRAY_TASK_ID is set but SLURM_ARRAY_TASK_COUNT is not', 'Run as a Slurm job array (#SBATCH --array=1-N), or give --shard I/N');
    const n = whole(count, 'SLURM_ARRAY_TASK_COUNT', 1);
    const min = env.SLURM_ARRAY_TASK_MIN !== undefined && env.SLURM_ARRAY_TASK_MIN !== '' ? whole(env.SLURM_ARRAY_TASK_MIN, 'SLURM_ARRAY_TASK_MIN', 0) : 0;
    const i = whole(sid, 'SLURM_ARRAY_TASK_ID', 0) - min;
    if (i < 0 || i >= n) {
      throw new ShardError(`SLURM_ARRAY_TASK_ID ${sid} is outside the array of ${n} tasks from ${min}`, 'Use a contiguous array such as --array=1-N (a step or a list of task ids is not supported)');
    }
    if (o.shards !== undefined && whole(o.shards, '--shards', 1) !== n) throw new ShardError(`SLURM_ARRAY_TASK_COUNT ${n} and --shards ${o.shards} disagree`);
    return { index: i, count: n, source: 'slurm' };
  }
  const kid = env.JOB_COMPLETION_INDEX;
  if (kid !== undefined && kid !== '') {
    if (o.shards === undefined) throw new ShardError('JOB_COMPLETION_INDEX is set (a Kubernetes Indexed Job), but not the number of shards', 'Give --shards N with N the Job\'s completions');
    const n = whole(o.shards, '--shards', 1);
    const i = whole(kid, 'JOB_COMPLETION_INDEX', 0);
    if (i >= n) throw new ShardError(`JOB_COMPLETION_INDEX ${i} is not below --shards ${n}`);
    return { index: i, count: n, source: 'kubernetes' };
  }
  if (o.shards !== undefined && whole(o.shards, '--shards', 1) !== 1) {
    throw new ShardError(`--shards ${o.shards} needs the shard's own number: --shard I/N, a Slurm job array or a Kubernetes Indexed Job`);
  }
  return { index: 0, count: 1, source: 'default' };
}

/** The units [start, end) of shard `index` (from 0) of `count` over `units` units. */
export function shardRange(units: number, index: number, count: number): { start: number; end: number } {
  return { start: Math.floor((index * units) / count), end: Math.floor(((index + 1) * units) / count) };
}

/** The folder name of a shard inside the output folder: shard-0002-of-0004. */
export function shardFolder(index: number, count: number): string {
  const w = Math.max(4, String(count).length);
  return `shard-${String(index + 1).padStart(w, '0')}-of-${String(count).padStart(w, '0')}`;
}
