/**
 * The Monte Carlo random-seeding reference: Poisson seeds at the observed density in a field of the same
 * size, their Voronoi tessellation, the same edge rule and minimum cell area as the observation, and the
 * same statistics, R times from one seed. It replaces the infinite-plane constants (constants.ts), which a
 * finite field with excluded edge cells biases.
 */
import { SettingsError, TooFewCellsError } from '../errors';
import { mulberry32, subSeed } from '../random';
import type { EdgeRule } from '../settings';
import { Tessellator } from '../tessellate';
import { windowCellsRetained } from './window';
import type { Rect } from '../types';
import { gammaCdf } from '../stats/dist';
import {
  AreaCdfTable, MAX_SIDES, aboavWeaireLaw, areaStats, cellSample, clarkEvans, lFunction, lRadii, lewisLaw, sideStats,
  type AreaStats,
} from '../stats/pattern';
import { PV_AREA_GAMMA_SHAPE } from './constants';
import { cachedReferenceFor, rememberReference } from './cache';
import { countFinite, ecdfOnGrid, envelope, meanSd, type Envelope } from './envelope';
import { STATISTICS, STATISTIC_KEYS, type PatternCurves, type PatternFigures, type ReferenceCurves, type StatisticKey } from '../stats/registry';
import type { MaskGeometry } from '../mask/geometry';
import { maskCovariance, type SetCovariance } from '../mask/covariance';
import { maskDensity, maskRegion, maskReplicateCells, seedsInMask } from './masked';
import { classRow, concat, pooledClasses, visibleCentroids } from './rows';

/**
 * How the observed cells relate to the field.
 * - 'seeds' (points and bodies patterns): the cells are the Voronoi cells of the points found in the field;
 *   seeds are drawn in the field only, and the spatial statistics are those of the seeds.
 * - 'window' (walls patterns): the cells are a window on a larger tissue; seeds are drawn in the field plus
 *   a guard band of 3 mean spacings (a Voronoi vertex farther than that from every seed has probability
 *   e^{−9π} ≈ 5e−13), the cells are cut by the field border, and the spatial statistics are those of the
 *   cells' centroids.
 */
export type ReferenceLayout = 'seeds' | 'window';

export interface ReferenceOptions {
  /** Number of cells observed in the field (all cells, edge cells included). */
  cells: number;
  field: Rect;
  replicates: number;
  seed: number;
  edgeRule: EdgeRule;
  /** Cells smaller than this (px²) are not counted (a segmentation cannot see them). Default 0. */
  minCellAreaPx?: number;
  /** Default 'seeds'. */
  layout?: ReferenceLayout;
  /**
   * Seeds per px². Default: cells / area for 'seeds'; for 'window' the λ that makes the expected number of
   * cells meeting the field equal `cells`, E N = λA + (2/π)·P·√λ + 1 (the kinematic formula for a convex
   * field of area A and perimeter P with the Poisson–Voronoi mean perimeter 4/√λ; Santaló 1976,
   * Integral Geometry and Geometric Probability; derived, memory).
   */
  density?: number;
  /**
   * A tissue mask inside `field`: the field of the statistics. 'seeds' draws the seeds uniformly in the mask;
   * 'window' draws them around it and keeps the cells with most of their pixels in it, as the observed
   * cells are kept; cells touching its border are edge cells; the edge rule is 'exclude'.
   */
  mask?: MaskGeometry;
  /** Called after each replicate with the fraction done (once with 1 when the reference comes from the cache). */
  onProgress?: (fraction: number) => void;
  /**
   * Default true: keep the reference in a small in-memory cache keyed by everything it depends on (cells,
   * field, replicates, seed, edge rule, minimum area, layout, density), so that a re-analysis with the
   * same keys returns it at once. A cached reference is shared: treat it as read-only.
   */
  cache?: boolean;
}

export { REFERENCE_CACHE_SIZE, cachedReferenceFor, clearReferenceCache, rememberReference } from './cache';

/** Names of the scalar statistics every replicate records: the statistics registry's keys, in its order. */
export const REFERENCE_STATISTICS = STATISTIC_KEYS;
export type ReferenceStatistic = StatisticKey;

/** Grid of normalised areas at which ECDF and histogram envelopes are tabulated. */
export const AREA_GRID_STEP = 0.05;
export const AREA_GRID_MAX = 4;


