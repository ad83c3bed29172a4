/** A Slurm job array script: one array task per shard; each task finds its shard in the environment. */
import type { TemplateOptions } from './index';
import { shellLine } from './index';

export function slurmTemplate(o: TemplateOptions): string {
  const run = shellLine([...o.program, 'sweep', o.plan, '--out', o.out]);
  const merge = shellLine([...o.program, 'sweep', 'merge', o.out, '--out', o.merged]);
  return `#!/bin/bash
# A Ripplewise sweep as a Slurm job array: ${o.shards} array tasks, one shard each.
# Each task reads its shard from SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_COUNT and
# SLURM_ARRAY_TASK_MIN, so keep the array contiguous (1-${o.shards}, no step or list).
# A task that fails or is requeued resumes: it redoes only the units it had not finished.
#
# Submit:                 sbatch this-file.sh
# When every task is done: ${merge}
#
# Change the time, memory and partition to your site's; one task uses one core.
#SBATCH --job-name=ripplewise-sweep
#SBATCH --array=1-${o.shards}
#SBATCH --cpus-per-task=1
#SBATCH --mem=2G
#SBATCH --time=04:00:00
#SBATCH --requeue
#SBATCH --output=ripplewise-sweep-%A_%a.log
set -euo pipefail

${run}
`;
}
