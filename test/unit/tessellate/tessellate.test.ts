import { describe, it, expect } from 'vitest';
import { Delaunay } from 'd3-delaunay';
import { tessellate } from '../../../src/core/tessellate';
import { seedPoints } from '../../../src/core/synth/seeds';
import { DegeneratePointsError, TooFewCellsError } from '../../../src/core/errors';
import type { Rect } from '../../../src/core/types';

const field: Rect = { x0: 10, y0: -5, x1: 1010, y1: 695 };
function randomSet(n: number, seed: number): Float64Array {
  const p = seedPoints(n, field.x1 - field.x0, field.y1 - field.y0, 'random', seed);
  for (let i = 0; i < n; i++) {
    p[2 * i]! += field.x0;
    p[2 * i + 1]! += field.y0;
  }
  return p;
}
const sum = (a: ArrayLike<number>): number => {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]!;
  return s;
};

describe('tessellate: invariants on a random set', () => {
  const pts = randomSet(3000, 5);
  const t = tessellate(pts, field);
  const n = 3000;

  it('cell areas sum to the field area (derived: the cells tile the field)', () => {
    expect(sum(t.area)).toBeCloseTo(1000 * 700, 6);
    for (const a of t.area) expect(a).toBeGreaterThan(0);
  });

  it('neighbours are symmetric, never self, never repeated', () => {
    const set = new Set<string>();
    for (let i = 0; i < n; i++) {
      const seen = new Set<number>();
      for (let k = t.neighbourOffsets[i]!; k < t.neighbourOffsets[i + 1]!; k++) {
        const j = t.neighbourIndex[k]!;
        expect(j).not.toBe(i);
        expect(seen.has(j)).toBe(false);
        seen.add(j);
        set.add(`${i},${j}`);
      }
    }
    for (const key of set) {
      const [i, j] = key.split(',');
      expect(set.has(`${j},${i}`)).toBe(true);
    }
  });

  it('interior cells have as many sides as neighbours; edge = 1 exactly for cells touching the border', () => {
    for (let i = 0; i < n; i++) {
      const touches = t.bbox[4 * i]! <= field.x0 || t.bbox[4 * i + 1]! <= field.y0 || t.bbox[4 * i + 2]! >= field.x1 || t.bbox[4 * i + 3]! >= field.y1;
      expect(t.edge[i]).toBe(touches ? 1 : 0);
      if (!t.edge[i]) expect(t.sides[i]).toBe(t.neighbourOffsets[i + 1]! - t.neighbourOffsets[i]!);
    }
  });

  it('perimeters, areas, centroids and boxes agree with the stored polygons and with d3-delaunay\'s own clipped cells', () => {
    const d3v = Delaunay.from(Array.from({ length: n }, (_, i) => [pts[2 * i]!, pts[2 * i + 1]!])).voronoi([field.x0, field.y0, field.x1, field.y1]);
    for (let i = 0; i < n; i++) {
      const o = t.polygonOffsets[i]!;
      const e = t.polygonOffsets[i + 1]!;
      expect(e - o).toBe(t.sides[i]);
      let per = 0;
      let a2 = 0;
      for (let k = o; k < e; k++) {
        const k2 = k + 1 < e ? k + 1 : o;
        const x = t.polygonCoords[2 * k]!, y = t.polygonCoords[2 * k + 1]!;
        const x2 = t.polygonCoords[2 * k2]!, y2 = t.polygonCoords[2 * k2 + 1]!;
        per += Math.hypot(x2 - x, y2 - y);
        a2 += x * y2 - x2 * y;
        expect(x >= t.bbox[4 * i]! && x <= t.bbox[4 * i + 2]! && y >= t.bbox[4 * i + 1]! && y <= t.bbox[4 * i + 3]!).toBe(true);
      }
      expect(per).toBeCloseTo(t.perimeter[i]!, 8);
      expect(a2 / 2).toBeCloseTo(t.area[i]!, 6); // positive shoelace orientation for every cell
      const poly = d3v.cellPolygon(i);
      let ad3 = 0;
      for (let k = 0; k + 1 < poly.length; k++) ad3 += poly[k]![0] * poly[k + 1]![1] - poly[k + 1]![0] * poly[k]![1];
      expect(Math.abs(ad3 / 2)).toBeCloseTo(t.area[i]!, 6);
      const cx = t.centroid[2 * i]!, cy = t.centroid[2 * i + 1]!;
      expect(cx > t.bbox[4 * i]! && cx < t.bbox[4 * i + 2]! && cy > t.bbox[4 * i + 1]! && cy < t.bbox[4 * i + 3]!).toBe(true);
    }
  });

  it('Delaunay triangles: 2n - 2 - h of them (derived: Euler\'s relation for a triangulated point set with h hull points)', () => {
    const T = t.triangles.length / 3;
    // Hull size from the triangles: edges used by a single triangle.
    const count = new Map<string, number>();
    for (let k = 0; k < t.triangles.length; k += 3) {
      for (let j = 0; j < 3; j++) {
        const a = t.triangles[k + j]!, b = t.triangles[k + ((j + 1) % 3)]!;
        const key = a < b ? `${a},${b}` : `${b},${a}`;
        count.set(key, (count.get(key) ?? 0) + 1);
      }
    }
    let h = 0;
    for (const c of count.values()) if (c === 1) h++;
    expect(T).toBe(2 * n - 2 - h);
  });

  it('same results up to scale when the fixture is rescaled by 1e-9 and 1e9 and shifted', () => {
    for (const s of [1e-9, 1e9]) {
      const f2: Rect = { x0: field.x0 * s + 3 * s, y0: field.y0 * s - 7 * s, x1: field.x1 * s + 3 * s, y1: field.y1 * s - 7 * s };
      const p2 = new Float64Array(pts.length);
      for (let i = 0; i < n; i++) {
        p2[2 * i] = pts[2 * i]! * s + 3 * s;
        p2[2 * i + 1] = pts[2 * i + 1]! * s - 7 * s;
      }
      const t2 = tessellate(p2, f2);
      expect(Array.from(t2.sides)).toEqual(Array.from(t.sides));
      expect(Array.from(t2.edge)).toEqual(Array.from(t.edge));
      expect(Array.from(t2.neighbourOffsets)).toEqual(Array.from(t.neighbourOffsets));
      expect(Array.from(t2.neighbourIndex)).toEqual(Array.from(t.neighbourIndex));
      for (let i = 0; i < n; i++) {
        expect(Math.abs(t2.area[i]! / (s * s) - t.area[i]!)).toBeLessThan(1e-9 * t.area[i]!);
        expect(Math.abs(t2.perimeter[i]! / s - t.perimeter[i]!)).toBeLessThan(1e-9 * t.perimeter[i]!);
        expect(Math.abs((t2.centroid[2 * i]! - 3 * s) / s - t.centroid[2 * i]!)).toBeLessThan(1e-7);
      }
    }
  });
});

