/** Grain size from the areas of the individually segmented grains, and the per-grain G distribution. */
import type { LabelImage, Rect } from '../types';
import { fieldCensus, type FieldCensus } from './census';
import { checkLabelsAndField } from './check';
import { CalibrationError, SettingsError } from '../errors';
import { PIXEL_SIZE_BAND } from '../image/calibration';
import { gFromMeanArea } from './formulas';
import type { GBin } from './types';

/** Areas and bounding boxes of the grains wholly inside the field. */
export interface InsideGrains {
  /** Labels of the grains that do not touch the field's border. */
  labels: number[];
  /** Their areas (px²), wall share not yet spread. */
  areaPx2: number[];
  /** Their bounding-box width and height (px). */
  bboxW: number[];
  bboxH: number[];
  /** Share of wall pixels (label 0) in the field. */
  wallFraction: number;
}

/**
 * The grains wholly inside the field (no pixel on the field's border, none outside it), with their pixel
 * areas and bounding boxes.
 *
 * @param labels label image (0 wall, 1..count grains)
 * @param field analysed rectangle (whole px)
 */
export function insideGrains(labels: LabelImage, field: Rect): InsideGrains {
  checkLabelsAndField(labels, field);
  return insideGrainsOf(fieldCensus(labels, field));
}

/** {@link insideGrains} from a census of the field already taken. */
export function insideGrainsOf(c: FieldCensus): InsideGrains {
  const { field } = c;
  const res: InsideGrains = { labels: [], areaPx2: [], bboxW: [], bboxH: [], wallFraction: c.walls / ((field.x1 - field.x0) * (field.y1 - field.y0)) };
  for (let l = 1; l < c.interior.length; l++) {
    if (c.flags[l] || c.interior[l] === 0) continue;
    res.labels.push(l);
    res.areaPx2.push(c.interior[l]!);
    res.bboxW.push(c.bx1[l]! - c.bx0[l]! + 1);
    res.bboxH.push(c.by1[l]! - c.by0[l]! + 1);
  }
  return res;
}

/**
 * Miles–Lantuéjoul weight of a grain kept because it lies wholly inside a W₁ × W₂ field:
 * w = W₁W₂ / ((W₁ − b₁)(W₂ − b₂)), b₁ × b₂ its bounding box. The weighted mean Σwᵢaᵢ/Σwᵢ is unbiased for the
 * number-weighted mean area, where the plain mean of the inside grains is biased against large grains.
 * (Miles 1974, On the elimination of edge effects in planar sampling; Lantuéjoul 1978.)
 *
 * @param W1 field width (px); @param W2 field height (px); @param b1 bbox width (px); @param b2 bbox height (px)
 * @returns the weight (Infinity when the box spans the field)
 */
export function milesLantuejoulWeight(W1: number, W2: number, b1: number, b2: number): number {
  const d = (W1 - b1) * (W2 - b2);
  return d > 0 ? (W1 * W2) / d : Infinity;
}

/** The most bins a per-grain G histogram may have (250 G units at the default 0.25). */
export const MAX_G_BINS = 1000;

/**
 * Histogram of per-grain G, G = −3.3223·log₁₀ a − 2.955 with a the grain's area in mm² (the mean-area form
 * of ASTM E1382 applied to each grain), in bins of `binG` G units aligned to multiples of binG.
 *
 * @param areasMm2 grain areas (mm²)
 * @param binG bin width (G units), default 0.25
 * @throws CalibrationError when an area gives no finite G (0 or infinite: a pixel size far outside the
 *   plausible band) or the G values span {@link MAX_G_BINS} bins or more; SettingsError for a bad bin width
 */
