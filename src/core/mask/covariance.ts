/**
 * The set covariance of a mask, γ(u) = |X ∩ (X + u)|, the area the window shares with itself moved by u:
 * the weight of the translation edge correction of Ripley's K in a window of any shape (Ohser 1983, Math.
 * Operationsforsch. Statist. Ser. Statist. 14:63; Ripley 1988, Statistical Inference for Spatial Processes;
 * pub, memory). For a W x H rectangle γ(u) = (W − |u_x|)(H − |u_y|).
 */
import type { PixelRuns } from './geometry';

/** γ at the integer offsets |dx| ≤ R, 0 ≤ dy ≤ R (γ(−u) = γ(u) gives the rest). */
export interface SetCovariance {
  /** Largest offset tabulated (px). */
  R: number;
  /** γ(dx, dy) at values[dy·(2R + 1) + dx + R] (px²). */
  values: Float64Array;
  /** γ(0) = the mask's area (px²). */
  area: number;
}

/**
 * The set covariance of the pixels `runs` at every integer offset up to R in each coordinate, from the runs
 * of row pairs: the overlap of run a of row y with run b of row y + dy moved back by dx is a trapezoid in dx,
 * whose second difference is four unit impulses (+1 at b0 − a1, −1 at min(b0 − a0, b1 − a1) and at their
 * max, +1 at b1 − a0); the impulses of every pair are summed and integrated twice. Exact: the counts are
 * whole numbers of pixels.
 *
 * @param rows number of rows of `runs` (rowStart has rows + 1 entries)
 * @param R the largest offset (px), a whole number ≥ 1
 */
export function setCovariance(runs: PixelRuns, rows: number, R: number): SetCovariance {
  const C = 2 * R + 1;
  const values = new Float64Array((R + 1) * C);
  // D[i] holds the impulses at d = i − R − 1, for −R − 1 < d ≤ R (index 1 .. 2R + 1).
  const D = new Float64Array(C + 1);
  const { rowStart, x0, x1 } = runs;
  for (let dy = 0; dy <= R; dy++) {
    D.fill(0);
    let v0 = 0; // f(−R − 1)
    let s0 = 0; // slope from impulses at d ≤ −R − 1
    const add = (d: number, c: number): void => {
      if (d > R) return;
      if (d <= -R - 1) {
        v0 += c * (-R - 1 - d);
        s0 += c;
      } else D[d + R + 1]! += c;
    };
    for (let ya = 0; ya + dy < rows; ya++) {
      const yb = ya + dy;
      const b0s = rowStart[yb]!;
      const b1s = rowStart[yb + 1]!;
      if (b0s === b1s) continue;
      for (let ka = rowStart[ya]!; ka < rowStart[ya + 1]!; ka++) {
        const a0 = x0[ka]!;
        const a1 = x1[ka]!;
        // Runs b with b1 − a0 > −R and b0 − a1 < R overlap a for some |dx| ≤ R.
        let lo = b0s;
        let hi = b1s;
        while (lo < hi) {
          const mid = (lo + hi) >> 1;
          if (x1[mid]! - a0 <= -R) lo = mid + 1;
          else hi = mid;
        }
        for (let kb = lo; kb < b1s; kb++) {
          const b0 = x0[kb]!;
          const b1 = x1[kb]!;
          if (b0 - a1 >= R) break;
          const p = b0 - a0;
          const q = b1 - a1;
          add(b0 - a1, 1);
          add(Math.min(p, q), -1);
          add(Math.max(p, q), -1);
          add(b1 - a0, 1);
        }
      }
    }
    // f(d) − f(d − 1) = Σ of the impulses at positions ≤ d − 1.
    let f = v0;
    let slope = s0;
    const row = dy * C;
    for (let d = -R; d <= R; d++) {
      slope += D[d + R]!;
      f += slope;
      values[row + d + R] = f;
    }
  }
  return { R, values, area: values[R]! };
}

/**
 * γ(dx, dy) at any offset with |dx|, |dy| < R: the bilinear interpolation of the tabulated values, which is
 * exact for a union of pixel squares (its covariance is the sum of the pixel pairs' tent functions).
 */
export function covarianceAt(c: SetCovariance, dx: number, dy: number): number {
  if (dy < 0) {
    dx = -dx;
    dy = -dy;
  }
  const R = c.R;
  const C = 2 * R + 1;
  const ix = Math.floor(dx);
  const iy = Math.floor(dy);
  if (ix < -R || ix >= R || iy >= R) return 0;
  const fx = dx - ix;
  const fy = dy - iy;
  const v = c.values;
  const k = iy * C + ix + R;
  return (1 - fy) * ((1 - fx) * v[k]! + fx * v[k + 1]!) + fy * ((1 - fx) * v[k + C]! + fx * v[k + C + 1]!);
}

const recent = new Map<string, SetCovariance>();

/**
 * The set covariance of a mask's pixels tabulated beyond `rmax` (px), kept for the last few masks: the
 * observation and its reference ask for the same one.
 */
export function maskCovariance(m: { key: string; pixels: PixelRuns; field: { y0: number; y1: number } }, rmax: number): SetCovariance {
  const R = Math.max(1, Math.ceil(rmax) + 1);
  const key = `${m.key}:${R}`;
  let c = recent.get(key);
  if (!c) {
    c = setCovariance(m.pixels, m.field.y1 - m.field.y0, R);
    recent.set(key, c);
    while (recent.size > 4) recent.delete(recent.keys().next().value!);
  }
  return c;
}
