import { describe, it, expect } from 'vitest';
import { pvAreaDensity, randomnessData, sideDistribution, areaDistribution, pairCorrelation } from '../../../src/ui/plots';
import { analyze } from '../../../src/core/analyze';
import { seedPoints } from '../../../src/core/synth/seeds';

describe('random-seeding reference curves', () => {
  it('the gamma area law (shape = rate = 7/2) is a density with mean 1 and variance 2/7', () => {
    // Ferenc & Néda 2007 (pub, read in text): gamma with k = 7/2 has mean 1 and variance 1/k = 0.2857
    // (derived), close to Gilbert's 0.2802 (docs/check-values.md, pub, memory).
    let m0 = 0, m1 = 0, m2 = 0;
    const h = 1e-4;
    for (let y = h / 2; y < 12; y += h) { const f = pvAreaDensity(y); m0 += f * h; m1 += y * f * h; m2 += y * y * f * h; }
    expect(m0).toBeCloseTo(1, 6);
    expect(m1).toBeCloseTo(1, 6);
    expect(m2 - m1 * m1).toBeCloseTo(2 / 7, 5);
    expect(Math.abs(m2 - m1 * m1 - 0.2802)).toBeLessThan(0.01);
  });
});

describe('plot data of a random point pattern', () => {
  // 3000 uniform seeds in a square: the observed figures must approach the Poisson–Voronoi values.
  const W = 1000, H = 1000;
  const points = seedPoints(3000, W, H, 'random', 5);
  const analysis = analyze({ kind: 'points', points, width: W, height: H }, { pattern: 'points' });

  it('side-count fractions sum to 1 and follow p(n) of random seeding', async () => {
    const a = await analysis;
    const s = sideDistribution(a);
    expect(s.observed.y.reduce((x, y) => x + y, 0)).toBeCloseTo(1, 9);
    const p6 = s.observed.y[s.observed.x.indexOf(6)];
    // p(6) = 0.2947 (Hilhorst 2007, docs/check-values.md, pub, memory); ~2600 interior cells: sd ≈ 0.009.
    expect(Math.abs(p6 - 0.2947)).toBeLessThan(0.04);
    // Mean sides 6 (Euler, derived) minus a border bias; μ₂ = 1.781 (Brakke 1987, pub, memory).
    expect(Math.abs(s.mean - 6)).toBeLessThan(0.1);
    expect(Math.abs(s.mu2 - 1.781)).toBeLessThan(0.25);
    expect(s.reference.y[s.reference.x.indexOf(6)]).toBeCloseTo(0.294667, 6);
  });

  it('the area histogram is a density, with the CV of random seeding', async () => {
    const a = await analysis;
    const d = areaDistribution(a);
    expect(d.observed.y.reduce((x, y) => x + y * d.binWidth, 0)).toBeCloseTo(1, 6);
    // CV 0.529 = √0.2802 (Gilbert 1962, pub, memory; derived).
    expect(Math.abs(d.cv - 0.529)).toBeLessThan(0.05);
  });

  it('the pair correlation of random points stays near 1 beyond one spacing', async () => {
    const a = await analysis;
    const g = pairCorrelation(a);
    const far = g.observed.y.filter((_, k) => g.observed.x[k] > 1);
    const mean = far.reduce((x, y) => x + y, 0) / far.length;
    // g(r) = 1 for a Poisson process (Illian et al. 2008, derived from the definition).
    expect(Math.abs(mean - 1)).toBeLessThan(0.05);
  });

  it('Aboav–Weaire and Lewis data cover the observed side counts', async () => {
    const a = await analysis;
    const r = randomnessData(a);
    expect(r.n).toBeGreaterThan(2500);
    expect(r.lewis.observed.x).toContain(6);
    const i6 = r.lewis.observed.x.indexOf(6);
    // Lewis: six-sided cells of PV have close to mean area (Hilhorst 2005, pub, read in text).
    expect(Math.abs(r.lewis.observed.y[i6] - 1)).toBeLessThan(0.1);
    const j6 = r.aboav.observed.x.indexOf(6);
    // Aboav–Weaire for PV at n = 6: 6 m(6) = 36 + μ₂ ≈ 37.8 (a ≈ 0.7; pub, memory, loose).
    expect(Math.abs(r.aboav.observed.y[j6] - 37.8)).toBeLessThan(1.5);
  });
});