export function gHistogram(areasMm2: readonly number[], binG = 0.25): GBin[] {
  if (areasMm2.length === 0) return [];
  if (!(binG > 0) || !Number.isFinite(binG)) throw new SettingsError(`The bin width of the per-grain G histogram must be a positive number; got ${binG}.`);
  const g = areasMm2.map(gFromMeanArea);
  let gLo = Infinity;
  let gHi = -Infinity;
  for (const v of g) {
    if (!Number.isFinite(v)) {
      throw new CalibrationError(`A grain's area (${areasMm2[g.indexOf(v)]} mm²) gives no finite grain size number; check the pixel size (${PIXEL_SIZE_BAND}) in the Scale panel or with --um-per-px.`);
    }
    if (v < gLo) gLo = v;
    if (v > gHi) gHi = v;
  }
  const lo = Math.floor(gLo / binG);
  const hi = Math.floor(gHi / binG);
  // Grains of one image span a few tens of G units (a 1 px grain and one of 10⁸ px are 27 G apart).
  if (hi - lo >= MAX_G_BINS) {
    throw new CalibrationError(`The grains' sizes span G ${gLo.toPrecision(3)} to ${gHi.toPrecision(3)}, more than any image holds; check the pixel size (${PIXEL_SIZE_BAND}) in the Scale panel or with --um-per-px.`);
  }
  const bins: GBin[] = [];
  for (let k = lo; k <= hi; k++) bins.push({ g0: k * binG, g1: (k + 1) * binG, count: 0, areaFraction: 0 });
  let total = 0;
  for (const a of areasMm2) total += a;
  g.forEach((gi, i) => {
    const b = bins[Math.floor(gi / binG) - lo]!;
    b.count++;
    b.areaFraction += areasMm2[i]! / total;
  });
  return bins;
}

/** Verdict of the two-population check on per-grain G. */
export interface DuplexCheck {
  duplex: boolean;
  /** G at which the two populations split, and their mean G and share of grains and of area. */
  split: number | null;
  fine: { gMean: number; grainShare: number; areaShare: number } | null;
  coarse: { gMean: number; grainShare: number; areaShare: number } | null;
  note: string;
}

/**
 * Looks for two populations of grain size (a duplex or bimodal structure) in per-grain G values.
 *
 * The values are split in two at the threshold that maximises the between-class variance (Otsu 1979,
 * A threshold selection method from gray-level histograms, applied to G instead of grey levels). The
 * structure is flagged when the two class means differ by at least `minGapG` G units (default 2, i.e. a
 * fourfold ratio of mean areas) and the smaller class holds at least 5 % of the grains or 10 % of the area.
 * This is a prompt to look, trade practice rather than a rule of the standard; a single broad population
 * (a random tessellation spreads per-grain G with a standard deviation near 0.8) splits into classes about
 * 1.3 G apart and is not flagged.
 *
 * @param g per-grain G values
 * @param areas per-grain areas (any unit), same order
 * @param minGapG smallest gap between the class means that is flagged (G units)
 */
export function duplexCheck(g: readonly number[], areas: readonly number[], minGapG = 2): DuplexCheck {
  const n = g.length;
  const none = (note: string): DuplexCheck => ({ duplex: false, split: null, fine: null, coarse: null, note });
  if (n < 10) return none('Too few grains to look for two populations (fewer than 10).');
  const idx = [...g.keys()].sort((a, b) => g[a]! - g[b]!);
  const sorted = idx.map((i) => g[i]!);
  const total = sorted.reduce((s, v) => s + v, 0);
  let best = -1;
  let bestK = -1;
  let cum = 0;
  for (let k = 1; k < n; k++) {
    cum += sorted[k - 1]!;
    if (sorted[k] === sorted[k - 1]) continue;
    const m1 = cum / k;
    const m2 = (total - cum) / (n - k);
    const v = k * (n - k) * (m1 - m2) ** 2;
    if (v > best) {
      best = v;
      bestK = k;
    }
  }
  if (bestK < 0) return none('All grains have the same size: one population.');
  const areaTotal = areas.reduce((s, v) => s + v, 0);
  const cls = (from: number, to: number) => {
    let sg = 0;
    let sa = 0;
    for (let k = from; k < to; k++) {
      sg += sorted[k]!;
      sa += areas[idx[k]!]!;
    }
    return { gMean: sg / (to - from), grainShare: (to - from) / n, areaShare: sa / areaTotal };
  };
  // Low G = large grains = coarse.
  const coarse = cls(0, bestK);
  const fine = cls(bestK, n);
  const split = (sorted[bestK - 1]! + sorted[bestK]!) / 2;
  const gap = fine.gMean - coarse.gMean;
  const minor = coarse.grainShare < fine.grainShare ? coarse : fine;
  const duplex = gap >= minGapG && (minor.grainShare >= 0.05 || minor.areaShare >= 0.1);
  const note = duplex
    ? `Two grain size populations: coarse about G ${coarse.gMean.toFixed(1)} (${(100 * coarse.areaShare).toFixed(0)} % of the area) and fine about G ${fine.gMean.toFixed(1)} (${(100 * fine.areaShare).toFixed(0)} % of the area); a single average G does not describe a duplex structure, rate the populations separately.`
    : `One grain size population (the best two-way split is ${gap.toFixed(1)} G apart, below ${minGapG}).`;
  return { duplex, split, fine, coarse, note };
}
