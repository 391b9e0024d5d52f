/**
 * Observed versus random seeding: every statistic of the pattern beside its Monte Carlo reference, with
 * p-values, plot data, and a verdict in the project's words.
 */
import { describeError } from '../errors';
import type { Settings } from '../settings';
import type { Tessellation } from '../tessellate';
import type { LabelImage, Rect } from '../types';
import { PV_AREA_GAMMA_SHAPE, PV_SIDES_DISTRIBUTION, LEMAITRE_CONSTANT, LEMAITRE_RANGE, type PublishedValue } from '../reference/constants';
import { AREA_GRID_MAX, AREA_GRID_STEP, referenceMonteCarlo, type Reference, type ReferenceLayout, type ReferenceOptions } from '../reference/montecarlo';
import { ecdfOnGrid } from '../reference/envelope';
import { referenceSummary, type ReferenceSummary } from '../reference/summary';
import { STATISTICS, type PatternCurves, type PatternFigures, type StatisticKey } from './registry';
import { chiSquareUpper, gammaPdf, normalTwoSided } from './dist';
import { largestGap, type LargestGap } from './gap';
import { assessQuality, type Quality } from './quality';
import { stretchedField, stretchPoints, type Anisotropy } from './anisotropy';
import { voronoiLikeness, type VoronoiLikeness } from './likeness';
import { combinedMaxZ, monteCarloP } from './mctest';
import { hasPixel, type MaskGeometry } from '../mask/geometry';
import { maskCovariance } from '../mask/covariance';

export { combinedMaxZ, monteCarloP } from './mctest';
import {
  MAX_SIDES, aboavWeaireLaw, areaStats, cellSample, type CellSample, clarkEvans, ksDistance, lFunction, lRadii, lewisLaw, sideStats, type LineFit,
} from './pattern';

/** The verdicts (docs/names.md). */
export type Verdict =
  | 'more regular than random'
  | 'consistent with random seeding'
  | 'more irregular than random'
  | 'departs from random seeding in opposite directions';

/**
 * How one statistic reads against random seeding: a direction only where its own p-value is below α;
 * "departs from random seeding" for a significant statistic without a direction (a distance).
 */
export type Reading = 'more regular' | 'more irregular' | 'departs from random seeding' | 'within the random range';

/** Fewest interior cells for the side and area statistics and for the verdict. */
export const MIN_INTERIOR_CELLS = 10;

export interface RandomnessInput {
  tessellation: Tessellation;
  /** Observed per-cell side numbers (walls: from the segmentation; else the tessellation's). */
  sides: Int32Array;
  /** Observed per-cell areas (px²). */
  area: Float64Array;
  /** Observed per-cell edge flags. */
  edge: Uint8Array;
  /** Observed per-cell bounding boxes x0, y0, x1, y1 (px); default the tessellation's. Used by the 'weight' rule. */
  bbox?: Float64Array;
  /** The segmentation (walls, bodies), for Voronoi-likeness; null or absent for points patterns. */
  labels?: LabelImage | null;
  settings: Settings;
  /** A reference drawn beforehand (for the same field, cell count, edge rule); drawn here if absent. */
  reference?: Reference;
  /** Why the reference drawn beforehand could not be drawn (then none is drawn here). */
  referenceError?: string;
  /**
   * voronoiLikeness(labels, tessellation, edge), computed beforehand (while a reference is being drawn);
   * computed here when absent.
   */
  likeness?: VoronoiLikeness;
  /** Observed neighbour graph (walls: from the segmentation), CSR; default the tessellation's. */
  neighbours?: { offsets: Int32Array; index: Int32Array };
  /** Minimum cell area (px²) the observation used; default settings.minCellAreaPx when positive and the pattern is not points. */
  minCellAreaPx?: number;
  /** Per-cell solidity of a segmentation, for the quality check; null or absent for points. */
  solidity?: ArrayLike<number> | null;
  /** Notices of earlier stages for the quality block (they do not fail it). */
  notices?: string[];
  /** Anisotropy of the cells (walls): aligned elongated cells move the spacing statistics to a stretched frame. */
  anisotropy?: Anisotropy | null;
  /**
   * A tissue mask inside the field: the field of the statistics (edge flags given accordingly; densities,
   * Clark–Evans and the L-function in the mask; the reference drawn in it; edge rule 'exclude').
   */
  mask?: MaskGeometry;
}

