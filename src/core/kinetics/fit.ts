/**
 * JMAK fits of a transformed fraction f(t): the straight line of the Avrami plot and a nonlinear
 * least-squares fit on f itself, both with 95 % intervals. Convention: f = 1 − exp(−k·(t − t0)ⁿ).
 */
import { SeriesError } from '../errors';
import { avramiPoint, halfTime, jmak, rateK } from './jmak';
import { invert } from './linalg';
import { levenbergMarquardt } from './lm';
import { t975 } from '../stats/dist';

/** A 95 % interval [low, high], or null when it cannot be estimated (no degrees of freedom). */
export type Interval = [number, number] | null;

/** The result of one JMAK fit; every number is finite or null so that it serialises to JSON. */
export interface JmakFit {
  method: 'avrami-plot' | 'nonlinear';
  /** Avrami exponent. */
  n: number;
  /** Rate constant of f = 1 − exp(−k·(t − t0)ⁿ), in time⁻ⁿ. */
  k: number;
  /** K = k^{1/n}, in time⁻¹, for the form f = 1 − exp(−(K·(t − t0))ⁿ). */
  K: number;
  /** Incubation time (time unit); 0 unless fitted or given. */
  t0: number;
  /** Whether t0 was a fitted parameter. */
  t0Fitted: boolean;
  /** Clock time at which f = ½: t0 + (ln 2 / k)^{1/n}. */
  tHalf: number;
  /** Standard errors of the parameters (ln k rather than k, which is fitted on a log scale). */
  se: { n: number | null; lnK: number | null; t0: number | null };
  ci95: { n: Interval; k: Interval; K: Interval; tHalf: Interval; t0: Interval };
  /** Coefficient of determination of the fitted variable (y of the Avrami plot, or f). */
  r2: number | null;
  /** Residual standard deviation s = √(SSR / dof) in the fitted variable. */
  s: number | null;
  dof: number;
  /** Indices (into the series) of the frames that entered the fit. */
  frames: number[];
  /** Observed minus fitted, one per frame in `frames`, in the fitted variable. */
  residuals: number[];
  /** Whether the iterations converged (always true for the straight-line fit). */
  converged: boolean;
  iterations: number;
}

export interface AvramiOptions {
  /** Frames with fitMin < f < fitMax enter the fit (defaults 0.02 and 0.98). */
  fitMin?: number;
  fitMax?: number;
  /** A fixed incubation time subtracted from t before taking logs (default 0). */
  t0?: number;
}

export interface NonlinearOptions {
  /** Fit an incubation time t0 as a third parameter (default false). */
  incubation?: boolean;
  /** Starting values; by default taken from the Avrami plot. */
  initial?: { n: number; k: number; t0?: number };
  /** Range of f used for the starting values from the Avrami plot (defaults 0.02 and 0.98). */
  fitMin?: number;
  fitMax?: number;
}

const fin = (x: number): number | null => (Number.isFinite(x) ? x : null);

function checkSeries(times: ArrayLike<number>, fractions: ArrayLike<number>): void {
  if (times.length !== fractions.length) {
    throw new SeriesError(`There are ${times.length} times for ${fractions.length} fractions; give one time per frame.`);
  }
  for (let i = 0; i < times.length; i++) {
    if (!Number.isFinite(times[i]!)) throw new SeriesError(`The time of frame ${i + 1} is missing or not a number; give one number per frame.`);
    const f = fractions[i]!;
    if (!Number.isFinite(f) || f < 0 || f > 1) throw new SeriesError(`The fraction of frame ${i + 1} is ${f}; fractions must lie in [0, 1].`);
  }
  for (let i = 1; i < times.length; i++) {
    if (!(times[i]! > times[i - 1]!)) {
      throw new SeriesError(`Times must increase from frame to frame; frame ${i + 1} (t = ${times[i]}) does not come after frame ${i} (t = ${times[i - 1]}).`);
    }
  }
}

/**
 * Derived quantities and their intervals from (n, ln k, t0) and the covariance of the fitted ones
 * (delta method: var g = ∇gᵀ·C·∇g). k and K intervals are taken on the log scale, so they stay positive.
 */