/** The reference: per-replicate statistics, their summaries and the envelopes of the distributions. */
export interface Reference {
  options: {
    cells: number; field: Rect; replicates: number; seed: number; edgeRule: EdgeRule; minCellAreaPx: number; layout: ReferenceLayout; density: number;
    /** The tissue mask's area (px²) and perimeter (px), when the reference was drawn in one. */
    mask?: { area: number; perimeter: number };
  };
  /** Seeds drawn per replicate (in the guard region for 'window'), raised for the cells the minimum area hides. */
  seedsPerReplicate: number;
  /** Replicate values of each statistic, length R (NaN where a replicate could not give it). */
  values: Record<ReferenceStatistic, Float64Array>;
  mean: Record<ReferenceStatistic, number>;
  sd: Record<ReferenceStatistic, number>;
  /** Side distribution p(n), n = 0..MAX_SIDES: mean and envelope over replicates. */
  sides: Envelope;
  /** Normalised-area ECDF at areaGrid. */
  areaEcdf: Envelope;
  /** Normalised-area histogram density on bins [areaGrid[k], areaGrid[k + 1]). */
  areaHistogram: Envelope;
  areaGrid: Float64Array;
  /** Pooled normalised-area CDF over all replicates (Kolmogorov–Smirnov distances are measured to it). */
  areaCdf: AreaCdfTable;
  /** Radii (px) and envelope of L(r) − r. */
  lRadii: Float64Array;
  lFunction: Envelope;
  /** Pooled Lewis and Aboav–Weaire class means (over all replicates' cells). */
  lewis: { n: number[]; value: number[] };
  aboav: { n: number[]; value: number[] };
  /** Interior cells used, summed over replicates. */
  interiorCellsTotal: number;
  warnings: string[];
}

/**
 * Draws the random-seeding reference.
 *
 * Each replicate r draws `seedsPerReplicate` uniform seeds (a Poisson process conditioned on its count,
 * which makes the Monte Carlo test exact given the observed number of cells) in the field, or for the
 * 'window' layout in the field plus its guard band, from the generator seeded with subSeed(seed, r);
 * tessellates them (for 'window': cuts the cells by the field border, see window.ts), keeps the cells the
 * observation's edge rule and minimum area keep, and records the statistics of stats/pattern.ts. The minimum area hides a fraction F of Poisson–
 * Voronoi cells, F = P(Y < minArea·λ) with Y gamma(7/2, 7/2) (Ferenc & Néda 2007; pub, read in text), so
 * seeds = round(cells / (1 − F)) puts the visible cells at the observed density (approximately: hidden cells
 * also change their neighbours).
 *
 * Distances of distributions: the side distribution by X² = Σ_bins (O − E)²/E with E from the replicates'
 * mean p(n) over the bins ≤4, 5, 6, 7, ≥8; the areas by the Kolmogorov–Smirnov distance to the pooled
 * area distribution; the L-function by max_r |L(r) − L̄(r)| (a maximum-deviation test; Diggle 2003,
 * Statistical Analysis of Spatial Point Patterns; pub, memory).
 *
 * A reference is cached (see {@link ReferenceOptions.cache}): the same options give the very same object,
 * which is frozen at its top level and must not be modified.
 *
 * @throws SettingsError on a bad count, field or replicate number; TooFewCellsError when the field holds
 *   so few cells that no replicate has an interior cell
 */
export function referenceMonteCarlo(opts: ReferenceOptions): Reference {
  if (opts.cache === false) return draw(opts);
  return cachedReferenceFor(opts) ?? rememberReference(opts, draw(opts));
}

function draw(opts: ReferenceOptions): Reference {
  const plan = planReference(opts);
  const batch = drawReplicates(plan, 0, plan.replicates, (done) => opts.onProgress?.(done / plan.replicates));
  return combineReplicates(plan, [batch]);
}

/**
 * The seed density λ (per px²) at which a window of W x H px on a Poisson–Voronoi tiling meets `cells`
 * cells on average: E N = λA + (2/π)·P·√λ + 1 for a convex window of area A and perimeter P (the kinematic
 * formula with the Poisson–Voronoi mean perimeter 4/√λ; Santaló 1976, Integral Geometry and Geometric
 * Probability; derived, memory), solved for √λ.
 */
export function windowDensity(cells: number, W: number, H: number): number {
  const A = W * H;
  const b = (2 / Math.PI) * 2 * (W + H);
  const x = (-b + Math.sqrt(b * b + 4 * A * Math.max(0, cells - 1))) / (2 * A);
  return x * x;
}

