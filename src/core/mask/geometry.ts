/**
 * A tissue mask as the field of the statistics: the pixels marked as tissue inside the analysed rectangle,
 * kept as runs per row (a few numbers per boundary crossing, so that it travels to the reference's
 * workers), with its area, perimeter, bounding box and its eroded interior (the pixels whose four
 * neighbours are tissue too: a cell with a pixel outside the interior touches the mask's border).
 */
import { SettingsError } from '../errors';
import { MS_LEN } from '../measure/kernel';
import type { Rect } from '../types';

/** A set of pixels as runs per row: row y (field.y0 ≤ y < field.y1) has runs [rowStart[y − y0], rowStart[y − y0 + 1]). */
export interface PixelRuns {
  y0: number;
  rowStart: Int32Array;
  /** First x of each run and the x after its last pixel (image px). */
  x0: Int32Array;
  x1: Int32Array;
}

/**
 * The field cut into squares of BLOCK px from its corner (x0, y0): the summed-area table `sat`, (bw + 1) x
 * (bh + 1), counts the squares whose pixels are all in the interior.
 */
export interface InnerBlocks {
  x0: number;
  y0: number;
  bw: number;
  bh: number;
  sat: Int32Array;
}

const BLOCK = 8;

/** A mask's geometry: plain numbers and typed arrays (posted to worker threads as it is). */
export interface MaskGeometry {
  /** Size of the raster the mask was given on (the image). */
  width: number;
  height: number;
  /** The analysed rectangle (whole px); the mask is the tissue inside it. */
  field: Rect;
  /** Bounding box of the tissue pixels (px, pixel squares). */
  bbox: Rect;
  /** Number of tissue pixels (px²). */
  area: number;
  /**
   * Length of the tissue's outline (px): the weighted marching-squares length of the measurements'
   * perimeter (measure/kernel.ts), the field's border counting as outline.
   */
  perimeter: number;
  /** Tissue pixels on the field's border (each one px of outline there; a corner pixel counts twice). */
  borderLength: number;
  /** The tissue pixels. */
  pixels: PixelRuns;
  /** The interior: tissue pixels not on the field's border whose four neighbours are tissue. */
  inner: PixelRuns;
  /** Blocks of the interior, for a quick test of a rectangle lying in it ({@link innerHolds}). */
  blocks: InnerBlocks;
  /** A digest of the runs, for caches keyed by the mask. */
  key: string;
}

/**
 * Runs of the pixels of rows r = 0..rows − 1 (image row y0 + r), columns x = 0..w − 1 (image column x0 + x):
 * `fill(r, out)` writes row r's pixels into out, 1 inside, 0 outside.
 */
function buildRuns(y0: number, rows: number, x0: number, w: number, fill: (r: number, out: Uint8Array) => void): PixelRuns {
  const rowStart = new Int32Array(rows + 1);
  const s0: number[] = [];
  const s1: number[] = [];
  const line = new Uint8Array(w);
  for (let r = 0; r < rows; r++) {
    fill(r, line);
    let x = 0;
    while (x < w) {
      while (x < w && line[x] === 0) x++;
      if (x >= w) break;
      const s = x;
      while (x < w && line[x] === 1) x++;
      s0.push(x0 + s);
      s1.push(x0 + x);
    }
    rowStart[r + 1] = s0.length;
  }
  return { y0, rowStart, x0: Int32Array.from(s0), x1: Int32Array.from(s1) };
}

