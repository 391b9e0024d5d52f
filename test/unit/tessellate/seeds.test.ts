import { describe, it, expect } from 'vitest';
import { seedPoints, hardCoreDistance } from '../../../src/core/synth/seeds';
import { SettingsError } from '../../../src/core/errors';

/** Brute-force mean nearest-neighbour distance. */
function meanNN(p: Float64Array): { mean: number; min: number } {
  const n = p.length / 2;
  let sum = 0;
  let min = Infinity;
  for (let i = 0; i < n; i++) {
    let best = Infinity;
    for (let j = 0; j < n; j++) {
      if (i === j) continue;
      const d = Math.hypot(p[2 * i]! - p[2 * j]!, p[2 * i + 1]! - p[2 * j + 1]!);
      if (d < best) best = d;
    }
    sum += best;
    if (best < min) min = best;
  }
  return { mean: sum / n, min };
}

describe('seedPoints', () => {
  const W = 1000;
  const H = 800;
  const n = 1500;
  for (const order of ['random', 'regular', 'clustered'] as const) {
    it(`${order}: n points inside the field, deterministic from the seed`, () => {
      const a = seedPoints(n, W, H, order, 7);
      const b = seedPoints(n, W, H, order, 7);
      const c = seedPoints(n, W, H, order, 8);
      expect(a.length).toBe(2 * n);
      expect(Array.from(a)).toEqual(Array.from(b));
      expect(Array.from(a)).not.toEqual(Array.from(c));
      for (let i = 0; i < n; i++) {
        expect(a[2 * i]! >= 0 && a[2 * i]! < W && a[2 * i + 1]! >= 0 && a[2 * i + 1]! < H).toBe(true);
      }
    });
  }

  it('regular keeps its hard-core distance', () => {
    const p = seedPoints(n, W, H, 'regular', 3);
    expect(meanNN(p).min).toBeGreaterThanOrEqual(hardCoreDistance(n, W, H) * (1 - 1e-12));
  });

  it('Clark–Evans index orders the three processes (Clark & Evans 1954, pub, read in text: R = mean NN / (1/(2 sqrt(lambda))))', () => {
    const re = 1 / (2 * Math.sqrt(n / (W * H)));
    const R = (o: 'random' | 'regular' | 'clustered') => meanNN(seedPoints(n, W, H, o, 11)).mean / re;
    // Random: R near 1 (plus a small edge bias upward, since border points lack neighbours outside).
    expect(Math.abs(R('random') - 1)).toBeLessThan(0.08);
    expect(R('regular')).toBeGreaterThan(1.4);
    expect(R('clustered')).toBeLessThan(0.7);
  });

  it('rejects bad counts and fields', () => {
    expect(() => seedPoints(0, W, H, 'random', 1)).toThrow(SettingsError);
    expect(() => seedPoints(10, 0, H, 'random', 1)).toThrow(SettingsError);
    expect(() => seedPoints(10, W, H, 'grid' as never, 1)).toThrow(SettingsError);
  });
});
