/**
 * Pure helpers of the analysis worker: display rasters, outlines, cell boxes, downscaling for the live
 * preview, and the list of buffers to transfer. No DOM, no opencv.js: unit-tested in Node.
 */
import type { GreyImage, LabelImage } from '../src/core/types';
import type { SettingsInput } from '../src/core/settings';
import { LAYER_COLOURS, rgb } from '../src/core/export/palette';

/**
 * An RGBA raster of a grey image for display, contrast-stretched between the 0.1 % and 99.9 % points of
 * its histogram (so that one hot pixel does not flatten a 16-bit image). Display only: analysis uses the
 * original values.
 *
 * @param img grey image, 8- or 16-bit
 * @returns width * height * 4 bytes, opaque
 */
export function displayRgba(img: GreyImage): Uint8ClampedArray {
  const { data } = img;
  const n = data.length;
  const levels = img.bitDepth === 16 ? 65536 : 256;
  const hist = new Uint32Array(levels);
  for (let i = 0; i < n; i++) hist[data[i]!]!++;
  const cut = Math.floor(n * 0.001);
  let lo = 0, hi = levels - 1, acc = 0;
  for (; lo < levels - 1; lo++) { acc += hist[lo]!; if (acc > cut) break; }
  acc = 0;
  for (; hi > 0; hi--) { acc += hist[hi]!; if (acc > cut) break; }
  if (hi <= lo) { lo = 0; hi = levels - 1; }
  const lut = new Uint8ClampedArray(levels);
  const s = 255 / (hi - lo);
  for (let v = 0; v < levels; v++) lut[v] = Math.round((v - lo) * s);
  const out = new Uint8ClampedArray(n * 4);
  for (let i = 0, j = 0; i < n; i++, j += 4) {
    const g = lut[data[i]!]!;
    out[j] = g; out[j + 1] = g; out[j + 2] = g; out[j + 3] = 255;
  }
  return out;
}

/** Outline colour: the overlay palette's (src/core/export/palette.ts). */
export const OUTLINE_RGB: [number, number, number] = rgb(LAYER_COLOURS.outlines.colour);

/**
 * Cell outlines of a label image as RGBA: a pixel of cell v is on the outline when one of its 4-neighbours
 * is not v (or it lies on the image border). Everything else is transparent.
 */
export function outlineRgba(l: LabelImage, rgb: [number, number, number] = OUTLINE_RGB): Uint8ClampedArray {
  const { width: w, height: h, labels } = l;
  const out = new Uint8ClampedArray(w * h * 4);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      const v = labels[i]!;
      if (v === 0) continue;
      const edge = x === 0 || y === 0 || x === w - 1 || y === h - 1
        || labels[i - 1] !== v || labels[i + 1] !== v || labels[i - w] !== v || labels[i + w] !== v;
      if (!edge) continue;
      const j = i * 4;
      out[j] = rgb[0]; out[j + 1] = rgb[1]; out[j + 2] = rgb[2]; out[j + 3] = 255;
    }
  }
  return out;
}

/** Bounding box of each cell, 4 per cell (x0, y0, x1, y1; end exclusive, px); cell c at index 4 (c - 1). */
export function cellBoxes(l: LabelImage): Int32Array {
  const { width: w, height: h, labels, count } = l;
  const b = new Int32Array(count * 4);
  for (let c = 0; c < count; c++) { b[4 * c] = 2 ** 31 - 1; b[4 * c + 1] = 2 ** 31 - 1; b[4 * c + 2] = -1; b[4 * c + 3] = -1; }
  for (let y = 0, i = 0; y < h; y++) {
    for (let x = 0; x < w; x++, i++) {
      const v = labels[i]!;
      if (v === 0) continue;
      const k = 4 * (v - 1);
      if (x < b[k]!) b[k] = x;
      if (y < b[k + 1]!) b[k + 1] = y;
      if (x + 1 > b[k + 2]!) b[k + 2] = x + 1;
      if (y + 1 > b[k + 3]!) b[k + 3] = y + 1;
    }
  }
  return b;
}

