/**
 * Pure edits of a label image: merge two cells, split one along a drawn line, remove one.
 * Each returns a new LabelImage whose labels are renumbered 1..count in their old order (new pieces of a
 * split are appended at the end), so it satisfies the LabelImage contract and can be re-measured at once.
 */
import { EditError } from '../errors';
import type { LabelImage } from '../types';

/** One edit, as recorded in a session's edit history (cell ids refer to the labels before the edit). */
export type EditOp =
  | { kind: 'merge'; a: number; b: number }
  | { kind: 'split'; cell: number; x0: number; y0: number; x1: number; y1: number }
  | { kind: 'remove'; cell: number };

/** Wall pixels within this distance (px, Chebyshev) of both merged cells, and nearer to both than to any other cell, join them. */
const MERGE_WALL_RADIUS = 3;

function checkCell(labels: LabelImage, cell: number, what: string): void {
  if (!Number.isInteger(cell) || cell < 1 || cell > labels.count) {
    throw new EditError(`${what} ${String(cell)} is not a cell of this image (cells are 1 to ${labels.count}); pick a cell on the Bench.`);
  }
}

/**
 * Renumbers `lab` in place so that the labels present become 1..k in increasing order of their old value.
 * Returns k. `maxLabel` bounds the old labels.
 */
function compact(lab: Int32Array, maxLabel: number): number {
  const present = new Uint8Array(maxLabel + 1);
  for (let i = 0; i < lab.length; i++) present[lab[i]!] = 1;
  const map = new Int32Array(maxLabel + 1);
  let k = 0;
  for (let v = 1; v <= maxLabel; v++) if (present[v]) map[v] = ++k;
  for (let i = 0; i < lab.length; i++) lab[i] = map[lab[i]!]!;
  return k;
}

/**
 * Removes `cell`: its pixels become 0 (wall / background) and the cells above it move down by one.
 *
 * @param labels label image (0 = wall / background, 1..count cells)
 * @param cell the cell id to remove, 1..count
 */
export function removeCell(labels: LabelImage, cell: number): LabelImage {
  checkCell(labels, cell, 'Cell');
  const out = new Int32Array(labels.labels);
  for (let i = 0; i < out.length; i++) {
    const v = out[i]!;
    if (v === cell) out[i] = 0;
    else if (v > cell) out[i] = v - 1;
  }
  return { width: labels.width, height: labels.height, labels: out, count: labels.count - 1 };
}

/**
 * Merges cell `b` into cell `a`. The wall pixels that lie between them (within {@link MERGE_WALL_RADIUS} px
 * of both, and nearer to both than to any third cell; Chebyshev distance) join the merged cell, so that the wall that separated them disappears
 * while walls shared with neighbours stay. The merged cell takes the lower of the two ids.
 *
 * @param labels label image
 * @param a first cell id, 1..count
 * @param b second cell id, 1..count, different from `a`
 */
export function mergeCells(labels: LabelImage, a: number, b: number): LabelImage {
  checkCell(labels, a, 'Cell');
  checkCell(labels, b, 'Cell');
  if (a === b) throw new EditError(`Cannot merge cell ${a} with itself; select two different cells.`);
  const keep = Math.min(a, b);
  const drop = Math.max(a, b);
  const { width: w, height: h } = labels;
  const src = labels.labels;
  const out = new Int32Array(src);
  const r = MERGE_WALL_RADIUS;
  // Only wall pixels near both cells can join, so the search stays inside their bounding box.
  let bx0 = w, by0 = h, bx1 = -1, by1 = -1;
  for (let i = 0; i < src.length; i++) {
    const v = src[i];
    if (v !== a && v !== b) continue;
    if (v === drop) out[i] = keep;
    const x = i % w, y = (i - x) / w;
    if (x < bx0) bx0 = x;
    if (x > bx1) bx1 = x;
    if (y < by0) by0 = y;
    if (y > by1) by1 = y;
  }
  for (let y = Math.max(0, by0 - r); y <= Math.min(h - 1, by1 + r); y++) {
    for (let x = Math.max(0, bx0 - r); x <= Math.min(w - 1, bx1 + r); x++) {
      const i = y * w + x;
      if (src[i] !== 0) continue;
      // Chebyshev distance to the nearest pixel of a, of b, and of any other cell.
      let dA = r + 1, dB = r + 1, dO = r + 1;
      const ya = Math.max(0, y - r), yb = Math.min(h - 1, y + r);
      const xa = Math.max(0, x - r), xb = Math.min(w - 1, x + r);
      for (let yy = ya; yy <= yb; yy++) {
        const row = yy * w;
        const ddy = Math.abs(yy - y);
        for (let xx = xa; xx <= xb; xx++) {
          const u = src[row + xx];
          if (u === 0) continue;
          const d = Math.max(ddy, Math.abs(xx - x));
          if (u === a) { if (d < dA) dA = d; } else if (u === b) { if (d < dB) dB = d; } else if (d < dO) dO = d;
        }
      }
      if (dA <= r && dB <= r && Math.max(dA, dB) < dO) out[i] = keep;
    }
  }
  for (let i = 0; i < out.length; i++) if (out[i]! > drop) out[i]! -= 1;
  return { width: w, height: h, labels: out, count: labels.count - 1 };
}

/**
 * Visits the pixels of a 4-connected digital line from (x0, y0) to (x1, y1) (pixel centres at integer
 * coordinates), so that a cut along it leaves no diagonal gap for 8-connected regions to leak through.
 */