describe('tessellate: lattices with known cells', () => {
  it('square lattice: every cell is an a x a square with 4 sides; interior cells have 4 neighbours (derived)', () => {
    const nx = 12, ny = 9, a = 2.5;
    const pts = new Float64Array(2 * nx * ny);
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      pts[2 * (j * nx + i)] = (i + 0.5) * a;
      pts[2 * (j * nx + i) + 1] = (j + 0.5) * a;
    }
    const t = tessellate(pts, { x0: 0, y0: 0, x1: nx * a, y1: ny * a });
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const c = j * nx + i;
      expect(t.area[c]).toBeCloseTo(a * a, 9);
      expect(t.perimeter[c]).toBeCloseTo(4 * a, 9);
      expect(t.sides[c]).toBe(4);
      expect(t.centroid[2 * c]).toBeCloseTo((i + 0.5) * a, 9);
      const border = i === 0 || j === 0 || i === nx - 1 || j === ny - 1;
      expect(t.edge[c]).toBe(border ? 1 : 0);
      const deg = t.neighbourOffsets[c + 1]! - t.neighbourOffsets[c]!;
      const expected = (i > 0 ? 1 : 0) + (i < nx - 1 ? 1 : 0) + (j > 0 ? 1 : 0) + (j < ny - 1 ? 1 : 0);
      expect(deg).toBe(expected);
    }
  });

  it('hexagonal lattice: interior cells are regular hexagons of area (sqrt 3 / 2) d^2 and perimeter 2 sqrt 3 d (derived)', () => {
    const d = 1.7, nx = 14, ny = 12;
    const h = (Math.sqrt(3) / 2) * d;
    const pts: number[] = [];
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) pts.push((i + 0.5 + (j % 2) * 0.5) * d, (j + 0.5) * h);
    const t = tessellate(Float64Array.from(pts), { x0: 0, y0: 0, x1: (nx + 1) * d, y1: ny * h });
    let interior = 0;
    for (let c = 0; c < nx * ny; c++) {
      const x = pts[2 * c]!, y = pts[2 * c + 1]!;
      if (x < 2 * d || y < 2 * d || x > (nx + 1) * d - 2 * d || y > ny * h - 2 * d) continue;
      interior++;
      expect(t.edge[c]).toBe(0);
      expect(t.sides[c]).toBe(6);
      expect(t.area[c]).toBeCloseTo(h * d, 9);
      expect(t.perimeter[c]).toBeCloseTo(2 * Math.sqrt(3) * d, 9);
    }
    expect(interior).toBeGreaterThan(60);
  });
});

