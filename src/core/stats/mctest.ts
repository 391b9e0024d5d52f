/**
 * Monte Carlo tests of an observation against the replicates of its reference: one statistic's rank p-value,
 * and the combined test of several by their largest standardised departure.
 */

/**
 * Monte Carlo p-value of an observed value t among finite replicate values: two-sided
 * min(1, 2·min(1 + #{T ≥ t}, 1 + #{T ≤ t})/(R + 1)), or upper-tail (1 + #{T ≥ t})/(R + 1).
 * (Barnard 1963; Besag & Diggle 1977, Appl. Stat. 26:327; pub, memory.)
 */
export function monteCarloP(t: number, values: ArrayLike<number>, tail: 'two' | 'upper'): number | null {
  if (!Number.isFinite(t)) return null;
  let R = 0;
  let ge = 0;
  let le = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!Number.isFinite(v)) continue;
    R++;
    if (v >= t) ge++;
    if (v <= t) le++;
  }
  if (!R) return null;
  if (tail === 'upper') return (1 + ge) / (R + 1);
  return Math.min(1, (2 * Math.min(1 + ge, 1 + le)) / (R + 1));
}

/**
 * Combined Monte Carlo test of several signed statistics by their largest standardised departure: with the
 * mean and sd of each statistic over all R + 1 patterns (the observed one and the replicates,
 * exchangeable under random seeding), T = max_s |x_s − mean_s| / sd_s, and the p-value is the observed T's
 * rank among the R + 1 values of T, (#{T_j ≥ T_obs}) / (R + 1). Being a symmetric function of the R + 1
 * patterns, T keeps the test exactly at its nominal size whatever the dependence between the statistics,
 * and unlike a smallest-rank combination it has no ties that would make it coarse.
 * (Besag & Diggle 1977, Appl. Stat. 26:327, for the Monte Carlo test; the maximum of standardised
 * statistics is a usual global-envelope form, Myllymäki et al. 2017, J. R. Stat. Soc. B 79:381; pub, memory.)
 *
 * @param observed observed value of each statistic
 * @param replicates replicate values of each statistic (same length R each); replicates with any
 *   non-finite value are dropped
 * @returns the combined p-value, the index of the statistic with the largest observed departure, and
 *   each statistic's own two-sided rank p-value
 */
export function combinedMaxZ(observed: number[], replicates: ArrayLike<number>[]): { p: number; strongest: number; pEach: number[] } | null {
  const S = observed.length;
  if (!S) return null;
  const R0 = replicates[0]!.length;
  const keep: number[] = [];
  for (let r = 0; r < R0; r++) if (replicates.every((v) => Number.isFinite(v[r]!))) keep.push(r);
  const N = keep.length + 1;
  if (N < 3) return null;
  const T = new Float64Array(N);
  const zObs: number[] = [];
  const pEach: number[] = [];
  for (let s = 0; s < S; s++) {
    const v = new Float64Array(N);
    keep.forEach((r, j) => (v[j] = replicates[s]![r]!));
    v[N - 1] = observed[s]!;
    let mean = 0;
    for (let j = 0; j < N; j++) mean += v[j]!;
    mean /= N;
    let sd = 0;
    for (let j = 0; j < N; j++) sd += (v[j]! - mean) ** 2;
    sd = Math.sqrt(sd / (N - 1)) || 1;
    for (let j = 0; j < N; j++) {
      const z = Math.abs(v[j]! - mean) / sd;
      if (z > T[j]!) T[j] = z;
    }
    zObs.push(Math.abs(v[N - 1]! - mean) / sd);
    pEach.push(monteCarloP(observed[s]!, v.subarray(0, N - 1), 'two')!);
  }
  let count = 0;
  for (let j = 0; j < N; j++) if (T[j]! >= T[N - 1]!) count++;
  let strongest = 0;
  for (let s = 1; s < S; s++) if (zObs[s]! > zObs[strongest]!) strongest = s;
  return { p: count / N, strongest, pEach };
}
