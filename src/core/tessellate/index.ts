/**
 * The Voronoi tessellation of a point set clipped to a rectangular field, with its Delaunay dual and
 * neighbour graph, on d3-delaunay. One pass per cell, typed outputs allocated once.
 *
 * Over 500 lines on purpose: the Tessellator's run, its cell walk, the radial order and the reuse of its
 * typed arrays from run to run share private state that the Monte Carlo loop depends on for speed; split
 * into modules, that state would have to be exposed or passed around on every call.
 */
import { Delaunay } from 'd3-delaunay';
import { DegeneratePointsError } from '../errors';
import type { Rect } from '../types';
import { mayBeFlat, refuseDegenerate, validatePoints } from './checks';
import { clipToRect, polygonMeasures } from './polygon';
import { tessellateFew } from './few';
import type { Tessellation } from './types';

export type { Tessellation } from './types';
export { validatePoints } from './checks';

/**
 * Two Voronoi vertices closer than this (in units of the mean point spacing) are one vertex: the edge
 * between them has no length, as happens for cocircular seeds (a square lattice, for one).
 */
const VERTEX_EPS = 1e-9;

/** From this many points on, points are triangulated and cells processed in radial order. */
export const RADIAL_ORDER_MIN_POINTS = 50000;

function identity(n: number): Int32Array {
  const p = new Int32Array(n);
  for (let i = 0; i < n; i++) p[i] = i;
  return p;
}

/** Growable Float64Array for the polygon coordinates. */
class Buffer64 {
  data: Float64Array;
  length = 0;
  constructor(capacity: number) {
    this.data = new Float64Array(Math.max(16, capacity));
  }
  push2(x: number, y: number): void {
    if (this.length + 2 > this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = x;
    this.data[this.length++] = y;
  }
}

/**
 * Voronoi tessellation of `points` clipped to `field`, with the Delaunay triangles and the neighbour graph.
 *
 * Method: the points are translated and scaled so that their mean spacing is 1 (which makes every
 * tolerance relative and the result independent of scale), triangulated (Delaunator, robust orientation
 * predicates), and each cell is built from the circumcentres of the triangles around its point. Cells
 * whose circumcentres all lie strictly inside the field are taken as they are; only the others are clipped
 * (d3-delaunay's rectangle clipping). Two cells are neighbours if their common Voronoi edge, clipped to
 * the field, has positive length. Area and centroid by the shoelace formula; sides of an interior cell equal
 * its number of neighbours; a border cell counts the sides of its clipped polygon, border segments included.
 *
 * Coincident points are refused rather than merged, because merging would break the rule that point i
 * is cell i + 1 of the caller's table.
 *
 * @param points seeds, interleaved x0, y0, x1, y1, ... (px); at least 3, not all on one line, no two alike,
 *   all inside the closed field
 * @param field the field (px)
 * @throws TooFewCellsError fewer than 3 points; DegeneratePointsError collinear, coincident, non-finite or
 *   outside points; SettingsError an empty field
 */
export function tessellate(points: Float64Array, field: Rect): Tessellation {
  // One or two points: nothing to triangulate, the field is split directly.
  if (points.length === 2 || points.length === 4) return tessellateFew(points, field);
  return new Tessellator(false).run(points, field, 'polygons') as Tessellation;
}

/** The per-cell part of a {@link Tessellation}, without polygons and triangles. */
export type CellTessellation = Omit<Tessellation, 'polygonOffsets' | 'polygonCoords' | 'triangles'>;

/**
 * As {@link tessellate}, but keeps no polygons and no triangles: the lean form the Monte Carlo reference
 * draws hundreds of times. Same validation, same errors, same per-cell values.
 */
export function tessellateCells(points: Float64Array, field: Rect): CellTessellation {
  return new Tessellator(false).run(points, field, 'cells');
}

/**
 * What {@link Tessellator.run} returns: 'polygons' a full {@link Tessellation}; 'cells' the per-cell values
 * only; 'retained' the per-cell values with the cell polygons kept inside the tessellator, read back with
 * {@link Tessellator.cellPolygon} until the next run.
 */
export type TessellatorOutput = 'polygons' | 'cells' | 'retained';

/**
 * A reusable tessellation engine: the work of {@link tessellate} with its triangulation and typed arrays
 * allocated once and refilled on every run of the same number of points (what a Monte Carlo loop needs).
 * The values are those of {@link tessellate} bit for bit, whatever the output chosen.
 *
 * With `reuse` true the arrays of a result (and its `points`, which is the caller's array) belong to the
 * engine and are overwritten by the next run; with `reuse` false every run returns fresh arrays.
 */
export class Tessellator {
  private readonly reuse: boolean;
  private n = -1;
  private delaunay: Delaunay<Float64Array> | null = null;
  private voronoi: ReturnType<Delaunay<Float64Array>['voronoi']> | null = null;
  private sorted: Float64Array = new Float64Array(0);
  private identityPerm: Int32Array = new Int32Array(0);
  private buf = new Buffer64(256);
  private startSorted: Int32Array = new Int32Array(0);
  private keep: Uint8Array = new Uint8Array(0);
  /** 1 for the points on the convex hull of the last run (sorted order). */
  private onHull: Uint8Array = new Uint8Array(0);
  private arrays: {
    area: Float64Array; perimeter: Float64Array; sides: Int32Array; edge: Uint8Array; bbox: Float64Array; centroid: Float64Array;
    degree: Int32Array; fill: Int32Array; neighbours: Int32Array | null;
  } | null = null;
  // Normalisation of the last run, for cellPolygon.
  private lastInv = 1;
  private lastField: Rect = { x0: 0, y0: 0, x1: 1, y1: 1 };
  private lastRank: Int32Array | null = null;
  private lastSides: Int32Array = new Int32Array(0);

