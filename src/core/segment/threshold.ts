/**
 * The threshold step shared by the walls and bodies segmenters: Otsu (default), adaptive or manual on the
 * prepared 8-bit image, and the check that both classes are present.
 */
import type { CV } from '../cv/index';
import { otsuThreshold, thresholdMask, type MaskThreshold } from '../cv/kernels';
import { NoCellsError } from '../errors';
import type { ThresholdMethod } from '../settings';

export interface ThresholdResult {
  /** 1 = bright class (value > level). */
  bright: Uint8Array;
  /** Pixels in the bright class. */
  brightCount: number;
  /** The global level used (0..255), or -1 for adaptive. */
  level: number;
}

/**
 * @param what 'cells' or 'bodies', for the message when the image is uniform
 * @throws NoCellsError when one class is empty (a uniform image)
 */
export function thresholdPrepared(
  cv: CV,
  prepared: Uint8Array,
  width: number,
  height: number,
  s: { threshold: ThresholdMethod; manualThreshold: number; adaptiveBlockPx: number },
  what: 'cells' | 'bodies',
): ThresholdResult {
  const method = maskThreshold(s);
  let level: number;
  let bright: Uint8Array;
  if (method.kind === 'adaptive') {
    level = -1;
    bright = thresholdMask(cv, prepared, width, height, method);
  } else {
    level = method.kind === 'global' ? method.level : otsuThreshold(cv, prepared, width, height);
    bright = thresholdMask(cv, prepared, width, height, { kind: 'global', level });
  }
  let brightCount = 0;
  for (let i = 0; i < bright.length; i++) brightCount += bright[i]!;
  if (brightCount === 0 || brightCount === bright.length) throw uniformImageError(what);
  return { bright, brightCount, level };
}

/** The error for an image with one class only (nothing to threshold). */
export function uniformImageError(what: 'cells' | 'bodies'): NoCellsError {
  return new NoCellsError(`No ${what} found: the image is uniform (nothing to threshold); check that this is the right image, or set a manual threshold.`);
}

/** The threshold settings as a kernel's method. */
export function maskThreshold(s: { threshold: ThresholdMethod; manualThreshold: number; adaptiveBlockPx: number }): MaskThreshold {
  if (s.threshold === 'adaptive') return { kind: 'adaptive', blockPx: s.adaptiveBlockPx };
  return s.threshold === 'manual' ? { kind: 'global', level: s.manualThreshold } : { kind: 'otsu' };
}
