/**
 * The Bench's overlay drawing: the core's renderer (src/core/export/path.ts, the one the SVG export uses)
 * plus the shapes only the Bench needs (field, circles, the largest gap) and a sink suited to Path2D.
 */
import type { Tessellation } from '../../core/tessellate/types';
import { drawCentroids, drawDelaunay, drawPolygons, SvgPath, type PathSink } from '../../core/export/path';
import type { Rect } from '../../core/types';

export type { PathSink };
export { drawPolygons, drawDelaunay, drawCentroids, SvgPath };

/**
 * A sink that passes drawing on but closes each subpath with a line back to its first point instead of
 * closePath(): Chromium's Path2D.closePath() gets slower with the path's length, which made one path of
 * 20 000 Voronoi cells take seconds to build.
 */
export class LineClosingSink implements PathSink {
  private x0 = 0;
  private y0 = 0;
  constructor(private readonly target: { moveTo(x: number, y: number): void; lineTo(x: number, y: number): void }) {}
  moveTo(x: number, y: number): void { this.x0 = x; this.y0 = y; this.target.moveTo(x, y); }
  lineTo(x: number, y: number): void { this.target.lineTo(x, y); }
  closePath(): void { this.target.lineTo(this.x0, this.y0); }
}

/** Cell count of a tessellation. */
export function cellCount(t: Tessellation): number {
  return t.points.length / 2;
}

/** The clipped Voronoi cells, or only the cells (0-based) listed in `only`. */
export function drawVoronoi(sink: PathSink, t: Tessellation, only?: readonly number[]): void {
  const set = only ? new Set(only) : null;
  drawPolygons(sink, t.polygonOffsets, t.polygonCoords, set ? (i) => set.has(i) : undefined);
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
    const sx = t.points[2 * i]!, sy = t.points[2 * i + 1]!;
    for (let k = t.polygonOffsets[i]!; k < t.polygonOffsets[i + 1]!; k++) {
      const x = t.polygonCoords[2 * k]!, y = t.polygonCoords[2 * k + 1]!;
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
    const d = (points[i]! - x) ** 2 + (points[i + 1]! - y) ** 2;
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

/** One tile of a TiledPath: its path and the box (image px) of everything drawn into it. */
export interface PathTile<P> { path: P; x0: number; y0: number; x1: number; y1: number }

/**
 * A sink that splits drawing into a grid of paths by where each subpath starts, and keeps each tile's box,
 * so the Bench strokes only the tiles in view and can build them a slice at a time. Subpaths are closed
 * with a line back to their first point (see LineClosingSink).
 */
export class TiledSink<P extends { moveTo(x: number, y: number): void; lineTo(x: number, y: number): void }> implements PathSink {
  readonly tiles: (PathTile<P> | null)[];
  private cur: PathTile<P> | null = null;
  private sx = 0;
  private sy = 0;

  /**
   * @param field the rectangle (image px) the grid covers; points outside go to the nearest tile
   * @param n tiles per side
   * @param make creates an empty path
   */
  constructor(private readonly field: Rect, private readonly n: number, private readonly make: () => P) {
    this.tiles = new Array<PathTile<P> | null>(n * n).fill(null);
  }

  moveTo(x: number, y: number): void {
    const f = this.field;
    const gx = Math.min(this.n - 1, Math.max(0, Math.floor(((x - f.x0) / Math.max(1e-9, f.x1 - f.x0)) * this.n)));
    const gy = Math.min(this.n - 1, Math.max(0, Math.floor(((y - f.y0) / Math.max(1e-9, f.y1 - f.y0)) * this.n)));
    let t = this.tiles[gy * this.n + gx];
    if (!t) { t = { path: this.make(), x0: x, y0: y, x1: x, y1: y }; this.tiles[gy * this.n + gx] = t; }
    this.cur = t;
    this.sx = x;
    this.sy = y;
    t.path.moveTo(x, y);
    this.grow(x, y);
  }

  lineTo(x: number, y: number): void {
    this.cur?.path.lineTo(x, y);
    this.grow(x, y);
  }

  closePath(): void {
    this.lineTo(this.sx, this.sy);
  }

  private grow(x: number, y: number): void {
    const t = this.cur;
    if (!t) return;
    if (x < t.x0) t.x0 = x; else if (x > t.x1) t.x1 = x;
    if (y < t.y0) t.y0 = y; else if (y > t.y1) t.y1 = y;
  }

  /** The tiles that meet the rectangle [x0, x1] x [y0, y1] (image px), widened by `pad`. */
  visible(x0: number, y0: number, x1: number, y1: number, pad = 0): PathTile<P>[] {
    const out: PathTile<P>[] = [];
    for (const t of this.tiles) if (t && t.x1 + pad >= x0 && t.x0 - pad <= x1 && t.y1 + pad >= y0 && t.y0 - pad <= y1) out.push(t);
    return out;
  }
}

/** Delaunay edges of triangles [from, to) (triangle indices), each edge once over all calls that share `done`. */
export function drawDelaunayRange(sink: PathSink, t: Tessellation, from: number, to: number, done: Set<number>): void {
  const tri = t.triangles;
  const p = t.points;
  const n = p.length / 2;
  for (let i = 3 * from; i < 3 * to && i < tri.length; i += 3) {
    for (let k = 0; k < 3; k++) {
      const a = tri[i + k]!, b = tri[i + ((k + 1) % 3)]!;
      const key = a < b ? a * n + b : b * n + a;
      if (done.has(key)) continue;
      done.add(key);
      sink.moveTo(p[2 * a]!, p[2 * a + 1]!);
      sink.lineTo(p[2 * b]!, p[2 * b + 1]!);
    }
  }
}

/** Lets the browser run other work (input, rendering) before the caller goes on. */
export function yieldToPage(): Promise<void> {
  const s = (globalThis as { scheduler?: { yield?: () => Promise<void> } }).scheduler;
  if (s?.yield) return s.yield();
  return new Promise((r) => setTimeout(r, 0));
}