  private readonly radialFrom: number;

  /**
   * @param reuse whether the arrays of a result belong to the engine (see above)
   * @param radialFrom the number of points from which the radial order is used (a parameter for tests,
   *   which check that the order does not change the values)
   */
  constructor(reuse = true, radialFrom = RADIAL_ORDER_MIN_POINTS) {
    this.reuse = reuse;
    this.radialFrom = radialFrom;
  }

  /**
   * Tessellates `points` in `field`; see {@link tessellate} for the method, parameters and errors.
   * @param output which result to build (see {@link TessellatorOutput})
   */
  run(points: Float64Array, field: Rect, output: TessellatorOutput): Tessellation | CellTessellation {
    try {
      return this.build(points, field, output);
    } catch (e) {
      // A failed run can leave the triangulation jittered or half-updated: start afresh next time.
      this.n = -1;
      this.delaunay = null;
      this.voronoi = null;
      throw e;
    }
  }

  /**
   * Vertices of cell i of the last 'retained' run, in the caller's px coordinates (clamped to the field
   * exactly as {@link tessellate}'s polygonCoords), appended to `out` as x, y pairs after clearing it.
   */
  cellPolygon(i: number, out: number[]): void {
    out.length = 0;
    const k = this.lastRank ? this.lastRank[i]! : i;
    const f = this.lastField;
    const inv = this.lastInv;
    const data = this.buf.data;
    let src = this.startSorted[k]!;
    const end = src + 2 * this.lastSides[i]!;
    for (; src < end; src += 2) {
      out.push(Math.min(f.x1, Math.max(f.x0, data[src]! * inv + f.x0)), Math.min(f.y1, Math.max(f.y0, data[src + 1]! * inv + f.y0)));
    }
  }

