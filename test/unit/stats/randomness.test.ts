import { describe, it, expect } from 'vitest';
import { randomness, monteCarloP, combinedMaxZ, MIN_INTERIOR_CELLS } from '../../../src/core/stats';
import { mulberry32, normal } from '../../../src/core/random';
import { tessellate } from '../../../src/core/tessellate';
import { seedPoints } from '../../../src/core/synth/seeds';
import { defaultSettings, type Settings } from '../../../src/core/settings';
import { referenceMonteCarlo } from '../../../src/core/reference/montecarlo';
import { windowCells as windowCellsFor } from '../../../src/core/reference/window';

function settings(replicates: number, seed: number): Settings {
  const s = defaultSettings();
  s.pattern = 'points';
  s.reference.replicates = replicates;
  s.reference.seed = seed;
  return s;
}
function analyse(order: 'random' | 'regular' | 'clustered', n: number, W: number, H: number, seed: number, s: Settings) {
  const t = tessellate(seedPoints(n, W, H, order, seed), { x0: 0, y0: 0, x1: W, y1: H });
  return randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: s });
}

describe('Monte Carlo p-values', () => {
  it('two-sided and upper-tail ranks (Besag & Diggle 1977; derived from the definition)', () => {
    const v = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19];
    expect(monteCarloP(100, v, 'upper')).toBeCloseTo(1 / 20, 12);
    expect(monteCarloP(100, v, 'two')).toBeCloseTo(2 / 20, 12);
    expect(monteCarloP(0, v, 'two')).toBeCloseTo(2 / 20, 12);
    expect(monteCarloP(10, v, 'two')).toBe(1);
    expect(monteCarloP(Number.NaN, v, 'two')).toBeNull();
    expect(monteCarloP(5, [Number.NaN, 1, 9], 'upper')).toBeCloseTo(2 / 3, 12);
  });
  it('the combined test ranks the observed largest standardised departure among all patterns', () => {
    const r1 = Array.from({ length: 99 }, (_, i) => Math.sin(i * 1.7));
    const r2 = Array.from({ length: 99 }, (_, i) => Math.cos(i * 2.3));
    const c = combinedMaxZ([5, 0], [r1, r2])!;
    expect(c.p).toBeCloseTo(1 / 100, 12); // the observed departs far more than any replicate
    expect(c.strongest).toBe(0);
    const mid = combinedMaxZ([0, 0], [r1, r2])!;
    expect(mid.p).toBeGreaterThan(0.9);
  });
  it('the agreement of several statistics that each depart a little in the same direction carries the test (derived: under H0 the sum of three independent standard normals has sd √3)', () => {
    // 199 replicates of three independent standard normals (Box–Muller on a fixed sequence).
    const rnd = mulberry32(42);
    const reps = [0, 1, 2].map(() => Array.from({ length: 199 }, () => normal(rnd)));
    // Each observed statistic 2 sd towards "regular" (the first two regular when low, the third when high).
    const obs = [-2, -2, 2];
    const signs = [-1, -1, 1];
    const maxOnly = combinedMaxZ(obs, reps)!;
    const both = combinedMaxZ(obs, reps, signs)!;
    // max |z| = 2 is exceeded by about 1 − (1 − 0.0455)³ ≈ 13 % of null patterns; the agreement 6/√3 ≈ 3.5 sd by fewer than 1 %.
    expect(maxOnly.p).toBeGreaterThan(0.05);
    expect(both.p).toBeLessThan(0.02);
    expect(both.byAgreement).toBe(true);
    expect(both.agreement!).toBeGreaterThan(3);
    // Disagreeing statistics cancel in the agreement: no gain over the maximum alone.
    const mixed = combinedMaxZ([-2, 2, 2], reps, signs)!;
    expect(mixed.byAgreement).toBe(false);
  });
});

