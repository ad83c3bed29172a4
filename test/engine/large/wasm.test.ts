/**
 * The WebAssembly SIMD kernel and the pure-JS kernel: the committed module matches its source,
 * both follow the same order of operations (so they give the same bits, checked here to
 * 1e-12 and to equality), the LU gives the same factors with either, and the choice between
 * them is explicit, with a JS fallback where WebAssembly SIMD is missing. The plain triple loop
 * is the independent reference for the kernel (common practice).
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { KC, gemmSub } from '../../../engine/linalg/gemm';
import { decodeBase64, jsKernel, kernelFor, kernelInfo, setKernel, wasmKernel, wasmSimdAvailable } from '../../../engine/linalg/kernel';
import { KERNELS_SOURCE_SHA256, KERNELS_WASM_PRIVATE, KERNELS_WASM_SHARED } from '../../../engine/linalg/wasm-module';
import { LU } from '../../../engine/linalg/lu';
import { InputError } from '../../../engine/errors';
import { randomMatrix, rng } from '../../helpers/random';

const root = new URL('../../../', import.meta.url);

afterEach(() => setKernel('auto'));

describe('the committed WebAssembly module', () => {
  it('was built from the committed source (hash), and a fresh build gives the same bytes', () => {
    const src = readFileSync(new URL('assembly/kernels.ts', root));
    expect(createHash('sha256').update(src).digest('hex')).toBe(KERNELS_SOURCE_SHA256);
    const out = execFileSync(process.execPath, ['scripts/build-wasm.mjs', '--check'], { cwd: root, encoding: 'utf8' });
    expect(out).toMatch(/matches/);
  }, 60_000);

  it('decodes from base64 as Node does, and is valid WebAssembly with SIMD here', () => {
    for (const b64 of [KERNELS_WASM_PRIVATE, KERNELS_WASM_SHARED]) {
      const bytes = decodeBase64(b64);
      expect(Buffer.from(bytes).equals(Buffer.from(b64, 'base64'))).toBe(true);
      expect(WebAssembly.validate(bytes)).toBe(true);
    }
    expect(wasmSimdAvailable()).toBe(true);
    const ex = new WebAssembly.Instance(new WebAssembly.Module(decodeBase64(KERNELS_WASM_PRIVATE)), { env: { memory: new WebAssembly.Memory({ initial: 1 }) } }).exports as { kc(): number };
    expect(ex.kc()).toBe(KC);
  });
});

describe('WASM and JS kernels', () => {
  it('give the same C − A B on odd shapes and offsets, and match the triple loop', () => {
    const r = rng(17);
    const ws = wasmKernel()!.workspace(400_000);
    for (const [m, n, k] of [[1, 1, 1], [3, 5, 7], [2, 600, 130], [7, 3, 257], [97, 131, 513], [5, 4, 300], [130, 7, 9], [64, 64, 256]] as const) {
      const lda = k + 3, ldb = n + 1, ldc = n + 5;
      const aOff = 11, bOff = aOff + m * lda + 7, cOff = bOff + k * ldb + 5;
      const len = cOff + m * ldc + 10;
      const f = ws.f64;
      for (let i = 0; i < len; i++) f[i] = r() - 0.5;
      const js = f.slice(0, len);
      const ref = f.slice(0, len);
      for (let i = 0; i < m; i++) {
        for (let j = 0; j < n; j++) {
          let s = 0;
          for (let p = 0; p < k; p++) s += ref[aOff + i * lda + p]! * ref[bOff + p * ldb + j]!;
          ref[cOff + i * ldc + j] = ref[cOff + i * ldc + j]! - s;
        }
      }
      gemmSub(m, n, k, js, aOff, lda, js, bOff, ldb, js, cOff, ldc);
      ws.gemmSub(m, n, k, aOff, lda, bOff, ldb, cOff, ldc);
      let diff = 0;
      let same = true;
      for (let i = 0; i < len; i++) {
        diff = Math.max(diff, Math.abs(js[i]! - f[i]!));
        if (!Object.is(js[i], f[i])) same = false;
        expect(Math.abs(js[i]! - ref[i]!)).toBeLessThan(1e-12);
      }
      expect(diff).toBeLessThanOrEqual(1e-12);
      expect(same).toBe(true);
    }
  });

  it('propagate NaN and infinity alike', () => {
    const ws = wasmKernel()!.workspace(64);
    const f = ws.f64;
    f.set([Infinity, 0, NaN, 1, 0, 2, 5, 5, 5, 5]);
    const js = f.slice();
    // C (1 × 2 at 6) −= A (1 × 2 at 0) B (2 × 2 at 2)
    gemmSub(1, 2, 2, js, 0, 2, js, 2, 2, js, 6, 2);
    ws.gemmSub(1, 2, 2, 0, 2, 2, 2, 6, 2);
    expect(Array.from(f.subarray(6, 8))).toEqual(Array.from(js.subarray(6, 8)));
    expect(Number.isNaN(f[6]!)).toBe(true);
  });

  it('give the same LU factors, solves and inverse', () => {
    for (const n of [97, 150, 301]) {
      const a = randomMatrix(n, n, 0);
      setKernel('js');
      const lj = new LU(a);
      const B = randomMatrix(n, 3).data.subarray(0, n * 20);
      const xj = lj.solveMany({ rows: n, cols: 20, data: Float64Array.from(B) });
      const ij = lj.inverse();
      setKernel('wasm');
      const lw = new LU(a);
      expect(lw.kernel.name).toBe('wasm-simd');
      expect(lj.kernel.name).toBe('js');
      const xw = lw.solveMany({ rows: n, cols: 20, data: Float64Array.from(B) });
      const iw = lw.inverse();
      expect(Array.from(lw.pivots)).toEqual(Array.from(lj.pivots));
      let d = 0;
      for (let k = 0; k < n * n; k++) d = Math.max(d, Math.abs(lw.lu[k]! - lj.lu[k]!), Math.abs(iw.data[k]! - ij.data[k]!));
      for (let k = 0; k < n * 20; k++) d = Math.max(d, Math.abs(xw.data[k]! - xj.data[k]!));
      expect(d).toBeLessThanOrEqual(1e-12);
      expect(d).toBe(0);
    }
  });
});

describe('WASM and JS kernels on singular matrices', () => {
  it('report the same first zero pivot (LAPACK info) and the same factors', () => {
    const n = 200;
    // A zero column (column 31: exactly singular) and, separately, a row repeated (rows 50 and
    // 120: singular in exact arithmetic, rounding usually leaves a tiny pivot).
    const zeroCol = randomMatrix(n, 9, 0);
    for (let i = 0; i < n; i++) zeroCol.data[i * n + 30] = 0;
    const twin = randomMatrix(n, 10, 0);
    twin.data.copyWithin(119 * n, 49 * n, 50 * n);
    for (const a of [zeroCol, twin]) {
      setKernel('js');
      const j = new LU(a);
      setKernel('wasm');
      const w = new LU(a);
      expect(w.singularColumn).toBe(j.singularColumn);
      expect(Array.from(w.pivots)).toEqual(Array.from(j.pivots));
      expect(w.lu).toEqual(j.lu);
    }
    setKernel('wasm');
    expect(new LU(zeroCol).singularColumn).toBe(31);
  });
});

describe('the choice of kernel', () => {
  it('is explicit and reported', () => {
    expect(kernelInfo()).toEqual({ simd: true, choice: 'auto', large: 'wasm-simd', small: 'js' });
    setKernel('js');
    expect(kernelFor(5000).name).toBe('js');
    expect(new LU(randomMatrix(200, 1)).kernel).toBe(jsKernel);
    setKernel('wasm');
    expect(kernelFor(2).name).toBe('wasm-simd');
    expect(() => setKernel('gpu' as 'js')).toThrow(InputError);
  });

  it('falls back to JavaScript where WebAssembly SIMD is missing', async () => {
    const saved = globalThis.WebAssembly;
    const a = randomMatrix(120, 4, 0);
    const b = Float64Array.from({ length: 120 }, (_, i) => i);
    setKernel('wasm');
    const expected = Array.from(new LU(a).solve(b));
    try {
      vi.resetModules();
      // A runtime whose WebAssembly rejects SIMD modules.
      vi.stubGlobal('WebAssembly', { ...saved, Module: saved.Module, validate: () => false });
      const k = await import('../../../engine/linalg/kernel');
      expect(k.wasmSimdAvailable()).toBe(false);
      expect(k.kernelFor(5000).name).toBe('js');
      expect(() => k.setKernel('wasm')).toThrow(/no WebAssembly SIMD/);
      vi.stubGlobal('WebAssembly', undefined);
      vi.resetModules();
      const k2 = await import('../../../engine/linalg/kernel');
      expect(k2.kernelInfo().simd).toBe(false);
      const { LU: LU2 } = await import('../../../engine/linalg/lu');
      const lu2 = new LU2(a);
      expect(lu2.kernel.name).toBe('js');
      expect(Array.from(lu2.solve(b))).toEqual(expected);
    } finally {
      vi.unstubAllGlobals();
      vi.resetModules();
    }
  });
});
