import jpegJs from 'jpeg-js';
import { ImageDecodeError, UnsupportedFormatError } from '../errors';
import { checkDimensions, namePrefix } from './limits';
import type { InterleavedImage } from './grey';
import { exifOrientation, orientUpright } from './orient';

/** What the JPEG frame header (SOFn) says. */
export interface JpegHeader {
  width: number;
  height: number;
  /** Sample precision in bits (8 for baseline; 12 is possible in extended JPEG and is not read). */
  precision: number;
  /** Number of colour components: 1 grey, 3 colour (YCbCr or RGB), 4 CMYK / YCCK. */
  components: number;
  /** The frame marker's second byte: C0 baseline, C1 extended, C2 progressive (Huffman); others not read. */
  sof: number;
  /** Bytes of entropy-coded data in all the scans (restart markers included). */
  scanBytes: number;
  /** EXIF Orientation (1..8) of the first APP1 Exif segment; 1 (as stored) without one. */
  orientation: number;
}

/** A decoded JPEG before conversion to grey. */
export interface JpegRaster {
  image: InterleavedImage;
  colour: boolean;
}

/** SOFn markers: C0..CF except C4 (DHT), C8 (JPG extension) and CC (DAC). */
function isStartOfFrame(marker: number): boolean {
  return marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc;
}

/**
 * Walks the JPEG marker segments (ITU-T Recommendation T.81, 1992, "Digital compression and coding of
 * continuous-tone still images", Annex B) to the frame header, and checks that an end-of-image marker
 * (FF D9) follows the first scan. Inside entropy-coded data an FF byte is always followed by 00 or a restart
 * marker, so FF D9 there can only be the real end of image; a file without it was cut short.
 *
 * @param bytes - the whole file, starting with FF D8
 * @param name - file name for messages
 * @throws ImageDecodeError when the file is truncated or has no frame header
 */
export function readJpegHeader(bytes: Uint8Array, name?: string): JpegHeader {
  const p = namePrefix(name);
  const truncated = () =>
    new ImageDecodeError(`${p}the JPEG file is truncated (it ends before its end-of-image marker); copy or export it again`);
  let header: JpegHeader | null = null;
  let scanBytes = 0;
  let orientation: number | null = null;
  let at = 2;
  for (;;) {
    while (at < bytes.length && bytes[at] === 0xff && bytes[at + 1] === 0xff) at++; // fill bytes
    if (at + 2 > bytes.length) throw truncated();
    if (bytes[at] !== 0xff) {
      throw new ImageDecodeError(`${p}the JPEG file is damaged (a marker is missing at byte ${at}); re-save it`);
    }
    const marker = bytes[at + 1]!;
    if (marker === 0xd9) break;
    if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) { at += 2; continue; }
    if (at + 4 > bytes.length) throw truncated();
    const length = (bytes[at + 2]! << 8) | bytes[at + 3]!;
    if (at + 2 + length > bytes.length) throw truncated();
    if (isStartOfFrame(marker) && header === null) {
      if (length < 8) throw new ImageDecodeError(`${p}the JPEG file is damaged (short frame header); re-save it`);
      header = {
        precision: bytes[at + 4]!,
        height: (bytes[at + 5]! << 8) | bytes[at + 6]!,
        width: (bytes[at + 7]! << 8) | bytes[at + 8]!,
        components: bytes[at + 9]!,
        sof: marker,
        scanBytes: 0,
        orientation: 1,
      };
    }
    if (marker === 0xe1 && orientation === null && length >= 16 && bytes[at + 4] === 0x45) {
      orientation = exifOrientation(bytes.subarray(at + 4, at + 2 + length));
    }
    at += 2 + length;
    if (marker === 0xda) {
      // Skip the entropy-coded scan: stop at the first FF not followed by 00 or a restart marker.
      const scanStart = at;
      while (at + 1 < bytes.length) {
        if (bytes[at] === 0xff) {
          const next = bytes[at + 1]!;
          if (next !== 0x00 && !(next >= 0xd0 && next <= 0xd7) && next !== 0xff) break;
        }
        at++;
      }
      if (at + 1 >= bytes.length) throw truncated();
      scanBytes += at - scanStart;
    }
  }
  if (header === null) {
    throw new ImageDecodeError(`${p}the JPEG file has no frame header; re-save it`);
  }
  header.scanBytes = scanBytes;
  header.orientation = orientation ?? 1;
  return header;
}

