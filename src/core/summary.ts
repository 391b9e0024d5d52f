/**
 * The summary of one analysis: the figures other tools read from summary.json (keys documented in the
 * README). All statistics over interior cells (edge = 0).
 */
import type { Summary } from './analysis.types';
import type { SegmentInfo } from './analyze';
import type { Settings } from './settings';
import type { Tessellation } from './tessellate/types';
import type { LabelImage, Rect } from './types';

export interface SummaryInput {
  settings: Settings;
  width: number;
  height: number;
  field: Rect;
  count: number;
  /** Observed cell areas (px²): segmented pixel counts, or Voronoi areas for points. */
  area: Float64Array;
  /** Observed side counts: segmentation neighbours for walls, Voronoi sides otherwise. */
  sides: Int32Array;
  edge: Uint8Array;
  bbox: Float64Array;
  tess: Tessellation;
  labels: LabelImage | null;
  segment: SegmentInfo | null;
}

/** Mean and coefficient of variation (sample sd / mean) of the selected values. */
export function meanCv(values: ArrayLike<number>, keep: (i: number) => boolean): { mean: number; cv: number; n: number } {
  let n = 0;
  let s = 0;
  for (let i = 0; i < values.length; i++) if (keep(i)) (s += values[i]!), n++;
  const mean = n ? s / n : NaN;
  let v = 0;
  for (let i = 0; i < values.length; i++) if (keep(i)) v += (values[i]! - mean) ** 2;
  const sd = n > 1 ? Math.sqrt(v / (n - 1)) : NaN;
  return { mean, cv: sd / mean, n };
}

/**
 * Side-count statistics: mean, μ₂ = ⟨(n − ⟨n⟩)²⟩ (population variance, as the topology literature defines
 * it; Weaire & Rivier 1984, Contemp. Phys. 25:59), p(6), and the distribution p(n).
 */
export function sideStats(sides: ArrayLike<number>, keep: (i: number) => boolean): { mean: number; mu2: number; p6: number; n: number; distribution: Record<string, number>; counts: Record<string, number> } {
  const counts: Record<string, number> = {};
  let n = 0;
  let s = 0;
  for (let i = 0; i < sides.length; i++) {
    if (!keep(i)) continue;
    const k = sides[i]!;
    counts[k] = (counts[k] ?? 0) + 1;
    s += k;
    n++;
  }
  const mean = n ? s / n : NaN;
  let v = 0;
  for (let i = 0; i < sides.length; i++) if (keep(i)) v += (sides[i]! - mean) ** 2;
  const distribution: Record<string, number> = {};
  for (const k of Object.keys(counts).sort((a, b) => Number(a) - Number(b))) distribution[k] = counts[k]! / n;
  return { mean, mu2: n ? v / n : NaN, p6: n ? (counts[6] ?? 0) / n : NaN, n, distribution, counts };
}

export function buildSummary(inp: SummaryInput): Summary {
  const { settings, width, height, field, count, edge } = inp;
  const interior = (i: number) => edge[i] === 0;
  let nInterior = 0;
  for (let i = 0; i < count; i++) if (edge[i] === 0) nInterior++;
  const u = settings.umPerPx;
  const a2 = u === null ? 1 : u * u;
  const areaStats = meanCv(inp.area, interior);
  const sides = sideStats(inp.sides, interior);
  const fieldArea = (field.x1 - field.x0) * (field.y1 - field.y0);
  return {
    tessellab: 1,
    width,
    height,
    pattern: settings.pattern,
    umPerPx: u,
    units: { length: u === null ? 'px' : 'um', area: u === null ? 'px2' : 'um2' },
    field: { ...field, area: fieldArea * a2 },
    segmentation: inp.segment,
    cells: { count, interior: nInterior, edge: count - nInterior, densityPerArea: count / (fieldArea * a2) },
    area: { mean: areaStats.mean * a2, cv: areaStats.cv, n: areaStats.n, source: settings.pattern === 'points' ? 'voronoi' : 'segmentation' },
    sides: {
      mean: sides.mean,
      mu2: sides.mu2,
      p6: sides.p6,
      n: sides.n,
      distribution: sides.distribution,
      counts: sides.counts,
      source: settings.pattern === 'walls' ? 'segmentation' : 'voronoi',
    },
  };
}
