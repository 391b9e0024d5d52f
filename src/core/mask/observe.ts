/**
 * The observed cells of a segmentation seen through a tissue mask: a cell belongs to the tissue when more
 * than half of its pixels are in the mask; it is cut to the mask, and it is an edge cell when it touches the
 * mask's border (or the field's). The side number of a cell is its number of neighbours in the segmentation
 * cut to the mask, left-out cells included: an interior cell keeps every neighbour it has.
 */
import { cellSums, type CellSums } from '../measure/kernel';
import type { Tessellation } from '../tessellate/types';
import type { LabelImage, Rect } from '../types';
import { maskedCells } from './cells';
import type { MaskGeometry } from './geometry';

export interface MaskedLabels {
  /** The kept cells 1..count, cut to the mask; 0 elsewhere (field-sized, as the labels given). */
  labels: LabelImage;
  /** Sums of the kept cells; `edge` marks the cells touching the mask's border; neighbour lists among kept cells. */
  sums: CellSums;
  /** Neighbours of each kept cell in the cut segmentation, the left-out cells included. */
  sides: Int32Array;
  /** Cells that met the mask with at most half of their pixels. */
  dropped: number;
}

/**
 * Keeps, cuts and measures the cells of a segmentation in a mask.
 *
 * @param labels the segmentation of the field (field-sized)
 * @param intensity the field's grey values, or undefined
 * @param field the field inside the image (px)
 * @param mask the image's mask, one byte per pixel, nonzero = tissue (image-sized, `width` wide)
 */
export function maskLabels(labels: LabelImage, intensity: ArrayLike<number> | undefined, field: Rect, mask: Uint8Array, width: number): MaskedLabels {
  const { width: w, height: h, labels: L, count } = labels;
  // Pixel (x, y) of the field is mask[row(y) + x].
  const row = (y: number): number => (y + field.y0) * width + field.x0;
  const total = new Float64Array(count + 1);
  const inside = new Float64Array(count + 1);
  for (let y = 0; y < h; y++) {
    const m0 = row(y);
    const l0 = y * w;
    for (let x = 0; x < w; x++) {
      const l = L[l0 + x]!;
      total[l]!++;
      if (mask[m0 + x] !== 0) inside[l]!++;
    }
  }
  const relabel = new Int32Array(count + 1);
  let kept = 0;
  for (let l = 1; l <= count; l++) if (2 * inside[l]! > total[l]!) relabel[l] = ++kept;
  let met = kept;
  for (let l = 1; l <= count; l++) if (!relabel[l] && inside[l]! > 0) relabel[l] = ++met;
  const cut = new Int32Array(w * h);
  for (let y = 0; y < h; y++) {
    const m0 = row(y);
    const l0 = y * w;
    for (let x = 0; x < w; x++) if (mask[m0 + x] !== 0) cut[l0 + x] = relabel[L[l0 + x]!]!;
  }
  const all = cellSums({ width: w, height: h, labels: cut, count: met }, intensity);
  const sides = new Int32Array(kept);
  for (let c = 0; c < kept; c++) sides[c] = all.neighbourOffsets[c + 1]! - all.neighbourOffsets[c]!;
  // Edge cells: a pixel on the field's border or next to a pixel outside the mask, or pixels cut away.
  const edge = new Uint8Array(kept);
  for (let l = 1; l <= count; l++) if (relabel[l]! >= 1 && relabel[l]! <= kept && inside[l] !== total[l]) edge[relabel[l]! - 1] = 1;
  for (let y = 0; y < h; y++) {
    const m = row(y);
    for (let x = 0; x < w; x++) {
      const c = cut[y * w + x]!;
      if (c < 1 || c > kept || edge[c - 1]) continue;
      const q = m + x;
      if (x === 0 || y === 0 || x === w - 1 || y === h - 1 || !mask[q - 1] || !mask[q + 1] || !mask[q - width] || !mask[q + width]) edge[c - 1] = 1;
    }
  }
  for (let p = 0; p < cut.length; p++) if (cut[p]! > kept) cut[p] = 0;
  return { labels: { width: w, height: h, labels: cut, count: kept }, sums: keepFirst(all, kept, edge), sides, dropped: met - kept };
}

/** The sums of cells 0..k−1 with the given edge flags and neighbour lists among those cells. */
function keepFirst(s: CellSums, k: number, edge: Uint8Array): CellSums {
  const offsets = new Int32Array(k + 1);
  const index: number[] = [];
  for (let c = 0; c < k; c++) {
    for (let q = s.neighbourOffsets[c]!; q < s.neighbourOffsets[c + 1]!; q++) if (s.neighbourIndex[q]! < k) index.push(s.neighbourIndex[q]!);
    offsets[c + 1] = index.length;
  }
  return {
    count: k, n: s.n.slice(0, k), cx: s.cx.slice(0, k), cy: s.cy.slice(0, k), mu20: s.mu20.slice(0, k), mu02: s.mu02.slice(0, k), mu11: s.mu11.slice(0, k),
    intensitySum: s.intensitySum.slice(0, k), xmin: s.xmin.slice(0, k), ymin: s.ymin.slice(0, k), xmax: s.xmax.slice(0, k), ymax: s.ymax.slice(0, k),
    edge, perimeter: s.perimeter.slice(0, k), hullArea: s.hullArea.slice(0, k), neighbourOffsets: offsets, neighbourIndex: Int32Array.from(index),
  };
}

/**
 * An observed tessellation seen through the mask, as the reference's replicates see theirs (mask/cells.ts,
 * every cell kept): the Voronoi areas are those inside the mask, and a cell whose Voronoi cell touches the
 * mask's border is an edge cell. Points, polygons and neighbours stay as they are.
 */
export function maskTessellation(t: Tessellation, m: MaskGeometry): Tessellation {
  const c = maskedCells(t, (i, out) => {
    out.length = 0;
    for (let v = t.polygonOffsets[i]!; v < t.polygonOffsets[i + 1]!; v++) out.push(t.polygonCoords[2 * v]!, t.polygonCoords[2 * v + 1]!);
  }, m, 'all');
  return { ...t, area: c.area, edge: c.edge };
}
