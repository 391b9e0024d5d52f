/**
 * The centred L-function of a point pattern with the translation edge correction, in a rectangular field or
 * in a window of any shape given by its set covariance (mask/covariance.ts).
 */
import type { Rect } from '../types';
import { covarianceAt, type SetCovariance } from '../mask/covariance';
import { buildGrid } from './grid';

/**
 * Centred L-function L(r) − r of a point pattern at the given radii, from Ripley's K with the translation
 * edge correction: K(r) = A/(n(n−1)) Σ_{i≠j} 1(d_ij ≤ r)·A/((W − |dx|)(H − |dy|)), L = √(K/π).
 * Positive values: more pairs at distance ≤ r than for Poisson points (clustering); negative: fewer
 * (regularity). (Ripley 1977, J. R. Stat. Soc. B 39:172; Besag 1977; Ohser 1983; pub, memory.)
 * In a window X of any shape (a tissue mask) the same estimator with A = |X| and the set covariance
 * γ(u) = |X ∩ (X + u)| in place of (W − |dx|)(H − |dy|) (Ohser 1983, Math. Operationsforsch. Statist. Ser.
 * Statist. 14:63; pub, memory); γ is the mask's, exact for its pixel squares (mask/covariance.ts).
 *
 * @param field a rectangle holding the points (the field, or the mask's bounding box)
 * @param radii increasing radii (px), radii[k] = (k + 1)·Δ
 * @param window the window's set covariance, tabulated beyond the largest radius; absent: the field is the window
 */
export function lFunction(points: Float64Array, field: Rect, radii: Float64Array, window?: SetCovariance): Float64Array {
  const n = points.length / 2;
  const nr = radii.length;
  const out = new Float64Array(nr);
  if (n < 2 || nr === 0) return out.fill(Number.NaN);
  const W = field.x1 - field.x0;
  const H = field.y1 - field.y0;
  const rmax = radii[nr - 1]!;
  const dr = rmax / nr;
  const bins = new Float64Array(nr);
  const g = buildGrid(points, field, rmax);
  const { gw, gh, start, order } = g;
  // Coordinates in bucket order, so that the pair loops read memory in sequence.
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let q = 0; q < n; q++) {
    xs[q] = points[2 * order[q]!]!;
    ys[q] = points[2 * order[q]! + 1]!;
  }
  const r2max = rmax * rmax;
  const invDr = 1 / dr;
  // The bucket side is at least rmax: pairs lie in this bucket, the next one, or the three below. In
  // row-major bucket order this bucket and the next one are one run of memory, and so are the three
  // below; pairs are visited in the same order as bucket by bucket, so the sums are the same.
  for (let by = 0; by < gh; by++) {
    for (let bx = 0; bx < gw; bx++) {
      const b = by * gw + bx;
      const end0 = start[bx + 1 < gw ? b + 2 : b + 1]!;
      let lo1 = 0;
      let hi1 = 0;
      if (by + 1 < gh) {
        const row = (by + 1) * gw;
        lo1 = start[row + (bx > 0 ? bx - 1 : 0)]!;
        hi1 = start[row + (bx + 1 < gw ? bx + 2 : bx + 1)]!;
      }
      const bEnd = start[b + 1]!;
      for (let q = start[b]!; q < bEnd; q++) {
        const x = xs[q]!;
        const y = ys[q]!;
        for (let run = 0; run < 2; run++) {
          const uEnd = run === 0 ? end0 : hi1;
          for (let u = run === 0 ? q + 1 : lo1; u < uEnd; u++) {
            const dx = xs[u]! - x;
            const dy = ys[u]! - y;
            const d2 = dx * dx + dy * dy;
            if (d2 > r2max) continue;
            let k = Math.ceil(Math.sqrt(d2) * invDr) - 1;
            if (k < 0) k = 0;
            else if (k >= nr) k = nr - 1;
            if (window) bins[k]! += 1 / Math.max(1, covarianceAt(window, dx, dy));
            else bins[k]! += 1 / ((W - Math.abs(dx)) * (H - Math.abs(dy)));
          }
        }
      }
    }
  }
  const A = window ? window.area : W * H;
  let cum = 0;
  for (let k = 0; k < nr; k++) {
    cum += bins[k]!;
    const K = ((A * A) / (n * (n - 1))) * 2 * cum;
    out[k] = Math.sqrt(K / Math.PI) - radii[k]!;
  }
  return out;
}

/**
 * The radii of the L-function for a pattern of `cells` points in `field`: 25 steps up to min(2.5 spacings,
 * a quarter of the shorter side). In a mask: the spacing from the mask's `area`, the sides of its bounding box `field`.
 */
export function lRadii(cells: number, field: Rect, area?: number): Float64Array {
  const W = field.x1 - field.x0;
  const H = field.y1 - field.y0;
  const spacing = Math.sqrt((area ?? W * H) / Math.max(1, cells));
  const rmax = Math.min(2.5 * spacing, 0.25 * Math.min(W, H));
  const nr = 25;
  const r = new Float64Array(nr);
  for (let k = 0; k < nr; k++) r[k] = ((k + 1) * rmax) / nr;
  return r;
}
