import { describe, expect, it } from 'vitest';
import { clipToRect, polygonMeasures } from '../../../src/core/tessellate/polygon';

function measures(poly: number[]) {
  const area = new Float64Array(1);
  const perimeter = new Float64Array(1);
  const centroid = new Float64Array(2);
  const bbox = new Float64Array(4);
  polygonMeasures(poly, 0, poly.length, 0, area, perimeter, centroid, bbox);
  return { area: area[0]!, perimeter: perimeter[0]!, centroid: [...centroid], bbox: [...bbox] };
}

function clipped(poly: number[], x0: number, y0: number, x1: number, y1: number): number[] {
  const p = [...poly];
  clipToRect(p, [], x0, y0, x1, y1);
  return p;
}

describe('convex polygon clipping and measures (values worked by hand)', () => {
  it('a square cut to a strip: a 3 × 10 rectangle (area 30, perimeter 26, centroid (3.5, 5))', () => {
    const p = clipped([0, 0, 10, 0, 10, 10, 0, 10], 2, -1, 5, 20);
    expect(p.length).toBe(8);
    const m = measures(p);
    expect(m.area).toBe(30);
    expect(m.perimeter).toBe(26);
    expect(m.centroid).toEqual([3.5, 5]);
    expect(m.bbox).toEqual([2, 0, 5, 10]);
  });

  it('a triangle cut by a square: the pentagon (0,0) (6,0) (6,2) (2,6) (0,6)', () => {
    // Square 36 less the corner triangle (2,6) (6,2) (6,6) of area 8: 28. Centroid (36·3 − 8·14/3) / 28 =
    // 53/21 on both axes. Perimeter 6 + 2 + 4√2 + 2 + 6.
    for (const tri of [[0, 0, 8, 0, 0, 8], [0, 8, 8, 0, 0, 0]]) {
      const p = clipped(tri, 0, 0, 6, 6);
      expect(p.length).toBe(10);
      const m = measures(p);
      expect(m.area).toBeCloseTo(28, 12);
      expect(m.perimeter).toBeCloseTo(16 + 4 * Math.SQRT2, 12);
      expect(m.centroid[0]).toBeCloseTo(53 / 21, 12);
      expect(m.centroid[1]).toBeCloseTo(53 / 21, 12);
      expect(m.bbox).toEqual([0, 0, 6, 6]);
      // Crossings lie exactly on the bound they cross.
      const xs = new Set(p.filter((_, k) => k % 2 === 0));
      const ys = new Set(p.filter((_, k) => k % 2 === 1));
      expect([...xs].sort()).toEqual([0, 2, 6]);
      expect([...ys].sort()).toEqual([0, 2, 6]);
    }
  });

  it('a crossing at an inexact fraction still lands on the bound', () => {
    // Both edges from x = 0.1 cross x = 0.45; interpolating x along them gives 0.1 + t·0.6 = 0.45000000000000007
    // in double precision (t = 0.35 / 0.6), the bound itself is what is kept.
    const p = clipped([0.1, 0, 0.7, 0.3, 0.1, 0.9], 0.45, 0, 1, 1);
    expect(p.length).toBe(6);
    for (let k = 0; k < p.length; k += 2) expect([0.45, 0.7]).toContain(p[k]);
  });

  it('a polygon outside the rectangle clips to nothing', () => {
    expect(clipped([0, 0, 1, 0, 0, 1], 2, 2, 3, 3)).toEqual([]);
  });

  it('a degenerate polygon has no area and its first vertex as centroid', () => {
    const m = measures([1, 1, 3, 1, 5, 1]);
    expect(m.area).toBe(0);
    expect(m.centroid).toEqual([1, 1]);
    expect(m.perimeter).toBe(8);
  });
});
