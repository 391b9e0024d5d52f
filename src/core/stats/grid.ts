/** A uniform bucket grid over a rectangle for neighbour searches among points (counting sort, CSR). */
import type { Rect } from '../types';

export interface PointGrid {
  x0: number;
  y0: number;
  cell: number;
  gw: number;
  gh: number;
  /** Points of bucket b: order[start[b] .. start[b + 1]). */
  start: Int32Array;
  order: Int32Array;
}

/**
 * Buckets points (interleaved x, y) into square cells of side `cell` covering `field`.
 * @param points interleaved x, y (px)
 * @param field the rectangle the points lie in (px)
 * @param cell bucket side (px), > 0
 */
export function buildGrid(points: Float64Array, field: Rect, cell: number): PointGrid {
  const n = points.length / 2;
  const W = field.x1 - field.x0;
  const H = field.y1 - field.y0;
  // Cap the bucket count so that a tiny cell on a large field cannot exhaust memory.
  const c = Math.max(cell, Math.sqrt((W * H) / Math.max(16, 4 * n)));
  const gw = Math.max(1, Math.ceil(W / c));
  const gh = Math.max(1, Math.ceil(H / c));
  const start = new Int32Array(gw * gh + 1);
  const key = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const gx = Math.min(gw - 1, Math.max(0, Math.floor((points[2 * i]! - field.x0) / c)));
    const gy = Math.min(gh - 1, Math.max(0, Math.floor((points[2 * i + 1]! - field.y0) / c)));
    const k = gy * gw + gx;
    key[i] = k;
    start[k + 1]!++;
  }
  for (let b = 0; b < gw * gh; b++) start[b + 1] = start[b + 1]! + start[b]!;
  const fill = start.slice(0, gw * gh);
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[fill[key[i]!]!++] = i;
  return { x0: field.x0, y0: field.y0, cell: c, gw, gh, start, order };
}

/**
 * Distance from each point to its nearest other point (px), by ring search in a bucket grid of about one
 * point per bucket: the rings around a point's bucket are searched until every bucket left is farther
 * (from the point, to the searched block's border) than the nearest point found. Exact: the minimum of
 * the squared distances does not depend on the order they are visited in.
 * @param points interleaved x, y (px), at least 2 distinct positions
 * @param field the rectangle the points lie in
 */
export function nearestNeighbourDistances(points: Float64Array, field: Rect): Float64Array {
  const n = points.length / 2;
  const out = new Float64Array(n);
  if (n < 2) return out.fill(Number.NaN);
  const spacing = Math.sqrt(((field.x1 - field.x0) * (field.y1 - field.y0)) / n);
  const g = buildGrid(points, field, spacing);
  const { gw, gh, start, order, cell } = g;
  // Coordinates in bucket order: a row of buckets is then one run of memory.
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let q = 0; q < n; q++) {
    xs[q] = points[2 * order[q]!]!;
    ys[q] = points[2 * order[q]! + 1]!;
  }
  // Safety factor on the stopping distance: rounding in the bucket bounds must never stop a search early.
  const SHRINK = 1 - 1e-9;
  for (let by = 0; by < gh; by++) {
    for (let bx = 0; bx < gw; bx++) {
      const b = by * gw + bx;
      for (let q = start[b]!; q < start[b + 1]!; q++) {
        const x = xs[q]!;
        const y = ys[q]!;
        const rx = x - g.x0;
        const ry = y - g.y0;
        let best = Infinity;
        for (let ring = 0; ; ring++) {
          const xa = Math.max(0, bx - ring);
          const xb = Math.min(gw - 1, bx + ring);
          const ya = by - ring;
          const yb = by + ring;
          for (let yy = Math.max(0, ya); yy <= Math.min(gh - 1, yb); yy++) {
            const row = yy * gw;
            // Whole rows at the top and bottom of the ring, the two end buckets on the rows between.
            const full = ring === 0 || yy === ya || yy === yb;
            for (let side = 0; side < (full ? 1 : 2); side++) {
              let u0: number;
              let u1: number;
              if (full) {
                u0 = start[row + xa]!;
                u1 = start[row + xb + 1]!;
              } else {
                const xx = side === 0 ? bx - ring : bx + ring;
                if (xx < 0 || xx >= gw) continue;
                u0 = start[row + xx]!;
                u1 = start[row + xx + 1]!;
              }
              for (let u = u0; u < u1; u++) {
                if (u === q) continue;
                const dx = xs[u]! - x;
                const dy = ys[u]! - y;
                const d2 = dx * dx + dy * dy;
                if (d2 < best) best = d2;
              }
            }
          }
          // Distance from the point to the nearest unsearched bucket (none left on a side at the grid's edge).
          let bound = Infinity;
          if (bx - ring > 0) bound = Math.min(bound, rx - (bx - ring) * cell);
          if (bx + ring < gw - 1) bound = Math.min(bound, (bx + ring + 1) * cell - rx);
          if (by - ring > 0) bound = Math.min(bound, ry - (by - ring) * cell);
          if (by + ring < gh - 1) bound = Math.min(bound, (by + ring + 1) * cell - ry);
          if (bound === Infinity) break;
          bound *= SHRINK;
          if (bound > 0 && best <= bound * bound) break;
        }
        out[order[q]!] = Math.sqrt(best);
      }
    }
  }
  return out;
}
