/**
 * Anisotropy of a cell pattern: how far the cells' major axes share one direction, how elongated the mean
 * cell is, and the area-preserving stretch that makes the mean cell isotropic. Spacing statistics
 * (Clark–Evans, the L-function) assume an isotropic pattern: long aligned cells sit close across their short
 * axis, which reads as clustering. When the cells are aligned and elongated, those statistics are computed in
 * the stretched frame instead, and the reference is drawn in the stretched field.
 */
import type { Rect } from '../types';

/** Below this mean-cell aspect ratio the cells count as isotropic enough (trade). */
export const MIN_ASPECT_FOR_STRETCH = 1.2;
/** The principal direction must lie within this many degrees of an image axis for the stretch to keep the field a rectangle. */
export const AXIS_TOLERANCE_DEG = 10;

export interface Anisotropy {
  /** Cells measured (interior cells with an ellipse). */
  cells: number;
  /** Nematic order of the major axes, |⟨e^{2iψ}⟩|: 0 for random directions, 1 for all parallel. */
  orientationOrder: number | null;
  /** Rayleigh test of uniform axial directions, P ≈ exp(−n·S²) (a reference: isotropic cells give p uniform). */
  pValue: number | null;
  /** Direction of the mean cell's major axis, counter-clockwise from +x as seen on screen, in (−90°, 90°]. */
  directionDeg: number | null;
  /** Aspect ratio of the mean cell shape (1 for isotropic cells). */
  meanAspect: number | null;
  /** Mean of the cells' own aspect ratios, major / minor axis. */
  meanElongation: number | null;
  /**
   * What the spacing statistics did: 'none' (isotropic enough), 'stretched' (computed in the frame where the
   * mean cell is round), or 'left out' (aligned away from the image axes: left out of the verdict).
   */
  spacing: 'none' | 'stretched' | 'left out';
  /** The stretch applied to x and y (px → px, area-preserving), when spacing is 'stretched'. */
  stretch: { sx: number; sy: number } | null;
}

/**
 * Anisotropy of the cells from their equal-moment ellipses. Each cell's shape tensor, normalised to
 * determinant 1, is S = r·uuᵀ + (1/r)·vvᵀ, with r = major/minor and u, v its axes; the mean cell is the mean
 * of S, whose eigenvalues λ₁ ≥ λ₂ give the mean aspect √(λ₁/λ₂) (the normalised shape tensor; Aubouy et al.
 * 2003, Granular Matter 5:67, pub, memory). The orientation order is the mean resultant length of the doubled
 * angles, tested by Rayleigh's test for axial data (Mardia & Jupp 2000, Directional Statistics; pub, memory).
 * The stretch scales the major direction by (λ₂/λ₁)^¼ and the minor by (λ₁/λ₂)^¼, which makes the mean
 * cell round and keeps areas.
 *
 * @param major per-cell major axis (any length unit), minor the minor axis, orientationDeg the registry's
 *   orientation (counter-clockwise on screen), keep which cells to use
 * @param alpha significance level of the Rayleigh test
 */
export function anisotropy(major: ArrayLike<number>, minor: ArrayLike<number>, orientationDeg: ArrayLike<number>, keep: (i: number) => boolean, alpha: number): Anisotropy {
  let n = 0;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  let c2 = 0;
  let s2 = 0;
  let elong = 0;
  for (let i = 0; i < major.length; i++) {
    const a = major[i]!;
    const b = minor[i]!;
    if (!keep(i) || !(a > 0) || !(b > 0)) continue;
    // Screen angle counter-clockwise with y up; in image coordinates (y down) the axis is (cos θ, −sin θ).
    const t = (orientationDeg[i]! * Math.PI) / 180;
    const ux = Math.cos(t);
    const uy = -Math.sin(t);
    const r = a / b;
    // S = r·uuᵀ + (1/r)·vvᵀ with v = (−uy, ux).
    sxx += r * ux * ux + (uy * uy) / r;
    syy += r * uy * uy + (ux * ux) / r;
    sxy += r * ux * uy - (ux * uy) / r;
    c2 += Math.cos(2 * t);
    s2 += Math.sin(2 * t);
    elong += r;
    n++;
  }
  const none: Anisotropy = { cells: n, orientationOrder: null, pValue: null, directionDeg: null, meanAspect: null, meanElongation: null, spacing: 'none', stretch: null };
  if (n < 3) return none;
  sxx /= n;
  syy /= n;
  sxy /= n;
  const tr = sxx + syy;
  const disc = Math.sqrt(Math.max(0, ((sxx - syy) / 2) ** 2 + sxy * sxy));
  const l1 = tr / 2 + disc;
  const l2 = tr / 2 - disc;
  // Principal direction in image coordinates, then as a screen angle (y up) in (−90°, 90°].
  const phiImage = 0.5 * Math.atan2(2 * sxy, sxx - syy);
  let directionDeg = (-phiImage * 180) / Math.PI;
  if (directionDeg <= -90) directionDeg += 180;
  const order = Math.hypot(c2, s2) / n;
  const pValue = Math.exp(-n * order * order);
  const meanAspect = Math.sqrt(l1 / l2);
  const out: Anisotropy = { cells: n, orientationOrder: order, pValue, directionDeg, meanAspect, meanElongation: elong / n, spacing: 'none', stretch: null };
  if (!(pValue < alpha) || !(meanAspect >= MIN_ASPECT_FOR_STRETCH)) return out;
  const along = Math.abs(directionDeg) <= AXIS_TOLERANCE_DEG ? 'x' : Math.abs(directionDeg) >= 90 - AXIS_TOLERANCE_DEG ? 'y' : null;
  if (!along) return { ...out, spacing: 'left out' };
  const shrink = (l2 / l1) ** 0.25;
  const grow = 1 / shrink;
  return { ...out, spacing: 'stretched', stretch: along === 'x' ? { sx: shrink, sy: grow } : { sx: grow, sy: shrink } };
}

/** The field scaled by a stretch (the field itself without one). */
export function stretchedField(f: Rect, s: { sx: number; sy: number } | null): Rect {
  return s ? { x0: f.x0 * s.sx, y0: f.y0 * s.sy, x1: f.x1 * s.sx, y1: f.y1 * s.sy } : f;
}

/** Points (interleaved x, y) scaled by a stretch. */
export function stretchPoints(points: Float64Array, s: { sx: number; sy: number }): Float64Array {
  const out = new Float64Array(points.length);
  for (let i = 0; i < points.length; i += 2) {
    out[i] = points[i]! * s.sx;
    out[i + 1] = points[i + 1]! * s.sy;
  }
  return out;
}
