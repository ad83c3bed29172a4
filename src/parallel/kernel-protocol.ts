/**
 * A parallel dense kernel: the WebAssembly SIMD GEMM run by the calling thread and by helper
 * threads (worker_threads in Node, Web Workers in the browser) on one shared WebAssembly
 * memory. It plugs into the engine as a `DenseKernel` (`setKernel(kernel)` or
 * `new LU(a, { kernel })`), so the LU's trailing updates and the blocked solves with many
 * right-hand sides are split between the threads.
 *
 * This file holds what Node and the browser share: the layout of the control block, the loop a
 * helper thread runs (`serveKernel`), and the kernel itself (`ParallelKernel`). It uses no Node
 * API; `kernel-node.ts` and `kernel-web.ts` only spawn the helpers.
 *
 * Protocol (one slot of `SLOT` Int32 per helper in a SharedArrayBuffer `control`):
 * 1. The caller posts `{ type: 'init', module, memory, control, slot }` (a compiled
 *    `WebAssembly.Module` of the shared-memory variant, the shared `WebAssembly.Memory`, the
 *    control buffer, the helper's slot number). The helper instantiates the module on the
 *    memory, posts `{ type: 'ready', slot }` and then waits on its slot with `Atomics.wait`.
 * 2. For each job the caller writes the arguments of `gemmSub` (ARGS…ARGS+9) and the op
 *    (OP_GEMM) into the slot, increments SEQ and notifies it; the helper runs the call and
 *    stores SEQ into DONE (and 1 into ERROR if the call threw), then notifies DONE. The caller
 *    does its own share meanwhile and waits on DONE.
 * 3. OP_STOP ends the helper's loop.
 *
 * Every element of C is computed by one thread with the depth uncut, in the kernel's order, so
 * the result is the same bits as with one thread.
 */
import type { DenseKernel, KernelExports, Workspace } from '../../engine/linalg/kernel';
import { align8, registerWorkspace, sharedKernelModule, wasmLuPieces, wasmPackDoubles } from '../../engine/linalg/kernel';

export const SLOT = 16;
export const SEQ = 0;
export const DONE = 1;
export const OP = 2;
export const ERROR = 3;
export const ARGS = 4; // 10 arguments: m, n, k, aOff, lda, bOff, ldb, cOff, ldc, pack
export const OP_GEMM = 1;
export const OP_STOP = 2;

/** Below this many multiply-adds a call is not worth splitting. */
export const SPLIT_MIN = 1 << 18;

export interface InitMessage {
  type: 'init';
  module: WebAssembly.Module;
  memory: WebAssembly.Memory;
  control: SharedArrayBuffer;
  slot: number;
}

export interface ReadyMessage {
  type: 'ready';
  slot: number;
}

/** The loop a helper thread runs after `init` (it returns on OP_STOP). */
export function serveKernel(control: SharedArrayBuffer, slot: number, ex: KernelExports): void {
  const ctl = new Int32Array(control);
  const b = slot * SLOT;
  let seen = Atomics.load(ctl, b + SEQ);
  for (;;) {
    Atomics.wait(ctl, b + SEQ, seen);
    const seq = Atomics.load(ctl, b + SEQ);
    if (seq === seen) continue;
    seen = seq;
    if (Atomics.load(ctl, b + OP) === OP_STOP) {
      Atomics.store(ctl, b + DONE, seq);
      Atomics.notify(ctl, b + DONE);
      return;
    }
    try {
      const a = (i: number) => ctl[b + ARGS + i]!;
      ex.gemmSub(a(0), a(1), a(2), a(3), a(4), a(5), a(6), a(7), a(8), a(9));
    } catch {
      Atomics.store(ctl, b + ERROR, 1);
    }
    Atomics.store(ctl, b + DONE, seq);
    Atomics.notify(ctl, b + DONE);
  }
}

/** A helper thread as the kernel sees it. */
export interface Helper {
  post(message: InitMessage): void;
  /** Resolves on the helper's `ready` message. */
  ready: Promise<void>;
  terminate(): void;
}

export interface ParallelOptions {
  /** Threads in all, the calling one included (default: the cores available, at least 1). */
  threads?: number;
  /** Largest size of the shared memory in 64 KiB pages (default 65536, that is 4 GiB). */
  maximumPages?: number;
}

const PAGE = 65536;

export class ParallelKernel implements DenseKernel {
  readonly name: string;
  readonly threads: number;
  private readonly ctl: Int32Array;
  private readonly ex: KernelExports;
  private readonly pack: number;
  private closed = false;
  /** Calls split between threads so far (for the benchmark and tests). */
  splitCalls = 0;

  private constructor(
    private readonly memory: WebAssembly.Memory,
    control: SharedArrayBuffer,
    private readonly helpers: Helper[],
    module: WebAssembly.Module,
  ) {
    this.threads = helpers.length + 1;
    this.name = `wasm-simd ×${this.threads} threads`;
    this.ctl = new Int32Array(control);
    this.ex = new WebAssembly.Instance(module, { env: { memory } }).exports as unknown as KernelExports;
    this.pack = wasmPackDoubles();
  }

