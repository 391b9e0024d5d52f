/**
 * The statistics of one cell pattern, computed the same way for an observation and for every replicate
 * of the random-seeding reference (so the two can be compared without bias): which cells enter and with
 * what weight (edge rule, minimum area), side numbers, normalised areas, Lewis's law, the Aboav–Weaire law,
 * Clark–Evans and the L-function of the points.
 */
import type { EdgeRule } from '../settings';
import type { Rect } from '../types';
import { digamma, trigamma } from './dist';
import { nearestNeighbourDistances } from './grid';
import { sortPositive } from './sort';

export { lFunction, lRadii } from './lfunction';

/** Side numbers are counted in bins 0..MAX_SIDES; the last bin holds every cell with MAX_SIDES sides or more. */
export const MAX_SIDES = 20;

/** The cells that enter the statistics and their weights. */
export interface CellSample {
  /** 0-based cell indices. */
  index: Int32Array;
  /** Weight of each entry of `index` (1 under 'exclude'; Miles–Lantuéjoul factor under 'weight'). */
  weight: Float64Array;
  weightSum: number;
}

/**
 * Selects the cells for distribution statistics: interior cells (edge = 0) with area ≥ minCellAreaPx.
 * Under 'weight' each gets the Miles–Lantuéjoul factor W·H / ((W − b₁)(H − b₂)), b₁ × b₂ its bounding box,
 * which undoes the bias against large cells that excluding border cells introduces (Miles 1974;
 * Lantuéjoul 1978; pub, memory). Cells whose box is as wide or tall as the field cannot be weighted and
 * are left out.
 *
 * @param area per-cell area (px²)
 * @param edge per-cell 1 if the cell touches the field border
 * @param bbox per-cell bounding box x0, y0, x1, y1 (px), 4 per cell; needed for 'weight'
 * @param field the field (px)
 */
export function cellSample(area: Float64Array, edge: Uint8Array, bbox: Float64Array | null, field: Rect, edgeRule: EdgeRule, minCellAreaPx: number): CellSample {
  const n = area.length;
  const W = field.x1 - field.x0;
  const H = field.y1 - field.y0;
  const idx = new Int32Array(n);
  const w = new Float64Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    if (edge[i] || !(area[i]! >= minCellAreaPx) || !(area[i]! > 0)) continue;
    let weight = 1;
    if (edgeRule === 'weight' && bbox) {
      const b1 = bbox[4 * i + 2]! - bbox[4 * i]!;
      const b2 = bbox[4 * i + 3]! - bbox[4 * i + 1]!;
      if (!(b1 < W && b2 < H)) continue;
      weight = (W * H) / ((W - b1) * (H - b2));
    }
    idx[m] = i;
    w[m++] = weight;
  }
  let weightSum = 0;
  for (let k = 0; k < m; k++) weightSum += w[k]!;
  return { index: idx.slice(0, m), weight: w.slice(0, m), weightSum };
}

/** Side-number statistics of a cell sample. */
export interface SideStats {
  /** p[n] = (weighted) fraction of cells with n sides, n = 0..MAX_SIDES. */
  p: Float64Array;
  mean: number;
  /** Variance of the side number, μ₂ = ⟨(n − ⟨n⟩)²⟩. */
  mu2: number;
  p6: number;
  /** Lemaître's combination μ₂·p(6)². */
  lemaitre: number;
}

/** Distribution, mean and variance μ₂ of the side numbers of the sample. */
export function sideStats(sides: Int32Array, s: CellSample): SideStats {
  const p = new Float64Array(MAX_SIDES + 1);
  let m1 = 0;
  let m2 = 0;
  for (let k = 0; k < s.index.length; k++) {
    const n = sides[s.index[k]!]!;
    const w = s.weight[k]!;
    p[Math.min(MAX_SIDES, n)]! += w;
    m1 += w * n;
    m2 += w * n * n;
  }
  const W = s.weightSum;
  if (!(W > 0)) return { p, mean: Number.NaN, mu2: Number.NaN, p6: Number.NaN, lemaitre: Number.NaN };
  for (let n = 0; n <= MAX_SIDES; n++) p[n] = p[n]! / W;
  const mean = m1 / W;
  const mu2 = m2 / W - mean * mean;
  return { p, mean, mu2, p6: p[6]!, lemaitre: mu2 * p[6]! * p[6]! };
}

