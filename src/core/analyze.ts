/**
 * The pipeline: (grey image or point set, settings) -> Analysis.
 * bytes -> raster (caller) -> labels -> cells (columns) -> tessellation -> comparison -> summary.
 * Each stage is one function; progress is reported through a callback; an AbortSignal cancels between stages.
 */
import { cellOutlines, type Polygons } from './cv/contours';
import { loadCv } from './cv/index';
import { CancelledError, ImageTooLargeError, ImageTooSmallError, NoCellsError, SettingsError, TessellabError, describeError } from './errors';
import { grainSize, grainSizeSummary } from './grain/index';
import type { GrainSizeResult } from './grain/types';
import { assignEvents, eventsDispersion } from './stats/events';
import { voronoiLikeness } from './stats/likeness';
import { randomness, referenceOptionsFor, type RandomnessResult } from './stats/randomness';
import type { Reference } from './reference/montecarlo';
import { startReference, type ReferencePool } from './reference/parallel';
import type { Analysis } from './analysis.types';
import { MAX_PIXELS, MIN_SIDE_PX, outOfCvMemory, tooLargeMessage } from './image/limits';
import { cellSums, type CellSums } from './measure/kernel';
import { measureColumns, type MeasureContext } from './measure/registry';
import { segmentBodies } from './segment/bodies';
import { segmentWalls, type SegmentResult } from './segment/walls';
import { resolveSettings, type Settings, type SettingsInput } from './settings';
import { buildSummary, type CalibrationSource, type EventsSummary, type GrainSizeSummary, type SegmentInfo } from './summary';
import { tessellate } from './tessellate/index';
import type { Tessellation } from './tessellate/types';
import type { Columns, GreyImage, LabelImage, Progress, Rect } from './types';
import { anisotropy, stretchedField, type Anisotropy } from './stats/anisotropy';
import { hasPixel, maskGeometry, type MaskGeometry } from './mask/geometry';
import { maskLabels, maskTessellation } from './mask/observe';

export type AnalyzeInput =
  | { kind: 'image'; image: GreyImage; name?: string }
  | { kind: 'points'; points: Float64Array; width: number; height: number; name?: string };

export interface AnalyzeOptions {
  onProgress?: Progress;
  signal?: AbortSignal;
  /** Event points (interleaved x, y in px, image coordinates) to count per cell. */
  events?: Float64Array;
  /**
   * Threads that draw the random-seeding reference while the rest of the analysis runs (the command line's
   * worker_threads, the app's web workers). Without one it is drawn on this thread; the result is the same.
   */
  referencePool?: ReferencePool | null;
  /** Where settings.umPerPx came from, recorded in the summary; default 'user' when it is set, else 'none'. */
  calibrationSource?: CalibrationSource;
  /** Why a pixel size the file gives is not used, recorded in the summary's calibration block. */
  calibrationNotice?: string;
  /**
   * A tissue mask: one byte per pixel of the image (points: of the width x height field), nonzero = tissue.
   * Only the cells with most of their pixels in it are kept (cut to it; points: those in it); cells touching its
   * border are edge cells; it is the field of the statistics and of the random-seeding reference.
   */
  mask?: Uint8Array;
}

/** The calibration source an analysis records. */
function calibrationSourceOf(settings: Settings, opts: AnalyzeOptions): CalibrationSource {
  return opts.calibrationSource ?? (settings.umPerPx === null ? 'none' : 'user');
}

export type { SegmentInfo } from './summary';

function check(signal?: AbortSignal): void {
  if (signal?.aborted) throw new CancelledError();
}

