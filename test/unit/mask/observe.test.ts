/**
 * Cells seen through a mask, on hand-drawn rasters whose expected values are counted by hand (derived):
 * - segmented cells: kept when more than half of their pixels are in the mask, cut to it, edge cells at the
 *   mask's or the field's border, side numbers counting every neighbour in the cut segmentation;
 * - Voronoi cells: their pixels are those whose centres they hold, counted in the field, the mask and its
 *   interior.
 */
import { describe, expect, it } from 'vitest';
import { maskGeometry } from '../../../src/core/mask/geometry';
import { maskLabels } from '../../../src/core/mask/observe';
import { maskedCells } from '../../../src/core/mask/cells';
import type { CellTessellation } from '../../../src/core/tessellate';

describe('segmented cells in a mask', () => {
  // A 16 x 16 field of bricks in four rows of 4 px (so that no four cells meet at a point):
  //   row A (y 0..3):   1: x 0..3,  2: x 4..7,  3: x 8..11, 4: x 12..15
  //   row B (y 4..7):   5: x 0..5,  6: x 6..9,  7: x 10..15
  //   row C (y 8..11):  8: x 0..3,  9: x 4..7, 10: x 8..11, 11: x 12..15
  //   row D (y 12..15): 12: x 0..5, 13: x 6..9, 14: x 10..15
  // The mask: x < 14. Cells 4 and 11 have exactly half of their pixels in it and are left out; 7 and 14 have
  // 16 of their 24 and are kept, cut to them.
  const W = 16;
  const rows = [[4, 8, 12, 16], [6, 10, 16], [4, 8, 12, 16], [6, 10, 16]];
  const labels = new Int32Array(W * W);
  let first = 1;
  rows.forEach((ends, r) => {
    for (let y = 4 * r; y < 4 * r + 4; y++) for (let x = 0; x < W; x++) labels[y * W + x] = first + ends.findIndex((e) => x < e);
    first += ends.length;
  });
  const mask = new Uint8Array(W * W);
  for (let y = 0; y < W; y++) for (let x = 0; x < 14; x++) mask[y * W + x] = 1;
  const r = maskLabels({ width: W, height: W, labels, count: 14 }, undefined, { x0: 0, y0: 0, x1: W, y1: W }, mask, W);

  it('keeps the cells with most of their pixels in the mask, in their order, and cuts them to it', () => {
    // Kept: 1, 2, 3, 5, 6, 7, 8, 9, 10, 12, 13, 14 -> 1..12.
    expect(r.labels.count).toBe(12);
    expect(r.dropped).toBe(2);
    expect(Array.from(r.sums.n)).toEqual([16, 16, 16, 24, 16, 16, 16, 16, 16, 24, 16, 16]);
    expect(r.labels.labels[0 * W + 13]).toBe(0); // cell 4's pixel in the mask: left out
    expect(r.labels.labels[5 * W + 7]).toBe(5); // cell 6
    expect(r.labels.labels[5 * W + 13]).toBe(6); // cell 7, in the mask
    expect(r.labels.labels[5 * W + 14]).toBe(0); // cell 7, cut away
  });

  it('edge cells touch the mask\'s or the field\'s border; cells 6, 9 and 10 are interior', () => {
    expect(Array.from(r.sums.edge)).toEqual([1, 1, 1, 1, 0, 1, 1, 0, 0, 1, 1, 1]);
  });

  it('side numbers count every neighbour, left-out cells included; neighbour lists keep the kept ones', () => {
    // Cell 6: 2, 3, 5, 7, 9, 10. Cell 7: 3, 4, 6, 10, 11. Cell 9: 5, 6, 8, 10, 12, 13. Cell 10: 6, 7, 9, 11, 13, 14.
    expect(r.sides[4]).toBe(6);
    expect(r.sides[5]).toBe(5);
    expect(r.sides[7]).toBe(6);
    expect(r.sides[8]).toBe(6);
    const of = (c: number) => Array.from(r.sums.neighbourIndex.subarray(r.sums.neighbourOffsets[c]!, r.sums.neighbourOffsets[c + 1]!)).sort((a, b) => a - b);
    // Cell 10 (index 8): cells 6, 7, 9, 13, 14 -> indices 4, 5, 7, 10, 11 (cell 11 is left out).
    expect(of(8)).toEqual([4, 5, 7, 10, 11]);
    // Cell 7 (index 5): cells 3, 6, 10 -> 2, 4, 8.
    expect(of(5)).toEqual([2, 4, 8]);
  });
});

