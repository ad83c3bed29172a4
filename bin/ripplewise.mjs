#!/usr/bin/env node
// The `ripplewise` command. It runs the compiled command in dist/cli/main.mjs (built by
// scripts/build-cli.mjs, the `prepare` step of `npm ci`, or `npm run build:cli`) while that build
// is current: no source file it was built from is newer than it was then (dist/cli/sources.json).
// Otherwise (no build yet, or a source edited since) it runs the TypeScript sources through tsx's
// loader (tsx is a runtime dependency), with a note on a terminal; RIPPLEWISE_SOURCES=1 asks for
// the sources always. src/cli/main.ts parses the arguments and sets the exit code (0 success,
// 1 the table failed its checks, 2 a usage or input error).
import { readFileSync, statSync } from 'node:fs';

const argv = process.argv.slice(2);
const root = new URL('../', import.meta.url);

/** Whether dist/cli/main.mjs was built from the sources as they are now. */
function buildIsCurrent() {
  if (process.env.RIPPLEWISE_SOURCES === '1') return false;
  try {
    const { files } = JSON.parse(readFileSync(new URL('dist/cli/sources.json', root), 'utf8'));
    for (const [file, mtime] of Object.entries(files)) if (statSync(new URL(file, root)).mtimeMs > mtime) return false;
    return true;
  } catch {
    return false;
  }
}

if (argv.length === 1 && (argv[0] === '--version' || argv[0] === '-V')) {
  // The version alone needs no program.
  process.stdout.write(`${JSON.parse(readFileSync(new URL('package.json', root), 'utf8')).version}\n`);
} else if (buildIsCurrent()) {
  const { runProcess } = await import(new URL('dist/cli/main.mjs', root).href);
  process.exitCode = await runProcess(argv);
} else {
  if (process.stderr.isTTY && process.env.RIPPLEWISE_SOURCES !== '1') {
    process.stderr.write('note: running the TypeScript sources (the build in dist/cli is missing or older than them; npm run build:cli makes it)\n');
  }
  const { register } = await import('tsx/esm/api');
  register();
  const { runProcess } = await import('../src/cli/main.ts');
  process.exitCode = await runProcess(argv);
}
