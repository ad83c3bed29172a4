// A helper thread of the parallel kernel in Node (worker_threads). Plain JavaScript so that it
// starts under any loader; the protocol and its layout are those of kernel-protocol.ts (the layout
// arrives with the init message, so the numbers have one source).
import { parentPort } from 'node:worker_threads';

parentPort.once('message', (msg) => {
  const { module, memory, control, slot, layout } = msg;
  const { SLOT, SEQ, DONE, OP, ERROR, ARGS, OP_STOP } = layout;
  const ex = new WebAssembly.Instance(module, { env: { memory } }).exports;
  const ctl = new Int32Array(control);
  const b = slot * SLOT;
  let seen = Atomics.load(ctl, b + SEQ);
  parentPort.postMessage({ type: 'ready', slot });
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
      const a = (i) => ctl[b + ARGS + i];
      ex.gemmSub(a(0), a(1), a(2), a(3), a(4), a(5), a(6), a(7), a(8), a(9));
    } catch {
      Atomics.store(ctl, b + ERROR, 1);
    }
    Atomics.store(ctl, b + DONE, seq);
    Atomics.notify(ctl, b + DONE);
  }
});