  private build(points: Float64Array, field: Rect, output: TessellatorOutput): Tessellation | CellTessellation {
    validatePoints(points, field);
    const keepPolygons = output !== 'cells';
    const n = points.length / 2;
    const W = field.x1 - field.x0;
    const H = field.y1 - field.y0;
    const s = Math.sqrt(n / (W * H));
    const inv = 1 / s;
    const Wn = W * s;
    const Hn = H * s;
    const fresh = !this.reuse || this.n !== n || !this.delaunay;
    if (fresh) {
      this.sorted = new Float64Array(2 * n);
      this.startSorted = new Int32Array(n);
      this.keep = new Uint8Array(6 * n);
      this.onHull = new Uint8Array(n);
      this.delaunay = null;
      this.voronoi = null;
      this.arrays = null;
    }

    // Large sets are triangulated and walked in order of distance from the centre. Delaunator's sweep
    // inserts the points in nearly that order, so it then reads its points nearly in sequence, and the
    // triangles it makes are numbered in that order too: the walk around one cell after another then
    // reads triangles that lie close together in memory. In the caller's order (random for a random set)
    // every step of the walk waits for memory; a Hilbert order keeps the cells together but not
    // Delaunator's triangles, and took about a quarter longer for a million random points. The values do
    // not depend on the order for points in general position; four or more points on one circle (a
    // lattice) can be triangulated otherwise and then differ in the last bits. Small sets fit in the cache
    // as they are.
    const reorder = n >= this.radialFrom;
    const sorted = this.sorted;
    let perm: Int32Array;
    if (reorder) {
      perm = radialOrder(points, n);
      for (let k = 0; k < n; k++) {
        const i = perm[k]!;
        sorted[2 * k] = (points[2 * i]! - field.x0) * s;
        sorted[2 * k + 1] = (points[2 * i + 1]! - field.y0) * s;
      }
    } else {
      if (this.identityPerm.length !== n) this.identityPerm = identity(n);
      perm = this.identityPerm;
      for (let i = 0; i < n; i++) {
        sorted[2 * i] = (points[2 * i]! - field.x0) * s;
        sorted[2 * i + 1] = (points[2 * i + 1]! - field.y0) * s;
      }
    }

    if (mayBeFlat(sorted, n, Wn, Hn)) refuseDegenerate(sorted, points, n);

    // d3-delaunay's public interface only: update() re-triangulates the moved points in place, and the
    // Voronoi diagram's update() does that and recomputes the circumcentres.
    let delaunay = this.delaunay;
    let voronoi = this.voronoi;
    if (delaunay && voronoi && voronoi.xmin === 0 && voronoi.ymin === 0 && voronoi.xmax === Wn && voronoi.ymax === Hn) {
      voronoi.update();
    } else if (delaunay) {
      delaunay.update();
      voronoi = delaunay.voronoi([0, 0, Wn, Hn]);
    } else {
      delaunay = new Delaunay(sorted);
      voronoi = delaunay.voronoi([0, 0, Wn, Hn]);
    }
    const { triangles, halfedges, inedges } = delaunay;
    const onHull = this.onHull;
    onHull.fill(0);
    for (const k of delaunay.hull) onHull[k] = 1;
    for (let k = 0; k < n; k++) {
      if (inedges[k] === -1) {
        const i = perm[k]!;
        const j = perm[delaunay.find(sorted[2 * k]!, sorted[2 * k + 1]!, k === 0 ? 1 : 0)]!;
        throw new DegeneratePointsError(
          `Points ${Math.min(i, j) + 1} and ${Math.max(i, j) + 1} coincide at (${points[2 * i]}, ${points[2 * i + 1]}) px; remove or merge duplicate points first.`,
        );
      }
    }
    this.delaunay = delaunay;
    this.voronoi = voronoi;
    this.n = n;
    const cc = voronoi.circumcenters;

    let a = this.arrays;
    if (!a || !this.reuse) {
      a = {
        area: new Float64Array(n), perimeter: new Float64Array(n), sides: new Int32Array(n), edge: new Uint8Array(n),
        bbox: new Float64Array(4 * n), centroid: new Float64Array(2 * n), degree: new Int32Array(n + 1), fill: new Int32Array(n),
        neighbours: this.reuse ? new Int32Array(6 * n) : null,
      };
      this.arrays = a;
    } else {
      a.edge.fill(0);
      a.degree.fill(0);
    }
    const { area, perimeter, sides, edge, bbox, centroid } = a;
    const startSorted = this.startSorted;
    const m = triangles.length;
    const keep = this.keep;
    keep.fill(0, 0, m);
    const need = keepPolygons ? 2 * (m + 8 * delaunay.hull.length) : 256;
    if (this.buf.data.length < need) this.buf = new Buffer64(need);
    const buf = this.buf;
    buf.length = 0;

    // Border cells are drawn by d3 into this context; reused for every cell.
    const scratch: number[] = [];
    const spare: number[] = [];
    const ctx = {
      moveTo(x: number, y: number) { scratch.push(x, y); },
      lineTo(x: number, y: number) { scratch.push(x, y); },
      closePath() {},
    };

    for (let k = 0; k < n; k++) {
      const i = perm[k]!;
      if (!keepPolygons) buf.length = 0;
      const start = buf.length;
      let interior = onHull[k] === 0;
      if (interior) {
        const e0 = inedges[k]!;
        // The vertex before the first belongs to the triangle across the incoming halfedge.
        const tl = (halfedges[e0]! / 3) | 0;
        let px = cc[2 * tl]!;
        let py = cc[2 * tl + 1]!;
        let firstKept = false;
        let e = e0;
        do {
          const t = (e / 3) | 0;
          const x = cc[2 * t]!;
          const y = cc[2 * t + 1]!;
          if (!(x > 0 && x < Wn && y > 0 && y < Hn)) {
            interior = false;
            break;
          }
          // The step from (px, py) to (x, y) is the Voronoi edge dual to e; with both ends inside the field
          // its clipped length is max(|dx|, |dy|), so this test is also the neighbour test of neighbourGraph.
          const kept = Math.abs(x - px) > VERTEX_EPS || Math.abs(y - py) > VERTEX_EPS;
          if (kept) buf.push2(x, y);
          if (e === e0) firstKept = kept;
          else {
            // (px, py) was checked inside at the previous step; the first edge waits for the walk to close.
            const o = halfedges[e]!;
            keep[o < e ? o : e] = kept ? 1 : 2;
          }
          px = x;
          py = y;
          e = halfedges[e % 3 === 2 ? e - 2 : e + 1]!;
        } while (e !== e0);
        if (!interior) buf.length = start;
        else {
          const o = halfedges[e0]!;
          keep[o < e0 ? o : e0] = firstKept ? 1 : 2;
        }
      }
      if (!interior) {
        scratch.length = 0;
        if (onHull[k] === 0) {
          // A bounded cell that crosses the border: its own polygon clipped to the field (exact for convex
          // cells, and much cheaper than the general clipping of unbounded cells).
          const e0 = inedges[k]!;
          let e = e0;
          do {
            const t = (e / 3) | 0;
            scratch.push(cc[2 * t]!, cc[2 * t + 1]!);
            e = halfedges[e % 3 === 2 ? e - 2 : e + 1]!;
          } while (e !== e0);
          clipToRect(scratch, spare, 0, 0, Wn, Hn);
        } else {
          voronoi.renderCell(k, ctx);
        }
        const mm = scratch.length;
        let px = scratch[mm - 2]!;
        let py = scratch[mm - 1]!;
        for (let j = 0; j < mm; j += 2) {
          const x = scratch[j]!;
          const y = scratch[j + 1]!;
          if (Math.abs(x - px) > VERTEX_EPS || Math.abs(y - py) > VERTEX_EPS) buf.push2(x, y);
          px = x;
          py = y;
        }
        edge[i] = 1;
      }
      startSorted[k] = start;
      sides[i] = (buf.length - start) / 2;
      polygonMeasures(buf.data, start, buf.length, i, area, perimeter, centroid, bbox);
    }

    const inv2 = inv * inv;
    for (let i = 0; i < n; i++) {
      area[i] = area[i]! * inv2;
      perimeter[i] = perimeter[i]! * inv;
      centroid[2 * i] = centroid[2 * i]! * inv + field.x0;
      centroid[2 * i + 1] = centroid[2 * i + 1]! * inv + field.y0;
      bbox[4 * i] = Math.max(field.x0, bbox[4 * i]! * inv + field.x0);
      bbox[4 * i + 1] = Math.max(field.y0, bbox[4 * i + 1]! * inv + field.y0);
      bbox[4 * i + 2] = Math.min(field.x1, bbox[4 * i + 2]! * inv + field.x0);
      bbox[4 * i + 3] = Math.min(field.y1, bbox[4 * i + 3]! * inv + field.y0);
    }

    const neighbourOffsets = a.degree;
    // A one-off run allocates the index at its exact length once the degrees are known.
    const neighbourIndex = neighbourGraph(sorted, perm, triangles, halfedges, inedges, cc, Wn, Hn, n, sides, edge, keep, neighbourOffsets, a.fill, a.neighbours);

    this.lastInv = inv;
    this.lastField = { ...field };
    this.lastSides = sides;
    this.lastRank = null;
    if (output === 'retained' && reorder) {
      const rank = new Int32Array(n);
      for (let k = 0; k < n; k++) rank[perm[k]!] = k;
      this.lastRank = rank;
    }

    const cells: CellTessellation = {
      points: this.reuse ? points : points.slice(),
      field: { ...field },
      area,
      perimeter,
      sides,
      centroid,
      edge,
      bbox,
      neighbourOffsets,
      neighbourIndex,
    };
    if (output !== 'polygons') return cells;

    // Polygons in the caller's order and coordinates. Written in processing order: the reads then run
    // through the buffer in sequence, and the scattered side are the writes, which do not stall.
    const polygonOffsets = new Int32Array(n + 1);
    for (let i = 0; i < n; i++) polygonOffsets[i + 1] = polygonOffsets[i]! + sides[i]!;
    const polygonCoords = new Float64Array(buf.length);
    const data = buf.data;
    const { x0, y0, x1, y1 } = field;
    for (let k = 0; k < n; k++) {
      const i = perm[k]!;
      let src = startSorted[k]!;
      const end = 2 * polygonOffsets[i + 1]!;
      for (let dst = 2 * polygonOffsets[i]!; dst < end; dst += 2, src += 2) {
        // Clamped so that vertices on the border sit exactly on it despite the rescaling.
        polygonCoords[dst] = Math.min(x1, Math.max(x0, data[src]! * inv + x0));
        polygonCoords[dst + 1] = Math.min(y1, Math.max(y0, data[src + 1]! * inv + y0));
      }
    }
    const tri = new Uint32Array(m);
    if (reorder) for (let j = 0; j < m; j++) tri[j] = perm[triangles[j]!]!;
    else tri.set(triangles.subarray(0, m));
    return { ...cells, triangles: tri, polygonOffsets, polygonCoords };
  }
}

/**
 * A permutation of the points by distance from the centre of their bounding box, nearest first: a counting
 * sort into n rings of equal area, the caller's order within a ring.
 */
function radialOrder(points: Float64Array, n: number): Int32Array {
  let minx = Infinity;
  let maxx = -Infinity;
  let miny = Infinity;
  let maxy = -Infinity;
  for (let i = 0; i < 2 * n; i += 2) {
    const x = points[i]!;
    const y = points[i + 1]!;
    if (x < minx) minx = x;
    if (x > maxx) maxx = x;
    if (y < miny) miny = y;
    if (y > maxy) maxy = y;
  }
  const cx = (minx + maxx) / 2;
  const cy = (miny + maxy) / 2;
  const r2 = ((maxx - minx) / 2) ** 2 + ((maxy - miny) / 2) ** 2;
  const scale = r2 > 0 ? n / r2 : 0;
  const ring = new Int32Array(n);
  const count = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) {
    const dx = points[2 * i]! - cx;
    const dy = points[2 * i + 1]! - cy;
    const b = Math.min(n - 1, Math.floor((dx * dx + dy * dy) * scale));
    ring[i] = b;
    count[b + 1]!++;
  }
  for (let b = 0; b < n; b++) count[b + 1] = count[b + 1]! + count[b]!;
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[count[ring[i]!]!++] = i;
  return perm;
}