describe('tessellate: Euler and the Weaire sum rule on a periodic tessellation', () => {
  it('on a 3 x 3 tiling the central copy has mean side number exactly 6 and obeys sum n p(n) m(n) = 36 + mu2 exactly', () => {
    // Euler on the torus with trivalent vertices gives a mean of exactly 6 sides (derived); the sum rule is
    // Weaire 1974, Metallography 7:157 (pub, memory), an identity on any closed trivalent network.
    const n = 2000, W = 400, H = 300;
    const base = seedPoints(n, W, H, 'random', 9);
    const tiled = new Float64Array(18 * n);
    let k = 0;
    for (let ty = 0; ty < 3; ty++) for (let tx = 0; tx < 3; tx++) for (let i = 0; i < n; i++) {
      tiled[k++] = base[2 * i]! + tx * W;
      tiled[k++] = base[2 * i + 1]! + ty * H;
    }
    const t = tessellate(tiled, { x0: 0, y0: 0, x1: 3 * W, y1: 3 * H });
    const c0 = 4 * n; // the central tile
    const sides = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      expect(t.edge[c0 + i]).toBe(0);
      sides[i] = t.sides[c0 + i]!;
    }
    const total = sum(sides);
    expect(total).toBe(6 * n);
    let sumN2 = 0;
    let lhs = 0; // sum over cells of n_i * m_i, m_i the mean side number of i's neighbours
    for (let i = 0; i < n; i++) {
      sumN2 += sides[i]! * sides[i]!;
      let s = 0;
      const o = t.neighbourOffsets[c0 + i]!, e = t.neighbourOffsets[c0 + i + 1]!;
      for (let q = o; q < e; q++) s += sides[t.neighbourIndex[q]! % n]!;
      lhs += s; // n_i * (s / n_i)
    }
    const mu2 = sumN2 / n - 36;
    expect(lhs / n).toBeCloseTo(36 + mu2, 10);
  });
});

