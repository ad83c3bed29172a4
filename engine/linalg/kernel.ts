/**
 * The dense kernel under the LU, the blocked solves and the inverse: C ← C − A B on blocks of
 * one workspace array, done either in pure JavaScript (`gemm.ts`) or in WebAssembly SIMD
 * (f64x2, `assembly/kernels.ts`, embedded in `wasm-module.ts`). Both follow the same order of
 * operations and give the same bits; the choice changes speed only.
 *
 * The choice is explicit: `setKernel('js' | 'wasm' | 'auto' | kernel)`. Under `'auto'` (the
 * default) the WebAssembly kernel is used for matrices of at least `WASM_MIN_N` rows when the
 * runtime validates SIMD, and the JavaScript kernel otherwise. `kernelInfo()` says what is
 * available and chosen. A parallel kernel (worker threads over a shared memory) lives outside
 * the engine (src/parallel/ in Node, a web-worker counterpart in the browser) and plugs in
 * through the same `DenseKernel` interface.
 *
 * @example
 * setKernel('js');                 // force pure JavaScript (for a comparison)
 * new LU(a).solve(b);
 * setKernel('auto');
 * kernelInfo(); // { simd: true, choice: 'auto', ... }
 */
import { InputError } from '../errors';
import { gemmSub } from './gemm';
import { KERNELS_WASM_PRIVATE, KERNELS_WASM_SHARED } from './wasm-module';

/** A run of doubles the kernel computes on, with C ← C − A B on blocks inside it. */
export interface Workspace {
  /** The doubles (index 0 is the workspace's first element). */
  readonly f64: Float64Array;
  /**
   * C ← C − A B with C `m × n`, A `m × k`, B `k × n`, all blocks of `f64` given by element
   * offsets and leading dimensions.
   */
  gemmSub(m: number, n: number, k: number, aOff: number, lda: number, bOff: number, ldb: number, cOff: number, ldc: number): void;
  /**
   * Optional fast paths for the narrow pieces of the LU, computing on `f64` with the same
   * element operations as the JavaScript in lu.ts (so the same bits): `panel` factors columns
   * c0..c1−1 of the n × n matrix at offset 0 (the pivots into `piv`, returning LAPACK's info,
   * or null when it cannot), `lowerBase` and `upperBase` solve with a small triangle.
   */
  panel?(n: number, c0: number, c1: number, piv: Int32Array, info: number): number | null;
  lowerBase?(m: number, r: number, lOff: number, ldl: number, xOff: number, ldx: number, unit: boolean): void;
  upperBase?(m: number, r: number, lOff: number, ldl: number, xOff: number, ldx: number, unit: boolean): void;
  /** True when `f64` lives in memory that other threads can see (copy results out of it). */
  readonly shared: boolean;
  /** Give the memory back (the workspace must not be used afterwards). */
  release(): void;
}

export interface DenseKernel {
  /** 'js', 'wasm-simd', or a parallel kernel's own name. */
  readonly name: string;
  /** A zero-filled workspace of `length` doubles. */
  workspace(length: number): Workspace;
  /** A workspace over an existing array, without copying (kernels that compute on any array). */
  adopt?(data: Float64Array): Workspace;
}

const owners = new WeakMap<Float64Array, { ws: Workspace; kernel: DenseKernel }>();

/** Remember that `ws.f64` belongs to `kernel` (so that an LU can factor it in place). */
export function registerWorkspace(kernel: DenseKernel, ws: Workspace): Workspace {
  owners.set(ws.f64, { ws, kernel });
  return ws;
}

/** The workspace that owns this array, if a kernel made it. */
export function workspaceOf(f64: Float64Array): { ws: Workspace; kernel: DenseKernel } | undefined {
  return owners.get(f64);
}

/** Below this order the automatic choice keeps to JavaScript (copying in costs more than it saves). */
export const WASM_MIN_N = 96;

// ---------------------------------------------------------------------------------------------
// Pure JavaScript.

function jsWorkspace(f64: Float64Array): Workspace {
  return {
    f64,
    shared: false,
    gemmSub: (m, n, k, aOff, lda, bOff, ldb, cOff, ldc) => gemmSub(m, n, k, f64, aOff, lda, f64, bOff, ldb, f64, cOff, ldc),
    release: () => undefined,
  };
}

export const jsKernel: DenseKernel = {
  name: 'js',
  workspace: (length) => jsWorkspace(new Float64Array(length)),
  adopt: (data) => jsWorkspace(data),
};

