import { ImageTooLargeError, ImageTooSmallError, TessellabError } from '../errors';

/**
 * The largest image, in pixels (width x height of one page), that the decoders and the analysis accept:
 * 100 megapixels (e.g. 10 000 x 10 000 px).
 *
 * The bound is opencv.js's memory: its WebAssembly heap is capped at 1 GiB in this build, and the walls
 * segmentation needs about 9 bytes a pixel of it. Measured with `scripts/measure-pixel-limit.ts` (a synthetic
 * image, one size per process; results in test/unit/hostile/pixel-limit.json): walls work at 118 MP and fail
 * at 120 MP; bodies work at 139 MP; 110 MP three times and 118 MP twice in one process (a batch) work. 100 MP
 * leaves a margin for images whose cells need more outline memory than the synthetic one.
 * The web app uses a lower limit of its own (64 MP), since the page and the worker share the tab's memory.
 */
export const MAX_PIXELS = 100_000_000;

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
  if (width * height > maxPixels) throw new ImageTooLargeError(`${p}${tooLargeMessage(width, height, maxPixels)}`);
}

/** "W x H px exceeds the limit of N megapixels; crop or downsample first" (no full stop). */
export function tooLargeMessage(width: number, height: number, maxPixels: number = MAX_PIXELS): string {
  return `${width} x ${height} px exceeds the limit of ${formatMegapixels(maxPixels)} megapixels; crop or downsample first`;
}

/**
 * An error from inside opencv.js turned into one line: when its WebAssembly memory runs out it throws a bare
 * number (the address of a C++ exception) or a RangeError ("memory access out of bounds"), which would reach
 * the user as "Unexpected error: 7078392". Typed errors of ours pass through unchanged.
 *
 * @param e what was thrown
 * @param width, height the size of the image being processed, for the message
 */
export function outOfCvMemory(e: unknown, width: number, height: number): unknown {
  if (e instanceof TessellabError) return e;
  const text = e instanceof Error ? e.message : String(e);
  const fromCv = typeof e === 'number' || /memory|Aborted\(|OOM|bad_alloc|Invalid (typed )?array length|Array buffer allocation failed/i.test(text);
  if (!fromCv) return e;
  return new ImageTooLargeError(
    `${width} x ${height} px needs more memory than the image analysis has (opencv.js holds at most 1 GiB; the limit is ${formatMegapixels(MAX_PIXELS)} megapixels); crop or downsample first`,
  );
}

function formatMegapixels(pixels: number): string {
  const mp = pixels / 1e6;
  // Whole megapixels (truncated, so the limit is never overstated) unless the limit is below one.
  return mp >= 1 ? String(Math.floor(mp)) : String(Number(mp.toPrecision(3)));
}
