/**
 * An analysis whose random-seeding reference is drawn on worker threads is the same, byte for byte, as
 * one drawn on the calling thread (the project's rule: same inputs, same bytes out; DEVELOPERS.md).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import { CancelledError } from '../../src/core/errors';
import type { ReferencePool } from '../../src/core/reference/parallel';
import { summaryJson } from '../../src/core/export/index';
import { clearReferenceCache } from '../../src/core/reference/montecarlo';
import { synthesize } from '../../src/core/synth/index';
import { seedPoints } from '../../src/core/synth/seeds';
import { createNodeReferencePool } from '../../src/node/referencePool';

describe('reference threads change nothing in the results', () => {
  const pool = createNodeReferencePool(1);
  afterAll(() => pool.close());
  const settings = { umPerPx: 0.5, reference: { replicates: 39, seed: 3 } };

  it('walls image: the same summary.json with and without the pool', async () => {
    const img = synthesize({ pattern: 'walls', cells: 400, width: 700, height: 600, order: 'random', seed: 8 }).image;
    clearReferenceCache();
    const own: number[] = [];
    const one = await analyze({ kind: 'image', image: img }, settings, { onProgress: (s, f) => s === 'statistics' && own.push(f) });
    // Drawn on this thread while the analysis waits: the fraction moves through the stage.
    expect(own.filter((f) => f > 0 && f < 1).length).toBeGreaterThan(5);
    expect(own.every((f, k) => k === 0 || f >= own[k - 1]!)).toBe(true);
    clearReferenceCache();
    const stats: number[] = [];
    const many = await analyze({ kind: 'image', image: img }, settings, { referencePool: pool, onProgress: (s, f) => s === 'statistics' && stats.push(f) });
    expect(many.summary.randomness.reference?.replicates).toBe(39);
    expect(summaryJson(many)).toBe(summaryJson(one));
    // The wait for the reference moves the statistics stage's progress (common practice: progress on long work).
    expect(stats[0]).toBe(0);
    expect(stats.at(-1)).toBe(1);
    expect(stats.every((f, k) => k === 0 || f >= stats[k - 1]!)).toBe(true);
  });

  it('an analysis cancelled before its statistics stops its reference: the pool draws no further chunk', async () => {
    const img = synthesize({ pattern: 'walls', cells: 400, width: 700, height: 600, order: 'random', seed: 9 }).image;
    // Every chunk handed to the pool, as the promise of its batch.
    const runs: Promise<unknown>[] = [];
    const counting: ReferencePool = {
      size: pool.size,
      run: (plan, r0, r1) => {
        const p = pool.run(plan, r0, r1);
        runs.push(p);
        return p;
      },
    };
    const ctl = new AbortController();
    clearReferenceCache();
    const run = analyze({ kind: 'image', image: img }, { ...settings, reference: { replicates: 199, seed: 4 } }, {
      referencePool: counting, signal: ctl.signal, onProgress: (s, f) => s === 'measure' && f === 1 && ctl.abort(),
    });
    await expect(run).rejects.toBeInstanceOf(CancelledError);
    const atCancel = runs.length;
    // Wait for the chunks already out to land (events, not a fixed time). A reference that went on would
    // hand out its next chunk synchronously when one lands, before this wait resumes, and be waited for too.
    for (let seen = -1; seen !== runs.length; ) {
      seen = runs.length;
      await Promise.allSettled(runs);
    }
    expect(atCancel).toBeGreaterThan(0);
    expect(runs.length).toBe(atCancel);
  });

  it('points: the same summary.json with and without the pool', async () => {
    const pts = seedPoints(800, 900, 900, 'random', 4);
    clearReferenceCache();
    const one = await analyze({ kind: 'points', points: pts, width: 900, height: 900 }, { ...settings, pattern: 'points' });
    clearReferenceCache();
    const many = await analyze({ kind: 'points', points: pts, width: 900, height: 900 }, { ...settings, pattern: 'points' }, { referencePool: pool });
    expect(summaryJson(many)).toBe(summaryJson(one));
  });
});
