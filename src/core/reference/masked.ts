/**
 * One replicate of the random-seeding reference in a tissue mask: the seeds, their cells seen through the
 * mask with the observation's rule (mask/cells.ts), and the points of the spacing statistics.
 */
import type { MaskGeometry } from '../mask/geometry';
import { hasPixel } from '../mask/geometry';
import { maskedCells, type MaskedCells } from '../mask/cells';
import type { CellTessellation, Tessellator } from '../tessellate';
import type { Rect } from '../types';

/**
 * The seed density λ (per px²) at which a mask meets `cells` cells on average. 'seeds': cells / A. 'window'
 * (a window on a larger tiling, cells kept when most of their pixels are in the mask): along the mask's own
 * border a cut cell is kept about as often as not, which leaves λA; along the field's border every cut cell
 * is kept, which adds (2/π)·B·√λ for B px of the mask's outline on the field's border, as in the kinematic
 * formula of a rectangle (see windowDensity in montecarlo.ts; derived, approximate: its constant term,
 * 1 cell, is left out).
 */
export function maskDensity(cells: number, m: MaskGeometry, layout: 'seeds' | 'window'): number {
  const A = m.area;
  if (layout === 'seeds') return cells / A;
  const b = (2 / Math.PI) * m.borderLength;
  const x = (-b + Math.sqrt(b * b + 4 * A * Math.max(0, cells))) / (2 * A);
  return x * x;
}

/**
 * Draws `seeds` seeds uniformly in the mask by rejection: uniform in the mask's bounding box, kept when the
 * pixel under them is tissue.
 */
export function seedsInMask(m: MaskGeometry, seeds: number, rng: () => number, out: Float64Array): void {
  const b = m.bbox;
  const W = b.x1 - b.x0;
  const H = b.y1 - b.y0;
  for (let i = 0; i < seeds; ) {
    const x = rng() * W + b.x0;
    const y = rng() * H + b.y0;
    if (!hasPixel(m.pixels, Math.floor(x), Math.floor(y))) continue;
    out[2 * i] = x;
    out[2 * i + 1] = y;
    i++;
  }
}

/**
 * The region a replicate's seeds are drawn in: for 'window' the mask's bounding box and a guard band of
 * `margin` px (a Voronoi cell that meets the mask has its seed there, but with negligible probability);
 * for 'seeds' the field (the seeds themselves lie in the mask).
 */
export function maskRegion(m: MaskGeometry, layout: 'seeds' | 'window', margin: number, field: Rect): Rect {
  if (layout === 'seeds') return { ...field };
  return { x0: m.bbox.x0 - margin, y0: m.bbox.y0 - margin, x1: m.bbox.x1 + margin, y1: m.bbox.y1 + margin };
}

/**
 * One replicate's cells in the mask: 'seeds' tessellates the seeds (drawn in the mask) in the field and keeps
 * every cell; 'window' tessellates the seeds of the region and keeps the cells with most of their pixels in
 * the mask. The engine's arrays are overwritten by its next run.
 */
export function maskReplicateCells(engine: Tessellator, pts: Float64Array, region: Rect, m: MaskGeometry, layout: 'seeds' | 'window'): MaskedCells {
  const t = engine.run(pts, region, 'retained') as CellTessellation;
  return maskedCells(t, (i, out) => engine.cellPolygon(i, out), m, layout === 'seeds' ? 'all' : 'majority');
}
