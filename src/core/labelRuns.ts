/**
 * A label image in run-length form: each row is a sequence of runs of one label that together cover it.
 * What the page needs of a label image (the cell under the pointer, the pixels of a selected cell) without
 * the full image: for cellular images a few bytes per cell boundary crossing instead of 4 bytes a pixel
 * (a 16 MP walls image of 12 577 cells: about 4 MB instead of 64 MB), so the worker hands it over
 * instead of copying the label image. {@link rowRuns} is the one scan of a label image's rows into runs that
 * the core's readers of label images share.
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

/**
 * Splits one row of a label image into runs (stretches of one label): run k covers columns
 * [starts[k], starts[k + 1]) and holds label labs[k], and starts[nr] = w. The one scan of label images into
 * runs: {@link labelRuns}, the per-cell sums, the cell outlines and the grain census all read rows through it.
 * @param L the labels, row-major
 * @param row index in L of the row's first pixel
 * @param w the row's length (the image width)
 * @param starts at least w + 1 long; labs at least w long
 * @returns nr, the number of runs of the row
 */
export function rowRuns(L: Int32Array, row: number, w: number, starts: Int32Array, labs: Int32Array): number {
  starts[0] = 0;
  if (w <= 0) return 0;
  let prev = L[row]!;
  labs[0] = prev;
  let nr = 1;
  for (let x = 1; x < w; x++) {
    const l = L[row + x]!;
    if (l !== prev) {
      starts[nr] = x;
      labs[nr] = l;
      nr++;
      prev = l;
    }
  }
  starts[nr] = w;
  return nr;
}

/** The run-length form of a label image (one scan, row by row, with {@link rowRuns}). */
export function labelRuns(img: LabelImage): LabelRuns {
  const { width: w, height: h, labels: L, count } = img;
  const rowStart = new Int32Array(h + 1);
  const starts = new Int32Array(w + 1);
  const labs = new Int32Array(Math.max(1, w));
  let runX = new Int32Array(Math.max(16, 4 * h));
  let runLabel = new Int32Array(runX.length);
  let k = 0;
  for (let y = 0; y < h; y++) {
    rowStart[y] = k;
    const nr = rowRuns(L, y * w, w, starts, labs);
    if (k + nr > runX.length) {
      const size = Math.max(2 * runX.length, k + nr);
      const x2 = new Int32Array(size);
      x2.set(runX.subarray(0, k));
      runX = x2;
      const l2 = new Int32Array(size);
      l2.set(runLabel.subarray(0, k));
      runLabel = l2;
    }
    for (let j = 0; j < nr; j++, k++) {
      runX[k] = starts[j]!;
      runLabel[k] = labs[j]!;
    }
  }
  rowStart[h] = k;
  return { width: w, height: h, count, rowStart, runX: runX.slice(0, k), runLabel: runLabel.slice(0, k) };
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
