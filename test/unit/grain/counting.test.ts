import { describe, expect, it } from 'vitest';
import { grainSize, insideGrains, interceptCount, jeffriesCount, milesLantuejoulWeight, duplexCheck, gFromMeanArea } from '../../../src/core/grain/index';
import type { TestPattern } from '../../../src/core/grain/index';
import { defaultSettings } from '../../../src/core/settings';
import { makeLabels, squareGrid } from './helpers';

describe('Jeffries count on hand-made tilings (ASTM E112 half rule, pub read in text; Saltykov corner rule, pub read in text)', () => {
  it('10 px squares, test rectangle (5,5)-(45,45): 9 inside, 12 cut by a side, 4 at corners, N = 9 + 12/2 + 4/4 = 16', () => {
    const lab = squareGrid(50, 50, 10);
    const c = jeffriesCount(lab, { x0: 0, y0: 0, x1: 50, y1: 50 }, { shape: 'rectangle', x0: 5, y0: 5, x1: 45, y1: 45 });
    expect([c.inside, c.cut, c.corner]).toEqual([9, 12, 4]);
    expect(c.count).toBe(16);
    // Hand: 16 grains per 1600 px² is the tiling's true density of one per 100 px² (derived).
    expect(c.count / c.areaPx2).toBeCloseTo(1 / 100, 12);
    // Audit marks: one per counted grain, weights summing to N.
    expect(c.marks.length).toBe(25);
    expect(c.marks.reduce((s, m) => s + m.weight, 0)).toBe(16);
    expect(c.marks.filter((m) => m.weight === 0.25).length).toBe(4);
    for (const m of c.marks) expect(m.x >= 5 && m.x <= 45 && m.y >= 5 && m.y <= 45).toBe(true);
  });

  it('the same with 1 px walls (label 0) on the grid lines: walls are ignored, N = 16', () => {
    const lab = makeLabels(50, 50, (x, y) => (x % 10 === 0 || y % 10 === 0 ? 0 : Math.floor(y / 10) * 5 + Math.floor(x / 10) + 1));
    const c = jeffriesCount(lab, { x0: 0, y0: 0, x1: 50, y1: 50 }, { shape: 'rectangle', x0: 5, y0: 5, x1: 45, y1: 45 });
    expect(c.count).toBe(16);
  });

  it('the same rectangle with a wall pixel at a corner: the nearest grain holds the corner, N = 16', () => {
    const lab = squareGrid(50, 50, 10);
    lab.labels[5 * 50 + 5] = 0;
    const c = jeffriesCount(lab, { x0: 0, y0: 0, x1: 50, y1: 50 }, { shape: 'rectangle', x0: 5, y0: 5, x1: 45, y1: 45 });
    expect(c.corner).toBe(4);
    expect(c.count).toBe(16);
  });

  it('rectangle = whole field of a 4 × 4 grid: grains on the field border count as cut: 4 + 8/2 + 4/4 = 9', () => {
    const lab = squareGrid(40, 40, 10);
    const c = jeffriesCount(lab, { x0: 0, y0: 0, x1: 40, y1: 40 }, { shape: 'rectangle', x0: 0, y0: 0, x1: 40, y1: 40 });
    expect([c.inside, c.cut, c.corner, c.count]).toEqual([4, 8, 4, 9]);
  });

  it('circle r = 14 at (15,15) on a 3 × 3 grid of 10 px squares: 1 inside, 8 cut, N = 5; unbiased N = 4 (Li & Zhou 2011, pub read in text)', () => {
    // Hand: the centre square's farthest pixel centre is 6.4 px away; each outer square has a pixel centre beyond 14 px.
    const lab = squareGrid(30, 30, 10);
    const field = { x0: 0, y0: 0, x1: 30, y1: 30 };
    const fig = { shape: 'circle' as const, cx: 15, cy: 15, r: 14 };
    const c = jeffriesCount(lab, field, fig);
    expect([c.inside, c.cut, c.corner, c.count]).toEqual([1, 8, 0, 5]);
    expect(c.areaPx2).toBeCloseTo(Math.PI * 196, 9);
    const u = jeffriesCount(lab, field, fig, { unbiased: true });
    expect(u.count).toBe(4);
    expect(u.rule).toMatch(/− 1/);
  });

  it('rectangle with the unbiased option: the corner rule already is the −1 correction (4·¼ = 4·½ − 1, derived), N unchanged', () => {
    const lab = squareGrid(50, 50, 10);
    // 9 inside + 12/2 cut + 4 corners at ¼ = 9 + 12/2 + 4/2 − 1 = 16 (derived): the option changes nothing.
    const fig = { shape: 'rectangle' as const, x0: 5, y0: 5, x1: 45, y1: 45 };
    const c = jeffriesCount(lab, { x0: 0, y0: 0, x1: 50, y1: 50 }, fig, { unbiased: true });
    const plain = jeffriesCount(lab, { x0: 0, y0: 0, x1: 50, y1: 50 }, fig);
    expect([c.inside, c.cut, c.corner]).toEqual([9, 12, 4]);
    expect(c.count).toBe(16);
    expect(plain.count).toBe(16);
  });

  it('rotating the image by 90° leaves a centred circle count unchanged (derived invariant)', () => {
    const lab = makeLabels(60, 60, (x, y) => 1 + ((Math.floor(x / 7) * 13 + Math.floor(y / 11) * 7) % 40));
    // Relabel to 1..count so every label is present.
    const seen = new Map<number, number>();
    for (let i = 0; i < lab.labels.length; i++) {
      const l = lab.labels[i]!;
      if (!seen.has(l)) seen.set(l, seen.size + 1);
      lab.labels[i] = seen.get(l)!;
    }
    lab.count = seen.size;
    const rot = makeLabels(60, 60, (x, y) => lab.labels[(59 - x) * 60 + y]!);
    rot.count = lab.count;
    const field = { x0: 0, y0: 0, x1: 60, y1: 60 };
    const fig = { shape: 'circle' as const, cx: 30, cy: 30, r: 29 };
    const a = jeffriesCount(lab, field, fig);
    const b = jeffriesCount(rot, field, fig);
    expect([b.inside, b.cut]).toEqual([a.inside, a.cut]);
  });
});

