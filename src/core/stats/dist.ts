/**
 * Distribution functions from jstat (a general-purpose statistics library) and the few special functions
 * the gamma fit needs. The one wrapper of jstat: every other module takes its distributions from here.
 */
// @ts-ignore -- jstat ships no type declarations; the functions used are typed below.
import jStatModule from 'jstat';

interface JStatLike {
  chisquare: { cdf(x: number, dof: number): number };
  gamma: { cdf(x: number, shape: number, scale: number): number; pdf(x: number, shape: number, scale: number): number };
  normal: { cdf(x: number, mean: number, sd: number): number };
  studentt: { inv(p: number, dof: number): number };
}
const jStat = jStatModule as unknown as JStatLike;

/** Upper tail P(X ≥ x) of the chi-square law with `dof` degrees of freedom. */
export function chiSquareUpper(x: number, dof: number): number {
  if (!(dof > 0) || !Number.isFinite(x)) return Number.NaN;
  return Math.max(0, 1 - jStat.chisquare.cdf(x, dof));
}

/** Lower tail P(X ≤ x) of the chi-square law with `dof` degrees of freedom. */
export function chiSquareLower(x: number, dof: number): number {
  if (!(dof > 0) || !Number.isFinite(x)) return Number.NaN;
  return jStat.chisquare.cdf(x, dof);
}

/** Density of the gamma law with the given shape and rate (scale = 1 / rate). */
export function gammaPdf(x: number, shape: number, rate: number): number {
  return x <= 0 ? 0 : jStat.gamma.pdf(x, shape, 1 / rate);
}

/** CDF of the gamma law with the given shape and rate (scale = 1 / rate). */
export function gammaCdf(x: number, shape: number, rate: number): number {
  return x <= 0 ? 0 : jStat.gamma.cdf(x, shape, 1 / rate);
}

/**
 * The two-sided 95 % Student-t quantile t(0.975, dof), or NaN when dof < 1.
 * @param dof degrees of freedom
 */
export function t975(dof: number): number {
  if (!(dof >= 1)) return Number.NaN;
  return jStat.studentt.inv(0.975, dof);
}

/** Two-sided normal p-value of a z score. */
export function normalTwoSided(z: number): number {
  if (!Number.isFinite(z)) return Number.NaN;
  return 2 * (1 - jStat.normal.cdf(Math.abs(z), 0, 1));
}

/**
 * Digamma ψ(x) for x > 0: recurrence up to x ≥ 10, then the asymptotic series
 * ψ(x) ≈ ln x − 1/(2x) − 1/(12x²) + 1/(120x⁴) − 1/(252x⁶) + 1/(240x⁸) − 1/(132x¹⁰)
 * (Abramowitz & Stegun 1964, 6.3.18; pub, memory).
 */
export function digamma(x: number): number {
  let r = 0;
  while (x < 10) {
    r -= 1 / x;
    x += 1;
  }
  const f = 1 / (x * x);
  return r + Math.log(x) - 0.5 / x - f * (1 / 12 - f * (1 / 120 - f * (1 / 252 - f * (1 / 240 - f / 132))));
}

/**
 * Trigamma ψ'(x) for x > 0: recurrence up to x ≥ 10, then
 * ψ'(x) ≈ 1/x + 1/(2x²) + 1/(6x³) − 1/(30x⁵) + 1/(42x⁷) − 1/(30x⁹) (Abramowitz & Stegun 1964, 6.4.12; pub, memory).
 */
export function trigamma(x: number): number {
  let r = 0;
  while (x < 10) {
    r += 1 / (x * x);
    x += 1;
  }
  const f = 1 / (x * x);
  return r + 1 / x + f / 2 + (f / x) * (1 / 6 - f * (1 / 30 - f * (1 / 42 - f / 30)));
}