function derive(
  n: number,
  lnk: number,
  t0: number,
  cov: Float64Array | null,
  np: 2 | 3,
  dof: number,
): Pick<JmakFit, 'n' | 'k' | 'K' | 't0' | 'tHalf' | 'se' | 'ci95'> {
  const k = Math.exp(lnk);
  const th = halfTime(n, k);
  const out = {
    n,
    k,
    K: rateK(n, k),
    t0,
    tHalf: t0 + th,
    se: { n: null as number | null, lnK: null as number | null, t0: null as number | null },
    ci95: { n: null as Interval, k: null as Interval, K: null as Interval, tHalf: null as Interval, t0: null as Interval },
  };
  const tq = t975(dof);
  if (!cov || !Number.isFinite(tq)) return out;
  const c = (a: number, b: number): number => cov[a * np + b]!;
  const quad = (gr: number[]): number => {
    let v = 0;
    for (let a = 0; a < np; a++) for (let b = 0; b < np; b++) v += (gr[a] ?? 0) * (gr[b] ?? 0) * c(a, b);
    return Math.sqrt(Math.max(v, 0));
  };
  const seN = Math.sqrt(Math.max(c(0, 0), 0));
  const seL = Math.sqrt(Math.max(c(1, 1), 0));
  out.se.n = fin(seN);
  out.se.lnK = fin(seL);
  out.ci95.n = [n - tq * seN, n + tq * seN];
  out.ci95.k = [Math.exp(lnk - tq * seL), Math.exp(lnk + tq * seL)];
  const seLnKK = quad([-lnk / (n * n), 1 / n]);
  const lnKK = lnk / n;
  out.ci95.K = [Math.exp(lnKK - tq * seLnKK), Math.exp(lnKK + tq * seLnKK)];
  const h = (Math.log(Math.LN2) - lnk) / n;
  const seTh = quad([th * (-h / n), th * (-1 / n), 1]);
  out.ci95.tHalf = [out.tHalf - tq * seTh, out.tHalf + tq * seTh];
  if (np === 3) {
    const se0 = Math.sqrt(Math.max(c(2, 2), 0));
    out.se.t0 = fin(se0);
    out.ci95.t0 = [t0 - tq * se0, t0 + tq * se0];
  }
  return out;
}

/** Indices of frames with fitMin < f < fitMax and t > t0, which the Avrami plot can use. */
export function avramiFrames(times: ArrayLike<number>, fractions: ArrayLike<number>, fitMin = 0.02, fitMax = 0.98, t0 = 0): number[] {
  const idx: number[] = [];
  for (let i = 0; i < times.length; i++) {
    const f = fractions[i]!;
    if (f > fitMin && f < fitMax && avramiPoint(times[i]!, f, t0)) idx.push(i);
  }
  return idx;
}

/**
 * The Avrami plot fit: ordinary least squares of y = ln(−ln(1 − f)) on x = ln(t − t0) over the frames with
 * fitMin < f < fitMax. Slope = n, intercept = ln k. Standard errors: se(n) = s/√Sxx,
 * se(ln k) = s·√(1/m + x̄²/Sxx), cov = −x̄·s²/Sxx; intervals with the Student-t quantile on m − 2 degrees
 * of freedom (Avrami 1940, "Kinetics of phase change. II", J. Chem. Phys. 8:212; the plot is pub).
 *
 * @param times frame times, strictly increasing (any unit)
 * @param fractions transformed fraction per frame, in [0, 1]
 * @throws SeriesError with fewer than three usable frames, saying how many there are
 */
