/**
 * Published constants of the planar Poisson–Voronoi tessellation (seeds of intensity λ: "random
 * seeding"), for an infinite plane. A finite field with excluded edge cells biases every one of them,
 * which is why the verdict rests on the Monte Carlo reference (montecarlo.ts); these stand beside it.
 *
 * Status as in the project's check-value table: pub = published, derived = follows from a definition;
 * "memory" = the figure is recalled, not read from the text, so tests use tolerances a last-digit slip
 * cannot break.
 */

/** A published value with its source. */
export interface PublishedValue {
  value: number;
  source: string;
  /** pub = published; derived = follows from a definition; trade = common practice; monte carlo = a stated simulation, not published. */
  status: 'pub' | 'derived' | 'trade' | 'monte carlo';
  note?: string;
}

/** Mean cell area times λ: exactly 1 (one cell per seed). derived. */
export const PV_MEAN_AREA: PublishedValue = { value: 1, source: 'one cell per seed', status: 'derived' };

/**
 * Mean perimeter times √λ: 4.
 * Meijering 1953, "Interface area, edge length, and number of vertices in crystal aggregates with random
 * nucleation", Philips Res. Rep. 8:270. pub, memory.
 */
export const PV_MEAN_PERIMETER: PublishedValue = { value: 4, source: 'Meijering 1953, Philips Res. Rep. 8:270', status: 'pub', note: 'memory' };

/** Mean number of sides: exactly 6 for a trivalent planar network (Euler's relation). derived. */
export const PV_MEAN_SIDES: PublishedValue = { value: 6, source: "Euler's relation, trivalent vertices", status: 'derived' };

/**
 * Variance of the normalised cell area A·λ: 0.2802.
 * Gilbert 1962, "Random subdivisions of space into crystals", Ann. Math. Stat. 33:958; Brakke 1987.
 * pub, memory.
 */
export const PV_AREA_VARIANCE: PublishedValue = { value: 0.2802, source: 'Gilbert 1962, Ann. Math. Stat. 33:958; Brakke 1987', status: 'pub', note: 'memory' };

/** Coefficient of variation of the cell area: √0.2802 = 0.529. derived. */
export const PV_AREA_CV: PublishedValue = { value: Math.sqrt(0.2802), source: 'square root of the area variance', status: 'derived' };

/**
 * Shape (= rate) of the gamma law fitted to the normalised area: 7/2, f(y) = C·y^{5/2}·e^{−7y/2}.
 * Ferenc & Néda 2007, "On the size distribution of Poisson Voronoi cells", Physica A 385:518.
 * pub, read in text. (The method-of-moments shape is 1/0.2802 = 3.57, close to it.)
 */
export const PV_AREA_GAMMA_SHAPE: PublishedValue = { value: 3.5, source: 'Ferenc & Néda 2007, Physica A 385:518', status: 'pub', note: 'read in text' };

/**
 * Variance of the side number μ₂: 1.781. Brakke 1987; Hilhorst 2007. pub, memory.
 */
export const PV_SIDES_VARIANCE: PublishedValue = { value: 1.781, source: 'Brakke 1987; Hilhorst 2007', status: 'pub', note: 'memory' };

/**
 * Side-number distribution p(n), n = 3..10.
 * p(3): Hayen & Quine 2000; p(4)..p(7): Hilhorst 2007 (Monte Carlo), p(6) also the exact series of
 * Calka 2003, Adv. Appl. Prob. 35:863; p(8)..p(10): same, loose. All pub, memory.
 */
export const PV_SIDES_DISTRIBUTION: Readonly<Record<number, PublishedValue>> = {
  3: { value: 0.011244, source: 'Hayen & Quine 2000', status: 'pub', note: 'memory' },
  4: { value: 0.10684, source: 'Hilhorst 2007 (Monte Carlo)', status: 'pub', note: 'memory' },
  5: { value: 0.25947, source: 'Hilhorst 2007 (Monte Carlo)', status: 'pub', note: 'memory' },
  6: { value: 0.294667, source: 'Hilhorst 2007; Calka 2003, Adv. Appl. Prob. 35:863', status: 'pub', note: 'memory' },
  7: { value: 0.19858, source: 'Hilhorst 2007 (Monte Carlo)', status: 'pub', note: 'memory' },
  8: { value: 0.09, source: 'Hilhorst 2007 (Monte Carlo)', status: 'pub', note: 'memory, loose' },
  9: { value: 0.0297, source: 'Hilhorst 2007 (Monte Carlo)', status: 'pub', note: 'memory, loose' },
  10: { value: 0.0075, source: 'Hilhorst 2007 (Monte Carlo)', status: 'pub', note: 'memory, loose' },
};