describe('Voronoi cells in a mask', () => {
  // Two square cells side by side in a 40 x 20 field: [2.2, 12.7] x [3.1, 13.9] and [12.7, 30.4] x [3.1, 13.9].
  // Pixels whose centres x + 0.5, y + 0.5 they hold: columns 2..12 and 13..29, rows 3..13 (11 rows).
  // The mask: x < 8 (all rows).
  const polys = [[2.2, 3.1, 12.7, 3.1, 12.7, 13.9, 2.2, 13.9], [12.7, 3.1, 30.4, 3.1, 30.4, 13.9, 12.7, 13.9]];
  const area = polys.map((p) => (p[2]! - p[0]!) * (p[5]! - p[1]!));
  const t: CellTessellation = {
    points: new Float64Array([7, 8, 20, 8]), field: { x0: 0, y0: 0, x1: 40, y1: 20 }, area: Float64Array.from(area), perimeter: new Float64Array(2),
    sides: new Int32Array([4, 4]), centroid: new Float64Array([7.45, 8.5, 21.55, 8.5]), edge: new Uint8Array(2),
    bbox: new Float64Array([2.2, 3.1, 12.7, 13.9, 12.7, 3.1, 30.4, 13.9]), neighbourOffsets: new Int32Array([0, 1, 2]), neighbourIndex: new Int32Array([1, 0]),
  };
  const mask = new Uint8Array(40 * 20);
  for (let y = 0; y < 20; y++) for (let x = 0; x < 8; x++) mask[y * 40 + x] = 1;
  const g = maskGeometry(mask, 40, 20, t.field);
  const polygonOf = (i: number, out: number[]) => {
    out.length = 0;
    out.push(...polys[i]!);
  };

  it("'majority': the first cell (66 of 121 pixels in the mask) is kept, the second (none) is not", () => {
    const c = maskedCells(t, polygonOf, g, 'majority');
    expect(Array.from(c.kept)).toEqual([0]);
    expect(c.edge[0]).toBe(1);
    // Its pixels in the mask: columns 2..7, rows 3..13 -> 66; the mean of their centres (5, 8.5).
    expect(c.area[0]).toBe(66);
    expect(c.seen[0]).toBe(121);
    expect(c.centroid[0]).toBeCloseTo(5, 12);
    expect(c.centroid[1]).toBeCloseTo(8.5, 12);
    expect(c.neighbourOffsets[1]).toBe(0);
  });

  it("'all': both cells kept; the one outside the mask is an edge cell with no pixel in it", () => {
    const c = maskedCells(t, polygonOf, g, 'all');
    expect(Array.from(c.kept)).toEqual([0, 1]);
    expect(Array.from(c.edge)).toEqual([1, 1]);
    expect(c.area[1]).toBe(0);
    expect(Array.from(c.neighbourIndex)).toEqual([1, 0]);
  });

  it('a cell inside the mask\'s interior keeps its polygon\'s area and centroid', () => {
    const all = new Uint8Array(40 * 20).fill(1);
    const c = maskedCells(t, polygonOf, maskGeometry(all, 40, 20, t.field), 'majority');
    expect(Array.from(c.edge)).toEqual([0, 0]);
    expect(c.area[0]).toBe(area[0]);
    expect(c.centroid[0]).toBe(7.45);
  });
});