export function fitAvrami(times: ArrayLike<number>, fractions: ArrayLike<number>, opts: AvramiOptions = {}): JmakFit {
  checkSeries(times, fractions);
  const fitMin = opts.fitMin ?? 0.02;
  const fitMax = opts.fitMax ?? 0.98;
  const t0 = opts.t0 ?? 0;
  const idx = avramiFrames(times, fractions, fitMin, fitMax, t0);
  if (idx.length < 3) {
    throw new SeriesError(
      `Only ${idx.length} frame${idx.length === 1 ? '' : 's'} ha${idx.length === 1 ? 's' : 've'} ${fitMin} < f < ${fitMax}${idx.length ? ` (frame ${idx.map((i) => i + 1).join(', ')})` : ''}; the Avrami fit needs at least 3: add frames during the transformation or widen the fit range.`,
    );
  }
  const m = idx.length;
  const xs = idx.map((i) => avramiPoint(times[i]!, fractions[i]!, t0)!.x);
  const ys = idx.map((i) => avramiPoint(times[i]!, fractions[i]!, t0)!.y);
  const xm = xs.reduce((a, b) => a + b, 0) / m;
  const ym = ys.reduce((a, b) => a + b, 0) / m;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let j = 0; j < m; j++) {
    sxx += (xs[j]! - xm) ** 2;
    sxy += (xs[j]! - xm) * (ys[j]! - ym);
    syy += (ys[j]! - ym) ** 2;
  }
  if (!(sxx > 0)) throw new SeriesError('The frames of the Avrami fit all have the same time; give frames at different times.');
  const n = sxy / sxx;
  const lnk = ym - n * xm;
  const residuals = ys.map((y, j) => y - (lnk + n * xs[j]!));
  const ssr = residuals.reduce((a, r) => a + r * r, 0);
  const dof = m - 2;
  const s2 = dof > 0 ? ssr / dof : Number.NaN;
  const cov = dof > 0 ? Float64Array.of(s2 / sxx, (-xm * s2) / sxx, (-xm * s2) / sxx, s2 * (1 / m + (xm * xm) / sxx)) : null;
  return {
    method: 'avrami-plot',
    ...derive(n, lnk, t0, cov, 2, dof),
    t0Fitted: false,
    r2: syy > 0 ? fin(1 - ssr / syy) : null,
    s: fin(Math.sqrt(s2)),
    dof,
    frames: idx,
    residuals,
    converged: true,
    iterations: 0,
  };
}

/** Starting values for the nonlinear fit: the Avrami plot at a few trial incubation times, best r² wins. */
function startingValues(times: ArrayLike<number>, fractions: ArrayLike<number>, incubation: boolean, fitMin: number, fitMax: number): { n: number; k: number; t0: number } {
  let firstPositive = Number.POSITIVE_INFINITY;
  for (let i = 0; i < times.length; i++) if (fractions[i]! > 0) { firstPositive = times[i]!; break; }
  const candidates = incubation && Number.isFinite(firstPositive) && firstPositive > 0 ? [0, 0.25, 0.5, 0.75, 0.9].map((q) => q * firstPositive) : [0];
  let best: { n: number; k: number; t0: number; r2: number } | null = null;
  for (const t0 of candidates) {
    for (const [lo, hi] of [[fitMin, fitMax], [0, 1]] as const) {
      if (avramiFrames(times, fractions, lo, hi, t0).length < 3) continue;
      const a = fitAvrami(times, fractions, { fitMin: lo, fitMax: hi, t0 });
      const r2 = a.r2 ?? -Infinity;
      if (!best || r2 > best.r2) best = { n: a.n, k: a.k, t0, r2 };
      break;
    }
  }
  if (best && best.n > 0 && Number.isFinite(best.k)) return best;
  // No usable Avrami plot: put the half-time at the frame nearest f = ½ with n = 2.
  let near = 0;
  for (let i = 0; i < times.length; i++) if (Math.abs(fractions[i]! - 0.5) < Math.abs(fractions[near]! - 0.5)) near = i;
  const th = Math.max(times[near]!, 1e-12);
  return { n: 2, k: Math.LN2 / (th * th), t0: 0 };
}

/**
 * Nonlinear least squares of f = 1 − exp(−k·(t − t0)ⁿ) on the fractions themselves (all frames), by
 * Levenberg–Marquardt on (n, ln k[, t0]). Covariance (JᵀJ)⁻¹·s² with s² = SSR/(m − p); 95 % intervals with
 * the Student-t quantile on m − p degrees of freedom (delta method for k, K and t½).
 *
 * @param times frame times, strictly increasing
 * @param fractions transformed fraction per frame, in [0, 1]
 * @throws SeriesError when fewer than three frames have fitMin < f < fitMax, or there are fewer frames than
 *   parameters + 1
 */
