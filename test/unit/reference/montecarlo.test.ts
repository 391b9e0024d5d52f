import { describe, it, expect } from 'vitest';
import { referenceMonteCarlo } from '../../../src/core/reference/montecarlo';
import { referenceSummary } from '../../../src/core/reference/summary';
import { SettingsError, TooFewCellsError } from '../../../src/core/errors';

const field = { x0: 0, y0: 0, x1: 2000, y1: 2000 };

describe('Monte Carlo reference reproduces the published Poisson–Voronoi values (window on a larger tessellation, weight rule, >= 100 000 interior cells)', () => {
  const ref = referenceMonteCarlo({ cells: 3000, field, replicates: 40, seed: 12345, edgeRule: 'weight', layout: 'window' });
  const seedsRef = referenceMonteCarlo({ cells: 3000, field, replicates: 20, seed: 12345, edgeRule: 'weight', layout: 'seeds' });

  it('has at least 100 000 interior cells in total', () => {
    expect(ref.interiorCellsTotal).toBeGreaterThanOrEqual(100000);
  });
  it('p(6) = 0.2947 ± 0.004 (Hilhorst 2007; Calka 2003; pub, memory)', () => {
    expect(Math.abs(ref.mean.p6 - 0.2947)).toBeLessThan(0.004);
  });
  it('mu2 = 1.781 ± 0.03 (Brakke 1987; Hilhorst 2007; pub, memory)', () => {
    expect(Math.abs(ref.mean.mu2 - 1.781)).toBeLessThan(0.03);
  });
  it('variance of the normalised area = 0.280 ± 0.01 (Gilbert 1962; Brakke 1987; pub, memory)', () => {
    expect(Math.abs(ref.mean.areaVariance - 0.2802)).toBeLessThan(0.01);
  });
  it('p(3)..p(7) each within 0.006 (Hayen & Quine 2000; Hilhorst 2007; pub, memory)', () => {
    // p(3) = 0.011244 (Hayen & Quine 2000), p(4) = 0.10684, p(5) = 0.25947, p(6) = 0.294667, p(7) = 0.19858
    // (Hilhorst 2007); pub, memory.
    const published: Record<number, number> = { 3: 0.011244, 4: 0.10684, 5: 0.25947, 6: 0.294667, 7: 0.19858 };
    for (let n = 3; n <= 7; n++) expect(Math.abs(ref.sides.mean[n]! - published[n]!)).toBeLessThan(0.006);
  });
  it('mean perimeter = 4/sqrt(lambda) within 1 % (Meijering 1953; pub, memory)', () => {
    expect(Math.abs(ref.mean.meanPerimeterScaled / 4 - 1)).toBeLessThan(0.01);
  });
  it('gamma shape of the normalised area near 7/2 (Ferenc & Néda 2007; pub, read in text), loose: the fit is not exact', () => {
    expect(Math.abs(ref.mean.gammaShape - 3.5)).toBeLessThan(0.15);
  });
  it('Lewis slope near 0.23 per side (Hilhorst 2005; pub, read in text) and Aboav–Weaire a within a loose band of 0.7 (memory, loose)', () => {
    expect(Math.abs(ref.mean.lewisSlope - 0.23)).toBeLessThan(0.03);
    expect(ref.mean.aboavA).toBeGreaterThan(0.4);
    expect(ref.mean.aboavA).toBeLessThan(1.0);
  });
  it('mean side number of the weighted interior cells is 6 (derived: Euler) within 0.01', () => {
    expect(Math.abs(ref.mean.meanSides - 6)).toBeLessThan(0.01);
  });
  it('Clark–Evans R of Poisson seeds (edge-corrected) is 1 within 2 standard errors of the replicate mean (Clark & Evans 1954, read in text; Donnelly 1978, memory)', () => {
    const se = seedsRef.sd.clarkEvansR / Math.sqrt(20);
    expect(Math.abs(seedsRef.mean.clarkEvansR - 1)).toBeLessThan(2 * se + 0.002);
  });
  it('the L-function envelope of Poisson seeds brackets 0 at every radius (derived: L(r) = r for Poisson points)', () => {
    for (let k = 0; k < seedsRef.lRadii.length; k++) {
      expect(seedsRef.lFunction.lo[k]!).toBeLessThan(0);
      expect(seedsRef.lFunction.hi[k]!).toBeGreaterThan(0);
      expect(Math.abs(seedsRef.lFunction.mean[k]!)).toBeLessThan(0.01 * seedsRef.lRadii[k]! + 0.3);
    }
  });
  it('centroids of Poisson–Voronoi cells are more regular than Poisson points: Clark–Evans R > 1.2 (follows from the construction; no published figure used)', () => {
    expect(ref.mean.clarkEvansR).toBeGreaterThan(1.2);
  });
});

