import { decode as fastPngDecode, convertIndexedToRgb } from 'fast-png';
import type { DecodedPng } from 'fast-png';
import { ImageDecodeError, UnsupportedFormatError } from '../errors';
import { inflateBounded } from './inflate';
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
  /** 0 none, 1 Adam7. */
  interlace: number;
}

/** A decoded PNG before conversion to grey. */
export interface PngRaster {
  image: InterleavedImage;
  /** Whether the stored colours are not all grey (palette PNGs with only grey entries count as grey). */
  colour: boolean;
  /** µm per pixel in x from the pHYs chunk when its unit is the metre, else null. */
  umPerPx: number | null;
  /** µm per pixel in y from the same chunk, else null. */
  umPerPxY: number | null;
}

const textAscii = (b: Uint8Array, at: number) =>
  String.fromCharCode(b[at]!, b[at + 1]!, b[at + 2]!, b[at + 3]!);

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
    bitDepth: bytes[24]!,
    colorType: bytes[25]!,
    interlace: bytes[28]!,
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

/** Samples per pixel of each PNG colour type (PNG specification, section 11.2.2). */
const CHANNELS: Record<number, number> = { 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 };

/** The Adam7 passes: first column, first row, column step, row step (PNG specification, section 8.2). */
const ADAM7 = [[0, 0, 8, 8], [4, 0, 8, 8], [0, 4, 4, 8], [2, 0, 4, 4], [0, 2, 2, 4], [1, 0, 2, 2], [0, 1, 1, 2]] as const;

/**
 * The number of bytes the image data of a PNG inflates to, from its header: each row of each pass is one
 * filter-type byte and ceil(width x bits per pixel / 8) bytes (PNG specification, sections 7.2 and 8.2).
 * Null for a colour type or bit depth that the specification does not define (the decoder then says so).
 */
export function pngRawSize(h: PngHeader): number | null {
  const channels = CHANNELS[h.colorType];
  if (channels === undefined || ![1, 2, 4, 8, 16].includes(h.bitDepth)) return null;
  const bpp = channels * h.bitDepth;
  const rows = (w: number, n: number) => (w > 0 && n > 0 ? n * (1 + Math.ceil((w * bpp) / 8)) : 0);
  if (h.interlace !== 1) return rows(h.width, h.height);
  let total = 0;
  for (const [x0, y0, dx, dy] of ADAM7) total += rows(Math.ceil((h.width - x0) / dx), Math.ceil((h.height - y0) / dy));
  return total;
}

/** The most bytes an embedded ICC profile (iCCP) may inflate to; real profiles are far smaller. */
const MAX_ICC_BYTES = 32 * 2 ** 20;

/**
 * Inflates the zlib streams of a PNG (the image data, and an embedded ICC profile) while counting their
 * output, stopping as soon as it passes what the header promises: a file whose 16 x 16 header hides a
 * gigabyte of image data is refused after a few megabytes, before the decoder allocates it all. A stream
 * that is damaged otherwise is left to the decoder, which names the fault.
 *
 * @throws ImageDecodeError when the image data inflates to more or fewer bytes than the header's size, or the
 *   profile to more than 32 MiB
 */
function checkInflatedSizes(bytes: Uint8Array, header: PngHeader, name?: string): void {
  const expected = pngRawSize(header);
  if (expected === null) return;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const idat: Uint8Array[] = [];
  let icc: Uint8Array | null = null;
  for (let at = 8; at + 12 <= bytes.length;) {
    const length = view.getUint32(at);
    const type = textAscii(bytes, at + 4);
    const data = bytes.subarray(at + 8, at + 8 + length);
    if (type === 'IDAT') idat.push(data);
    if (type === 'iCCP' && icc === null) {
      const nul = data.indexOf(0);
      if (nul >= 0) icc = data.subarray(nul + 2);
    }
    if (type === 'IEND') break;
    at += 12 + length;
  }
  const p = namePrefix(name);
  const r = inflateBounded(idat, expected, false);
  if (!r.ok && r.overflow) {
    throw new ImageDecodeError(
      `${p}the PNG's image data inflates to more than the ${header.width} x ${header.height} px its header gives (${expected} bytes); the file is damaged or made to exhaust memory: re-save it`,
    );
  }
  // Short data is refused here too, before the decoder allocates the whole image for it.
  if (r.ok && r.length < expected) {
    throw new ImageDecodeError(
      `${p}the PNG's image data holds ${r.length} of the ${expected} bytes its ${header.width} x ${header.height} px header gives; the file is damaged or cut short: copy or export it again`,
    );
  }
  if (icc) {
    const q = inflateBounded([icc], MAX_ICC_BYTES, false);
    if (!q.ok && q.overflow) {
      throw new ImageDecodeError(`${p}the PNG's colour profile (iCCP) inflates to more than 32 MiB; the file is damaged or made to exhaust memory: re-save it without the profile`);
    }
  }
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
      const byte = packed[y * bytesPerRow + (bit >> 3)]!;
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
  checkInflatedSizes(bytes, header, name);
  let png: DecodedPng;
  try {
    png = fastPngDecode(bytes, { checkCrc: true });
  } catch (e) {
    throw pngError(p, e);
  }
  const res = png.resolution && png.resolution.unit === 1 ? png.resolution : null;
  const umPerPx = res && res.x > 0 ? 1e6 / res.x : null;
  const umPerPxY = res && res.y > 0 ? 1e6 / res.y : null;
  const { width, height } = png;

  if (png.palette) {
    const palette = png.palette;
    let rgb: Uint8Array;
    try {
      if (palette.length === 0) throw new Error('empty palette');
      rgb = convertIndexedToRgb(png);
    } catch {
      throw new ImageDecodeError(
        `${p}the PNG's palette (${palette.length} colour${palette.length === 1 ? '' : 's'}) does not cover the colour numbers its pixels use; the file is damaged: re-save it`,
      );
    }
    const channels = palette[0]!.length as 3 | 4;
    const colour = palette.some((c) => c[0] !== c[1] || c[1] !== c[2]);
    return { image: { width, height, data: rgb, channels, bitDepth: 8 }, colour, umPerPx, umPerPxY };
  }
  const channels = png.channels;
  if (channels < 1 || channels > 4) throw new UnsupportedFormatError(`${p}PNG with ${channels} channels is not supported; re-save as grey or RGB`);
  if (png.depth < 8) {
    return { image: { width, height, data: unpackLowDepthGrey(png), channels: 1, bitDepth: 8 }, colour: false, umPerPx, umPerPxY };
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
    umPerPxY,
  };
}

function toUint8(a: Uint8Array | Uint8ClampedArray | Uint16Array): Uint8Array {
  return a instanceof Uint8Array ? a : new Uint8Array(a.buffer, a.byteOffset, a.length);
}
