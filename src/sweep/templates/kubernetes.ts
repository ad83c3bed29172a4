/** A Kubernetes Indexed Job: one pod per shard, JOB_COMPLETION_INDEX from Kubernetes, the count by --shards. */
import type { TemplateOptions } from './index';

const q = (s: string) => JSON.stringify(s);

export function kubernetesTemplate(o: TemplateOptions): string {
  const command = [...o.program, 'sweep', o.plan, '--out', o.out, '--shards', String(o.shards)];
  return `# A Ripplewise sweep as a Kubernetes Indexed Job: ${o.shards} completions, one shard each.
# Kubernetes sets JOB_COMPLETION_INDEX (0 to ${o.shards - 1}) in each pod; --shards gives the count.
# The image is the one the Dockerfile of \`ripplewise sweep template dockerfile\` builds.
# The plan, its tables and scenarios, and the output folder live on the volume 'work' (a
# PersistentVolumeClaim every pod can write: ReadWriteMany). A pod that fails is started again
# and redoes only its unfinished units.
# Apply:  kubectl apply -f this-file.yaml
# Then:   ${[...o.program, 'sweep', 'merge', o.out, '--out', o.merged].join(' ')}   (in a pod or where the volume is mounted)
apiVersion: batch/v1
kind: Job
metadata:
  name: ripplewise-sweep
  labels:
    app: ripplewise-sweep
spec:
  completionMode: Indexed
  completions: ${o.shards}
  parallelism: ${o.shards}
  backoffLimitPerIndex: 3
  maxFailedIndexes: 0
  template:
    metadata:
      labels:
        app: ripplewise-sweep
    spec:
      restartPolicy: Never
      containers:
        - name: sweep
          image: ${q(o.image)}
          workingDir: /work
          command: [${command.map(q).join(', ')}]
          resources:
            requests:
              cpu: "1"
              memory: 2Gi
            limits:
              memory: 2Gi
          volumeMounts:
            - name: work
              mountPath: /work
      volumes:
        - name: work
          persistentVolumeClaim:
            claimName: ripplewise-sweep-work
`;
}
