import { describe, it, expect } from 'vitest';
import { mergeCells, splitCell, removeCell, applyEdits, type EditOp } from '../../../src/core/edit';
import { EditError } from '../../../src/core/errors';
import type { LabelImage } from '../../../src/core/types';

/** A label image from rows of digits (one char per pixel, '.' = 0). */
function img(rows: string[]): LabelImage {
  const h = rows.length, w = rows[0]!.length;
  const labels = new Int32Array(w * h);
  let count = 0;
  rows.forEach((r, y) => [...r].forEach((c, x) => {
    const v = c === '.' ? 0 : parseInt(c, 36);
    labels[y * w + x] = v;
    count = Math.max(count, v);
  }));
  return { width: w, height: h, labels, count };
}
function rows(l: LabelImage): string[] {
  const out: string[] = [];
  for (let y = 0; y < l.height; y++) {
    let r = '';
    for (let x = 0; x < l.width; x++) { const v = l.labels[y * l.width + x]!; r += v === 0 ? '.' : v.toString(36); }
    out.push(r);
  }
  return out;
}
/** The LabelImage contract (src/core/types.ts): every label in 1..count is present, none above. */
function checkContract(l: LabelImage): void {
  const seen = new Set<number>();
  for (const v of l.labels) { expect(v).toBeGreaterThanOrEqual(0); expect(v).toBeLessThanOrEqual(l.count); if (v) seen.add(v); }
  expect(seen.size).toBe(l.count);
}

// Three cells in a row separated by one-pixel walls, a fourth below them all.
const three = img([
  '111.222.333',
  '111.222.333',
  '111.222.333',
  '111.222.333',
  '111.222.333',
  '...........',
  '44444444444',
]);

describe('removeCell', () => {
  it('clears the cell and moves the higher ids down by one', () => {
    const r = removeCell(three, 2);
    expect(r.count).toBe(3);
    expect(rows(r)).toEqual([
      '111.....222',
      '111.....222',
      '111.....222',
      '111.....222',
      '111.....222',
      '...........',
      '33333333333',
    ]);
    checkContract(r);
  });
  it('leaves its input unchanged', () => {
    const before = rows(three);
    removeCell(three, 1);
    expect(rows(three)).toEqual(before);
  });
  it('rejects an id that is not a cell', () => {
    expect(() => removeCell(three, 0)).toThrow(EditError);
    expect(() => removeCell(three, 5)).toThrow(/not a cell of this image/);
    expect(() => removeCell(three, 1.5)).toThrow(EditError);
  });
});

describe('mergeCells', () => {
  it('joins two neighbours and the wall between them, but not the walls they share with others', () => {
    const m = mergeCells(three, 1, 2);
    expect(m.count).toBe(3);
    // The wall column x=3 between 1 and 2 joins them; the wall row they share with cell 4 stays.
    expect(rows(m)).toEqual([
      '1111111.222',
      '1111111.222',
      '1111111.222',
      '1111111.222',
      '1111111.222',
      '...........',
      '33333333333',
    ]);
    checkContract(m);
  });
  it('gives the merged cell the lower id whatever the order', () => {
    expect(rows(mergeCells(three, 3, 2))).toEqual(rows(mergeCells(three, 2, 3)));
    expect(mergeCells(three, 3, 2).labels[0 * 11 + 5]).toBe(2);
  });
  it('rejects merging a cell with itself or with a non-cell', () => {
    expect(() => mergeCells(three, 2, 2)).toThrow(/itself/);
    expect(() => mergeCells(three, 2, 9)).toThrow(EditError);
  });
});

describe('splitCell', () => {
  const big = img([
    '..........',
    '.11111111.',
    '.11111111.',
    '.11111111.',
    '.11111111.',
    '.11111111.',
    '..........',
    '2222222222',
  ]);
  it('cuts a cell in two along a vertical line; the larger piece keeps the id', () => {
    const s = splitCell(big, 1, 3, 1, 3, 5);
    expect(s.count).toBe(3);
    expect(rows(s)).toEqual([
      '..........',
      '.33.11111.',
      '.33.11111.',
      '.33.11111.',
      '.33.11111.',
      '.33.11111.',
      '..........',
      '2222222222',
    ]);
    checkContract(s);
  });
  it('extends a short drawn line to the walls', () => {
    // Drawn only from y=2 to y=4: the cut still runs from wall to wall.
    const s = splitCell(big, 1, 5, 2, 5, 4);
    expect(s.count).toBe(3);
    const pieces = [0, 0, 0, 0];
    for (const v of s.labels) pieces[v]!++;
    // 4 columns x 5 rows left of x=5, 3 columns x 5 rows right; the right one is new (id 3).
    expect(pieces[1]).toBe(20);
    expect(pieces[3]).toBe(15);
  });
  it('a diagonal cut leaves no 8-connected leak', () => {
    const s = splitCell(big, 1, 1, 1, 6, 5);
    expect(s.count).toBe(3);
    checkContract(s);
  });
  it('rejects a zero-length line and a line that misses the cell', () => {
    expect(() => splitCell(big, 1, 3, 3, 3, 3)).toThrow(/zero length/);
    expect(() => splitCell(big, 1, 0, 0, 9, 0)).toThrow(/does not cut cell 1 in two/);
    expect(() => splitCell(big, 1, NaN, 0, 9, 0)).toThrow(EditError);
  });
});

describe('applyEdits', () => {
  it('replays a history in order; cell ids refer to the labels before each step', () => {
    const ops: EditOp[] = [{ kind: 'remove', cell: 1 }, { kind: 'merge', a: 1, b: 2 }];
    const r = applyEdits(three, ops);
    expect(r.count).toBe(2);
    expect(rows(r)).toEqual([
      '....1111111',
      '....1111111',
      '....1111111',
      '....1111111',
      '....1111111',
      '...........',
      '22222222222',
    ]);
    expect(applyEdits(three, [])).toBe(three);
  });
});
