/**
 * Two-phase kernels on opencv.js for the kinetics of an image series: a fixed threshold that separates the
 * transformed phase, and the connected components (domains) of that phase.
 */
import { loadCv } from './index';
import { withMats } from './mats';

/** The domains of a binary mask: 4-connected components with their areas. */
export interface PhaseComponents {
  width: number;
  height: number;
  /** 0 = untransformed, 1..count = component id; row-major. */
  labels: Int32Array;
  count: number;
  /** Area in px of component i + 1. */
  area: Int32Array;
  /** 1 when component i + 1 touches the border of the mask. */
  touchesBorder: Uint8Array;
}

/**
 * The transformed phase of an 8-bit image at a fixed threshold T: 1 where value > T (bright phase) or
 * value ≤ T (dark phase), 0 elsewhere. (cv.threshold, THRESH_BINARY / THRESH_BINARY_INV.)
 *
 * @param data 8-bit grey values, row-major, width × height
 * @param threshold T on the 0..255 scale
 * @param bright true when the transformed phase is the brighter one
 * @returns a 0/1 mask of the same shape
 */
export async function phaseMask(data: Uint8Array, width: number, height: number, threshold: number, bright: boolean): Promise<Uint8Array> {
  const { cv } = await loadCv();
  return withMats((track) => {
    const src = track(new cv.Mat(height, width, cv.CV_8UC1));
    src.data.set(data);
    const dst = track(new cv.Mat());
    cv.threshold(src, dst, threshold, 1, bright ? cv.THRESH_BINARY : cv.THRESH_BINARY_INV);
    return Uint8Array.from(dst.data as Uint8Array);
  });
}

/**
 * Otsu's threshold of an 8-bit image as opencv.js computes it (cv.threshold with THRESH_OTSU): the T that
 * maximises the between-class variance of {≤ T} and {> T}
 * (Otsu 1979, "A threshold selection method from gray-level histograms", IEEE Trans. SMC 9:62).
 */
export async function otsuThresholdCv(data: Uint8Array, width: number, height: number): Promise<number> {
  const { cv } = await loadCv();
  return withMats((track) => {
    const src = track(new cv.Mat(height, width, cv.CV_8UC1));
    src.data.set(data);
    const dst = track(new cv.Mat());
    return cv.threshold(src, dst, 0, 255, cv.THRESH_BINARY + cv.THRESH_OTSU) as number;
  });
}

/**
 * 4-connected components of a 0/1 mask (cv.connectedComponentsWithStats), with each component's area and
 * whether it touches the mask's border.
 *
 * @param mask 0/1 values, row-major, width × height
 */
export async function phaseComponents(mask: Uint8Array, width: number, height: number): Promise<PhaseComponents> {
  const { cv } = await loadCv();
  return withMats((track) => {
    const src = track(new cv.Mat(height, width, cv.CV_8UC1));
    src.data.set(mask);
    const labels = track(new cv.Mat());
    const stats = track(new cv.Mat());
    const centroids = track(new cv.Mat());
    const total = cv.connectedComponentsWithStats(src, labels, stats, centroids, 4, cv.CV_32S) as number;
    const count = total - 1;
    const area = new Int32Array(count);
    const touchesBorder = new Uint8Array(count);
    const s = stats.data32S as Int32Array;
    const cols = stats.cols as number;
    for (let i = 0; i < count; i++) {
      const row = (i + 1) * cols;
      const left = s[row + cv.CC_STAT_LEFT]!;
      const top = s[row + cv.CC_STAT_TOP]!;
      const w = s[row + cv.CC_STAT_WIDTH]!;
      const h = s[row + cv.CC_STAT_HEIGHT]!;
      area[i] = s[row + cv.CC_STAT_AREA]!;
      touchesBorder[i] = left === 0 || top === 0 || left + w === width || top + h === height ? 1 : 0;
    }
    return { width, height, labels: Int32Array.from(labels.data32S as Int32Array), count, area, touchesBorder };
  });
}
