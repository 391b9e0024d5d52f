/**
 * How deep each point of a blob's outline lies inside a concavity: the outer contour of each 8-connected
 * blob of a mask (opencv's border following, Suzuki & Abe 1985, CVGIP 30:32), its convex hull (Andrew's
 * monotone chain, 1979), and for every contour pixel between two consecutive hull vertices its distance to
 * the hull edge that bridges them (the depth of a convexity defect; trade). A convex blob has depth under a
 * pixel everywhere (digitisation only); two overlapping discs have a defect on each side whose deepest point
 * is the neck.
 */
import type { CV } from './index';
import { matFromArray, withMats } from './mats';

/**
 * @param mask 0/1, row-major, width × height
 * @returns per pixel: the concavity depth (px) of that contour pixel, 0 off the outlines (and at contour pixels
 *   on a hull edge); where two contours meet at a pixel the larger depth
 */
export function concavityDepth(cv: CV, mask: Uint8Array, width: number, height: number): Float32Array {
  const depth = new Float32Array(width * height);
  forEachOutline(cv, mask, width, height, (pts) => markContour(pts, depth, width));
  return depth;
}

/**
 * The cusps of the holes of a set of bodies: the corners of each hole's convex hull where the hole's outline
 * turns sharply, the angle between the outline `CUSP_ARM` px before and after the corner being at most
 * `maxAngleDeg`. A gap enclosed by touching bodies narrows to such a corner at each neck (its sides are the
 * bodies' outlines, bulging into it or straight); a roundish dark spot inside one body has none (every hull
 * corner of a disc of radius 3 px or more turns by less than 60°, an angle of 120° or more). A hole too small
 * to measure an angle on (an outline of fewer than 2·CUSP_ARM + 2 pixels) has none.
 *
 * @param holes 0/1, row-major: 1 = a hole pixel
 * @returns 1 at the cusp pixels (and the outline pixels next to them), 0 elsewhere
 */
export function holeCusps(cv: CV, holes: Uint8Array, width: number, height: number, maxAngleDeg: number): Uint8Array {
  const cusp = new Uint8Array(width * height);
  const cosMax = Math.cos((maxAngleDeg * Math.PI) / 180);
  forEachOutline(cv, holes, width, height, (pts) => {
    const m = pts.length >> 1;
    if (m < 2 * CUSP_ARM + 2) return;
    for (const i of hullIndices(pts, m)) {
      const a = (i - CUSP_ARM + m) % m;
      const b = (i + CUSP_ARM) % m;
      const ux = pts[2 * a]! - pts[2 * i]!;
      const uy = pts[2 * a + 1]! - pts[2 * i + 1]!;
      const vx = pts[2 * b]! - pts[2 * i]!;
      const vy = pts[2 * b + 1]! - pts[2 * i + 1]!;
      const nu = Math.hypot(ux, uy);
      const nv = Math.hypot(vx, vy);
      if (nu === 0 || nv === 0 || (ux * vx + uy * vy) / (nu * nv) < cosMax) continue;
      for (let d = -1; d <= 1; d++) {
        const j = (i + d + m) % m;
        cusp[pts[2 * j + 1]! * width + pts[2 * j]!] = 1;
      }
    }
  });
  return cusp;
}

/**
 * Calls `fn` with the points (interleaved x, y, in order) of the outer outline of each connected part of a
 * 0/1 mask, found by opencv.js's findContours; every Mat freed.
 */
function forEachOutline(cv: CV, mask: Uint8Array, width: number, height: number, fn: (pts: Int32Array) => void): void {
  withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, mask));
    const contours = track(new cv.MatVector());
    const hier = track(new cv.Mat());
    cv.findContours(src, contours, hier, cv.RETR_EXTERNAL, cv.CHAIN_APPROX_NONE);
    const n = contours.size() as number;
    for (let k = 0; k < n; k++) {
      const ct = contours.get(k);
      try {
        fn(ct.data32S as Int32Array);
      } finally {
        ct.delete();
      }
    }
  });
}

/** How far (contour steps, about px) along the outline the angle at a hull corner is measured. */
const CUSP_ARM = 3;

/** Marks the defect depth of each point of one closed contour (interleaved x, y, in order). */
function markContour(pts: Int32Array, depth: Float32Array, width: number): void {
  const n = pts.length >> 1;
  if (n < 4) return;
  const hull = hullIndices(pts, n);
  if (hull.length < 3) return;
  // Hull vertices in contour order; each pair of consecutive vertices bridges the contour run between them.
  hull.sort((a, b) => a - b);
  for (let h = 0; h < hull.length; h++) {
    const i0 = hull[h]!;
    const i1 = hull[(h + 1) % hull.length]!;
    const span = (i1 - i0 + n) % n;
    if (span < 2) continue;
    const ax = pts[2 * i0]!;
    const ay = pts[2 * i0 + 1]!;
    const dx = pts[2 * i1]! - ax;
    const dy = pts[2 * i1 + 1]! - ay;
    const len = Math.hypot(dx, dy);
    for (let s = 1; s < span; s++) {
      const i = (i0 + s) % n;
      const px = pts[2 * i]!;
      const py = pts[2 * i + 1]!;
      // Distance to the bridging edge (to its start when the edge has no length: a contour that doubles back).
      const d = len > 0 ? Math.abs(dx * (py - ay) - dy * (px - ax)) / len : Math.hypot(px - ax, py - ay);
      const p = py * width + px;
      if (d > depth[p]!) depth[p] = d;
    }
  }
}

/** Indices of the convex hull's vertices (Andrew's monotone chain; collinear points left out). */
function hullIndices(pts: Int32Array, n: number): number[] {
  const order = Array.from({ length: n }, (_, i) => i);
  order.sort((a, b) => pts[2 * a]! - pts[2 * b]! || pts[2 * a + 1]! - pts[2 * b + 1]!);
  const cross = (o: number, a: number, b: number): number =>
    (pts[2 * a]! - pts[2 * o]!) * (pts[2 * b + 1]! - pts[2 * o + 1]!) - (pts[2 * a + 1]! - pts[2 * o + 1]!) * (pts[2 * b]! - pts[2 * o]!);
  const lower: number[] = [];
  for (const i of order) {
    while (lower.length >= 2 && cross(lower[lower.length - 2]!, lower[lower.length - 1]!, i) <= 0) lower.pop();
    lower.push(i);
  }
  const upper: number[] = [];
  for (let k = order.length - 1; k >= 0; k--) {
    const i = order[k]!;
    while (upper.length >= 2 && cross(upper[upper.length - 2]!, upper[upper.length - 1]!, i) <= 0) upper.pop();
    upper.push(i);
  }
  lower.pop();
  upper.pop();
  // A contour visits a pixel twice where it is one pixel thick: keep one index per hull point (the first).
  return Array.from(new Set(lower.concat(upper)));
}