const line = (x0: number, y0: number, x1: number, y1: number, angleDeg = 0): TestPattern => ({ kind: 'line', angleDeg, x0, y0, x1, y1 });

describe('intercept counting rules on hand-made tilings (ASTM E112 intercept procedure; pub, read in text)', () => {
  const stripes = makeLabels(50, 30, (x) => Math.floor(x / 10) + 1);
  const field = { x0: 0, y0: 0, x1: 50, y1: 30 };

  it('a horizontal line across five 10 px stripes crosses 4 boundaries: P = 4, N = 3 whole + 2 half = 4', () => {
    const c = interceptCount(stripes, field, [line(0, 15.5, 50, 15.5)]);
    expect(c.P).toBe(4);
    expect(c.N).toBe(4);
    const xs = c.lines[0]!.crossings.map((k) => k.x);
    xs.forEach((x, i) => expect(Math.abs(x - 10 * (i + 1))).toBeLessThan(0.3));
    expect(c.lines[0]!.crossings.every((k) => k.kind === 'cross' && k.weight === 1)).toBe(true);
  });

  it('a vertical line inside one stripe crosses nothing: P = 0', () => {
    const c = interceptCount(stripes, field, [line(15.5, 0, 15.5, 30, 90)]);
    expect(c.P).toBe(0);
  });

  it('a circle r = 8 at (25,15) crosses the boundaries x = 20 and x = 30 twice each: P = 4', () => {
    const c = interceptCount(stripes, field, [{ kind: 'circle', cx: 25, cy: 15, r: 8 }]);
    expect(c.P).toBe(4);
    expect(c.N).toBe(4);
    expect(c.lengthPx).toBeCloseTo(16 * Math.PI, 9);
  });

  it('2 px walls (label 0) between the stripes: each wall is one boundary, P = 4', () => {
    const walled = makeLabels(50, 30, (x) => (x % 10 < 2 && x >= 10 ? 0 : Math.floor(x / 10) + 1));
    const c = interceptCount(walled, field, [line(0, 15.5, 50, 15.5)]);
    expect(c.P).toBe(4);
  });

  // Grains 1 (top left), 2 (top right) and 3 (bottom) meet at the triple point (10, 10).
  const tee = makeLabels(20, 20, (x, y) => (y >= 10 ? 3 : x < 10 ? 1 : 2));
  const f20 = { x0: 0, y0: 0, x1: 20, y1: 20 };

  it('a diagonal through the triple point (10,10) counts 1.5', () => {
    const c = interceptCount(tee, f20, [line(0.5, 0.5, 19.5, 19.5, -45)]);
    expect(c.P).toBe(1.5);
    expect(c.lines[0]!.crossings[0]!.kind).toBe('triple');
  });

  it('a horizontal line at y = 5.5 crosses the 1|2 boundary away from the junction: 1', () => {
    expect(interceptCount(tee, f20, [line(0, 5.5, 20, 5.5)]).P).toBe(1);
  });

  // Grain 2 is the bottom-right quadrant x ≥ 10, y ≥ 10; the lines x + y = c run at 45°.
  const quad = makeLabels(20, 20, (x, y) => (x >= 10 && y >= 10 ? 2 : 1));
  const diag = (c: number): TestPattern => {
    const x0 = Math.max(0.5, c - 19.5);
    return line(x0, c - x0, c - x0, x0, 45);
  };

  it('a line grazing the corner (x + y = 20.28, a 0.4 px chord) is a tangent hit: 1', () => {
    const c = interceptCount(quad, f20, [diag(20.28)]);
    expect(c.P).toBe(1);
    expect(c.lines[0]!.crossings[0]!.kind).toBe('tangent');
  });

  it('a line cutting the corner (x + y = 24, a 5.7 px chord) crosses twice: 2', () => {
    expect(interceptCount(quad, f20, [diag(24)]).P).toBe(2);
  });

  it('a line missing the corner (x + y = 19.5): 0', () => {
    expect(interceptCount(quad, f20, [diag(19.5)]).P).toBe(0);
  });

  // The bricks are offset so that no test line runs along a boundary.
  it('bricks 40 × 10 px: ℓ̄(0°)/ℓ̄(90°) = (410/10)/(410/41) = 4.1 (hand count: 10 vertical and 41 horizontal boundaries cross the lines)', () => {
    const bricks = makeLabels(410, 410, (x, y) => Math.floor((y + 4) / 10) * 11 + Math.floor((x + 3) / 40) + 1);
    const s = defaultSettings();
    s.grain.lineAngles = [0, 90];
    const r = grainSize({ labels: bricks, umPerPx: 1, field: { x0: 0, y0: 0, x1: 410, y1: 410 }, pattern: 'walls', settings: s });
    const p0 = r.intercept!.patterns.find((p) => p.angleDeg === 0)!;
    const p90 = r.intercept!.patterns.find((p) => p.angleDeg === 90)!;
    expect(p0.P).toBe(5 * 10);
    expect(p90.P).toBe(5 * 41);
    expect(Math.abs(r.intercept!.anisotropy!.ratio - 4.1)).toBeLessThan(0.001);
  });
});

