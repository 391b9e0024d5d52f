/**
 * Voronoi-likeness: how well the Voronoi cells of the segmented cells' own centroids reproduce the
 * segmented cells. Near 1: the pattern is what seeding at the centroids would grow (a centroidal Voronoi
 * tessellation); well below 1: the walls are not where the centroids' bisectors would put them.
 */
import { Delaunay } from 'd3-delaunay';
import type { Tessellation } from '../tessellate';
import { delaunayNeighbours } from '../tessellate/neighbours';
import type { LabelImage } from '../types';

export interface VoronoiLikeness {
  /** Per cell: the fraction of its pixels that lie in the Voronoi cell of its own centroid (NaN if no pixel sampled). */
  overlap: Float64Array;
  /** Per cell: segmented area / Voronoi area (walls make this a little below 1). */
  areaRatio: Float64Array;
  /** Median of `overlap` over interior cells. */
  medianOverlap: number;
  /** Pixel-weighted overlap over interior cells: Σ|Sᵢ ∩ Vᵢ| / Σ|Sᵢ|. */
  overallOverlap: number;
  /** Sampling step in px (1 = every pixel). */
  stepPx: number;
}

/**
 * For each labelled pixel (on a grid of `stepPx`, chosen so that at most about 4 million pixels are
 * looked at), tests whether it lies in the Voronoi cell of its own cell's centroid: a point is in the
 * Voronoi cell of c_i when no Delaunay neighbour of c_i is nearer (the cell is the intersection of the
 * half-planes of its Delaunay neighbours; Okabe et al. 2000, Spatial Tessellations, property V2; pub,
 * memory). A pixel equally far from its own centroid and a neighbour counts as inside. Pixel centres are
 * at (x + 0.5, y + 0.5).
 *
 * @param labels the segmentation; cell k has label k + 1
 * @param t the tessellation of the cells' centroids (point k = cell k)
 * @param edge per-cell edge flags (edge cells are left out of the summaries)
 */
export function voronoiLikeness(labels: LabelImage, t: Tessellation, edge: Uint8Array): VoronoiLikeness {
  const n = t.area.length;
  const inside = new Float64Array(n);
  const total = new Float64Array(n);
  const pixels = new Float64Array(n);
  const step = Math.max(1, Math.ceil(Math.sqrt((labels.width * labels.height) / 4e6)));
  const pts = t.points;
  const { offsets, index } = delaunayNeighbours(new Delaunay(pts.slice()), n);
  const { x0, y0, x1, y1 } = t.field;
  for (let y = Math.max(0, Math.floor(y0)); y < Math.min(labels.height, Math.ceil(y1)); y += step) {
    const py = y + 0.5;
    const row = y * labels.width;
    for (let x = Math.max(0, Math.floor(x0)); x < Math.min(labels.width, Math.ceil(x1)); x += step) {
      const l = labels.labels[row + x]!;
      if (l <= 0 || l > n) continue;
      const i = l - 1;
      const px = x + 0.5;
      const dx = px - pts[2 * i]!;
      const dy = py - pts[2 * i + 1]!;
      const own = dx * dx + dy * dy;
      let nearest = true;
      for (let q = offsets[i]!; q < offsets[i + 1]!; q++) {
        const j = index[q]!;
        const ex = px - pts[2 * j]!;
        const ey = py - pts[2 * j + 1]!;
        if (ex * ex + ey * ey < own) {
          nearest = false;
          break;
        }
      }
      total[i]!++;
      if (nearest) inside[i]!++;
    }
  }
  for (let i = 0; i < labels.labels.length; i++) {
    const l = labels.labels[i]!;
    if (l > 0 && l <= n) pixels[l - 1]!++;
  }
  const overlap = new Float64Array(n);
  const areaRatio = new Float64Array(n);
  const list: number[] = [];
  let si = 0;
  let st = 0;
  for (let k = 0; k < n; k++) {
    overlap[k] = total[k]! > 0 ? inside[k]! / total[k]! : Number.NaN;
    areaRatio[k] = t.area[k]! > 0 ? pixels[k]! / t.area[k]! : Number.NaN;
    if (!edge[k] && total[k]! > 0) {
      list.push(overlap[k]!);
      si += inside[k]!;
      st += total[k]!;
    }
  }
  list.sort((a, b) => a - b);
  const med = list.length ? (list.length % 2 ? list[(list.length - 1) / 2]! : (list[list.length / 2 - 1]! + list[list.length / 2]!) / 2) : Number.NaN;
  return { overlap, areaRatio, medianOverlap: med, overallOverlap: st > 0 ? si / st : Number.NaN, stepPx: step };
}

