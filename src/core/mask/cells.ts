/**
 * Voronoi cells seen through a tissue mask, measured on the mask's pixel grid as a segmentation sees cells:
 * a cell's pixels are the pixels of the field whose centres it holds. The same function serves the
 * random-seeding reference's replicates and an observed point pattern's tessellation, so that the two are
 * measured alike.
 */
import type { CellTessellation } from '../tessellate';
import { countInRow, hasPixel, innerHolds, type MaskGeometry } from './geometry';

/**
 * Which cells are kept: 'majority' those with more than half of their pixels in the mask (a window on a
 * larger tissue, as the observed cells of a walls pattern are kept); 'all' every cell (seeds drawn in the mask).
 */
export type MaskKeepRule = 'majority' | 'all';

export interface MaskedCells extends CellTessellation {
  /** Index in the input tessellation of each kept cell. */
  kept: Int32Array;
  /**
   * What a segmentation would see of each kept cell (px²): its area for an interior cell, its pixels in the
   * field for an edge cell (the minimum cell area applies to it).
   */
  seen: Float64Array;
}

/** The chord of a convex polygon (x, y pairs) at height y: [lo, hi] in out, false when the line misses it. */
function chord(poly: number[], y: number, out: Float64Array): boolean {
  let lo = Infinity;
  let hi = -Infinity;
  const m = poly.length;
  for (let j = 0, k = m - 2; j < m; k = j, j += 2) {
    const ya = poly[k + 1]!;
    const yb = poly[j + 1]!;
    if ((ya <= y && y < yb) || (yb <= y && y < ya)) {
      const xa = poly[k]!;
      const x = xa + ((y - ya) * (poly[j]! - xa)) / (yb - ya);
      if (x < lo) lo = x;
      if (x > hi) hi = x;
    }
  }
  out[0] = lo;
  out[1] = hi;
  return hi >= lo;
}

/**
 * The cells of `t` seen through the mask `m`. For each cell, the pixels of the field whose centres lie in its
 * (convex) polygon are counted row by row against the mask's runs: in the field, in the mask and in the
 * mask's interior. A kept cell is an edge cell when one of its pixels is not in the interior (it touches the
 * mask's border or the field's); an edge cell's area and centroid are those of its pixels in the mask, an
 * interior cell keeps the polygon's. Neighbour lists keep the kept neighbours; side numbers are unchanged.
 *
 * @param polygonOf writes cell i's polygon (x, y pairs, px) into `out`
 */
export function maskedCells(t: CellTessellation, polygonOf: (i: number, out: number[]) => void, m: MaskGeometry, rule: MaskKeepRule): MaskedCells {
  const n = t.area.length;
  const f = m.field;
  const b = m.bbox;
  const map = new Int32Array(n).fill(-1);
  const kept: number[] = [];
  const cArea = new Float64Array(n);
  const cSeen = new Float64Array(n);
  const cx = new Float64Array(n);
  const cy = new Float64Array(n);
  const cEdge = new Uint8Array(n);
  const poly: number[] = [];
  const span = new Float64Array(2);
  const sum = new Float64Array(1);
  for (let i = 0; i < n; i++) {
    const x0 = t.bbox[4 * i]!, y0 = t.bbox[4 * i + 1]!, x1 = t.bbox[4 * i + 2]!, y1 = t.bbox[4 * i + 3]!;
    const meets = x1 > b.x0 && x0 < b.x1 && y1 > b.y0 && y0 < b.y1;
    if (!meets && rule === 'majority') continue;
    let total = 0;
    let inMask = 0;
    let inner = 0;
    let sx = 0;
    let sy = 0;
    // A cell whose box lies in whole interior blocks is an interior cell: no need to count its pixels.
    const px0 = Math.ceil(x0 - 0.5);
    const py0 = Math.ceil(y0 - 0.5);
    const px1 = Math.floor(x1 - 0.5) + 1;
    const py1 = Math.floor(y1 - 0.5) + 1;
    if (meets && innerHolds(m.blocks, px0, py0, px1, py1)) {
      const k = kept.length;
      kept.push(i);
      map[i] = k;
      cArea[k] = cSeen[k] = t.area[i]!;
      cx[k] = t.centroid[2 * i]!;
      cy[k] = t.centroid[2 * i + 1]!;
      continue;
    }
    if (meets) {
      polygonOf(i, poly);
      const ya = Math.max(f.y0, Math.ceil(y0 - 0.5));
      const yb = Math.min(f.y1 - 1, Math.floor(y1 - 0.5));
      for (let y = ya; y <= yb; y++) {
        if (!chord(poly, y + 0.5, span)) continue;
        const a = Math.max(f.x0, Math.ceil(span[0]! - 0.5));
        const e = Math.min(f.x1, Math.floor(span[1]! - 0.5) + 1);
        if (e <= a) continue;
        total += e - a;
        const c = countInRow(m.pixels, y, a, e, sum);
        if (!c) continue;
        inMask += c;
        sx += sum[0]!;
        sy += c * (y + 0.5);
        inner += countInRow(m.inner, y, a, e);
      }
    }
    if (rule === 'majority' && !(2 * inMask > total)) continue;
    const k = kept.length;
    kept.push(i);
    map[i] = k;
    const px = t.centroid[2 * i]!;
    const py = t.centroid[2 * i + 1]!;
    // A cell too small to hold a pixel centre: its own pixel decides.
    const edge = total > 0 ? inner < total : !hasPixel(m.inner, Math.floor(px), Math.floor(py));
    cEdge[k] = edge ? 1 : 0;
    cArea[k] = edge ? inMask : t.area[i]!;
    cSeen[k] = edge ? total : t.area[i]!;
    cx[k] = edge && inMask > 0 ? sx / inMask : px;
    cy[k] = edge && inMask > 0 ? sy / inMask : py;
  }
  const K = kept.length;
  const area = cArea.slice(0, K);
  const perimeter = new Float64Array(K);
  const sides = new Int32Array(K);
  const centroid = new Float64Array(2 * K);
  const bbox = new Float64Array(4 * K);
  const offsets = new Int32Array(K + 1);
  const nb: number[] = [];
  for (let k = 0; k < K; k++) {
    const i = kept[k]!;
    perimeter[k] = t.perimeter[i]!;
    sides[k] = t.sides[i]!;
    centroid[2 * k] = cx[k]!;
    centroid[2 * k + 1] = cy[k]!;
    for (let q = 0; q < 4; q++) bbox[4 * k + q] = t.bbox[4 * i + q]!;
    for (let q = t.neighbourOffsets[i]!; q < t.neighbourOffsets[i + 1]!; q++) {
      const j = map[t.neighbourIndex[q]!]!;
      if (j >= 0) nb.push(j);
    }
    offsets[k + 1] = nb.length;
  }
  return {
    points: centroid.slice(), field: { ...f }, area, perimeter, sides, centroid, edge: cEdge.slice(0, K), bbox,
    neighbourOffsets: offsets, neighbourIndex: Int32Array.from(nb), kept: Int32Array.from(kept), seen: cSeen.slice(0, K),
  };
}