/** The minimum cell area (px²) the observation used: the segmentation's, else settings.minCellAreaPx for images, else 0. */
function observedMinArea(settings: Settings, minCellAreaPx?: number): number {
  return minCellAreaPx ?? (settings.pattern !== 'points' && settings.minCellAreaPx > 0 ? settings.minCellAreaPx : 0);
}

/** Walls patterns are a window on a larger tissue; bodies and points are the seeds in the field. */
function referenceLayoutOf(settings: Settings): ReferenceLayout {
  return settings.pattern === 'walls' ? 'window' : 'seeds';
}

/**
 * The options of the random-seeding reference for an observation of `cells` cells in `field` (the one
 * place they are worked out, for {@link randomness} and for a reference started ahead of it), or null
 * when the settings ask for no reference (replicates 0).
 */
export function referenceOptionsFor(settings: Settings, cells: number, field: Rect, minCellAreaPx?: number, mask?: MaskGeometry): ReferenceOptions | null {
  // Fewer cells than the verdict needs: a reference could not change the answer.
  if (settings.reference.replicates < 1 || cells < MIN_INTERIOR_CELLS) return null;
  return {
    cells, field, replicates: settings.reference.replicates, seed: settings.reference.seed, edgeRule: settings.edgeRule,
    minCellAreaPx: observedMinArea(settings, minCellAreaPx), layout: referenceLayoutOf(settings), ...(mask ? { mask } : {}),
  };
}

/** One row of the tests table: one statistic of the registry (stats/registry.ts). */
export interface TestRow {
  /** The statistic's key in the registry (stats/registry.ts). */
  key: string;
  name: string;
  statistic: number | null;
  referenceMean: number | null;
  referenceSd: number | null;
  /** Monte Carlo p-value (two-sided for signed statistics, upper tail for distances). */
  pValue: number | null;
  /** The reading at α; null when there is no p-value. */
  reading: Reading | null;
  /** The infinite-plane value for random seeding with its source, where there is one (for comparison only). */
  published: PublishedValue | null;
  /** Why a statistic is missing, if it is. */
  note?: string;
}

/** Everything the Randomness panel and summary.json need; plain JSON. */
export interface RandomnessResult {
  /** The check before the verdict: when not ok, the verdict is null ("not rated") with the reason. */
  quality: Quality;
  /** Anisotropy of the cells, or null where it was not measured (points). */
  anisotropy: Anisotropy | null;
  verdict: Verdict | null;
  /** The verdict with the statistic and p-value behind it, or why there is none. */
  verdictText: string;
  alpha: number;
  basis: { test: string; combines: string[]; pValue: number | null; strongest: string | null; regular: string[]; irregular: string[] };
  tests: TestRow[];
  reference: ReferenceSummary | null;
  cells: number;
  interiorCells: number;
  sides: {
    n: number[];
    /** Fraction of the cells in the statistics with n sides (weighted by the edge rule). */
    observed: number[];
    /** Number of cells in the statistics with n sides. */
    counts: number[];
    reference: (number | null)[];
    referenceLo: (number | null)[];
    referenceHi: (number | null)[];
    published: (number | null)[];
    mean: number | null;
    mu2: number | null;
    p6: number | null;
    chiSquare: { statistic: number | null; dof: number; pAsymptotic: number | null; pValue: number | null };
    lemaitre: { value: number | null; expected: number; applies: boolean };
  };
  areas: {
    /** Mean area of the cells in the statistics (px², weighted by the edge rule). */
    mean: number | null;
    cv: number | null;
    variance: number | null;
    gammaShape: number | null;
    ksDistance: number | null;
    ecdf: { y: number[]; observed: number[]; mean: (number | null)[]; lo: (number | null)[]; hi: (number | null)[] };
    histogram: { y0: number[]; binWidth: number; observed: number[]; mean: (number | null)[]; lo: (number | null)[]; hi: (number | null)[]; published: number[] };
  };
  clarkEvans: { R: number | null; Runcorrected: number | null; se: number | null; z: number | null; pNormal: number | null; points: number; referenceMean: number | null; referenceSd: number | null; pValue: number | null };
  lFunction: { rPx: number[]; observed: (number | null)[]; mean: (number | null)[]; lo: (number | null)[]; hi: (number | null)[]; maxDeviation: number | null; pValue: number | null };
  lewis: { n: number[]; observed: number[]; count: number[]; fit: JsonFit; reference: { n: number[]; value: (number | null)[]; slopeMean: number | null; slopeSd: number | null } };
  aboavWeaire: { n: number[]; observed: number[]; count: number[]; fit: JsonFit; a: number | null; reference: { n: number[]; value: (number | null)[]; aMean: number | null; aSd: number | null } };
  largestGap: { x: number; y: number; radius: number; cell: number } | null;
  voronoiLikeness: { medianOverlap: number | null; overallOverlap: number | null; stepPx: number } | null;
  warnings: string[];
}

