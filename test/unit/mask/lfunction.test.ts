/**
 * The spacing statistics in a mask window.
 * - L-function with the translation correction in an irregular mask: against R's spatstat, Lest(X,
 *   correction = "translate"), computed once by scripts/reference/mask_spatstat.R and written beside this
 *   test (spatstat-mask.json, with its versions). spatstat tabulates the set covariance by FFT on its pixel
 *   grid and looks it up there, the project interpolates the exact covariance of the pixel squares: the two
 *   agree to 0.1 % of L here.
 * - In a mask that is the whole rectangle, the L-function equals the rectangle's (derived: its set covariance
 *   is (W − |dx|)(H − |dy|), and the area W·H).
 * - Clark–Evans in a mask: Donnelly's edge-corrected expectation and variance with the mask's area A and
 *   perimeter P (Donnelly 1978; docs/check-values.md, pub, memory), with the mean nearest-neighbour distance
 *   found by brute force here (derived).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { maskGeometry } from '../../../src/core/mask/geometry';
import { maskCovariance, setCovariance } from '../../../src/core/mask/covariance';
import { lFunction, lRadii } from '../../../src/core/stats/lfunction';
import { clarkEvans } from '../../../src/core/stats/pattern';

const ref = JSON.parse(readFileSync(new URL('./spatstat-mask.json', import.meta.url), 'utf8')) as {
  width: number; height: number; mask: string[]; areaPx2: number; x: number[]; y: number[]; r: number[]; Ltrans: number[];
};

function refMask() {
  const { width: W, height: H } = ref;
  const m = new Uint8Array(W * H);
  ref.mask.forEach((row, y) => {
    for (let x = 0; x < W; x++) m[y * W + x] = row[x] === '1' ? 1 : 0;
  });
  return maskGeometry(m, W, H, { x0: 0, y0: 0, x1: W, y1: H });
}

function refPoints(): Float64Array {
  const p = new Float64Array(2 * ref.x.length);
  ref.x.forEach((v, i) => ((p[2 * i] = v), (p[2 * i + 1] = ref.y[i]!)));
  return p;
}

describe('spacing statistics in a mask', () => {
  it('L(r) with the translation correction agrees with spatstat in an irregular mask with a hole', () => {
    const g = refMask();
    expect(g.area).toBe(ref.areaPx2);
    // spatstat's r starts at 0; the project's radii are (k + 1)·Δ.
    const radii = Float64Array.from(ref.r.slice(1));
    const L = lFunction(refPoints(), g.bbox, radii, setCovariance(g.pixels, ref.height, 22));
    for (let k = 0; k < radii.length; k++) {
      const ours = L[k]! + radii[k]!;
      const theirs = ref.Ltrans[k + 1]!;
      expect(Math.abs(ours - theirs)).toBeLessThan(Math.max(0.002, 1e-3 * theirs));
    }
  });

  it('in a mask that is the whole field, L(r) is the rectangle\'s', () => {
    const W = 90;
    const H = 70;
    const g = maskGeometry(new Uint8Array(W * H).fill(1), W, H, { x0: 0, y0: 0, x1: W, y1: H });
    let s = 11;
    const rnd = () => ((s = (s * 16807) % 2147483647) / 2147483647);
    const pts = Float64Array.from({ length: 240 }, (_, i) => (i % 2 ? H : W) * rnd());
    const radii = lRadii(120, g.bbox);
    const masked = lFunction(pts, g.bbox, radii, maskCovariance(g, radii[radii.length - 1]!));
    const plain = lFunction(pts, { x0: 0, y0: 0, x1: W, y1: H }, radii);
    for (let k = 0; k < radii.length; k++) expect(masked[k]).toBeCloseTo(plain[k]!, 9);
  });

  it('Clark–Evans in a mask uses its area and perimeter in Donnelly\'s correction', () => {
    const g = refMask();
    const pts = refPoints();
    const n = pts.length / 2;
    let sum = 0;
    for (let i = 0; i < n; i++) {
      let best = Infinity;
      for (let j = 0; j < n; j++) if (j !== i) best = Math.min(best, Math.hypot(pts[2 * j]! - pts[2 * i]!, pts[2 * j + 1]! - pts[2 * i + 1]!));
      sum += best;
    }
    const mean = sum / n;
    const A = g.area;
    const P = g.perimeter;
    const expected = 0.5 * Math.sqrt(A / n) + (0.0514 + 0.041 / Math.sqrt(n)) * (P / n);
    const sd = Math.sqrt(0.0703 * (A / (n * n)) + 0.037 * P * Math.sqrt(A / n ** 5));
    const ce = clarkEvans(pts, g.bbox, undefined, { area: A, perimeter: P });
    expect(ce.meanDistance).toBeCloseTo(mean, 10);
    expect(ce.R).toBeCloseTo(mean / (0.5 * Math.sqrt(A / n)), 10);
    expect(ce.Rcorrected).toBeCloseTo(mean / expected, 10);
    expect(ce.se).toBeCloseTo(sd / expected, 10);
  });
});
