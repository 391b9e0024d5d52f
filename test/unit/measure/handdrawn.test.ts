/**
 * Measurements on small hand-drawn rasters. Two kinds of expected value, each marked beside its check:
 * - derived: worked out by hand from a definition (a pixel count, a symmetry, a hull drawn on paper);
 * - scikit-image: the same rasters measured once with scikit-image 0.19.3 regionprops (Debian's
 *   python3-skimage) and, for the hull of the pixel squares, scipy 1.10.1 spatial.ConvexHull, by
 *   scripts/reference/handdrawn_regionprops.py, whose printed values are pasted below as literals. The script
 *   converts regionprops' conventions to the project's (centroid +0.5 px, axes with each pixel's 1/12 px²,
 *   orientation from the row axis to counter-clockwise from +x on screen) and says how.
 */
import { describe, expect, it } from 'vitest';
import { cellSums } from '../../../src/core/measure/kernel';
import { MEASUREMENTS, measureColumns, type MeasureContext } from '../../../src/core/measure/registry';
import type { LabelImage } from '../../../src/core/types';

function raster(w: number, h: number, f: (x: number, y: number) => number): LabelImage {
  const labels = new Int32Array(w * h);
  let count = 0;
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) (labels[y * w + x] = f(x, y)), (count = Math.max(count, labels[y * w + x]!));
  return { width: w, height: h, labels, count };
}

const t30 = (30 * Math.PI) / 180;
/** The rasters of scripts/reference/handdrawn_regionprops.py, drawn the same way. */
const shapes = {
  rectangle: () => raster(40, 30, (x, y) => (x >= 5 && x < 25 && y >= 7 && y < 17 ? 1 : 0)),
  upright: () => raster(30, 40, (x, y) => (x >= 7 && x < 17 && y >= 5 && y < 25 ? 1 : 0)),
  barDown: () => raster(40, 40, (x, y) => (Math.abs(x - y) <= 1 && x + y >= 6 && x + y <= 72 ? 1 : 0)),
  barUp: () => raster(40, 40, (x, y) => (Math.abs(x - (39 - y)) <= 1 && x + (39 - y) >= 6 && x + (39 - y) <= 72 ? 1 : 0)),
  disc: () => raster(80, 80, (x, y) => ((x + 0.5 - 40) ** 2 + (y + 0.5 - 40) ** 2 <= 30 * 30 ? 1 : 0)),
  // L = [0,10)x[0,30) ∪ [10,30)x[20,30) inside a 40 x 40 image, offset by (2, 2).
  L: () =>
    raster(40, 40, (x, y) => {
      const u = x - 2;
      const v = y - 2;
      return (u >= 0 && u < 10 && v >= 0 && v < 30) || (u >= 10 && u < 30 && v >= 20 && v < 30) ? 1 : 0;
    }),
  // Semi-axes 25 and 10 px, major axis 30° counter-clockwise from +x on screen, centred off the grid's
  // symmetry points (no symmetry of the raster ties its second moments).
  ellipse: () =>
    raster(90, 80, (x, y) => {
      const u = x + 0.5 - 44.3;
      const v = -(y + 0.5 - 39.7);
      const a = u * Math.cos(t30) + v * Math.sin(t30);
      const b = -u * Math.sin(t30) + v * Math.cos(t30);
      return (a / 25) ** 2 + (b / 10) ** 2 <= 1 ? 1 : 0;
    }),
};

interface SkimageRow {
  area: number; x: number; y: number; major: number; minor: number; eqDiameter: number; crofton: number; hullArea: number;
  /** Converted orientation (deg), null where regionprops ties the moments (see the script). */
  orientation: number | null;
}
/**
 * scikit-image 0.19.3 regionprops (+ scipy 1.10.1 ConvexHull for hullArea), printed by
 * scripts/reference/handdrawn_regionprops.py and pasted here (12 significant digits).
 */
