/**
 * The whole walls pipeline against the window reference, on the generator's windows on a larger tiling
 * (seeds drawn beyond the image too, as a micrograph shows part of a tissue): segmentation, centroids,
 * statistics and the Monte Carlo reference together.
 * Sources: a Monte Carlo test of level 0.05 rejects a true null in about 5 % of cases (Besag & Diggle 1977;
 * pub, memory), so random seeding must mostly be "consistent with random seeding", and a standardised
 * statistic of the observation against its reference has mean 0 when the pipeline adds no bias (derived).
 * Hard-core seeding is more regular than Poisson (trade: the hard-core process of Matérn; pub, memory).
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import { synthesize } from '../../src/core/synth/index';

const settings = { reference: { replicates: 99, seed: 5 } };

async function verdictOf(order: 'random' | 'regular', seed: number) {
  const img = synthesize({ pattern: 'walls', cells: 250, width: 640, height: 480, order, seed, window: true }).image;
  const a = await analyze({ kind: 'image', image: img }, settings);
  const r = a.summary.randomness as { verdict: string };
  const ce = a.summary.clarkEvans as { R: number; referenceMean: number; referenceSd: number };
  return { verdict: r.verdict, z: (ce.R - ce.referenceMean) / ce.referenceSd };
}

describe('walls windows from the generator against the window reference', () => {
  it('random seeding: "consistent with random seeding" in at least 8 of 10, and Clark–Evans R unbiased', async () => {
    const res = [];
    for (let k = 0; k < 10; k++) res.push(await verdictOf('random', 500 + k));
    expect(res.filter((r) => r.verdict === 'consistent with random seeding').length).toBeGreaterThanOrEqual(8);
    // Mean of 10 standardised values: its standard error is about 1/√10; 0.75 is about 2.4 of them.
    const meanZ = res.reduce((s, r) => s + r.z, 0) / res.length;
    expect(Math.abs(meanZ)).toBeLessThan(0.75);
  });
  it('hard-core seeding: "more regular than random"', async () => {
    for (let k = 0; k < 3; k++) expect((await verdictOf('regular', 600 + k)).verdict).toBe('more regular than random');
  });
});