describe('verdicts on synthetic patterns (the test keeps its size and has power)', () => {
  it('random seeding: "consistent with random seeding" in at least 90 of 100 seeds (size of a level-0.05 test)', () => {
    let consistent = 0;
    for (let k = 0; k < 100; k++) {
      const r = analyse('random', 200, 300, 300, 1000 + k, settings(99, 77 + k));
      expect(r.verdictText.startsWith(r.verdict!)).toBe(true);
      if (r.verdict === 'consistent with random seeding') consistent++;
    }
    expect(consistent).toBeGreaterThanOrEqual(90);
  });
  it('hard-core seeding: "more regular than random"', () => {
    for (let k = 0; k < 5; k++) expect(analyse('regular', 300, 400, 400, 2000 + k, settings(99, 5 + k)).verdict).toBe('more regular than random');
  });
  it('clustered seeding: "more irregular than random"', () => {
    for (let k = 0; k < 5; k++) expect(analyse('clustered', 300, 400, 400, 3000 + k, settings(99, 5 + k)).verdict).toBe('more irregular than random');
  });
  it('the verdict text names the test, the p-value, alpha and the statistic behind it', () => {
    const r = analyse('regular', 300, 400, 400, 2000, settings(99, 5));
    expect(r.verdictText).toMatch(/more regular than random \(combined Monte Carlo test .* p = [0-9.e-]+ at α = 0\.05, 99 replicates; strongest: .* = /);
    expect(r.basis.combines).toHaveLength(3);
  });
});

describe('randomness result', () => {
  const s = settings(39, 3);
  const t = tessellate(seedPoints(500, 500, 400, 'random', 8), { x0: 0, y0: 0, x1: 500, y1: 400 });
  const r = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: s });

  it('is plain JSON with the summary keys and a tests table', () => {
    const j = JSON.parse(JSON.stringify(r));
    // 39 replicates were drawn (derived): the interior cells summed over the replicates over their mean per
    // replicate (the mean printed to 6 digits).
    expect(j.reference.interiorCellsTotal / j.reference.statistics.interiorCells.mean).toBeCloseTo(39, 3);
    // The settings' seed is the one drawn from: another seed gives another reference.
    const other = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: settings(39, 4) });
    expect(other.reference!.statistics['mu2']!.mean).not.toBe(j.reference.statistics.mu2.mean);
    expect(j.sides.reference).toHaveLength(21);
    expect(typeof j.clarkEvans.R).toBe('number');
    expect(typeof j.largestGap.radius).toBe('number');
    expect(typeof j.largestGap.x).toBe('number');
    for (const row of j.tests) {
      expect(typeof row.name).toBe('string');
      expect('statistic' in row && 'referenceMean' in row && 'referenceSd' in row && 'pValue' in row).toBe(true);
    }
    expect(j.tests.map((x: { key: string }) => x.key)).toEqual(expect.arrayContaining(['mu2', 'p6', 'areaCv', 'ksDistance', 'clarkEvansR', 'lMaxDeviation', 'lewisSlope', 'aboavA', 'sidesChiSquare']));
  });
  it('plot data have matching lengths; the observed ECDF ends at 1 and the p(n) sum to 1 (derived)', () => {
    expect(r.areas.ecdf.observed.length).toBe(r.areas.ecdf.y.length);
    expect(r.areas.ecdf.mean.length).toBe(r.areas.ecdf.y.length);
    expect(r.lFunction.observed.length).toBe(r.lFunction.rPx.length);
    expect(r.sides.observed.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    expect(r.sides.lemaitre.value!).toBeCloseTo(r.sides.mu2! * r.sides.p6! ** 2, 12);
  });
  it('uses a reference passed in instead of drawing one', () => {
    const ref = referenceMonteCarlo({ cells: 500, field: t.field, replicates: 19, seed: 9, edgeRule: 'exclude' });
    const r2 = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: s, reference: ref });
    expect(r2.reference?.replicates).toBe(19);
    expect(r2.tests.find((x) => x.key === 'mu2')!.referenceMean).toBeCloseTo(ref.mean.mu2, 12);
  });
});