const SKIMAGE: Record<keyof typeof shapes, SkimageRow> = {
  rectangle: { area: 200, x: 15.0, y: 12.0, major: 23.0940107676, minor: 11.5470053838, eqDiameter: 15.9576912161, crofton: 55.7728462036, hullArea: 200.0, orientation: 0.0 },
  upright: { area: 200, x: 12.0, y: 15.0, major: 23.0940107676, minor: 11.5470053838, eqDiameter: 15.9576912161, crofton: 55.7728462036, hullArea: 200.0, orientation: 90.0 },
  barDown: { area: 100, x: 20.0, y: 20.0, major: 54.437242154, minor: 2.57164020293, eqDiameter: 11.283791671, crofton: 92.2823008199, hullArea: 132.0, orientation: null },
  barUp: { area: 100, x: 20.0, y: 20.0, major: 54.437242154, minor: 2.57164020293, eqDiameter: 11.283791671, crofton: 92.2823008199, hullArea: 132.0, orientation: null },
  disc: { area: 2828, x: 40.0, y: 40.0, major: 60.0155881055, minor: 60.0155881055, eqDiameter: 60.0060116364, crofton: 188.659042044, hullArea: 2898.0, orientation: null },
  L: { area: 500, x: 13.0, y: 21.0, major: 41.6333199893, minor: 24.1108550934, eqDiameter: 25.2313252202, crofton: 112.101052774, hullArea: 700.0, orientation: null },
  ellipse: { area: 787, x: 44.2026683609, y: 39.7604828463, major: 49.9186244823, minor: 20.1111939164, eqDiameter: 31.6550078456, crofton: 115.781657512, hullArea: 835.5, orientation: 29.9885259649 },
};

/** |a − b| within rel·|b| (the literals carry 12 significant digits). */
function near(a: number, b: number, rel = 1e-10): void {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));
}

function columns(img: LabelImage, umPerPx: number | null = null) {
  const sums = cellSums(img);
  const n = sums.count;
  const z = new Float64Array(n);
  const ctx: MeasureContext = {
    count: n,
    umPerPx,
    offsetX: 0,
    offsetY: 0,
    sums,
    x: sums.cx,
    y: sums.cy,
    voronoiArea: z,
    voronoiSides: new Int32Array(n),
    edge: sums.edge,
    neighbours: Int32Array.from({ length: n }, (_, c) => sums.neighbourOffsets[c + 1]! - sums.neighbourOffsets[c]!),
    hasIntensity: false,
  };
  return { cols: measureColumns(ctx, 'walls'), sums };
}

describe('hand-drawn rasters against scikit-image regionprops (values from scripts/reference/handdrawn_regionprops.py)', () => {
  for (const name of Object.keys(shapes) as (keyof typeof shapes)[]) {
    it(`${name}: area, centroid, axes, elongation, equivalent diameter, solidity, orientation, perimeter`, () => {
      const ref = SKIMAGE[name];
      const { cols } = columns(shapes[name]());
      expect(cols['area_px2']![0]).toBe(ref.area);
      near(cols['x_px']![0]!, ref.x);
      near(cols['y_px']![0]!, ref.y);
      near(cols['major_axis_px']![0]!, ref.major);
      near(cols['minor_axis_px']![0]!, ref.minor);
      near(cols['elongation']![0]!, ref.major / ref.minor, 1e-9);
      near(cols['eq_diameter_px']![0]!, ref.eqDiameter);
      // Solidity: area over scipy's hull of the pixel squares' corners.
      near(cols['solidity']![0]!, ref.area / ref.hullArea);
      if (ref.orientation !== null) near(cols['orientation_deg']![0]!, ref.orientation, 1e-9);
      // The project's outline is the marching-squares length times one factor, 0.99946 of the Crofton
      // perimeter (4 directions) on every shape; 1e-5 allows for the literal's rounding and the ratio's
      // spread over shapes (seen: 0.9994563 to 0.9994566), and no more.
      expect(Math.abs(cols['perimeter_px']![0]! / ref.crofton - 0.99946)).toBeLessThan(1e-5);
      // Circularity 4πA/P² with that perimeter.
      near(cols['circularity']![0]!, (4 * Math.PI * ref.area) / (0.99946 * ref.crofton) ** 2, 2e-5);
    });
  }
});

