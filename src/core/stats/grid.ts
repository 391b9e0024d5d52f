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
 * Distance from each point to its nearest other point (px), by ring search in a bucket grid.
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
  for (let i = 0; i < n; i++) {
    const x = points[2 * i]!;
    const y = points[2 * i + 1]!;
    const gx = Math.min(gw - 1, Math.max(0, Math.floor((x - g.x0) / cell)));
    const gy = Math.min(gh - 1, Math.max(0, Math.floor((y - g.y0) / cell)));
    let best = Infinity;
    for (let ring = 0; ; ring++) {
      // Points in ring `ring` are at least (ring - 1) * cell away (the point sits somewhere in its bucket).
      if ((ring - 1) * cell > Math.sqrt(best)) break;
      if (ring > gw && ring > gh) break;
      const ya = gy - ring;
      const yb = gy + ring;
      for (let yy = Math.max(0, ya); yy <= Math.min(gh - 1, yb); yy++) {
        const onEdgeRow = yy === ya || yy === yb;
        for (let xx = Math.max(0, gx - ring); xx <= Math.min(gw - 1, gx + ring); xx++) {
          if (!onEdgeRow && xx !== gx - ring && xx !== gx + ring) continue;
          const b = yy * gw + xx;
          for (let q = start[b]!; q < start[b + 1]!; q++) {
            const j = order[q]!;
            if (j === i) continue;
            const dx = points[2 * j]! - x;
            const dy = points[2 * j + 1]! - y;
            const d2 = dx * dx + dy * dy;
            if (d2 < best) best = d2;
          }
        }
      }
    }
    out[i] = Math.sqrt(best);
  }
  return out;
}
