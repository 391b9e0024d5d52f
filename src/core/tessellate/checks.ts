/**
 * The checks of a point set before it is tessellated: points and field valid, at least 3 distinct points,
 * not all on one line.
 */
import Delaunator from 'delaunator';
import { DegeneratePointsError, SettingsError, TooFewCellsError } from '../errors';
import type { Rect } from '../types';

/**
 * A triangulation is flat (its points on one line) when no triangle has a doubled area above this, in the
 * normalised units: d3-delaunay's rule, which then moves the points by a tiny jitter and goes on. Such
 * sets are refused here before d3-delaunay sees them.
 */
const FLAT_CROSS = 1e-10;

/**
 * Validates a point set and a field for tessellate (index.ts); throws the typed error tessellate would.
 * @param points interleaved x, y (px)
 * @param field the field (px)
 */
export function validatePoints(points: Float64Array, field: Rect): void {
  if (!(field.x1 > field.x0) || !(field.y1 > field.y0) || ![field.x0, field.x1, field.y0, field.y1].every(Number.isFinite)) {
    throw new SettingsError(`The field must be a rectangle with x1 > x0 and y1 > y0; got ${JSON.stringify(field)}.`);
  }
  if (points.length % 2 !== 0) throw new DegeneratePointsError('Points must be interleaved x, y pairs; the array has an odd length.');
  const n = points.length / 2;
  if (n < 3) throw new TooFewCellsError(`A tessellation needs at least 3 points; got ${n}. Detect more cells or use a larger field.`);
  for (let i = 0; i < n; i++) {
    const x = points[2 * i]!;
    const y = points[2 * i + 1]!;
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      throw new DegeneratePointsError(`Point ${i + 1} is not a finite number pair (${x}, ${y}); remove it.`);
    }
    if (x < field.x0 || x > field.x1 || y < field.y0 || y > field.y1) {
      throw new DegeneratePointsError(
        `Point ${i + 1} at (${x}, ${y}) px lies outside the field [${field.x0}, ${field.x1}] x [${field.y0}, ${field.y1}]; enlarge the field or drop the point.`,
      );
    }
  }
}

/**
 * Whether the points (normalised, in [0, W] x [0, H]) might be flat by the rule of {@link FLAT_CROSS}; false
 * only when they cannot be. A flat triangulation has a hull of area at most n·FLAT_CROSS (at most 2n
 * triangles), and any three of the points span at most the hull; so three points spanning more (the first
 * point, the one farthest from it, and the one farthest from the line through both) rule it out. The
 * bound allows for the rounding of both computations.
 */
export function mayBeFlat(c: Float64Array, n: number, W: number, H: number): boolean {
  const ax = c[0]!;
  const ay = c[1]!;
  let far = 0;
  let bx = ax;
  let by = ay;
  for (let i = 2; i < 2 * n; i += 2) {
    const d2 = (c[i]! - ax) ** 2 + (c[i + 1]! - ay) ** 2;
    if (d2 > far) {
      far = d2;
      bx = c[i]!;
      by = c[i + 1]!;
    }
  }
  const ex = bx - ax;
  const ey = by - ay;
  let most = 0;
  for (let i = 2; i < 2 * n; i += 2) {
    const cross = Math.abs(ex * (c[i + 1]! - ay) - ey * (c[i]! - ax));
    if (cross > most) most = cross;
  }
  const rounding = 2e-15 * Math.max(W, H) ** 2;
  return most <= 2 * n * (FLAT_CROSS + rounding) + rounding;
}

/**
 * Throws the error for points that are flat or fewer than 3 distinct: decided on the triangulation
 * d3-delaunay would make of them (Delaunator's), by d3-delaunay's rule ({@link FLAT_CROSS}).
 */
export function refuseDegenerate(coords: Float64Array, points: Float64Array, n: number): void {
  const d = new Delaunator(coords);
  const { triangles: t, hull } = d;
  let flat = true;
  for (let i = 0; i < t.length && flat; i += 3) {
    const a = 2 * t[i]!;
    const b = 2 * t[i + 1]!;
    const c = 2 * t[i + 2]!;
    const cross = (coords[c]! - coords[a]!) * (coords[b + 1]! - coords[a + 1]!) - (coords[b]! - coords[a]!) * (coords[c + 1]! - coords[a + 1]!);
    if (cross > FLAT_CROSS) flat = false;
  }
  if (hull.length >= 3 && !flat) return;
  if (hull.length < 3 && distinctCount(points) < 3) {
    throw new DegeneratePointsError(`Only ${distinctCount(points)} of the ${n} points are distinct; a tessellation needs 3 distinct points not on one line.`);
  }
  throw new DegeneratePointsError(`All ${n} points lie on one line; a tessellation needs points spread in two dimensions.`);
}

function distinctCount(points: Float64Array): number {
  const seen = new Set<string>();
  for (let i = 0; i < points.length; i += 2) seen.add(`${points[i]},${points[i + 1]}`);
  return seen.size;
}