/**
 * Everything a reference's replicates depend on, checked and worked out once: a plain object of numbers
 * and typed arrays, so that it can be posted to a worker that draws some of the replicates.
 */
export interface ReferencePlan {
  cells: number;
  field: Rect;
  replicates: number;
  seed: number;
  edgeRule: EdgeRule;
  minArea: number;
  layout: ReferenceLayout;
  density: number;
  /** Seeds per replicate, drawn uniformly in `region` (the field, plus the guard band for 'window'). */
  seeds: number;
  region: Rect;
  /** L-function radii (px). */
  radii: Float64Array;
  /** Normalised areas at which the ECDF is tabulated. */
  areaGrid: Float64Array;
  /** The tissue mask the seeds and cells are drawn in, or null (the field), and its set covariance for the L-function. */
  mask: MaskGeometry | null;
  window: SetCovariance | null;
  warnings: string[];
}

/**
 * Checks the options and works out the density, seed count, guard region and curve grids.
 * @throws SettingsError on a bad count, field, replicate number, edge rule or density; TooFewCellsError under 3 cells
 */
export function planReference(opts: ReferenceOptions): ReferencePlan {
  const { cells, field, replicates: R, seed, edgeRule } = opts;
  const minArea = opts.minCellAreaPx && opts.minCellAreaPx > 0 ? opts.minCellAreaPx : 0;
  const layout: ReferenceLayout = opts.layout ?? 'seeds';
  if (!Number.isInteger(cells) || cells < 3) throw new TooFewCellsError(`The reference needs at least 3 cells in the field; got ${cells}.`);
  if (!Number.isInteger(R) || R < 1) throw new SettingsError(`The number of replicates must be a positive whole number; got ${R}.`);
  if (!(field.x1 > field.x0 && field.y1 > field.y0)) throw new SettingsError(`The reference field must have a positive width and height; got ${JSON.stringify(field)}.`);
  if (edgeRule !== 'exclude' && edgeRule !== 'weight') throw new SettingsError(`The edge rule must be exclude or weight; got "${String(edgeRule)}".`);
  const W = field.x1 - field.x0;
  const H = field.y1 - field.y0;
  const warnings: string[] = [];
  const mask = opts.mask ?? null;
  const A = mask ? mask.area : W * H;
  let density = opts.density;
  if (density === undefined) density = mask ? maskDensity(cells, mask, layout) : layout === 'window' ? windowDensity(cells, W, H) : cells / A;
  if (!(density > 0) || !Number.isFinite(density)) throw new SettingsError(`The seed density must be a positive number per px²; got ${density}.`);
  const hidden = minArea > 0 ? gammaCdf(minArea * density, PV_AREA_GAMMA_SHAPE.value, PV_AREA_GAMMA_SHAPE.value) : 0;
  if (hidden > 0.5) {
    warnings.push(`The minimum cell area (${minArea} px²) hides ${(100 * hidden).toFixed(0)} % of random-seeding cells at this density; the reference is unreliable. Lower the minimum area.`);
  }
  const seedDensity = density / Math.max(0.05, 1 - hidden);
  const margin = layout === 'window' ? 3 / Math.sqrt(seedDensity) : 0;
  const region: Rect = mask ? maskRegion(mask, layout, margin, field) : { x0: field.x0 - margin, y0: field.y0 - margin, x1: field.x1 + margin, y1: field.y1 + margin };
  const seeds = Math.max(3, Math.round(seedDensity * (mask && layout === 'seeds' ? A : (region.x1 - region.x0) * (region.y1 - region.y0))));
  const G = Math.round(AREA_GRID_MAX / AREA_GRID_STEP) + 1;
  const areaGrid = new Float64Array(G);
  for (let k = 0; k < G; k++) areaGrid[k] = k * AREA_GRID_STEP;
  if (mask && edgeRule === 'weight') warnings.push("In a tissue mask the edge rule is 'exclude': the Miles–Lantuéjoul weights are those of a rectangle.");
  const radii = mask ? lRadii(cells, mask.bbox, A) : lRadii(cells, field);
  return {
    cells, field: { x0: field.x0, y0: field.y0, x1: field.x1, y1: field.y1 }, replicates: R, seed, edgeRule: mask ? 'exclude' : edgeRule, minArea, layout, density, seeds, region,
    radii, areaGrid, mask, window: mask ? maskCovariance(mask, radii[radii.length - 1]!) : null, warnings,
  };
}

const NSTAT = REFERENCE_STATISTICS.length;
const NS = MAX_SIDES + 1;

