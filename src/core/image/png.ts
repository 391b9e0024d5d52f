import { decode as fastPngDecode, convertIndexedToRgb } from 'fast-png';
import type { DecodedPng } from 'fast-png';
import { ImageDecodeError, UnsupportedFormatError } from '../errors';
import { checkDimensions, namePrefix } from './limits';
import type { InterleavedImage } from './grey';

/** What the PNG header (IHDR) says. */
export interface PngHeader {
  width: number;
  height: number;
  /** Bits per sample (or per palette index): 1, 2, 4, 8 or 16. */
  bitDepth: number;
  /** 0 grey, 2 RGB, 3 palette, 4 grey + alpha, 6 RGBA. */
  colorType: number;
}

/** A decoded PNG before conversion to grey. */
export interface PngRaster {
  image: InterleavedImage;
  /** Whether the stored colours are not all grey (palette PNGs with only grey entries count as grey). */
  colour: boolean;
  /** µm per pixel from the pHYs chunk when its unit is the metre, else null. */
  umPerPx: number | null;
}

const textAscii = (b: Uint8Array, at: number) =>
  String.fromCharCode(b[at], b[at + 1], b[at + 2], b[at + 3]);

/**
 * Reads the IHDR chunk and walks the chunk list up to IEND without inflating anything, so size limits and
 * truncation are caught before the pixels are allocated. Chunk layout per the PNG specification
 * (W3C, 2003, "Portable Network Graphics (PNG) Specification, Second Edition", section 5.3):
 * 4-byte big-endian length, 4-byte type, data, 4-byte CRC.
 *
 * @param bytes - the whole file, starting with the PNG signature
 * @param name - file name for messages
 * @throws ImageDecodeError when IHDR is missing or a chunk runs past the end of the file (truncated)
 */
export function readPngHeader(bytes: Uint8Array, name?: string): PngHeader {
  const p = namePrefix(name);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const truncated = () =>
    new ImageDecodeError(`${p}the PNG file is truncated (it ends before its last chunk); copy or export it again`);
  if (bytes.length < 8 + 8 + 13 + 4) throw truncated();
  if (view.getUint32(8) !== 13 || textAscii(bytes, 12) !== 'IHDR') {
    throw new ImageDecodeError(`${p}the PNG file is damaged (its first chunk is not IHDR); re-save it`);
  }
  const header: PngHeader = {
    width: view.getUint32(16),
    height: view.getUint32(20),
    bitDepth: bytes[24],
    colorType: bytes[25],
  };
  let at = 8;
  for (;;) {
    if (at + 12 > bytes.length) throw truncated();
    const length = view.getUint32(at);
    const type = textAscii(bytes, at + 4);
    if (at + 12 + length > bytes.length) throw truncated();
    at += 12 + length;
    if (type === 'IEND') break;
  }
  return header;
}

function pngError(p: string, e: unknown): ImageDecodeError {
  const why = e instanceof Error ? e.message.replace(/\s+/g, ' ').replace(/[:.]\s*$/, '') : String(e);
  return new ImageDecodeError(`${p}the PNG file could not be decoded (${why}); re-save it as PNG or TIFF`);
}

function unpackLowDepthGrey(png: DecodedPng): Uint8Array {
  const { width, height, depth } = png;
  const packed = png.data as Uint8Array;
  const bytesPerRow = Math.ceil((width * depth) / 8);
  const maxValue = (1 << depth) - 1;
  const out = new Uint8Array(width * height);
  const mask = maxValue;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const bit = x * depth;
      const byte = packed[y * bytesPerRow + (bit >> 3)];
      const v = (byte >> (8 - depth - (bit & 7))) & mask;
      out[y * width + x] = Math.round((v * 255) / maxValue);
    }
  }
  return out;
}

/**
 * Decodes a PNG: grey, grey + alpha, RGB, RGBA (8 or 16 bit), palette (1..8-bit indices, expanded to RGB),
 * and 1/2/4-bit grey (scaled to 0..255). Checks the header size first ({@link checkDimensions}).
 *
 * @param bytes - the whole file
 * @param maxPixels - limit on width x height
 * @param name - file name for messages
 */
export function decodePngRaster(bytes: Uint8Array, maxPixels: number, name?: string): PngRaster {
  const p = namePrefix(name);
  const header = readPngHeader(bytes, name);
  checkDimensions(header.width, header.height, maxPixels, name);
  let png: DecodedPng;
  try {
    png = fastPngDecode(bytes, { checkCrc: true });
  } catch (e) {
    throw pngError(p, e);
  }
  const umPerPx =
    png.resolution && png.resolution.unit === 1 && png.resolution.x > 0 ? 1e6 / png.resolution.x : null;
  const { width, height } = png;

  if (png.palette) {
    const palette = png.palette;
    const rgb = convertIndexedToRgb(png);
    const channels = palette[0].length as 3 | 4;
    const colour = palette.some((c) => c[0] !== c[1] || c[1] !== c[2]);
    return { image: { width, height, data: rgb, channels, bitDepth: 8 }, colour, umPerPx };
  }
  const channels = png.channels;
  if (channels < 1 || channels > 4) throw new UnsupportedFormatError(`${p}PNG with ${channels} channels is not supported; re-save as grey or RGB`);
  if (png.depth < 8) {
    return { image: { width, height, data: unpackLowDepthGrey(png), channels: 1, bitDepth: 8 }, colour: false, umPerPx };
  }
  const bitDepth = png.depth === 16 ? 16 : 8;
  const data = bitDepth === 16 ? (png.data as Uint16Array) : toUint8(png.data);
  const expected = width * height * channels;
  if (data.length !== expected) {
    throw new ImageDecodeError(`${p}the PNG file is damaged (${data.length} of ${expected} samples); re-save it`);
  }
  return {
    image: { width, height, data, channels: channels as 1 | 2 | 3 | 4, bitDepth },
    colour: channels >= 3,
    umPerPx,
  };
}

function toUint8(a: Uint8Array | Uint8ClampedArray | Uint16Array): Uint8Array {
  return a instanceof Uint8Array ? a : new Uint8Array(a.buffer, a.byteOffset, a.length);
}
