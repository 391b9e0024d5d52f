/**
 * The summary of one analysis: the figures other tools read from summary.json. One typed, versioned
 * interface, built by one pure function from the analysis's parts; nothing patches it afterwards. Its JSON
 * Schema (docs/summary.schema.json) is generated from this interface by scripts/make-summary-schema.mjs.
 *
 * The cell figures (area, sides) are those of the cells in the statistics, the same sample as the tests
 * table and the plots: interior cells (edge = 0) at or above the minimum cell area, weighted by the edge
 * rule (stats/pattern.ts cellSample).
 */
import type { ResolvedPixelSize } from './image/calibration';
import type { PatternKind, Settings } from './settings';
import type { RandomnessResult, TestRow, Verdict } from './stats/randomness';
import type { Quality } from './stats/quality';
import type { Anisotropy } from './stats/anisotropy';
import type { ReferenceSummary } from './reference/summary';
import type { EventsDispersion } from './stats/events';
import type { Rect } from './types';
import type { MaskGeometry } from './mask/geometry';

/** The version of summary.json's layout; raised whenever a key changes meaning or is removed. */
export const SUMMARY_VERSION = 2;

/** Where the pixel size came from: the user (typed, or a scale bar), the image file, or nowhere. */
export type CalibrationSource = ResolvedPixelSize['source'];

/** Segmentation details kept with an analysis (for the Detect panel and the summary). */
export interface SegmentInfo {
  threshold: number;
  polarity: string;
  minCellAreaPx: number;
  /**
   * Walls: the size hint, the typical cell diameter (px, equivalent circle) that scaled the automatic
   * settings; `source` says whether it was set (walls.cellDiameterPx) or read from the image.
   */
  cellDiameterPx?: { value: number; source: 'setting' | 'image' };
  /** Walls: the marker dynamic (px) used to split cell interiors joined through a gap in a wall; 0 = none. */
  markerDynamicPx?: number;
}

/** A least-squares line in JSON (null where it could not be fitted). */
export interface LineFitJson {
  slope: number | null;
  intercept: number | null;
  r2: number | null;
}

/** Events per cell against Poisson counts proportional to area (interior cells), or why there is no test. */
export type EventsSummary = ({ total: number } & EventsDispersion) | { total: number; error: string };

/** One grain-size figure's interval (G units). */
export type GInterval = [number | null, number | null] | null;

/** ASTM E112 / E1382 rating in summary.json (grain/index.ts grainSizeSummary), or why there is none. */
export type GrainSizeSummary =
  | {
    G: number | null;
    method: string | null;
    ci95: GInterval;
    relativeAccuracyPct: number | null;
    iso643: number | null;
    umPerPx: number;
    fieldArea_mm2: number | null;
    planimetric: {
      G: number | null; NA_per_mm2: number | null; count: number; inside: number; cut: number; corner: number; rule: string; testShape: string;
      testArea_mm2: number | null; ci95: GInterval; relativeAccuracyPct: number | null; placements: number; iso643: number | null;
    } | null;
    intercept: {
      G: number | null; meanIntercept_um: number | null; NL_per_mm: number | null; P: number; N: number; lineLength_mm: number | null;
      anisotropy: number | null; ci95: GInterval; relativeAccuracyPct: number | null; placements: number; iso643: number | null;
    } | null;
    meanArea: {
      G: number | null; G_unweighted: number | null; grains: number; meanArea_um2: number | null; meanAreaWeighted_um2: number | null;
      gSd: number | null; duplex: boolean; iso643: number | null;
    } | null;
    warnings: string[];
    cautions: string[];
  }
  | { G: null; error: string };

/**
 * A tissue mask, the field of the statistics: its tissue pixels, area and perimeter (summary units; the
 * perimeter is the measurements' weighted marching-squares length, the field's border counting) and the
 * bounding box of the tissue (px).
 */
export interface MaskSummary {
  pixels: number;
  area: number;
  perimeter: number;
  bbox: Rect;
}

