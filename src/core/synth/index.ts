/**
 * The project's own generator of synthetic micrographs with known truth: a walls pattern (the Voronoi
 * tiling of seeds drawn with walls of a given width) and a bodies pattern (touching discs). Used for demo
 * images, tests and benchmarks. Deterministic from the seed.
 */
import { Delaunay } from 'd3-delaunay';
import { SettingsError } from '../errors';
import { generatorSeed, mulberry32, normal } from '../random';
import type { GreyImage, LabelImage } from '../types';
import { windowDensity } from '../reference/montecarlo';
import { delaunayNeighbours } from '../tessellate/neighbours';
import { hardCoreDistance, seedPoints, type SeedOrder } from './seeds';

export interface SynthOptions {
  pattern: 'walls' | 'bodies';
  /** Number of seeds (cells or bodies). */
  cells: number;
  width: number;
  height: number;
  order: SeedOrder;
  seed: number;
  /** Wall width (px) of a walls pattern. Default 3. */
  wallPx?: number;
  /** Walls darker or lighter than the cells. Default 'dark'. */
  wallPolarity?: 'dark' | 'light';
  /** Gaussian blur sigma (px) applied after drawing. Default 0.7. */
  blurPx?: number;
  /** Standard deviation of added Gaussian noise, in grey levels of 255. Default 6. */
  noise?: number;
  /** Relative strength of a smooth illumination gradient across the field (0 = none). Default 0.15. */
  illumination?: number;
  /** Spread of cell-to-cell brightness, grey levels. Default 12. */
  cellContrast?: number;
  /**
   * Body diameter as a multiple of the hard-core distance of 'regular' seeds (bodies pattern). Default 1.2:
   * the closest bodies overlap a little, so touching bodies must be split.
   */
  bodyRadiusFactor?: number;
  /** Bit depth of the output image. Default 8. */
  bitDepth?: 8 | 16;
  /**
   * Walls: the image is a window on a larger tiling, as a micrograph is. Seeds are also drawn in a guard
   * band of 3 mean spacings around the image, at the density that puts `cells` cells in the image on
   * average (windowDensity), so that cells reach across the border. Default false: seeds in the image only,
   * `cells` of them.
   */
  window?: boolean;
}

export interface SynthResult {
  image: GreyImage;
  /** Seeds, interleaved x, y (px): for a window, those of the cells seen in the image (some lie outside it). */
  seeds: Float64Array;
  /**
   * Truth labels: for walls the Voronoi tiling of the seeds without walls (cell i+1 holds seed i); for
   * bodies the discs (0 = background), a pixel shared by two discs going to the nearer centre.
   */
  truth: LabelImage;
  cells: number;
  /** The options as used, defaults filled in. */
  options: Required<SynthOptions>;
}

const MAX_SYNTH_PIXELS = 64e6;

function fill(o: SynthOptions): Required<SynthOptions> {
  return {
    wallPx: 3,
    wallPolarity: 'dark',
    blurPx: 0.7,
    noise: 6,
    illumination: 0.15,
    cellContrast: 12,
    bodyRadiusFactor: 1.2,
    bitDepth: 8,
    window: false,
    ...(Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as SynthOptions),
  };
}

function validate(o: Required<SynthOptions>): void {
  if (o.pattern !== 'walls' && o.pattern !== 'bodies') throw new SettingsError(`Pattern must be walls or bodies; got "${String(o.pattern)}".`);
  if (!Number.isInteger(o.width) || !Number.isInteger(o.height) || o.width < 16 || o.height < 16) {
    throw new SettingsError(`Image size must be whole pixels, at least 16 x 16; got ${o.width} x ${o.height}.`);
  }
  if (o.width * o.height > MAX_SYNTH_PIXELS) throw new SettingsError(`Synthetic images are limited to 64 megapixels; ${o.width} x ${o.height} is larger.`);
  if (!Number.isInteger(o.cells) || o.cells < 1) throw new SettingsError(`Cell count must be a positive whole number; got ${o.cells}.`);
  if (o.cells > (o.width * o.height) / 16) throw new SettingsError(`${o.cells} cells do not fit in ${o.width} x ${o.height} px; use at most one cell per 16 px².`);
  if (!(o.wallPx > 0)) throw new SettingsError('Wall width must be positive.');
  if (o.window && o.pattern !== 'walls') throw new SettingsError('A window on a larger tiling is a walls pattern; bodies lie in the image. Leave the window option off for bodies.');
}

