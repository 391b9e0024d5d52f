/** Matching of segmented cells to the generator's truth tiling, for the ground-truth tests. */
import type { Analysis } from '../../src/core/analysis.types';
import { cellSums } from '../../src/core/measure/kernel';
import { tessellate } from '../../src/core/tessellate/index';
import type { SynthResult } from '../../src/core/synth/index';

export interface TruthMatch {
  truthCells: number;
  found: number;
  /** Median of |A_seg − A_truth| / A_truth over interior matched cells. */
  medianAreaError: number;
  /** Interior cells (both sides) whose segmented neighbour count equals the exact Voronoi side count. */
  sidesMatch: number;
  sidesCompared: number;
}

/**
 * A truth cell is found when one segmented cell holds more than half of it and is itself more than half
 * that truth cell (a one-to-one majority overlap).
 */
export function matchTruth(r: SynthResult, a: Analysis): TruthMatch {
  const L = a.labels!.labels;
  const T = r.truth.labels;
  const nT = r.truth.count;
  const nS = a.labels!.count;
  const segArea = new Float64Array(nS + 1);
  const truthArea = new Float64Array(nT + 1);
  const pair = new Map<number, number>();
  for (let i = 0; i < L.length; i++) {
    segArea[L[i]!]!++;
    truthArea[T[i]!]!++;
    const k = T[i]! * (nS + 1) + L[i]!;
    pair.set(k, (pair.get(k) ?? 0) + 1);
  }
  const best = new Int32Array(nT + 1);
  const bestc = new Float64Array(nT + 1);
  for (const [k, c] of pair) {
    const t = Math.floor(k / (nS + 1));
    if (c > bestc[t]!) (bestc[t] = c), (best[t] = k % (nS + 1));
  }
  const truthSums = cellSums(r.truth);
  const exact = tessellate(r.seeds, { x0: 0, y0: 0, x1: r.truth.width, y1: r.truth.height });
  const nb = a.columns['neighbours']!;
  const edge = a.columns['edge']!;
  let found = 0;
  const errs: number[] = [];
  let sidesMatch = 0;
  let sidesCompared = 0;
  for (let t = 1; t <= nT; t++) {
    const l = best[t]!;
    if (!(l > 0 && bestc[t]! > 0.5 * truthArea[t]! && bestc[t]! > 0.5 * segArea[l]!)) continue;
    found++;
    if (truthSums.edge[t - 1] || edge[l - 1]) continue;
    errs.push(Math.abs(segArea[l]! - truthArea[t]!) / truthArea[t]!);
    if (exact.edge[t - 1]) continue;
    sidesCompared++;
    if (nb[l - 1] === exact.sides[t - 1]) sidesMatch++;
  }
  errs.sort((x, y) => x - y);
  return { truthCells: nT, found, medianAreaError: errs[errs.length >> 1]!, sidesMatch, sidesCompared };
}