/**
 * Length (Chebyshev) of the part of segment (ax, ay) + t (dx, dy), t in [0, tmax], inside [0, W] x [0, H]
 * (Liang–Barsky clipping).
 */
function clippedLength(ax: number, ay: number, dx: number, dy: number, tmax: number, W: number, H: number): number {
  let t0 = 0;
  let t1 = tmax;
  for (let k = 0; k < 4; k++) {
    const pk = k === 0 ? -dx : k === 1 ? dx : k === 2 ? -dy : dy;
    const qk = k === 0 ? ax : k === 1 ? W - ax : k === 2 ? ay : H - ay;
    if (pk === 0) {
      if (qk < 0) return 0;
    } else {
      const r = qk / pk;
      if (pk < 0) {
        if (r > t1) return 0;
        if (r > t0) t0 = r;
      } else {
        if (r < t0) return 0;
        if (r < t1) t1 = r;
      }
    }
  }
  return (t1 - t0) * Math.max(Math.abs(dx), Math.abs(dy));
}

/**
 * Neighbours: the Delaunay edges whose Voronoi edge, clipped to the field, has positive length (CSR, in
 * `degree` (n + 1, zeroed; becomes the offsets) and `neighbourIndex`). keep[e] holds the decision for the
 * edge of halfedge e when the cell walk already made it (1 neighbour, 2 not, 0 undecided): the walk of an
 * interior cell decides all its edges, and its sides are its degree, so only the edges around border
 * cells (edge = 1) are looked at here. Returns the index: a part of `buffer` when one is given, else a new
 * array of exactly its length; neighbours are listed in the order of their edges' halfedge numbers.
 */