/** Statistics of the areas normalised by their (weighted) mean. */
export interface AreaStats {
  /** Weighted mean area (px²). */
  mean: number;
  /** Variance of the normalised area y = A / mean. */
  variance: number;
  /** Coefficient of variation (= √variance). */
  cv: number;
  /** Maximum-likelihood shape of a gamma law fitted to y (its rate equals the shape since ⟨y⟩ = 1). */
  gammaShape: number;
  /** Normalised areas sorted ascending. */
  sorted: Float64Array;
  /** Cumulative weight fraction up to and including each sorted value (the ECDF at it). */
  cumulative: Float64Array;
}

/**
 * Normalised areas y = A/Ā of the sample, their variance and coefficient of variation, and the gamma
 * maximum-likelihood shape: k solves ln k − ψ(k) = ln⟨y⟩ − ⟨ln y⟩, started at Minka's closed form and
 * refined by Newton steps on 1/k (Minka 2002, "Estimating a gamma distribution", tech. note; pub, memory).
 */
export function areaStats(area: Float64Array, s: CellSample): AreaStats {
  const m = s.index.length;
  let sum = 0;
  for (let k = 0; k < m; k++) sum += s.weight[k]! * area[s.index[k]!]!;
  const mean = sum / s.weightSum;
  const order = new Float64Array(2 * m);
  let v = 0;
  let logSum = 0;
  for (let k = 0; k < m; k++) {
    const y = area[s.index[k]!]! / mean;
    const w = s.weight[k]!;
    v += w * (y - 1) * (y - 1);
    logSum += w * Math.log(y);
    order[2 * k] = y;
    order[2 * k + 1] = w;
  }
  const variance = v / s.weightSum;
  let equal = true;
  for (let k = 1; k < m && equal; k++) equal = s.weight[k] === s.weight[0];
  let sorted: Float64Array;
  const cumulative = new Float64Array(m);
  if (equal) {
    // Equal weights (the 'exclude' rule): a plain numeric sort is several times faster than an index sort,
    // and a radix sort of the (positive) values faster again.
    sorted = new Float64Array(m);
    for (let k = 0; k < m; k++) sorted[k] = order[2 * k]!;
    sortPositive(sorted);
    for (let k = 0; k < m; k++) cumulative[k] = (k + 1) / m;
  } else {
    sorted = new Float64Array(m);
    const perm = new Uint32Array(m);
    for (let k = 0; k < m; k++) perm[k] = k;
    perm.sort((a, b) => order[2 * a]! - order[2 * b]!);
    let c = 0;
    for (let k = 0; k < m; k++) {
      const j = perm[k]!;
      sorted[k] = order[2 * j]!;
      c += order[2 * j + 1]!;
      cumulative[k] = c / s.weightSum;
    }
  }
  const gap = -logSum / s.weightSum; // ln⟨y⟩ − ⟨ln y⟩ with ⟨y⟩ = 1
  return { mean, variance, cv: Math.sqrt(variance), gammaShape: m >= 2 ? gammaShapeMle(gap) : Number.NaN, sorted, cumulative };
}

/** Gamma ML shape k from s = ln(mean) − mean(ln x) > 0. */
export function gammaShapeMle(s: number): number {
  if (!(s > 0) || !Number.isFinite(s)) return Number.NaN;
  let k = (3 - s + Math.sqrt((s - 3) * (s - 3) + 24 * s)) / (12 * s);
  for (let it = 0; it < 8; it++) {
    const num = Math.log(k) - digamma(k) - s;
    const den = k * k * (1 / k - trigamma(k));
    const next = 1 / (1 / k + num / den);
    if (!(next > 0)) break;
    if (Math.abs(next - k) < 1e-12 * k) {
      k = next;
      break;
    }
    k = next;
  }
  return k;
}