describe('tessellate: bad input', () => {
  const f: Rect = { x0: 0, y0: 0, x1: 10, y1: 10 };
  it('fewer than 3 points: the triangulating engine refuses them (tessellate() splits the field itself, see few.test.ts)', async () => {
    const { tessellateCells } = await import('../../../src/core/tessellate');
    expect(() => tessellateCells(Float64Array.from([1, 1, 2, 2]), f)).toThrow(TooFewCellsError);
    expect(() => tessellateCells(Float64Array.from([1, 1, 2, 2]), f)).toThrow(/at least 3 points; got 2/);
  });
  it('all collinear', () => {
    expect(() => tessellate(Float64Array.from([1, 1, 2, 2, 3, 3, 4, 4, 5, 5]), f)).toThrow(DegeneratePointsError);
    expect(() => tessellate(Float64Array.from([1, 1, 2, 2, 3, 3, 4, 4, 5, 5]), f)).toThrow(/one line/);
  });
  it('points within a hair of one line are refused as on one line, and left where they are', () => {
    // 40 points along the diagonal, each moved off it by at most 1e-13 px (derived: a triangle of them then
    // has a doubled area below 2e-12 in units of the mean spacing, under the flatness rule's 1e-10).
    const hair = Float64Array.from({ length: 80 }, (_, k) => 0.2 + (k >> 1) * 0.24 + (k % 2 ? 1 : -1) * ((k * 7919) % 11 - 5) * 2e-14);
    const copy = hair.slice();
    expect(() => tessellate(hair, f)).toThrow(/All 40 points lie on one line/);
    expect(Array.from(hair)).toEqual(Array.from(copy));
    // The same points moved across the line by up to 0.05 px span a field that is tiled exactly.
    const spread = Float64Array.from({ length: 80 }, (_, k) => 0.2 + (k >> 1) * 0.24 + (k % 2 ? 1 : -1) * ((k * 7919) % 11 - 5) * 1e-2);
    expect(sum(tessellate(spread, f).area)).toBeCloseTo(100, 9);
  });
  it('duplicate points are refused and named', () => {
    expect(() => tessellate(Float64Array.from([1, 1, 5, 2, 3, 7, 5, 2, 8, 8]), f)).toThrow(/Points 2 and 4 coincide/);
    expect(() => tessellate(Float64Array.from([1, 1, 1, 1, 1, 1, 1, 1]), f)).toThrow(DegeneratePointsError);
  });
  it('points off the field or not finite', () => {
    expect(() => tessellate(Float64Array.from([1, 1, 5, 2, 3, 17]), f)).toThrow(/Point 3 .* outside the field/);
    expect(() => tessellate(Float64Array.from([1, 1, NaN, 2, 3, 7]), f)).toThrow(/Point 2 is not a finite/);
  });
});

describe('Tessellator: a reused engine gives what a fresh tessellation gives', () => {
  const same = (a: ArrayLike<number>, b: ArrayLike<number>) => expect(Array.from(a)).toEqual(Array.from(b));
  it('bit for bit over runs of equal and different sizes, after a refused point set, in every output form (derived: reuse must not change results)', async () => {
    const { Tessellator, tessellateCells } = await import('../../../src/core/tessellate');
    const { windowCells, windowCellsRetained } = await import('../../../src/core/reference/window');
    const engine = new Tessellator(true);
    const sets = [randomSet(800, 1), randomSet(800, 2), randomSet(500, 3), randomSet(800, 4)];
    const inner: Rect = { x0: 200, y0: 100, x1: 800, y1: 600 };
    for (const [k, p] of sets.entries()) {
      if (k === 2) {
        const line = new Float64Array(1600);
        for (let i = 0; i < 800; i++) { line[2 * i] = field.x0 + i; line[2 * i + 1] = 0; }
        expect(() => engine.run(line, field, 'cells')).toThrow(DegeneratePointsError);
      }
      const fresh = tessellate(p, field);
      const cells = engine.run(p, field, 'cells');
      for (const key of ['area', 'perimeter', 'sides', 'centroid', 'edge', 'bbox', 'neighbourOffsets', 'neighbourIndex'] as const) same(cells[key], fresh[key]);
      const lean = tessellateCells(p, field);
      same(lean.neighbourIndex, fresh.neighbourIndex);
      const full = engine.run(p, field, 'polygons') as typeof fresh;
      same(full.polygonCoords, fresh.polygonCoords);
      same(full.polygonOffsets, fresh.polygonOffsets);
      same(full.triangles, fresh.triangles);
      const w1 = windowCells(fresh, inner);
      const w2 = windowCellsRetained(engine.run(p, field, 'retained'), engine, inner);
      for (const key of ['area', 'perimeter', 'sides', 'centroid', 'edge', 'bbox', 'neighbourOffsets', 'neighbourIndex'] as const) same(w2[key], w1[key]);
    }
  });
});