export function fitJmakNonlinear(times: ArrayLike<number>, fractions: ArrayLike<number>, opts: NonlinearOptions = {}): JmakFit {
  checkSeries(times, fractions);
  const incubation = opts.incubation ?? false;
  const fitMin = opts.fitMin ?? 0.02;
  const fitMax = opts.fitMax ?? 0.98;
  const np = incubation ? 3 : 2;
  const m = times.length;
  const inRange = avramiFrames(times, fractions, fitMin, fitMax, Number.NEGATIVE_INFINITY);
  if (inRange.length < 3) {
    throw new SeriesError(
      `Only ${inRange.length} frame${inRange.length === 1 ? '' : 's'} ha${inRange.length === 1 ? 's' : 've'} ${fitMin} < f < ${fitMax}; the JMAK fit needs at least 3: add frames during the transformation or widen the fit range.`,
    );
  }
  if (m < np + 1) throw new SeriesError(`A JMAK fit with ${np} parameters needs at least ${np + 1} frames; got ${m}.`);
  const start = opts.initial ? { n: opts.initial.n, k: opts.initial.k, t0: opts.initial.t0 ?? 0 } : startingValues(times, fractions, incubation, fitMin, fitMax);
  let firstPositive = Number.POSITIVE_INFINITY;
  for (let i = 0; i < m; i++) if (fractions[i]! > 0) { firstPositive = times[i]!; break; }
  const t0Max = Number.isFinite(firstPositive) ? firstPositive - 1e-9 * Math.max(1, Math.abs(firstPositive)) : times[m - 1]!;
  const unpack = (p: Float64Array): [number, number, number] => [p[0]!, p[1]!, incubation ? p[2]! : 0];
  const res = levenbergMarquardt(
    {
      np,
      m,
      residuals(p, out) {
        const [n, lnk, t0] = unpack(p);
        const k = Math.exp(lnk);
        for (let i = 0; i < m; i++) out[i] = jmak(times[i]!, n, k, t0) - fractions[i]!;
      },
      jacobian(p, out) {
        const [n, lnk, t0] = unpack(p);
        const k = Math.exp(lnk);
        for (let i = 0; i < m; i++) {
          const u = times[i]! - t0;
          const row = i * np;
          if (!(u > 0)) {
            for (let a = 0; a < np; a++) out[row + a] = 0;
            continue;
          }
          const g = k * Math.pow(u, n);
          const e = Math.exp(-g) * g;
          out[row] = e * Math.log(u);
          out[row + 1] = e;
          if (incubation) out[row + 2] = (-e * n) / u;
        }
      },
      clamp(p) {
        p[0] = Math.min(Math.max(p[0]!, 0.05), 20);
        if (incubation) p[2] = Math.min(Math.max(p[2]!, 0), t0Max);
      },
    },
    incubation ? [start.n, Math.log(start.k), start.t0] : [start.n, Math.log(start.k)],
  );
  const [n, lnk, t0] = unpack(res.p);
  const dof = m - np;
  const s2 = dof > 0 ? res.ssr / dof : Number.NaN;
  const inv = invert(res.jtj, np);
  const cov = inv && dof > 0 ? inv.map((v) => v * s2) : null;
  const k = Math.exp(lnk);
  const residuals: number[] = [];
  let fm = 0;
  for (let i = 0; i < m; i++) fm += fractions[i]!;
  fm /= m;
  let sst = 0;
  for (let i = 0; i < m; i++) {
    residuals.push(fractions[i]! - jmak(times[i]!, n, k, t0));
    sst += (fractions[i]! - fm) ** 2;
  }
  return {
    method: 'nonlinear',
    ...derive(n, lnk, t0, cov, np, dof),
    t0Fitted: incubation,
    r2: sst > 0 ? fin(1 - res.ssr / sst) : null,
    s: fin(Math.sqrt(s2)),
    dof,
    frames: Array.from({ length: m }, (_, i) => i),
    residuals,
    converged: res.converged,
    iterations: res.iterations,
  };
}
