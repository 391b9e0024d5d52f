/**
 * The one list of pattern statistics. Each entry says what the statistic is (key, label, unit, formula and
 * source), which tail of its reference distribution reads "regular", the published value it is compared
 * with (or none), and how it is computed. The observation, every Monte Carlo replicate, the tests table,
 * the verdict, summary.json, the Randomness panel and the README's list of keys read this list, so a
 * statistic exists in one place only. Adding one is one entry here plus its test (DEVELOPERS.md).
 */
import {
  PV_ABOAV_A, PV_AREA_CV, PV_AREA_GAMMA_SHAPE, PV_AREA_VARIANCE, PV_LEWIS_SLOPE, PV_MEAN_PERIMETER, PV_MEAN_SIDES, PV_SIDES_DISTRIBUTION,
  PV_SIDES_VARIANCE, LEMAITRE_CONSTANT, type PublishedValue,
} from '../reference/constants';
import type { AreaStats, CellSample, ClarkEvans, ClassLaw, SideStats } from './pattern';
import { MAX_SIDES, ksDistance } from './pattern';

/** The figures of one pattern (an observation or one replicate) from which first-pass statistics are read. */
export interface PatternFigures {
  sample: CellSample;
  /** Side statistics of the sample; null when the sample is empty. */
  sides: SideStats | null;
  /** Normalised-area statistics of the sample; null when the sample is empty. */
  areas: AreaStats | null;
  clarkEvans: ClarkEvans;
  lewis: ClassLaw | null;
  aboav: (ClassLaw & { a: number }) | null;
  /** Weighted mean perimeter × √λ (replicates only: an observation's cells are not Voronoi cells); NaN when absent. */
  meanPerimeterScaled: number;
}

/** What a second-pass statistic reads of one pattern: its curves, measured against the reference's mean curves. */
export interface PatternCurves {
  /** Side distribution p(n), n = 0..MAX_SIDES. */
  sidesP: ArrayLike<number>;
  /** Cells in the sample. */
  cells: number;
  /** Sorted normalised areas and cumulative weight fractions; null when the sample is empty. */
  areas: Pick<AreaStats, 'sorted' | 'cumulative'> | null;
  /** L(r) − r at the reference's radii. */
  l: ArrayLike<number>;
}

/** The reference's mean curves that second-pass statistics measure distances to. */
export interface ReferenceCurves {
  sidesMean: ArrayLike<number>;
  /** Pooled normalised-area CDF of all replicates. */
  areaCdf: (y: number) => number;
  lMean: ArrayLike<number>;
}

interface StatisticBase {
  /** Key in summary.json (randomness.tests[].key) and in the reference's values. */
  key: string;
  /** What users read. */
  label: string;
  unit: 'none' | 'px' | 'cells';
  /** The formula, in words and symbols. */
  formula: string;
  /** Where the statistic comes from (author, year, title), or "definition". */
  source: string;
  /** Tail of the Monte Carlo test: two-sided, or upper for distances. */
  tail: 'two' | 'upper';
  /** Which side of the reference means "more regular than random"; null when the statistic has no direction. */
  regular: 'low' | 'high' | null;
  /** The infinite-plane value for random seeding, with its source, or null where there is none. */
  published: PublishedValue | null;
  /** Shown in the tests table (and summary.json's randomness.tests). */
  table: boolean;
  /** One of the statistics the verdict's combined test rests on. */
  verdict: boolean;
  /** Needs at least MIN_INTERIOR_CELLS cells in the observation's sample (else not computed). */
  needsCells: boolean;
  /** A spacing statistic of the points (assumes an isotropic pattern; computed in the stretched frame for aligned cells). */
  spacing?: true;
  /** The published value holds only for this layout of the reference (e.g. seeds in the field, not a window). */
  publishedLayout?: 'seeds' | 'window';
}

/** A statistic read from a pattern's own figures. */
export interface FirstPassStatistic extends StatisticBase {
  pass: 1;
  compute(f: PatternFigures): number;
}

/** A distance of a pattern's curve to the reference's mean curve (needs the whole reference first). */
export interface SecondPassStatistic extends StatisticBase {
  pass: 2;
  compute(c: PatternCurves, ref: ReferenceCurves): number;
}

export type StatisticEntry = FirstPassStatistic | SecondPassStatistic;

