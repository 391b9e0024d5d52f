/**
 * A window on a larger tessellation: the cells of a tessellation of a guard region that meet the field,
 * cut by the field's border, as a micrograph shows a tissue or a polished section.
 */
import type { CellTessellation, Tessellation, Tessellator } from '../tessellate';
import type { Rect } from '../types';

/**
 * The cells of `t` (a tessellation of a region containing `field`) that meet `field`, renumbered 0..m−1.
 * Cells whose box lies strictly inside the field keep their values and have edge = 0; cells that cross the
 * border are clipped to it (Sutherland–Hodgman, exact for convex cells; Sutherland & Hodgman 1974, Comm.
 * ACM 17:32; pub, memory) for area, perimeter, box and centroid, and have edge = 1. Neighbour lists keep
 * only neighbours that meet the field. `points` holds the clipped cells' centroids.
 */
export function windowCells(t: Tessellation, field: Rect): CellTessellation {
  return windowOf(t, field, (i, out) => {
    out.length = 0;
    for (let v = t.polygonOffsets[i]!; v < t.polygonOffsets[i + 1]!; v++) out.push(t.polygonCoords[2 * v]!, t.polygonCoords[2 * v + 1]!);
  });
}

/**
 * As {@link windowCells}, for the cells of the last 'retained' run of `engine` (the polygons stay inside
 * the engine, which saves building them for every cell). Same values bit for bit.
 */
export function windowCellsRetained(t: CellTessellation, engine: Tessellator, field: Rect): CellTessellation {
  return windowOf(t, field, (i, out) => engine.cellPolygon(i, out));
}

function windowOf(t: CellTessellation, field: Rect, polygonOf: (i: number, out: number[]) => void): CellTessellation {
  const n = t.area.length;
  const map = new Int32Array(n).fill(-1);
  const kind = new Uint8Array(n); // 0 outside, 1 inside, 2 crossing
  const clipped: (number[] | null)[] = [];
  const clippedOf = new Int32Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    const x0 = t.bbox[4 * i]!, y0 = t.bbox[4 * i + 1]!, x1 = t.bbox[4 * i + 2]!, y1 = t.bbox[4 * i + 3]!;
    if (x1 <= field.x0 || x0 >= field.x1 || y1 <= field.y0 || y0 >= field.y1) continue;
    if (x0 > field.x0 && x1 < field.x1 && y0 > field.y0 && y1 < field.y1) {
      kind[i] = 1;
    } else {
      let poly: number[] = [];
      polygonOf(i, poly);
      poly = clipAxis(poly, 0, field.x0, 1);
      poly = clipAxis(poly, 0, field.x1, -1);
      poly = clipAxis(poly, 1, field.y0, 1);
      poly = clipAxis(poly, 1, field.y1, -1);
      // A box can meet the field while the cell only grazes it (near a corner): no area, no cell.
      if (poly.length < 6 || !(polygonArea(poly) > 0)) continue;
      kind[i] = 2;
      clippedOf[i] = clipped.length;
      clipped.push(poly);
    }
    map[i] = m++;
  }
  const area = new Float64Array(m);
  const perimeter = new Float64Array(m);
  const sides = new Int32Array(m);
  const centroid = new Float64Array(2 * m);
  const edge = new Uint8Array(m);
  const bbox = new Float64Array(4 * m);
  const offsets = new Int32Array(m + 1);
  const nb = new Int32Array(t.neighbourIndex.length);
  let nbLength = 0;
  for (let i = 0; i < n; i++) {
    const k = map[i]!;
    if (k < 0) continue;
    for (let q = t.neighbourOffsets[i]!; q < t.neighbourOffsets[i + 1]!; q++) {
      const j = map[t.neighbourIndex[q]!]!;
      if (j >= 0) nb[nbLength++] = j;
    }
    offsets[k + 1] = nbLength;
    if (kind[i] === 1) {
      area[k] = t.area[i]!;
      perimeter[k] = t.perimeter[i]!;
      sides[k] = t.sides[i]!;
      centroid[2 * k] = t.centroid[2 * i]!;
      centroid[2 * k + 1] = t.centroid[2 * i + 1]!;
      for (let c = 0; c < 4; c++) bbox[4 * k + c] = t.bbox[4 * i + c]!;
      continue;
    }
    edge[k] = 1;
    measure(clipped[clippedOf[i]!]!, k, area, perimeter, sides, centroid, bbox);
  }
  return {
    points: centroid.slice(),
    field: { ...field },
    area,
    perimeter,
    sides,
    centroid,
    edge,
    bbox,
    neighbourOffsets: offsets,
    neighbourIndex: nb.slice(0, nbLength),
  };
}

function polygonArea(p: number[]): number {
  let a2 = 0;
  const m = p.length / 2;
  for (let a = 0; a < m; a++) {
    const b = (a + 1) % m;
    a2 += (p[2 * a]! - p[0]!) * (p[2 * b + 1]! - p[1]!) - (p[2 * b]! - p[0]!) * (p[2 * a + 1]! - p[1]!);
  }
  return Math.abs(a2) / 2;
}

/** Keeps the part of polygon p (flat x, y) with sign·(coord[axis] − c) ≥ 0. */
function clipAxis(p: number[], axis: 0 | 1, c: number, sign: 1 | -1): number[] {
  const out: number[] = [];
  const m = p.length / 2;
  for (let a = 0; a < m; a++) {
    const b = (a + 1) % m;
    const pa = sign * (p[2 * a + axis]! - c);
    const pb = sign * (p[2 * b + axis]! - c);
    if (pa >= 0) out.push(p[2 * a]!, p[2 * a + 1]!);
    if ((pa >= 0) !== (pb >= 0)) {
      const s = pa / (pa - pb);
      out.push(p[2 * a]! + s * (p[2 * b]! - p[2 * a]!), p[2 * a + 1]! + s * (p[2 * b + 1]! - p[2 * a + 1]!));
    }
  }
  return out;
}

function measure(p: number[], k: number, area: Float64Array, perimeter: Float64Array, sides: Int32Array, centroid: Float64Array, bbox: Float64Array): void {
  const m = p.length / 2;
  if (m < 3) return;
  const ox = p[0]!, oy = p[1]!;
  let a2 = 0, cx = 0, cy = 0, per = 0;
  let minx = Infinity, miny = Infinity, maxx = -Infinity, maxy = -Infinity;
  for (let a = 0; a < m; a++) {
    const b = (a + 1) % m;
    const xa = p[2 * a]! - ox, ya = p[2 * a + 1]! - oy, xb = p[2 * b]! - ox, yb = p[2 * b + 1]! - oy;
    const cr = xa * yb - xb * ya;
    a2 += cr;
    cx += (xa + xb) * cr;
    cy += (ya + yb) * cr;
    per += Math.hypot(xb - xa, yb - ya);
    minx = Math.min(minx, p[2 * a]!);
    maxx = Math.max(maxx, p[2 * a]!);
    miny = Math.min(miny, p[2 * a + 1]!);
    maxy = Math.max(maxy, p[2 * a + 1]!);
  }
  area[k] = Math.abs(a2) / 2;
  perimeter[k] = per;
  sides[k] = m;
  centroid[2 * k] = a2 ? ox + cx / (3 * a2) : ox;
  centroid[2 * k + 1] = a2 ? oy + cy / (3 * a2) : oy;
  bbox[4 * k] = minx;
  bbox[4 * k + 1] = miny;
  bbox[4 * k + 2] = maxx;
  bbox[4 * k + 3] = maxy;
}
