/**
 * Invariants of the pipeline (the geometric checks of docs/design.md): tiling, rotation, calibration, Voronoi areas.
 * Sources: a tessellation's cells partition its window, so their areas sum to the window's (derived from
 * the definition of a tessellation); lengths scale with the unit and areas with its square (derived:
 * dimensional analysis); pixel-grid measurements are unchanged by a quarter turn of the grid (derived:
 * the 2x2 window weights and run sums are symmetric under it).
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import { clearReferenceCache } from '../../src/core/reference/montecarlo';
import { synthesize } from '../../src/core/synth/index';
import type { GreyImage } from '../../src/core/types';

function rotate90(img: GreyImage): GreyImage {
  // Clockwise on screen: new (x', y') = (H − 1 − y, x); new width = old height.
  const { width: w, height: h } = img;
  const out = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) out[x * h + (h - 1 - y)] = img.data[y * w + x]!;
  return { width: h, height: w, data: out, bitDepth: 8 };
}

const sum = (a: ArrayLike<number>) => {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]!;
  return s;
};

describe('invariants', () => {
  const r = synthesize({ pattern: 'walls', cells: 300, width: 640, height: 480, order: 'random', seed: 5 });

  it('walls cells tile the field and the Voronoi cells of the centroids sum to the field area', async () => {
    const a = await analyze({ kind: 'image', image: r.image }, {});
    expect(sum(a.columns['area_px2']!)).toBe(640 * 480);
    expect(sum(a.columns['voronoi_area_px2']!)).toBeCloseTo(640 * 480, 6);
  });

  it('rotating the image by 90° leaves the table unchanged up to order', async () => {
    const a = await analyze({ kind: 'image', image: r.image }, {});
    const b = await analyze({ kind: 'image', image: rotate90(r.image) }, {});
    expect(b.labels!.count).toBe(a.labels!.count);
    const key = (areas: ArrayLike<number>, per: ArrayLike<number>, sol: ArrayLike<number>) =>
      Array.from({ length: areas.length }, (_, i) => `${areas[i]}|${per[i]!.toFixed(6)}|${sol[i]!.toFixed(9)}`).sort();
    // Pixel areas, perimeters (the 2x2 window weights are symmetric under a quarter turn) and solidity are
    // exactly invariant; the segmentation itself is rotation-symmetric up to opencv's kernels.
    const ka = key(a.columns['area_px2']!, a.columns['perimeter_px']!, a.columns['solidity']!);
    const kb = key(b.columns['area_px2']!, b.columns['perimeter_px']!, b.columns['solidity']!);
    let same = 0;
    const setB = new Set(kb);
    for (const k of ka) if (setB.has(k)) same++;
    expect(same / ka.length).toBeGreaterThan(0.98);
    // Orientation turns by 90° (modulo 180°): compare the sorted axes, which do not change.
    const axes = (x: typeof a) => Array.from(x.columns['major_axis_px']!).map((v) => v.toFixed(6)).sort();
    const A = axes(a);
    const B = new Set(axes(b));
    expect(A.filter((v) => B.has(v)).length / A.length).toBeGreaterThan(0.98);
  });

  it('doubling the pixel size doubles lengths and quadruples areas', async () => {
    const a = await analyze({ kind: 'image', image: r.image }, { umPerPx: 0.5 });
    const b = await analyze({ kind: 'image', image: r.image }, { umPerPx: 1 });
    const n = a.labels!.count;
    for (let i = 0; i < n; i++) {
      expect(b.columns['perimeter_um']![i]).toBeCloseTo(2 * a.columns['perimeter_um']![i]!, 9);
      expect(b.columns['major_axis_um']![i]).toBeCloseTo(2 * a.columns['major_axis_um']![i]!, 9);
      expect(b.columns['area_um2']![i]).toBeCloseTo(4 * a.columns['area_um2']![i]!, 9);
      expect(b.columns['voronoi_area_um2']![i]).toBeCloseTo(4 * a.columns['voronoi_area_um2']![i]!, 6);
      expect(b.columns['circularity']![i]).toBe(a.columns['circularity']![i]);
    }
    expect((b.summary as any).area.mean).toBeCloseTo(4 * (a.summary as any).area.mean, 6);
  });

  it('a field limits the analysis and keeps image coordinates', async () => {
    const f = { x0: 100, y0: 50, x1: 500, y1: 400 };
    const a = await analyze({ kind: 'image', image: r.image }, { field: f });
    expect(sum(a.columns['area_px2']!)).toBe(400 * 350);
    const xs = a.columns['x_px']!;
    for (const x of xs) expect(x >= 100 && x <= 500).toBe(true);
    expect(a.labels!.width).toBe(400);
  });

  it('the same inputs give identical outputs (determinism)', async () => {
    // The reference cache is emptied before each run, so that each draws its random-seeding reference
    // afresh instead of the second reading the first's cached object.
    // A drawn reference moves the statistics stage through intermediate fractions; a cached one reports
    // only its end, so counting them shows that both runs drew.
    const run = async () => {
      clearReferenceCache();
      const steps: number[] = [];
      const out = await analyze({ kind: 'image', image: r.image }, {}, { onProgress: (s, f) => s === 'statistics' && f > 0 && f < 1 && steps.push(f) });
      return { out, steps: steps.length };
    };
    const { out: a, steps: drawnA } = await run();
    const { out: b, steps: drawnB } = await run();
    expect(drawnA).toBeGreaterThan(5);
    expect(drawnB).toBeGreaterThan(5);
    expect(JSON.stringify(a.summary)).toBe(JSON.stringify(b.summary));
    expect(Buffer.from(a.labels!.labels.buffer).equals(Buffer.from(b.labels!.labels.buffer))).toBe(true);
  });
});
