/** Test figures of the planimetric method: placement in the field, area, containment. */
import { SettingsError } from '../errors';
import type { Rect } from '../types';
import type { TestFigure } from './types';

/**
 * The test figure centred in a rectangle: a circle of radius fraction·min(w, h)/2, or a rectangle of
 * fraction·w × fraction·h (rounded to whole pixels). fraction = 1 gives the largest that fits.
 *
 * @param rect the rectangle to fit (px)
 * @param shape circle or rectangle
 * @param fraction size as a fraction of the largest that fits, (0, 1]
 */
export function centredFigure(rect: Rect, shape: 'circle' | 'rectangle', fraction: number): TestFigure {
  const w = rect.x1 - rect.x0;
  const h = rect.y1 - rect.y0;
  const cx = (rect.x0 + rect.x1) / 2;
  const cy = (rect.y0 + rect.y1) / 2;
  if (shape === 'circle') return { shape, cx, cy, r: (fraction * Math.min(w, h)) / 2 };
  const fw = Math.max(1, Math.round(fraction * w));
  const fh = Math.max(1, Math.round(fraction * h));
  const x0 = rect.x0 + Math.floor((w - fw) / 2);
  const y0 = rect.y0 + Math.floor((h - fh) / 2);
  return { shape, x0, y0, x1: x0 + fw, y1: y0 + fh };
}

/** Area of a test figure (px²): πr² or w·h. */
export function figureArea(f: TestFigure): number {
  return f.shape === 'circle' ? Math.PI * f.r * f.r : (f.x1 - f.x0) * (f.y1 - f.y0);
}

/** Whether the point (x, y) (px) lies inside the figure (boundary included). */
export function figureContains(f: TestFigure, x: number, y: number): boolean {
  if (f.shape === 'circle') {
    const dx = x - f.cx;
    const dy = y - f.cy;
    return dx * dx + dy * dy <= f.r * f.r;
  }
  return x >= f.x0 && x <= f.x1 && y >= f.y0 && y <= f.y1;
}

/** Throws SettingsError unless the figure has a positive size and lies within the field. */
export function checkFigureInField(f: TestFigure, field: Rect): void {
  const eps = 1e-9;
  if (f.shape === 'circle') {
    if (!(f.r > 0) || ![f.cx, f.cy, f.r].every(Number.isFinite)) {
      throw new SettingsError(`The test circle needs a positive radius; got r = ${f.r} px.`);
    }
    if (f.cx - f.r < field.x0 - eps || f.cx + f.r > field.x1 + eps || f.cy - f.r < field.y0 - eps || f.cy + f.r > field.y1 + eps) {
      throw new SettingsError(
        `The test circle (radius ${f.r.toFixed(1)} px at ${f.cx.toFixed(1)}, ${f.cy.toFixed(1)}) is larger than the field or reaches outside it; make it smaller (grain.testSizeFraction) or move it inside the field.`,
      );
    }
    return;
  }
  if (!(f.x1 > f.x0 && f.y1 > f.y0) || ![f.x0, f.y0, f.x1, f.y1].every(Number.isFinite)) {
    throw new SettingsError('The test rectangle needs x1 > x0 and y1 > y0 (px).');
  }
  if (f.x0 < field.x0 - eps || f.x1 > field.x1 + eps || f.y0 < field.y0 - eps || f.y1 > field.y1 + eps) {
    throw new SettingsError(
      `The test rectangle (${f.x1 - f.x0} x ${f.y1 - f.y0} px) is larger than the field or reaches outside it; make it smaller (grain.testSizeFraction) or move it inside the field.`,
    );
  }
}

/** The field split into a 2 × 2 grid of equal rectangles (px), for test placements. */
export function quadrants(field: Rect): Rect[] {
  const mx = Math.floor((field.x0 + field.x1) / 2);
  const my = Math.floor((field.y0 + field.y1) / 2);
  return [
    { x0: field.x0, y0: field.y0, x1: mx, y1: my },
    { x0: mx, y0: field.y0, x1: field.x1, y1: my },
    { x0: field.x0, y0: my, x1: mx, y1: field.y1 },
    { x0: mx, y0: my, x1: field.x1, y1: field.y1 },
  ];
}