// ---------------------------------------------------------------------------------------------
// WebAssembly, through the global that Node and browsers both have (typed here because the
// engine is compiled against ES2022 alone).

export interface WasmMemoryLike {
  readonly buffer: ArrayBuffer | SharedArrayBuffer;
  grow(pages: number): number;
}
interface WasmInstanceLike {
  exports: Record<string, unknown>;
}
export interface WasmApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => WasmInstanceLike;
  Memory: new (d: { initial: number; maximum?: number; shared?: boolean }) => WasmMemoryLike;
  validate(bytes: Uint8Array): boolean;
}

/** The exports of the compiled kernels. */
export interface KernelExports {
  gemmSub(m: number, n: number, k: number, aOff: number, lda: number, bOff: number, ldb: number, cOff: number, ldc: number, pack: number): void;
  panelBase(n: number, c0: number, c1: number, a: number, buf: number, piv: number, info: number): number;
  lowerBase(m: number, r: number, l: number, ldl: number, x: number, ldx: number, unit: number): void;
  upperBase(m: number, r: number, l: number, ldl: number, x: number, ldx: number, unit: number): void;
  kc(): number;
  packLength(): number;
}

/**
 * The narrow LU pieces of a workspace whose doubles start at byte 0 of `memory`, using the
 * scratch area at element offset `pack` (`packDoubles` long) of one thread.
 */
export function wasmLuPieces(
  ex: KernelExports,
  memory: WasmMemoryLike,
  pack: number,
  packDoubles: number,
): Pick<Workspace, 'panel' | 'lowerBase' | 'upperBase'> {
  return {
    panel: (n, c0, c1, piv, info) => {
      const w = c1 - c0;
      const need = align8((n - c0) * w);
      if (need + 8 > packDoubles) return null;
      const pivAt = (pack + need) * 2; // i32 element offset
      const r = ex.panelBase(n, c0, c1, 0, pack, pivAt, info);
      const view = new Int32Array(memory.buffer, pivAt * 4, w);
      for (let k = 0; k < w; k++) piv[c0 + k] = view[k]!;
      return r;
    },
    lowerBase: (m, r, lOff, ldl, xOff, ldx, unit) => ex.lowerBase(m, r, lOff, ldl, xOff, ldx, unit ? 1 : 0),
    upperBase: (m, r, lOff, ldl, xOff, ldx, unit) => ex.upperBase(m, r, lOff, ldl, xOff, ldx, unit ? 1 : 0),
  };
}

const PAGE = 65536;
/** The most doubles a 32-bit memory can hold (4 GiB). */
const MAX_DOUBLES = (65536 * PAGE) / 8;

function wasmApi(): WasmApi | undefined {
  const w = (globalThis as unknown as { WebAssembly?: WasmApi }).WebAssembly;
  return w && typeof w.Module === 'function' && typeof w.validate === 'function' ? w : undefined;
}

/** Decode base64 without atob or Buffer (neither is in the engine's library). */
export function decodeBase64(s: string): Uint8Array<ArrayBuffer> {
  const code = (c: number): number =>
    c >= 65 && c <= 90 ? c - 65 : c >= 97 && c <= 122 ? c - 71 : c >= 48 && c <= 57 ? c + 4 : c === 43 ? 62 : c === 47 ? 63 : -1;
  let len = s.length;
  while (len > 0 && s.charCodeAt(len - 1) === 61) len--;
  const out = new Uint8Array((len * 3) >> 2);
  let o = 0;
  let acc = 0;
  let bits = 0;
  for (let i = 0; i < len; i++) {
    const v = code(s.charCodeAt(i));
    if (v < 0) throw new InputError('bad-base64', `not base64 at position ${i + 1}`);
    acc = (acc << 6) | v;
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      out[o++] = (acc >> bits) & 255;
    }
  }
  return out;
}

let api: WasmApi | undefined;
let privateModule: object | null | undefined;
let sharedModule: object | null | undefined;
let packDoubles = 0;

function compile(base64: string): object | null {
  const w = wasmApi();
  if (!w) return null;
  try {
    const bytes = decodeBase64(base64);
    if (!w.validate(bytes)) return null;
    return new w.Module(bytes);
  } catch {
    // No SIMD, or a main thread that refuses synchronous compilation: JavaScript it is.
    return null;
  }
}

function loadPrivate(): object | null {
  if (privateModule === undefined) {
    privateModule = compile(KERNELS_WASM_PRIVATE);
    if (privateModule) {
      api = wasmApi()!;
      const probe = new api.Instance(privateModule, { env: { memory: new api.Memory({ initial: 1 }) } });
      packDoubles = (probe.exports as unknown as KernelExports).packLength();
    }
  }
  return privateModule;
}