/** The field of an image: the settings' rectangle clipped to the image, in whole pixels, or the whole image. */
export function resolveField(field: Rect | null, width: number, height: number): Rect {
  if (!field) return { x0: 0, y0: 0, x1: width, y1: height };
  const f = {
    x0: Math.max(0, Math.floor(field.x0)),
    y0: Math.max(0, Math.floor(field.y0)),
    x1: Math.min(width, Math.ceil(field.x1)),
    y1: Math.min(height, Math.ceil(field.y1)),
  };
  if (f.x1 - f.x0 < MIN_SIDE_PX || f.y1 - f.y0 < MIN_SIDE_PX) {
    throw new SettingsError(`The field (${f.x1 - f.x0} x ${f.y1 - f.y0} px inside the image) is too small; draw one of at least ${MIN_SIDE_PX} x ${MIN_SIDE_PX} px.`);
  }
  return f;
}

/** A copy of the field part of an image (or the image itself when the field is the whole image). */
export function cropImage(img: GreyImage, f: Rect): GreyImage {
  if (f.x0 === 0 && f.y0 === 0 && f.x1 === img.width && f.y1 === img.height) return img;
  const w = f.x1 - f.x0;
  const h = f.y1 - f.y0;
  const data = img.bitDepth === 16 ? new Uint16Array(w * h) : new Uint8Array(w * h);
  for (let y = 0; y < h; y++) data.set(img.data.subarray((y + f.y0) * img.width + f.x0, (y + f.y0) * img.width + f.x1), y * w);
  return { width: w, height: h, data, bitDepth: img.bitDepth };
}

function validateImage(img: GreyImage): void {
  const { width: w, height: h } = img;
  if (w < MIN_SIDE_PX || h < MIN_SIDE_PX) {
    throw new ImageTooSmallError(`${w} x ${h} px is too small to analyse; the minimum is ${MIN_SIDE_PX} x ${MIN_SIDE_PX}.`);
  }
  if (w * h > MAX_PIXELS) throw new ImageTooLargeError(`${tooLargeMessage(w, h, MAX_PIXELS)}.`);
  if (img.data.length !== w * h) throw new SettingsError(`The image data holds ${img.data.length} values, not ${w} x ${h}.`);
}

/**
 * Analyses one grey image (walls or bodies pattern) or one point set (points pattern).
 *
 * @param input the image (grey, 8 or 16 bit) or the points (px, image coordinates) with the image size
 * @param settingsInput settings over the defaults (src/core/settings.ts)
 * @returns the Analysis: labels, per-cell columns, tessellation, summary, settings used
 * @throws TessellabError subclasses with one-line messages (no cells, too few cells, bad settings, ...)
 */
export async function analyze(input: AnalyzeInput, settingsInput: SettingsInput | Settings = {}, opts: AnalyzeOptions = {}): Promise<Analysis> {
  const settings = resolveSettings(settingsInput as SettingsInput);
  const progress = opts.onProgress ?? (() => {});
  check(opts.signal);
  if (input.kind === 'points') {
    if (settings.pattern !== 'points') settings.pattern = 'points';
    return analyzePoints(input.points, input.width, input.height, settings, opts);
  }
  if (settings.pattern === 'points') throw new SettingsError('The points pattern reads a CSV of x, y, not an image; choose walls or bodies for an image.');
  const img = input.image;
  validateImage(img);
  const field = resolveField(settings.field, img.width, img.height);
  const crop = cropImage(img, field);
  progress('load', 0);
  const { cv } = await loadCv();
  check(opts.signal);
  progress('segment', 0);
  // A walls segmentation knows its cell count before its flood: the reference's workers start then.
  let early: ReferenceStart = null;
  let seg: SegmentResult;
  try {
    seg = settings.pattern === 'walls'
      ? segmentWalls(cv, crop, settings, opts.mask ? undefined : (count, minArea) => (early = startReferenceFor(settings, count, field, minArea, opts)))
      : segmentBodies(cv, crop, settings);
    progress('segment', 1);
    check(opts.signal);
  } catch (e) {
    (early as ReferenceStart)?.cancel();
    throw outOfCvMemory(e, crop.width, crop.height);
  }
  return measureLabels(seg.labels, crop, field, img.width, img.height, settings, opts, { threshold: seg.threshold, polarity: seg.polarity, minCellAreaPx: seg.minCellAreaPx, ...(seg.cellDiameterPx ? { cellDiameterPx: seg.cellDiameterPx, markerDynamicPx: seg.markerDynamicPx } : {}) }, early);
}

