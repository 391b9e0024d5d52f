/**
 * A tissue mask's area, perimeter, interior and set covariance, against values derived by hand.
 * - Area of a digital disc: the pixel squares whose centres lie within r cover the disc of radius r − √2/2 and
 *   lie in the disc of radius r + √2/2 (derived), and the count of lattice points in a disc is πr² to within
 *   about r^{2/3} (the Gauss circle problem; pub, memory).
 * - Perimeter: a disc's is 2πr; the estimator (src/core/measure/kernel.ts) weighs straight marching-squares
 *   segments by w₁ = 4√2/(π + 2√2) and corner cuts by w₂ = w₁·√2/2, unbiased over orientations (derived
 *   there), so a W x H rectangle of pixels reads w₁·(2W + 2H − 4) + 4·w₂ (derived: 2(W − 1) + 2(H − 1) straight
 *   segments through the border pixels' centres and four corner cuts), 5.2 % under 2(W + H).
 * - Set covariance of a W x H rectangle: γ(u) = (W − |u_x|)(H − |u_y|) (derived), exact at any offset for
 *   pixel squares.
 */
import { describe, expect, it } from 'vitest';
import { maskGeometry, countInRow, hasPixel, innerHolds } from '../../../src/core/mask/geometry';
import { covarianceAt, setCovariance } from '../../../src/core/mask/covariance';
import { SettingsError } from '../../../src/core/errors';

const W1 = (4 * Math.SQRT2) / (Math.PI + 2 * Math.SQRT2);
const W2 = (W1 * Math.SQRT2) / 2;

function raster(w: number, h: number, inside: (x: number, y: number) => boolean): Uint8Array {
  const m = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) if (inside(x + 0.5, y + 0.5)) m[y * w + x] = 255;
  return m;
}
const whole = (w: number, h: number) => ({ x0: 0, y0: 0, x1: w, y1: h });

