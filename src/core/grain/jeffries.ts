/** The planimetric (Jeffries) count of grains in a test circle or rectangle. */
import type { LabelImage, Rect } from '../types';
import { fieldCensus, ON_BORDER, type FieldCensus } from './census';
import { checkLabelsAndField } from './check';
import { checkFigureInField, figureArea } from './figure';
import type { GrainMark, JeffriesCount, TestFigure } from './types';

export interface JeffriesOptions {
  /** Subtract one from the count of a circle (the unbiased correction). Default false. */
  unbiased?: boolean;
}

/** The grain label at the pixel holding a rectangle corner, or the nearest grain pixel inside the rectangle when that pixel is wall. */
function cornerLabel(labels: LabelImage, f: { x0: number; y0: number; x1: number; y1: number }, cx: number, cy: number): number {
  const w = labels.width;
  const at = labels.labels[cy * w + cx]!;
  if (at > 0) return at;
  let best = 0;
  let bestD = Infinity;
  const R = 8;
  for (let dy = -R; dy <= R; dy++) {
    for (let dx = -R; dx <= R; dx++) {
      const x = cx + dx;
      const y = cy + dy;
      if (x < f.x0 || x >= f.x1 || y < f.y0 || y >= f.y1) continue;
      const l = labels.labels[y * w + x]!;
      const d = dx * dx + dy * dy;
      if (l > 0 && d < bestD) {
        bestD = d;
        best = l;
      }
    }
  }
  return best;
}

/**
 * Counts grains in a planimetric test figure by the Jeffries rule.
 *
 * A pixel belongs to the figure when its centre does. A grain (label ≥ 1; label 0 is wall) with pixels in
 * the figure is *inside* when all its pixels are in the figure and none lies on the field's border (a grain
 * touching the border may continue beyond it), and *cut* otherwise. For a rectangle the grain holding each
 * corner counts ¼ per corner instead of ½.
 *
 * N = N_inside + ½·N_cut (circle; ASTM E112, the Jeffries planimetric procedure);
 * N = z + ½·w + ¼·u (rectangle, z inside, w cut by a side, u at corners; Saltykov, Stereometric Metallography);
 * N = N_inside + ½·N_cut − 1 with the unbiased correction (circle; Li & Zhou 2011, J. ASTM Int. 8(5)).
 * The corner rule already is that correction: four distinct corner grains weigh 4·¼ = 4·½ − 1, so the
 * option subtracts nothing more for a rectangle.
 *
 * @param labels label image (0 wall, 1..count grains)
 * @param field analysed rectangle (whole px, inside the image)
 * @param figure test circle or rectangle (px), inside the field
 * @param options unbiased correction
 * @returns counts, N, and one audit mark per counted grain at the centroid of its pixels in the figure
 */
export function jeffriesCount(labels: LabelImage, field: Rect, figure: TestFigure, options: JeffriesOptions = {}): JeffriesCount {
  checkLabelsAndField(labels, field);
  const f = wholePixelFigure(figure);
  checkFigureInField(f, field);
  return jeffriesCountOf(labels, fieldCensus(labels, field, [f]), f, options);
}

/** A test rectangle with its sides rounded to whole pixels; a circle as it is. */
export function wholePixelFigure(f: TestFigure): TestFigure {
  return f.shape === 'rectangle' ? { shape: 'rectangle', x0: Math.round(f.x0), y0: Math.round(f.y0), x1: Math.round(f.x1), y1: Math.round(f.y1) } : f;
}

/** Whether two test figures are the same shape at the same place and size. */
function sameFigure(a: TestFigure, b: TestFigure): boolean {
  if (a.shape === 'circle') return b.shape === 'circle' && a.cx === b.cx && a.cy === b.cy && a.r === b.r;
  return b.shape === 'rectangle' && a.x0 === b.x0 && a.y0 === b.y0 && a.x1 === b.x1 && a.y1 === b.y1;
}

/**
 * {@link jeffriesCount} from a census of the field (labels and field checked). The census's tally is used
 * when it holds this figure (made whole-pixel); otherwise the field is read again for it.
 */
export function jeffriesCountOf(labels: LabelImage, census: FieldCensus, figure: TestFigure, options: JeffriesOptions = {}): JeffriesCount {
  const f = wholePixelFigure(figure);
  checkFigureInField(f, census.field);
  let tally = census.figures.find((t) => t !== null && sameFigure(t.figure, f));
  if (!tally) {
    census = fieldCensus(labels, census.field, [f]);
    tally = census.figures[0]!;
  }
  const n = labels.count + 1;
  const inC = tally.count;
  const sx = tally.sx;
  const sy = tally.sy;
  const cornerCount = new Int32Array(n);
  if (f.shape === 'rectangle') {
    const pts: [number, number][] = [
      [f.x0, f.y0],
      [f.x1 - 1, f.y0],
      [f.x0, f.y1 - 1],
      [f.x1 - 1, f.y1 - 1],
    ];
    for (const [cx, cy] of pts) {
      const l = cornerLabel(labels, f, cx, cy);
      if (l > 0 && inC[l]! > 0) cornerCount[l]!++;
    }
  }
  let inside = 0;
  let cut = 0;
  let corner = 0;
  let sum = 0;
  const marks: GrainMark[] = [];
  for (let l = 1; l < n; l++) {
    const c = inC[l]!;
    if (c === 0) continue;
    let weight: number;
    if (cornerCount[l]! > 0) {
      corner++;
      weight = 0.25 * cornerCount[l]!;
    } else if ((census.flags[l]! & ON_BORDER) !== 0 || census.inField[l]! > c) {
      // On the field's border, or with pixels in the field outside the figure.
      cut++;
      weight = 0.5;
    } else {
      inside++;
      weight = 1;
    }
    sum += weight;
    marks.push({ label: l, weight, x: sx[l]! / c, y: sy[l]! / c });
  }
  const unbiased = options.unbiased === true;
  let count = sum;
  let rule: string;
  if (f.shape === 'circle') {
    if (unbiased) {
      count = sum - 1;
      rule = 'N = N_inside + ½·N_cut − 1 (test circle, Jeffries count with the unbiased correction)';
    } else rule = 'N = N_inside + ½·N_cut (test circle, Jeffries count)';
  } else {
    rule = 'N = N_inside + ½·N_cut + ¼·N_corner (test rectangle, corner grains a quarter; this already carries the unbiased −1 correction)';
  }
  return { figure: f, areaPx2: figureArea(f), inside, cut, corner, unbiased, count, rule, marks };
}