describe('hand-drawn rasters, worked by hand (derived)', () => {
  it('a 20 x 10 px rectangle: area, centroid, axes, orientation, solidity', () => {
    // Rectangle x in [5, 25), y in [7, 17) on a 40 x 30 background (0).
    const { cols } = columns(shapes.rectangle());
    expect(cols['area_px2']![0]).toBe(200); // 20 * 10 pixels
    // Centroid of [5, 25) x [7, 17): (15, 12) in continuous coordinates.
    expect(cols['x_px']![0]).toBeCloseTo(15, 12);
    expect(cols['y_px']![0]).toBeCloseTo(12, 12);
    // Second moments of a uniform a x b rectangle: a²/12 and b²/12 (derived: ∫x² dx / a over [−a/2, a/2]);
    // equal-moment ellipse axes 4·√(a²/12) = a·2/√3 (derived from the definition, trade convention).
    expect(cols['major_axis_px']![0]).toBeCloseTo((20 * 2) / Math.sqrt(3), 10);
    expect(cols['minor_axis_px']![0]).toBeCloseTo((10 * 2) / Math.sqrt(3), 10);
    expect(cols['orientation_deg']![0]).toBeCloseTo(0, 10); // long side along x
    expect(cols['elongation']![0]).toBeCloseTo(2, 10);
    expect(cols['solidity']![0]).toBeCloseTo(1, 12); // a rectangle is convex: hull = itself
    // The outline of an axis-aligned rectangle comes within the stated −5.2 % of its 60 px of pixel edges
    // (derived: the corner cuts shorten it a little more). Its exact value is checked against scikit-image above.
    expect(cols['perimeter_px']![0]! / 60).toBeGreaterThan(0.92);
    expect(cols['perimeter_px']![0]! / 60).toBeLessThan(1);
    expect(cols['eq_diameter_px']![0]).toBeCloseTo(Math.sqrt((4 * 200) / Math.PI), 10);
  });

  it('the same rectangle standing upright has orientation 90°', () => {
    const { cols } = columns(shapes.upright());
    expect(cols['orientation_deg']![0]).toBeCloseTo(90, 10);
  });

  it('a diagonal bar is oriented at +45° (counter-clockwise on screen) or −45°', () => {
    // Pixels with |x − y| <= 1 in a 40 x 40 box run from top-left to bottom-right: on screen (y down)
    // that is clockwise from +x, i.e. −45° in the counter-clockwise convention (derived: the bar is
    // symmetric about its diagonal, so the major axis lies along it).
    expect(columns(shapes.barDown()).cols['orientation_deg']![0]).toBeCloseTo(-45, 6);
    expect(columns(shapes.barUp()).cols['orientation_deg']![0]).toBeCloseTo(45, 6);
  });

  it('a digital disc of radius 30 px: circularity near 1, solidity near 1, area near πr²', () => {
    const r = 30;
    const { cols } = columns(shapes.disc());
    // Area of a digitised disc is πr² to within about the perimeter's order of pixels (Gauss circle problem).
    expect(Math.abs(cols['area_px2']![0]! - Math.PI * r * r)).toBeLessThan(2 * Math.PI * r * 0.1);
    // Circularity 4πA/P² = 1 for a disc (isoperimetric inequality, equality case). The weighted outline
    // is unbiased over orientations, so a disc's perimeter comes within 1.5 % of 2πr (derived from the
    // weights' mean error; a plain marching-squares outline would be about 5 % long).
    expect(cols['perimeter_px']![0]! / (2 * Math.PI * r)).toBeGreaterThan(0.985);
    expect(cols['perimeter_px']![0]! / (2 * Math.PI * r)).toBeLessThan(1.015);
    expect(cols['circularity']![0]).toBeGreaterThan(0.97);
    expect(cols['circularity']![0]).toBeLessThan(1.03);
    // The hull spans the outer corners of the boundary pixels, so a digital disc's solidity falls short of 1
    // by about the half-pixel rim: ≈ 1 − 0.5·2πr·0.5/(πr²) = 1 − 0.5/r ≈ 0.983 at r = 30 (derived, rough).
    expect(cols['solidity']![0]).toBeGreaterThan(0.97);
    expect(cols['elongation']![0]).toBeCloseTo(1, 2);
  });

  it('an L shape: solidity from the hull worked out by hand', () => {
    // L = [0,10)x[0,30) ∪ [10,30)x[20,30) inside a 40 x 40 image, offset by (2, 2).
    // Pixel area 10*30 + 20*10 = 500. The hull of its pixel squares has corners (2,2), (12,2), (32,22),
    // (32,32), (2,32): shoelace area = 30*30 − (20*20)/2 = 700. Solidity 500/700.
    const { cols } = columns(shapes.L());
    expect(cols['area_px2']![0]).toBe(500);
    expect(cols['solidity']![0]).toBeCloseTo(500 / 700, 12);
  });

  it('neighbours: a 3 x 3 grid of squares, the centre touches 4 (pixel edges only)', () => {
    const img = raster(30, 30, (x, y) => 1 + Math.floor(x / 10) + 3 * Math.floor(y / 10));
    const { cols } = columns(img);
    const nb = cols['neighbours']!;
    expect(nb[4]).toBe(4); // centre cell 5: left, right, up, down; corners touch only at points
    expect(nb[0]).toBe(2); // corner cells
    expect(nb[1]).toBe(3); // edge-middle cells
    expect(Array.from(cols['edge']!)).toEqual([1, 1, 1, 1, 0, 1, 1, 1, 1]);
  });

  it('four cells meeting at a point: the lost wall joins the pair with the sharper corners', () => {
    // Cells 1 and 3 are wedges narrower than 90° at the centre; 2 and 4 are wider. In a trivalent network
    // the two narrow ones shared the vanished short wall (corner angles sum below 180° only for them).
    const img = raster(40, 40, (x, y) => {
      const a = Math.atan2(y + 0.5 - 20, x + 0.5 - 20); // angle on screen, y down
      const deg = ((a * 180) / Math.PI + 360) % 360;
      if (deg < 60) return 1;
      if (deg < 180) return 2;
      if (deg < 240) return 3;
      return 4;
    });
    const { sums } = columns(img);
    const nbOf = (c: number) => Array.from(sums.neighbourIndex.subarray(sums.neighbourOffsets[c - 1]!, sums.neighbourOffsets[c]!)).map((v) => v + 1).sort();
    expect(nbOf(1)).toEqual([2, 3, 4]);
    expect(nbOf(2)).toEqual([1, 3]);
  });

  it('calibration: lengths scale with the pixel size, areas with its square', () => {
    const img = shapes.rectangle();
    const px = columns(img).cols;
    const um = columns(img, 2).cols;
    expect(um['area_um2']![0]).toBeCloseTo(4 * px['area_px2']![0]!, 10);
    expect(um['perimeter_um']![0]).toBeCloseTo(2 * px['perimeter_px']![0]!, 10);
    expect(um['x_um']![0]).toBeCloseTo(2 * px['x_px']![0]!, 10);
    expect(um['circularity']![0]).toBeCloseTo(px['circularity']![0]!, 12);
    expect(Object.keys(um).some((k) => k.endsWith('_px') || k.endsWith('_px2'))).toBe(false);
  });

  it('every registry entry documents its formula', () => {
    for (const m of MEASUREMENTS) {
      expect(m.doc.length).toBeGreaterThan(10);
      expect(m.formula.length).toBeGreaterThan(2);
    }
  });
});
