import { ImageDecodeError, UnsupportedFormatError } from '../errors';
import { namePrefix } from './limits';

/** The image formats the decoders read. */
export type ImageFormat = 'png' | 'jpeg' | 'tiff';

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

function startsWith(bytes: Uint8Array, sig: readonly number[], at = 0): boolean {
  if (bytes.length < at + sig.length) return false;
  for (let i = 0; i < sig.length; i++) if (bytes[at + i] !== sig[i]) return false;
  return true;
}

/** Formats recognised by their magic numbers that we do not read, so the message can name them. */
const OTHER_FORMATS: { name: string; test: (b: Uint8Array) => boolean }[] = [
  { name: 'GIF', test: (b) => startsWith(b, [0x47, 0x49, 0x46, 0x38]) },
  // 'BM' alone is too common at the start of text; the DIB header size at byte 14 must be a known one too.
  { name: 'BMP', test: (b) => startsWith(b, [0x42, 0x4d]) && b.length >= 18 && [12, 40, 52, 56, 64, 108, 124].includes(b[14]! | (b[15]! << 8) | (b[16]! << 16) | (b[17]! << 24)) },
  { name: 'WebP', test: (b) => startsWith(b, [0x52, 0x49, 0x46, 0x46]) && startsWith(b, [0x57, 0x45, 0x42, 0x50], 8) },
  { name: 'JPEG 2000', test: (b) => startsWith(b, [0x00, 0x00, 0x00, 0x0c, 0x6a, 0x50, 0x20, 0x20]) || startsWith(b, [0xff, 0x4f, 0xff, 0x51]) },
  { name: 'HEIF/AVIF', test: (b) => startsWith(b, [0x66, 0x74, 0x79, 0x70], 4) },
  { name: 'PDF', test: (b) => startsWith(b, [0x25, 0x50, 0x44, 0x46]) },
  { name: 'ZIP', test: (b) => startsWith(b, [0x50, 0x4b, 0x03, 0x04]) },
];

/**
 * Whether the first bytes read as text: UTF-8 (or plain ASCII) without control characters other than tab,
 * line feed, carriage return and form feed. Binary image data breaks this within a few bytes.
 */
function looksLikeText(bytes: Uint8Array): boolean {
  const head = bytes.subarray(0, 1024);
  for (let i = 0; i < head.length; i++) {
    const c = head[i]!;
    if (c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d && c !== 0x0c) return false;
    if (c === 0x7f) return false;
  }
  try {
    // A multi-byte character cut at the 1024-byte boundary is not a reason to call it binary.
    new TextDecoder('utf-8', { fatal: true }).decode(head.subarray(0, Math.max(0, head.length - 4)));
    return true;
  } catch {
    return false;
  }
}

/**
 * Detects the image format from the bytes' magic numbers (never from the file name).
 *
 * PNG: the 8-byte signature 89 50 4E 47 0D 0A 1A 0A. JPEG: FF D8 FF. TIFF: `II*\0` or `MM\0*`
 * (BigTIFF: `II+\0`, `MM\0+`). These are the signatures of the PNG specification (W3C/ISO 15948),
 * JPEG (ITU-T T.81 / JFIF) and TIFF 6.0.
 *
 * @param bytes - the whole file
 * @param name - file name for messages
 * @returns the format
 * @throws ImageDecodeError for an empty file, a text file, or bytes that match no image format
 * @throws UnsupportedFormatError for an image format recognised but not read (GIF, BMP, WebP, ...)
 */
export function detectFormat(bytes: Uint8Array, name?: string): ImageFormat {
  const p = namePrefix(name);
  if (bytes.length === 0) {
    throw new ImageDecodeError(`${p}the file is empty (0 bytes); choose the image file again or re-export it`);
  }
  if (startsWith(bytes, PNG_SIGNATURE)) return 'png';
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'jpeg';
  if (
    startsWith(bytes, [0x49, 0x49, 0x2a, 0x00]) || startsWith(bytes, [0x4d, 0x4d, 0x00, 0x2a]) ||
    startsWith(bytes, [0x49, 0x49, 0x2b, 0x00]) || startsWith(bytes, [0x4d, 0x4d, 0x00, 0x2b])
  ) {
    return 'tiff';
  }
  for (const f of OTHER_FORMATS) {
    if (f.test(bytes)) {
      throw new UnsupportedFormatError(`${p}${f.name} images are not supported; re-save the image as PNG or TIFF`);
    }
  }
  if (looksLikeText(bytes)) {
    throw new ImageDecodeError(`${p}this looks like a text file, not an image; choose a PNG, JPEG or TIFF file`);
  }
  throw new ImageDecodeError(
    `${p}the file is not a PNG, JPEG or TIFF image (its first bytes match none of them); check the file or re-save it as PNG or TIFF`,
  );
}
