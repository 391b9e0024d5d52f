/**
 * Events (a second point set: spots, detections) counted per cell, and a test of whether they are spread
 * over the cells as independent Poisson counts proportional to cell area would be.
 */
import { Delaunay } from 'd3-delaunay';
import { CsvError, TooFewCellsError } from '../errors';
import { parsePointsCsv } from '../segment/points';
import type { Tessellation } from '../tessellate';
import type { LabelImage } from '../types';
import { chiSquareLower, chiSquareUpper } from './dist';

/** Where each event went. */
export interface EventAssignment {
  /** Events per cell, length = number of cells. */
  counts: Int32Array;
  /** 0-based cell of each event, −1 for an event outside the field. */
  cell: Int32Array;
  /** Events outside the field (not counted). */
  outside: number;
  /** Events on a wall or background pixel, given to the nearest centroid. */
  nearest: number;
}

/**
 * Assigns each event (x, y in px) to a cell: with a label image, to the cell whose label the event's pixel
 * (floor x, floor y) carries; on a wall or background pixel, or without labels (points patterns), to the
 * cell of the nearest centroid (its Voronoi cell; Delaunay point location). Events outside the field count
 * for no cell.
 *
 * @param events interleaved x, y (px)
 * @param labels the segmentation (cell k has label k + 1), or null
 * @param tessellation the tessellation of the centroids (its points and field)
 */
export function assignEventsDetailed(events: Float64Array, labels: LabelImage | null, tessellation: Tessellation): EventAssignment {
  const n = tessellation.area.length;
  const m = Math.floor(events.length / 2);
  const counts = new Int32Array(n);
  const cell = new Int32Array(m).fill(-1);
  const f = tessellation.field;
  const delaunay = new Delaunay(tessellation.points.slice());
  let hint = 0;
  let outside = 0;
  let nearest = 0;
  for (let e = 0; e < m; e++) {
    const x = events[2 * e]!;
    const y = events[2 * e + 1]!;
    if (!(x >= f.x0 && x <= f.x1 && y >= f.y0 && y <= f.y1)) {
      outside++;
      continue;
    }
    let c = -1;
    if (labels) {
      const px = Math.floor(x);
      const py = Math.floor(y);
      if (px >= 0 && py >= 0 && px < labels.width && py < labels.height) {
        const l = labels.labels[py * labels.width + px]!;
        if (l > 0 && l <= n) c = l - 1;
      }
    }
    if (c < 0) {
      c = delaunay.find(x, y, hint);
      hint = c;
      if (labels) nearest++;
    }
    cell[e] = c;
    counts[c]!++;
  }
  return { counts, cell, outside, nearest };
}

/** Events per cell; see {@link assignEventsDetailed}. */
export function assignEvents(events: Float64Array, labels: LabelImage | null, tessellation: Tessellation): Int32Array {
  return assignEventsDetailed(events, labels, tessellation).counts;
}

/** Events per unit area of each cell (events / px², or per µm² if the areas are). */
export function eventsDensity(counts: Int32Array, area: Float64Array): Float64Array {
  const out = new Float64Array(counts.length);
  for (let i = 0; i < counts.length; i++) out[i] = area[i]! > 0 ? counts[i]! / area[i]! : Number.NaN;
  return out;
}

/** Result of the dispersion test of events over cells. */
export interface EventsDispersion {
  events: number;
  cells: number;
  /** X² = Σ (cᵢ − eᵢ)² / eᵢ, eᵢ = N·aᵢ/Σa. */
  statistic: number;
  dof: number;
  /** X² / dof: 1 for Poisson counts, > 1 clumped, < 1 more even than Poisson. */
  index: number;
  /** P(χ² ≥ X²): small when events clump into some cells. */
  pOver: number;
  /** P(χ² ≤ X²): small when events are spread more evenly than Poisson counts. */
  pUnder: number;
  /** Two-sided: 2·min(pOver, pUnder), at most 1. */
  p: number;
  /** Cells with expected count below 1 (the chi-square approximation is rough when many are). */
  smallExpected: number;
}

