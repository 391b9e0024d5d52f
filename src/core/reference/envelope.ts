/** Summaries of replicate values and curves: ECDFs on a grid, mean and sd, pointwise quantile envelopes. */
import type { AreaStats } from '../stats/pattern';

/** Pointwise summary of a curve over the replicates. */
export interface Envelope {
  mean: Float64Array;
  /** 2.5 % and 97.5 % pointwise quantiles. */
  lo: Float64Array;
  hi: Float64Array;
  /** Pointwise extremes over all replicates. */
  min: Float64Array;
  max: Float64Array;
}

/** Mean and sample standard deviation of the finite entries. */
export function meanSd(a: ArrayLike<number>): [number, number] {
  let n = 0;
  let s = 0;
  for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i]!)) { s += a[i]!; n++; }
  if (!n) return [Number.NaN, Number.NaN];
  const m = s / n;
  let v = 0;
  for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i]!)) v += (a[i]! - m) ** 2;
  return [m, n > 1 ? Math.sqrt(v / (n - 1)) : Number.NaN];
}

/** Pointwise mean, 2.5 %/97.5 % quantiles and extremes of R curves of length L stored row by row. */
export function envelope(curves: Float64Array, R: number, L: number): Envelope {
  const mean = new Float64Array(L);
  const lo = new Float64Array(L);
  const hi = new Float64Array(L);
  const min = new Float64Array(L);
  const max = new Float64Array(L);
  const col = new Float64Array(R);
  for (let k = 0; k < L; k++) {
    let m = 0;
    for (let r = 0; r < R; r++) {
      const v = curves[r * L + k]!;
      if (Number.isFinite(v)) col[m++] = v;
    }
    if (!m) {
      mean[k] = lo[k] = hi[k] = min[k] = max[k] = Number.NaN;
      continue;
    }
    const c = col.subarray(0, m).sort();
    let s = 0;
    for (let j = 0; j < m; j++) s += c[j]!;
    mean[k] = s / m;
    lo[k] = quantileSorted(c, 0.025);
    hi[k] = quantileSorted(c, 0.975);
    min[k] = c[0]!;
    max[k] = c[m - 1]!;
  }
  return { mean, lo, hi, min, max };
}

/** Linear-interpolation quantile of sorted values (the usual "type 7" definition; trade). */
export function quantileSorted(c: ArrayLike<number>, q: number): number {
  const h = (c.length - 1) * q;
  const a = Math.floor(h);
  const b = Math.min(c.length - 1, a + 1);
  return c[a]! + (h - a) * (c[b]! - c[a]!);
}


/** ECDF of a sample at the grid points into out[offset ..]. */
export function ecdfOnGrid(a: Pick<AreaStats, 'sorted' | 'cumulative'>, grid: Float64Array, out: Float64Array, offset: number): void {
  let k = 0;
  let c = 0;
  for (let g = 0; g < grid.length; g++) {
    while (k < a.sorted.length && a.sorted[k]! <= grid[g]!) c = a.cumulative[k++]!;
    out[offset + g] = c;
  }
}

export function countFinite(a: Float64Array): number {
  let c = 0;
  for (const v of a) if (Number.isFinite(v)) c++;
  return c;
}
