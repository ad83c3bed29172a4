/** A GNU parallel command line: every shard on this machine (or on --sshlogin hosts), then the merge. */
import type { TemplateOptions } from './index';
import { shellLine, shellWord } from './index';

export function parallelTemplate(o: TemplateOptions): string {
  const jobs = o.jobs ?? o.shards;
  const shards = Array.from({ length: o.shards }, (_, i) => String(i + 1)).join(' ');
  const run = `${shellLine([...o.program, 'sweep', o.plan, '--out', o.out])} --shard {}/${o.shards}`;
  const merge = shellLine([...o.program, 'sweep', 'merge', o.out, '--out', o.merged]);
  return `# A Ripplewise sweep with GNU parallel: ${o.shards} shards, ${jobs} at a time, then the merge.
# Run it again after a failure: finished shards are kept, unfinished ones resume.
# Across machines that share the folder ${shellWord(o.out)}: add --sshlogin host1,host2 (and --workdir .).
parallel --quote --jobs ${jobs} --halt now,fail=1 ${run} ::: ${shards} && ${merge}
`;
}
