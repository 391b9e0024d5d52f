/**
 * A pool of reference worker threads over any message channel: worker_threads in Node
 * (src/node/referencePool.ts), web workers in the browser (workers/referencePool.ts). Each worker answers
 * a {@link ReferenceRequest} with a {@link ReferenceReply} (see {@link answerReferenceRequest}); a worker
 * that fails rejects its chunks, which then fall back to the caller's thread (parallel.ts).
 */
import { describeError } from '../errors';
import { batchBuffers, drawReplicates, type ReferencePlan, type ReplicateBatch } from './montecarlo';
import type { ReferencePool } from './parallel';

export interface ReferenceRequest {
  id: number;
  plan: ReferencePlan;
  r0: number;
  r1: number;
}

export interface ReferenceReply {
  id: number;
  batch?: ReplicateBatch;
  error?: string;
}

/** What a worker thread does with a request: the reply and the buffers to transfer with it. */
export function answerReferenceRequest(m: ReferenceRequest): { reply: ReferenceReply; transfer: ArrayBuffer[] } {
  try {
    const batch = drawReplicates(m.plan, m.r0, m.r1);
    return { reply: { id: m.id, batch }, transfer: batchBuffers(batch) };
  } catch (e) {
    return { reply: { id: m.id, error: describeError(e) }, transfer: [] };
  }
}

/** One worker thread, as the pool sees it. */
export interface PoolWorker {
  post(m: ReferenceRequest): void;
  /** Stops the thread. */
  terminate(): void | Promise<unknown>;
  /** Whether the thread keeps the process alive while a chunk is out (Node); absent in the browser. */
  keepAlive?(on: boolean): void;
}

/** Starts a worker thread whose replies go to onReply and whose failure (crash, exit) to onFail. */
export type SpawnWorker = (onReply: (m: ReferenceReply) => void, onFail: (e: Error) => void) => PoolWorker;

export interface ClosablePool extends ReferencePool {
  /** Stops the workers; chunks still out are rejected. */
  close(): Promise<void>;
}

/** A pool of `size` workers started by `spawn` on first use, round robin, restarted after a failure. */
export function workerPool(size: number, spawn: SpawnWorker): ClosablePool {
  interface Slot {
    worker: PoolWorker;
    pending: Map<number, { resolve: (b: ReplicateBatch) => void; reject: (e: Error) => void }>;
  }
  const slots: (Slot | null)[] = new Array(size).fill(null);
  let next = 0;
  let nextId = 0;
  let busy = 0;
  const keepAlive = (on: boolean): void => {
    for (const s of slots) s?.worker.keepAlive?.(on);
  };

  const start = (k: number): Slot => {
    const pending: Slot['pending'] = new Map();
    const fail = (e: Error): void => {
      if (slots[k] === slot) slots[k] = null;
      for (const p of pending.values()) p.reject(e);
      pending.clear();
    };
    const slot: Slot = {
      pending,
      worker: spawn((m) => {
        const p = pending.get(m.id);
        if (!p) return;
        pending.delete(m.id);
        if (m.batch) p.resolve(m.batch);
        else p.reject(new Error(m.error ?? 'The reference worker sent no batch.'));
      }, fail),
    };
    slot.worker.keepAlive?.(busy > 0);
    return slot;
  };

  return {
    size,
    run(plan: ReferencePlan, r0: number, r1: number): Promise<ReplicateBatch> {
      const k = next;
      next = (next + 1) % size;
      const slot = slots[k] ?? (slots[k] = start(k));
      const id = nextId++;
      return new Promise<ReplicateBatch>((resolve, reject) => {
        // While a chunk is out the workers keep the process alive; an idle pool lets it exit.
        const settled = (): void => {
          if (--busy === 0) keepAlive(false);
        };
        slot.pending.set(id, { resolve: (b) => (settled(), resolve(b)), reject: (e) => (settled(), reject(e)) });
        if (busy++ === 0) keepAlive(true);
        slot.worker.post({ id, plan, r0, r1 });
      });
    },
    async close(): Promise<void> {
      const all = slots.filter((s): s is Slot => !!s);
      slots.fill(null);
      for (const s of all) {
        for (const p of s.pending.values()) p.reject(new Error('The reference pool was closed.'));
        s.pending.clear();
      }
      await Promise.all(all.map((s) => s.worker.terminate()));
    },
  };
}