describe('mean area of grains wholly inside the field, Miles–Lantuéjoul weighted (Miles 1974; Lantuéjoul 1978; pub, memory)', () => {
  // Field 40 × 40: A = [10,30)×[10,20) (200 px², box 20 × 10), B = [10,20)×[20,30), C = [20,30)×[20,30) (100 px² each);
  // grain 1 is the rest and touches the border.
  const lab = makeLabels(40, 40, (x, y) => {
    if (y >= 10 && y < 20 && x >= 10 && x < 30) return 2;
    if (y >= 20 && y < 30 && x >= 10 && x < 20) return 3;
    if (y >= 20 && y < 30 && x >= 20 && x < 30) return 4;
    return 1;
  });
  const field = { x0: 0, y0: 0, x1: 40, y1: 40 };

  it('three grains inside; weights 1600/600 and 1600/900; weighted mean 142.857 px², plain mean 133.33 px² (hand)', () => {
    const ig = insideGrains(lab, field);
    expect(ig.labels).toEqual([2, 3, 4]);
    expect(ig.areaPx2).toEqual([200, 100, 100]);
    expect(milesLantuejoulWeight(40, 40, 20, 10)).toBeCloseTo(1600 / 600, 12);
    const s = defaultSettings();
    const r = grainSize({ labels: lab, umPerPx: 1, field, pattern: 'walls', settings: s });
    expect(r.meanArea!.grains).toBe(3);
    expect(r.meanArea!.meanArea_um2).toBeCloseTo(400 / 3, 9);
    const wA = 1600 / 600;
    const wB = 1600 / 900;
    expect(r.meanArea!.meanAreaWeighted_um2).toBeCloseTo((wA * 200 + 2 * wB * 100) / (wA + 2 * wB), 9);
    expect(Math.abs(r.meanArea!.meanAreaWeighted_um2 - 142.857)).toBeLessThan(0.001);
    expect(r.meanArea!.G).toBeCloseTo(gFromMeanArea(142.857e-6), 4);
  });
});

describe('two populations in the per-grain G histogram (trade: a flag to look, not a rule of the standard)', () => {
  it('8 px squares beside 32 px squares (areas 16× apart = 4 G units, derived) are flagged duplex', () => {
    const lab = makeLabels(256, 128, (x, y) => (x < 128 ? Math.floor(y / 8) * 16 + Math.floor(x / 8) + 1 : 257 + Math.floor(y / 32) * 4 + Math.floor((x - 128) / 32)));
    const r = grainSize({ labels: lab, umPerPx: 1, field: { x0: 0, y0: 0, x1: 256, y1: 128 }, pattern: 'walls', settings: defaultSettings() });
    expect(r.meanArea!.duplex).toBe(true);
    expect(r.warnings.some((w) => /Two grain size populations/.test(w))).toBe(true);
    const counts = r.meanArea!.histogram.filter((b) => b.count > 0);
    expect(counts.length).toBe(2);
    expect(counts[1]!.g0 - counts[0]!.g0).toBeCloseTo(4, 0);
    expect(r.meanArea!.histogram.reduce((s, b) => s + b.areaFraction, 0)).toBeCloseTo(1, 12);
  });

  it('one log-normal population with the spread of a random tessellation (sd 0.8 G) is not flagged', () => {
    // Normal deviates by Box–Muller on a fixed lattice of (u1, u2), so the test is deterministic.
    const g: number[] = [];
    for (let i = 0; i < 400; i++) {
      const u1 = (i + 0.5) / 400;
      const u2 = ((i * 0.618034) % 1) + 1e-9;
      g.push(8 + 0.8 * Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2));
    }
    const d = duplexCheck(g, g.map((v) => 2 ** -v));
    expect(d.duplex).toBe(false);
  });
});
