/**
 * Outlines of labelled cells as polygons, traced by opencv's border following (Suzuki & Abe 1985,
 * CVGIP 30:32) on each cell's bounding box; the outer border of each cell, through the centres of its
 * boundary pixels, with collinear points dropped.
 */
import type { CV } from './index';
import { withMats } from './mats';
import type { LabelImage } from '../types';

export interface Polygons {
  /** Vertices of polygon i are coords[2*offsets[i] .. 2*offsets[i+1]) (px, pixel centres + offset). */
  offsets: Int32Array;
  coords: Float64Array;
}

/**
 * One outline per cell (the longest outer contour when a cell has several parts).
 * @param offsetX, offsetY added to every vertex (the field's origin in the image), plus 0.5 so vertices sit
 *   at pixel centres in the continuous coordinates of the tables.
 */
export function cellOutlines(cv: CV, img: LabelImage, offsetX = 0, offsetY = 0): Polygons {
  const { width: w, height: h, labels: L, count } = img;
  const xmin = new Int32Array(count).fill(w);
  const ymin = new Int32Array(count).fill(h);
  const xmax = new Int32Array(count).fill(-1);
  const ymax = new Int32Array(count).fill(-1);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const l = L[y * w + x]! - 1;
      if (l < 0) continue;
      if (x < xmin[l]!) xmin[l] = x;
      if (x > xmax[l]!) xmax[l] = x;
      if (y < ymin[l]!) ymin[l] = y;
      if (y > ymax[l]!) ymax[l] = y;
    }
  }
  const offsets = new Int32Array(count + 1);
  const parts: Float64Array[] = [];
  withMats((track) => {
    for (let c = 0; c < count; c++) {
      const bw = xmax[c]! - xmin[c]! + 3;
      const bh = ymax[c]! - ymin[c]! + 3;
      const m = new cv.Mat(bh, bw, cv.CV_8UC1, new cv.Scalar(0));
      const contours = new cv.MatVector();
      const hier = new cv.Mat();
      try {
        const d = m.data as Uint8Array;
        for (let y = ymin[c]!; y <= ymax[c]!; y++) {
          const row = y * w;
          const out = (y - ymin[c]! + 1) * bw + 1 - xmin[c]!;
          for (let x = xmin[c]!; x <= xmax[c]!; x++) if (L[row + x] === c + 1) d[out + x] = 1;
        }
        cv.findContours(m, contours, hier, cv.RETR_EXTERNAL, cv.CHAIN_APPROX_SIMPLE);
        let best: Int32Array | null = null;
        for (let k = 0; k < contours.size(); k++) {
          const ct = contours.get(k);
          try {
            const pts = ct.data32S as Int32Array;
            if (!best || pts.length > best.length) best = new Int32Array(pts);
          } finally {
            ct.delete();
          }
        }
        const pts = best ?? new Int32Array(0);
        const poly = new Float64Array(pts.length);
        for (let k = 0; k < pts.length; k += 2) {
          poly[k] = pts[k]! - 1 + xmin[c]! + offsetX + 0.5;
          poly[k + 1] = pts[k + 1]! - 1 + ymin[c]! + offsetY + 0.5;
        }
        parts.push(poly);
        offsets[c + 1] = offsets[c]! + poly.length / 2;
      } finally {
        m.delete();
        contours.delete();
        hier.delete();
      }
    }
    void track;
  });
  const coords = new Float64Array(offsets[count]! * 2);
  let o = 0;
  for (const p of parts) (coords.set(p, o), (o += p.length));
  return { offsets, coords };
}