function neighbourGraph(
  coords: Float64Array, perm: Int32Array, triangles: Uint32Array, halfedges: Int32Array, inedges: Int32Array, cc: Float64Array,
  W: number, H: number, n: number, sides: Int32Array, edge: Uint8Array,
  keep: Uint8Array, degree: Int32Array, fill: Int32Array, buffer: Int32Array | null,
): Int32Array {
  const m = triangles.length;
  for (let k = 0; k < n; k++) {
    const i = perm[k]!;
    if (!edge[i]) {
      degree[i + 1] = sides[i]!;
      continue;
    }
    // Around point k: every incoming halfedge, and on the hull the outgoing hull halfedge that ends the walk.
    let count = 0;
    const e0 = inedges[k]!;
    let e = e0;
    do {
      const o = halfedges[e]!;
      count += decide(coords, triangles, halfedges, cc, keep, o !== -1 && o < e ? o : e, W, H);
      const out = e % 3 === 2 ? e - 2 : e + 1;
      const next = halfedges[out]!;
      if (next === -1) {
        count += decide(coords, triangles, halfedges, cc, keep, out, W, H);
        break;
      }
      e = next;
    } while (e !== e0);
    degree[i + 1] = count;
  }
  for (let i = 0; i < n; i++) degree[i + 1] = degree[i + 1]! + degree[i]!;
  const offsets = degree;
  const neighbourIndex = buffer ? buffer.subarray(0, offsets[n]!) : new Int32Array(offsets[n]!);
  fill.set(offsets.subarray(0, n));
  for (let e = 0; e < m; e++) {
    if (keep[e] !== 1) continue;
    const p = perm[triangles[e]!]!;
    const q = perm[triangles[e % 3 === 2 ? e - 2 : e + 1]!]!;
    neighbourIndex[fill[p]!++] = q;
    neighbourIndex[fill[q]!++] = p;
  }
  return neighbourIndex;
}

