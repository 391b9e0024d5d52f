/**
 * The Voronoi tessellation of one or two points in a rectangular field, where a triangulation has nothing to
 * work with: one point owns the whole field; two points split it along their perpendicular bisector. So an
 * image with one or two cells still gets its table and summary.
 */
import { DegeneratePointsError, SettingsError } from '../errors';
import type { Rect } from '../types';
import { polygonMeasures } from './polygon';
import type { Tessellation } from './types';

/** Keeps the part of the convex polygon `poly` (flat x, y) where (x − mx)·nx + (y − my)·ny ≤ 0. */
function clipByLine(poly: number[], mx: number, my: number, nx: number, ny: number): number[] {
  const out: number[] = [];
  const m = poly.length / 2;
  const side = (k: number) => (poly[2 * k]! - mx) * nx + (poly[2 * k + 1]! - my) * ny;
  for (let j = 0; j < m; j++) {
    const i = (j + m - 1) % m;
    const da = side(i);
    const db = side(j);
    // A crossing only where the line passes strictly between the two vertices: a vertex on the line is kept once.
    if ((da < 0 && db > 0) || (da > 0 && db < 0)) {
      const t = da / (da - db);
      out.push(poly[2 * i]! + t * (poly[2 * j]! - poly[2 * i]!), poly[2 * i + 1]! + t * (poly[2 * j + 1]! - poly[2 * i + 1]!));
    }
    if (db <= 0) out.push(poly[2 * j]!, poly[2 * j + 1]!);
  }
  return out;
}

/**
 * Tessellation of 1 or 2 points (px) clipped to the field: the same fields as the triangulated one; every
 * cell touches the border; two cells are each other's neighbour; there is no Delaunay triangle.
 * @throws SettingsError on a bad field; DegeneratePointsError on a point that is not finite, lies outside
 *   the field, or coincides with the other
 */
export function tessellateFew(points: Float64Array, field: Rect): Tessellation {
  const n = points.length / 2;
  if (!(field.x1 > field.x0) || !(field.y1 > field.y0)) throw new SettingsError(`The field must be a rectangle with x1 > x0 and y1 > y0; got ${JSON.stringify(field)}.`);
  for (let i = 0; i < n; i++) {
    const x = points[2 * i]!;
    const y = points[2 * i + 1]!;
    if (!Number.isFinite(x) || !Number.isFinite(y)) throw new DegeneratePointsError(`Point ${i + 1} is not a finite number pair (${x}, ${y}); remove it.`);
    if (x < field.x0 || x > field.x1 || y < field.y0 || y > field.y1) throw new DegeneratePointsError(`Point ${i + 1} (${x}, ${y}) lies outside the field; remove it or enlarge the field.`);
  }
  const rect = [field.x0, field.y0, field.x1, field.y0, field.x1, field.y1, field.x0, field.y1];
  const polys: number[][] = [];
  if (n === 1) polys.push(rect);
  else {
    const [ax, ay, bx, by] = [points[0]!, points[1]!, points[2]!, points[3]!];
    if (ax === bx && ay === by) throw new DegeneratePointsError(`Points 1 and 2 coincide at (${ax}, ${ay}); merge them.`);
    const mx = (ax + bx) / 2;
    const my = (ay + by) / 2;
    polys.push(clipByLine(rect, mx, my, bx - ax, by - ay), clipByLine(rect, mx, my, ax - bx, ay - by));
  }
  const area = new Float64Array(n);
  const perimeter = new Float64Array(n);
  const centroid = new Float64Array(2 * n);
  const bbox = new Float64Array(4 * n);
  const sides = new Int32Array(n);
  const polygonOffsets = new Int32Array(n + 1);
  const coords: number[] = [];
  polys.forEach((p, i) => {
    polygonMeasures(p, 0, p.length, i, area, perimeter, centroid, bbox);
    sides[i] = p.length / 2;
    coords.push(...p);
    polygonOffsets[i + 1] = coords.length / 2;
  });
  return {
    points, field: { ...field }, area, perimeter, sides, centroid, edge: new Uint8Array(n).fill(1), bbox,
    neighbourOffsets: n === 2 ? Int32Array.of(0, 1, 2) : Int32Array.of(0, 0), neighbourIndex: n === 2 ? Int32Array.of(1, 0) : new Int32Array(0),
    triangles: new Uint32Array(0), polygonOffsets, polygonCoords: Float64Array.from(coords),
  };
}