/**
 * What replicates r0 .. r1−1 of a plan gave, row by row (row j is replicate r0 + j): typed arrays only, so
 * that a batch drawn in a worker is transferred, not copied. NaN where a replicate could not give a value.
 */
export interface ReplicateBatch {
  r0: number;
  r1: number;
  /** REFERENCE_STATISTICS values, NSTAT per row, before the second pass (ksDistance, sidesChiSquare, lMaxDeviation are NaN). */
  values: Float64Array;
  /** p(n), n = 0..MAX_SIDES, per row. */
  sides: Float64Array;
  /** Normalised-area ECDF at plan.areaGrid, per row. */
  ecdf: Float64Array;
  /** L(r) − r at plan.radii, per row. */
  l: Float64Array;
  /** Row j's sorted normalised areas and cumulative weight fractions are [areaOffsets[j], areaOffsets[j + 1]). */
  areaOffsets: Int32Array;
  areaSorted: Float64Array;
  areaCumulative: Float64Array;
  /** Sum of the cells' weights in row j (0 when the replicate had no interior cell). */
  weightSum: Float64Array;
  /** Lewis and Aboav–Weaire class counts and count × class mean, NS per row. */
  lewisW: Float64Array;
  lewisV: Float64Array;
  aboavW: Float64Array;
  aboavV: Float64Array;
}

/** The transferable buffers of a batch (for postMessage). */
export function batchBuffers(b: ReplicateBatch): ArrayBuffer[] {
  return [b.values, b.sides, b.ecdf, b.l, b.areaOffsets, b.areaSorted, b.areaCumulative, b.weightSum, b.lewisW, b.lewisV, b.aboavW, b.aboavV].map(
    (a) => a.buffer as ArrayBuffer,
  );
}

/** This thread's tessellation engine and seed array, reused from batch to batch (drawReplicates is not re-entrant). */
let threadEngine: Tessellator | null = null;
let threadSeeds = new Float64Array(0);

/**
 * Draws replicates r0 .. r1−1 of a plan. Replicate r's seeds come from the generator seeded with
 * subSeed(seed, r) alone, so any split of the replicates into batches gives the same rows.
 * @param onReplicate called after each replicate with the number done in this batch
 */
