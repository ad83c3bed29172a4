#!/usr/bin/env node
// The `ripplewise` command. It runs the TypeScript sources directly: tsx's ESM loader is
// registered in this process (tsx is a runtime dependency, so this works after `npm ci`), then
// src/cli/main.ts parses the arguments and sets the exit code (0 success, 1 the table failed its
// checks, 2 a usage or input error).
import { readFileSync } from 'node:fs';

const argv = process.argv.slice(2);
if (argv.length === 1 && (argv[0] === '--version' || argv[0] === '-V')) {
  // The version alone needs no TypeScript.
  process.stdout.write(`${JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')).version}\n`);
} else {
  const { register } = await import('tsx/esm/api');
  register();
  const { main } = await import('../src/cli/main.ts');
  process.exitCode = await main(argv);
}