/** Fractions of the side bins ≤4, 5, 6, 7, ≥8 of p(n), n = 0..MAX_SIDES. */
function sideBins(p: ArrayLike<number>): number[] {
  let low = 0;
  let high = 0;
  for (let n = 0; n <= 4; n++) low += p[n]!;
  for (let n = 8; n <= MAX_SIDES; n++) high += p[n]!;
  return [low, p[5]!, p[6]!, p[7]!, high];
}

/**
 * Pearson's X² of an observed side distribution p (fractions of `count` cells) against expected fractions
 * q, over the bins ≤4, 5, 6, 7, ≥8 (4 degrees of freedom when q is known). (Pearson 1900; pub, memory.)
 */
export function sidesChiSquare(p: ArrayLike<number>, count: number, q: ArrayLike<number>): number {
  const o = sideBins(p);
  const e = sideBins(q);
  let x2 = 0;
  for (let b = 0; b < 5; b++) {
    if (e[b]! > 0) x2 += (count * (o[b]! - e[b]!) ** 2) / e[b]!;
  }
  return x2;
}

/** max_k |a_k − b_k| over the finite pairs; NaN when there is none. */
export function maxDeviation(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let d = Number.NaN;
  for (let k = 0; k < a.length; k++) {
    const e = Math.abs(a[k]! - b[k]!);
    if (Number.isFinite(e) && !(e <= d)) d = e;
  }
  return d;
}

const NONE = Number.NaN;

