/**
 * One or two points: the field itself, or the field cut along the perpendicular bisector (derived from the
 * definition of a Voronoi cell). An analysis of one or two cells keeps its table and summary and says which
 * statistics are left out and why.
 */
import { describe, expect, it } from 'vitest';
import { tessellate } from '../../../src/core/tessellate';
import { analyze } from '../../../src/core/analyze';
import { DegeneratePointsError, NoCellsError } from '../../../src/core/errors';

const field = { x0: 0, y0: 0, x1: 100, y1: 100 };

describe('tessellation of one or two points', () => {
  it('one point owns the whole field', () => {
    const t = tessellate(Float64Array.of(30, 40), field);
    expect(Array.from(t.area)).toEqual([10000]);
    expect(Array.from(t.perimeter)).toEqual([400]);
    expect(Array.from(t.centroid)).toEqual([50, 50]);
    expect(Array.from(t.sides)).toEqual([4]);
    expect(Array.from(t.edge)).toEqual([1]);
    expect(t.neighbourIndex.length).toBe(0);
  });
  it('two points on a horizontal line split the field at the midpoint (x = 40)', () => {
    const t = tessellate(Float64Array.of(20, 50, 60, 50), field);
    expect(t.area[0]).toBeCloseTo(4000, 9);
    expect(t.area[1]).toBeCloseTo(6000, 9);
    expect(t.centroid[0]).toBeCloseTo(20, 9);
    expect(t.centroid[2]).toBeCloseTo(70, 9);
    expect(Array.from(t.neighbourIndex)).toEqual([1, 0]);
  });
  it('two points on a diagonal: the cells are triangles or pentagons whose areas sum to the field', () => {
    const t = tessellate(Float64Array.of(10, 10, 90, 90), field);
    // The bisector x + y = 100 is the other diagonal: two triangles of 5000 px² each.
    expect(t.area[0]).toBeCloseTo(5000, 9);
    expect(t.area[1]).toBeCloseTo(5000, 9);
    expect(Array.from(t.sides)).toEqual([3, 3]);
    const u = tessellate(Float64Array.of(10, 20, 70, 60), field);
    expect(u.area[0]! + u.area[1]!).toBeCloseTo(10000, 9);
  });
  it('refuses coincident or outside points with a message that says what to do', () => {
    expect(() => tessellate(Float64Array.of(5, 5, 5, 5), field)).toThrow(DegeneratePointsError);
    expect(() => tessellate(Float64Array.of(5, 5, 5, 5), field)).toThrow(/coincide.*merge/);
    expect(() => tessellate(Float64Array.of(500, 5), field)).toThrow(/outside the field/);
  });
});

describe('an analysis of few cells', () => {
  function discs(centres: number[][]) {
    const W = 400, H = 300;
    const data = new Uint8Array(W * H).fill(30);
    for (const [cx, cy] of centres) for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) if ((x - cx!) ** 2 + (y - cy!) ** 2 < 1600) data[y * W + x] = 200;
    return { width: W, height: H, data, bitDepth: 8 as const };
  }
  it('two bodies: a table of two cells with their areas, a summary, no verdict and the reason', async () => {
    const a = await analyze({ kind: 'image', image: discs([[100, 80], [300, 150]]) }, { pattern: 'bodies' });
    expect(a.summary.cells.count).toBe(2);
    // A disc of radius 40 px: π·40² ≈ 5027 px² (derived); the pixel count of x² + y² < 1600 is 5013.
    for (const v of a.columns.area_px2!) expect(Math.abs(v - Math.PI * 1600) / (Math.PI * 1600)).toBeLessThan(0.01);
    expect(a.summary.randomness.verdict).toBeNull();
    expect(a.summary.randomness.warnings.join(' ')).toMatch(/2 cells cannot be compared with random seeding/);
  });
  it('one point: analysed; none: refused with a clear error', async () => {
    const one = await analyze({ kind: 'points', points: Float64Array.of(10, 10), width: 100, height: 100 }, {});
    expect(one.summary.cells.count).toBe(1);
    expect(one.tessellation.area[0]).toBe(10000);
    await expect(analyze({ kind: 'points', points: new Float64Array(0), width: 100, height: 100 }, {})).rejects.toThrow(NoCellsError);
    await expect(analyze({ kind: 'image', image: discs([]) }, { pattern: 'bodies' })).rejects.toThrow(/No cells|uniform|threshold/);
  });
});