/** The neighbour decision of the edge of canonical halfedge c (the lower of the pair), made once: 1 if kept. */
function decide(coords: Float64Array, triangles: Uint32Array, halfedges: Int32Array, cc: Float64Array, keep: Uint8Array, c: number, W: number, H: number): number {
  let kp = keep[c]!;
  if (kp === 0) {
    kp = edgeLength(coords, triangles, cc, c, halfedges[c]!, W, H) > VERTEX_EPS ? 1 : 2;
    keep[c] = kp;
  }
  return kp === 1 ? 1 : 0;
}

/** Chebyshev length of the Voronoi edge dual to halfedge e (opposite o, −1 on the hull), clipped to [0, W] x [0, H]. */
function edgeLength(coords: Float64Array, triangles: Uint32Array, cc: Float64Array, e: number, o: number, W: number, H: number): number {
  const t = (e / 3) | 0;
  const ax = cc[2 * t]!;
  const ay = cc[2 * t + 1]!;
  if (o !== -1) {
    const u = (o / 3) | 0;
    const bx = cc[2 * u]!;
    const by = cc[2 * u + 1]!;
    if (ax > 0 && ax < W && ay > 0 && ay < H && bx > 0 && bx < W && by > 0 && by < H) {
      return Math.max(Math.abs(bx - ax), Math.abs(by - ay));
    }
    return clippedLength(ax, ay, bx - ax, by - ay, 1, W, H);
  }
  // Hull edge: the Voronoi edge is a ray from the circumcentre, perpendicular to the edge, pointing
  // away from the triangle's third vertex.
  const p = triangles[e]!;
  const q = triangles[e % 3 === 2 ? e - 2 : e + 1]!;
  const r = triangles[e % 3 === 0 ? e + 2 : e - 1]!;
  const ex = coords[2 * q]! - coords[2 * p]!;
  const ey = coords[2 * q + 1]! - coords[2 * p + 1]!;
  let dx = ey;
  let dy = -ex;
  if (dx * (coords[2 * r]! - coords[2 * p]!) + dy * (coords[2 * r + 1]! - coords[2 * p + 1]!) > 0) {
    dx = -dx;
    dy = -dy;
  }
  return clippedLength(ax, ay, dx, dy, Infinity, W, H);
}