/**
 * Index-of-dispersion test of event counts against independent Poisson counts with means proportional to
 * cell area: eᵢ = N·aᵢ/Σa, X² = Σ (cᵢ − eᵢ)²/eᵢ, referred to χ² with k − 1 degrees of freedom (Fisher 1950;
 * Cochran 1954, Biometrics 10:417; pub, memory). Cells of zero area are left out.
 *
 * @param counts events per cell
 * @param areas cell areas (any unit; only ratios matter)
 * @throws TooFewCellsError with fewer than 2 cells of positive area
 */
export function eventsDispersion(counts: Int32Array, areas: Float64Array): EventsDispersion {
  let total = 0;
  let areaSum = 0;
  let k = 0;
  for (let i = 0; i < counts.length; i++) {
    if (!(areas[i]! > 0)) continue;
    total += counts[i]!;
    areaSum += areas[i]!;
    k++;
  }
  if (k < 2) throw new TooFewCellsError(`The events test needs at least 2 cells with an area; got ${k}.`);
  let x2 = 0;
  let small = 0;
  for (let i = 0; i < counts.length; i++) {
    if (!(areas[i]! > 0)) continue;
    const e = (total * areas[i]!) / areaSum;
    if (e < 1) small++;
    if (e > 0) x2 += (counts[i]! - e) ** 2 / e;
  }
  const dof = k - 1;
  if (total === 0) {
    return { events: 0, cells: k, statistic: Number.NaN, dof, index: Number.NaN, pOver: Number.NaN, pUnder: Number.NaN, p: Number.NaN, smallExpected: k };
  }
  const pOver = chiSquareUpper(x2, dof);
  const pUnder = chiSquareLower(x2, dof);
  return { events: total, cells: k, statistic: x2, dof, index: x2 / dof, pOver, pUnder, p: Math.min(1, 2 * Math.min(pOver, pUnder)), smallExpected: small };
}

/**
 * Reads an events CSV (x, y per line; header optional) into interleaved px coordinates. Bad lines raise a
 * CsvError that names the line (parsing is shared with the points pattern).
 * @param text the file's text
 * @param name the file name, for messages
 */
export function parseEventsCsv(text: string, name = 'events file'): Float64Array {
  const parsed = parsePointsCsv(text, { name });
  if (parsed.count === 0) throw new CsvError(`${name}: no events found; it needs one x,y pair per line.`);
  return parsed.points;
}

/** Everything the events option adds: per-cell counts and density, and the dispersion test. */
export interface EventsAnalysis {
  counts: Int32Array;
  /** Events per px² of each cell (per the unit of `area`). */
  density: Float64Array;
  dispersion: EventsDispersion | null;
  outside: number;
  nearest: number;
  warnings: string[];
}

/**
 * Assigns events to cells ({@link assignEventsDetailed}), computes the per-cell density with `area`
 * (the observed cell areas: segmented for walls and bodies, Voronoi for points) and tests the counts
 * against Poisson counts ({@link eventsDispersion}). A test that cannot be made leaves `dispersion` null
 * with the reason in `warnings`; the counts are kept.
 */
export function analyseEvents(events: Float64Array, labels: LabelImage | null, tessellation: Tessellation, area: Float64Array): EventsAnalysis {
  const a = assignEventsDetailed(events, labels, tessellation);
  const warnings: string[] = [];
  if (a.outside) warnings.push(`${a.outside} of ${events.length / 2} events lie outside the field and were not counted.`);
  let dispersion: EventsDispersion | null = null;
  try {
    dispersion = eventsDispersion(a.counts, area);
    if (dispersion.events === 0) warnings.push('No event falls in the field; the events test needs at least one.');
    else if (dispersion.smallExpected > dispersion.cells / 2) {
      warnings.push(`Most cells expect fewer than 1 event (${dispersion.smallExpected} of ${dispersion.cells}); the chi-square p-value of the events test is rough.`);
    }
  } catch (e) {
    warnings.push(e instanceof Error ? e.message : String(e));
  }
  return { counts: a.counts, density: eventsDensity(a.counts, area), dispersion, outside: a.outside, nearest: a.nearest, warnings };
}
