import { describe, expect, it } from 'vitest';
import { SeriesError } from '../../../src/core/errors';
import { fitAvrami, fitJmakNonlinear, halfTime, jmak, rateK } from '../../../src/core/kinetics/index';
import { t975 } from '../../../src/core/stats/dist';

const times = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 12, 14];

describe('JMAK law', () => {
  it('half-time is (ln 2 / k)^{1/n} and f(t½) = ½', () => {
    // derived: docs/check-values.md §4, t½ = (ln 2 / k)^{1/n}
    for (const [n, k] of [[2, 3.1e-3], [3, 2.1e-5], [1.5, 0.2], [4, 1e-7]] as const) {
      const th = halfTime(n, k);
      expect(th).toBeCloseTo(Math.pow(Math.LN2 / k, 1 / n), 12);
      expect(jmak(th, n, k)).toBeCloseTo(0.5, 14);
      expect(jmak(th + 2.5, n, k, 2.5)).toBeCloseTo(0.5, 14);
    }
  });

  it('the K form 1 − exp(−(K·t)ⁿ) with K = k^{1/n} gives the same curve', () => {
    // derived: docs/check-values.md §4, K = k^{1/n}
    const n = 2.7;
    const k = 4e-4;
    const K = rateK(n, k);
    for (const t of [0.5, 3, 10, 40]) expect(jmak(t, n, k)).toBeCloseTo(1 - Math.exp(-Math.pow(K * t, n)), 14);
    expect(jmak(-1, n, k)).toBe(0);
    expect(jmak(1, n, k, 2)).toBe(0);
  });
});

describe('Avrami plot fit', () => {
  it('recovers n and k from exact JMAK values', () => {
    // derived: on exact values the Avrami plot is the straight line ln(−ln(1 − f)) = ln k + n·ln t (docs/check-values.md §4)
    const f = times.map((t) => jmak(t, 2.5, 0.004));
    const fit = fitAvrami(times, f);
    expect(fit.n).toBeCloseTo(2.5, 9);
    expect(fit.k / 0.004).toBeCloseTo(1, 9);
    expect(fit.tHalf).toBeCloseTo(halfTime(2.5, 0.004), 9);
    expect(fit.r2).toBeCloseTo(1, 12);
    // only frames with 0.02 < f < 0.98 enter: f(1) = 0.004 is left out
    expect(fit.frames).toEqual(f.map((x, i) => (x > 0.02 && x < 0.98 ? i : -1)).filter((i) => i >= 0));
    expect(fit.frames).not.toContain(0);
    const g = fitAvrami(times, f, { fitMin: 0.1, fitMax: 0.9 });
    expect(g.frames.every((i) => f[i]! > 0.1 && f[i]! < 0.9)).toBe(true);
    expect(g.frames.length).toBeLessThan(fit.frames.length);
  });

  it('gives ordinary-least-squares standard errors and Student-t intervals', () => {
    // derived: textbook OLS, se(slope) = s/√Sxx; the quantile t(0.975, 3) = 3.182 (pub, statistical tables; memory, tolerance 1e-3)
    expect(t975(3)).toBeCloseTo(3.182, 3);
    expect(t975(10)).toBeCloseTo(2.228, 3);
    const ts = [2, 3, 4, 5, 6];
    const ys = [-3, -2, -1.5, -0.5, 0.3];
    const f = ys.map((y) => 1 - Math.exp(-Math.exp(y)));
    const fit = fitAvrami(ts, f);
    const xs = ts.map(Math.log);
    const xm = xs.reduce((a, b) => a + b) / 5;
    const ym = ys.reduce((a, b) => a + b) / 5;
    const sxx = xs.reduce((a, x) => a + (x - xm) ** 2, 0);
    const slope = xs.reduce((a, x, i) => a + (x - xm) * (ys[i]! - ym), 0) / sxx;
    const icpt = ym - slope * xm;
    const ssr = xs.reduce((a, x, i) => a + (ys[i]! - icpt - slope * x) ** 2, 0);
    const se = Math.sqrt(ssr / 3 / sxx);
    expect(fit.n).toBeCloseTo(slope, 10);
    expect(fit.se.n!).toBeCloseTo(se, 10);
    expect(fit.ci95.n![1] - fit.n).toBeCloseTo(t975(3) * se, 10);
    expect(fit.dof).toBe(3);
  });

  it('refuses fewer than three usable frames and says how many there are', () => {
    const f = [0, 0.01, 0.3, 0.6, 0.99, 1];
    expect(() => fitAvrami([1, 2, 3, 4, 5, 6], f)).toThrow(SeriesError);
    expect(() => fitAvrami([1, 2, 3, 4, 5, 6], f)).toThrow(/Only 2 frames have 0.02 < f < 0.98 \(frame 3, 4\)/);
  });

  it('refuses times that do not increase or are missing', () => {
    expect(() => fitAvrami([1, 3, 2, 4], [0.1, 0.2, 0.3, 0.4])).toThrow(/frame 3 \(t = 2\) does not come after frame 2/);
    expect(() => fitAvrami([1, 2, Number.NaN, 4], [0.1, 0.2, 0.3, 0.4])).toThrow(/time of frame 3 is missing/);
    expect(() => fitAvrami([1, 2, 3], [0.1, 0.2, 0.3, 0.4])).toThrow(/3 times for 4 fractions/);
  });
});