/**
 * Decodes an 8-bit JPEG (grey or colour) with jpeg-js, after checking the header size
 * ({@link checkDimensions}) so an oversized file allocates nothing. Colour is converted to RGB by jpeg-js;
 * the caller makes it grey. An EXIF Orientation tag is applied ({@link orientUpright}), so the image is
 * upright as viewers show it (width and height swap for orientations 5 to 8).
 *
 * @param bytes - the whole file
 * @param maxPixels - limit on width x height
 * @param name - file name for messages
 */
export function decodeJpegRaster(bytes: Uint8Array, maxPixels: number, name?: string): JpegRaster {
  const p = namePrefix(name);
  const header = readJpegHeader(bytes, name);
  if (header.width === 0 || header.height === 0) {
    throw new UnsupportedFormatError(`${p}this JPEG gives its height after the image data, which is not supported; re-save it`);
  }
  if (header.sof !== 0xc0 && header.sof !== 0xc1 && header.sof !== 0xc2) {
    const kind = header.sof === 0xc3 || header.sof === 0xc7 || header.sof === 0xcb || header.sof === 0xcf ? 'lossless' : header.sof >= 0xc9 ? 'arithmetic-coded' : 'hierarchical';
    throw new UnsupportedFormatError(`${p}${kind} JPEG is not supported (only baseline and progressive); re-save it as PNG, TIFF or an ordinary JPEG`);
  }
  checkDimensions(header.width, header.height, maxPixels, name);
  // Huffman coding spends at least one bit on each 8 x 8 block of the largest component (a DC code of one
  // bit; ITU-T T.81, Annexes C and F), so a file with fewer scan bytes cannot hold the size it claims: a
  // small file claiming a huge image would otherwise be decoded at full size, mostly from nothing.
  const blocks = Math.ceil(header.width / 8) * Math.ceil(header.height / 8);
  if (header.scanBytes * 8 < blocks) {
    throw new ImageDecodeError(
      `${p}the JPEG's image data (${header.scanBytes} bytes) is too short for the ${header.width} x ${header.height} px its header gives (at least ${Math.ceil(blocks / 8)} bytes); the file is damaged or cut short: copy or export it again`,
    );
  }
  if (header.precision !== 8) {
    throw new UnsupportedFormatError(`${p}${header.precision}-bit JPEG is not supported; re-save as 16-bit PNG or TIFF`);
  }
  if (header.components !== 1 && header.components !== 3) {
    throw new UnsupportedFormatError(`${p}JPEG with ${header.components} colour components (e.g. CMYK) is not supported; re-save as RGB or grey`);
  }
  const pixels = header.width * header.height;
  let decoded: { width: number; height: number; data: Uint8Array };
  try {
    decoded = jpegJs.decode(bytes, {
      useTArray: true,
      formatAsRGBA: false,
      // Our own limit has been checked; the library's defaults (100 MP, 512 MB) must not undercut it.
      maxResolutionInMP: Math.ceil(pixels / 1e6) + 1,
      maxMemoryUsageInMB: Math.ceil((pixels * 8) / 2 ** 20) + 64,
    });
  } catch (e) {
    const why = e instanceof Error ? e.message.replace(/\s+/g, ' ') : String(e);
    throw new ImageDecodeError(`${p}the JPEG file could not be decoded (${why}); re-save it as PNG or TIFF`);
  }
  const { width, height, data } = decoded;
  if (header.components === 1) {
    // jpeg-js replicates a grey component into R, G and B; keep one.
    const grey = new Uint8Array(width * height);
    for (let i = 0; i < grey.length; i++) grey[i] = data[3 * i]!;
    return { image: orientUpright({ width, height, data: grey, channels: 1, bitDepth: 8 }, header.orientation), colour: false };
  }
  return { image: orientUpright({ width, height, data, channels: 3, bitDepth: 8 }, header.orientation), colour: true };
}
