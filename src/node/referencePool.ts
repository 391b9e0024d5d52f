/**
 * The random-seeding reference's worker threads in Node (the command line, batches, the benchmark):
 * worker_threads that each draw chunks of replicates and transfer the typed arrays back. Workers start on
 * first use and are kept for the process; an idle pool does not keep the process alive.
 */
import { Worker } from 'node:worker_threads';
import { workerPool, type ClosablePool, type ReferenceReply } from '../core/reference/workerPool';
import { allowedCpus } from './cpus';

/**
 * Threads for the pool: one per CPU the process may use (affinity and cgroup quota, src/node/cpus.ts) beyond
 * the caller's own (the caller draws chunks too), 1 to 7.
 */
export function defaultPoolSize(): number {
  return Math.max(1, Math.min(7, allowedCpus().count - 1));
}

/** A pool of `size` worker threads (default {@link defaultPoolSize}). */
export function createNodeReferencePool(size = defaultPoolSize()): ClosablePool {
  return workerPool(size, (onReply, onFail) => {
    const w = new Worker(new URL('./referenceWorker.mjs', import.meta.url));
    w.on('message', (m: ReferenceReply) => onReply(m));
    w.on('error', onFail);
    w.on('exit', (code) => onFail(new Error(`The reference worker stopped (exit code ${code}).`)));
    return {
      post: (m) => w.postMessage(m),
      terminate: () => w.terminate(),
      keepAlive: (on) => (on ? w.ref() : w.unref()),
    };
  });
}

let shared: ClosablePool | null = null;

/** The process's pool, created on first use. */
export function sharedReferencePool(): ClosablePool {
  return (shared ??= createNodeReferencePool());
}