type JsonFit = { slope: number | null; intercept: number | null; r2: number | null };

const num = (v: number | undefined | null): number | null => (v !== undefined && v !== null && Number.isFinite(v) ? v : null);
const list = (a: ArrayLike<number>): (number | null)[] => Array.from(a, (v) => num(v));
const fitJson = (f: LineFit): JsonFit => ({ slope: num(f.slope), intercept: num(f.intercept), r2: num(f.r2) });

/** Number of the sample's cells with n sides, n = 0..MAX_SIDES (the last bin holds MAX_SIDES or more). */
function sideCounts(sides: Int32Array, s: CellSample): number[] {
  const c = new Array<number>(MAX_SIDES + 1).fill(0);
  for (let k = 0; k < s.index.length; k++) c[Math.min(MAX_SIDES, sides[s.index[k]!]!)]!++;
  return c;
}

/**
 * The reading of one statistic at level α: its direction (by the side of the reference mean it lies on)
 * only when its p-value is below α; "within the random range" otherwise; null without a p-value.
 */
export function readingOf(regular: 'low' | 'high' | null, value: number, referenceMean: number, p: number | null, alpha: number): Reading | null {
  if (p === null || !Number.isFinite(value)) return null;
  if (!(p < alpha)) return 'within the random range';
  if (regular === null || !Number.isFinite(referenceMean)) return 'departs from random seeding';
  return (value < referenceMean) === (regular === 'low') ? 'more regular' : 'more irregular';
}

const fmt = (v: number): string => (Math.abs(v) >= 100 ? v.toFixed(0) : Math.abs(v) >= 1 ? v.toFixed(3) : v.toPrecision(3));
const fmtP = (p: number): string => (p < 0.001 ? p.toExponential(1) : p.toFixed(3));

/**
 * Observed statistics of the pattern, each beside its random-seeding reference, and the verdict.
 *
 * The verdict rests on one combined Monte Carlo test (see {@link combinedMaxZ}) of three statistics that
 * each say which way a pattern departs from random seeding: the side-number variance μ₂ and the area
 * coefficient of variation (both lower for regular patterns) and the edge-corrected Clark–Evans index
 * (higher for regular patterns). If the combined p-value is below settings.reference.alpha, the direction
 * of the statistic with the largest standardised departure gives "more regular than random" or "more irregular than
 * random"; otherwise "consistent with random seeding". The other tests are reported beside it.
 *
 * Nothing computed is thrown away: statistics that cannot be computed (too few cells, no reference) are
 * null with the reason in `warnings`.
 */
