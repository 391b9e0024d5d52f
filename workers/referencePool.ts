/**
 * The analysis worker's reference threads: web workers (one per core beyond the analysis worker's own,
 * which draws chunks too), started on first use.
 */
import { workerPool, type ClosablePool, type ReferenceReply } from '../src/core/reference/workerPool';

export function createBrowserReferencePool(size = Math.max(1, Math.min(7, (navigator.hardwareConcurrency || 2) - 1))): ClosablePool {
  return workerPool(size, (onReply, onFail) => {
    const w = new Worker(new URL('./reference.worker.ts', import.meta.url), { type: 'module', name: 'tessellab-reference' });
    w.onmessage = (e: MessageEvent<ReferenceReply>) => onReply(e.data);
    w.onerror = (e) => {
      e.preventDefault();
      w.terminate();
      onFail(new Error(`The reference worker failed: ${e.message || 'it could not start'}.`));
    };
    return { post: (m) => w.postMessage(m), terminate: () => w.terminate() };
  });
}