/** Seeds of a window: drawn over the image and a guard band of 3 mean spacings, in image coordinates. */
function windowSeeds(o: Required<SynthOptions>): Float64Array {
  const { width: w, height: h } = o;
  const lambda = windowDensity(o.cells, w, h);
  const m = 3 / Math.sqrt(lambda);
  const count = Math.max(3, Math.round(lambda * (w + 2 * m) * (h + 2 * m)));
  return seedPoints(count, w + 2 * m, h + 2 * m, o.order, o.seed).map((v) => v - m);
}

/** Separable Gaussian blur of a Float32Array image, in place. */
function gaussianBlur(img: Float32Array, w: number, h: number, sigma: number): void {
  if (sigma <= 0) return;
  const r = Math.max(1, Math.ceil(3 * sigma));
  const k = new Float32Array(2 * r + 1);
  let s = 0;
  for (let i = -r; i <= r; i++) s += k[i + r] = Math.exp(-(i * i) / (2 * sigma * sigma));
  for (let i = 0; i < k.length; i++) k[i]! /= s;
  const tmp = new Float32Array(Math.max(w, h));
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let x = 0; x < w; x++) {
      let acc = 0;
      for (let i = -r; i <= r; i++) {
        const xx = x + i < 0 ? -(x + i) - 1 : x + i >= w ? 2 * w - (x + i) - 1 : x + i;
        acc += k[i + r]! * img[row + xx]!;
      }
      tmp[x] = acc;
    }
    img.set(tmp.subarray(0, w), row);
  }
  for (let x = 0; x < w; x++) {
    for (let y = 0; y < h; y++) {
      let acc = 0;
      for (let i = -r; i <= r; i++) {
        const yy = y + i < 0 ? -(y + i) - 1 : y + i >= h ? 2 * h - (y + i) - 1 : y + i;
        acc += k[i + r]! * img[yy * w + x]!;
      }
      tmp[y] = acc;
    }
    for (let y = 0; y < h; y++) img[y * w + x] = tmp[y]!;
  }
}

/**
 * Draws a synthetic micrograph with its truth.
 *
 * Walls: each pixel belongs to the nearest seed (the Voronoi tiling); its distance to the cell boundary is the
 * exact distance to the bisector of the nearest seed and its nearest rival among the Delaunay neighbours,
 * d = (|x − s_j|² − |x − s_i|²) / (2|s_i − s_j|), and the wall is drawn where d < wallPx/2, anti-aliased over
 * one pixel. Then blur, a smooth illumination gradient and Gaussian noise are added.
 */
