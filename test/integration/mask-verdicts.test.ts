/**
 * The walls pipeline in a tissue mask: the generator's windows on a larger tiling, seen through an irregular
 * mask covering half of the image, against the reference drawn in the same mask. As for whole windows
 * (window-verdicts.test.ts): a Monte Carlo test of level 0.05 rejects a true null in about 5 % of cases
 * (Besag & Diggle 1977; pub, memory), so random seeding must mostly read "consistent with random seeding";
 * a standardised statistic of the observation against its reference has mean 0 when the observation and the
 * reference are measured alike (derived); hard-core seeding is more regular than Poisson (trade: Matérn's
 * hard-core process; pub, memory).
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import { synthesize } from '../../src/core/synth/index';
import { SettingsError } from '../../src/core/errors';

const W = 640;
const H = 480;
const settings = { reference: { replicates: 99, seed: 5 } };

/** A wavy blob with three lobes, off centre: half of the image. */
function blob(): Uint8Array {
  const m = new Uint8Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const t = Math.atan2(y + 0.5 - 250, x + 0.5 - 330);
      const r = 0.92 * 240 * (1 + 0.18 * Math.sin(3 * t) + 0.1 * Math.cos(5 * t + 1));
      if (Math.hypot(x + 0.5 - 330, y + 0.5 - 250) < r) m[y * W + x] = 1;
    }
  }
  return m;
}
const mask = blob();
const tissue = mask.reduce((s, v) => s + v, 0);

async function run(order: 'random' | 'regular', seed: number) {
  const img = synthesize({ pattern: 'walls', cells: 400, width: W, height: H, order, seed, window: true }).image;
  const s = (await analyze({ kind: 'image', image: img }, settings, { mask })).summary;
  const ce = s.clarkEvans;
  const interior = s.randomness.reference!.statistics.interiorCells!;
  return {
    s,
    verdict: s.randomness.verdict,
    z: (ce.R! - ce.referenceMean!) / ce.referenceSd!,
    zInterior: (s.cells.inStatistics - interior.mean!) / interior.sd!,
  };
}

describe('walls windows in an irregular mask against the reference drawn in it', () => {
  it('the mask covers about half of the image', () => {
    expect(tissue / (W * H)).toBeGreaterThan(0.45);
    expect(tissue / (W * H)).toBeLessThan(0.55);
  });

  it('random seeding: "consistent with random seeding" in at least 8 of 10; Clark–Evans R and the cell count unbiased', async () => {
    const res: Awaited<ReturnType<typeof run>>[] = [];
    for (let k = 0; k < 10; k++) res.push(await run('random', 500 + k));
    expect(res.filter((r) => r.verdict === 'consistent with random seeding').length).toBeGreaterThanOrEqual(8);
    // Means of 10 standardised values: standard error about 1/√10; 0.75 is about 2.4 of them.
    const mean = (f: (r: (typeof res)[number]) => number) => res.reduce((s, r) => s + f(r), 0) / res.length;
    expect(Math.abs(mean((r) => r.z))).toBeLessThan(0.75);
    expect(Math.abs(mean((r) => r.zInterior))).toBeLessThan(0.75);
    // The field of the statistics is the mask, and the summary says so.
    const s = res[0]!.s;
    expect(s.field.mask?.pixels).toBe(tissue);
    expect(s.cells.densityPerArea).toBeCloseTo(s.cells.count / tissue, 12);
    expect(s.randomness.reference?.mask?.areaPx2).toBe(tissue);
    expect(s.grainSize).toMatchObject({ G: null });
  });

  it('hard-core seeding: "more regular than random"', async () => {
    for (let k = 0; k < 3; k++) expect((await run('regular', 600 + k)).verdict).toBe('more regular than random');
  });

  it('a mask of another size than the image is refused', async () => {
    const img = synthesize({ pattern: 'walls', cells: 100, width: 200, height: 160, order: 'random', seed: 1 }).image;
    await expect(analyze({ kind: 'image', image: img }, settings, { mask: new Uint8Array(200 * 150).fill(1) })).rejects.toThrow(SettingsError);
    await expect(analyze({ kind: 'image', image: img }, settings, { mask: new Uint8Array(200 * 160) })).rejects.toThrow(/marks no tissue/);
  });
});