describe('Monte Carlo reference: edge rule and determinism', () => {
  it('excluding edge cells without weights biases against large cells, hence against many-sided ones (docs/check-values.md section 3, Miles 1974, pub, memory; Lewis\'s law links size and sides)', () => {
    // Same seeds, two rules: unweighted interior cells have fewer sides on average; weighted ones about 6.
    const o = { cells: 300, field: { x0: 0, y0: 0, x1: 300, y1: 300 }, replicates: 60, seed: 3, layout: 'window' as const };
    const a = referenceMonteCarlo({ ...o, edgeRule: 'exclude' });
    const b = referenceMonteCarlo({ ...o, edgeRule: 'weight' });
    expect(a.mean.meanSides).toBeLessThan(b.mean.meanSides - 0.02);
    expect(Math.abs(b.mean.meanSides - 6)).toBeLessThan(0.03);
  });
  it('the same seed gives identical replicates, another seed different ones', () => {
    const o = { cells: 200, field: { x0: 5, y0: 5, x1: 405, y1: 305 }, replicates: 9, edgeRule: 'exclude' as const };
    // Drawn afresh each time (cache off): a cached second call would return the first object itself.
    const a = referenceMonteCarlo({ ...o, seed: 1, cache: false });
    const b = referenceMonteCarlo({ ...o, seed: 1, cache: false });
    const c = referenceMonteCarlo({ ...o, seed: 2, cache: false });
    expect(b).not.toBe(a);
    expect(Array.from(a.values.mu2)).toEqual(Array.from(b.values.mu2));
    expect(Array.from(a.values.mu2)).not.toEqual(Array.from(c.values.mu2));
    expect(JSON.stringify(referenceSummary(a))).toEqual(JSON.stringify(referenceSummary(b)));
  });
  it('the minimum cell area hides small cells and raises the seeds drawn to keep the visible density', () => {
    const r = referenceMonteCarlo({ cells: 500, field: { x0: 0, y0: 0, x1: 500, y1: 500 }, replicates: 5, seed: 4, edgeRule: 'exclude', minCellAreaPx: 150 });
    // 150 px² at 0.002 seeds per px² hides F = P(Y < 0.3) = 0.0459013 of the cells, Y gamma of shape and
    // rate 7/2 (Ferenc & Néda 2007; pub, read in text); 500 / (1 − F) = 524.05 seeds (scipy 1.10.1
    // gamma.cdf, scripts/reference/hidden_fraction.py).
    expect(r.seedsPerReplicate).toBe(524);
    const none = referenceMonteCarlo({ cells: 500, field: { x0: 0, y0: 0, x1: 500, y1: 500 }, replicates: 5, seed: 4, edgeRule: 'exclude' });
    expect(none.seedsPerReplicate).toBe(500);
  });
  it('the summary is plain JSON', () => {
    const r = referenceMonteCarlo({ cells: 100, field: { x0: 0, y0: 0, x1: 100, y1: 100 }, replicates: 3, seed: 4, edgeRule: 'weight' });
    const s = JSON.parse(JSON.stringify(referenceSummary(r, { includeValues: true })));
    expect(s.replicates).toBe(3);
    expect(s.statistics.mu2.values).toHaveLength(3);
    expect(s.sides.mean).toHaveLength(21);
  });
});

