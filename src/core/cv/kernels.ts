/**
 * The opencv.js kernels the segmenters use, each taking and returning typed arrays so that no Mat escapes
 * this folder. Every Mat is freed in a `finally` (withMats).
 */
import type { CV } from './index';
import { matFromArray, matFromGrey, withMats } from './mats';
import type { GreyImage } from '../types';

export interface PrepareOptions {
  /** Radius (px) of the illumination estimate; 0 = no flattening. */
  flattenRadiusPx: number;
  /** Gaussian sigma (px); 0 = no smoothing. */
  smoothSigmaPx: number;
  /**
   * Where the illumination may be read (1) and where not (0): the background of a bodies image, so that the
   * bodies themselves do not raise the estimate. Absent = everywhere (the walls pattern).
   */
  backgroundMask?: Uint8Array;
  /**
   * 'divide' (default): illumination multiplies what is seen (transmitted or reflected light). 'subtract':
   * the background's level itself varies (a backdrop lighter in one part, glare, stray light), which
   * division would carry into the bodies' contrast.
   */
  flattenBy?: 'divide' | 'subtract';
}

/**
 * Weight, relative to a pixel's neighbourhood fully in the background, below which the masked illumination
 * estimate leans on the mean of the whole background (regularised normalised convolution): a region covered
 * by bodies gets the global level rather than an estimate from a few stray pixels.
 */
const MASKED_FLATTEN_PRIOR = 0.05;

/**
 * Flattens uneven illumination, smooths and stretches an image to 8 bits, keeping full (16-bit) precision
 * until the final conversion.
 *
 * Flattening divides by a background estimate: a Gaussian blur of sigma = radius/2, computed on a copy
 * downsampled so the kernel stays about 8 px wide (illumination is smooth, so nothing is lost) and scaled
 * back up. Division, not subtraction, because illumination multiplies reflectance/transmittance. With a
 * background mask the estimate is a normalised convolution, G∗(I·m) / G∗m (Knutsson & Westin 1993, Proc.
 * CVPR 515; pub, memory), regularised towards the mean background where the mask is sparse, so that large
 * bodies do not lift the estimate around them.
 * The stretch maps the 0.1 and 99.9 percentiles to 0 and 255 (trade).
 *
 * @returns 8-bit smoothed image, row-major, same size as the input.
 */