export function drawReplicates(plan: ReferencePlan, r0: number, r1: number, onReplicate?: (done: number) => void): ReplicateBatch {
  const { field, edgeRule, minArea, layout, region, radii, areaGrid } = plan;
  const count = r1 - r0;
  const nr = radii.length;
  const G = areaGrid.length;
  const values = new Float64Array(count * NSTAT).fill(Number.NaN);
  const sides = new Float64Array(count * NS).fill(Number.NaN);
  const ecdf = new Float64Array(count * G).fill(Number.NaN);
  const l = new Float64Array(count * nr).fill(Number.NaN);
  const areaOffsets = new Int32Array(count + 1);
  const sortedParts: Float64Array[] = [];
  const cumulativeParts: Float64Array[] = [];
  const weightSum = new Float64Array(count);
  const lewisW = new Float64Array(count * NS);
  const lewisV = new Float64Array(count * NS);
  const aboavW = new Float64Array(count * NS);
  const aboavV = new Float64Array(count * NS);
  const RW = region.x1 - region.x0;
  const RH = region.y1 - region.y0;
  const seeds = plan.seeds;
  const mask = plan.mask;
  const sqrtLambda = Math.sqrt(seeds / (mask && layout === 'seeds' ? mask.area : RW * RH));
  let areaLength = 0;

  // One engine and one seed array for all replicates: same seed count, so nothing is reallocated. The
  // engine is kept for the thread's next batch too (batches of one reference have the same seed count).
  const engine = (threadEngine ??= new Tessellator(true));
  if (threadSeeds.length !== 2 * seeds) threadSeeds = new Float64Array(2 * seeds);
  const pts = threadSeeds;
  for (let j = 0; j < count; j++) {
    const r = r0 + j;
    const v = j * NSTAT;
    const rng = mulberry32(subSeed(plan.seed, r));
    if (mask && layout === 'seeds') seedsInMask(mask, seeds, rng, pts);
    // Uniform seeds in the region, drawn x then y as synth/seeds uniformPoints draws them.
    else {
      for (let i = 0; i < seeds; i++) {
        pts[2 * i] = rng() * RW + region.x0;
        pts[2 * i + 1] = rng() * RH + region.y0;
      }
    }
    const mc = mask ? maskReplicateCells(engine, pts, region, mask, layout) : null;
    const t = mc ?? (layout === 'window' ? windowCellsRetained(engine.run(pts, region, 'retained'), engine, field) : engine.run(pts, field, 'cells'));
    const sample = cellSample(t.area, t.edge, t.bbox, field, edgeRule, minArea);
    const m = sample.index.length;
    const sp = layout === 'seeds' ? pts : visibleCentroids(t.centroid, mc ? mc.seen : t.area, minArea);
    // In a mask: its area and perimeter, and the points' rectangle its bounding box.
    const shape = mask ? { area: mask.area, perimeter: mask.perimeter } : undefined;
    const box = mask ? mask.bbox : field;
    const ce = layout === 'seeds' ? clarkEvans(sp, box, { offsets: t.neighbourOffsets, index: t.neighbourIndex }, shape) : clarkEvans(sp, box, undefined, shape);
    l.set(lFunction(sp, box, radii, plan.window ?? undefined), j * nr);
    areaOffsets[j + 1] = areaLength;
    let fig: PatternFigures = { sample, sides: null, areas: null, clarkEvans: ce, lewis: null, aboav: null, meanPerimeterScaled: Number.NaN };
    if (m > 0) {
      const ss = sideStats(t.sides, sample);
      sides.set(ss.p, j * NS);
      const as = areaStats(t.area, sample);
      sortedParts.push(as.sorted);
      cumulativeParts.push(as.cumulative);
      areaLength += as.sorted.length;
      areaOffsets[j + 1] = areaLength;
      weightSum[j] = sample.weightSum;
      ecdfOnGrid(as, areaGrid, ecdf, j * G);
      let per = 0;
      for (let k = 0; k < m; k++) per += sample.weight[k]! * t.perimeter[sample.index[k]!]!;
      const lewis = lewisLaw(t.sides, t.area, sample, as.mean);
      classRow(lewis, lewisW, lewisV, j * NS);
      const aw = aboavWeaireLaw(t.sides, t.edge, t.neighbourOffsets, t.neighbourIndex, sample);
      classRow(aw, aboavW, aboavV, j * NS);
      fig = { sample, sides: ss, areas: as, clarkEvans: ce, lewis, aboav: aw, meanPerimeterScaled: (per / sample.weightSum) * sqrtLambda };
    }
    // Second-pass statistics stay NaN here: they need the whole reference (combineReplicates).
    for (let s = 0; s < NSTAT; s++) {
      const st = STATISTICS[s]!;
      if (st.pass === 1) values[v + s] = st.compute(fig);
    }
    onReplicate?.(j + 1);
  }
  return {
    r0, r1, values, sides, ecdf, l, areaOffsets, areaSorted: concat(sortedParts, areaLength), areaCumulative: concat(cumulativeParts, areaLength),
    weightSum, lewisW, lewisV, aboavW, aboavV,
  };
}

/**
 * Assembles the reference from batches that together hold every replicate of the plan once (in any
 * order; any split). Pooled sums run over the replicates in order, so the result does not depend on the
 * split: the same bytes from one thread or several.
 * @throws TooFewCellsError when no replicate has an interior cell
 */
