import { describe, expect, it } from 'vitest';
import { otsuThresholdCv } from '../../../src/core/cv/phase';
import { histogram256, otsu } from '../../../src/core/kinetics/threshold';
import { simulateGrowth } from '../../../src/core/kinetics/index';
import { mulberry32, normal } from '../../../src/core/random';

describe("Otsu's threshold of a series", () => {
  it('matches opencv.js (cv.threshold with THRESH_OTSU) on simulated frames and random bimodal images', async () => {
    // reference library: opencv.js implements Otsu 1979; the same histogram must give the same threshold
    const { frames } = simulateGrowth({ width: 200, height: 160, mode: 'site-saturation', density: 2e-3, speed: 1, times: [3, 8, 14], seed: 2 });
    const images = frames.map((f) => f.data as Uint8Array);
    const rng = mulberry32(9);
    for (let k = 0; k < 4; k++) {
      const d = new Uint8Array(150 * 100);
      const p = 0.1 + 0.25 * k;
      for (let i = 0; i < d.length; i++) d[i] = Math.max(0, Math.min(255, Math.round((rng() < p ? 170 : 70) + 20 * normal(rng))));
      images.push(d);
    }
    for (const [i, d] of images.entries()) {
      const w = i < 3 ? 200 : 150;
      const h = i < 3 ? 160 : 100;
      expect(otsu(histogram256(d)).threshold).toBe(await otsuThresholdCv(d, w, h));
    }
  });

  it('effectiveness is near 1 for two spikes and low for one mode', () => {
    // derived: η = σ_B²/σ_T² is 1 for two spikes (Otsu 1979)
    const two = new Float64Array(256);
    two[40] = 100;
    two[200] = 300;
    expect(otsu(two).effectiveness).toBeCloseTo(1, 12);
    const one = new Float64Array(256);
    for (let i = 0; i < 256; i++) one[i] = Math.exp(-(((i - 128) / 10) ** 2) / 2);
    expect(otsu(one).effectiveness).toBeLessThan(0.7);
  });
});
