import { describe, it, expect } from 'vitest';
import { largestGap } from '../../../src/core/stats/gap';
import { clarkEvans, ksDistance, gammaShapeMle, weightedLine, cellSample, sideStats, areaStats, lFunction, lRadii } from '../../../src/core/stats/pattern';
import { digamma } from '../../../src/core/stats/dist';
import { voronoiLikeness } from '../../../src/core/stats/likeness';
import { tessellate } from '../../../src/core/tessellate';
import { seedPoints } from '../../../src/core/synth/seeds';
import type { LabelImage, Rect } from '../../../src/core/types';

/** Exhaustive largest empty circle centred in the rectangle: circumcentres of triples, bisector/border crossings, corners. */
function bruteGap(p: Float64Array, f: Rect): number {
  const n = p.length / 2;
  const cands: [number, number][] = [[f.x0, f.y0], [f.x1, f.y0], [f.x0, f.y1], [f.x1, f.y1]];
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) {
    const ax = p[2 * i]!, ay = p[2 * i + 1]!, bx = p[2 * j]!, by = p[2 * j + 1]!;
    // Bisector: points q with |q - a|^2 = |q - b|^2, i.e. 2 (b - a) . q = |b|^2 - |a|^2.
    const ux = 2 * (bx - ax), uy = 2 * (by - ay), c = bx * bx + by * by - ax * ax - ay * ay;
    for (const x of [f.x0, f.x1]) if (uy !== 0) { const y = (c - ux * x) / uy; if (y >= f.y0 && y <= f.y1) cands.push([x, y]); }
    for (const y of [f.y0, f.y1]) if (ux !== 0) { const x = (c - uy * y) / ux; if (x >= f.x0 && x <= f.x1) cands.push([x, y]); }
    for (let k = j + 1; k < n; k++) {
      const cx = p[2 * k]!, cy = p[2 * k + 1]!;
      const d = 2 * (ax * (by - cy) + bx * (cy - ay) + cx * (ay - by));
      if (Math.abs(d) < 1e-12) continue;
      const x = ((ax * ax + ay * ay) * (by - cy) + (bx * bx + by * by) * (cy - ay) + (cx * cx + cy * cy) * (ay - by)) / d;
      const y = ((ax * ax + ay * ay) * (cx - bx) + (bx * bx + by * by) * (ax - cx) + (cx * cx + cy * cy) * (bx - ax)) / d;
      if (x >= f.x0 && x <= f.x1 && y >= f.y0 && y <= f.y1) cands.push([x, y]);
    }
  }
  let best = 0;
  for (const [x, y] of cands) {
    let m = Infinity;
    for (let i = 0; i < n; i++) m = Math.min(m, Math.hypot(p[2 * i]! - x, p[2 * i + 1]! - y));
    best = Math.max(best, m);
  }
  return best;
}

describe('largest gap', () => {
  it('matches an exhaustive search on small random sets (derived: the centre is a vertex of the clipped Voronoi diagram)', () => {
    const f: Rect = { x0: 0, y0: 0, x1: 100, y1: 70 };
    for (let s = 0; s < 25; s++) {
      const n = 3 + (s % 12);
      const p = seedPoints(n, 100, 70, s % 3 === 0 ? 'clustered' : 'random', 500 + s);
      const g = largestGap(tessellate(p, f));
      expect(g.radius).toBeCloseTo(bruteGap(p, f), 9);
      expect(g.x >= f.x0 && g.x <= f.x1 && g.y >= f.y0 && g.y <= f.y1).toBe(true);
      let nearest = Infinity;
      for (let i = 0; i < n; i++) nearest = Math.min(nearest, Math.hypot(p[2 * i]! - g.x, p[2 * i + 1]! - g.y));
      expect(nearest).toBeCloseTo(g.radius, 9);
    }
  });
});

describe('Clark–Evans', () => {
  it('Poisson points: edge-corrected R within 2 standard errors of 1 in at least 34 of 40 sets (Clark & Evans 1954, read in text; Donnelly 1978, memory)', () => {
    let inside = 0;
    for (let s = 0; s < 40; s++) {
      const p = seedPoints(1000, 500, 400, 'random', 900 + s);
      const ce = clarkEvans(p, { x0: 0, y0: 0, x1: 500, y1: 400 });
      if (Math.abs(ce.Rcorrected - 1) < 2 * ce.se) inside++;
    }
    expect(inside).toBeGreaterThanOrEqual(34);
  });
  it('hexagonal lattice: R = 2.1491 (Clark & Evans 1954, pub, read in text)', () => {
    const d = 3, nx = 30, ny = 20;
    const h = (Math.sqrt(3) / 2) * d;
    const pts: number[] = [];
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) pts.push((i + 0.25 + (j % 2) * 0.5) * d, (j + 0.5) * h);
    // The field holds exactly one lattice cell (area d * h) per point, so lambda = N / A is the lattice density.
    const ce = clarkEvans(Float64Array.from(pts), { x0: 0, y0: 0, x1: nx * d, y1: ny * h });
    expect(ce.meanDistance).toBeCloseTo(d, 9);
    expect(ce.R).toBeCloseTo(2.1491, 3);
  });
  it('nearest neighbours from the tessellation graph equal the grid search', () => {
    const p = seedPoints(800, 300, 300, 'clustered', 4);
    const f = { x0: 0, y0: 0, x1: 300, y1: 300 };
    const t = tessellate(p, f);
    expect(clarkEvans(p, f, { offsets: t.neighbourOffsets, index: t.neighbourIndex }).meanDistance).toBeCloseTo(clarkEvans(p, f).meanDistance, 12);
  });
});

