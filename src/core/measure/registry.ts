/**
 * The one registry of per-cell measurements. Each entry has a noun-first name, a unit kind, a formula and
 * its source, and computes one column from the per-cell sums. Column names carry their unit
 * (`area_um2` when calibrated, `area_px2` otherwise); pixel and calibrated values are never mixed.
 *
 * References:
 * [1] Hu, M.-K. (1962) Visual pattern recognition by moment invariants. IRE Trans. Inf. Theory 8:179.
 * [2] Lorensen, W. & Cline, H. (1987) Marching cubes. SIGGRAPH '87 (the 2-D case: marching squares).
 * [3] Russ, J. C. (2011) The Image Processing Handbook, 6th ed., ch. 11 (shape descriptors; trade).
 * [4] Koplowitz, J. & Bruckstein, A. M. (1989) Design of perimeter estimators for digitized planar shapes.
 *     IEEE Trans. PAMI 11:611 (pub, memory): one factor on the segment lengths, fitted over orientations.
 */
import type { PatternKind } from '../settings';
import type { CellSums } from './kernel';

export type UnitKind = 'length' | 'area' | 'angle' | 'none' | 'count' | 'flag' | 'id';

/** Everything a measurement may read, in px. Arrays are indexed by cell index (label - 1). */
export interface MeasureContext {
  count: number;
  /** µm per px, or null when uncalibrated. */
  umPerPx: number | null;
  /** Offset of the field in the image (px): centroids are reported in image coordinates. */
  offsetX: number;
  offsetY: number;
  /** Present for segmented patterns (walls, bodies); absent for points. */
  sums?: CellSums;
  /** Centroid (px, image coordinates) of each cell. */
  x: Float64Array;
  y: Float64Array;
  /** Voronoi figures of the centroids. */
  voronoiArea: Float64Array;
  voronoiSides: Int32Array;
  /** Edge flag per cell (touches the field border). */
  edge: Uint8Array;
  /** Neighbour count per cell (segmentation neighbours; Voronoi neighbours for points). */
  neighbours: Int32Array;
  /** Event count per cell, when events were given. */
  events?: Int32Array;
  /** Whether the intensity image was given. */
  hasIntensity: boolean;
}

export interface Measurement {
  /** Base name, noun first; the unit suffix is added by {@link columnName}. */
  name: string;
  unit: UnitKind;
  /** What it is, for people (README, tooltips). */
  doc: string;
  /** The formula, in plain text. */
  formula: string;
  /** Which patterns have it. */
  patterns: PatternKind[];
  /** Whether the context has what it needs (e.g. events given). */
  available?(ctx: MeasureContext): boolean;
  compute(ctx: MeasureContext): Float64Array | Int32Array;
}

const ALL: PatternKind[] = ['walls', 'bodies', 'points'];
const SEG: PatternKind[] = ['walls', 'bodies'];

function map(ctx: MeasureContext, f: (c: number) => number): Float64Array {
  const out = new Float64Array(ctx.count);
  for (let c = 0; c < ctx.count; c++) out[c] = f(c);
  return out;
}

function lengthScale(ctx: MeasureContext): number {
  return ctx.umPerPx ?? 1;
}

/** Semi-axis eigenvalues of the second-moment matrix: [λ1, λ2] with λ1 >= λ2 (px²). */
function eigen(ctx: MeasureContext, c: number): [number, number] {
  const s = ctx.sums!;
  const a = s.mu20[c]!;
  const b = s.mu02[c]!;
  const m = s.mu11[c]!;
  const t = (a + b) / 2;
  const d = Math.sqrt(((a - b) / 2) ** 2 + m * m);
  return [t + d, Math.max(0, t - d)];
}