export function combineReplicates(plan: ReferencePlan, batches: ReplicateBatch[]): Reference {
  const { cells, field, replicates: R, seed, edgeRule, minArea, layout, density, radii, areaGrid } = plan;
  const nr = radii.length;
  const G = areaGrid.length;
  const W = field.x1 - field.x0;
  const H = field.y1 - field.y0;
  const warnings = [...plan.warnings];
  const sorted = [...batches].sort((a, b) => a.r0 - b.r0);
  let next = 0;
  for (const b of sorted) {
    if (b.r0 !== next) throw new Error(`Reference batches do not cover replicates ${next}..${b.r0 - 1}.`);
    next = b.r1;
  }
  if (next !== R) throw new Error(`Reference batches stop at replicate ${next} of ${R}.`);

  const values = {} as Record<ReferenceStatistic, Float64Array>;
  for (const name of REFERENCE_STATISTICS) values[name] = new Float64Array(R);
  const sidesCurves = new Float64Array(R * NS);
  const ecdfCurves = new Float64Array(R * G);
  const histCurves = new Float64Array(R * (G - 1)).fill(Number.NaN);
  const lCurves = new Float64Array(R * nr);
  const areaSamples: (Pick<AreaStats, 'sorted' | 'cumulative'> | null)[] = new Array(R).fill(null);
  const pooled = new AreaCdfTable();
  const lewisW = new Float64Array(NS);
  const lewisV = new Float64Array(NS);
  const aboavW = new Float64Array(NS);
  const aboavV = new Float64Array(NS);
  let interiorTotal = 0;
  for (const b of sorted) {
    for (let j = 0; j < b.r1 - b.r0; j++) {
      const r = b.r0 + j;
      for (let s = 0; s < NSTAT; s++) values[REFERENCE_STATISTICS[s]!][r] = b.values[j * NSTAT + s]!;
      interiorTotal += values.interiorCells[r]!;
      sidesCurves.set(b.sides.subarray(j * NS, (j + 1) * NS), r * NS);
      ecdfCurves.set(b.ecdf.subarray(j * G, (j + 1) * G), r * G);
      lCurves.set(b.l.subarray(j * nr, (j + 1) * nr), r * nr);
      const a0 = b.areaOffsets[j]!;
      const a1 = b.areaOffsets[j + 1]!;
      if (!(values.interiorCells[r]! > 0)) continue;
      const as = { sorted: b.areaSorted.subarray(a0, a1), cumulative: b.areaCumulative.subarray(a0, a1) };
      areaSamples[r] = as;
      pooled.add(as, b.weightSum[j]!);
      for (let k = 0; k + 1 < G; k++) {
        histCurves[r * (G - 1) + k] = (ecdfCurves[r * G + k + 1]! - ecdfCurves[r * G + k]!) / AREA_GRID_STEP;
      }
      // Classes a replicate does not have hold 0 in its rows, and adding 0 changes no sum.
      for (let n = 0; n < NS; n++) {
        lewisW[n]! += b.lewisW[j * NS + n]!;
        lewisV[n]! += b.lewisV[j * NS + n]!;
        aboavW[n]! += b.aboavW[j * NS + n]!;
        aboavV[n]! += b.aboavV[j * NS + n]!;
      }
    }
  }
  if (interiorTotal === 0) {
    throw new TooFewCellsError(
      `None of the ${R} reference replicates has an interior cell: ${cells} cells in a ${W} x ${H} px field all touch the border. Use a larger field or more cells.`,
    );
  }

  const sides = envelope(sidesCurves, R, NS);
  const lEnv = envelope(lCurves, R, nr);
  // Second pass: distances of each replicate's curves to the reference's own mean curves.
  const meanCurves: ReferenceCurves = { sidesMean: sides.mean, areaCdf: (y) => pooled.at(y), lMean: lEnv.mean };
  for (let r = 0; r < R; r++) {
    const curves: PatternCurves = {
      sidesP: sidesCurves.subarray(r * NS, (r + 1) * NS), cells: values.interiorCells[r]!, areas: areaSamples[r] ?? null, l: lCurves.subarray(r * nr, (r + 1) * nr),
    };
    for (const st of STATISTICS) if (st.pass === 2) values[st.key][r] = st.compute(curves, meanCurves);
  }

  const mean = {} as Record<ReferenceStatistic, number>;
  const sd = {} as Record<ReferenceStatistic, number>;
  for (const name of REFERENCE_STATISTICS) {
    const [mu, s] = meanSd(values[name]);
    mean[name] = mu;
    sd[name] = s;
  }
  const validSides = countFinite(values.mu2);
  if (validSides < R) warnings.push(`${R - validSides} of ${R} replicates had no interior cell; their side and area statistics are missing. Use a larger field.`);
  if (mean.interiorCells < 10) {
    warnings.push(`Only ${mean.interiorCells.toFixed(1)} interior cells per replicate on average: the field is too small for a stable reference; use a larger field or more cells.`);
  }
  return {
    options: {
      cells, field: { ...field }, replicates: R, seed, edgeRule, minCellAreaPx: minArea, layout, density,
      ...(plan.mask ? { mask: { area: plan.mask.area, perimeter: plan.mask.perimeter } } : {}),
    },
    seedsPerReplicate: plan.seeds,
    values,
    mean,
    sd,
    sides,
    areaEcdf: envelope(ecdfCurves, R, G),
    areaHistogram: envelope(histCurves, R, G - 1),
    areaGrid,
    areaCdf: pooled,
    lRadii: radii,
    lFunction: lEnv,
    lewis: pooledClasses(lewisW, lewisV),
    aboav: pooledClasses(aboavW, aboavV),
    interiorCellsTotal: interiorTotal,
    warnings,
  };
}