/**
 * A distribution of normalised areas tabulated on a fine grid (bins of width `step` on [0, max]); its CDF
 * is linear within a bin. Used to pool the reference's replicates into one distribution to measure
 * Kolmogorov–Smirnov distances against.
 */
export class AreaCdfTable {
  readonly step: number;
  readonly bins: number;
  private readonly mass: Float64Array;
  private cdf: Float64Array | null = null;
  constructor(max = 8, step = 0.005) {
    this.step = step;
    this.bins = Math.ceil(max / step);
    this.mass = new Float64Array(this.bins + 1);
  }
  /** Adds a sample (sorted values with cumulative weight fractions) with total weight `weight`. */
  add(a: Pick<AreaStats, 'sorted' | 'cumulative'>, weight = 1): void {
    let prev = 0;
    for (let k = 0; k < a.sorted.length; k++) {
      const b = Math.min(this.bins, Math.floor(a.sorted[k]! / this.step));
      this.mass[b]! += (a.cumulative[k]! - prev) * weight;
      prev = a.cumulative[k]!;
    }
    this.cdf = null;
  }
  /** The pooled CDF at y. */
  at(y: number): number {
    if (!this.cdf) {
      const c = new Float64Array(this.bins + 2);
      let total = 0;
      for (let b = 0; b <= this.bins; b++) total += this.mass[b]!;
      for (let b = 0; b <= this.bins; b++) c[b + 1] = c[b]! + this.mass[b]! / (total || 1);
      this.cdf = c;
    }
    if (y <= 0) return 0;
    const u = y / this.step;
    const b = Math.floor(u);
    if (b >= this.bins) return this.cdf[this.bins]! + (this.cdf[this.bins + 1]! - this.cdf[this.bins]!) * Math.min(1, (u - this.bins) / this.bins);
    return this.cdf[b]! + (this.cdf[b + 1]! - this.cdf[b]!) * (u - b);
  }
}

/**
 * Kolmogorov–Smirnov distance sup |F_n(y) − F(y)| between a (weighted) sample and a continuous CDF:
 * max over sorted y_(k) of |F(y_(k)) − c_k| and |F(y_(k)) − c_{k−1}|, c the cumulative weight fractions.
 * (Kolmogorov 1933; Smirnov 1948; pub, memory.)
 */
export function ksDistance(a: Pick<AreaStats, 'sorted' | 'cumulative'>, F: (y: number) => number): number {
  let d = 0;
  let prev = 0;
  for (let k = 0; k < a.sorted.length; k++) {
    const f = F(a.sorted[k]!);
    const c = a.cumulative[k]!;
    const e = Math.max(Math.abs(f - c), Math.abs(f - prev));
    if (e > d) d = e;
    prev = c;
  }
  return a.sorted.length ? d : Number.NaN;
}

/** Weighted least-squares line y = intercept + slope·x with r². */
export interface LineFit {
  slope: number;
  intercept: number;
  r2: number;
}

/** Weighted least squares of y on x; NaN fields if fewer than 2 distinct x. */
export function weightedLine(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number>): LineFit {
  let sw = 0, sx = 0, sy = 0;
  for (let i = 0; i < x.length; i++) {
    sw += w[i]!;
    sx += w[i]! * x[i]!;
    sy += w[i]! * y[i]!;
  }
  const mx = sx / sw;
  const my = sy / sw;
  let sxx = 0, sxy = 0, syy = 0;
  for (let i = 0; i < x.length; i++) {
    const dx = x[i]! - mx;
    const dy = y[i]! - my;
    sxx += w[i]! * dx * dx;
    sxy += w[i]! * dx * dy;
    syy += w[i]! * dy * dy;
  }
  if (!(sxx > 1e-12 * sw)) return { slope: Number.NaN, intercept: Number.NaN, r2: Number.NaN };
  const slope = sxy / sxx;
  return { slope, intercept: my - slope * mx, r2: syy > 0 ? (sxy * sxy) / (sxx * syy) : 1 };
}

