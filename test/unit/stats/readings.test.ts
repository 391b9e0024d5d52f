/**
 * Readings of single statistics and the verdict's words: a direction only where the statistic's own p-value
 * is below α; significant statistics that disagree are reported as disagreeing; replicate seeds of different
 * base seeds are independent.
 */
import { describe, expect, it } from 'vitest';
import { readingOf, randomness } from '../../../src/core/stats/randomness';
import { subSeed } from '../../../src/core/random';
import { referenceMonteCarlo, clearReferenceCache } from '../../../src/core/reference/montecarlo';
import { resolveSettings } from '../../../src/core/settings';
import { tessellate } from '../../../src/core/tessellate';
import { seedPoints } from '../../../src/core/synth/seeds';

describe('reading of one statistic (common practice: a direction is claimed only for a significant test)', () => {
  it('gives no direction at p ≥ α', () => {
    expect(readingOf('low', 2.1, 1.78, 0.82, 0.05)).toBe('within the random range');
    expect(readingOf('high', 0.9, 1.0, 0.05, 0.05)).toBe('within the random range');
  });
  it('gives the direction at p < α, by the side of the reference mean and which tail reads regular', () => {
    expect(readingOf('low', 1.2, 1.78, 0.01, 0.05)).toBe('more regular');
    expect(readingOf('low', 2.4, 1.78, 0.01, 0.05)).toBe('more irregular');
    expect(readingOf('high', 1.3, 1.0, 0.01, 0.05)).toBe('more regular');
    expect(readingOf(null, 9, 3, 0.01, 0.05)).toBe('departs from random seeding');
  });
  it('has no reading without a p-value or a value', () => {
    expect(readingOf('low', 1, 2, null, 0.05)).toBeNull();
    expect(readingOf('low', Number.NaN, 2, 0.01, 0.05)).toBeNull();
  });
});

describe('readings in a result', () => {
  it('random points: no statistic reads "more regular" or "more irregular" unless its p-value is below α', () => {
    const W = 800;
    const pts = seedPoints(800, W, W, 'random', 21);
    const t = tessellate(pts, { x0: 0, y0: 0, x1: W, y1: W });
    const r = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: resolveSettings({ pattern: 'points', reference: { replicates: 39, seed: 2 } }) });
    let checked = 0;
    for (const row of r.tests) {
      if (row.pValue === null) continue;
      checked++;
      if (row.pValue >= r.alpha) expect(row.reading, row.key).toBe('within the random range');
      else expect(row.reading, row.key).not.toBe('within the random range');
    }
    // A result whose p-values were all missing would pass the loop unchecked: most statistics have one here.
    expect(checked).toBeGreaterThanOrEqual(r.tests.length - 1);
  });
});

describe('replicate seeds', () => {
  it('base seeds 1 to 100 share no replicate sub-seed over 199 replicates (derived: a bijection of mixed sums)', () => {
    const seen = new Map<number, number>();
    for (let s = 1; s <= 100; s++) {
      for (let i = 0; i < 199; i++) {
        const v = subSeed(s, i);
        expect(seen.has(v), `seed ${s} replicate ${i} repeats seed ${seen.get(v)}`).toBe(false);
        seen.set(v, s);
      }
    }
    expect(seen.size).toBe(100 * 199);
  });

  it('two base seeds give references whose means differ by about their Monte Carlo standard error', () => {
    clearReferenceCache();
    const field = { x0: 0, y0: 0, x1: 600, y1: 600 };
    const a = referenceMonteCarlo({ cells: 400, field, replicates: 99, seed: 1, edgeRule: 'exclude', cache: false });
    const b = referenceMonteCarlo({ cells: 400, field, replicates: 99, seed: 2, edgeRule: 'exclude', cache: false });
    let shared = 0;
    for (let r = 0; r < 99; r++) if (a.values.mu2[r] === b.values.mu2[r]) shared++;
    expect(shared).toBe(0);
    // The difference of two independent means of 99 values has sd √2·sd/√99; allow 4 of those
    // (derived: central limit theorem). The difference is not 0 either (the seeds give other replicates).
    for (const key of ['mu2', 'areaCv', 'clarkEvansR'] as const) {
      const se = Math.SQRT2 * Math.max(a.sd[key], b.sd[key]) / Math.sqrt(99);
      const d = Math.abs(a.mean[key] - b.mean[key]);
      expect(d, key).toBeLessThan(4 * se);
      expect(d, key).toBeGreaterThan(0);
    }
  });
});
