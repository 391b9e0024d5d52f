/**
 * Hostile and broken files built byte by byte, laid out as the PNG specification (W3C 2003, chunks: section
 * 5.3; Adam7: section 8.2), TIFF 6.0 (Adobe 1992: IFDs section 2, LZW section 13, PackBits section 9) and
 * zlib (RFC 1950) describe them. Compression comes from fflate (a general-purpose zlib implementation).
 */
import { Zlib, zlibSync } from 'fflate';
import { crc32 } from '../../../src/core/image/phys';

export function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let at = 0;
  for (const p of parts) { out.set(p, at); at += p.length; }
  return out;
}

/** zlib data that inflates to `bytes` zero bytes, made a megabyte at a time (never held whole). */
export function zlibZeros(bytes: number): Uint8Array {
  const parts: Uint8Array[] = [];
  const z = new Zlib({ level: 9 }, (chunk) => parts.push(chunk));
  const mib = new Uint8Array(2 ** 20);
  for (let left = bytes; left > 0; left -= mib.length) z.push(mib.subarray(0, Math.min(mib.length, left)), left <= mib.length);
  return concat(parts);
}

export function pngChunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const v = new DataView(out.buffer);
  v.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  v.setUint32(8 + data.length, crc32(out.subarray(4, 8 + data.length)));
  return out;
}

export interface PngSpec {
  width: number;
  height: number;
  colorType?: number;
  bitDepth?: number;
  interlace?: number;
  /** The zlib stream of the image data (one IDAT). */
  idat: Uint8Array;
  /** RGB triples of a palette (PLTE). */
  palette?: number[][];
  /** Extra chunks put before IDAT. */
  before?: Uint8Array[];
}

export function png(spec: PngSpec): Uint8Array {
  const ihdr = new Uint8Array(13);
  const v = new DataView(ihdr.buffer);
  v.setUint32(0, spec.width);
  v.setUint32(4, spec.height);
  ihdr[8] = spec.bitDepth ?? 8;
  ihdr[9] = spec.colorType ?? 0;
  ihdr[12] = spec.interlace ?? 0;
  return concat([
    new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    ...(spec.palette ? [pngChunk('PLTE', new Uint8Array(spec.palette.flat()))] : []),
    ...(spec.before ?? []),
    pngChunk('IDAT', spec.idat),
    pngChunk('IEND', new Uint8Array(0)),
  ]);
}

/** Rows of 8-bit samples, each after a filter byte 0 (None), as a zlib stream. */
export function rawRows(rows: number[][]): Uint8Array {
  return zlibSync(new Uint8Array(rows.flatMap((r) => [0, ...r])));
}

/** One TIFF IFD entry: tag, type (2 ASCII, 3 SHORT, 4 LONG), and its values or text. */
export type Entry = [tag: number, type: 2 | 3 | 4, value: number | number[] | string];

export interface TiffSpec {
  width: number;
  height: number;
  compression?: number;
  /** The strips' bytes as stored (compressed or not), one strip each. */
  strips: Uint8Array[];
  rowsPerStrip?: number;
  description?: string;
  /** Where the IFD's next-IFD offset points: 'self', a byte offset, or 0 (the end; default). */
  next?: 'self' | number;
  /** Entries that replace (same tag) or join the usual ones. */
  extra?: Entry[];
  /** Store `strips` as tiles of this size instead (TileWidth, TileLength, TileOffsets, TileByteCounts). */
  tile?: { width: number; height: number };
}

/**
 * A little-endian 8-bit grey TIFF: header, strip data, the ImageDescription text, then one IFD (at the
 * returned `ifdAt`). Entries are written in tag order, values that do not fit four bytes after the IFD.
 */
