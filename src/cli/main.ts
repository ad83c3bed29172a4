/**
 * The `ripplewise` command: one subcommand per file in ./commands. `main(argv, ctx)` returns the
 * exit code (0 success, 1 the table failed its checks, 2 a usage or input error) and never
 * throws; bin/ripplewise.mjs sets it as the process's exit code.
 */
import { Command, CommanderError } from 'commander';
import { TOOL } from './options';
import type { CliContext } from './context';
import { processContext, styles, useColour } from './context';
import { EXIT_OK, EXIT_USAGE, errorReport } from './errors';
import { jsonText, terminalSafe } from './text';
import { parseLimits, setLimits } from '../io/limits';
import { register as aggregate } from './register/aggregate';
import { register as check } from './register/check';
import { register as coefficients } from './register/coefficients';
import { register as convert } from './register/convert';
import { register as extract } from './register/extract';
import { register as impact } from './register/impact';
import { register as linkages } from './register/linkages';
import { register as multipliers } from './register/multipliers';
import { register as price } from './register/price';
import { register as report } from './register/report';
import { register as requirements } from './register/requirements';
import { register as uncertainty } from './register/uncertainty';
import { register as regionalise } from './register/regionalise';
import { register as balance } from './register/balance';
import { register as sweep } from './register/sweep';

/** A command's action: it returns its exit code. */
export type Action = (ctx: CliContext) => Promise<number>;

export function program(ctx: CliContext, run: (a: Action, json: boolean) => void): Command {
  const p = new Command('ripplewise');
  p.description(
    'Input-output economics on your own machine: check tables, derive coefficients and total requirements, multipliers, scenario impacts, linkages, prices, extraction, and self-contained reports.',
  )
    .version(TOOL.version, '-V, --version', 'print the version')
    .helpOption('-h, --help', 'show help')
    .showSuggestionAfterError(true)
    .exitOverride()
    .configureOutput({
      writeOut: (s) => void ctx.stdout.write(terminalSafe(s)),
      writeErr: (s) => void ctx.stderr.write(terminalSafe(s)),
      getOutHasColors: () => useColour(ctx, ctx.stdout),
      getErrHasColors: () => useColour(ctx, ctx.stderr),
      outputError: (s, write) => write(`${styles(useColour(ctx, ctx.stderr)).red('error:')} ${s.replace(/^error: /, '')}`),
    })
    .addHelpText(
      'after',
      `
Exit codes: 0 success, 1 the table failed its checks, 2 a usage or input error.
Every command takes --json for machine-readable output; '-' reads standard input or writes standard output.
Results rest on fixed coefficients, no capacity limits, gross (not net) effects; they are not a forecast.
Have a qualified economist review them and follow local guidance first.

Examples:
  $ ripplewise check table.csv
  $ ripplewise multipliers table.xlsx --sheet IO --json
  $ ripplewise impact table.csv --scenario scenarios.json --out report.html
  $ ripplewise requirements --make make.txt --use use.txt --kind industry-by-commodity --out total.csv
`,
    );
  for (const r of [check, coefficients, requirements, multipliers, impact, uncertainty, linkages, price, extract, report, convert, aggregate, regionalise, balance]) r(p, run);
  sweep(p, run);
  return p;
}

/** Run the command line; returns the exit code. */
export async function main(argv: readonly string[], ctx: CliContext = processContext()): Promise<number> {
  let action: Action | undefined;
  let json = argv.includes('--json');
  try {
    // Limits raised for this run (RIPPLEWISE_LIMITS=maxSectors=20000,maxCells=2e8), else the defaults.
    setLimits(ctx.env.RIPPLEWISE_LIMITS ? parseLimits(ctx.env.RIPPLEWISE_LIMITS) : {});
  } catch (e) {
    return fail(ctx, e, json);
  }
  const p = program(ctx, (a, j) => {
    action = a;
    json = j;
  });
  try {
    await p.parseAsync([...argv], { from: 'user' });
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version') return EXIT_OK;
      // Help shown because no subcommand was given: a usage error.
      if (e.code === 'commander.help') return e.exitCode === 0 ? EXIT_OK : EXIT_USAGE;
      if (e.code === 'commander.executeSubCommandAsync') return EXIT_USAGE;
      // Commander has printed its message already.
      if (json) ctx.stdout.write(jsonText({ error: { code: e.code.replace(/^commander\./, ''), message: e.message.replace(/^error: /, ''), exitCode: EXIT_USAGE } }));
      return EXIT_USAGE;
    }
    return fail(ctx, e, json);
  }
  if (!action) {
    // No subcommand: show the help on standard error, as a usage error.
    ctx.stderr.write(p.helpInformation());
    return EXIT_USAGE;
  }
  try {
    return await action(ctx);
  } catch (e) {
    return fail(ctx, e, json);
  }
}

/**
 * The command as a process runs it (bin/ripplewise.mjs): `main` with the process's streams, and
 * a fault that escapes every handler (an error thrown in a callback, a promise rejected with no
 * one waiting) still ends as "internal error" with its id and exit 2, never as a stack trace.
 */
export async function runProcess(argv: readonly string[]): Promise<number> {
  const ctx = processContext();
  const json = argv.includes('--json');
  const fault = (e: unknown) => {
    process.exitCode = fail(ctx, e, json);
    process.exit();
  };
  process.on('uncaughtException', fault);
  process.on('unhandledRejection', fault);
  // A reader that stops early (`| head`) closes the pipe: that is the end, not a fault.
  for (const s of [process.stdout, process.stderr]) s.on('error', (e: NodeJS.ErrnoException) => (e.code === 'EPIPE' ? process.exit(process.exitCode ?? 0) : fault(e)));
  return main(argv, ctx);
}

function fail(ctx: CliContext, e: unknown, json: boolean): number {
  const r = errorReport(e);
  const s = styles(useColour(ctx, ctx.stderr));
  ctx.stderr.write(`${s.red('error:')} ${terminalSafe(r.message)}\n`);
  if (r.hint) ctx.stderr.write(`${s.dim('hint:')} ${terminalSafe(r.hint)}\n`);
  if (r.findings) {
    for (const f of r.findings.filter((x) => x.severity === 'error')) ctx.stderr.write(`  ${s.red('error')}   ${terminalSafe(`${f.code}: ${f.message}`)}\n`);
  }
  if (json) ctx.stdout.write(jsonText({ error: r }));
  return r.exitCode;
}
