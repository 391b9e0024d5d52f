/**
 * Monte Carlo tests of an observation against the replicates of its reference: one statistic's rank p-value,
 * and the combined test of several by their largest standardised departure and their agreement.
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
 * Combined Monte Carlo test of several signed statistics. With the mean and sd of each statistic over all
 * R + 1 patterns (the observed one and the replicates, exchangeable under random seeding), each pattern j
 * gets standardised departures z_sj = (x_sj − mean_s)/sd_s and two summaries: the largest departure
 * max_s |z_sj| (a usual global-envelope form), and, when the statistics' "regular" directions are given,
 * their agreement A_j = Σ_s d_s·z_sj with d_s = ±1 pointing every statistic towards "regular", itself
 * standardised over the R + 1 patterns. T_j is the larger of the two, and the p-value is the observed T's
 * rank among the R + 1 values, #{T_j ≥ T_obs}/(R + 1). Being a symmetric function of the R + 1 patterns, T
 * keeps the test exactly at its nominal size whatever the dependence between the statistics; the agreement
 * gives it power when several statistics depart a little in the same direction, the maximum when one
 * departs a lot. (Besag & Diggle 1977, Appl. Stat. 26:327, for the Monte Carlo test; Myllymäki et al. 2017,
 * J. R. Stat. Soc. B 79:381, for global envelopes; pub, memory.)
 *
 * @param observed observed value of each statistic
 * @param replicates replicate values of each statistic (same length R each); replicates with any
 *   non-finite value are dropped
 * @param regularSign per statistic +1 when larger values read "regular", −1 when smaller do (omit for no agreement term)
 * @returns the combined p-value, the index of the statistic with the largest observed departure, each
 *   statistic's own two-sided rank p-value, and the observed agreement (positive: towards "regular") and
 *   whether it, rather than one statistic, carried the test
 */
export function combinedMaxZ(
  observed: number[], replicates: ArrayLike<number>[], regularSign?: number[],
): { p: number; strongest: number; pEach: number[]; agreement: number | null; byAgreement: boolean } | null {
  const S = observed.length;
  if (!S) return null;
  const R0 = replicates[0]!.length;
  const keep: number[] = [];
  for (let r = 0; r < R0; r++) if (replicates.every((v) => Number.isFinite(v[r]!))) keep.push(r);
  const N = keep.length + 1;
  if (N < 3) return null;
  const T = new Float64Array(N);
  const A = new Float64Array(N);
  const zObs: number[] = [];
  const pEach: number[] = [];
  for (let s = 0; s < S; s++) {
    const v = new Float64Array(N);
    keep.forEach((r, j) => (v[j] = replicates[s]![r]!));
    v[N - 1] = observed[s]!;
    const [mean, sd] = meanAndSd(v);
    for (let j = 0; j < N; j++) {
      const z = (v[j]! - mean) / sd;
      if (Math.abs(z) > T[j]!) T[j] = Math.abs(z);
      if (regularSign) A[j]! += regularSign[s]! * z;
    }
    zObs.push(Math.abs(v[N - 1]! - mean) / sd);
    pEach.push(monteCarloP(observed[s]!, v.subarray(0, N - 1), 'two')!);
  }
  let agreement: number | null = null;
  let byAgreement = false;
  if (regularSign && S > 1) {
    const [mean, sd] = meanAndSd(A);
    for (let j = 0; j < N; j++) {
      const z = Math.abs(A[j]! - mean) / sd;
      if (j === N - 1 && z > T[j]!) byAgreement = true;
      if (z > T[j]!) T[j] = z;
    }
    agreement = (A[N - 1]! - mean) / sd;
  }
  let count = 0;
  for (let j = 0; j < N; j++) if (T[j]! >= T[N - 1]!) count++;
  let strongest = 0;
  for (let s = 1; s < S; s++) if (zObs[s]! > zObs[strongest]!) strongest = s;
  return { p: count / N, strongest, pEach, agreement, byAgreement };
}

/** Mean and sample sd (1 when the values do not vary) of a sample. */
function meanAndSd(v: Float64Array): [number, number] {
  const N = v.length;
  let mean = 0;
  for (let j = 0; j < N; j++) mean += v[j]!;
  mean /= N;
  let sd = 0;
  for (let j = 0; j < N; j++) sd += (v[j]! - mean) ** 2;
  return [mean, Math.sqrt(sd / (N - 1)) || 1];
}
