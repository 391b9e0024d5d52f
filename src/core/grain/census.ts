/**
 * One pass over a label image for the planimetric and mean-area counts of a field: per grain, its pixels
 * in the field, whether it reaches the field's border or beyond, its pixels and bounding box off the border,
 * and its pixels in each planimetric test figure with the sums of their centres.
 */
import { rowRuns } from '../labelRuns';
import type { LabelImage, Rect } from '../types';
import { figureContains } from './figure';
import type { TestFigure } from './types';

/** Bit of {@link FieldCensus.flags}: a pixel of the grain lies on the field's border. */
export const ON_BORDER = 1;
/** Bit of {@link FieldCensus.flags}: a pixel of the grain lies outside the field. */
export const OUTSIDE = 2;

/** The pixels of each grain whose centres lie in one test figure. */
export interface FigureTally {
  figure: TestFigure;
  /** Pixels of the grain in the figure (and in the field). */
  count: Int32Array;
  /** Sums of their centres' x and y (px). Every term is a multiple of ½ and the sums stay far below 2⁵², so they are exact whatever the order of addition. */
  sx: Float64Array;
  sy: Float64Array;
}

/** Per grain label (index 1..count), what the counts need to know about one field. */
export interface FieldCensus {
  field: Rect;
  /** Pixels of the grain in the field, its border included. */
  inField: Int32Array;
  /** {@link ON_BORDER} and {@link OUTSIDE} bits. */
  flags: Uint8Array;
  /** Pixels of the grain in the field off its border, and their bounding box (inclusive pixel columns and rows). */
  interior: Int32Array;
  bx0: Int32Array;
  by0: Int32Array;
  bx1: Int32Array;
  by1: Int32Array;
  /** Wall pixels (label ≤ 0) in the field. */
  walls: number;
  /** One tally per figure asked for, in the same order (null where the figure was null). */
  figures: (FigureTally | null)[];
}

/**
 * The first and one past the last pixel column of row `y` whose centres lie in the figure, clipped to the
 * columns [fx0, fx1); empty when a ≥ b. The pixel centres of a row that lie in a circle or rectangle are one
 * stretch, so its ends, found by {@link figureContains} itself from an estimate, bound it exactly.
 */
function figureRow(f: TestFigure, y: number, fx0: number, fx1: number): [number, number] {
  const py = y + 0.5;
  const inside = (x: number): boolean => figureContains(f, x + 0.5, py);
  let a: number;
  let b: number;
  if (f.shape === 'circle') {
    // When any column of the row is in the circle, the one nearest the centre is.
    const m = Math.floor(f.cx - 0.5);
    let c = NaN;
    for (let x = m - 1; x <= m + 2; x++) {
      if (inside(x)) {
        c = x;
        break;
      }
    }
    if (Number.isNaN(c)) return [0, 0];
    const dy = py - f.cy;
    const h = Math.sqrt(Math.max(0, f.r * f.r - dy * dy));
    a = Math.min(c, Math.ceil(f.cx - 0.5 - h));
    b = Math.max(c, Math.floor(f.cx - 0.5 + h));
    while (!inside(a)) a++;
    while (inside(a - 1)) a--;
    while (!inside(b)) b--;
    while (inside(b + 1)) b++;
  } else {
    if (!(py >= f.y0 && py <= f.y1)) return [0, 0];
    a = Math.ceil(f.x0 - 0.5);
    b = Math.floor(f.x1 - 0.5);
    while (a + 0.5 < f.x0) a++;
    while (a - 0.5 >= f.x0) a--;
    while (b + 0.5 > f.x1) b--;
    while (b + 1.5 <= f.x1) b++;
    if (a > b) return [0, 0];
  }
  return [Math.max(a, fx0), Math.min(b + 1, fx1)];
}

/** Adds row y of the field, given as its runs, to the census. @returns its wall pixels */
function countRow(c: FieldCensus, y: number, starts: Int32Array, labs: Int32Array, nr: number): number {
  const { inField, flags, interior, bx0, by0, bx1, by1 } = c;
  const { x0: fx0, y0: fy0, x1: fx1, y1: fy1 } = c.field;
  const borderRow = y === fy0 || y === fy1 - 1;
  let walls = 0;
  for (let k = 0; k < nr; k++) {
    const s = starts[k]!;
    const e = starts[k + 1]!;
    const l = labs[k]!;
    const a = s > fx0 ? s : fx0;
    const b = e < fx1 ? e : fx1;
    if (l <= 0) {
      if (a < b) walls += b - a;
      continue;
    }
    if (s < fx0 || e > fx1) flags[l]! |= OUTSIDE;
    if (a >= b) continue;
    inField[l]! += b - a;
    if (borderRow || a === fx0 || b === fx1) flags[l]! |= ON_BORDER;
    if (borderRow) continue;
    const ia = a > fx0 ? a : fx0 + 1;
    const ib = b < fx1 - 1 ? b : fx1 - 1;
    if (ia >= ib) continue;
    interior[l]! += ib - ia;
    if (ia < bx0[l]!) bx0[l] = ia;
    if (ib - 1 > bx1[l]!) bx1[l] = ib - 1;
    if (y < by0[l]!) by0[l] = y;
    if (y > by1[l]!) by1[l] = y;
  }
  return walls;
}