export function tiffFile(spec: TiffSpec): { bytes: Uint8Array; ifdAt: number } {
  const head = 8;
  const stripAt: number[] = [];
  let at = head;
  for (const s of spec.strips) { stripAt.push(at); at += s.length + (s.length & 1); }
  const text = spec.description === undefined ? null : new TextEncoder().encode(spec.description + '\0');
  const textAt = at;
  if (text) at += text.length + (text.length & 1);
  const ifdAt = at;
  const byTag = new Map<number, Entry>();
  const put = (e: Entry) => byTag.set(e[0], e);
  put([256, 4, spec.width]);
  put([257, 4, spec.height]);
  put([258, 3, 8]);
  put([259, 3, spec.compression ?? 1]);
  put([262, 3, 1]);
  put([277, 3, 1]);
  if (spec.tile) {
    put([322, 4, spec.tile.width]);
    put([323, 4, spec.tile.height]);
    put([324, 4, stripAt]);
    put([325, 4, spec.strips.map((s) => s.length)]);
  } else {
    put([273, 4, stripAt]);
    put([278, 4, spec.rowsPerStrip ?? spec.height]);
    put([279, 4, spec.strips.map((s) => s.length)]);
  }
  if (text) put([270, 2, '']);
  for (const e of spec.extra ?? []) put(e);
  const entries = [...byTag.values()].sort((a, b) => a[0] - b[0]);
  const ifdSize = 2 + entries.length * 12 + 4;
  let extraAt = ifdAt + ifdSize;
  const out = new Uint8Array(extraAt + 4096);
  const v = new DataView(out.buffer);
  out.set([0x49, 0x49, 0x2a, 0x00]);
  v.setUint32(4, ifdAt, true);
  spec.strips.forEach((s, i) => out.set(s, stripAt[i]!));
  if (text) out.set(text, textAt);
  v.setUint16(ifdAt, entries.length, true);
  entries.forEach(([tag, type, value], i) => {
    const e = ifdAt + 2 + i * 12;
    v.setUint16(e, tag, true);
    v.setUint16(e + 2, type, true);
    if (type === 2) {
      v.setUint32(e + 4, text!.length, true);
      v.setUint32(e + 8, textAt, true);
      return;
    }
    const values = Array.isArray(value) ? value : [value as number];
    v.setUint32(e + 4, values.length, true);
    const size = type === 3 ? 2 : 4;
    let to = e + 8;
    if (values.length * size > 4) { v.setUint32(e + 8, extraAt, true); to = extraAt; extraAt += values.length * size; }
    values.forEach((x, k) => (size === 2 ? v.setUint16(to + 2 * k, x, true) : v.setUint32(to + 4 * k, x, true)));
  });
  const next = spec.next === 'self' ? ifdAt : spec.next ?? 0;
  v.setUint32(ifdAt + 2 + entries.length * 12, next, true);
  return { bytes: out.slice(0, extraAt), ifdAt };
}

/**
 * TIFF LZW codes (9 to 12 bits, most significant bit first, code width growing one code early) that decode
 * to long runs of zeros: 0, then each new table entry in turn (00, 000, 0000, ...), a Clear when the table
 * is full, `cycles` times, then end of information. One cycle of about 5 KB decodes to about 7 MB.
 */
export function lzwZeroRuns(cycles: number): Uint8Array {
  const bytes: number[] = [];
  let acc = 0;
  let nbits = 0;
  let width = 9;
  const put = (code: number) => {
    acc = (acc << width) | code;
    nbits += width;
    while (nbits >= 8) { bytes.push((acc >> (nbits - 8)) & 0xff); nbits -= 8; }
    acc &= (1 << nbits) - 1;
  };
  for (let c = 0; c < cycles; c++) {
    put(256);
    width = 9;
    put(0);
    let next = 258; // the decoder adds entry `next` as it reads each code after the first
    for (let code = 258; code < 4094; code++) {
      put(code);
      next++;
      if (next + 1 >= 1 << width && width < 12) width++;
    }
  }
  put(257);
  if (nbits > 0) bytes.push((acc << (8 - nbits)) & 0xff);
  return new Uint8Array(bytes);
}
