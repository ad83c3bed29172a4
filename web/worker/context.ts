/** What a worker handler gets besides its arguments: progress reporting and cancellation. */
import { CancelledError } from '../../engine/errors';

export interface HandlerContext {
  /** Report progress, 0 to 1, with an optional note. */
  progress(fraction: number, note?: string): void;
  /** True once the page has asked to cancel. */
  readonly cancelled: boolean;
  /** Throw CancelledError if cancelled; let other messages in first (await it in loops). */
  checkpoint(): Promise<void>;
  /** Transfer these buffers with the result instead of copying them. */
  transfer(...buffers: ArrayBuffer[]): void;
}

export type Handler = (args: any, ctx: HandlerContext) => unknown | Promise<unknown>;

/** Yield to the event loop so that a cancel message can arrive. */
export function yieldNow(): Promise<void> {
  return new Promise((resolve) => {
    const ch = new MessageChannel();
    ch.port1.onmessage = () => {
      ch.port1.close();
      resolve();
    };
    ch.port2.postMessage(0);
    ch.port2.close();
  });
}

export function makeContext(post: (p: { fraction: number; note?: string }) => void, isCancelled: () => boolean, transfers: ArrayBuffer[]): HandlerContext {
  let last = 0;
  return {
    progress(fraction, note) {
      const now = Date.now();
      if (fraction < 1 && now - last < 50) return; // at most 20 updates a second
      last = now;
      post(note === undefined ? { fraction } : { fraction, note });
    },
    get cancelled() {
      return isCancelled();
    },
    async checkpoint() {
      await yieldNow();
      if (isCancelled()) throw new CancelledError();
    },
    transfer(...buffers) {
      transfers.push(...buffers);
    },
  };
}
