/**
 * Seeded pseudo-random numbers. Every random draw in Tessellab (Monte Carlo reference, demo generator)
 * goes through here, so the same seed gives the same numbers on every machine.
 */

/** A generator of uniform numbers in [0, 1). */
export interface Rng {
  (): number;
}

/**
 * Mulberry32: a small 32-bit generator with a full 2^32 period, adequate for Monte Carlo of this size.
 * (T. Ettinger, 2017, public-domain reference implementation; trade.)
 */
export function mulberry32(seed: number): Rng {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A standard normal deviate by the Box–Muller transform. */
export function normal(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng();
  const v = rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/**
 * A second stream's seed for the demo generator (src/core/synth): kept as it was so that the committed
 * sample images regenerate byte for byte. Its output is nearly linear in `seed`, so it must not derive
 * families of replicates (two base seeds would share most of them): use {@link subSeed} for those.
 */
export function generatorSeed(seed: number, i: number): number {
  let h = (seed ^ 0x9e3779b9) >>> 0;
  h = Math.imul(h ^ (i + 0x7f4a7c15), 0x85ebca6b) >>> 0;
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35) >>> 0;
  h ^= h >>> 16;
  return h >>> 0;
}

/**
 * A bijective 32-bit mixing function (xor-shift and odd multiplies, each invertible): nearby inputs give
 * unrelated outputs. (The "lowbias32" finaliser, C. Wellons 2018, public domain; trade.)
 */
export function mix32(x: number): number {
  x = (x ^ (x >>> 16)) >>> 0;
  x = Math.imul(x, 0x7feb352d) >>> 0;
  x = (x ^ (x >>> 15)) >>> 0;
  x = Math.imul(x, 0x846ca68b) >>> 0;
  return (x ^ (x >>> 16)) >>> 0;
}

/**
 * Derives an independent seed for replicate `i` of a run seeded with `seed`: the base seed is mixed fully
 * before the index is added, and the sum mixed again (splitmix-style). For one base seed the sub-seeds are
 * distinct (a bijection of distinct sums); two base seeds share a sub-seed only if their mixed values lie
 * within the replicate count of each other, about one chance in 10⁷ for a pair at 199 replicates.
 */
export function subSeed(seed: number, i: number): number {
  return mix32((mix32((seed ^ 0x9e3779b9) >>> 0) + i) >>> 0);
}
