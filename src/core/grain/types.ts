/** Result types of the grain size rating. Everything here is plain JSON (no typed arrays, no NaN). */
import type { Rect } from '../types';
import type { Precision } from './precision';

/** A planimetric test figure in px (pixel (x, y) covers [x, x + 1) × [y, y + 1)). */
export type TestFigure =
  | { shape: 'circle'; cx: number; cy: number; r: number }
  | { shape: 'rectangle'; x0: number; y0: number; x1: number; y1: number };

/** One counted grain of a Jeffries count, with the point where the audit mark goes (px). */
export interface GrainMark {
  label: number;
  /** 1 inside, 0.5 cut by the figure's boundary, 0.25 per rectangle corner held. */
  weight: number;
  x: number;
  y: number;
}

/** A Jeffries (planimetric) count in one test figure. */
export interface JeffriesCount {
  figure: TestFigure;
  /** Area of the figure (px²). */
  areaPx2: number;
  /** Grains wholly inside the figure. */
  inside: number;
  /** Grains cut by the figure's boundary (rectangle corners excluded). */
  cut: number;
  /** Grains holding a corner of a rectangle (0 for a circle). */
  corner: number;
  /** Whether one was subtracted (the unbiased correction). */
  unbiased: boolean;
  /** The count N = inside + cut/2 + corner/4 (− 1 when unbiased, circle). */
  count: number;
  /** The counting rule in words. */
  rule: string;
  marks: GrainMark[];
}

/** A test line or circle of the intercept method (px). */
export type TestPattern =
  | { kind: 'line'; angleDeg: number; x0: number; y0: number; x1: number; y1: number }
  | { kind: 'circle'; cx: number; cy: number; r: number };

/** One boundary intersection on a test line: 1 crossing, 1.5 through a triple point, 1 tangent hit. */
export interface Crossing {
  x: number;
  y: number;
  weight: number;
  kind: 'cross' | 'triple' | 'tangent';
}

/** The count on one test line or circle. */
export interface PatternCount {
  pattern: TestPattern;
  lengthPx: number;
  /** Intersections P (triple points 1.5, tangent hits 1). */
  P: number;
  /** Intercepts N (grain segments; for a straight line each end segment counts ½). */
  N: number;
  crossings: Crossing[];
}

/** The counts on a set of test lines and circles. */
export interface InterceptCount {
  lines: PatternCount[];
  P: number;
  N: number;
  lengthPx: number;
}

/** The planimetric (Jeffries) rating. */
export interface PlanimetricResult {
  method: string;
  count: JeffriesCount;
  NA_per_mm2: number;
  G: number;
  /** G to 0.1. */
  Greported: number;
  iso643: number;
  /** Counts in a 2 × 2 grid of smaller figures of the same shape: the field-to-field spread on one image. */
  placements: { figure: TestFigure; count: number; NA_per_mm2: number; G: number | null }[];
  /** Statistics of N_A (mm⁻²) over the placements. */
  precision: Precision;
  /** 95 % interval of G: G + log₂(1 ∓ %RA/100). */
  ci95: [number, number] | null;
}

/** One pattern placement of the intercept method: the parallel lines at one angle, or the circles. */
export interface InterceptPatternResult {
  name: string;
  angleDeg: number | null;
  P: number;
  N: number;
  lengthMm: number;
  NL_per_mm: number;
  meanIntercept_um: number | null;
  G: number | null;
  lines: PatternCount[];
}

/** The intercept (Heyn) rating. */
export interface InterceptResult {
  method: string;
  P: number;
  N: number;
  lengthMm: number;
  NL_per_mm: number;
  meanIntercept_um: number;
  G: number;
  Greported: number;
  iso643: number;
  patterns: InterceptPatternResult[];
  /** ℓ̄(0°)/ℓ̄(90°): above 1 for grains elongated along x. null without both angles. */
  anisotropy: { ratio: number; l0_um: number; l90_um: number } | null;
  /** Statistics of N_L (mm⁻¹) over the pattern placements. */
  precision: Precision;
  /** 95 % interval of G: G + 2·log₂(1 ∓ %RA/100). */
  ci95: [number, number] | null;
}

/** One bin of the per-grain G histogram. */
export interface GBin {
  /** Lower and upper edge in G units. */
  g0: number;
  g1: number;
  /** Grains in the bin. */
  count: number;
  /** Share of the measured grain area in the bin (0..1). */
  areaFraction: number;
}

/** Rating from the areas of all segmented grains wholly inside the field (ASTM E1382 style). */
export interface MeanAreaResult {
  method: string;
  /** Grains wholly inside the field (not touching its border). */
  grains: number;
  /** Share of wall pixels (label 0) in the field; grain areas are scaled by 1/(1 − share). */
  wallFraction: number;
  meanArea_um2: number;
  /** Miles–Lantuéjoul weighted mean area (µm²). */
  meanAreaWeighted_um2: number;
  /** G from the weighted mean area. */
  G: number;
  Greported: number;
  /** G from the unweighted mean area. */
  G_unweighted: number;
  iso643: number;
  /** Per-grain G: mean and standard deviation (G units). */
  gMean: number;
  gSd: number;
  histogram: GBin[];
  /** Two populations of grain size found (see duplexNote). */
  duplex: boolean;
  duplexNote: string;
}

/** Everything a grain size rating of one image produces. */
export interface GrainSizeResult {
  umPerPx: number;
  field: Rect;
  fieldAreaMm2: number;
  planimetric: PlanimetricResult | null;
  intercept: InterceptResult | null;
  meanArea: MeanAreaResult | null;
  /** The headline rating: planimetric when it could be made, else intercept, else mean area. */
  G: number | null;
  Greported: number | null;
  method: string | null;
  ci95: [number, number] | null;
  relativeAccuracyPct: number | null;
  iso643: number | null;
  warnings: string[];
  cautions: string[];
  notes: string[];
}
