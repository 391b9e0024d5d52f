/**
 * The random-seeding reference drawn on several threads: the replicates are split into chunks, worker
 * threads (a {@link ReferencePool}: worker_threads in Node, web workers in the browser) draw chunks as soon
 * as the job starts, and the caller draws chunks too once it waits for the result. The reference is
 * assembled in replicate order (combineReplicates), so it is the same, byte for byte, whatever the number
 * of threads or the split.
 */
import { CancelledError } from '../errors';
import {
  cachedReferenceFor, combineReplicates, drawReplicates, planReference, rememberReference,
  type Reference, type ReferenceOptions, type ReferencePlan, type ReplicateBatch,
} from './montecarlo';

/** Threads that draw replicates: `run` draws replicates r0 .. r1−1 of a plan (see drawReplicates). */
export interface ReferencePool {
  /** How many chunks the pool draws at once. */
  readonly size: number;
  run(plan: ReferencePlan, r0: number, r1: number): Promise<ReplicateBatch>;
}

/** A reference being drawn. */
export interface ReferenceJob {
  /**
   * Draws the chunks no worker has taken on this thread, waits for the rest and returns the reference.
   * @throws what planning or combining throws (SettingsError, TooFewCellsError); CancelledError on abort
   */
  result(signal?: AbortSignal): Promise<Reference>;
  /**
   * Lets finished batches land and the workers take their next chunks: a caller busy with other work
   * awaits this between its steps (it resolves at once when no worker is drawing).
   */
  tick(): Promise<void>;
  /** Gives the reference up (the analysis failed or was cancelled): the workers take no further chunk. */
  cancel(): void;
}

/**
 * The smallest chunk (replicates): about a 24th of each thread's share, so that the threads finish close
 * together. With worker threads, chunks start larger (see startReference) and shrink to this.
 */
export function chunkSize(replicates: number, threads: number): number {
  return Math.max(1, Math.ceil(replicates / (24 * Math.max(1, threads))));
}

/**
 * Chunks each worker holds at once: one being drawn and one waiting, so that a worker goes on while the
 * caller's thread is busy and cannot take its finished batch yet.
 */
export const CHUNKS_IN_FLIGHT = 2;

const nextTurn = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

/**
 * Starts drawing a reference: the pool's threads take chunks at once; the rest waits for
 * {@link ReferenceJob.result}. Without a pool (or with size 0) the whole reference is drawn in `result`.
 * A cached reference (same options) is returned at once; the new one is cached unless opts.cache is false.
 */
export function startReference(opts: ReferenceOptions, pool?: ReferencePool | null): ReferenceJob {
  const hit = opts.cache === false ? null : cachedReferenceFor(opts);
  if (hit) return { result: async () => hit, tick: async () => {}, cancel: () => {} };
  let plan: ReferencePlan;
  try {
    plan = planReference(opts);
  } catch (e) {
    return { result: async () => Promise.reject(e), tick: async () => {}, cancel: () => {} };
  }
  const R = plan.replicates;
  const workers = pool && pool.size > 0 ? pool.size : 0;
  const threads = workers + 1;
  const smallest = chunkSize(R, threads);
  // Guided self-scheduling: each chunk is a share of what is left, large at first (a worker keeps going
  // while the caller is busy elsewhere), down to `smallest` at the end (the threads finish together).
  let next = 0;
  const returned: [number, number][] = [];
  const queue = {
    get length(): number {
      return returned.length + (next < R ? 1 : 0);
    },
    shift(): [number, number] {
      if (returned.length) return returned.shift()!;
      // Alone, the caller draws even chunks: progress and cancellation between them.
      const size = workers ? Math.max(smallest, Math.ceil((R - next) / (2 * threads))) : smallest;
      const chunk: [number, number] = [next, Math.min(R, next + size)];
      next = chunk[1];
      return chunk;
    },
    push(chunk: [number, number]): void {
      returned.push(chunk);
    },
  };
  const batches: ReplicateBatch[] = [];
  let done = 0;
  let stopped = false;
  const landed = (b: ReplicateBatch): void => {
    batches.push(b);
    done += b.r1 - b.r0;
    opts.onProgress?.(done / R);
  };
  // Each worker slot takes chunks until none is left; a chunk a worker fails on goes back to the queue
  // for the caller's thread, and that slot stops.
  const slot = async (): Promise<void> => {
    while (!stopped && queue.length) {
      const chunk = queue.shift()!;
      try {
        landed(await pool!.run(plan, chunk[0], chunk[1]));
      } catch {
        queue.push(chunk);
        return;
      }
    }
  };
  // The pool deals its runs round robin, so CHUNKS_IN_FLIGHT slots per worker keep that many chunks at each.
  const slots = Array.from({ length: workers * CHUNKS_IN_FLIGHT }, slot);
  return {
    tick: () => (workers && !stopped && queue.length ? nextTurn() : Promise.resolve()),
    cancel: () => {
      stopped = true;
    },
    async result(signal?: AbortSignal): Promise<Reference> {
      try {
        for (;;) {
          while (queue.length) {
            if (signal?.aborted) throw new CancelledError();
            const [r0, r1] = queue.shift()!;
            landed(drawReplicates(plan, r0, r1));
            // Let finished workers' batches land (and their slots take the next chunk).
            if (workers) await nextTurn();
          }
          await Promise.all(slots);
          if (!queue.length) break;
        }
      } finally {
        stopped = true;
      }
      const ref = combineReplicates(plan, batches);
      return opts.cache === false ? ref : rememberReference(opts, ref);
    },
  };
}
