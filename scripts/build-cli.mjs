#!/usr/bin/env node
// Builds the `ripplewise` command into dist/cli/ (run by `npm ci` and `npm install` as the
// `prepare` step, and by `npm run build:cli`): ES modules of src/cli/main.ts split at every
// dynamic import (the sources and the small libraries; exceljs stays outside and is loaded on
// first use), the Monte Carlo worker, the kernel worker, and sources.json, the modification times
// of every source file the bundle was built from. main.mjs holds commander and the commands'
// declarations (src/cli/register) only; each command's module (src/cli/commands), with the
// readers, the engine and the report writers it needs, is a chunk loaded when the command runs,
// so `--help` parses a small file. bin/ripplewise.mjs runs the bundle only while no source file
// is newer than it was at build time; otherwise it runs the sources through tsx (see
// src/cli/README.md), so a stale build is never run.
import { copyFileSync, mkdirSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const out = join(root, 'dist/cli');
let esbuild;
try {
  esbuild = await import('esbuild');
} catch {
  // Installed without the build tools (production install): the command runs from the sources.
  console.warn('build-cli: esbuild is not installed; ripplewise will run its TypeScript sources through tsx');
  process.exit(0);
}
mkdirSync(out, { recursive: true });
// Chunks of an earlier build (their names carry a hash) are removed before writing the new ones.
for (const f of readdirSync(out)) if (f.startsWith('chunk-') && f.endsWith('.mjs')) rmSync(join(out, f));
const started = Date.now();
const result = await esbuild.build({
  absWorkingDir: root,
  entryPoints: { main: 'src/cli/main.ts', 'montecarlo-worker': 'src/parallel/montecarlo-node-worker.ts' },
  outdir: out,
  outExtension: { '.js': '.mjs' },
  bundle: true,
  platform: 'node',
  format: 'esm',
  // Each command's module becomes a chunk of its own, loaded by its dynamic import.
  splitting: true,
  chunkNames: 'chunk-[name]-[hash]',
  target: 'node20',
  // exceljs is large and needed only for workbooks written or opened whole: loaded on first use.
  external: ['exceljs', 'tsx', 'tsx/*'],
  define: { RIPPLEWISE_COMPILED: 'true' },
  // Libraries written as CommonJS call require inside an ES module bundle.
  banner: { js: "import { createRequire as __rwRequire } from 'node:module'; const require = __rwRequire(import.meta.url);" },
  metafile: true,
  logLevel: 'warning',
  legalComments: 'none',
  minifyWhitespace: true,
  minifySyntax: true,
});
copyFileSync(join(root, 'src/parallel/kernel-worker.mjs'), join(out, 'kernel-worker.mjs'));
const files = {};
for (const input of Object.keys(result.metafile.inputs)) {
  if (input.includes('node_modules/')) continue;
  files[input] = statSync(join(root, input)).mtimeMs;
}
for (const extra of ['src/parallel/kernel-worker.mjs', 'package.json', 'scripts/build-cli.mjs']) files[extra] = statSync(join(root, extra)).mtimeMs;
// What a start (`--help`, or any command before its own module loads) parses: main.mjs and the
// chunks it imports statically, with the source files in them (test/resource/compiled.test.ts
// checks that no reader, report writer or heavy library is among them).
const mainOut = Object.keys(result.metafile.outputs).find((k) => k.endsWith('/main.mjs'));
const startup = { files: 0, bytes: 0, inputs: new Set() };
for (const seen = new Set(), todo = [mainOut]; todo.length; ) {
  const k = todo.pop();
  if (seen.has(k)) continue;
  seen.add(k);
  const o = result.metafile.outputs[k];
  startup.files++;
  startup.bytes += o.bytes;
  for (const i of Object.keys(o.inputs)) startup.inputs.add(i);
  for (const i of o.imports) if (i.kind === 'import-statement' && result.metafile.outputs[i.path]) todo.push(i.path);
}
writeFileSync(
  join(out, 'sources.json'),
  JSON.stringify({ built: new Date().toISOString(), files, startup: { files: startup.files, bytes: startup.bytes, inputs: [...startup.inputs].sort() } }, null, 1),
);
console.log(
  `build-cli: ${relative(root, out)}/main.mjs from ${Object.keys(files).length} source files in ${Date.now() - started} ms; a start loads ${startup.files} files, ${(startup.bytes / 1024).toFixed(0)} KB`,
);
