import { encode as fastPngEncode } from 'fast-png';
import type { InterleavedImage } from './grey';

/**
 * Encodes a raster as PNG bytes (PNG specification, W3C 2003, second edition), with fast-png.
 * Used for the 16-bit label image and for overlay PNGs.
 *
 * Channels 1 grey, 2 grey + alpha, 3 RGB, 4 RGBA; bit depth 8 (Uint8Array) or 16 (Uint16Array). 16-bit values
 * 0..65535 are stored exactly. No pixel-size chunk is written.
 *
 * @param img - the raster, row-major with interleaved samples; `data.length` must be `width * height * channels`
 * @returns the PNG file as bytes
 * @throws RangeError when the sizes, the sample count or the array type do not match (a caller's bug)
 */
export function encodePng(img: InterleavedImage): Uint8Array {
  const { width, height, data, channels, bitDepth } = img;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1) {
    throw new RangeError(`encodePng: ${width} x ${height} px is not a valid image size`);
  }
  if (![1, 2, 3, 4].includes(channels)) throw new RangeError(`encodePng: ${channels} channels; use 1, 2, 3 or 4`);
  if (data.length !== width * height * channels) {
    throw new RangeError(`encodePng: ${data.length} samples do not make ${width} x ${height} px of ${channels} channels`);
  }
  if (bitDepth === 16 && !(data instanceof Uint16Array)) throw new RangeError('encodePng: 16-bit data must be a Uint16Array');
  if (bitDepth === 8 && !(data instanceof Uint8Array)) throw new RangeError('encodePng: 8-bit data must be a Uint8Array');
  if (bitDepth !== 8 && bitDepth !== 16) throw new RangeError(`encodePng: bit depth ${bitDepth}; use 8 or 16`);
  return fastPngEncode({ width, height, data, channels, depth: bitDepth });
}
