/**
 * Overlay drawing that writes into any object with moveTo / lineTo / closePath: a canvas 2D context, a
 * Path2D, or the SVG path builder below. One renderer serves the Bench and the tests.
 */
import type { Tessellation } from '../../core/tessellate/types';
import type { Rect } from '../../core/types';

/** The drawing calls the renderer uses. */
export interface PathSink {
  moveTo(x: number, y: number): void;
  lineTo(x: number, y: number): void;
  closePath(): void;
}

/** Builds an SVG path `d` attribute; coordinates rounded to 0.01 px. */
export class SvgPathBuilder implements PathSink {
  private parts: string[] = [];
  moveTo(x: number, y: number): void { this.parts.push(`M${r2(x)} ${r2(y)}`); }
  lineTo(x: number, y: number): void { this.parts.push(`L${r2(x)} ${r2(y)}`); }
  closePath(): void { this.parts.push('Z'); }
  toString(): string { return this.parts.join(''); }
}
function r2(v: number): number { return Math.round(v * 100) / 100; }

/** Cell count of a tessellation. */
export function cellCount(t: Tessellation): number {
  return t.points.length / 2;
}

/** The clipped Voronoi cells as closed polygons (each ends on its first vertex). Cells listed in `only` (0-based) when given. */
export function drawVoronoi(sink: PathSink, t: Tessellation, only?: Iterable<number>): void {
  const cells = only ?? range(cellCount(t));
  for (const i of cells) {
    const a = t.polygonOffsets[i], b = t.polygonOffsets[i + 1];
    if (b - a < 2) continue;
    sink.moveTo(t.polygonCoords[2 * a], t.polygonCoords[2 * a + 1]);
    for (let k = a + 1; k < b; k++) sink.lineTo(t.polygonCoords[2 * k], t.polygonCoords[2 * k + 1]);
    // Closed with a line back to the first vertex, not closePath(): Chromium's Path2D.closePath() gets
    // slower with the path's length, which made a 20 000-cell path take seconds.
    sink.lineTo(t.polygonCoords[2 * a], t.polygonCoords[2 * a + 1]);
  }
}

/** Each Delaunay edge once (the edge i-j of a triangle is drawn where i < j or it has no twin). */
export function drawDelaunay(sink: PathSink, t: Tessellation): number {
  const p = t.points;
  const seen = new Set<number>();
  const n = cellCount(t);
  let edges = 0;
  for (let k = 0; k < t.triangles.length; k += 3) {
    for (let e = 0; e < 3; e++) {
      const i = t.triangles[k + e], j = t.triangles[k + ((e + 1) % 3)];
      const key = i < j ? i * n + j : j * n + i;
      if (seen.has(key)) continue;
      seen.add(key);
      sink.moveTo(p[2 * i], p[2 * i + 1]);
      sink.lineTo(p[2 * j], p[2 * j + 1]);
      edges++;
    }
  }
  return edges;
}

/** A small plus sign of half-size `r` (px) at each centroid. */
export function drawCentroids(sink: PathSink, points: Float64Array, r: number): void {
  for (let i = 0; i < points.length; i += 2) {
    const x = points[i], y = points[i + 1];
    sink.moveTo(x - r, y);
    sink.lineTo(x + r, y);
    sink.moveTo(x, y - r);
    sink.lineTo(x, y + r);
  }
}

/** A rectangle outline. */
export function drawRect(sink: PathSink, r: Rect): void {
  sink.moveTo(r.x0, r.y0);
  sink.lineTo(r.x1, r.y0);
  sink.lineTo(r.x1, r.y1);
  sink.lineTo(r.x0, r.y1);
  sink.closePath();
}

/** A circle as a 64-gon (enough for a line a few px wide at any zoom the Bench allows). */
export function drawCircle(sink: PathSink, cx: number, cy: number, r: number, segments = 64): void {
  sink.moveTo(cx + r, cy);
  for (let k = 1; k < segments; k++) {
    const a = (2 * Math.PI * k) / segments;
    sink.lineTo(cx + r * Math.cos(a), cy + r * Math.sin(a));
  }
  sink.closePath();
}

/**
 * The largest gap between centroids: the largest circle centred in the field that contains no centroid.
 * Its centre is a vertex of the clipped Voronoi tessellation (a Voronoi vertex, or where a Voronoi edge
 * meets the field border), and its radius is that vertex's distance to the seed of its cell, which is
 * the nearest seed (Toussaint 1983, "Computing largest empty circles with location constraints").
 */
export function largestGap(t: Tessellation): { x: number; y: number; r: number; cell: number } | null {
  let best: { x: number; y: number; r: number; cell: number } | null = null;
  const n = cellCount(t);
  for (let i = 0; i < n; i++) {
    const sx = t.points[2 * i], sy = t.points[2 * i + 1];
    for (let k = t.polygonOffsets[i]; k < t.polygonOffsets[i + 1]; k++) {
      const x = t.polygonCoords[2 * k], y = t.polygonCoords[2 * k + 1];
      const r = Math.hypot(x - sx, y - sy);
      if (!best || r > best.r) best = { x, y, r, cell: i + 1 };
    }
  }
  return best;
}

/** The index of the centroid nearest to (x, y), or -1 for an empty set. */
export function nearestCentroid(points: Float64Array, x: number, y: number): number {
  let best = -1, bd = Infinity;
  for (let i = 0; i < points.length; i += 2) {
    const d = (points[i] - x) ** 2 + (points[i + 1] - y) ** 2;
    if (d < bd) { bd = d; best = i / 2; }
  }
  return best;
}

/**
 * A scale bar length that reads well: the largest of 1, 2, 5 x 10^k µm not longer than `maxUm`.
 */
export function niceScaleLength(maxUm: number): number {
  if (!(maxUm > 0)) return 0;
  const k = Math.floor(Math.log10(maxUm));
  for (const m of [5, 2, 1]) {
    const v = m * 10 ** k;
    if (v <= maxUm) return v;
  }
  return 10 ** k;
}

function* range(n: number): Generator<number> {
  for (let i = 0; i < n; i++) yield i;
}
