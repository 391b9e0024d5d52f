/**
 * Tiny files built byte by byte for the bad-input tests, laid out as the PNG specification (W3C 2003),
 * TIFF 6.0 (Adobe 1992) and JPEG (ITU-T T.81) describe them.
 */

import { concat, pngChunk } from '../hostile/craft';

/** A PNG that is only a signature, an IHDR claiming width x height 8-bit grey, and IEND: no pixel data. */
export function pngHeaderOnly(width: number, height: number): Uint8Array {
  const ihdr = new Uint8Array(13);
  const v = new DataView(ihdr.buffer);
  v.setUint32(0, width);
  v.setUint32(4, height);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 0; // grey
  return concat([
    new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IEND', new Uint8Array(0)),
  ]);
}

/** A baseline JPEG frame header claiming width x height, one grey component, an empty scan and EOI. */
export function jpegHeaderOnly(width: number, height: number): Uint8Array {
  return new Uint8Array([
    0xff, 0xd8,
    0xff, 0xc0, 0x00, 0x0b, 0x08, height >> 8, height & 0xff, width >> 8, width & 0xff, 0x01, 0x01, 0x11, 0x00,
    0xff, 0xda, 0x00, 0x08, 0x01, 0x01, 0x00, 0x00, 0x3f, 0x00,
    0x00, 0x00,
    0xff, 0xd9,
  ]);
}

export interface TiffSpec {
  width: number;
  height: number;
  compression?: number;
  /** Pixel data, 8-bit grey, one strip. */
  pixels: Uint8Array;
  /** Cut the file to this many bytes (to make a truncated file). */
  cutTo?: number;
  /** XResolution and YResolution (numerator, denominator) with ResolutionUnit (2 inch, 3 cm). */
  resolution?: { x: [number, number]; y: [number, number]; unit: number };
}

/** A little-endian, single-strip, 8-bit grey TIFF with its IFD before the pixel data. */
export function tiff(spec: TiffSpec): Uint8Array {
  const entries: [number, number, number][] = [ // tag, type (3 SHORT, 4 LONG), value
    [256, 4, spec.width],
    [257, 4, spec.height],
    [258, 3, 8],
    [259, 3, spec.compression ?? 1],
    [262, 3, 1],
    [273, 4, 0], // strip offset, filled below
    [277, 3, 1],
    [278, 4, spec.height],
    [279, 4, spec.pixels.length],
  ];
  const r = spec.resolution;
  // XResolution and YResolution are RATIONAL (type 5): two LONGs stored after the IFD, the entry holds their offset.
  if (r) entries.push([282, 5, 0], [283, 5, 0], [296, 3, r.unit]);
  const ifdSize = 2 + entries.length * 12 + 4;
  const rationalsAt = 8 + ifdSize;
  const dataAt = rationalsAt + (r ? 16 : 0);
  entries[5]![2] = dataAt;
  if (r) { entries[9]![2] = rationalsAt; entries[10]![2] = rationalsAt + 8; }
  const out = new Uint8Array(dataAt + spec.pixels.length);
  const v = new DataView(out.buffer);
  if (r) [r.x[0], r.x[1], r.y[0], r.y[1]].forEach((n, i) => v.setUint32(rationalsAt + 4 * i, n, true));
  out.set([0x49, 0x49, 0x2a, 0x00]);
  v.setUint32(4, 8, true);
  v.setUint16(8, entries.length, true);
  entries.forEach(([tag, type, value], i) => {
    const at = 10 + i * 12;
    v.setUint16(at, tag, true);
    v.setUint16(at + 2, type, true);
    v.setUint32(at + 4, 1, true);
    if (type === 3) v.setUint16(at + 8, value, true);
    else v.setUint32(at + 8, value, true);
  });
  v.setUint32(10 + entries.length * 12, 0, true);
  out.set(spec.pixels, dataAt);
  return spec.cutTo === undefined ? out : out.slice(0, spec.cutTo);
}

/**
 * A copy of a PNG with a pHYs chunk after IHDR: `x` and `y` pixels per unit, `unit` 1 = metre, 0 = none
 * (PNG specification, W3C 2003, section 11.3.5.3).
 */
export function withPhys(png: Uint8Array, x: number, y: number, unit = 1): Uint8Array {
  const data = new Uint8Array(9);
  const v = new DataView(data.buffer);
  v.setUint32(0, x);
  v.setUint32(4, y);
  data[8] = unit;
  // IHDR is always first: 8-byte signature + 4 length + 4 type + 13 data + 4 crc = 33 bytes.
  return concat([png.subarray(0, 33), pngChunk('pHYs', data), png.subarray(33)]);
}

/**
 * A JPEG APP1 segment (marker, length, "Exif\0\0", a little-endian TIFF header and an IFD0 of one entry)
 * whose only tag is Orientation (0x0112, SHORT, count 1) = `orientation` (Exif 2.3, CIPA DC-008).
 */
export function exifApp1(orientation: number): Uint8Array {
  const tiffPart = new Uint8Array(8 + 2 + 12 + 4);
  const v = new DataView(tiffPart.buffer);
  tiffPart.set([0x49, 0x49, 0x2a, 0x00]);
  v.setUint32(4, 8, true);
  v.setUint16(8, 1, true);
  v.setUint16(10, 0x0112, true);
  v.setUint16(12, 3, true);
  v.setUint32(14, 1, true);
  v.setUint16(18, orientation, true);
  v.setUint32(22, 0, true);
  const exif = concat([new Uint8Array([0x45, 0x78, 0x69, 0x66, 0, 0]), tiffPart]);
  const head = new Uint8Array(4);
  head.set([0xff, 0xe1]);
  new DataView(head.buffer).setUint16(2, exif.length + 2);
  return concat([head, exif]);
}
