import { ImageTooLargeError, ImageTooSmallError } from '../errors';

/** The largest image, in pixels (width x height of one page), that the decoders accept: 2^28, "268 megapixels". */
export const MAX_PIXELS = 268_435_456;

/** The smallest width and the smallest height, in pixels, of an image worth analysing. */
export const MIN_SIDE_PX = 16;

/** `"name: "` when a name is given, else `""`; every decoder message starts with it. */
export function namePrefix(name: string | undefined): string {
  return name ? `${name}: ` : '';
}

/**
 * Checks the size an image header claims before any pixel is decoded, so an oversized file fails without
 * allocating its raster.
 *
 * @param width - width in pixels, from the header
 * @param height - height in pixels, from the header
 * @param maxPixels - the limit on width x height (default {@link MAX_PIXELS})
 * @param name - file name for the message
 * @throws ImageTooSmallError when either side is below {@link MIN_SIDE_PX}
 * @throws ImageTooLargeError when width x height exceeds `maxPixels`
 */
export function checkDimensions(width: number, height: number, maxPixels: number = MAX_PIXELS, name?: string): void {
  const p = namePrefix(name);
  if (width < MIN_SIDE_PX || height < MIN_SIDE_PX) {
    throw new ImageTooSmallError(
      `${p}${width} x ${height} px is too small to analyse; the minimum is ${MIN_SIDE_PX} x ${MIN_SIDE_PX}`,
    );
  }
  if (width * height > maxPixels) {
    throw new ImageTooLargeError(
      `${p}${width} x ${height} px exceeds the limit of ${formatMegapixels(maxPixels)} megapixels; crop or downsample first`,
    );
  }
}

function formatMegapixels(pixels: number): string {
  const mp = pixels / 1e6;
  // Whole megapixels (truncated, so the limit is never overstated) unless the limit is below one.
  return mp >= 1 ? String(Math.floor(mp)) : String(Number(mp.toPrecision(3)));
}