/**
 * Recomputes every figure from a label image (after a merge / split / remove edit), without segmenting.
 * @param labels labels of the field (field-sized), 0 = wall/background
 * @param image the field's grey image for intensities, or null
 * @param imageSize the full image's size (the field is settings.field inside it)
 */
export async function reanalyzeLabels(
  labels: LabelImage,
  image: GreyImage | null,
  settingsInput: SettingsInput | Settings,
  imageSize: { width: number; height: number },
  opts: AnalyzeOptions = {},
): Promise<Analysis> {
  const settings = resolveSettings(settingsInput as SettingsInput);
  const field = resolveField(settings.field, imageSize.width, imageSize.height);
  if (labels.width !== field.x1 - field.x0 || labels.height !== field.y1 - field.y0) {
    throw new SettingsError(`The label image is ${labels.width} x ${labels.height} px but the field is ${field.x1 - field.x0} x ${field.y1 - field.y0} px.`);
  }
  return measureLabels(labels, image, field, imageSize.width, imageSize.height, settings, opts, null, null);
}

/**
 * Starts the random-seeding reference for an observation of `cells` cells in `field` (null when the
 * settings ask for none). Its result() never throws but for cancellation: a reference that cannot be
 * drawn becomes `{ referenceError }`, which the randomness report shows as a warning beside what was computed.
 */
function startReferenceFor(settings: Settings, cells: number, field: Rect, minCellAreaPx: number | undefined, opts: AnalyzeOptions, mask?: MaskGeometry) {
  const refOpts = referenceOptionsFor(settings, cells, field, minCellAreaPx, mask);
  if (!refOpts) return null;
  // While the analysis waits for it, the reference's progress is the statistics stage's (up to 90 %).
  let waiting = false;
  const onProgress = (f: number): void => {
    if (waiting) opts.onProgress?.('statistics', 0.9 * f);
  };
  const job = startReference({ ...refOpts, onProgress }, opts.referencePool);
  return {
    /** What it was started for. */
    cells,
    minCellAreaPx,
    /** Between the analysis's steps: the reference's workers take their next chunks. */
    tick: () => job.tick(),
    /** The analysis stopped before it needed the reference. */
    cancel: () => job.cancel(),
    async result(): Promise<{ reference?: Reference; referenceError?: string }> {
      waiting = true;
      try {
        return { reference: await job.result(opts.signal) };
      } catch (e) {
        if (e instanceof CancelledError) throw e;
        return { referenceError: describeError(e) };
      }
    },
  };
}

type ReferenceStart = ReturnType<typeof startReferenceFor>;

