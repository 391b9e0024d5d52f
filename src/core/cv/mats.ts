import type { CV } from './index';
import type { GreyImage } from '../types';

/**
 * Runs `fn` with Mats created through `track`, and deletes every tracked Mat afterwards, whatever happens.
 */
export function withMats<T>(fn: (track: <M extends { delete(): void }>(m: M) => M) => T): T {
  const mats: { delete(): void }[] = [];
  const track = <M extends { delete(): void }>(m: M): M => {
    mats.push(m);
    return m;
  };
  try {
    return fn(track);
  } finally {
    for (let i = mats.length - 1; i >= 0; i--) {
      try {
        const m = mats[i] as { delete(): void; isDeleted?: () => boolean };
        if (!m.isDeleted || !m.isDeleted()) m.delete();
      } catch {
        /* already deleted */
      }
    }
  }
}

/** Copies a typed array into a new Mat of the given type. The caller owns (and deletes) the Mat. */
export function matFromArray(cv: CV, rows: number, cols: number, type: number, data: ArrayLike<number> & { buffer: ArrayBufferLike }): CV {
  const m = new cv.Mat(rows, cols, type);
  const dst = type === cv.CV_8UC1 ? m.data : type === cv.CV_16UC1 ? m.data16U : type === cv.CV_32SC1 ? m.data32S : type === cv.CV_32FC1 ? m.data32F : null;
  if (!dst) {
    m.delete();
    throw new Error(`matFromArray: unsupported Mat type ${type}`);
  }
  dst.set(data as never);
  return m;
}

/** A grey image as a CV_8UC1 or CV_16UC1 Mat. The caller owns the Mat. */
export function matFromGrey(cv: CV, img: GreyImage): CV {
  return matFromArray(cv, img.height, img.width, img.bitDepth === 16 ? cv.CV_16UC1 : cv.CV_8UC1, img.data);
}
