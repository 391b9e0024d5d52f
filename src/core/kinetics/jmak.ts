/**
 * The JMAK (Johnson–Mehl–Avrami–Kolmogorov) law in the one convention Tessellab uses:
 * f(t) = 1 − exp(−k·(t − t0)ⁿ) for t > t0, else 0. k has units time⁻ⁿ. Some texts write
 * f = 1 − exp(−(K·t)ⁿ); then K = k^{1/n} (units time⁻¹), which is printed beside k.
 */

/** The convention, as printed in every result. */
export const JMAK_CONVENTION = 'f = 1 − exp(−k·(t − t0)^n); K = k^(1/n) for the form f = 1 − exp(−(K·(t − t0))^n)';

/**
 * Transformed fraction of the JMAK law.
 *
 * f = 1 − exp(−k·(t − t0)ⁿ) for t > t0, 0 otherwise
 * (Avrami 1939, "Kinetics of phase change. I", J. Chem. Phys. 7:1103; Johnson & Mehl 1939).
 *
 * @param t time (any unit; the same unit as t0 and 1/k^{1/n})
 * @param n Avrami exponent (dimensionless)
 * @param k rate constant (time⁻ⁿ)
 * @param t0 incubation time (same unit as t), default 0
 */
export function jmak(t: number, n: number, k: number, t0 = 0): number {
  const u = t - t0;
  if (!(u > 0)) return 0;
  return -Math.expm1(-k * Math.pow(u, n));
}

/**
 * Half-time of the JMAK law, the time from t0 at which f = ½: t½ = (ln 2 / k)^{1/n}
 * (derived from the law; docs/check-values.md section 4). Add t0 for the clock time.
 *
 * @param n Avrami exponent
 * @param k rate constant (time⁻ⁿ)
 * @returns t½ in the time unit of k
 */
export function halfTime(n: number, k: number): number {
  return Math.pow(Math.LN2 / k, 1 / n);
}

/** K = k^{1/n} (time⁻¹), the rate of the form f = 1 − exp(−(K·t)ⁿ). */
export function rateK(n: number, k: number): number {
  return Math.pow(k, 1 / n);
}

/**
 * The Avrami plot coordinates of one frame: x = ln(t − t0), y = ln(−ln(1 − f)).
 * Returns null when t ≤ t0 or f is outside (0, 1), where the transform is undefined.
 */
export function avramiPoint(t: number, f: number, t0 = 0): { x: number; y: number } | null {
  const u = t - t0;
  if (!(u > 0) || !(f > 0) || !(f < 1)) return null;
  return { x: Math.log(u), y: Math.log(-Math.log1p(-f)) };
}