/** The compiled shared-memory variant (for worker pools), or null when SIMD or threads are missing. */
export function sharedKernelModule(): object | null {
  if (sharedModule === undefined) sharedModule = compile(KERNELS_WASM_SHARED);
  return sharedModule;
}

/** True when this runtime runs the WebAssembly SIMD kernel. */
export function wasmSimdAvailable(): boolean {
  return loadPrivate() !== null;
}

/** Doubles of scratch each thread of the WebAssembly kernel needs. */
export function wasmPackDoubles(): number {
  loadPrivate();
  return packDoubles;
}

/** Round a count of doubles up to a multiple of 8 (64 bytes). */
export function align8(k: number): number {
  return Math.ceil(k / 8) * 8;
}

function wasmWorkspace(length: number): Workspace {
  const w = api!;
  const mod = loadPrivate()!;
  const pack = align8(length);
  const total = pack + packDoubles;
  if (total > MAX_DOUBLES) {
    // Larger than a 32-bit memory: compute in JavaScript instead (same results).
    return jsKernel.workspace(length);
  }
  let memory: WasmMemoryLike;
  try {
    memory = new w.Memory({ initial: Math.ceil((total * 8) / PAGE) });
  } catch {
    // The runtime would not give that much memory at once: JavaScript (same results).
    return jsKernel.workspace(length);
  }
  const ex = new w.Instance(mod, { env: { memory } }).exports as unknown as KernelExports;
  const f64 = new Float64Array(memory.buffer as ArrayBuffer, 0, length);
  return registerWorkspace(wasmSingleton, {
    f64,
    shared: false,
    gemmSub: (m, n, k, aOff, lda, bOff, ldb, cOff, ldc) => {
      if (m > 0 && n > 0 && k > 0) ex.gemmSub(m, n, k, aOff, lda, bOff, ldb, cOff, ldc, pack);
    },
    ...wasmLuPieces(ex, memory, pack, packDoubles),
    release: () => undefined,
  });
}

/** The WebAssembly SIMD kernel, or null where the runtime lacks SIMD. */
export function wasmKernel(): DenseKernel | null {
  if (!loadPrivate()) return null;
  return wasmSingleton;
}

const wasmSingleton: DenseKernel = { name: 'wasm-simd', workspace: wasmWorkspace };

// ---------------------------------------------------------------------------------------------
// The choice.

export type KernelChoice = 'auto' | 'js' | 'wasm';

let choice: KernelChoice = 'auto';
let custom: DenseKernel | null = null;

/**
 * Choose the kernel for every LU made from now on: 'js', 'wasm' (an `InputError` where the
 * runtime lacks WebAssembly SIMD), 'auto', or a kernel object (a parallel pool).
 */
export function setKernel(k: KernelChoice | DenseKernel): void {
  if (typeof k === 'object') {
    custom = k;
    return;
  }
  if (k !== 'auto' && k !== 'js' && k !== 'wasm') {
    throw new InputError('bad-kernel', `unknown kernel '${String(k)}'`, {}, "Use 'auto', 'js' or 'wasm'");
  }
  if (k === 'wasm' && !wasmSimdAvailable()) {
    throw new InputError('no-simd', 'this runtime has no WebAssembly SIMD', {}, "Use 'js' or 'auto'");
  }
  custom = null;
  choice = k;
}

/** The kernel an LU of order n uses under the current choice. */
export function kernelFor(n: number): DenseKernel {
  if (custom) return custom;
  if (choice === 'js') return jsKernel;
  if (choice === 'wasm') return wasmKernel() ?? jsKernel;
  return n >= WASM_MIN_N ? (wasmKernel() ?? jsKernel) : jsKernel;
}

export interface KernelInfo {
  /** Whether WebAssembly SIMD runs here. */
  simd: boolean;
  /** The current choice ('custom' when a kernel object was set). */
  choice: KernelChoice | 'custom';
  /** The kernel a large matrix gets now. */
  large: string;
  /** The kernel a small matrix (below WASM_MIN_N) gets now. */
  small: string;
}

export function kernelInfo(): KernelInfo {
  return {
    simd: wasmSimdAvailable(),
    choice: custom ? 'custom' : choice,
    large: kernelFor(Number.MAX_SAFE_INTEGER).name,
    small: kernelFor(1).name,
  };
}