describe('Tessellator: large sets walked in radial order', () => {
  /** Index of the first difference (-1: the same length and the same values, bit for bit). */
  const firstDifference = (a: ArrayLike<number>, b: ArrayLike<number>): number => {
    if (a.length !== b.length) return Math.min(a.length, b.length);
    for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return i;
    return -1;
  };
  const same = (a: ArrayLike<number>, b: ArrayLike<number>) => expect(firstDifference(a, b)).toBe(-1);
  const keys = ['area', 'perimeter', 'sides', 'centroid', 'edge', 'bbox', 'neighbourOffsets', 'neighbourIndex', 'polygonOffsets', 'polygonCoords', 'triangles'] as const;

  it('gives the values of the caller\'s order bit for bit, in every output form (derived: the processing order must not change results)', async () => {
    const { Tessellator, RADIAL_ORDER_MIN_POINTS } = await import('../../../src/core/tessellate');
    // Above the threshold, so tessellate() itself takes the radial path; and a small set forced onto it.
    // Random points are in general position: no four on one circle, so the triangulation is unique.
    const big = randomSet(RADIAL_ORDER_MIN_POINTS + 1000, 11);
    const small = randomSet(2000, 12);
    for (const p of [big, small]) {
      const plain = new Tessellator(false, Infinity).run(p, field, 'polygons') as ReturnType<typeof tessellate>;
      const radial = p === big ? tessellate(p, field) : (new Tessellator(false, 0).run(p, field, 'polygons') as ReturnType<typeof tessellate>);
      for (const k of keys) same(radial[k], plain[k]);
      // The reused engine and the retained polygons, read back cell by cell.
      const engine = new Tessellator(true, 0);
      const plainEngine = new Tessellator(true, Infinity);
      for (let round = 0; round < 2; round++) {
        const r = engine.run(p, field, 'retained');
        const q = plainEngine.run(p, field, 'retained');
        for (const k of ['area', 'sides', 'neighbourIndex'] as const) same(r[k], q[k]);
        const a: number[] = [];
        const b: number[] = [];
        for (let i = 0; i < p.length / 2; i += 97) {
          engine.cellPolygon(i, a);
          plainEngine.cellPolygon(i, b);
          same(a, b);
          same(a, plain.polygonCoords.subarray(2 * plain.polygonOffsets[i]!, 2 * plain.polygonOffsets[i + 1]!));
        }
      }
    }
  });

  it('matches d3-delaunay\'s own clipped cells on a large set (reference library: d3-delaunay 6)', async () => {
    const { RADIAL_ORDER_MIN_POINTS } = await import('../../../src/core/tessellate');
    const n = RADIAL_ORDER_MIN_POINTS + 500;
    const pts = randomSet(n, 13);
    const t = tessellate(pts, field);
    expect(sum(t.area)).toBeCloseTo(1000 * 700, 4);
    const d3 = new Delaunay(pts.slice());
    const v = d3.voronoi([field.x0, field.y0, field.x1, field.y1]);
    for (let i = 0; i < n; i += 101) {
      const poly = v.cellPolygon(i);
      let a2 = 0;
      for (let k = 0; k + 1 < poly.length; k++) a2 += poly[k]![0] * poly[k + 1]![1] - poly[k + 1]![0] * poly[k]![1];
      expect(t.area[i]).toBeCloseTo(Math.abs(a2) / 2, 6);
      const mine = Array.from(t.neighbourIndex.subarray(t.neighbourOffsets[i]!, t.neighbourOffsets[i + 1]!)).sort((x, y) => x - y);
      const theirs = [...d3.neighbors(i)].sort((x, y) => x - y);
      // d3 also lists Delaunay neighbours whose shared Voronoi edge lies wholly outside the field.
      for (const j of mine) expect(theirs).toContain(j);
      if (!t.edge[i]) expect(mine).toEqual(theirs);
    }
  });
});
