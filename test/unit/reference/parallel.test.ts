/**
 * The reference drawn on several threads is the reference drawn on one: the project's rule that the same
 * inputs give the same bytes (DEVELOPERS.md, "Every random draw takes a seed"), whatever the machine's
 * core count. Checked against the single-thread reference, which montecarlo.test.ts checks against the
 * published Poisson–Voronoi values.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { CancelledError, SettingsError, TooFewCellsError } from '../../../src/core/errors';
import {
  combineReplicates, drawReplicates, planReference, referenceMonteCarlo, type ReferenceOptions, type ReferencePlan, type ReplicateBatch,
} from '../../../src/core/reference/montecarlo';
import { referenceSummary } from '../../../src/core/reference/summary';
import { CHUNKS_IN_FLIGHT, chunkSize, startReference, type ReferencePool } from '../../../src/core/reference/parallel';
import { createNodeReferencePool } from '../../../src/node/referencePool';

const bytes = (r: ReturnType<typeof referenceMonteCarlo>) => JSON.stringify(referenceSummary(r, { includeValues: true }));

const cases: [string, ReferenceOptions][] = [
  ['seeds layout, exclude rule', { cells: 400, field: { x0: 0, y0: 0, x1: 700, y1: 500 }, replicates: 23, seed: 5, edgeRule: 'exclude', cache: false }],
  ['window layout, weight rule, minimum area, offset field', {
    cells: 600, field: { x0: 13, y0: 7, x1: 813, y1: 607 }, replicates: 21, seed: 77, edgeRule: 'weight', layout: 'window', minCellAreaPx: 40, cache: false,
  }],
];

/**
 * A pool on this thread that draws each chunk as a worker would, on a later turn of the event loop,
 * optionally failing some. `runs` holds every promise it has handed out, so that a test can wait for all of
 * them to settle.
 */
function fakePool(size: number, fail: (r0: number) => boolean = () => false): ReferencePool & { calls: number; runs: Promise<ReplicateBatch>[] } {
  const pool = {
    size,
    calls: 0,
    runs: [] as Promise<ReplicateBatch>[],
    run(plan: ReferencePlan, r0: number, r1: number): Promise<ReplicateBatch> {
      pool.calls++;
      const p = new Promise<ReplicateBatch>((resolve, reject) =>
        setTimeout(() => (fail(r0) ? reject(new Error('worker lost')) : resolve(structuredClone(drawReplicates(plan, r0, r1)))), 2),
      );
      pool.runs.push(p);
      return p;
    },
  };
  return pool;
}

/**
 * Resolves once every chunk the pool was given has settled and the job has had its turn after each: a
 * job that hands out another chunk when one lands does so synchronously in the continuation of that run
 * (which was registered before this wait's), so a new promise would show up in `runs` and be waited for too.
 */
async function allRunsSettled(pool: { runs: Promise<unknown>[] }): Promise<void> {
  for (let seen = -1; seen !== pool.runs.length; ) {
    seen = pool.runs.length;
    await Promise.allSettled(pool.runs);
  }
}

describe('replicates split into batches give the same reference as one pass', () => {
  for (const [name, o] of cases) {
    it(`${name}: any split, in any order`, () => {
      const serial = bytes(referenceMonteCarlo(o));
      const plan = planReference(o);
      const R = plan.replicates;
      for (const cuts of [[1], [5, 6, 17], [2, 4, 8, 16]]) {
        const edges = [0, ...cuts, R];
        const batches = edges.slice(1).map((r1, k) => drawReplicates(plan, edges[k]!, r1)).reverse();
        expect(bytes(combineReplicates(plan, batches))).toBe(serial);
      }
    });
  }
  it('batches that miss or repeat replicates are refused', () => {
    const plan = planReference(cases[0]![1]);
    expect(() => combineReplicates(plan, [drawReplicates(plan, 0, 10)])).toThrow(/stop at replicate 10 of 23/);
    expect(() => combineReplicates(plan, [drawReplicates(plan, 0, 10), drawReplicates(plan, 12, 23)])).toThrow(/do not cover replicates 10\.\.11/);
  });
});