/** FNV-1a over 32-bit words. */
function digest(parts: Int32Array[]): string {
  let h = 0x811c9dc5;
  for (const p of parts) {
    for (let i = 0; i < p.length; i++) {
      h = Math.imul(h ^ p[i]!, 0x01000193) >>> 0;
    }
    h = Math.imul(h ^ p.length, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

/**
 * The geometry of a tissue mask inside the analysed rectangle.
 *
 * @param mask one byte per pixel of the image, row-major; nonzero = tissue
 * @param width the image's width, height its height
 * @param field the analysed rectangle (whole px inside the image)
 * @throws SettingsError when the mask is not the image's size or has no tissue inside the field
 */
export function maskGeometry(mask: Uint8Array, width: number, height: number, field: Rect): MaskGeometry {
  if (!(mask instanceof Uint8Array)) throw new SettingsError('The mask must be one byte per pixel (a Uint8Array, nonzero = tissue).');
  if (mask.length !== width * height) {
    throw new SettingsError(`The mask holds ${mask.length} pixels but the image is ${width} x ${height} px (${width * height}); give a mask of the image's size.`);
  }
  const { x0: fx0, y0: fy0, x1: fx1, y1: fy1 } = field;
  const fw = fx1 - fx0;
  const rows = fy1 - fy0;
  // The field's tissue, padded by one pixel of outside on every side: t[(y + 1)·(fw + 2) + x + 1].
  const pw = fw + 2;
  const t = new Uint8Array(pw * (rows + 2));
  for (let r = 0; r < rows; r++) {
    const m0 = (fy0 + r) * width + fx0;
    const t0 = (r + 1) * pw + 1;
    for (let x = 0; x < fw; x++) t[t0 + x] = mask[m0 + x] !== 0 ? 1 : 0;
  }
  const at = (x: number, y: number): boolean => x >= fx0 && x < fx1 && y >= fy0 && y < fy1 && mask[y * width + x] !== 0;
  const pixels = buildRuns(fy0, rows, fx0, fw, (r, out) => out.set(t.subarray((r + 1) * pw + 1, (r + 1) * pw + 1 + fw)));
  let area = 0;
  let bx0 = Infinity;
  let bx1 = -Infinity;
  let by0 = Infinity;
  let by1 = -Infinity;
  for (let r = 0; r < rows; r++) {
    for (let k = pixels.rowStart[r]!; k < pixels.rowStart[r + 1]!; k++) {
      area += pixels.x1[k]! - pixels.x0[k]!;
      bx0 = Math.min(bx0, pixels.x0[k]!);
      bx1 = Math.max(bx1, pixels.x1[k]!);
      by0 = Math.min(by0, fy0 + r);
      by1 = Math.max(by1, fy0 + r + 1);
    }
  }
  if (area === 0) {
    throw new SettingsError(`The mask marks no tissue inside the ${fw} x ${rows} px field (every pixel is 0); mark the tissue with nonzero pixels.`);
  }
  // The interior: not on the field's border, the four neighbours tissue.
  const bw = Math.ceil(fw / BLOCK);
  const bh = Math.ceil(rows / BLOCK);
  const whole = new Uint8Array(bw * bh).fill(1);
  const inner = buildRuns(fy0, rows, fx0, fw, (r, out) => {
    out.fill(0);
    if (r > 0 && r < rows - 1) {
      const q0 = (r + 1) * pw + 1;
      for (let x = 1; x < fw - 1; x++) {
        const q = q0 + x;
        out[x] = t[q]! & t[q - 1]! & t[q + 1]! & t[q - pw]! & t[q + pw]!;
      }
    }
    const b0 = Math.floor(r / BLOCK) * bw;
    for (let x = 0; x < fw; x++) if (!out[x]) whole[b0 + Math.floor(x / BLOCK)] = 0;
  });
  const sat = new Int32Array((bw + 1) * (bh + 1));
  for (let j = 0; j < bh; j++) {
    for (let i = 0; i < bw; i++) sat[(j + 1) * (bw + 1) + i + 1] = whole[j * bw + i]! + sat[j * (bw + 1) + i + 1]! + sat[(j + 1) * (bw + 1) + i]! - sat[j * (bw + 1) + i]!;
  }
  // Perimeter: every 2x2 window of the padded field, by its corners inside.
  let perimeter = 0;
  for (let r = 0; r <= rows; r++) {
    const top = r * pw;
    const bot = top + pw;
    let b = t[top]!;
    let d = t[bot]!;
    for (let x = 0; x < pw - 1; x++) {
      const a = b;
      const c = d;
      b = t[top + x + 1]!;
      d = t[bot + x + 1]!;
      const m = a | (b << 1) | (c << 2) | (d << 3);
      if (m !== 0 && m !== 15) perimeter += MS_LEN[m]!;
    }
  }
  let borderLength = 0;
  for (let x = fx0; x < fx1; x++) borderLength += (at(x, fy0) ? 1 : 0) + (at(x, fy1 - 1) ? 1 : 0);
  for (let y = fy0; y < fy1; y++) borderLength += (at(fx0, y) ? 1 : 0) + (at(fx1 - 1, y) ? 1 : 0);
  const key = `${width}x${height}:${fx0},${fy0},${fx1},${fy1}:${area}:${digest([pixels.rowStart, pixels.x0, pixels.x1])}`;
  return {
    width, height, field: { x0: fx0, y0: fy0, x1: fx1, y1: fy1 }, bbox: { x0: bx0, y0: by0, x1: bx1, y1: by1 },
    area, perimeter, borderLength, pixels, inner, blocks: { x0: fx0, y0: fy0, bw, bh, sat }, key,
  };
}

/** Index of the first run of row y that ends after x (binary search); the row's end when none does. */
function firstRunAfter(r: PixelRuns, row: number, x: number): number {
  let lo = r.rowStart[row]!;
  let hi = r.rowStart[row + 1]!;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (r.x1[mid]! <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Whether pixel (x, y) is in the runs. */
export function hasPixel(r: PixelRuns, x: number, y: number): boolean {
  const row = y - r.y0;
  if (row < 0 || row >= r.rowStart.length - 1) return false;
  const k = firstRunAfter(r, row, x);
  return k < r.rowStart[row + 1]! && r.x0[k]! <= x;
}

/**
 * The pixels of row y with a ≤ x < b that are in the runs: their number, and the sum of their centres'
 * x (x + 0.5) in sum[0] when `sum` is given.
 */
export function countInRow(r: PixelRuns, y: number, a: number, b: number, sum?: Float64Array): number {
  const row = y - r.y0;
  if (row < 0 || row >= r.rowStart.length - 1 || b <= a) return 0;
  let count = 0;
  let sx = 0;
  const end = r.rowStart[row + 1]!;
  for (let k = firstRunAfter(r, row, a); k < end && r.x0[k]! < b; k++) {
    const s = Math.max(a, r.x0[k]!);
    const e = Math.min(b, r.x1[k]!);
    if (e <= s) continue;
    count += e - s;
    sx += ((e - s) * (s + e)) / 2;
  }
  if (sum) sum[0] = sx;
  return count;
}

/**
 * Whether every pixel x0 ≤ x < x1, y0 ≤ y < y1 is in the mask's interior, by whole blocks (false when the
 * blocks that cover the rectangle are not all interior, though its own pixels may be).
 */
export function innerHolds(b: InnerBlocks, x0: number, y0: number, x1: number, y1: number): boolean {
  if (x1 <= x0 || y1 <= y0) return false;
  const i0 = Math.floor((x0 - b.x0) / BLOCK);
  const j0 = Math.floor((y0 - b.y0) / BLOCK);
  const i1 = Math.ceil((x1 - b.x0) / BLOCK);
  const j1 = Math.ceil((y1 - b.y0) / BLOCK);
  if (i0 < 0 || j0 < 0 || i1 > b.bw || j1 > b.bh) return false;
  const W = b.bw + 1;
  const n = b.sat[j1 * W + i1]! - b.sat[j0 * W + i1]! - b.sat[j1 * W + i0]! + b.sat[j0 * W + i0]!;
  return n === (i1 - i0) * (j1 - j0);
}