/**
 * Lewis's law for PV: the mean normalised area of n-sided cells rises by about 0.23 per side, tending to
 * 1/4 per side for large n. Hilhorst 2005, J. Stat. Mech. P09005. pub, read in text.
 */
export const PV_LEWIS_SLOPE: PublishedValue = { value: 0.23, source: 'Hilhorst 2005, J. Stat. Mech. P09005', status: 'pub', note: 'read in text' };

/**
 * Aboav–Weaire parameter a in m(n) = 6 − a + (6a + μ₂)/n for PV. The law is only approximately linear for
 * PV, and no published value of a fits it well (the often-quoted 0.7 does not), so the value here is a
 * stated Monte Carlo estimate, not a published one: least-squares fits over n = 3..12 of 190 000
 * Poisson–Voronoi cells (scipy's Qhull) gave 0.570; the project's own reference, 20 replicates of 10 000
 * seeds in a 4000 px square, edge cells excluded (192 827 cells; `tessellab reference --cells 10000
 * --size 4000x4000 --replicates 20 --seed 5`), gave 0.564 ± 0.004 (mean ± standard error of the replicates'
 * fits). Law: Aboav 1970, Metallography 3:383; Weaire 1974, Metallography 7:157.
 */
export const PV_ABOAV_A: PublishedValue = {
  value: 0.57, source: 'Monte Carlo: fits over n = 3..12 of about 190 000 Poisson–Voronoi cells (0.570 scipy Qhull; 0.564 this project)', status: 'monte carlo',
};

/**
 * Lemaître's law: μ₂·p(6)² = 1/(2π) for 0.34 < p(6) < 0.66 (outside PV's p(6) = 0.295, so a cross-check
 * for regular patterns). Lemaître et al. 1993, Phil. Mag. Lett. 67:347. pub, memory.
 */
export const LEMAITRE_CONSTANT: PublishedValue = { value: 1 / (2 * Math.PI), source: 'Lemaître et al. 1993, Phil. Mag. Lett. 67:347', status: 'pub', note: 'memory' };
export const LEMAITRE_RANGE: readonly [number, number] = [0.34, 0.66];

/**
 * Clark–Evans: mean nearest-neighbour distance of Poisson points r_e = 1/(2√λ), standard error
 * 0.26136/√(Nλ); the index R = r̄/r_e is 2.1491 for a hexagonal lattice. Clark & Evans 1954, Ecology
 * 35:445. pub, read in text.
 */
export const CLARK_EVANS_SE_FACTOR: PublishedValue = { value: 0.26136, source: 'Clark & Evans 1954, Ecology 35:445', status: 'pub', note: 'read in text' };
export const CLARK_EVANS_HEXAGONAL: PublishedValue = { value: 2.1491, source: 'Clark & Evans 1954, Ecology 35:445', status: 'pub', note: 'read in text' };

/** All constants in one JSON-serialisable object, for summaries and the `reference` command. */
export function publishedConstants(): Record<string, PublishedValue | Record<number, PublishedValue>> {
  return {
    meanAreaTimesLambda: PV_MEAN_AREA,
    meanPerimeterTimesSqrtLambda: PV_MEAN_PERIMETER,
    meanSides: PV_MEAN_SIDES,
    areaVariance: PV_AREA_VARIANCE,
    areaCv: PV_AREA_CV,
    areaGammaShape: PV_AREA_GAMMA_SHAPE,
    sidesVariance: PV_SIDES_VARIANCE,
    sidesDistribution: { ...PV_SIDES_DISTRIBUTION },
    lewisSlope: PV_LEWIS_SLOPE,
    aboavA: PV_ABOAV_A,
    lemaitre: LEMAITRE_CONSTANT,
    clarkEvansHexagonal: CLARK_EVANS_HEXAGONAL,
  };
}