export function prepareGrey(cv: CV, img: GreyImage, o: PrepareOptions): Uint8Array {
  return withMats((track) => {
    const { width: w, height: h } = img;
    const src = track(matFromGrey(cv, img));
    const f = track(new cv.Mat());
    src.convertTo(f, cv.CV_32F);
    // The source is not needed again: its heap is reused by the Mats below.
    src.delete();
    if (o.flattenRadiusPx > 0) {
      const sigma = o.flattenRadiusPx / 2;
      const factor = Math.max(1, Math.floor(sigma / 8));
      const sw = Math.max(1, Math.round(w / factor));
      const sh = Math.max(1, Math.round(h / factor));
      const small = track(new cv.Mat());
      const sb = track(new cv.Mat());
      const ss = sigma / factor;
      const k = 2 * Math.ceil(3 * ss) + 1;
      const ksize = new cv.Size(k, k);
      let mean = Number.NaN;
      if (o.backgroundMask) {
        // Normalised convolution on the downsampled copy: blur(I·m) / blur(m), both at the small size.
        const m8 = track(matFromArray(cv, h, w, cv.CV_8UC1, o.backgroundMask));
        const weight = cv.countNonZero(m8) as number;
        if (weight === 0) throw new RangeError('prepareGrey: the background mask is empty');
        const fm = track(new cv.Mat());
        f.copyTo(fm);
        const fd = fm.data32F as Float32Array;
        const md = m8.data as Uint8Array;
        let sum = 0;
        for (let i = 0; i < fd.length; i++) {
          if (md[i]) sum += fd[i]!;
          else fd[i] = 0;
        }
        mean = sum / weight;
        const mf = track(new cv.Mat());
        m8.convertTo(mf, cv.CV_32F);
        cv.resize(fm, small, new cv.Size(sw, sh), 0, 0, cv.INTER_AREA);
        cv.GaussianBlur(small, sb, ksize, ss, ss, cv.BORDER_REFLECT);
        const ms = track(new cv.Mat());
        cv.resize(mf, ms, new cv.Size(sw, sh), 0, 0, cv.INTER_AREA);
        const mb = track(new cv.Mat());
        cv.GaussianBlur(ms, mb, ksize, ss, ss, cv.BORDER_REFLECT);
        const num = sb.data32F as Float32Array;
        const den = mb.data32F as Float32Array;
        const p = MASKED_FLATTEN_PRIOR;
        for (let i = 0; i < num.length; i++) num[i] = (num[i]! + p * mean) / (den[i]! + p);
      } else {
        cv.resize(f, small, new cv.Size(sw, sh), 0, 0, cv.INTER_AREA);
        cv.GaussianBlur(small, sb, ksize, ss, ss, cv.BORDER_REFLECT);
      }
      const bg = track(new cv.Mat());
      cv.resize(sb, bg, new cv.Size(w, h), 0, 0, cv.INTER_LINEAR);
      if (!o.backgroundMask) mean = cv.mean(bg)[0] as number;
      // max(bg, 1e-3) in place (a full-size Mat of the constant would cost 4 bytes a pixel of heap), and
      // only when needed: bilinear upscaling never goes below the small image's minimum (less a rounding
      // of a few parts in 10^7), so at 2e-3 or more no pixel of bg can be under 1e-3.
      if ((cv.minMaxLoc(sb) as { minVal: number }).minVal < 2e-3) {
        const b = bg.data32F as Float32Array;
        const eps = Math.fround(1e-3);
        for (let i = 0; i < b.length; i++) if (!(b[i]! >= eps)) b[i] = eps;
      }
      if (o.flattenBy === 'subtract') {
        // f − bg + mean, in place.
        const fd = f.data32F as Float32Array;
        const bd = bg.data32F as Float32Array;
        for (let i = 0; i < fd.length; i++) fd[i] = fd[i]! - bd[i]! + mean;
      } else cv.divide(f, bg, f, mean);
    }
    if (o.smoothSigmaPx > 0) {
      const k = 2 * Math.ceil(3 * o.smoothSigmaPx) + 1;
      cv.GaussianBlur(f, f, new cv.Size(k, k), o.smoothSigmaPx, o.smoothSigmaPx, cv.BORDER_REFLECT);
    }
    const data = f.data32F as Float32Array;
    // Exact extremes from opencv: one JS pass over the pixels fewer.
    const mm = cv.minMaxLoc(f) as { minVal: number; maxVal: number };
    const [lo, hi] = percentiles(data, mm.minVal, mm.maxVal, 0.001, 0.999);
    const out = new Uint8Array(w * h);
    const scale = hi > lo ? 255 / (hi - lo) : 0;
    for (let i = 0; i < out.length; i++) {
      const v = (data[i]! - lo) * scale;
      out[i] = v < 0 ? 0 : v > 255 ? 255 : (v + 0.5) | 0;
    }
    return out;
  });
}

/** Approximate percentiles of a float array through a 4096-bin histogram between its min and max. */
function percentiles(data: Float32Array, min: number, max: number, pLo: number, pHi: number): [number, number] {
  if (!(max > min)) return [min, max];
  const bins = 4096;
  const hist = new Float64Array(bins);
  const s = (bins - 1) / (max - min);
  for (let i = 0; i < data.length; i++) hist[((data[i]! - min) * s) | 0]!++;
  const n = data.length;
  let acc = 0;
  let lo = min;
  let hi = max;
  let loSet = false;
  for (let b = 0; b < bins; b++) {
    acc += hist[b]!;
    if (!loSet && acc >= pLo * n) {
      lo = min + b / s;
      loSet = true;
    }
    if (acc >= pHi * n) {
      hi = min + (b + 1) / s;
      break;
    }
  }
  return [lo, hi];
}

/**
 * Otsu's threshold of an 8-bit image: the level that maximises the between-class variance
 * (Otsu 1979, IEEE Trans. SMC 9:62). Pixels > t are the bright class.
 */
export function otsuThreshold(cv: CV, img8: Uint8Array, width: number, height: number): number {
  return withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, img8));
    return thresholdInto(cv, src, track(new cv.Mat()), { kind: 'otsu' });
  });
}

