/**
 * Bitmaps the worker makes for the page (the Bench's image and thumbnails, cell outlines, filmstrip
 * frames), so that the page does no per-pixel work. Browser only: ImageBitmap and createImageBitmap.
 */
import type { Analysis } from '../src/core/analysis.types';
import { labelRuns } from '../src/core/labelRuns';
import type { GreyImage } from '../src/core/types';
import { cellBoxes, displayRgba, outlineRgba } from './helpers';
import { KINETICS_THUMB_SIDE, THUMB_SIDE, type Overlay } from './protocol';

export async function bitmapOf(rgba: Uint8ClampedArray, width: number, height: number): Promise<ImageBitmap> {
  return createImageBitmap(new ImageData(rgba as Uint8ClampedArray<ArrayBuffer>, width, height));
}

/** A grey image as the Bench shows it (contrast-stretched). */
export function displayBitmap(img: GreyImage): Promise<ImageBitmap> {
  return bitmapOf(displayRgba(img), img.width, img.height);
}

/** A reduced copy of a bitmap for the zoomed-out Bench, or null when it is small already. */
export async function thumbOf(b: ImageBitmap, quality: ResizeQuality): Promise<ImageBitmap | null> {
  const k = THUMB_SIDE / Math.max(b.width, b.height);
  if (k >= 1) return null;
  return createImageBitmap(b, { resizeWidth: Math.max(1, Math.round(b.width * k)), resizeHeight: Math.max(1, Math.round(b.height * k)), resizeQuality: quality });
}

/** Outlines, cell boxes and the run-length labels of an analysis (empty for a point set). */
export async function makeOverlay(a: Analysis): Promise<Overlay> {
  if (!a.labels) return { outlines: null, outlinesThumb: null, cellBoxes: new Int32Array(0), runs: null };
  const outlines = await bitmapOf(outlineRgba(a.labels), a.labels.width, a.labels.height);
  return { outlines, outlinesThumb: await thumbOf(outlines, 'medium'), cellBoxes: cellBoxes(a.labels), runs: labelRuns(a.labels) };
}

/** A filmstrip thumbnail of a frame (contrast-stretched like the Bench). */
export async function frameThumb(img: GreyImage): Promise<ImageBitmap> {
  const b = await displayBitmap(img);
  const k = Math.min(1, KINETICS_THUMB_SIDE / Math.max(img.width, img.height));
  if (k >= 1) return b;
  const t = await createImageBitmap(b, { resizeWidth: Math.max(1, Math.round(img.width * k)), resizeHeight: Math.max(1, Math.round(img.height * k)), resizeQuality: 'medium' });
  b.close();
  return t;
}