/** summary.json. Lengths and areas in µm and µm² when calibrated (umPerPx not null), else px and px². */
export interface Summary {
  /** The layout version, {@link SUMMARY_VERSION}. */
  tessellab: typeof SUMMARY_VERSION;
  width: number;
  height: number;
  pattern: PatternKind;
  /** Micrometres per pixel, or null when unknown (every figure is then in px). */
  umPerPx: number | null;
  units: { length: 'px' | 'um'; area: 'px2' | 'um2' };
  /** Where the pixel size came from; `notice` says why a pixel size the file gives is not used (e.g. 72 dpi). */
  calibration: { source: CalibrationSource; notice?: string };
  /** The analysed rectangle (px) and its area (summary units), and the tissue mask in it when one was given. */
  field: Rect & { area: number; mask?: MaskSummary };
  segmentation: SegmentInfo | null;
  /** The check before the verdict; when ok is false, randomness.verdict is null ("not rated") with the reason. */
  quality: Quality;
  cells: {
    count: number;
    /** Cells not touching the field border. */
    interior: number;
    edge: number;
    /** Cells in the statistics (interior, at or above the minimum area; see the edge rule). */
    inStatistics: number;
    /** Cells per unit area of the field, or of the tissue mask when one was given (all cells). */
    densityPerArea: number;
  };
  /** Areas of the cells in the statistics: segmented areas (walls, bodies) or Voronoi areas (points). */
  area: {
    mean: number | null;
    cv: number | null;
    /** Variance of the normalised area A/⟨A⟩. */
    variance: number | null;
    gammaShape: number | null;
    ksDistance: number | null;
    n: number;
    source: 'segmentation' | 'voronoi';
  };
  /** Side numbers of the cells in the statistics (walls: segmentation neighbours; bodies, points: Voronoi sides). */
  sides: {
    mean: number | null;
    mu2: number | null;
    p6: number | null;
    n: number;
    /** Fraction of cells with n sides, for each n present. */
    distribution: Record<string, number>;
    counts: Record<string, number>;
    source: 'segmentation' | 'voronoi';
    /** The random-seeding reference's mean p(n). */
    reference: Record<string, number | null>;
    chiSquare: RandomnessResult['sides']['chiSquare'];
    lemaitre: RandomnessResult['sides']['lemaitre'];
  };
  randomness: {
    verdict: Verdict | null;
    verdictText: string;
    alpha: number;
    basis: RandomnessResult['basis'];
    /** One row per statistic of the registry shown in the tests table (stats/registry.ts). */
    tests: TestRow[];
    reference: ReferenceSummary | null;
    warnings: string[];
  };
  clarkEvans: RandomnessResult['clarkEvans'];
  /** Orientation order and elongation of the cells, and what the spacing statistics did about them (null for points). */
  anisotropy: Anisotropy | null;
  /** Centre and radius of the largest empty circle among the centroids (summary units), or null. */
  largestGap: { x: number; y: number; radius: number; cell: number } | null;
  lewis: { fit: LineFitJson; referenceSlopeMean: number | null };
  aboavWeaire: { a: number | null; fit: LineFitJson; referenceAMean: number | null };
  voronoiLikeness: RandomnessResult['voronoiLikeness'];
  /** Present when events were given. */
  events?: EventsSummary;
  /** Present for walls patterns. */
  grainSize?: GrainSizeSummary;
}

/**
 * summary.json as written: the summary, what was analysed and by which version (when the writer knows), and
 * every setting used, so that any figure can be reproduced from the file alone.
 */
export interface SummaryFile extends Summary {
  /** The input's file name. */
  image?: string;
  /** The input's path as it was given (command line). */
  input?: string;
  /** The version of Tessellab that wrote the file. */
  version?: string;
  settings: Settings;
}

export interface SummaryInput {
  settings: Settings;
  width: number;
  height: number;
  field: Rect;
  count: number;
  edge: Uint8Array;
  segment: SegmentInfo | null;
  randomness: RandomnessResult;
  calibrationSource: CalibrationSource;
  /** Why a pixel size the file gives is not used; absent when there is nothing to say. */
  calibrationNotice?: string;
  events?: EventsSummary;
  grainSize?: GrainSizeSummary;
  /** The tissue mask, when one was given. */
  mask?: MaskGeometry;
}