async function measureLabels(
  segmented: LabelImage,
  image: GreyImage | null,
  field: Rect,
  width: number,
  height: number,
  settings: Settings,
  opts: AnalyzeOptions,
  segment: SegmentInfo | null,
  early: ReferenceStart,
): Promise<Analysis> {
  const progress = opts.onProgress ?? (() => {});
  progress('measure', 0);
  // A tissue mask: the cells with most of their pixels in it, cut to it.
  const geom = opts.mask ? maskGeometry(opts.mask, width, height, field) : undefined;
  const cut = geom ? maskLabels(segmented, image?.data, field, opts.mask!, width) : null;
  const labels = cut ? cut.labels : segmented;
  if (labels.count < 1) {
    early?.cancel();
    if (cut) throw new NoCellsError(`No cell has most of its pixels in the mask (${segmented.count} found in the field); check that the mask marks the tissue with nonzero pixels.`);
    throw new NoCellsError('No cells found. Check the pattern kind (walls or bodies) and the threshold, or use a larger field.');
  }
  // The reference needs only the count, the field and the minimum area: the pool draws it meanwhile
  // (from the segmentation's flood on, when that told the count; it is started afresh should they differ).
  let reference = early;
  if (early && (early.cells !== labels.count || early.minCellAreaPx !== segment?.minCellAreaPx)) {
    early.cancel();
    reference = null;
  }
  reference ??= startReferenceFor(settings, labels.count, field, segment?.minCellAreaPx, opts, geom);
  try {
    const sums = cut ? cut.sums : cellSums(labels, image?.data);
    await reference?.tick();
    const n = sums.count;
    const pts = new Float64Array(2 * n);
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    for (let c = 0; c < n; c++) {
      x[c] = sums.cx[c]! + field.x0;
      y[c] = sums.cy[c]! + field.y0;
      pts[2 * c] = x[c]!;
      pts[2 * c + 1] = y[c]!;
    }
    progress('measure', 1);
    check(opts.signal);
    progress('tessellate', 0);
    const tess = geom ? maskTessellation(tessellate(pts, field), geom) : tessellate(pts, field);
    progress('tessellate', 1);
    await reference?.tick();
    const neighbours = cut ? cut.sides : new Int32Array(n);
    if (!cut) for (let c = 0; c < n; c++) neighbours[c] = sums.neighbourOffsets[c + 1]! - sums.neighbourOffsets[c]!;
    // The labels in image coordinates (a copy only when the field is inset), for events and the statistics.
    const imageLabels = labelsInImage(labels, field);
    const events = opts.events ? assignEvents(opts.events, imageLabels, tess) : undefined;
    const ctx: MeasureContext = {
      count: n,
      umPerPx: settings.umPerPx,
      offsetX: field.x0,
      offsetY: field.y0,
      sums,
      x,
      y,
      voronoiArea: tess.area,
      voronoiSides: tess.sides,
      edge: sums.edge,
      neighbours,
      events,
      hasIntensity: !!image,
    };
    const columns = measureColumns(ctx, settings.pattern);
    check(opts.signal);
    // Aligned, elongated cells: the spacing statistics and their reference move to the stretched field.
    let aniso = cellAnisotropy(columns, sums.edge, settings.reference.alpha);
    // In a mask the spacing statistics are not stretched: aligned cells leave them out of the verdict.
    if (geom && aniso.spacing === 'stretched') aniso = { ...aniso, spacing: 'left out', stretch: null };
    if (aniso.spacing === 'stretched' && reference) {
      reference.cancel();
      reference = startReferenceFor(settings, n, stretchedField(field, aniso.stretch), segment?.minCellAreaPx, opts);
    }
    await reference?.tick();
    // Grain size before the statistics, so that it runs while the pool is drawing the reference.
    let grain: GrainSizeResult | null = null;
    let grainSummary: GrainSizeSummary | undefined;
    if (settings.pattern === 'walls' && geom) {
      grainSummary = { G: null, error: 'The grain size is not rated in a tissue mask: the ASTM E112 counts need a rectangular field. Analyse a rectangle of the grains for it.' };
    } else if (settings.pattern === 'walls') {
      progress('grain size', 0);
      const g = rateGrainSize(labels, field, settings);
      grain = g.result;
      grainSummary = g.summary;
      progress('grain size', 1);
      check(opts.signal);
      await reference?.tick();
    }
    progress('statistics', 0);
    const sides = settings.pattern === 'walls' ? neighbours : tess.sides;
    // Voronoi-likeness needs no reference: measured while the pool finishes drawing it.
    const likeness = reference ? voronoiLikeness(imageLabels, tess, sums.edge) : undefined;
    const rnd = randomness({
      ...(reference ? await reference.result() : {}),
      likeness,
      tessellation: tess,
      sides,
      area: sums.n,
      // Bodies in a mask: also those whose Voronoi cell reaches its border, as in the reference.
      edge: geom && settings.pattern === 'bodies' ? sums.edge.map((e, i) => e | tess.edge[i]!) : sums.edge,
      bbox: bboxOf(sums, field),
      labels: imageLabels,
      settings,
      neighbours: settings.pattern === 'walls' ? { offsets: sums.neighbourOffsets, index: sums.neighbourIndex } : undefined,
      minCellAreaPx: segment?.minCellAreaPx,
      solidity: columns.solidity ?? null,
      anisotropy: aniso,
      mask: geom,
    });
    const summary = buildSummary({
      settings, width, height, field, count: n, edge: sums.edge, segment, randomness: rnd, calibrationSource: calibrationSourceOf(settings, opts), calibrationNotice: opts.calibrationNotice, mask: geom,
      events: events ? eventsSummary(events, sums.n, sums.edge) : undefined, grainSize: grainSummary,
    });
    progress('statistics', 1);
    return { width, height, field, settings, labels, columns, tessellation: tess, summary, grain, randomness: rnd };
  } catch (e) {
    // Failed or cancelled before the statistics: the workers need not draw the rest.
    reference?.cancel();
    throw e;
  }
}

