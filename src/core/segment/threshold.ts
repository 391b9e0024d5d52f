/**
 * The threshold step shared by the walls and bodies segmenters: Otsu (default), adaptive or manual on the
 * prepared 8-bit image, and the check that both classes are present.
 */
import type { CV } from '../cv/index';
import { connectedComponents, openMask, otsuThreshold, thresholdMask, type MaskThreshold } from '../cv/kernels';
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

/**
 * Hysteresis (Canny 1986, IEEE Trans. PAMI 8:679; trade): the body class grown over the pixels that are at
 * least halfway from the background's mean level to the threshold, where they connect (8-neighbours) to a
 * pixel past the threshold. A body whose rim is dimmer than its centre keeps its rim; a speck of background
 * noise that nowhere passes the threshold stays background. Only dim parts at least 3 px thick are added
 * (the added pixels are opened with a 3 px disc): the thin fringe that blur leaves around every body would
 * otherwise widen every body by a pixel.
 *
 * @param body 1 = body class at the threshold (changed in place)
 * @param bodyBright the bodies are the bright class (value > level); else the dark class (value ≤ level)
 */
export function hysteresis(cv: CV, prepared: Uint8Array, body: Uint8Array, width: number, height: number, level: number, bodyBright: boolean): void {
  let sum = 0;
  let n = 0;
  for (let i = 0; i < prepared.length; i++) if (!body[i]) (sum += prepared[i]!), n++;
  if (n === 0) return;
  const low = (sum / n + level) / 2;
  const dim = new Uint8Array(prepared.length);
  for (let i = 0; i < prepared.length; i++) dim[i] = !body[i] && (bodyBright ? prepared[i]! > low : prepared[i]! < low) ? 1 : 0;
  const weak = openMask(cv, dim, width, height, 1);
  for (let i = 0; i < weak.length; i++) weak[i]! |= body[i]!;
  const cc = connectedComponents(cv, weak, width, height, 8);
  const keep = new Uint8Array(cc.count + 1);
  for (let i = 0; i < body.length; i++) if (body[i]) keep[cc.labels[i]!] = 1;
  for (let i = 0; i < body.length; i++) body[i] = cc.labels[i]! > 0 && keep[cc.labels[i]!] ? 1 : 0;
}
