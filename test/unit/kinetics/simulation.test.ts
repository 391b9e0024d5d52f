import { beforeAll, describe, expect, it } from 'vitest';
import { analyzeSeriesDetailed, halfTime, simulateGrowth, type FinalMosaic, type GrowthTruth, type KineticsResult } from '../../../src/core/kinetics/index';

// A 1024 x 1024 px periodic field: the site-saturation run has 1049 nuclei, the constant-rate run about 4800
// nuclei drawn (phantoms included), enough that the pattern's own scatter stays well inside the tolerances
// (five seeds tried while choosing the sizes: |n − 2| ≤ 0.02, k within 4 %; |n − 3| ≤ 0.04, k within 10 %).
const SIZE = 1024;

describe('planar growth from nuclei all present at t = 0 (site saturation)', () => {
  const lambda = 1e-3; // nuclei per px²
  const v = 1; // px per time unit
  const times = [2, 3, 4, 5, 6.5, 8, 10, 12.5, 15, 18, 22, 26, 31, 37];
  let truth: GrowthTruth;
  let result: KineticsResult;
  let mosaic: FinalMosaic;
  beforeAll(async () => {
    const sim = simulateGrowth({ width: SIZE, height: SIZE, mode: 'site-saturation', density: lambda, speed: v, times, seed: 11 });
    truth = sim.truth;
    const out = await analyzeSeriesDetailed(sim.frames, times, {}, { timeUnit: 'min' });
    result = out.result;
    mosaic = out.mosaic;
  });

  it('measures the fraction the simulation painted', () => {
    // derived: the frames are the painted discs plus noise far below the threshold, so f must equal the painted fraction
    result.frames.forEach((fr, j) => expect(Math.abs(fr.fraction - truth.renderedFraction[j]!)).toBeLessThan(2e-3));
    // derived: the painted fraction follows 1 − exp(−πλv²t²) (docs/check-values.md §4) up to the pattern's scatter
    truth.renderedFraction.forEach((f, j) => expect(Math.abs(f - truth.expectedFraction[j]!)).toBeLessThan(0.02));
  });

  it('fits n = 2 ± 0.1 and k within 10 % of πλv²', () => {
    // derived: docs/check-values.md §4, planar growth with site saturation has n = 2, k = πλv²
    const kTrue = Math.PI * lambda * v * v;
    expect(truth.k).toBeCloseTo(kTrue, 15);
    for (const fit of [result.fit.avramiPlot, result.fit.nonlinear!]) {
      expect(Math.abs(fit.n - 2)).toBeLessThan(0.1);
      expect(Math.abs(fit.k / kTrue - 1)).toBeLessThan(0.1);
      expect(fit.r2!).toBeGreaterThan(0.999);
      // derived: t½ = (ln 2 / k)^{1/n}, against the true half-time within the same tolerance as k
      expect(fit.tHalf).toBeCloseTo(halfTime(fit.n, fit.k), 10);
      expect(Math.abs(fit.tHalf / halfTime(2, kTrue) - 1)).toBeLessThan(0.05);
    }
    expect(result.fit.method).toBe('nonlinear');
    expect(result.avrami).toBe(result.fit.nonlinear);
  });

  it('reads site saturation, and checks k against πλv² from the domains', () => {
    const it = result.interpretation;
    expect(it.mechanism).toBe('site-saturation');
    // derived: the early domain count estimates λ (a little low: nuclei closer than 2·v·t1 have already met)
    expect(Math.abs(it.nucleusDensity!.value / lambda - 1)).toBeLessThan(0.06);
    // derived: isolated domains grow at v
    expect(Math.abs(it.growthSpeed!.value / v - 1)).toBeLessThan(0.02);
    expect(it.growthSpeed!.unit).toBe('px/min');
    expect(Math.abs(it.checks.siteSaturation!.ratio - 1)).toBeLessThan(0.12);
    expect(it.assumptions.length).toBeGreaterThan(2);
  });

  it('gives the final mosaic: one domain per nucleus, nuclei found where they were', () => {
    // derived: the end state of site saturation is the Voronoi tessellation of the nuclei (docs/check-values.md §4), one
    // cell per nucleus; on the periodic field a domain cut by the border counts once per piece, so a few extra.
    expect(mosaic.complete).toBe(true);
    expect(Math.abs(mosaic.labels.count / truth.nuclei.length - 1)).toBeLessThan(0.08);
    const present = new Set(mosaic.labels.labels);
    expect(present.size).toBe(mosaic.labels.count + 1);
    // each nucleus estimate (domain centroid where it first appeared) lies near a true nucleus
    const d = mosaic.nuclei.map((e) => Math.min(...truth.nuclei.map((t) => Math.hypot(t.x - e.x, t.y - e.y))));
    d.sort((a, b) => a - b);
    expect(d[Math.floor(d.length / 2)]!).toBeLessThan(1);
    expect(mosaic.wallsImage.width).toBe(SIZE);
  });

  it('is plain JSON with plot data', () => {
    const back = JSON.parse(JSON.stringify(result)) as KineticsResult;
    expect(back).toEqual(result);
    expect(back.plots.fraction.f).toHaveLength(times.length);
    expect(back.plots.curves.t.length).toBe(back.plots.curves.nonlinear!.length);
    expect(back.plots.avrami.used.filter(Boolean).length).toBe(result.fit.avramiPlot.frames.length);
    // The settings it records are the ones the fit used: the Avrami plot takes exactly the frames with
    // fitMin < f < fitMax (the fit range's definition).
    const { fitMin, fitMax } = back.settings.kinetics;
    const inRange = back.frames.flatMap((fr, j) => (fr.fraction > fitMin && fr.fraction < fitMax ? [j] : []));
    expect(back.fit.avramiPlot.frames).toEqual(inRange);
    expect(inRange.length).toBeLessThan(back.frames.length);
  });
});