export function synthesize(options: SynthOptions): SynthResult {
  const o = fill(options);
  validate(o);
  const { width: w, height: h } = o;
  const seeds = o.window ? windowSeeds(o) : seedPoints(o.cells, w, h, o.order, o.seed);
  const n = seeds.length / 2;
  const rng = mulberry32(generatorSeed(o.seed, 1));
  const d = new Delaunay(seeds);
  const { offsets: off, index: idx } = delaunayNeighbours(d, n);
  const truth = new Int32Array(w * h);
  const img = new Float32Array(w * h);
  const cellGrey = new Float32Array(n);
  for (let i = 0; i < n; i++) cellGrey[i] = o.cellContrast * normal(rng);

  const dark = o.pattern === 'walls' ? o.wallPolarity === 'dark' : false;
  const cellBase = o.pattern === 'walls' ? (dark ? 175 : 80) : 60;
  const wallGrey = o.pattern === 'walls' ? (dark ? 55 : 205) : 190;
  const half = o.wallPx / 2;
  // Bodies: radius from the hard-core spacing so that neighbours touch or slightly overlap.
  let radius = 0;
  if (o.pattern === 'bodies') {
    radius = (o.bodyRadiusFactor * hardCoreDistance(n, w, h)) / 2;
  }

  let hint = 0;
  for (let y = 0; y < h; y++) {
    const py = y + 0.5;
    for (let x = 0; x < w; x++) {
      const px = x + 0.5;
      const i = d.find(px, py, hint);
      hint = i;
      const sx = seeds[2 * i]!;
      const sy = seeds[2 * i + 1]!;
      const di = (px - sx) ** 2 + (py - sy) ** 2;
      const p = y * w + x;
      if (o.pattern === 'walls') {
        let best = Infinity;
        for (let k = off[i]!; k < off[i + 1]!; k++) {
          const j = idx[k]!;
          const jx = seeds[2 * j]!;
          const jy = seeds[2 * j + 1]!;
          const dj = (px - jx) ** 2 + (py - jy) ** 2;
          const dist = (dj - di) / (2 * Math.hypot(sx - jx, sy - jy));
          if (dist < best) best = dist;
        }
        truth[p] = i + 1;
        // Coverage of the wall over this pixel, anti-aliased over one pixel.
        const cover = Math.min(1, Math.max(0, half - best + 0.5));
        const cell = cellBase + cellGrey[i]!;
        img[p] = cell + (wallGrey - cell) * cover;
      } else {
        const r = Math.sqrt(di);
        const cover = Math.min(1, Math.max(0, radius - r + 0.5));
        truth[p] = r <= radius ? i + 1 : 0;
        img[p] = cellBase + (wallGrey + cellGrey[i]! - cellBase) * cover;
      }
    }
  }

  gaussianBlur(img, w, h, o.blurPx);
  const scale = o.bitDepth === 16 ? 257 : 1;
  const max = o.bitDepth === 16 ? 65535 : 255;
  const out = o.bitDepth === 16 ? new Uint16Array(w * h) : new Uint8Array(w * h);
  for (let y = 0; y < h; y++) {
    const gy = y / h - 0.5;
    for (let x = 0; x < w; x++) {
      const gx = x / w - 0.5;
      const light = 1 + o.illumination * (0.8 * gx + 0.6 * gy);
      const v = (img[y * w + x]! * light + o.noise * normal(rng)) * scale;
      out[y * w + x] = v < 0 ? 0 : v > max ? max : Math.round(v);
    }
  }
  const seen = o.window ? seenCells(truth, seeds, n) : { seeds, count: n };
  return {
    image: { width: w, height: h, data: out, bitDepth: o.bitDepth },
    seeds: seen.seeds,
    truth: { width: w, height: h, labels: truth, count: seen.count },
    cells: seen.count,
    options: o,
  };
}

/** Keeps the cells that own a pixel of the image, numbered 1.. in seed order (truth relabelled in place). */
function seenCells(truth: Int32Array, seeds: Float64Array, n: number): { seeds: Float64Array; count: number } {
  const map = new Int32Array(n + 1);
  for (let p = 0; p < truth.length; p++) map[truth[p]!] = 1;
  let count = 0;
  for (let i = 1; i <= n; i++) if (map[i]) map[i] = ++count;
  for (let p = 0; p < truth.length; p++) truth[p] = map[truth[p]!]!;
  const out = new Float64Array(2 * count);
  for (let i = 1; i <= n; i++) {
    if (!map[i]) continue;
    out[2 * (map[i]! - 1)] = seeds[2 * (i - 1)]!;
    out[2 * (map[i]! - 1) + 1] = seeds[2 * (i - 1) + 1]!;
  }
  return { seeds: out, count };
}