/** A per-side-class law: class values, their weights and a line fit. */
export interface ClassLaw {
  /** Side numbers n of the classes used (at least `minCount` cells each). */
  n: number[];
  /** Class means (normalised area for Lewis; mean neighbour side number for Aboav–Weaire). */
  value: number[];
  /** Number of cells in each class. */
  count: number[];
  fit: LineFit;
}

/** Classes with fewer cells than this are shown but left out of the fits. */
export const MIN_CLASS_COUNT = 3;

/**
 * Lewis's law: mean normalised area ā(n) of n-sided cells against n, and its weighted line fit
 * (weights = class weight). (Lewis 1928, Anat. Rec. 38:341; pub, memory.)
 */
export function lewisLaw(sides: Int32Array, area: Float64Array, s: CellSample, meanArea: number): ClassLaw {
  const sumW = new Float64Array(MAX_SIDES + 1);
  const sumA = new Float64Array(MAX_SIDES + 1);
  const cnt = new Int32Array(MAX_SIDES + 1);
  for (let k = 0; k < s.index.length; k++) {
    const i = s.index[k]!;
    const n = Math.min(MAX_SIDES, sides[i]!);
    sumW[n]! += s.weight[k]!;
    sumA[n]! += (s.weight[k]! * area[i]!) / meanArea;
    cnt[n]!++;
  }
  return classLaw(sumW, sumA, cnt, (n) => n);
}

/**
 * Aboav–Weaire law: m(n), the mean side number of the neighbours of n-sided cells, against 1/n, fitted
 * as m(n) = α + β/n; the parameter a = 6 − α (m(n) = 6 − a + (6a + μ₂)/n). Neighbours that are edge
 * cells are left out of m, their side numbers being cut by the border. (Aboav 1970; Weaire 1974,
 * Metallography 7:157; pub, memory.)
 */
export function aboavWeaireLaw(sides: Int32Array, edge: Uint8Array, offsets: Int32Array, neighbours: Int32Array, s: CellSample): ClassLaw & { a: number } {
  const sumW = new Float64Array(MAX_SIDES + 1);
  const sumM = new Float64Array(MAX_SIDES + 1);
  const cnt = new Int32Array(MAX_SIDES + 1);
  for (let k = 0; k < s.index.length; k++) {
    const i = s.index[k]!;
    let tot = 0;
    let c = 0;
    for (let q = offsets[i]!; q < offsets[i + 1]!; q++) {
      const j = neighbours[q]!;
      if (edge[j]) continue;
      tot += sides[j]!;
      c++;
    }
    if (!c) continue;
    const n = Math.min(MAX_SIDES, sides[i]!);
    sumW[n]! += s.weight[k]!;
    sumM[n]! += (s.weight[k]! * tot) / c;
    cnt[n]!++;
  }
  const law = classLaw(sumW, sumM, cnt, (n) => 1 / n);
  return { ...law, a: 6 - law.fit.intercept };
}

function classLaw(sumW: Float64Array, sumV: Float64Array, cnt: Int32Array, xOf: (n: number) => number): ClassLaw {
  const n: number[] = [];
  const value: number[] = [];
  const count: number[] = [];
  const fx: number[] = [];
  const fy: number[] = [];
  const fw: number[] = [];
  for (let k = 1; k < MAX_SIDES; k++) {
    if (!cnt[k]) continue;
    n.push(k);
    value.push(sumV[k]! / sumW[k]!);
    count.push(cnt[k]!);
    if (cnt[k]! >= MIN_CLASS_COUNT) {
      fx.push(xOf(k));
      fy.push(sumV[k]! / sumW[k]!);
      fw.push(sumW[k]!);
    }
  }
  const fit = fx.length >= 2 ? weightedLine(fx, fy, fw) : { slope: Number.NaN, intercept: Number.NaN, r2: Number.NaN };
  return { n, value, count, fit };
}

