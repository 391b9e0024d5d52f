import type { GreyImage } from '../types';

/**
 * A raster with interleaved samples, row-major: sample c of pixel (x, y) is at `(y * width + x) * channels + c`.
 * Channels: 1 grey, 2 grey + alpha, 3 RGB, 4 RGBA. 8-bit samples in a Uint8Array, 16-bit in a Uint16Array.
 */
export interface InterleavedImage {
  width: number;
  height: number;
  data: Uint8Array | Uint16Array;
  channels: 1 | 2 | 3 | 4;
  bitDepth: 8 | 16;
}

/** ITU-R BT.601 luma weight of red. */
export const LUMA_R = 0.299;
/** ITU-R BT.601 luma weight of green. */
export const LUMA_G = 0.587;
/** ITU-R BT.601 luma weight of blue. */
export const LUMA_B = 0.114;

/**
 * Converts an interleaved raster to one grey channel, keeping its bit depth.
 *
 * Colour (3 or 4 channels): `Y = 0.299 R + 0.587 G + 0.114 B`, rounded to the nearest integer — the luma
 * weights of ITU-R Recommendation BT.601 ("Studio encoding parameters of digital television", ITU 1982,
 * rev. 2011). The weights sum to 1, so Y stays in 0..255 (8-bit) or 0..65535 (16-bit).
 * Alpha (channel 2 of grey + alpha, channel 4 of RGBA) is ignored: the colour is used as stored, not blended
 * over any background. Grey + alpha keeps the grey channel.
 * One channel is returned as it is, without a copy (the result shares `img.data`).
 *
 * @param img - the raster; `data.length` must be `width * height * channels`
 * @returns a grey image of the same width, height and bit depth (Uint8Array for 8-bit, Uint16Array for 16-bit)
 */
export function toGrey(img: InterleavedImage): GreyImage {
  const { width, height, data, channels, bitDepth } = img;
  const n = width * height;
  if (data.length !== n * channels) {
    throw new RangeError(`toGrey: ${data.length} samples do not make ${width} x ${height} px of ${channels} channels`);
  }
  if (channels === 1) return { width, height, data, bitDepth };
  const out = bitDepth === 16 ? new Uint16Array(n) : new Uint8Array(n);
  if (channels === 2) {
    for (let i = 0; i < n; i++) out[i] = data[2 * i]!;
  } else {
    for (let i = 0, j = 0; i < n; i++, j += channels) {
      out[i] = Math.round(LUMA_R * data[j]! + LUMA_G * data[j + 1]! + LUMA_B * data[j + 2]!);
    }
  }
  return { width, height, data: out, bitDepth };
}

/**
 * An 8-bit copy of a grey image, for display and for kernels that take 8-bit input.
 *
 * 8-bit data is copied unchanged. 16-bit data is stretched linearly from its own minimum to its maximum:
 * `out = round((v - min) * 255 / (max - min))`, so min maps to 0 and max to 255. A constant 16-bit image
 * (max = min) maps to all 0.
 *
 * @param img - grey image, 8- or 16-bit
 * @returns a new Uint8Array of `width * height` values
 */
export function greyTo8(img: GreyImage): Uint8Array {
  const { data } = img;
  if (img.bitDepth === 8) return Uint8Array.from(data);
  const n = data.length;
  let min = 65535;
  let max = 0;
  for (let i = 0; i < n; i++) {
    const v = data[i]!;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const out = new Uint8Array(n);
  if (max === min) return out;
  const scale = 255 / (max - min);
  for (let i = 0; i < n; i++) out[i] = Math.round((data[i]! - min) * scale);
  return out;
}