describe('nonlinear JMAK fit (Levenberg–Marquardt)', () => {
  it('returns n and k of exact JMAK values to 1e-6 from a poor start', () => {
    // derived: exact values of f = 1 − exp(−k·tⁿ) are fitted with zero residual (docs/check-values.md §4)
    for (const [n, k] of [[2, 3.1416e-3], [3, 2.0944e-5], [2.5, 0.004]] as const) {
      const f = times.map((t) => jmak(t * (n === 3 ? 4 : 1), n, k));
      const ts = times.map((t) => t * (n === 3 ? 4 : 1));
      const fit = fitJmakNonlinear(ts, f, { initial: { n: 1, k: k * 20 } });
      expect(fit.converged).toBe(true);
      expect(Math.abs(fit.n - n)).toBeLessThan(1e-6);
      expect(Math.abs(fit.k / k - 1)).toBeLessThan(1e-6);
      expect(Math.abs(fit.tHalf / halfTime(n, k) - 1)).toBeLessThan(1e-6);
    }
  });

  it('fits an incubation time when asked', () => {
    // derived: exact values of f = 1 − exp(−k·(t − t0)ⁿ)
    const f = times.map((t) => jmak(t, 2.5, 0.004, 1.5));
    const fit = fitJmakNonlinear(times, f, { incubation: true, initial: { n: 2, k: 0.01, t0: 0.5 } });
    expect(Math.abs(fit.n - 2.5)).toBeLessThan(1e-6);
    expect(Math.abs(fit.k / 0.004 - 1)).toBeLessThan(1e-6);
    expect(Math.abs(fit.t0 - 1.5)).toBeLessThan(1e-6);
    expect(fit.t0Fitted).toBe(true);
    expect(fit.tHalf).toBeCloseTo(1.5 + halfTime(2.5, 0.004), 6);
  });

  it('gives intervals from (JᵀJ)⁻¹·s² that widen with the scatter and cover the truth', () => {
    // trade: least-squares covariance; the scatter is a fixed deterministic pattern of ±0.01
    const f1 = times.map((t, i) => Math.min(1, Math.max(0, jmak(t, 2.5, 0.004) + 0.005 * Math.sin(i * 7.3))));
    const f2 = times.map((t, i) => Math.min(1, Math.max(0, jmak(t, 2.5, 0.004) + 0.02 * Math.sin(i * 7.3))));
    const a = fitJmakNonlinear(times, f1);
    const b = fitJmakNonlinear(times, f2);
    const wa = a.ci95.n![1] - a.ci95.n![0];
    const wb = b.ci95.n![1] - b.ci95.n![0];
    expect(wb).toBeGreaterThan(2 * wa);
    expect(a.ci95.n![0]).toBeLessThan(2.5);
    expect(a.ci95.n![1]).toBeGreaterThan(2.5);
    expect(a.ci95.k![0]).toBeLessThan(0.004);
    expect(a.ci95.k![1]).toBeGreaterThan(0.004);
    expect(a.residuals).toHaveLength(times.length);
  });
});