describe('L-function', () => {
  it('a hexagonal lattice has no pairs closer than its spacing: L(r) - r = -r below it (derived)', () => {
    const d = 10, nx = 20, ny = 20;
    const h = (Math.sqrt(3) / 2) * d;
    const pts: number[] = [];
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) pts.push((i + 0.25 + (j % 2) * 0.5) * d, (j + 0.5) * h);
    const f = { x0: 0, y0: 0, x1: nx * d, y1: ny * h };
    const r = lRadii(nx * ny, f);
    const L = lFunction(Float64Array.from(pts), f, r);
    for (let k = 0; k < r.length; k++) if (r[k]! < d * 0.999) expect(L[k]).toBeCloseTo(-r[k]!, 9);
  });
});

describe('small statistics helpers', () => {
  it('digamma(1) = -0.5772156649 (Euler–Mascheroni constant; pub) and the gamma ML shape inverts ln k - psi(k)', () => {
    expect(digamma(1)).toBeCloseTo(-0.5772156649, 9);
    for (const k of [0.7, 3.5, 20]) expect(gammaShapeMle(Math.log(k) - digamma(k))).toBeCloseTo(k, 8);
  });
  it('Kolmogorov–Smirnov distance of a hand sample against the uniform CDF (derived by hand: 0.2667)', () => {
    const a = { mean: 1, variance: 0, cv: 0, gammaShape: 0, sorted: Float64Array.from([0.1, 0.4, 0.8]), cumulative: Float64Array.from([1 / 3, 2 / 3, 1]) };
    expect(ksDistance(a, (y) => y)).toBeCloseTo(0.8 / 3, 12);
  });
  it('weighted least squares on exact points and the Miles–Lantuéjoul weights (docs/check-values.md section 3)', () => {
    const f = weightedLine([1, 2, 3], [3, 5, 7], [1, 1, 1]);
    expect(f.slope).toBeCloseTo(2, 12);
    expect(f.intercept).toBeCloseTo(1, 12);
    expect(f.r2).toBeCloseTo(1, 12);
    const bbox = Float64Array.from([10, 10, 20, 30, 0, 0, 5, 5]);
    const s = cellSample(Float64Array.from([100, 20]), Uint8Array.from([0, 1]), bbox, { x0: 0, y0: 0, x1: 100, y1: 50 }, 'weight', 0);
    expect(Array.from(s.index)).toEqual([0]);
    expect(s.weight[0]).toBeCloseTo((100 * 50) / (90 * 30), 12);
  });
  it('side and area statistics of a hand-made sample (derived)', () => {
    const s = cellSample(Float64Array.from([1, 2, 3, 2]), Uint8Array.from([0, 0, 0, 0]), null, { x0: 0, y0: 0, x1: 10, y1: 10 }, 'exclude', 0);
    const ss = sideStats(Int32Array.from([5, 6, 7, 6]), s);
    expect(ss.mean).toBe(6);
    expect(ss.mu2).toBeCloseTo(0.5, 12);
    expect(ss.p6).toBe(0.5);
    const as = areaStats(Float64Array.from([1, 2, 3, 2]), s);
    expect(as.mean).toBe(2);
    expect(as.variance).toBeCloseTo(0.125, 12); // y = 0.5, 1, 1.5, 1
    expect(Array.from(as.sorted)).toEqual([0.5, 1, 1, 1.5]);
  });
});

describe('Voronoi-likeness', () => {
  function rasterNearest(p: Float64Array, W: number, H: number): LabelImage {
    const labels = new Int32Array(W * H);
    const n = p.length / 2;
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
      let best = 0, bd = Infinity;
      for (let i = 0; i < n; i++) { const d = (p[2 * i]! - x - 0.5) ** 2 + (p[2 * i + 1]! - y - 0.5) ** 2; if (d < bd) { bd = d; best = i; } }
      labels[y * W + x] = best + 1;
    }
    return { width: W, height: H, labels, count: n };
  }
  it('cells drawn as the Voronoi cells of the tessellated points overlap them fully (derived)', () => {
    const W = 120, H = 90;
    const p = seedPoints(40, W, H, 'random', 2);
    const t = tessellate(p, { x0: 0, y0: 0, x1: W, y1: H });
    const v = voronoiLikeness(rasterNearest(p, W, H), t, t.edge);
    expect(v.overallOverlap).toBe(1);
    expect(v.medianOverlap).toBe(1);
  });
  it('cells drawn around other seeds overlap less', () => {
    const W = 120, H = 90;
    const p = seedPoints(40, W, H, 'random', 2);
    const q = p.map((v, i) => v + (i % 2 ? 4 : -4) * Math.sin(i));
    for (let i = 0; i < q.length; i++) q[i] = Math.min(i % 2 ? H - 0.01 : W - 0.01, Math.max(0, q[i]!));
    const t = tessellate(p, { x0: 0, y0: 0, x1: W, y1: H });
    const v = voronoiLikeness(rasterNearest(q, W, H), t, t.edge);
    expect(v.overallOverlap).toBeLessThan(0.95);
  });
});
