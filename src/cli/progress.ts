/**
 * Progress on long work: a cli-progress bar on standard error when it is a terminal, nothing at
 * all in a pipe or a file (and nothing under --json or CI=true either, where a bar is noise).
 */
import type { CliContext } from './context';
import { useColour } from './context';

export interface Progress {
  /** Start a named step (advances the bar by one). */
  step(name: string): void;
  /** Set the bar to done/total within the current run. */
  update(done: number, total: number): void;
  stop(): void;
  readonly active: boolean;
}

const SILENT: Progress = { step() {}, update() {}, stop() {}, active: false };

/** A progress bar of `total` steps, or a silent one when standard error is not a terminal (cli-progress is loaded only then). */
export async function progress(ctx: CliContext, title: string, total: number, o: { json?: boolean } = {}): Promise<Progress> {
  if (!ctx.stderr.isTTY || o.json || ctx.env.CI === 'true' || total < 1) return SILENT;
  const cliProgress = ((await import('cli-progress')) as unknown as { default: typeof import('cli-progress') }).default;
  const colour = useColour(ctx, ctx.stderr);
  const bar = new cliProgress.SingleBar(
    {
      format: `${title} {bar} {value}/{total} {step}`,
      stream: ctx.stderr as unknown as NodeJS.WritableStream,
      hideCursor: true,
      clearOnComplete: true,
      barsize: 24,
      noTTYOutput: false,
      ...(colour ? {} : { barCompleteChar: '#', barIncompleteChar: '.' }),
    },
    cliProgress.Presets.shades_classic,
  );
  let done = 0;
  let stopped = false;
  let size = total;
  bar.start(total, 0, { step: '' });
  return {
    active: true,
    step(name) {
      done = Math.min(size, done + 1);
      bar.update(done, { step: name });
    },
    update(d, t) {
      if (t !== size) {
        size = t;
        bar.setTotal(t);
      }
      done = d;
      bar.update(d);
    },
    stop() {
      if (stopped) return;
      stopped = true;
      bar.stop();
    },
  };
}