/** The statistics: those of the tests table first, in its order. */
export const STATISTICS = [
  {
    key: 'mu2', label: 'side-number variance μ₂', unit: 'none', pass: 1, tail: 'two', regular: 'low', table: true, verdict: true, needsCells: true,
    formula: 'μ₂ = ⟨(n − ⟨n⟩)²⟩ over the cells in the statistics', source: 'Weaire & Rivier 1984, Contemp. Phys. 25:59',
    published: PV_SIDES_VARIANCE, compute: (f) => f.sides?.mu2 ?? NONE,
  },
  {
    key: 'p6', label: 'hexagon fraction p(6)', unit: 'none', pass: 1, tail: 'two', regular: 'high', table: true, verdict: false, needsCells: true,
    formula: 'p(6) = fraction of six-sided cells', source: 'definition', published: PV_SIDES_DISTRIBUTION[6]!, compute: (f) => f.sides?.p6 ?? NONE,
  },
  {
    key: 'meanSides', label: 'mean side number', unit: 'none', pass: 1, tail: 'two', regular: null, table: true, verdict: false, needsCells: true,
    formula: '⟨n⟩', source: "Euler's relation (6 on a trivalent network)", published: PV_MEAN_SIDES, compute: (f) => f.sides?.mean ?? NONE,
  },
  {
    key: 'sidesChiSquare', label: 'side distribution X² (bins ≤4, 5, 6, 7, ≥8)', unit: 'none', pass: 2, tail: 'upper', regular: null, table: true, verdict: false, needsCells: true,
    formula: 'X² = Σ (O − E)²/E over the bins, E from the reference mean p(n)', source: 'Pearson 1900', published: null,
    compute: (c, r) => (c.areas ? sidesChiSquare(c.sidesP, c.cells, r.sidesMean) : NONE),
  },
  {
    key: 'areaCv', label: 'area coefficient of variation', unit: 'none', pass: 1, tail: 'two', regular: 'low', table: true, verdict: true, needsCells: true,
    formula: 'CV = sd(A)/⟨A⟩ (weighted, population form)', source: 'definition', published: PV_AREA_CV, compute: (f) => f.areas?.cv ?? NONE,
  },
  {
    key: 'gammaShape', label: 'gamma shape of normalised areas', unit: 'none', pass: 1, tail: 'two', regular: 'high', table: true, verdict: false, needsCells: true,
    formula: 'maximum-likelihood shape k of a gamma law fitted to A/⟨A⟩', source: 'Minka 2002 (estimator); Ferenc & Néda 2007 (value)',
    published: PV_AREA_GAMMA_SHAPE, compute: (f) => f.areas?.gammaShape ?? NONE,
  },
  {
    key: 'ksDistance', label: 'Kolmogorov–Smirnov distance of normalised areas', unit: 'none', pass: 2, tail: 'upper', regular: null, table: true, verdict: false, needsCells: true,
    formula: 'sup |F_n(y) − F(y)|, F the pooled reference distribution', source: 'Kolmogorov 1933; Smirnov 1948', published: null,
    compute: (c, r) => (c.areas ? ksDistance(c.areas, r.areaCdf) : NONE),
  },
  {
    key: 'clarkEvansR', label: 'Clark–Evans R (edge-corrected)', unit: 'none', pass: 1, spacing: true, tail: 'two', regular: 'high', table: true, verdict: true, needsCells: false,
    formula: 'R = r̄ / (0.5/√λ + (0.0514 + 0.041/√N)·P/N), Donnelly edge correction', source: 'Clark & Evans 1954, Ecology 35:445; Donnelly 1978',
    // R = 1 holds for Poisson points in the field (points, bodies); a walls window's centroids are not that.
    published: { value: 1, source: 'Clark & Evans 1954, Ecology 35:445', status: 'pub', note: 'read in text' }, publishedLayout: 'seeds',
    compute: (f) => f.clarkEvans.Rcorrected,
  },
  {
    key: 'lMaxDeviation', label: 'L-function maximum deviation (px)', unit: 'px', pass: 2, spacing: true, tail: 'upper', regular: null, table: true, verdict: false, needsCells: false,
    formula: 'max_r |L(r) − L̄(r)|, L̄ the reference mean', source: 'Besag 1977; Diggle 2003, Statistical Analysis of Spatial Point Patterns', published: null,
    compute: (c, r) => maxDeviation(c.l, r.lMean),
  },
  {
    key: 'lewisSlope', label: "Lewis's law slope", unit: 'none', pass: 1, tail: 'two', regular: null, table: true, verdict: false, needsCells: true,
    formula: 'slope of ⟨A_n⟩/⟨A⟩ against n (weighted least squares over classes of ≥ 3 cells)', source: 'Lewis 1928; Hilhorst 2005, J. Stat. Mech. P09005',
    published: PV_LEWIS_SLOPE, compute: (f) => f.lewis?.fit.slope ?? NONE,
  },
  {
    key: 'aboavA', label: 'Aboav–Weaire a', unit: 'none', pass: 1, tail: 'two', regular: null, table: true, verdict: false, needsCells: true,
    formula: 'a = 6 − intercept of n·m(n) against n, m(n) = mean sides of the neighbours of n-sided cells', source: 'Aboav 1970; Weaire 1974, Metallography 7:157',
    published: PV_ABOAV_A, compute: (f) => f.aboav?.a ?? NONE,
  },
  {
    key: 'areaVariance', label: 'variance of normalised areas', unit: 'none', pass: 1, tail: 'two', regular: 'low', table: false, verdict: false, needsCells: true,
    formula: 'Var(A/⟨A⟩)', source: 'definition', published: PV_AREA_VARIANCE, compute: (f) => f.areas?.variance ?? NONE,
  },
  {
    key: 'lewisIntercept', label: "Lewis's law intercept", unit: 'none', pass: 1, tail: 'two', regular: null, table: false, verdict: false, needsCells: true,
    formula: 'intercept of ⟨A_n⟩/⟨A⟩ against n', source: 'Lewis 1928', published: null, compute: (f) => f.lewis?.fit.intercept ?? NONE,
  },
  {
    key: 'lemaitre', label: 'Lemaître combination μ₂·p(6)²', unit: 'none', pass: 1, tail: 'two', regular: null, table: false, verdict: false, needsCells: true,
    formula: 'μ₂·p(6)²', source: 'Lemaître et al. 1993, Phil. Mag. Lett. 67:347', published: LEMAITRE_CONSTANT, compute: (f) => f.sides?.lemaitre ?? NONE,
  },
  {
    key: 'meanPerimeterScaled', label: 'mean perimeter × √λ', unit: 'none', pass: 1, tail: 'two', regular: null, table: false, verdict: false, needsCells: true,
    formula: '⟨P⟩·√λ of the Voronoi cells', source: 'Meijering 1953, Philips Res. Rep. 8:270', published: PV_MEAN_PERIMETER, compute: (f) => f.meanPerimeterScaled,
  },
  {
    key: 'interiorCells', label: 'cells in the statistics', unit: 'cells', pass: 1, tail: 'two', regular: null, table: false, verdict: false, needsCells: false,
    formula: 'count of the cells the edge rule and minimum area keep', source: 'definition', published: null, compute: (f) => f.sample.index.length,
  },
] as const satisfies readonly StatisticEntry[];

export type StatisticKey = (typeof STATISTICS)[number]['key'];

/** The keys in registry order. */
export const STATISTIC_KEYS: readonly StatisticKey[] = STATISTICS.map((s) => s.key);

/** The entry of a key. */
export function statistic(key: StatisticKey): StatisticEntry {
  return STATISTICS.find((s) => s.key === key)!;
}