function line4(x0: number, y0: number, x1: number, y1: number, visit: (x: number, y: number) => boolean): void {
  let x = Math.round(x0), y = Math.round(y0);
  const dx = Math.abs(Math.round(x1) - x), dy = Math.abs(Math.round(y1) - y);
  const sx = Math.round(x1) > x ? 1 : -1, sy = Math.round(y1) > y ? 1 : -1;
  if (!visit(x, y)) return;
  for (let ix = 0, iy = 0; ix < dx || iy < dy; ) {
    // Step along the axis whose next pixel boundary the exact line crosses first.
    if ((0.5 + ix) / dx < (0.5 + iy) / dy) { x += sx; ix++; } else { y += sy; iy++; }
    if (!visit(x, y)) return;
  }
}

/**
 * Splits `cell` along the straight line through (x0, y0) and (x1, y1) (px). The drawn segment is extended
 * at both ends for as long as it stays inside the cell, so a line drawn roughly across the cell cuts it
 * from wall to wall. The cut pixels become wall (0). The largest piece keeps the id `cell`; the others
 * are appended as new cells count+1, count+2, ... Pieces are 8-connected regions.
 *
 * @param labels label image
 * @param cell the cell to split, 1..count
 * @param x0 start of the drawn line, px (image coordinates)
 * @param y0 start, px
 * @param x1 end, px
 * @param y1 end, px
 * @throws EditError if the line has zero length or does not cut the cell in two
 */
export function splitCell(labels: LabelImage, cell: number, x0: number, y0: number, x1: number, y1: number): LabelImage {
  checkCell(labels, cell, 'Cell');
  if (![x0, y0, x1, y1].every(Number.isFinite)) throw new EditError('The split line has a coordinate that is not a number; draw it again.');
  const len = Math.hypot(x1 - x0, y1 - y0);
  if (len < 1) throw new EditError('The split line has zero length; drag across the cell to draw it.');
  const { width: w, height: h } = labels;
  const out = new Int32Array(labels.labels);
  const inCell = (x: number, y: number): boolean => x >= 0 && y >= 0 && x < w && y < h && out[y * w + x] === cell;
  const cut = (x: number, y: number): boolean => {
    if (x >= 0 && y >= 0 && x < w && y < h && out[y * w + x] === cell) out[y * w + x] = 0;
    return true;
  };
  line4(x0, y0, x1, y1, cut);
  // Extend past each end for as long as the ray runs through the cell; stop at the first other pixel.
  const ux = (x1 - x0) / len, uy = (y1 - y0) / len;
  const reach = w + h;
  const extend = (sx: number, sy: number, dirx: number, diry: number): void => {
    let first = true;
    line4(sx, sy, sx + dirx * reach, sy + diry * reach, (x, y) => {
      if (first) { first = false; return true; }
      if (!inCell(x, y)) return false;
      out[y * w + x] = 0;
      return true;
    });
  };
  extend(x1, y1, ux, uy);
  extend(x0, y0, -ux, -uy);

  // Label the 8-connected pieces of what is left of the cell.
  const piece = new Int32Array(w * h);
  const sizes: number[] = [0];
  const stack: number[] = [];
  for (let i = 0; i < out.length; i++) {
    if (out[i] !== cell || piece[i] !== 0) continue;
    const id = sizes.length;
    sizes.push(0);
    piece[i] = id;
    stack.push(i);
    while (stack.length) {
      const j = stack.pop() as number;
      sizes[id]!++;
      const jx = j % w, jy = (j - jx) / w;
      for (let dy = -1; dy <= 1; dy++) {
        const yy = jy + dy;
        if (yy < 0 || yy >= h) continue;
        for (let dx = -1; dx <= 1; dx++) {
          const xx = jx + dx;
          if (xx < 0 || xx >= w || (dx === 0 && dy === 0)) continue;
          const k = yy * w + xx;
          if (out[k] === cell && piece[k] === 0) {
            piece[k] = id;
            stack.push(k);
          }
        }
      }
    }
  }
  const nPieces = sizes.length - 1;
  if (nPieces < 2) {
    throw new EditError(`The line does not cut cell ${cell} in two; draw it across the whole cell, from wall to wall.`);
  }
  let largest = 1;
  for (let p = 2; p <= nPieces; p++) if (sizes[p]! > sizes[largest]!) largest = p;
  const newId = new Int32Array(nPieces + 1);
  let next = labels.count;
  for (let p = 1; p <= nPieces; p++) newId[p] = p === largest ? cell : ++next;
  for (let i = 0; i < out.length; i++) if (piece[i] !== 0) out[i] = newId[piece[i]!]!;
  const count = compact(out, next);
  return { width: w, height: h, labels: out, count };
}

/** Applies one recorded edit. */
export function applyEdit(labels: LabelImage, op: EditOp): LabelImage {
  switch (op.kind) {
    case 'merge': return mergeCells(labels, op.a, op.b);
    case 'split': return splitCell(labels, op.cell, op.x0, op.y0, op.x1, op.y1);
    case 'remove': return removeCell(labels, op.cell);
  }
}

/** Applies recorded edits in order to the labels an analysis produced; `labels` itself is not changed. */
export function applyEdits(labels: LabelImage, ops: readonly EditOp[]): LabelImage {
  let cur = labels;
  for (const op of ops) cur = applyEdit(cur, op);
  return cur;
}