/** Clark–Evans nearest-neighbour index of a point pattern. */
export interface ClarkEvans {
  n: number;
  /** Mean nearest-neighbour distance (px). */
  meanDistance: number;
  /** R = r̄ / r_e with r_e = 1/(2√λ), λ = n/A: no edge correction. */
  R: number;
  /** R with the edge-corrected expectation of Donnelly (1978); this is the index Tessellab reports. */
  Rcorrected: number;
  /** Standard error of R (corrected), from Donnelly's variance. */
  se: number;
  /** z = (Rcorrected − 1)/se; the normal-theory p-value goes with it. */
  z: number;
}

/**
 * Clark–Evans index of the points in a rectangular field, with the edge correction of Donnelly:
 * E[r̄] ≈ 0.5·√(A/N) + (0.0514 + 0.041/√N)·P/N and Var[r̄] ≈ 0.0703·A/N² + 0.037·P·√(A/N⁵), P the
 * field perimeter. Uncorrected: r_e = 1/(2√λ), se = 0.26136/√(Nλ).
 * (Clark & Evans 1954, Ecology 35:445, pub, read in text; Donnelly 1978, "Simulations to determine the
 * variance and edge effect of total nearest-neighbour distance", in Hodder (ed.), Simulation Studies in
 * Archaeology, pub, memory.) In a tissue mask (`window`): its area and perimeter for A and P, and the
 * points' nearest neighbours among themselves (all of them lie in the mask; `field` is a rectangle holding them).
 */
export function clarkEvans(points: Float64Array, field: Rect, graph?: { offsets: Int32Array; index: Int32Array }, window?: { area: number; perimeter: number }): ClarkEvans {
  const n = points.length / 2;
  const A = window ? window.area : (field.x1 - field.x0) * (field.y1 - field.y0);
  const P = window ? window.perimeter : 2 * (field.x1 - field.x0 + field.y1 - field.y0);
  if (n < 2) return { n, meanDistance: Number.NaN, R: Number.NaN, Rcorrected: Number.NaN, se: Number.NaN, z: Number.NaN };
  const d = graph ? graphNearestDistances(points, graph.offsets, graph.index) : nearestNeighbourDistances(points, field);
  let s = 0;
  for (let i = 0; i < n; i++) s += d[i]!;
  const mean = s / n;
  const re = 0.5 * Math.sqrt(A / n);
  const reCorr = re + (0.0514 + 0.041 / Math.sqrt(n)) * (P / n);
  const sd = Math.sqrt(0.0703 * (A / (n * n)) + 0.037 * P * Math.sqrt(A / n ** 5));
  const Rc = mean / reCorr;
  const se = sd / reCorr;
  return { n, meanDistance: mean, R: mean / re, Rcorrected: Rc, se, z: (Rc - 1) / se };
}

/**
 * Nearest-neighbour distances among graph neighbours only. Exact when the graph is the Voronoi neighbour
 * graph of the points clipped to a convex field: the midpoint between a point and its nearest neighbour
 * lies in the field and on their common Voronoi edge.
 */
export function graphNearestDistances(points: Float64Array, offsets: Int32Array, index: Int32Array): Float64Array {
  const n = points.length / 2;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = points[2 * i]!;
    const y = points[2 * i + 1]!;
    let best = Infinity;
    for (let q = offsets[i]!; q < offsets[i + 1]!; q++) {
      const j = index[q]!;
      const dx = points[2 * j]! - x;
      const dy = points[2 * j + 1]! - y;
      const d2 = dx * dx + dy * dy;
      if (d2 < best) best = d2;
    }
    out[i] = Math.sqrt(best);
  }
  return out;
}