describe('startReference', () => {
  for (const [name, o] of cases) {
    it(`${name}: with a pool (the pool takes chunks, the caller the rest) equals the single-thread reference`, async () => {
      const pool = fakePool(2);
      const r = await startReference(o, pool).result();
      expect(pool.calls).toBeGreaterThan(0);
      expect(bytes(r)).toBe(bytes(referenceMonteCarlo(o)));
    });
  }
  it('chunks a failing worker drops are drawn by the caller: same reference', async () => {
    const o = cases[1]![1];
    const pool = fakePool(2, (r0) => r0 % 2 === 0);
    expect(bytes(await startReference(o, pool).result())).toBe(bytes(referenceMonteCarlo(o)));
  });
  it('without a pool it is the single-thread reference; progress reaches 1', async () => {
    const o = cases[0]![1];
    const seen: number[] = [];
    const r = await startReference({ ...o, onProgress: (f) => seen.push(f) }, null).result();
    expect(bytes(r)).toBe(bytes(referenceMonteCarlo(o)));
    expect(seen.at(-1)).toBe(1);
    expect(seen.every((f, k) => k === 0 || f >= seen[k - 1]!)).toBe(true);
  });
  it('bad options reject at result() with the same typed errors as the single-thread reference', async () => {
    const field = { x0: 0, y0: 0, x1: 100, y1: 100 };
    await expect(startReference({ cells: 2, field, replicates: 9, seed: 1, edgeRule: 'exclude' }, fakePool(1)).result()).rejects.toBeInstanceOf(TooFewCellsError);
    await expect(startReference({ cells: 50, field, replicates: 0, seed: 1, edgeRule: 'exclude' }, fakePool(1)).result()).rejects.toBeInstanceOf(SettingsError);
    await expect(startReference({ cells: 50, field, replicates: 9, seed: 1, edgeRule: 'nearest' as never }, fakePool(1)).result()).rejects.toBeInstanceOf(SettingsError);
  });
  it('a cancelled job stops with CancelledError', async () => {
    const ctl = new AbortController();
    ctl.abort();
    await expect(startReference(cases[0]![1], null).result(ctl.signal)).rejects.toBeInstanceOf(CancelledError);
  });
  it('a cancelled job gives its workers no further chunk', async () => {
    const pool = fakePool(1);
    let landed = 0;
    const job = startReference({ ...cases[1]![1], onProgress: () => landed++ }, pool);
    const started = pool.calls;
    job.cancel();
    // Wait for the chunks already sent to land (events, not a fixed time); no slot takes another.
    await allRunsSettled(pool);
    expect(started).toBe(CHUNKS_IN_FLIGHT);
    expect(landed).toBe(started);
    expect(pool.calls).toBe(started);
  });
  it('a job that is not cancelled goes on giving chunks to its workers as they land (the check above can fail)', async () => {
    const pool = fakePool(1);
    let done = 0;
    startReference({ ...cases[1]![1], onProgress: (f) => (done = f) }, pool);
    const started = pool.calls;
    await allRunsSettled(pool);
    // Nobody called result(): the worker slots alone drew every replicate.
    expect(pool.calls).toBeGreaterThan(started);
    expect(done).toBe(1);
  });
  it('chunks: about 24 per thread, at least one replicate each', () => {
    expect(chunkSize(199, 2)).toBe(5);
    expect(chunkSize(5, 8)).toBe(1);
  });
});

describe('the Node worker-thread pool (real worker_threads)', () => {
  const pool = createNodeReferencePool(2);
  afterAll(() => pool.close());
  it('draws the same reference as one thread, and batches arrive as typed arrays', async () => {
    const o = cases[1]![1];
    const plan = planReference(o);
    const b = await pool.run(plan, 3, 9);
    expect(b.values).toBeInstanceOf(Float64Array);
    expect(b.r0).toBe(3);
    expect(JSON.stringify(Array.from(b.values))).toBe(JSON.stringify(Array.from(drawReplicates(plan, 3, 9).values)));
    expect(bytes(await startReference(o, pool).result())).toBe(bytes(referenceMonteCarlo(o)));
  });
  it('a chunk the worker cannot draw is rejected with its message', async () => {
    const plan = { ...planReference(cases[0]![1]), seeds: -1 } as ReferencePlan;
    await expect(pool.run(plan, 0, 1)).rejects.toThrow();
  });
});