  /** Start `threads − 1` helpers with `spawn` and resolve when all are ready. */
  static async start(spawn: (slot: number) => Helper, options: ParallelOptions & { threads: number }): Promise<ParallelKernel> {
    const module = sharedKernelModule() as WebAssembly.Module | null;
    if (!module) throw new Error('this runtime has no WebAssembly SIMD with shared memory; use the single-thread kernel');
    const threads = Math.max(1, Math.floor(options.threads));
    const memory = new WebAssembly.Memory({ initial: 1, maximum: options.maximumPages ?? 65536, shared: true });
    const control = new SharedArrayBuffer(Math.max(1, threads) * SLOT * 4);
    const helpers: Helper[] = [];
    for (let s = 0; s < threads - 1; s++) {
      const h = spawn(s);
      h.post({ type: 'init', module, memory, control, slot: s });
      helpers.push(h);
    }
    await Promise.all(helpers.map((h) => h.ready));
    const kernel = new ParallelKernel(memory, control, helpers, module);
    kernel.warmUp();
    return kernel;
  }

  /** A few split calls, so that every thread's code is optimised before the first real job. */
  private warmUp(): void {
    const s = 192;
    const ws = this.workspace(3 * s * s);
    for (let i = 0; i < ws.f64.length; i++) ws.f64[i] = ((i * 7919) % 1000) / 1000 - 0.5;
    for (let r = 0; r < 4; r++) ws.gemmSub(s, s, s, 0, s, s * s, s, 2 * s * s, s);
    this.splitCalls = 0;
  }

  /**
   * The workspace: the start of the shared memory, grown to fit. There is one at a time: a new
   * call hands out the same memory again, so copy results out before asking for another.
   */
  workspace(length: number): Workspace {
    if (this.closed) throw new Error('the parallel kernel has been closed');
    const base = align8(length);
    const total = base + this.threads * this.pack;
    const need = Math.ceil((total * 8) / PAGE);
    const have = this.memory.buffer.byteLength / PAGE;
    if (need > have) this.memory.grow(need - have);
    const f64 = new Float64Array(this.memory.buffer, 0, length);
    f64.fill(0);
    const ws: Workspace = {
      f64,
      shared: true,
      gemmSub: (m, n, k, aOff, lda, bOff, ldb, cOff, ldc) => this.gemm(base, m, n, k, aOff, lda, bOff, ldb, cOff, ldc),
      ...wasmLuPieces(this.ex, this.memory, base, this.pack),
      release: () => undefined,
    };
    return registerWorkspace(this, ws);
  }

  private gemm(base: number, m: number, n: number, k: number, aOff: number, lda: number, bOff: number, ldb: number, cOff: number, ldc: number): void {
    if (m <= 0 || n <= 0 || k <= 0) return;
    const T = this.threads;
    if (T === 1 || m * n * k < SPLIT_MIN || Math.max(m, n) < 8 * T) {
      this.ex.gemmSub(m, n, k, aOff, lda, bOff, ldb, cOff, ldc, base);
      return;
    }
    this.splitCalls++;
    const byCols = n >= m;
    const len = byCols ? n : m;
    const chunk = Math.ceil(len / T / 4) * 4;
    const ctl = this.ctl;
    const seqs: number[] = [];
    let mine: [number, number] = [0, Math.min(chunk, len)];
    for (let t = 1; t < T; t++) {
      const s0 = t * chunk;
      const s1 = Math.min(len, s0 + chunk);
      const b = (t - 1) * SLOT;
      if (s0 >= s1) {
        seqs.push(-1);
        continue;
      }
      const args = byCols
        ? [m, s1 - s0, k, aOff, lda, bOff + s0, ldb, cOff + s0, ldc]
        : [s1 - s0, n, k, aOff + s0 * lda, lda, bOff, ldb, cOff + s0 * ldc, ldc];
      for (let i = 0; i < 9; i++) ctl[b + ARGS + i] = args[i]!;
      ctl[b + ARGS + 9] = base + t * this.pack;
      Atomics.store(ctl, b + OP, OP_GEMM);
      const seq = Atomics.add(ctl, b + SEQ, 1) + 1;
      Atomics.notify(ctl, b + SEQ);
      seqs.push(seq);
    }
    if (mine[1] > mine[0]) {
      const [s0, s1] = mine;
      if (byCols) this.ex.gemmSub(m, s1 - s0, k, aOff, lda, bOff + s0, ldb, cOff + s0, ldc, base);
      else this.ex.gemmSub(s1 - s0, n, k, aOff + s0 * lda, lda, bOff, ldb, cOff + s0 * ldc, ldc, base);
    }
    mine = [0, 0];
    for (let t = 1; t < T; t++) {
      const seq = seqs[t - 1]!;
      if (seq < 0) continue;
      const b = (t - 1) * SLOT;
      const started = Date.now();
      for (;;) {
        const done = Atomics.load(ctl, b + DONE);
        if (done === seq) break;
        Atomics.wait(ctl, b + DONE, done, 1000);
        if (Date.now() - started > 300_000) throw new Error(`helper thread ${t} gave no answer in 5 minutes`);
      }
      if (Atomics.exchange(ctl, b + ERROR, 0) !== 0) throw new Error(`helper thread ${t} failed in the kernel`);
    }
  }

  /** Stop the helpers. */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    for (let t = 1; t < this.threads; t++) {
      const b = (t - 1) * SLOT;
      Atomics.store(this.ctl, b + OP, OP_STOP);
      Atomics.add(this.ctl, b + SEQ, 1);
      Atomics.notify(this.ctl, b + SEQ);
    }
    for (const h of this.helpers) h.terminate();
  }
}
