/** Field-to-field statistics of a grain size measurement, as the statistics section of ASTM E112 defines them. */
import { t975 } from '../stats/dist';

/** Mean, spread and 95 % confidence interval of n field values. null where n is too small to say. */
export interface Precision {
  /** Number of field values. */
  n: number;
  mean: number | null;
  /** Sample standard deviation (divisor n − 1). */
  sd: number | null;
  /** Student t quantile t(0.975, n − 1). */
  t: number | null;
  /** Half-width of the 95 % confidence interval of the mean, t·s/√n, in the unit of the values. */
  ci95: number | null;
  /** Relative accuracy, 100·CI/mean (%). */
  relativeAccuracyPct: number | null;
}

/**
 * Statistics of field measurements (N_A, N_L or ℓ̄ per field, or per test placement).
 *
 * mean x̄ = Σx/n; s = √(Σ(x − x̄)²/(n − 1)); 95 % CI = t·s/√n with t the two-sided 95 % quantile of Student's
 * t with n − 1 degrees of freedom; %RA = 100·CI/x̄. (ASTM E112, section on statistical analysis.)
 * The t quantile comes from jstat (stats/dist.ts).
 *
 * @param values field values, any one unit (at least 2 for a spread)
 */
export function precision(values: readonly number[]): Precision {
  const n = values.length;
  if (n === 0) return { n, mean: null, sd: null, t: null, ci95: null, relativeAccuracyPct: null };
  let sum = 0;
  for (const v of values) sum += v;
  const mean = sum / n;
  if (n < 2) return { n, mean, sd: null, t: null, ci95: null, relativeAccuracyPct: null };
  let ss = 0;
  for (const v of values) ss += (v - mean) ** 2;
  const sd = Math.sqrt(ss / (n - 1));
  const t = t975(n - 1);
  const ci95 = (t * sd) / Math.sqrt(n);
  const relativeAccuracyPct = mean !== 0 ? (100 * ci95) / mean : null;
  return { n, mean, sd, t, ci95, relativeAccuracyPct };
}