/** Anisotropy of the interior cells from the measurement columns (any length unit: only ratios matter). */
function cellAnisotropy(columns: Columns, edge: Uint8Array, alpha: number): Anisotropy {
  const col = (prefix: string) => columns[Object.keys(columns).find((k) => k.startsWith(prefix))!]!;
  return anisotropy(col('major_axis_'), col('minor_axis_'), columns.orientation_deg!, (i) => edge[i] === 0, alpha);
}

/**
 * ASTM E112 rating of a walls pattern. A missing pixel size or another problem that makes the rating
 * impossible becomes `{ error }` in the summary; the rest of the analysis stands.
 */
function rateGrainSize(labels: LabelImage, field: Rect, settings: Settings): { result: GrainSizeResult | null; summary: GrainSizeSummary } {
  try {
    const result = grainSize({ labels, umPerPx: settings.umPerPx, field: { x0: 0, y0: 0, x1: field.x1 - field.x0, y1: field.y1 - field.y0 }, pattern: 'walls', settings });
    return { result, summary: grainSizeSummary(result) };
  } catch (e) {
    if (e instanceof TessellabError) return { result: null, summary: { G: null, error: e.message } };
    throw e;
  }
}

/** Bounding boxes of the cells' pixel squares, x0, y0, x1, y1 per cell, in image px. */
function bboxOf(s: CellSums, field: Rect = { x0: 0, y0: 0, x1: 0, y1: 0 }): Float64Array {
  const b = new Float64Array(4 * s.count);
  for (let c = 0; c < s.count; c++) {
    b[4 * c] = s.xmin[c]! + field.x0;
    b[4 * c + 1] = s.ymin[c]! + field.y0;
    b[4 * c + 2] = s.xmax[c]! + 1 + field.x0;
    b[4 * c + 3] = s.ymax[c]! + 1 + field.y0;
  }
  return b;
}

/**
 * The statistics read label images in image coordinates; ours cover the field only. When the field is
 * the whole image they are the same; otherwise a zero-padded copy (rare: a drawn field).
 */
function labelsInImage(labels: LabelImage, field: Rect): LabelImage {
  if (field.x0 === 0 && field.y0 === 0) return labels;
  const w = field.x1;
  const h = field.y1;
  const out = new Int32Array(w * h);
  for (let y = 0; y < labels.height; y++) out.set(labels.labels.subarray(y * labels.width, (y + 1) * labels.width), (y + field.y0) * w + field.x0);
  return { width: w, height: h, labels: out, count: labels.count };
}