describe('randomness: bad input', () => {
  it('fewer interior cells than the statistics need: says how many, still reports what it can', () => {
    const t = tessellate(seedPoints(12, 100, 100, 'random', 1), { x0: 0, y0: 0, x1: 100, y1: 100 });
    const r = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: settings(19, 1) });
    expect(r.interiorCells).toBeLessThan(MIN_INTERIOR_CELLS);
    expect(r.verdict).toBeNull();
    expect(r.verdictText).toMatch(new RegExp(`at least ${MIN_INTERIOR_CELLS} interior cells; this field has ${r.interiorCells}`));
    expect(r.warnings.join(' ')).toMatch(/need at least 10 interior cells/);
    expect(r.largestGap!.radius).toBeGreaterThan(0);
    expect(r.clarkEvans.R).not.toBeNull();
  });
  it('no reference (replicates = 0): observed statistics and published constants only, with a warning', () => {
    const t = tessellate(seedPoints(200, 300, 300, 'random', 1), { x0: 0, y0: 0, x1: 300, y1: 300 });
    const r = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: settings(0, 1) });
    expect(r.verdict).toBeNull();
    expect(r.reference).toBeNull();
    expect(r.sides.mu2).not.toBeNull();
    expect(r.tests.find((x) => x.key === 'mu2')!.published!.value).toBeCloseTo(1.781, 3);
    expect(r.warnings.join(' ')).toMatch(/replicates is 0/);
  });
  it('too few replicates for the significance level: warned, not hidden', () => {
    const t = tessellate(seedPoints(200, 300, 300, 'random', 1), { x0: 0, y0: 0, x1: 300, y1: 300 });
    const r = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: settings(9, 1) });
    expect(r.warnings.join(' ')).toMatch(/smallest Monte Carlo p-value is 0\.100, above α = 0\.05/);
  });
  it('too few cells for a reference: none is drawn, the reason is given, the observed statistics kept', () => {
    const t = tessellate(Float64Array.from([1, 1, 9, 2, 5, 9, 2, 7]), { x0: 0, y0: 0, x1: 10, y1: 10 });
    const r = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: settings(19, 1) });
    expect(r.reference).toBeNull();
    expect(r.warnings.join(' ')).toMatch(/4 cells cannot be compared with random seeding/);
    expect(r.largestGap).not.toBeNull();
  });
  it('a field too small for a reference: the reference error is reported, the observed statistics kept', () => {
    // 12 cells in a strip 240 x 3 px: every cell of every replicate touches the border.
    const pts = Float64Array.from({ length: 24 }, (_, i) => (i % 2 ? 1 + (i % 3) * 0.5 : 10 + 20 * (i / 2)));
    const t = tessellate(pts, { x0: 0, y0: 0, x1: 240, y1: 3 });
    const r = randomness({ tessellation: t, sides: t.sides, area: t.area, edge: t.edge, settings: settings(19, 1) });
    expect(r.warnings.join(' ')).toMatch(/reference could not be drawn: .*interior cell/);
    expect(r.largestGap).not.toBeNull();
  });
});

describe('walls patterns: the window layout', () => {
  function wallsLike(seed: number, order: 'random' | 'regular' = 'random') {
    // A "segmentation" that is exactly the Voronoi tessellation of the seeds seen through the field; its
    // cells' centroids are what a walls analysis tessellates.
    const W = 300, H = 300;
    const f = { x0: 0, y0: 0, x1: W, y1: H };
    const big = seedPoints(Math.round(300 * (360 * 360) / (W * H)), 360, 360, order, seed);
    const inside: number[] = [];
    for (let i = 0; i < big.length / 2; i++) inside.push(big[2 * i]! - 30, big[2 * i + 1]! - 30);
    const all = tessellate(Float64Array.from(inside), { x0: -30, y0: -30, x1: 330, y1: 330 });
    const cut = windowCellsFor(all, f);
    const t = tessellate(cut.centroid, f);
    const s = settings(39, seed);
    s.pattern = 'walls';
    return randomness({ tessellation: t, sides: cut.sides, area: cut.area, edge: cut.edge, bbox: cut.bbox, settings: s, neighbours: { offsets: cut.neighbourOffsets, index: cut.neighbourIndex } });
  }
  it('a window on a random-seeding tessellation is "consistent with random seeding" in at least 8 of 10 seeds', () => {
    let ok = 0;
    for (let k = 0; k < 10; k++) {
      const r = wallsLike(400 + k);
      expect((r.reference as { layout: string }).layout).toBe('window');
      if (r.verdict === 'consistent with random seeding') ok++;
    }
    expect(ok).toBeGreaterThanOrEqual(8);
  });
  it('a window on a hard-core tessellation is "more regular than random"', () => {
    expect(wallsLike(7, 'regular').verdict).toBe('more regular than random');
  });
});
