/**
 * Outlines of labelled cells as polygons, traced by opencv's border following (Suzuki & Abe 1985,
 * CVGIP 30:32) on each cell's bounding box; the outer border of each cell, through the centres of its
 * boundary pixels, with collinear points dropped.
 */
import type { CV } from './index';
import { withMats } from './mats';
import { labelRuns } from '../labelRuns';
import type { LabelImage } from '../types';

export interface Polygons {
  /** Vertices of polygon i are coords[2*offsets[i] .. 2*offsets[i+1]) (px, pixel centres + offset). */
  offsets: Int32Array;
  coords: Float64Array;
}

/** Side (px) of the atlas that many cells' masks share for one border-following call. */
const ATLAS_SIDE = 2048;

/**
 * One outline per cell (the longest outer contour when a cell has several parts).
 *
 * Each cell's mask, on its bounding box with a one-pixel empty margin, is traced exactly as it would be
 * alone; the masks are packed side by side into a shared atlas (shelf packing) so that one call traces
 * hundreds of cells: the cost per call of opencv.js, not the tracing, was most of the time.
 *
 * @param offsetX, offsetY added to every vertex (the field's origin in the image), plus 0.5 so vertices sit
 *   at pixel centres in the continuous coordinates of the tables.
 */
export function cellOutlines(cv: CV, img: LabelImage, offsetX = 0, offsetY = 0): Polygons {
  const { width: w, height: h, count } = img;
  const xmin = new Int32Array(count).fill(w);
  const ymin = new Int32Array(count).fill(h);
  const xmax = new Int32Array(count).fill(-1);
  const ymax = new Int32Array(count).fill(-1);
  // The cells' runs (row, first x, end x), bucketed by cell: masks are then drawn run by run.
  const perCell = new Int32Array(count + 1);
  let cellRuns: Int32Array;
  {
    const { rowStart, runX, runLabel } = labelRuns(img);
    for (let y = 0; y < h; y++) {
      const end = rowStart[y + 1]!;
      for (let k = rowStart[y]!; k < end; k++) {
        const l = runLabel[k]! - 1;
        if (l < 0) continue;
        const x = runX[k]!;
        const e = k + 1 < end ? runX[k + 1]! : w;
        if (x < xmin[l]!) xmin[l] = x;
        if (e - 1 > xmax[l]!) xmax[l] = e - 1;
        if (y < ymin[l]!) ymin[l] = y;
        if (y > ymax[l]!) ymax[l] = y;
        perCell[l + 1]!++;
      }
    }
    for (let c = 0; c < count; c++) perCell[c + 1]! += perCell[c]!;
    cellRuns = new Int32Array(3 * perCell[count]!);
    const pos = perCell.slice(0, count);
    for (let y = 0; y < h; y++) {
      const end = rowStart[y + 1]!;
      for (let k = rowStart[y]!; k < end; k++) {
        const l = runLabel[k]! - 1;
        if (l < 0) continue;
        const j = 3 * pos[l]!++;
        cellRuns[j] = y;
        cellRuns[j + 1] = runX[k]!;
        cellRuns[j + 2] = k + 1 < end ? runX[k + 1]! : w;
      }
    }
  }
  let maxW = 0;
  let maxH = 0;
  for (let c = 0; c < count; c++) {
    if (xmax[c]! < 0) continue;
    maxW = Math.max(maxW, xmax[c]! - xmin[c]! + 3);
    maxH = Math.max(maxH, ymax[c]! - ymin[c]! + 3);
  }
  const aw = Math.max(ATLAS_SIDE, maxW);
  const ah = Math.max(ATLAS_SIDE, maxH);
  // Per cell: its longest outer contour in its own box's coordinates (margin included).
  const best: (Int32Array | null)[] = new Array<Int32Array | null>(count).fill(null);
  withMats((track) => {
    const atlas = track(new cv.Mat(ah, aw, cv.CV_8UC1, new cv.Scalar(0)));
    const contours = track(new cv.MatVector());
    const hier = track(new cv.Mat());
    // The batch in the atlas: tiles in placement order, shelves as runs of tiles.
    let tileCell: number[] = [];
    let tileX: number[] = [];
    let tileY: number[] = [];
    let shelfY: number[] = [];
    let shelfFirst: number[] = [];
    let sx = 0;
    let sy = 0;
    let sh = 0;
    const tileAt = (px: number, py: number): number => {
      let lo = 0;
      let hi = shelfY.length - 1;
      while (lo < hi) {
        const mid = (lo + hi + 1) >> 1;
        if (shelfY[mid]! <= py) lo = mid;
        else hi = mid - 1;
      }
      let a = shelfFirst[lo]!;
      let b = (lo + 1 < shelfFirst.length ? shelfFirst[lo + 1]! : tileCell.length) - 1;
      while (a < b) {
        const mid = (a + b + 1) >> 1;
        if (tileX[mid]! <= px) a = mid;
        else b = mid - 1;
      }
      return a;
    };
    const flush = (): void => {
      if (tileCell.length === 0) return;
      cv.findContours(atlas, contours, hier, cv.RETR_EXTERNAL, cv.CHAIN_APPROX_SIMPLE);
      // Contours come in the order opencv found them; within one tile that order is the order a lone
      // trace of that cell gives, so "the first of the longest" is the same cell part as it would be alone.
      for (let k = 0; k < contours.size(); k++) {
        const ct = contours.get(k);
        try {
          const pts = ct.data32S as Int32Array;
          if (pts.length === 0) continue;
          const t = tileAt(pts[0]!, pts[1]!);
          const c = tileCell[t]!;
          const prev = best[c];
          if (!prev || pts.length > prev.length) {
            const local = new Int32Array(pts.length);
            const ox = tileX[t]!;
            const oy = tileY[t]!;
            for (let i = 0; i < pts.length; i += 2) {
              local[i] = pts[i]! - ox;
              local[i + 1] = pts[i + 1]! - oy;
            }
            best[c] = local;
          }
        } finally {
          ct.delete();
        }
      }
      (atlas.data as Uint8Array).fill(0);
      tileCell = [];
      tileX = [];
      tileY = [];
      shelfY = [];
      shelfFirst = [];
      sx = 0;
      sy = 0;
      sh = 0;
    };
    for (let c = 0; c < count; c++) {
      if (xmax[c]! < 0) continue;
      const bw = xmax[c]! - xmin[c]! + 3;
      const bh = ymax[c]! - ymin[c]! + 3;
      if (sx + bw > aw) {
        sy += sh;
        sx = 0;
        sh = 0;
      }
      if (sy + bh > ah) flush();
      if (sx === 0) {
        shelfY.push(sy);
        shelfFirst.push(tileCell.length);
      }
      tileCell.push(c);
      tileX.push(sx);
      tileY.push(sy);
      // The atlas's view is taken afresh: opencv.js may have grown (and moved) its memory meanwhile.
      const d = atlas.data as Uint8Array;
      const dx = sx + 1 - xmin[c]!;
      for (let i = perCell[c]!; i < perCell[c + 1]!; i++) {
        const out = (sy + cellRuns[3 * i]! - ymin[c]! + 1) * aw + dx;
        d.fill(1, out + cellRuns[3 * i + 1]!, out + cellRuns[3 * i + 2]!);
      }
      sx += bw;
      if (bh > sh) sh = bh;
    }
    flush();
  });
  const offsets = new Int32Array(count + 1);
  for (let c = 0; c < count; c++) offsets[c + 1] = offsets[c]! + (best[c]?.length ?? 0) / 2;
  const coords = new Float64Array(offsets[count]! * 2);
  for (let c = 0; c < count; c++) {
    const pts = best[c];
    if (!pts) continue;
    const o = 2 * offsets[c]!;
    for (let k = 0; k < pts.length; k += 2) {
      coords[o + k] = pts[k]! - 1 + xmin[c]! + offsetX + 0.5;
      coords[o + k + 1] = pts[k + 1]! - 1 + ymin[c]! + offsetY + 0.5;
    }
  }
  return { offsets, coords };
}
