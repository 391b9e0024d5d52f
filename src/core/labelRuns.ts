/**
 * A label image in run-length form: each row is a sequence of runs of one label that together cover it.
 * What the page needs of a label image (the cell under the pointer, the pixels of a selected cell) without
 * the full image: for cellular images a few bytes per cell boundary crossing instead of 4 bytes a pixel
 * (a 16 MP walls image of 12 577 cells: about 4 MB instead of 64 MB), so the worker hands it over
 * instead of copying the label image.
 */
import type { LabelImage } from './types';

export interface LabelRuns {
  width: number;
  height: number;
  /** Number of cells (labels 1..count); 0 is wall or background. */
  count: number;
  /** Row y's runs are [rowStart[y], rowStart[y + 1]); length height + 1. */
  rowStart: Int32Array;
  /** First x of each run; a run ends where the next run of its row starts, or at the row's end. */
  runX: Int32Array;
  /** Label of each run. */
  runLabel: Int32Array;
}

/** The run-length form of a label image (two passes: count the runs, then write them; at most one run a pixel). */
export function labelRuns(img: LabelImage): LabelRuns {
  const { width: w, height: h, labels: L, count } = img;
  const rowStart = new Int32Array(h + 1);
  // A run starts at each row's first pixel and wherever the label changes along the row.
  let k = 0;
  for (let y = 0; y < h; y++) {
    rowStart[y] = k;
    const row = y * w;
    for (let x = 0; x < w; x++) if (x === 0 || L[row + x] !== L[row + x - 1]) k++;
  }
  rowStart[h] = k;
  const runX = new Int32Array(k);
  const runLabel = new Int32Array(k);
  k = 0;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let x = 0; x < w; x++) {
      if (x === 0 || L[row + x] !== L[row + x - 1]) {
        runX[k] = x;
        runLabel[k++] = L[row + x]!;
      }
    }
  }
  return { width: w, height: h, count, rowStart, runX, runLabel };
}

/** The label at pixel (x, y) (whole numbers inside the image), by binary search in the row's runs. */
export function runLabelAt(r: LabelRuns, x: number, y: number): number {
  let lo = r.rowStart[y]!;
  let hi = r.rowStart[y + 1]! - 1;
  // The last run of the row that starts at or before x.
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (r.runX[mid]! <= x) lo = mid;
    else hi = mid - 1;
  }
  return r.runLabel[lo]!;
}

/**
 * Calls `span(x0, x1, y)` for each run of `label` on rows y0 .. y1 − 1 (pixels x0 .. x1 − 1), row by row,
 * left to right.
 */
export function forEachSpan(r: LabelRuns, label: number, y0: number, y1: number, span: (x0: number, x1: number, y: number) => void): void {
  const { rowStart, runX, runLabel, width } = r;
  for (let y = Math.max(0, y0); y < Math.min(r.height, y1); y++) {
    const end = rowStart[y + 1]!;
    for (let k = rowStart[y]!; k < end; k++) {
      if (runLabel[k] === label) span(runX[k]!, k + 1 < end ? runX[k + 1]! : width, y);
    }
  }
}