/** The figures of an analysis as summary.json holds them. Pure: the same input gives the same object. */
export function buildSummary(inp: SummaryInput): Summary {
  const { settings, width, height, field, count, edge, randomness: r } = inp;
  let nInterior = 0;
  for (let i = 0; i < count; i++) if (edge[i] === 0) nInterior++;
  const u = settings.umPerPx;
  const k = u ?? 1;
  const a2 = k * k;
  const fieldArea = (field.x1 - field.x0) * (field.y1 - field.y0);
  const m = inp.mask;
  const mask: MaskSummary | undefined = m ? { pixels: m.area, area: m.area * a2, perimeter: m.perimeter * k, bbox: { ...m.bbox } } : undefined;
  const distribution: Record<string, number> = {};
  const counts: Record<string, number> = {};
  const reference: Record<string, number | null> = {};
  r.sides.n.forEach((n, i) => {
    if (r.sides.counts[i]! > 0) {
      distribution[n] = r.sides.observed[i]!;
      counts[n] = r.sides.counts[i]!;
    }
    reference[n] = r.sides.reference[i] ?? null;
  });
  const g = r.largestGap;
  return {
    tessellab: SUMMARY_VERSION,
    width,
    height,
    pattern: settings.pattern,
    umPerPx: u,
    units: { length: u === null ? 'px' : 'um', area: u === null ? 'px2' : 'um2' },
    calibration: { source: inp.calibrationSource, ...(inp.calibrationNotice ? { notice: inp.calibrationNotice } : {}) },
    field: { ...field, area: fieldArea * a2, ...(mask ? { mask } : {}) },
    segmentation: inp.segment,
    quality: r.quality,
    cells: { count, interior: nInterior, edge: count - nInterior, inStatistics: r.interiorCells, densityPerArea: count / ((m ? m.area : fieldArea) * a2) },
    area: {
      mean: r.areas.mean === null ? null : r.areas.mean * a2, cv: r.areas.cv, variance: r.areas.variance, gammaShape: r.areas.gammaShape, ksDistance: r.areas.ksDistance,
      n: r.interiorCells, source: settings.pattern === 'points' ? 'voronoi' : 'segmentation',
    },
    sides: {
      mean: r.sides.mean, mu2: r.sides.mu2, p6: r.sides.p6, n: r.interiorCells, distribution, counts,
      source: settings.pattern === 'walls' ? 'segmentation' : 'voronoi', reference, chiSquare: r.sides.chiSquare, lemaitre: r.sides.lemaitre,
    },
    randomness: { verdict: r.verdict, verdictText: r.verdictText, alpha: r.alpha, basis: r.basis, tests: r.tests, reference: r.reference, warnings: r.warnings },
    clarkEvans: r.clarkEvans,
    anisotropy: r.anisotropy,
    largestGap: g ? { x: g.x * k, y: g.y * k, radius: g.radius * k, cell: g.cell } : null,
    lewis: { fit: r.lewis.fit, referenceSlopeMean: r.lewis.reference.slopeMean },
    aboavWeaire: { a: r.aboavWeaire.a, fit: r.aboavWeaire.fit, referenceAMean: r.aboavWeaire.reference.aMean },
    voronoiLikeness: r.voronoiLikeness,
    ...(inp.events ? { events: inp.events } : {}),
    ...(inp.grainSize ? { grainSize: inp.grainSize } : {}),
  };
}

/**
 * summary.json of an input that could not be analysed: which input, which version tried, and why. A batch
 * keeps one summary.json per input, complete or failed, so that a workflow engine keeps every result and a
 * merged table has a row for every input. Its JSON Schema is docs/failed-summary.schema.json, generated
 * from this interface by scripts/make-summary-schema.mjs.
 */
export interface FailedSummary {
  /** The layout version, {@link SUMMARY_VERSION}. */
  tessellab: typeof SUMMARY_VERSION;
  /** The input's file name. */
  image: string;
  /** The input's path as it was given. */
  input: string;
  /** The version of Tessellab that tried. */
  version: string;
  error: {
    /** The error's kind (src/core/errors.ts), or 'Unexpected'. */
    kind: string;
    /** One line: what is wrong and what to do. */
    message: string;
  };
}
