/**
 * Plot data of the Randomness panel: observed figures of the Voronoi tessellation of the centroids next to
 * the random-seeding (Poisson–Voronoi) reference. Pure: Analysis in, plain series out; the panel turns them
 * into plotly traces.
 */
// The page's form of an analysis (all but the label image), which the worker's full analysis also is.
import type { PageAnalysis as Analysis } from '../../workers/protocol';
import {
  PV_ABOAV_A, PV_AREA_GAMMA_SHAPE, PV_LEWIS_SLOPE, PV_SIDES_DISTRIBUTION, PV_SIDES_VARIANCE,
} from '../core/reference/constants';

const PV_SIDES: Record<number, number> = Object.fromEntries(
  Object.entries(PV_SIDES_DISTRIBUTION).map(([n, v]) => [Number(n), v.value]),
);
const PV_MU2 = PV_SIDES_VARIANCE.value;
const PV_AW_A = PV_ABOAV_A.value;
const LEWIS_SLOPE = PV_LEWIS_SLOPE.value;
const GAMMA_K = PV_AREA_GAMMA_SHAPE.value;

/**
 * Density of the normalised cell area y = A / Ā of a Poisson–Voronoi tessellation, approximated by the
 * gamma law with shape = rate = k = 7/2: f(y) = k^k / Γ(k) · y^{5/2} · e^{−7y/2}
 * (Ferenc & Néda 2007, Physica A 385:518; pub, read in text). Γ(7/2) = 15√π / 8.
 */
export function pvAreaDensity(y: number): number {
  if (y <= 0) return 0;
  const k = GAMMA_K;
  const gamma = Math.exp(lnGamma(k));
  return (k ** k / gamma) * y ** (k - 1) * Math.exp(-k * y);
}

export interface Series { x: number[]; y: number[] }

export interface RandomnessData {
  /** Interior cells used. */
  n: number;
  area: { observed: Series; reference: Series; binWidth: number; cv: number };
  sides: { observed: Series; reference: Series; mean: number; mu2: number };
  lewis: { observed: Series; reference: Series; counts: number[] };
  aboav: { observed: Series; reference: Series; counts: number[] };
  pair: { observed: Series; rUnit: string };
}

/** Interior cells (not touching the field border) of the tessellation, 0-based. */
function interiorCells(a: Analysis): number[] {
  const e = a.tessellation.edge;
  const out: number[] = [];
  for (let i = 0; i < e.length; i++) if (e[i] === 0) out.push(i);
  return out;
}

/** Histogram of the normalised Voronoi areas of interior cells as a density, with the reference density. */
export function areaDistribution(a: Analysis, bins = 30): RandomnessData['area'] {
  const cells = interiorCells(a);
  const area = a.tessellation.area;
  let mean = 0;
  for (const i of cells) mean += area[i];
  mean /= Math.max(1, cells.length);
  let v = 0;
  for (const i of cells) v += (area[i] - mean) ** 2;
  const cv = cells.length > 1 ? Math.sqrt(v / (cells.length - 1)) / mean : NaN;
  const max = 3;
  const w = max / bins;
  const counts = new Array<number>(bins).fill(0);
  for (const i of cells) {
    const y = area[i] / mean;
    const b = Math.min(bins - 1, Math.floor(y / w));
    counts[b]++;
  }
  const observed: Series = { x: counts.map((_, k) => (k + 0.5) * w), y: counts.map((c) => c / (cells.length * w)) };
  const reference: Series = { x: [], y: [] };
  for (let k = 0; k <= 120; k++) { const y = (k / 120) * max; reference.x.push(y); reference.y.push(pvAreaDensity(y)); }
  return { observed, reference, binWidth: w, cv };
}

/** Fraction of interior cells with n sides, with the Poisson–Voronoi p(n). */
export function sideDistribution(a: Analysis): RandomnessData['sides'] {
  const cells = interiorCells(a);
  const s = a.tessellation.sides;
  const counts = new Map<number, number>();
  let sum = 0;
  for (const i of cells) { counts.set(s[i], (counts.get(s[i]) ?? 0) + 1); sum += s[i]; }
  const mean = sum / Math.max(1, cells.length);
  let m2 = 0;
  for (const i of cells) m2 += (s[i] - mean) ** 2;
  const ns = [...new Set([...counts.keys(), 3, 4, 5, 6, 7, 8, 9, 10])].sort((p, q) => p - q);
  return {
    observed: { x: ns, y: ns.map((n) => (counts.get(n) ?? 0) / Math.max(1, cells.length)) },
    reference: { x: ns.filter((n) => PV_SIDES[n] !== undefined), y: ns.filter((n) => PV_SIDES[n] !== undefined).map((n) => PV_SIDES[n]) },
    mean,
    mu2: m2 / Math.max(1, cells.length),
  };
}

/**
 * Lewis's law: mean normalised area of the n-sided interior cells against n, with the Poisson–Voronoi line
 * 1 + 0.23 (n − 6).
 */
export function lewis(a: Analysis): RandomnessData['lewis'] {
  const cells = interiorCells(a);
  const { area, sides } = a.tessellation;
  let mean = 0;
  for (const i of cells) mean += area[i];
  mean /= Math.max(1, cells.length);
  const sum = new Map<number, number>(), cnt = new Map<number, number>();
  for (const i of cells) { sum.set(sides[i], (sum.get(sides[i]) ?? 0) + area[i] / mean); cnt.set(sides[i], (cnt.get(sides[i]) ?? 0) + 1); }
  const ns = [...cnt.keys()].sort((p, q) => p - q);
  return {
    observed: { x: ns, y: ns.map((n) => (sum.get(n) as number) / (cnt.get(n) as number)) },
    reference: { x: [3, 10], y: [1 + LEWIS_SLOPE * (3 - 6), 1 + LEWIS_SLOPE * (10 - 6)] },
    counts: ns.map((n) => cnt.get(n) as number),
  };
}

