/**
 * Convex polygons held as flat x, y lists: clipping to a rectangle and the measures of a polygon (area,
 * perimeter, centroid, bounding box). The one copy of these for the tessellation (its border cells) and for
 * the window on a larger tessellation (reference/window.ts).
 */

/**
 * Clips the convex polygon in `poly` (flat x, y) to [x0, x1] x [y0, y1] in place, by Sutherland–Hodgman
 * (Sutherland & Hodgman 1974, Comm. ACM 17:32; pub, memory). Crossings get the bound as exact coordinate.
 * @param tmp scratch list, overwritten
 */
export function clipToRect(poly: number[], tmp: number[], x0: number, y0: number, x1: number, y1: number): void {
  clipHalf(poly, tmp, 0, x0, 1);
  clipHalf(tmp, poly, 0, x1, -1);
  clipHalf(poly, tmp, 1, y0, 1);
  clipHalf(tmp, poly, 1, y1, -1);
}

/** Keeps the part of src with sign·(coord[axis] − c) ≥ 0, into dst. */
function clipHalf(src: number[], dst: number[], axis: 0 | 1, c: number, sign: 1 | -1): void {
  dst.length = 0;
  const m = src.length / 2;
  if (m === 0) return;
  let ax = src[2 * m - 2]!;
  let ay = src[2 * m - 1]!;
  let da = sign * ((axis === 0 ? ax : ay) - c);
  for (let j = 0; j < m; j++) {
    const bx = src[2 * j]!;
    const by = src[2 * j + 1]!;
    const db = sign * ((axis === 0 ? bx : by) - c);
    if ((da >= 0) !== (db >= 0)) {
      const t = da / (da - db);
      if (axis === 0) dst.push(c, ay + t * (by - ay));
      else dst.push(ax + t * (bx - ax), c);
    }
    if (db >= 0) dst.push(bx, by);
    ax = bx;
    ay = by;
    da = db;
  }
}

/**
 * Area, perimeter, centroid and bounding box of the polygon data[start..end) (flat x, y; either
 * orientation) into slot i of the arrays: area[i], perimeter[i], centroid[2i..2i+1], bbox[4i..4i+3] as
 * x0, y0, x1, y1. Area and centroid by the shoelace formula; a polygon without area gets its first vertex as
 * centroid.
 */
export function polygonMeasures(
  data: ArrayLike<number>, start: number, end: number, i: number,
  area: Float64Array, perimeter: Float64Array, centroid: Float64Array, bbox: Float64Array,
): void {
  // Coordinates relative to the first vertex keep the shoelace sums free of cancellation.
  const ox = data[start]!;
  const oy = data[start + 1]!;
  let a2 = 0;
  let cx = 0;
  let cy = 0;
  let per = 0;
  let minx = ox;
  let maxx = ox;
  let miny = oy;
  let maxy = oy;
  let px = data[end - 2]! - ox;
  let py = data[end - 1]! - oy;
  for (let k = start; k < end; k += 2) {
    const X = data[k]!;
    const Y = data[k + 1]!;
    if (X < minx) minx = X;
    if (X > maxx) maxx = X;
    if (Y < miny) miny = Y;
    if (Y > maxy) maxy = Y;
    const x = X - ox;
    const y = Y - oy;
    const cr = px * y - x * py;
    a2 += cr;
    cx += (px + x) * cr;
    cy += (py + y) * cr;
    const ddx = x - px;
    const ddy = y - py;
    per += Math.sqrt(ddx * ddx + ddy * ddy);
    px = x;
    py = y;
  }
  area[i] = Math.abs(a2) / 2;
  perimeter[i] = per;
  centroid[2 * i] = a2 !== 0 ? ox + cx / (3 * a2) : ox;
  centroid[2 * i + 1] = a2 !== 0 ? oy + cy / (3 * a2) : oy;
  bbox[4 * i] = minx;
  bbox[4 * i + 1] = miny;
  bbox[4 * i + 2] = maxx;
  bbox[4 * i + 3] = maxy;
}