/** Averages f x f blocks (the last partial blocks included), keeping the bit depth. */
export function downscaleGrey(img: GreyImage, f: number): GreyImage {
  const w = Math.ceil(img.width / f), h = Math.ceil(img.height / f);
  const sum = new Float64Array(w * h);
  const cnt = new Uint32Array(w * h);
  for (let y = 0; y < img.height; y++) {
    const row = Math.floor(y / f) * w;
    for (let x = 0; x < img.width; x++) {
      const k = row + Math.floor(x / f);
      sum[k]! += img.data[y * img.width + x]!;
      cnt[k]!++;
    }
  }
  const data = img.bitDepth === 16 ? new Uint16Array(w * h) : new Uint8Array(w * h);
  for (let k = 0; k < w * h; k++) data[k] = Math.round(sum[k]! / cnt[k]!);
  return { width: w, height: h, data, bitDepth: img.bitDepth };
}

/**
 * Settings for an image downscaled by f: lengths in px divide by f, areas by f², odd block sizes stay odd,
 * and the pixel size multiplies by f, so the preview segments at the same physical scale.
 */
export function scaleSettings(s: SettingsInput, f: number): SettingsInput {
  if (f === 1) return s;
  const c = structuredClone(s) as Record<string, unknown> & SettingsInput;
  const len = (v: number | undefined, min = 0): number | undefined => (v === undefined || v < 0 ? v : Math.max(min, v / f));
  const odd = (v: number | undefined): number | undefined => {
    if (v === undefined) return v;
    const r = Math.max(3, Math.round(v / f));
    return r % 2 === 1 ? r : r + 1;
  };
  if (c.umPerPx) c.umPerPx = c.umPerPx * f;
  if (c.minCellAreaPx !== undefined && c.minCellAreaPx > 0) c.minCellAreaPx = Math.max(1, c.minCellAreaPx / (f * f));
  if (c.field) c.field = { x0: Math.floor((c.field.x0 ?? 0) / f), y0: Math.floor((c.field.y0 ?? 0) / f), x1: Math.ceil((c.field.x1 ?? 0) / f), y1: Math.ceil((c.field.y1 ?? 0) / f) };
  if (c.walls) {
    c.walls = { ...c.walls };
    c.walls.flattenRadiusPx = len(c.walls.flattenRadiusPx);
    c.walls.smoothSigmaPx = len(c.walls.smoothSigmaPx);
    c.walls.adaptiveBlockPx = odd(c.walls.adaptiveBlockPx);
    if (c.walls.seedErodePx !== undefined) c.walls.seedErodePx = Math.round(c.walls.seedErodePx / f);
    // The size hint and the split dynamic are lengths; -1 (auto) and 0 (never split) keep their meaning.
    if (c.walls.cellDiameterPx !== undefined && c.walls.cellDiameterPx > 0) c.walls.cellDiameterPx = Math.max(2, c.walls.cellDiameterPx / f);
    if (c.walls.markerDynamicPx !== undefined && c.walls.markerDynamicPx > 0) c.walls.markerDynamicPx = c.walls.markerDynamicPx / f;
  }
  if (c.bodies) {
    c.bodies = { ...c.bodies };
    c.bodies.smoothSigmaPx = len(c.bodies.smoothSigmaPx);
    c.bodies.adaptiveBlockPx = odd(c.bodies.adaptiveBlockPx);
  }
  return c;
}

/** Every ArrayBuffer under `value` (typed arrays in nested objects and arrays), each listed once. */
export function collectTransfers(value: unknown): ArrayBuffer[] {
  const seen = new Set<ArrayBuffer>();
  const walk = (v: unknown, depth: number): void => {
    if (v === null || typeof v !== 'object' || depth > 8) return;
    if (ArrayBuffer.isView(v)) {
      if (v.buffer instanceof ArrayBuffer && v.buffer.byteLength > 0) seen.add(v.buffer);
      return;
    }
    if (Array.isArray(v)) { for (const x of v) walk(x, depth + 1); return; }
    for (const x of Object.values(v as Record<string, unknown>)) walk(x, depth + 1);
  };
  walk(value, 0);
  return [...seen];
}

/** The file name without its folder and last extension: 'a/b/grains.tif' -> 'grains' (the exports' stem). */
export { fileStem as baseName } from '../src/core/export/files';