describe('planar growth with a constant nucleation rate', () => {
  const rate = 1.6e-4; // nuclei per px² per time unit
  const v = 1;
  const times = [3, 4, 5, 6, 7, 8.5, 10, 12, 14, 16.5, 19, 22, 25, 28.5];
  let result: KineticsResult;
  beforeAll(async () => {
    const sim = simulateGrowth({ width: SIZE, height: SIZE, mode: 'constant-rate', rate, speed: v, times, seed: 5 });
    result = (await analyzeSeriesDetailed(sim.frames, times, {})).result;
  });

  it('fits n = 3 ± 0.15 and k within 15 % of πIv²/3', () => {
    // derived: docs/check-values.md §4, planar growth with a constant nucleation rate has n = 3, k = πIv²/3
    const kTrue = (Math.PI * rate * v * v) / 3;
    for (const fit of [result.fit.avramiPlot, result.fit.nonlinear!]) {
      expect(Math.abs(fit.n - 3)).toBeLessThan(0.15);
      expect(Math.abs(fit.k / kTrue - 1)).toBeLessThan(0.15);
      expect(Math.abs(fit.tHalf / halfTime(3, kTrue) - 1)).toBeLessThan(0.05);
    }
  });

  it('reads a constant rate, with a rising domain count and the growth speed of isolated domains', () => {
    const it = result.interpretation;
    expect(it.mechanism).toBe('constant-rate');
    expect(it.statement).toMatch(/domain count rises/);
    expect(Math.abs(it.growthSpeed!.value / v - 1)).toBeLessThan(0.02);
    // derived, a lower bound: nuclei that touch a domain, or are still below the minimum area, before a
    // frame are missed (seen at 0.85–0.87 of I over five seeds)
    const r = it.nucleationRate!.value / rate;
    expect(r).toBeGreaterThan(0.75);
    expect(r).toBeLessThan(1.02);
    expect(it.checks.constantRate!.ratio).toBeGreaterThan(0.9);
    expect(it.checks.constantRate!.ratio).toBeLessThan(1.4);
  });
});