export function randomness(input: RandomnessInput): RandomnessResult {
  const { tessellation: t, sides, area, edge, settings } = input;
  const warnings: string[] = [];
  const field = t.field;
  const n = area.length;
  const alpha = settings.reference.alpha;
  const minArea = observedMinArea(settings, input.minCellAreaPx);
  const layout = referenceLayoutOf(settings);
  const bbox = input.bbox ?? t.bbox;
  const graph = input.neighbours ?? { offsets: t.neighbourOffsets, index: t.neighbourIndex };

  // Spacing statistics: in the frame where the mean cell is round when the cells are aligned and elongated.
  const stretch = input.anisotropy?.spacing === 'stretched' ? input.anisotropy.stretch : null;
  const spacingField = stretchedField(field, stretch);
  const spacingPoints = stretch ? stretchPoints(t.points, stretch) : t.points;
  let ref: Reference | null = input.reference ?? null;
  if (!ref) {
    const refOpts = referenceOptionsFor(settings, n, spacingField, input.minCellAreaPx, input.mask);
    if (!refOpts && n < MIN_INTERIOR_CELLS) {
      warnings.push(`No random-seeding reference was drawn: ${n} cell${n === 1 ? '' : 's'} cannot be compared with random seeding (the comparison needs at least ${MIN_INTERIOR_CELLS}).`);
    } else if (!refOpts) {
      warnings.push('No random-seeding reference was drawn (reference.replicates is 0); only the published constants are shown. Set replicates to 199 for tests.');
    } else if (input.referenceError !== undefined) {
      warnings.push(`The random-seeding reference could not be drawn: ${input.referenceError}`);
    } else {
      try {
        ref = referenceMonteCarlo(refOpts);
      } catch (e) {
        warnings.push(`The random-seeding reference could not be drawn: ${describeError(e)}`);
      }
    }
  }
  if (ref) {
    warnings.push(...ref.warnings);
    const minP = 1 / (ref.options.replicates + 1);
    if (minP > alpha) {
      warnings.push(`With ${ref.options.replicates} replicates the smallest Monte Carlo p-value is ${fmtP(minP)}, above α = ${alpha}: no test can reach significance. Use at least ${Math.ceil(1 / alpha) - 1} replicates.`);
    }
  }

  // Observed cells in the statistics.
  const mask = input.mask ?? null;
  const sample = cellSample(area, edge, bbox, field, mask ? 'exclude' : settings.edgeRule, minArea);
  const m = sample.index.length;
  const enough = m >= MIN_INTERIOR_CELLS;
  if (!enough) {
    warnings.push(`The side, area and size–topology statistics need at least ${MIN_INTERIOR_CELLS} interior cells; this field has ${m}. Use a larger field or a higher magnification.`);
  }
  const ss = m > 0 ? sideStats(sides, sample) : null;
  const as = m > 0 ? areaStats(area, sample) : null;
  // The tessellation is that of these very points, so its neighbour graph holds every nearest neighbour
  // (not so for stretched points: there the grid search finds them).
  const shape = mask ? { area: mask.area, perimeter: mask.perimeter } : undefined;
  const ce = stretch ? clarkEvans(spacingPoints, spacingField) : clarkEvans(spacingPoints, field, { offsets: t.neighbourOffsets, index: t.neighbourIndex }, shape);
  if (spacingPoints.length / 2 < 2) warnings.push('Clark–Evans and the L-function need at least 2 points.');
  const radii = ref ? ref.lRadii : mask ? lRadii(n, mask.bbox, mask.area) : lRadii(n, spacingField);
  const L = mask ? lFunction(spacingPoints, mask.bbox, radii, maskCovariance(mask, radii[radii.length - 1]!)) : lFunction(spacingPoints, spacingField, radii);
  const an = input.anisotropy ?? null;
  if (an?.spacing === 'stretched') {
    warnings.push(`The cells are aligned (order ${an.orientationOrder!.toFixed(2)}, direction ${an.directionDeg!.toFixed(0)}°) and elongated (mean cell ${an.meanAspect!.toFixed(2)}:1): Clark–Evans and the L-function are computed with x scaled by ${stretch!.sx.toFixed(3)} and y by ${stretch!.sy.toFixed(3)}, which makes the mean cell round, against random seeding in the same stretched field.`);
  } else if (an?.spacing === 'left out' && mask) {
    warnings.push(`The cells are aligned (order ${an.orientationOrder!.toFixed(2)}) and elongated (mean cell ${an.meanAspect!.toFixed(2)}:1): Clark–Evans and the L-function assume an isotropic pattern and, in a tissue mask, are not computed in a stretched frame; they are left out of the verdict.`);
  } else if (an?.spacing === 'left out') {
    warnings.push(`The cells are aligned (order ${an.orientationOrder!.toFixed(2)}) at ${an.directionDeg!.toFixed(0)}°, away from the image axes, and elongated (mean cell ${an.meanAspect!.toFixed(2)}:1): Clark–Evans and the L-function assume an isotropic pattern and are left out of the verdict. Rotate the image so that the cells lie along an axis to include them.`);
  }
  const lewis = m > 0 && as ? lewisLaw(sides, area, sample, as.mean) : null;
  const aw = m > 0 ? aboavWeaireLaw(sides, edge, graph.offsets, graph.index, sample) : null;
  if (enough && lewis && !Number.isFinite(lewis.fit.slope)) warnings.push(`Lewis's law needs at least 2 side classes with ${3} or more cells.`);

  const figures: PatternFigures = {
    sample, sides: enough ? ss : null, areas: enough ? as : null, clarkEvans: ce, lewis: enough ? lewis : null, aboav: enough ? aw : null, meanPerimeterScaled: Number.NaN,
  };
  const curves: PatternCurves = { sidesP: ss ? ss.p : [], cells: m, areas: enough ? as : null, l: L };
  const obs = {} as Record<StatisticKey, number>;
  for (const st of STATISTICS) {
    if (st.pass === 1) obs[st.key] = st.compute(figures);
    else obs[st.key] = ref && (enough || !st.needsCells) ? st.compute(curves, { sidesMean: ref.sides.mean, areaCdf: (y) => ref!.areaCdf.at(y), lMean: ref.lFunction.mean }) : Number.NaN;
  }

  const tests: TestRow[] = [];
  const pOf = {} as Record<StatisticKey, number | null>;
  for (const st of STATISTICS) {
    const v = obs[st.key];
    const p = ref ? monteCarloP(v, ref.values[st.key], st.tail) : null;
    pOf[st.key] = p;
    if (!st.table) continue;
    const mean = ref ? ref.mean[st.key] : Number.NaN;
    const applies = !('publishedLayout' in st) || st.publishedLayout === layout;
    tests.push({
      key: st.key, name: st.label, statistic: num(v), referenceMean: num(mean), referenceSd: num(ref ? ref.sd[st.key] : Number.NaN),
      pValue: p, reading: readingOf(st.regular, v, mean, p, alpha), published: applies ? st.published : null,
      ...(!Number.isFinite(v) ? { note: 'not computed (see warnings)' } : {}),
    });
  }

  // The verdict.
  let verdict: Verdict | null = null;
  let verdictText: string;
  let basisP: number | null = null;
  let strongest: string | null = null;
  const regularOnes: string[] = [];
  const irregularOnes: string[] = [];
  const used = STATISTICS.filter((s) => s.verdict && Number.isFinite(obs[s.key]) && !(an?.spacing === 'left out' && 'spacing' in s));
  const quality = assessQuality(input.solidity ?? null, enough && as ? as.cv : null, input.notices);
  if (!quality.ok) {
    verdictText = `Not rated: ${quality.warnings[0]}`;
  } else if (!ref) {
    verdictText = 'No verdict: the random-seeding reference is missing (see warnings).';
  } else if (!enough) {
    verdictText = `No verdict: it needs at least ${MIN_INTERIOR_CELLS} interior cells; this field has ${m}.`;
  } else if (!used.length) {
    verdictText = `No verdict: none of ${STATISTICS.filter((s) => s.verdict).map((s) => s.label).join(', ')} could be computed.`;
  } else {
    const c = combinedMaxZ(used.map((s) => obs[s.key]), used.map((s) => ref!.values[s.key]), used.map((s) => (s.regular === 'high' ? 1 : -1)));
    if (!c) {
      verdictText = 'No verdict: the reference has no complete replicate.';
    } else {
      basisP = c.p;
      const s = used[c.strongest]!;
      const v = obs[s.key];
      strongest = s.label;
      // Each verdict statistic's own reading: the directions of those significant on their own.
      used.forEach((u, k) => {
        const r = readingOf(u.regular, obs[u.key], ref!.mean[u.key], c.pEach[k]!, alpha);
        if (r === 'more regular') regularOnes.push(u.label);
        if (r === 'more irregular') irregularOnes.push(u.label);
      });
      // Without a significant statistic of its own, the direction is the one the test rests on: the agreement
      // of the statistics when it carried the test, else the largest single departure.
      const strongestRegular = c.byAgreement ? c.agreement! > 0 : (v < ref.mean[s.key]) === (s.regular === 'low');
      const head = `combined Monte Carlo test of ${used.map((u) => u.label).join(', ')}: p = ${fmtP(c.p)} at α = ${alpha}, ${ref.options.replicates} replicates`;
      // The agreement is named only when it made the departure significant.
      const carried = c.byAgreement && c.p < alpha;
      const detail = (carried ? `carried by the statistics' agreement, ${fmt(Math.abs(c.agreement!))} sd towards ${c.agreement! > 0 ? 'regular' : 'irregular'}; ` : '')
        + `strongest: ${s.label} = ${fmt(v)} against ${fmt(ref.mean[s.key])} ± ${fmt(ref.sd[s.key])} for random seeding, p = ${fmtP(c.pEach[c.strongest]!)}`;
      if (!(c.p < alpha)) {
        verdict = 'consistent with random seeding';
        verdictText = `${verdict} (${head}; ${detail})`;
      } else if (regularOnes.length && irregularOnes.length) {
        verdict = 'departs from random seeding in opposite directions';
        verdictText = `${verdict}: more regular by ${regularOnes.join(', ')}; more irregular by ${irregularOnes.join(', ')} (${head})`;
      } else {
        const regular = regularOnes.length ? true : irregularOnes.length ? false : strongestRegular;
        verdict = regular ? 'more regular than random' : 'more irregular than random';
        verdictText = `${verdict} (${head}; ${detail})`;
      }
    }
  }

  // Plot data.
  const G = Math.round(AREA_GRID_MAX / AREA_GRID_STEP) + 1;
  const grid = ref ? ref.areaGrid : Float64Array.from({ length: G }, (_, k) => k * AREA_GRID_STEP);
  const ecdf = new Float64Array(grid.length);
  if (as) ecdfOnGrid(as, grid, ecdf, 0);
  const hist = Array.from({ length: grid.length - 1 }, (_, k) => (ecdf[k + 1]! - ecdf[k]!) / AREA_GRID_STEP);
  const nAxis = Array.from({ length: MAX_SIDES + 1 }, (_, k) => k);
  const none = (len: number) => new Array<number | null>(len).fill(null);
  let gap: LargestGap | null = null;
  try {
    gap = largestGap(t, mask ? (x, y) => hasPixel(mask.pixels, Math.floor(x), Math.floor(y)) : undefined);
  } catch (e) {
    warnings.push(`The largest gap could not be found: ${describeError(e)}`);
  }
  let likeness: RandomnessResult['voronoiLikeness'] = null;
  if (input.labels) {
    const vl = input.likeness ?? voronoiLikeness(input.labels, t, edge);
    likeness = { medianOverlap: num(vl.medianOverlap), overallOverlap: num(vl.overallOverlap), stepPx: vl.stepPx };
  }
  const chi = obs.sidesChiSquare;

  return {
    quality,
    anisotropy: an,
    verdict,
    verdictText,
    alpha,
    basis: {
      test: 'combined Monte Carlo test (largest standardised departure or agreement of the statistics)', combines: used.map((u) => u.label), pValue: basisP, strongest, regular: regularOnes, irregular: irregularOnes,
    },
    tests,
    reference: ref ? referenceSummary(ref) : null,
    cells: n,
    interiorCells: m,
    sides: {
      n: nAxis,
      observed: ss ? Array.from(ss.p) : new Array(MAX_SIDES + 1).fill(0),
      counts: sideCounts(sides, sample),
      reference: ref ? list(ref.sides.mean) : none(MAX_SIDES + 1),
      referenceLo: ref ? list(ref.sides.lo) : none(MAX_SIDES + 1),
      referenceHi: ref ? list(ref.sides.hi) : none(MAX_SIDES + 1),
      published: nAxis.map((k) => PV_SIDES_DISTRIBUTION[k]?.value ?? null),
      mean: num(ss?.mean),
      mu2: num(ss?.mu2),
      p6: num(ss?.p6),
      chiSquare: { statistic: num(chi), dof: 4, pAsymptotic: num(chiSquareUpper(chi, 4)), pValue: pOf.sidesChiSquare },
      lemaitre: { value: num(ss?.lemaitre), expected: LEMAITRE_CONSTANT.value, applies: !!ss && ss.p6 > LEMAITRE_RANGE[0] && ss.p6 < LEMAITRE_RANGE[1] },
    },
    areas: {
      mean: num(as?.mean),
      cv: num(as?.cv),
      variance: num(as?.variance),
      gammaShape: num(as?.gammaShape),
      ksDistance: num(obs.ksDistance),
      ecdf: { y: Array.from(grid), observed: Array.from(ecdf), mean: ref ? list(ref.areaEcdf.mean) : none(grid.length), lo: ref ? list(ref.areaEcdf.lo) : none(grid.length), hi: ref ? list(ref.areaEcdf.hi) : none(grid.length) },
      histogram: {
        y0: Array.from(grid.subarray(0, grid.length - 1)), binWidth: AREA_GRID_STEP, observed: hist,
        mean: ref ? list(ref.areaHistogram.mean) : none(hist.length), lo: ref ? list(ref.areaHistogram.lo) : none(hist.length), hi: ref ? list(ref.areaHistogram.hi) : none(hist.length),
        // The published law of normalised Poisson–Voronoi areas, gamma with shape = rate = 7/2, at the bin centres.
        published: Array.from(grid.subarray(0, grid.length - 1), (y0) => gammaPdf(y0 + AREA_GRID_STEP / 2, PV_AREA_GAMMA_SHAPE.value, PV_AREA_GAMMA_SHAPE.value)),
      },
    },
    clarkEvans: {
      R: num(ce.Rcorrected), Runcorrected: num(ce.R), se: num(ce.se), z: num(ce.z), pNormal: layout === 'seeds' ? num(normalTwoSided(ce.z)) : null, points: ce.n,
      referenceMean: num(ref?.mean.clarkEvansR), referenceSd: num(ref?.sd.clarkEvansR), pValue: pOf.clarkEvansR,
    },
    lFunction: {
      rPx: Array.from(radii), observed: list(L),
      mean: ref ? list(ref.lFunction.mean) : none(radii.length), lo: ref ? list(ref.lFunction.lo) : none(radii.length), hi: ref ? list(ref.lFunction.hi) : none(radii.length),
      maxDeviation: num(obs.lMaxDeviation), pValue: pOf.lMaxDeviation,
    },
    lewis: {
      n: lewis?.n ?? [], observed: lewis?.value ?? [], count: lewis?.count ?? [], fit: fitJson(lewis?.fit ?? { slope: NaN, intercept: NaN, r2: NaN }),
      reference: { n: ref?.lewis.n ?? [], value: ref ? list(ref.lewis.value) : [], slopeMean: num(ref?.mean.lewisSlope), slopeSd: num(ref?.sd.lewisSlope) },
    },
    aboavWeaire: {
      n: aw?.n ?? [], observed: aw?.value ?? [], count: aw?.count ?? [], fit: fitJson(aw?.fit ?? { slope: NaN, intercept: NaN, r2: NaN }), a: num(aw?.a),
      reference: { n: ref?.aboav.n ?? [], value: ref ? list(ref.aboav.value) : [], aMean: num(ref?.mean.aboavA), aSd: num(ref?.sd.aboavA) },
    },
    largestGap: gap && Number.isFinite(gap.radius) ? { x: gap.x, y: gap.y, radius: gap.radius, cell: gap.cell } : null,
    voronoiLikeness: likeness,
    warnings,
  };
}