/**
 * Aboav–Weaire: n · m(n) against n, m(n) the mean side count of the neighbours of n-sided cells (interior
 * cells and interior neighbours only), with the Poisson–Voronoi line n·m(n) = (6 − a) n + 6a + μ₂.
 */
export function aboavWeaire(a: Analysis): RandomnessData['aboav'] {
  const t = a.tessellation;
  const sum = new Map<number, number>(), cnt = new Map<number, number>();
  for (let i = 0; i < t.edge.length; i++) {
    if (t.edge[i]) continue;
    let s = 0, k = 0;
    for (let j = t.neighbourOffsets[i]; j < t.neighbourOffsets[i + 1]; j++) {
      const nb = t.neighbourIndex[j];
      if (t.edge[nb]) continue;
      s += t.sides[nb]; k++;
    }
    if (k === 0) continue;
    const n = t.sides[i];
    sum.set(n, (sum.get(n) ?? 0) + s / k);
    cnt.set(n, (cnt.get(n) ?? 0) + 1);
  }
  const ns = [...cnt.keys()].sort((p, q) => p - q);
  const line = (n: number): number => (6 - PV_AW_A) * n + 6 * PV_AW_A + PV_MU2;
  return {
    observed: { x: ns, y: ns.map((n) => (n * (sum.get(n) as number)) / (cnt.get(n) as number)) },
    reference: { x: [3, 10], y: [line(3), line(10)] },
    counts: ns.map((n) => cnt.get(n) as number),
  };
}

/**
 * Pair-correlation function g(r) of the centroids with the translation edge correction for a rectangular
 * field W x H: ĝ(r) = Σ_{i≠j, d_ij in bin} 1 / ((W − |dx|)(H − |dy|)) / (2π r Δr λ²), λ² = n(n − 1)/A²
 * (Illian, Penttinen, Stoyan & Stoyan 2008, "Statistical Analysis and Modelling of Spatial Point
 * Patterns", §4.3). g = 1 for random seeding. r in units of the mean spacing 1/√λ, up to 3.
 */
export function pairCorrelation(a: Analysis, bins = 30): RandomnessData['pair'] {
  const p = a.tessellation.points;
  const f = a.tessellation.field;
  const W = f.x1 - f.x0, H = f.y1 - f.y0, A = W * H;
  const n = p.length / 2;
  const unit = Math.sqrt(A / Math.max(1, n));
  const rmax = 3 * unit, dr = rmax / bins;
  const acc = new Float64Array(bins);
  // Grid of cell size rmax: only the 3 x 3 neighbourhood holds partners closer than rmax.
  const gx = Math.max(1, Math.ceil(W / rmax)), gy = Math.max(1, Math.ceil(H / rmax));
  const grid: number[][] = Array.from({ length: gx * gy }, () => []);
  const cellOf = (i: number): [number, number] => [
    Math.min(gx - 1, Math.max(0, Math.floor((p[2 * i] - f.x0) / rmax))),
    Math.min(gy - 1, Math.max(0, Math.floor((p[2 * i + 1] - f.y0) / rmax))),
  ];
  for (let i = 0; i < n; i++) { const [cx, cy] = cellOf(i); grid[cy * gx + cx].push(i); }
  for (let i = 0; i < n; i++) {
    const [cx, cy] = cellOf(i);
    for (let yy = Math.max(0, cy - 1); yy <= Math.min(gy - 1, cy + 1); yy++) {
      for (let xx = Math.max(0, cx - 1); xx <= Math.min(gx - 1, cx + 1); xx++) {
        for (const j of grid[yy * gx + xx]) {
          if (j === i) continue;
          const dx = p[2 * j] - p[2 * i], dy = p[2 * j + 1] - p[2 * i + 1];
          const d = Math.hypot(dx, dy);
          if (d >= rmax) continue;
          acc[Math.floor(d / dr)] += 1 / ((W - Math.abs(dx)) * (H - Math.abs(dy)));
        }
      }
    }
  }
  const lambda2 = (n * (n - 1)) / (A * A);
  const x: number[] = [], y: number[] = [];
  for (let k = 0; k < bins; k++) {
    const r = (k + 0.5) * dr;
    x.push(r / unit);
    y.push(acc[k] / (2 * Math.PI * r * dr * lambda2));
  }
  return { observed: { x, y }, rUnit: 'mean spacing' };
}

/** Everything the Randomness panel plots. */
export function randomnessData(a: Analysis): RandomnessData {
  return {
    n: interiorCells(a).length,
    area: areaDistribution(a),
    sides: sideDistribution(a),
    lewis: lewis(a),
    aboav: aboavWeaire(a),
    pair: pairCorrelation(a),
  };
}

/** ln Γ(x) for x > 0 (Lanczos approximation, g = 7, n = 9; Press et al. 2007, Numerical Recipes §6.1). */
function lnGamma(x: number): number {
  const c = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7];
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  x -= 1;
  let a = c[0];
  const t = x + 7.5;
  for (let i = 1; i < 9; i++) a += c[i] / (x + i);
  return 0.5 * Math.log(2 * Math.PI) + (x + 0.5) * Math.log(t) - t + Math.log(a);
}
