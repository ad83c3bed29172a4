#!/usr/bin/env node
// Builds the `ripplewise` command into dist/cli/ (run by `npm ci` and `npm install` as the
// `prepare` step, and by `npm run build:cli`): one ES module bundle of src/cli/main.ts (the
// sources and the small libraries; exceljs stays outside and is loaded on first use), the Monte
// Carlo worker, the kernel worker, and sources.json, the modification times of every source
// file the bundle was built from. bin/ripplewise.mjs runs the bundle only while no source file
// is newer than it was at build time; otherwise it runs the sources through tsx (see
// src/cli/README.md), so a stale build is never run.
import { copyFileSync, mkdirSync, statSync, writeFileSync } from 'node:fs';
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
const started = Date.now();
const result = await esbuild.build({
  absWorkingDir: root,
  entryPoints: { main: 'src/cli/main.ts', 'montecarlo-worker': 'src/parallel/montecarlo-node-worker.ts' },
  outdir: out,
  outExtension: { '.js': '.mjs' },
  bundle: true,
  platform: 'node',
  format: 'esm',
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
writeFileSync(join(out, 'sources.json'), JSON.stringify({ built: new Date().toISOString(), files }, null, 1));
console.log(`build-cli: ${relative(root, out)}/main.mjs from ${Object.keys(files).length} source files in ${Date.now() - started} ms`);
