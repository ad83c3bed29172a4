/**
 * The report code runs in the browser too (the workbench exports the same reports): nothing under
 * src/report, or anything it imports, may import a Node module, and exceljs is loaded only by a
 * dynamic import. Checked on the import graph from src/report/index.ts.
 */
import { existsSync, readFileSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { dirname, join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from '../cli/harness';
import { sha256Hex, digestHex } from '../../src/report/sha256';
import { createHash, randomBytes } from 'node:crypto';

function resolveTs(from: string, spec: string): string {
  const base = resolve(dirname(from), spec);
  for (const c of [`${base}.ts`, join(base, 'index.ts'), base]) if (existsSync(c) && c.endsWith('.ts')) return c;
  throw new Error(`cannot resolve ${spec} from ${from}`);
}

function graph(entry: string) {
  const seen = new Set<string>();
  const external: { file: string; spec: string; dynamic: boolean; typeOnly: boolean }[] = [];
  const stack = [entry];
  while (stack.length) {
    const f = stack.pop()!;
    if (seen.has(f)) continue;
    seen.add(f);
    const src = readFileSync(f, 'utf8');
    for (const m of src.matchAll(/^\s*(import|export)\s+(type\s+)?[^'"]*?from\s+'([^']+)'/gm)) {
      const spec = m[3]!;
      if (spec.startsWith('.')) stack.push(resolveTs(f, spec));
      else external.push({ file: f, spec, dynamic: false, typeOnly: !!m[2] });
    }
    for (const m of src.matchAll(/import\(\s*'([^']+)'\s*\)/g)) {
      const spec = m[1]!;
      if (spec.startsWith('.')) stack.push(resolveTs(f, spec));
      // import('x') is a dynamic import, or a type (`typeof import('x')`): never loaded with the module.
      else external.push({ file: f, spec, dynamic: true, typeOnly: false });
    }
  }
  return { files: [...seen], external };
}

describe('src/report is browser-safe', () => {
  it('imports no Node module anywhere in its import graph; exceljs only dynamically', () => {
    const { files, external } = graph(join(ROOT, 'src/report/index.ts'));
    expect(files.length).toBeGreaterThan(15);
    expect(files.some((f) => f.includes('/src/io/'))).toBe(true);
    const builtins = new Set(builtinModules);
    for (const x of external) {
      expect(x.spec.startsWith('node:') || builtins.has(x.spec), `${x.file} imports ${x.spec}`).toBe(false);
      if (x.spec === 'exceljs') expect(x.dynamic || x.typeOnly, `${x.file} imports exceljs statically`).toBe(true);
    }
    expect(external.some((x) => x.spec === 'exceljs' && x.dynamic)).toBe(true);
  });

  it('hashes as node:crypto does, synchronously and through Web Crypto (source: node:crypto; FIPS 180-4 test vector for "abc")', async () => {
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    for (const n of [0, 1, 55, 56, 63, 64, 65, 119, 1000, 65537]) {
      const b = new Uint8Array(randomBytes(n));
      const want = createHash('sha256').update(b).digest('hex');
      expect(sha256Hex(b), `${n} bytes`).toBe(want);
      expect(await digestHex(b), `${n} bytes`).toBe(want);
    }
  });
});