/**
 * Binary mask (1 = bright class) by a global threshold (pixels > t) or by a local-mean adaptive
 * threshold over a block of `blockPx` (pixel brighter than its neighbourhood mean).
 */
export function thresholdMask(
  cv: CV,
  img8: Uint8Array,
  width: number,
  height: number,
  method: { kind: 'global'; level: number } | { kind: 'adaptive'; blockPx: number },
): Uint8Array {
  if (method.kind === 'global') {
    const out = new Uint8Array(img8.length);
    const t = method.level;
    for (let i = 0; i < out.length; i++) out[i] = img8[i]! > t ? 1 : 0;
    return out;
  }
  return withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, img8));
    const dst = track(new cv.Mat());
    thresholdInto(cv, src, dst, method);
    return new Uint8Array(dst.data as Uint8Array);
  });
}

/** How the class of interest is separated: Otsu, a fixed level, or a local-mean adaptive threshold. */
export type MaskThreshold = { kind: 'otsu' } | { kind: 'global'; level: number } | { kind: 'adaptive'; blockPx: number };

/** The marker components of {@link thresholdComponents}, after the caller's selection. */
export interface ThresholdComponents {
  /** The global level used (0..255), or -1 for adaptive. */
  level: number;
  /** Pixels in the bright class (value > level, or above the local mean). */
  brightCount: number;
  /** Components 1..count before selection; areas[l] = pixels of component l (areas[0] the rest). */
  count: number;
  areas: Int32Array;
  /** Component labels (w*h), with the components the selection dropped set to 0. */
  labels: Int32Array;
}

/**
 * Thresholds an 8-bit image, picks one class, erodes it and labels its connected components, all inside
 * opencv.js: the masks never cross to JavaScript, and the label image crosses once, after `select` has
 * seen the component areas. Same pixels and labels as thresholdMask, erodeMask and connectedComponents in
 * turn (the bright class is value > level; adaptive is value > local mean).
 *
 * @param pick told the bright-class pixel count, returns the class to label
 * @param erodePx erosion radius (px) of the picked class before labelling; 0 = none
 * @param select told the component areas (index = label) before the label image is copied out (so that
 *   work needing only the areas can start at once); returns keep[label] (1 keep, 0 drop)
 * @throws whatever pick or select throw (every Mat freed)
 */
export function thresholdComponents(
  cv: CV,
  img8: Uint8Array,
  width: number,
  height: number,
  method: MaskThreshold,
  pick: (brightCount: number) => 'bright' | 'dark',
  erodePx: number,
  connectivity: 4 | 8,
  select: (areas: Int32Array, count: number) => Uint8Array,
): ThresholdComponents {
  return withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, img8));
    const mask = track(new cv.Mat());
    const level = thresholdInto(cv, src, mask, method);
    const brightCount = cv.countNonZero(mask) as number;
    if (pick(brightCount) === 'dark') {
      // 1 − mask in place: the dark class.
      const m = mask.data as Uint8Array;
      for (let i = 0; i < m.length; i++) m[i]! ^= 1;
    }
    const fg = erodePx > 0 ? erodeMat(cv, track, mask, erodePx) : mask;
    // The source is not needed again: its heap is reused by the label Mat.
    src.delete();
    const cc = labelComponents(cv, track, fg, connectivity);
    const keep = select(cc.areas, cc.count);
    // Copy out and drop in one pass (the view is taken after select, which may have used opencv.js).
    const view = cc.labels.data32S as Int32Array;
    const labels = new Int32Array(view.length);
    for (let i = 0; i < view.length; i++) {
      const l = view[i]!;
      labels[i] = keep[l] ? l : 0;
    }
    return { level, brightCount, count: cc.count, areas: cc.areas, labels };
  });
}

type Track = <M extends { delete(): void }>(m: M) => M;

/**
 * The 0/1 mask of the bright class of an 8-bit Mat into `dst`: value > level (Otsu's or the given), or
 * value > the mean over a block of `blockPx` (made odd). Returns the level, −1 for adaptive.
 */