export const MEASUREMENTS: Measurement[] = [
  {
    name: 'cell',
    unit: 'id',
    doc: 'Cell number (1-based), the value of the cell in the label image.',
    formula: 'label',
    patterns: ALL,
    compute: (ctx) => Int32Array.from({ length: ctx.count }, (_, i) => i + 1),
  },
  {
    name: 'x',
    unit: 'length',
    doc: 'Centroid x, from the left edge of the image.',
    formula: 'mean of pixel-centre x (pixel (0,0) spans [0,1))',
    patterns: ALL,
    compute: (ctx) => map(ctx, (c) => ctx.x[c]! * lengthScale(ctx)),
  },
  {
    name: 'y',
    unit: 'length',
    doc: 'Centroid y, from the top edge of the image (downwards).',
    formula: 'mean of pixel-centre y',
    patterns: ALL,
    compute: (ctx) => map(ctx, (c) => ctx.y[c]! * lengthScale(ctx)),
  },
  {
    name: 'area',
    unit: 'area',
    doc: 'Cell area: the number of pixels times the pixel area.',
    formula: 'A = N·s², s = pixel size',
    patterns: SEG,
    compute: (ctx) => map(ctx, (c) => ctx.sums!.n[c]! * lengthScale(ctx) ** 2),
  },
  {
    name: 'perimeter',
    unit: 'length',
    doc: 'Length of the cell outline: the marching-squares contour through the midpoints between inside and outside pixel centres [2], times one factor, 0.947544, that makes it unbiased on average over boundary orientations (the plain contour is up to 8 % long) [4].',
    formula: 'P = 0.947544 × the plain marching-squares length (Σ over 2x2 windows: 1 across the window, √2/2 across a corner); 0.947544 = 4√2/(π + 2√2), the least-squares factor over boundary angles 0°–45° (derived): mean 0.99946 of the true length, −5.2 % to +2.6 % at any one angle; along straight stretches 0.99946 × the four-direction Crofton perimeter',
    patterns: SEG,
    compute: (ctx) => map(ctx, (c) => ctx.sums!.perimeter[c]! * lengthScale(ctx)),
  },
  {
    name: 'eq_diameter',
    unit: 'length',
    doc: 'Diameter of the disc with the same area.',
    formula: 'd = √(4A/π)',
    patterns: SEG,
    compute: (ctx) => map(ctx, (c) => Math.sqrt((4 * ctx.sums!.n[c]!) / Math.PI) * lengthScale(ctx)),
  },
  {
    name: 'major_axis',
    unit: 'length',
    doc: 'Major axis of the ellipse with the same second moments [1].',
    formula: '4·√λ₁, λ₁ the larger eigenvalue of the central second-moment matrix (with the 1/12 pixel term)',
    patterns: SEG,
    compute: (ctx) => map(ctx, (c) => 4 * Math.sqrt(eigen(ctx, c)[0]) * lengthScale(ctx)),
  },
  {
    name: 'minor_axis',
    unit: 'length',
    doc: 'Minor axis of the ellipse with the same second moments [1].',
    formula: '4·√λ₂',
    patterns: SEG,
    compute: (ctx) => map(ctx, (c) => 4 * Math.sqrt(eigen(ctx, c)[1]) * lengthScale(ctx)),
  },
  {
    name: 'orientation',
    unit: 'angle',
    doc: 'Angle of the major axis, counter-clockwise from the +x axis as seen on screen, in (−90°, 90°].',
    formula: 'θ = −½·atan2(2μ₁₁, μ₂₀ − μ₀₂) (image y points down, hence the sign)',
    patterns: SEG,
    compute: (ctx) =>
      map(ctx, (c) => {
        const s = ctx.sums!;
        let t = (-0.5 * Math.atan2(2 * s.mu11[c]!, s.mu20[c]! - s.mu02[c]!) * 180) / Math.PI;
        if (t <= -90) t += 180;
        return Math.abs(t) < 1e-9 ? 0 : t;
      }),
  },
  {
    name: 'elongation',
    unit: 'none',
    doc: 'Ratio of major to minor axis (1 for a disc or a square).',
    formula: '√(λ₁/λ₂)',
    patterns: SEG,
    compute: (ctx) =>
      map(ctx, (c) => {
        const [a, b] = eigen(ctx, c);
        return b > 0 ? Math.sqrt(a / b) : Infinity;
      }),
  },
  {
    name: 'circularity',
    unit: 'none',
    doc: 'Isoperimetric quotient: 1 for a disc, lower for elongated or ragged cells [3].',
    formula: '4πA / P²',
    patterns: SEG,
    compute: (ctx) => map(ctx, (c) => (4 * Math.PI * ctx.sums!.n[c]!) / ctx.sums!.perimeter[c]! ** 2),
  },
  {
    name: 'solidity',
    unit: 'none',
    doc: 'Area over the area of the convex hull of the cell’s pixel squares: 1 for a convex cell [3].',
    formula: 'A / A_hull',
    patterns: SEG,
    compute: (ctx) => map(ctx, (c) => ctx.sums!.n[c]! / ctx.sums!.hullArea[c]!),
  },
  {
    name: 'neighbours',
    unit: 'count',
    doc: 'Number of cells that share a boundary with this one (segmented cells: a shared pixel edge; points: Voronoi neighbours).',
    formula: 'count of distinct labels across the cell’s pixel edges',
    patterns: ALL,
    compute: (ctx) => ctx.neighbours.slice(),
  },
  {
    name: 'voronoi_area',
    unit: 'area',
    doc: 'Area of the Voronoi cell of the centroid, clipped to the field.',
    formula: 'shoelace area of the clipped Voronoi polygon',
    patterns: ALL,
    compute: (ctx) => map(ctx, (c) => ctx.voronoiArea[c]! * lengthScale(ctx) ** 2),
  },
  {
    name: 'voronoi_sides',
    unit: 'count',
    doc: 'Number of sides of the Voronoi cell of the centroid.',
    formula: 'Voronoi neighbours (border cells: sides of the clipped polygon)',
    patterns: ALL,
    compute: (ctx) => ctx.voronoiSides.slice(),
  },
  {
    name: 'edge',
    unit: 'flag',
    doc: '1 if the cell touches the field border (kept in the table, left out of or weighted in statistics by the edge rule).',
    formula: 'segmented: a pixel on the field border; points: the Voronoi cell meets the border',
    patterns: ALL,
    compute: (ctx) => Int32Array.from(ctx.edge),
  },
  {
    name: 'intensity_mean',
    unit: 'none',
    doc: 'Mean grey value of the cell’s pixels in the original image (its own bit depth).',
    formula: 'Σ I / N',
    patterns: SEG,
    available: (ctx) => ctx.hasIntensity,
    compute: (ctx) => map(ctx, (c) => ctx.sums!.intensitySum[c]! / ctx.sums!.n[c]!),
  },
  {
    name: 'events',
    unit: 'count',
    doc: 'Number of events assigned to the cell.',
    formula: 'events inside the cell (or nearest centroid outside cells)',
    patterns: ALL,
    available: (ctx) => !!ctx.events,
    compute: (ctx) => ctx.events!.slice(),
  },
];

/** The column name of a measurement, with its unit: `area_um2`, `x_px`, `orientation_deg`, `circularity`. */
export function columnName(m: Measurement, calibrated: boolean): string {
  const u = calibrated ? 'um' : 'px';
  switch (m.unit) {
    case 'length':
      return `${m.name}_${u}`;
    case 'area':
      return `${m.name}_${u}2`;
    case 'angle':
      return `${m.name}_deg`;
    default:
      return m.name;
  }
}

/** All applicable measurements computed as columns, in registry order. */
export function measureColumns(ctx: MeasureContext, pattern: PatternKind): Record<string, Float64Array | Int32Array> {
  const out: Record<string, Float64Array | Int32Array> = {};
  const calibrated = ctx.umPerPx !== null;
  for (const m of MEASUREMENTS) {
    if (!m.patterns.includes(pattern)) continue;
    if (m.available && !m.available(ctx)) continue;
    out[columnName(m, calibrated)] = m.compute(ctx);
  }
  return out;
}