describe('Monte Carlo reference: bad input', () => {
  it('too few cells, no replicates, an empty field', () => {
    expect(() => referenceMonteCarlo({ cells: 2, field, replicates: 5, seed: 1, edgeRule: 'exclude' })).toThrow(TooFewCellsError);
    expect(() => referenceMonteCarlo({ cells: 20, field, replicates: 0, seed: 1, edgeRule: 'exclude' })).toThrow(SettingsError);
    expect(() => referenceMonteCarlo({ cells: 20, field: { x0: 0, y0: 0, x1: 0, y1: 5 }, replicates: 5, seed: 1, edgeRule: 'exclude' })).toThrow(SettingsError);
  });
  it('a field too small for its replicates: every cell touches the border', () => {
    expect(() => referenceMonteCarlo({ cells: 4, field: { x0: 0, y0: 0, x1: 10, y1: 10 }, replicates: 5, seed: 1, edgeRule: 'exclude' })).toThrow(/interior cell/);
  });
  it('few interior cells per replicate: computed, with a warning that names the cause', () => {
    const r = referenceMonteCarlo({ cells: 12, field: { x0: 0, y0: 0, x1: 10, y1: 10 }, replicates: 19, seed: 1, edgeRule: 'exclude' });
    expect(r.warnings.join(' ')).toMatch(/too small|no interior cell/);
  });
});

describe('window cells', () => {
  it('cells cut by the field tile it exactly; cells inside keep their values (derived)', async () => {
    const { windowCells } = await import('../../../src/core/reference/window');
    const { tessellate } = await import('../../../src/core/tessellate');
    const { seedPoints } = await import('../../../src/core/synth/seeds');
    const p = seedPoints(600, 300, 300, 'random', 3);
    const all = tessellate(p, { x0: 0, y0: 0, x1: 300, y1: 300 });
    const f = { x0: 50, y0: 40, x1: 250, y1: 230 };
    const w = windowCells(all, f);
    let a = 0;
    for (let k = 0; k < w.area.length; k++) {
      expect(w.area[k]).toBeGreaterThan(0);
      a += w.area[k]!;
      const cx = w.centroid[2 * k]!, cy = w.centroid[2 * k + 1]!;
      expect(cx >= f.x0 && cx <= f.x1 && cy >= f.y0 && cy <= f.y1).toBe(true);
    }
    expect(a).toBeCloseTo(200 * 190, 6);
  });
});

describe('Monte Carlo reference: cache', () => {
  const o = { cells: 150, field: { x0: 0, y0: 0, x1: 300, y1: 200 }, replicates: 7, seed: 11, edgeRule: 'exclude' as const, layout: 'window' as const };
  it('a repeated request returns the cached reference, equal to a fresh draw (derived: the reference is a function of its options)', async () => {
    const { clearReferenceCache } = await import('../../../src/core/reference/montecarlo');
    clearReferenceCache();
    const a = referenceMonteCarlo(o);
    let progress = 0;
    const b = referenceMonteCarlo({ ...o, field: { ...o.field }, onProgress: (f) => (progress = f) });
    expect(b).toBe(a);
    expect(progress).toBe(1);
    const fresh = referenceMonteCarlo({ ...o, cache: false });
    expect(fresh).not.toBe(a);
    expect(JSON.stringify(referenceSummary(fresh, { includeValues: true }))).toEqual(JSON.stringify(referenceSummary(a, { includeValues: true })));
    expect(Object.isFrozen(a)).toBe(true);
  });
  it('any change of cells, field, replicates, seed, edge rule, minimum area, layout or density draws a new reference', () => {
    // What was drawn, not the options read back: the replicate values of every statistic and the seed count.
    const drawn = (r: ReturnType<typeof referenceMonteCarlo>) =>
      JSON.stringify({ seeds: r.seedsPerReplicate, values: Object.fromEntries(Object.entries(r.values).map(([k, v]) => [k, Array.from(v)])) });
    const a = referenceMonteCarlo(o);
    const changed = [
      { ...o, cells: 151 }, { ...o, field: { ...o.field, x1: 301 } }, { ...o, replicates: 8 }, { ...o, seed: 12 },
      { ...o, edgeRule: 'weight' as const }, { ...o, minCellAreaPx: 60 }, { ...o, layout: 'seeds' as const }, { ...o, density: 0.003 },
    ];
    for (const c of changed) {
      const r = referenceMonteCarlo(c);
      // The cache returns what a fresh draw with these options gives (a key that missed the change would
      // return the first reference instead) ...
      expect(drawn(r)).toBe(drawn(referenceMonteCarlo({ ...c, cache: false })));
      // ... and the change changes what is drawn.
      expect(drawn(r)).not.toBe(drawn(a));
    }
  });
});
