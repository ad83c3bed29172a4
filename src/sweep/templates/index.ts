/**
 * Templates for the schedulers people already run: a Slurm job array script, a Kubernetes
 * Indexed Job manifest, a GNU parallel command line, and the Dockerfile of the image the
 * Kubernetes Job runs. Each is text with the plan, the output folder and the shard count filled
 * in (shell words quoted), and comments that say what to change.
 */
import { dockerfileTemplate } from './dockerfile';
import { kubernetesTemplate } from './kubernetes';
import { parallelTemplate } from './parallel';
import { slurmTemplate } from './slurm';

export const TEMPLATE_KINDS = ['slurm', 'kubernetes', 'parallel', 'dockerfile'] as const;
export type TemplateKind = (typeof TEMPLATE_KINDS)[number];

export interface TemplateOptions {
  /** The plan file, as the job sees it. */
  plan: string;
  /** The folder the shards write to (shared by every task). */
  out: string;
  /** The combined Parquet file the merge writes. */
  merged: string;
  shards: number;
  /** The command that runs Ripplewise, as shell words (default `ripplewise`). */
  program: string[];
  /** The container image (Kubernetes). */
  image: string;
  /** Tasks at a time (GNU parallel; default: the shard count). */
  jobs?: number;
  toolVersion: string;
}

/** A word for a POSIX shell: unchanged when it is safe, else in single quotes. */
export function shellWord(s: string): string {
  return /^[A-Za-z0-9_@%+=:,./-]+$/.test(s) ? s : `'${s.replace(/'/g, `'\\''`)}'`;
}

export function shellLine(words: readonly string[]): string {
  return words.map(shellWord).join(' ');
}

export function template(kind: TemplateKind, o: TemplateOptions): string {
  switch (kind) {
    case 'slurm':
      return slurmTemplate(o);
    case 'kubernetes':
      return kubernetesTemplate(o);
    case 'parallel':
      return parallelTemplate(o);
    case 'dockerfile':
      return dockerfileTemplate(o);
  }
}
