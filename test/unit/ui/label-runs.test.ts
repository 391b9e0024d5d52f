/**
 * The run-length form of a label image the page picks and fills cells with (src/core/labelRuns.ts),
 * checked against the label image itself, pixel by pixel: the label at every pixel, every cell's pixels
 * as spans, and the number of runs as a plain count of label changes along the rows (derived).
 */
import { describe, expect, it } from 'vitest';
import { forEachSpan, labelRuns, rowRuns, runLabelAt } from '../../../src/core/labelRuns';
import { synthesize } from '../../../src/core/synth';
import type { LabelImage } from '../../../src/core/types';

/** Every check of the runs against the label image they came from. */
function checkAgainstImage(l: LabelImage): void {
  const r = labelRuns(l);
  const { width: w, height: h } = l;
  expect([r.width, r.height, r.count]).toEqual([w, h, l.count]);
  // A run starts at x = 0 and wherever the label differs from the pixel before it.
  let changes = 0;
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) if (x === 0 || l.labels[y * w + x] !== l.labels[y * w + x - 1]) changes++;
  expect(r.runX.length).toBe(changes);
  expect(r.rowStart[h]).toBe(changes);
  const wrong: string[] = [];
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    const v = runLabelAt(r, x, y);
    if (v !== l.labels[y * w + x]) wrong.push(`(${x}, ${y}): ${v} for ${l.labels[y * w + x]}`);
  }
  expect(wrong.slice(0, 5)).toEqual([]);
  // Each cell's spans mark exactly its pixels, once each.
  const seen = new Int32Array(w * h);
  for (let c = 0; c <= l.count; c++) {
    forEachSpan(r, c, 0, h, (x0, x1, y) => {
      expect(x1).toBeGreaterThan(x0);
      for (let x = x0; x < x1; x++) {
        expect(l.labels[y * w + x]).toBe(c);
        seen[y * w + x]!++;
      }
    });
  }
  expect(seen.every((s) => s === 1)).toBe(true);
}

describe('label runs', () => {
  it('a small image written out by hand', () => {
    // Row 0: 1 1 0 2; row 1: 2 2 2 2.
    const l: LabelImage = { width: 4, height: 2, count: 2, labels: Int32Array.from([1, 1, 0, 2, 2, 2, 2, 2]) };
    const r = labelRuns(l);
    expect(Array.from(r.rowStart)).toEqual([0, 3, 4]);
    expect(Array.from(r.runX)).toEqual([0, 2, 3, 0]);
    expect(Array.from(r.runLabel)).toEqual([1, 0, 2, 2]);
    const spans: number[][] = [];
    forEachSpan(r, 2, 0, 2, (x0, x1, y) => spans.push([x0, x1, y]));
    expect(spans).toEqual([[3, 4, 0], [0, 4, 1]]);
    // Rows outside the image are skipped, not read.
    const none: number[][] = [];
    forEachSpan(r, 1, -3, 0, (x0, x1, y) => none.push([x0, x1, y]));
    forEachSpan(r, 1, 2, 9, (x0, x1, y) => none.push([x0, x1, y]));
    expect(none).toEqual([]);
  });

  it('one row split by rowRuns: the runs with the row end as last start', () => {
    // Row 1 of 0 0 | 3 3 0 5 5 5: runs [0, 2) of 3, [2, 3) of 0, [3, 6) of 5.
    const L = Int32Array.from([0, 0, 0, 0, 0, 0, 3, 3, 0, 5, 5, 5]);
    const starts = new Int32Array(7).fill(-1);
    const labs = new Int32Array(6).fill(-1);
    const nr = rowRuns(L, 6, 6, starts, labs);
    expect(nr).toBe(3);
    expect(Array.from(starts.subarray(0, nr + 1))).toEqual([0, 2, 3, 6]);
    expect(Array.from(labs.subarray(0, nr))).toEqual([3, 0, 5]);
    expect(rowRuns(L, 0, 0, starts, labs)).toBe(0);
  });

  let seed = 11;
  const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
  for (const [w, h] of [[1, 1], [1, 9], [9, 1], [2, 2], [17, 13], [64, 5]] as const) {
    it(`random ${w} x ${h} label image`, () => {
      const labels = new Int32Array(w * h);
      let v = 0;
      for (let i = 0; i < labels.length; i++) { if (rnd() < 0.35) v = Math.floor(rnd() * 5); labels[i] = v; }
      checkAgainstImage({ width: w, height: h, labels, count: 4 });
    });
  }

  it('the worst case, a label change at every pixel, has one run a pixel', () => {
    const w = 33, h = 7;
    const labels = Int32Array.from({ length: w * h }, (_, i) => 1 + (i % 2));
    checkAgainstImage({ width: w, height: h, labels, count: 2 });
    expect(labelRuns({ width: w, height: h, labels, count: 2 }).runX.length).toBe(w * h);
  });

  it('the true labels of a generated walls image, and far fewer runs than pixels', () => {
    const s = synthesize({ pattern: 'walls', width: 300, height: 200, cells: 60, order: 'random', seed: 3 });
    const l = s.truth;
    checkAgainstImage(l);
    // About one run per cell a row crosses: a small fraction of the pixels.
    expect(labelRuns(l).runX.length).toBeLessThan(0.1 * l.width * l.height);
  });
});
