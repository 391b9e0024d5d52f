/**
 * A small Levenberg–Marquardt least-squares solver for models with a handful of parameters.
 * (Levenberg 1944, "A method for the solution of certain non-linear problems in least squares",
 * Q. Appl. Math. 2:164; Marquardt 1963, SIAM J. Appl. Math. 11:431; damping scaled by diag(JᵀJ).)
 */
import { solve } from './linalg';

export interface LmProblem {
  /** Number of parameters. */
  np: number;
  /** Number of observations. */
  m: number;
  /** Model minus observation for each of the m observations, written into `out`. */
  residuals(p: Float64Array, out: Float64Array): void;
  /** ∂residual_i/∂p_j written row-major into `out` (m × np). */
  jacobian(p: Float64Array, out: Float64Array): void;
  /** Keeps a trial parameter vector inside its allowed region (modifies in place). */
  clamp?(p: Float64Array): void;
}

export interface LmResult {
  p: Float64Array;
  /** Sum of squared residuals at p. */
  ssr: number;
  /** JᵀJ at p (np × np), for the covariance. */
  jtj: Float64Array;
  iterations: number;
  converged: boolean;
}

/**
 * Minimises Σ rᵢ(p)² from p0. Each step solves (JᵀJ + μ·diag(JᵀJ))·δ = −Jᵀr; μ shrinks tenfold after a
 * step that lowers the sum and grows tenfold otherwise. Stops when the step is below `xtol` relative to p,
 * the relative decrease is below `ftol`, or after `maxIter` iterations.
 */
export function levenbergMarquardt(
  prob: LmProblem,
  p0: ArrayLike<number>,
  opts: { maxIter?: number; xtol?: number; ftol?: number } = {},
): LmResult {
  const { np, m } = prob;
  const maxIter = opts.maxIter ?? 500;
  const xtol = opts.xtol ?? 1e-13;
  const ftol = opts.ftol ?? 1e-16;
  let p = Float64Array.from(p0);
  prob.clamp?.(p);
  const r = new Float64Array(m);
  const J = new Float64Array(m * np);
  const jtj = new Float64Array(np * np);
  const g = new Float64Array(np);
  const rTrial = new Float64Array(m);
  const ssrOf = (v: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < m; i++) s += v[i]! * v[i]!;
    return s;
  };
  const build = (): void => {
    prob.jacobian(p, J);
    jtj.fill(0);
    g.fill(0);
    for (let i = 0; i < m; i++) {
      for (let a = 0; a < np; a++) {
        const ja = J[i * np + a]!;
        g[a] = g[a]! + ja * r[i]!;
        for (let b = a; b < np; b++) jtj[a * np + b] = jtj[a * np + b]! + ja * J[i * np + b]!;
      }
    }
    for (let a = 0; a < np; a++) for (let b = 0; b < a; b++) jtj[a * np + b] = jtj[b * np + a]!;
  };
  prob.residuals(p, r);
  let ssr = ssrOf(r);
  let mu = 1e-3;
  let converged = false;
  let it = 0;
  build();
  for (; it < maxIter && !converged; it++) {
    if (ssr === 0) {
      converged = true;
      break;
    }
    let accepted = false;
    for (let tries = 0; tries < 40 && !accepted; tries++) {
      const A = Float64Array.from(jtj);
      for (let a = 0; a < np; a++) A[a * np + a] = A[a * np + a]! + mu * Math.max(jtj[a * np + a]!, 1e-300);
      const neg = new Float64Array(np);
      for (let a = 0; a < np; a++) neg[a] = -g[a]!;
      const delta = solve(A, neg, np);
      if (!delta) {
        mu *= 10;
        continue;
      }
      const trial = new Float64Array(np);
      for (let a = 0; a < np; a++) trial[a] = p[a]! + delta[a]!;
      prob.clamp?.(trial);
      prob.residuals(trial, rTrial);
      const ssrTrial = ssrOf(rTrial);
      if (Number.isFinite(ssrTrial) && ssrTrial <= ssr) {
        let small = true;
        for (let a = 0; a < np; a++) if (Math.abs(trial[a]! - p[a]!) > xtol * (Math.abs(p[a]!) + xtol)) small = false;
        const drop = ssr - ssrTrial;
        p = trial;
        r.set(rTrial);
        const prev = ssr;
        ssr = ssrTrial;
        mu = Math.max(mu / 10, 1e-15);
        accepted = true;
        build();
        if (small || drop <= ftol * prev) converged = true;
      } else mu *= 10;
    }
    if (!accepted) {
      // No downhill step exists at any damping: p is a minimum to working precision.
      converged = true;
    }
  }
  return { p, ssr, jtj, iterations: it, converged };
}