function thresholdInto(cv: CV, src: CV, dst: CV, method: MaskThreshold): number {
  if (method.kind === 'adaptive') {
    const block = method.blockPx % 2 === 1 ? method.blockPx : method.blockPx + 1;
    cv.adaptiveThreshold(src, dst, 1, cv.ADAPTIVE_THRESH_MEAN_C, cv.THRESH_BINARY, block, 0);
    return -1;
  }
  if (method.kind === 'otsu') return cv.threshold(src, dst, 0, 1, cv.THRESH_BINARY | cv.THRESH_OTSU) as number;
  cv.threshold(src, dst, method.level, 1, cv.THRESH_BINARY);
  return method.level;
}

/** A 0/1 Mat eroded with a disc-like (elliptic) element of radius r px; outside the image counts as 1. */
function erodeMat(cv: CV, track: Track, src: CV, r: number): CV {
  const dst = track(new cv.Mat());
  const k = track(cv.getStructuringElement(cv.MORPH_ELLIPSE, new cv.Size(2 * r + 1, 2 * r + 1)));
  cv.erode(src, dst, k, new cv.Point(-1, -1), 1, cv.BORDER_CONSTANT, new cv.Scalar(1));
  return dst;
}

/** Connected components of a 0/1 Mat: the CV_32S label Mat (tracked), the count and each label's pixel count. */
function labelComponents(cv: CV, track: Track, src: CV, connectivity: 4 | 8): { labels: CV; count: number; areas: Int32Array } {
  const labels = track(new cv.Mat());
  const stats = track(new cv.Mat());
  const cents = track(new cv.Mat());
  const n = cv.connectedComponentsWithStats(src, labels, stats, cents, connectivity, cv.CV_32S) as number;
  const st = stats.data32S as Int32Array;
  const areas = new Int32Array(n);
  for (let i = 0; i < n; i++) areas[i] = st[i * 5 + 4]!;
  return { labels, count: n - 1, areas };
}

/** Erodes a 0/1 mask with a disc-like (elliptic) element of radius r px; r = 0 returns a copy. */
export function erodeMask(cv: CV, mask: Uint8Array, width: number, height: number, r: number): Uint8Array {
  if (r <= 0) return mask.slice();
  return withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, mask));
    return new Uint8Array(erodeMat(cv, track, src, r).data as Uint8Array);
  });
}

/** Opens a 0/1 mask (erosion then dilation) with a disc-like (elliptic) element of radius r px: parts thinner than 2r + 1 px go. */
export function openMask(cv: CV, mask: Uint8Array, width: number, height: number, r: number): Uint8Array {
  if (r <= 0) return mask.slice();
  return withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, mask));
    const dst = track(new cv.Mat());
    const k = track(cv.getStructuringElement(cv.MORPH_ELLIPSE, new cv.Size(2 * r + 1, 2 * r + 1)));
    cv.morphologyEx(src, dst, cv.MORPH_OPEN, k, new cv.Point(-1, -1), 1, cv.BORDER_CONSTANT, new cv.Scalar(0));
    return new Uint8Array(dst.data as Uint8Array);
  });
}

/**
 * Connected components of a 0/1 mask (4- or 8-connectivity). Returns labels (0 = background, 1..count)
 * and the pixel count of each label (index = label).
 */
export function connectedComponents(
  cv: CV,
  mask: Uint8Array,
  width: number,
  height: number,
  connectivity: 4 | 8 = 4,
): { labels: Int32Array; count: number; areas: Int32Array } {
  return withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, mask));
    const cc = labelComponents(cv, track, src, connectivity);
    return { labels: new Int32Array(cc.labels.data32S as Int32Array), count: cc.count, areas: cc.areas };
  });
}

/** Exact Euclidean distance (px) of each mask pixel to the nearest 0 pixel (Felzenszwalb & Huttenlocher 2012, via opencv's precise mode). */
export function distanceTransform(cv: CV, mask: Uint8Array, width: number, height: number): Float32Array {
  return withMats((track) => {
    const src = track(matFromArray(cv, height, width, cv.CV_8UC1, mask));
    const dst = track(new cv.Mat());
    cv.distanceTransform(src, dst, cv.DIST_L2, cv.DIST_MASK_PRECISE);
    return new Float32Array(dst.data32F as Float32Array);
  });
}