/** Events per cell against Poisson counts proportional to area, over interior cells. */
function eventsSummary(counts: Int32Array, area: Float64Array, edge: Uint8Array): EventsSummary {
  const keep: number[] = [];
  for (let i = 0; i < counts.length; i++) if (!edge[i]) keep.push(i);
  let total = 0;
  for (const c of counts) total += c;
  try {
    const d = eventsDispersion(Int32Array.from(keep, (i) => counts[i]!), Float64Array.from(keep, (i) => area[i]!));
    return { total, ...d };
  } catch (e) {
    if (e instanceof TessellabError) return { total, error: e.message };
    throw e;
  }
}

async function analyzePoints(points: Float64Array, width: number, height: number, settings: Settings, opts: AnalyzeOptions): Promise<Analysis> {
  let pts = points;
  if (settings.points.units === 'um') {
    if (settings.umPerPx === null) settings.umPerPx = 1;
    const k = 1 / settings.umPerPx;
    pts = points.map((v) => v * k);
  }
  const field = settings.field ? { ...settings.field } : { x0: 0, y0: 0, x1: width, y1: height };
  // A tissue mask: the points in it.
  const geom = opts.mask ? maskGeometry(opts.mask, width, height, resolveField(settings.field, width, height)) : undefined;
  if (geom) pts = pts.filter((_, k) => hasPixel(geom.pixels, Math.floor(pts[k & ~1]!), Math.floor(pts[k | 1]!)));
  const n = pts.length / 2;
  if (n < 1) throw new NoCellsError(geom ? `None of the ${points.length / 2} points lies in the mask; check that the mask marks the tissue with nonzero pixels.` : 'The point set is empty; give at least one x, y pair.');
  const reference = startReferenceFor(settings, n, field, undefined, opts, geom);
  const progress = opts.onProgress ?? (() => {});
  try {
    progress('tessellate', 0);
    const tess = geom ? maskTessellation(tessellate(pts, field), geom) : tessellate(pts, field);
    progress('tessellate', 1);
    await reference?.tick();
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) (x[i] = pts[2 * i]!), (y[i] = pts[2 * i + 1]!);
    const neighbours = new Int32Array(n);
    for (let i = 0; i < n; i++) neighbours[i] = tess.neighbourOffsets[i + 1]! - tess.neighbourOffsets[i]!;
    const events = opts.events ? assignEvents(opts.events, null, tess) : undefined;
    const ctx: MeasureContext = {
      count: n,
      umPerPx: settings.umPerPx,
      offsetX: 0,
      offsetY: 0,
      x,
      y,
      voronoiArea: tess.area,
      voronoiSides: tess.sides,
      edge: tess.edge,
      neighbours,
      events,
      hasIntensity: false,
    };
    const columns = measureColumns(ctx, 'points');
    progress('statistics', 0);
    const rnd = randomness({ ...(reference ? await reference.result() : {}), tessellation: tess, sides: tess.sides, area: tess.area, edge: tess.edge, settings, labels: null, mask: geom });
    const summary = buildSummary({
      settings, width, height, field, count: n, edge: tess.edge, segment: null, randomness: rnd, calibrationSource: calibrationSourceOf(settings, opts), calibrationNotice: opts.calibrationNotice, mask: geom,
      events: events ? eventsSummary(events, tess.area, tess.edge) : undefined,
    });
    progress('statistics', 1);
    return { width, height, field, settings, labels: null, columns, tessellation: tess, summary, randomness: rnd };
  } catch (e) {
    // Failed or cancelled before the statistics: the workers need not draw the rest.
    reference?.cancel();
    throw e;
  }
}

/** The segmented cells' outlines (image px), or null for a points pattern. Loads opencv.js if needed. */
export async function outlinesOf(analysis: Analysis): Promise<Polygons | null> {
  if (!analysis.labels) return null;
  const { cv } = await loadCv();
  try {
    return cellOutlines(cv, analysis.labels, analysis.field.x0, analysis.field.y0);
  } catch (e) {
    throw outOfCvMemory(e, analysis.labels.width, analysis.labels.height);
  }
}