describe('mask geometry', () => {
  it('a disc of radius 60: area within the covering bounds and near πr², perimeter near 2πr', () => {
    const r = 60;
    const g = maskGeometry(raster(200, 160, (x, y) => (x - 97) ** 2 + (y - 83) ** 2 < r * r), 200, 160, whole(200, 160));
    expect(g.area).toBeGreaterThan(Math.PI * (r - Math.SQRT1_2) ** 2);
    expect(g.area).toBeLessThan(Math.PI * (r + Math.SQRT1_2) ** 2);
    expect(Math.abs(g.area - Math.PI * r * r)).toBeLessThan(r ** (2 / 3) * 2);
    expect(g.perimeter / (2 * Math.PI * r)).toBeCloseTo(1, 2);
    expect(g.borderLength).toBe(0);
    expect(g.bbox).toEqual({ x0: 37, y0: 23, x1: 157, y1: 143 });
  });

  it('a 70 x 40 rectangle inside the field: area W·H and the estimator\'s perimeter for it', () => {
    const g = maskGeometry(raster(120, 90, (x, y) => x > 20 && x < 90 && y > 30 && y < 70), 120, 90, whole(120, 90));
    expect(g.area).toBe(70 * 40);
    expect(g.perimeter).toBeCloseTo(W1 * (2 * 70 + 2 * 40 - 4) + 4 * W2, 2);
    expect(g.perimeter / (2 * (70 + 40))).toBeGreaterThan(0.94);
    expect(g.bbox).toEqual({ x0: 20, y0: 30, x1: 90, y1: 70 });
    // The interior: one pixel in from each side.
    let inner = 0;
    for (let y = 30; y < 70; y++) inner += countInRow(g.inner, y, 0, 120);
    expect(inner).toBe(68 * 38);
    expect(hasPixel(g.inner, 21, 31)).toBe(true);
    expect(hasPixel(g.inner, 20, 31)).toBe(false);
    // The quick test by blocks: a box well inside holds, a box reaching the outline does not.
    expect(innerHolds(g.blocks, 32, 40, 80, 56)).toBe(true);
    expect(innerHolds(g.blocks, 16, 40, 80, 56)).toBe(false);
    expect(innerHolds(g.blocks, 32, 40, 80, 72)).toBe(false);
  });

  it('a rectangle on the field\'s border: the border is outline, its length counted apart', () => {
    const g = maskGeometry(raster(120, 90, (x) => x < 50), 120, 90, whole(120, 90));
    expect(g.area).toBe(50 * 90);
    expect(g.perimeter).toBeCloseTo(W1 * (2 * 50 + 2 * 90 - 4) + 4 * W2, 2);
    // Top and bottom rows (50 px each) and the left column (90 px).
    expect(g.borderLength).toBe(50 + 50 + 90);
    // Pixels on the field's border are not interior.
    expect(hasPixel(g.inner, 0, 45)).toBe(false);
    expect(hasPixel(g.inner, 1, 45)).toBe(true);
  });

  it('counts pixels and sums their centres over a row range', () => {
    const g = maskGeometry(raster(40, 4, (x) => (x > 5 && x < 10) || (x > 20 && x < 30)), 40, 4, whole(40, 4));
    const sum = new Float64Array(1);
    // Tissue: pixels 5..9 and 20..29 (centres x + 0.5 inside). Row 1, x in [8, 25): pixels 8, 9 and 20..24.
    expect(countInRow(g.pixels, 1, 8, 25, sum)).toBe(7);
    expect(sum[0]).toBeCloseTo(8.5 + 9.5 + 20.5 + 21.5 + 22.5 + 23.5 + 24.5, 12);
    expect(countInRow(g.pixels, 1, 10, 20)).toBe(0);
  });

  it('the set covariance of a rectangle is (W − |dx|)(H − |dy|), at whole and fractional offsets', () => {
    const g = maskGeometry(raster(60, 50, (x, y) => x > 7 && x < 37 && y > 10 && y < 30), 60, 50, whole(60, 50));
    const c = setCovariance(g.pixels, 50, 12);
    expect(c.area).toBe(30 * 20);
    for (const [dx, dy] of [[0, 0], [3, 0], [-5, 2], [7, -11], [-11, -11], [2.25, 0.5], [-6.7, 3.1], [0.3, -9.9]] as const) {
      expect(covarianceAt(c, dx, dy)).toBeCloseTo((30 - Math.abs(dx)) * (20 - Math.abs(dy)), 9);
    }
  });

  it('the set covariance of an irregular mask equals the count of pixel pairs at each offset', () => {
    const inside = (x: number, y: number) => (x - 30) ** 2 / 400 + (y - 20) ** 2 / 150 < 1 && !(x > 25 && x < 31 && y > 15 && y < 22);
    const m = raster(64, 40, inside);
    const g = maskGeometry(m, 64, 40, whole(64, 40));
    const c = setCovariance(g.pixels, 40, 9);
    for (let dy = -8; dy <= 8; dy += 4) {
      for (let dx = -8; dx <= 8; dx += 2) {
        let pairs = 0;
        for (let y = 0; y < 40; y++) for (let x = 0; x < 64; x++) {
          const x2 = x + dx;
          const y2 = y + dy;
          if (m[y * 64 + x] && x2 >= 0 && y2 >= 0 && x2 < 64 && y2 < 40 && m[y2 * 64 + x2]) pairs++;
        }
        expect(covarianceAt(c, dx, dy)).toBe(pairs);
      }
    }
  });

  it('a field inside the image: the tissue outside it does not count', () => {
    const m = new Uint8Array(100 * 80).fill(1);
    const g = maskGeometry(m, 100, 80, { x0: 10, y0: 20, x1: 60, y1: 50 });
    expect(g.area).toBe(50 * 30);
    expect(g.bbox).toEqual({ x0: 10, y0: 20, x1: 60, y1: 50 });
    expect(g.borderLength).toBe(2 * (50 + 30));
  });
});

describe('mask geometry: bad input', () => {
  it('a mask of another size is refused, saying both sizes', () => {
    expect(() => maskGeometry(new Uint8Array(99 * 80).fill(1), 100, 80, whole(100, 80))).toThrow(SettingsError);
    expect(() => maskGeometry(new Uint8Array(99 * 80).fill(1), 100, 80, whole(100, 80))).toThrow(/7920 pixels .* 100 x 80 px/);
  });
  it('a mask without tissue in the field is refused', () => {
    expect(() => maskGeometry(new Uint8Array(100 * 80), 100, 80, whole(100, 80))).toThrow(/marks no tissue/);
    const m = raster(100, 80, (x) => x > 90);
    expect(() => maskGeometry(m, 100, 80, { x0: 0, y0: 0, x1: 50, y1: 80 })).toThrow(/marks no tissue inside the 50 x 80 px field/);
  });
});
