import { describe, it, expect } from 'vitest';
import { SvgPath, LineClosingSink, drawVoronoi, drawDelaunay, drawCentroids, drawRect, largestGap, nearestCentroid, niceScaleLength } from '../../../src/ui/render/overlay';
import { tessellate } from '../../../src/core/tessellate/index';

// Four seeds at the centres of the quadrants of a 100 x 100 field: the Voronoi cells are the quadrants.
const t = tessellate(new Float64Array([25, 25, 75, 25, 25, 75, 75, 75]), { x0: 0, y0: 0, x1: 100, y1: 100 });

describe('overlay renderer (draws into any moveTo/lineTo sink)', () => {
  it('draws one closed polygon per Voronoi cell', () => {
    const p = new SvgPath();
    drawVoronoi(new LineClosingSink(p), t);
    const d = p.toString();
    expect(d).not.toContain('Z');
    expect(d.match(/M/g)?.length).toBe(4);
    // Each polygon ends where it began.
    for (const poly of d.split('M').slice(1)) {
      const pts = [...poly.matchAll(/(-?[\d.]+) (-?[\d.]+)/g)].map((m) => m[0]);
      expect(pts[pts.length - 1]).toBe(pts[0]);
    }
    // Every vertex lies on the quadrant grid (derived: the bisectors of the seeds are x = 50 and y = 50).
    for (const m of d.matchAll(/[ML](-?[\d.]+) (-?[\d.]+)/g)) {
      expect([0, 50, 100]).toContain(Math.round(Number(m[1])));
      expect([0, 50, 100]).toContain(Math.round(Number(m[2])));
    }
  });
  it('draws only the cells asked for', () => {
    const p = new SvgPath();
    drawVoronoi(p, t, [2]);
    expect(p.toString().match(/M/g)?.length).toBe(1);
  });
  it('draws each Delaunay edge once: a square cut into 2 triangles has 4 sides and 1 diagonal', () => {
    const p = new SvgPath();
    drawDelaunay(p, t);
    expect(p.toString().match(/M/g)?.length).toBe(5);
  });
  it('centroid crosses and rectangles', () => {
    const p = new SvgPath();
    drawCentroids(p, t.points, 2);
    expect(p.toString().match(/M/g)?.length).toBe(8);
    const r = new SvgPath();
    drawRect(r, { x0: 1, y0: 2, x1: 3, y1: 4 });
    expect(r.toString()).toBe('M1 2L3 2L3 4L1 4Z');
  });
  it('the largest gap is centred on a Voronoi vertex, at its distance to the nearest seed', () => {
    const g = largestGap(t)!;
    // The field corners are 25·√2 from their seed, as is the centre (50, 50); nothing is farther.
    expect(g.r).toBeCloseTo(25 * Math.SQRT2, 9);
  });
  it('nearest centroid and scale-bar lengths', () => {
    expect(nearestCentroid(t.points, 80, 10)).toBe(1);
    expect(nearestCentroid(new Float64Array(0), 0, 0)).toBe(-1);
    expect(niceScaleLength(73)).toBe(50);
    expect(niceScaleLength(0.3)).toBe(0.2);
    expect(niceScaleLength(1)).toBe(1);
    expect(niceScaleLength(0)).toBe(0);
  });
});