/** Adds the columns [xa, xb) of row y, given as its runs, to a figure's tally. */
function tallyRow(tally: FigureTally, y: number, xa: number, xb: number, starts: Int32Array, labs: Int32Array, nr: number): void {
  // The first run that ends after xa.
  let lo = 0;
  let hi = nr - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (starts[mid + 1]! > xa) hi = mid;
    else lo = mid + 1;
  }
  const { count, sx, sy } = tally;
  const cy = y + 0.5;
  for (let k = lo; k < nr && starts[k]! < xb; k++) {
    const l = labs[k]!;
    if (l <= 0) continue;
    const a = starts[k]! > xa ? starts[k]! : xa;
    const b = starts[k + 1]! < xb ? starts[k + 1]! : xb;
    const len = b - a;
    count[l]! += len;
    // Σ (x + ½) over the columns a..b−1.
    sx[l]! += (len * (a + b)) / 2;
    sy[l]! += len * cy;
  }
}

/**
 * Reads the label image once, row by row: each row is split into runs (stretches of one label), and all
 * the counting is done per run. The caller has checked the labels and the field (checkLabelsAndField) and
 * each figure (checkFigureInField; rectangles in whole pixels).
 *
 * @param labels label image (0 wall, 1..count grains)
 * @param field analysed rectangle (whole px, inside the image)
 * @param figures planimetric test figures to tally (null entries are skipped)
 */
export function fieldCensus(labels: LabelImage, field: Rect, figures: readonly (TestFigure | null)[] = []): FieldCensus {
  const n = labels.count + 1;
  const tallies = figures.map((f): FigureTally | null => (f ? { figure: f, count: new Int32Array(n), sx: new Float64Array(n), sy: new Float64Array(n) } : null));
  const c: FieldCensus = {
    field,
    inField: new Int32Array(n),
    flags: new Uint8Array(n),
    interior: new Int32Array(n),
    bx0: new Int32Array(n).fill(2 ** 30),
    by0: new Int32Array(n).fill(2 ** 30),
    bx1: new Int32Array(n).fill(-1),
    by1: new Int32Array(n).fill(-1),
    walls: 0,
    figures: tallies,
  };
  const { flags } = c;
  const { x0: fx0, y0: fy0, x1: fx1, y1: fy1 } = field;
  const w = labels.width;
  const L = labels.labels;
  let walls = 0;
  // Rows each figure can reach (a margin beyond its extent; figureRow decides each row exactly).
  const rowsOf = tallies.map((t): [number, number] => {
    if (!t) return [0, 0];
    const f = t.figure;
    const lo = Math.floor(f.shape === 'circle' ? f.cy - f.r : f.y0) - 2;
    const hi = Math.ceil(f.shape === 'circle' ? f.cy + f.r : f.y1) + 2;
    return [Math.max(fy0, lo), Math.min(fy1, hi)];
  });
  // Runs of the current row: run k covers columns [starts[k], starts[k + 1]) and holds label labs[k].
  const starts = new Int32Array(w + 1);
  const labs = new Int32Array(w);

  for (let y = 0; y < labels.height; y++) {
    const row = y * w;
    const nr = rowRuns(L, row, w, starts, labs);
    if (y < fy0 || y >= fy1) {
      for (let k = 0; k < nr; k++) if (labs[k]! > 0) flags[labs[k]!]! |= OUTSIDE;
      continue;
    }
    walls += countRow(c, y, starts, labs, nr);
    for (let t = 0; t < tallies.length; t++) {
      const tally = tallies[t];
      if (!tally || y < rowsOf[t]![0] || y >= rowsOf[t]![1]) continue;
      const [xa, xb] = figureRow(tally.figure, y, fx0, fx1);
      if (xa < xb) tallyRow(tally, y, xa, xb, starts, labs, nr);
    }
  }
  c.walls = walls;
  return c;
}
