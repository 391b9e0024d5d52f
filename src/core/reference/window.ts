/**
 * A window on a larger tessellation: the cells of a tessellation of a guard region that meet the field,
 * cut by the field's border, as a micrograph shows a tissue or a polished section.
 */
import type { CellTessellation, Tessellation, Tessellator } from '../tessellate';
import { clipToRect, polygonMeasures } from '../tessellate/polygon';
import type { Rect } from '../types';

/**
 * The cells of `t` (a tessellation of a region containing `field`) that meet `field`, renumbered 0..m−1.
 * Cells whose box lies strictly inside the field keep their values and have edge = 0; cells that cross the
 * border are clipped to it (Sutherland–Hodgman, exact for convex cells: tessellate/polygon.ts) for area,
 * perimeter, box and centroid, and have edge = 1. Neighbour lists keep
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
  // Measures of the crossing cells, clipped to the field, in the order met.
  const cArea = new Float64Array(n);
  const cPerimeter = new Float64Array(n);
  const cSides = new Int32Array(n);
  const cCentroid = new Float64Array(2 * n);
  const cBbox = new Float64Array(4 * n);
  const clippedOf = new Int32Array(n);
  let crossing = 0;
  const poly: number[] = [];
  const tmp: number[] = [];
  let m = 0;
  for (let i = 0; i < n; i++) {
    const x0 = t.bbox[4 * i]!, y0 = t.bbox[4 * i + 1]!, x1 = t.bbox[4 * i + 2]!, y1 = t.bbox[4 * i + 3]!;
    if (x1 <= field.x0 || x0 >= field.x1 || y1 <= field.y0 || y0 >= field.y1) continue;
    if (x0 > field.x0 && x1 < field.x1 && y0 > field.y0 && y1 < field.y1) {
      kind[i] = 1;
    } else {
      polygonOf(i, poly);
      clipToRect(poly, tmp, field.x0, field.y0, field.x1, field.y1);
      // A box can meet the field while the cell only grazes it (near a corner): no area, no cell.
      if (poly.length < 6) continue;
      polygonMeasures(poly, 0, poly.length, crossing, cArea, cPerimeter, cCentroid, cBbox);
      if (!(cArea[crossing]! > 0)) continue;
      cSides[crossing] = poly.length / 2;
      kind[i] = 2;
      clippedOf[i] = crossing++;
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
  const crossed = { area: cArea, perimeter: cPerimeter, sides: cSides, centroid: cCentroid, bbox: cBbox };
  for (let i = 0; i < n; i++) {
    const k = map[i]!;
    if (k < 0) continue;
    for (let q = t.neighbourOffsets[i]!; q < t.neighbourOffsets[i + 1]!; q++) {
      const j = map[t.neighbourIndex[q]!]!;
      if (j >= 0) nb[nbLength++] = j;
    }
    offsets[k + 1] = nbLength;
    // Cells inside keep their values; crossing cells take their clipped measures.
    const c = kind[i] === 1 ? i : clippedOf[i]!;
    const from = kind[i] === 1 ? t : crossed;
    area[k] = from.area[c]!;
    perimeter[k] = from.perimeter[c]!;
    sides[k] = from.sides[c]!;
    centroid[2 * k] = from.centroid[2 * c]!;
    centroid[2 * k + 1] = from.centroid[2 * c + 1]!;
    for (let q = 0; q < 4; q++) bbox[4 * k + q] = from.bbox[4 * c + q]!;
    if (kind[i] === 2) edge[k] = 1;
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
