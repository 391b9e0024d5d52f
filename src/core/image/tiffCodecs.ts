/**
 * The TIFF strip and tile decoders, bounded by what the header promises. A strip or tile of a page decodes
 * to at most tile width x rows x bytes per pixel; a file whose compressed data would decode to more (a
 * "decompression bomb", or damage) is refused as soon as its output passes that size, before the rest is
 * decoded. LZW (TIFF 6.0, section 13), PackBits (section 9) and Deflate (zlib, Adobe's TIFF Technical
 * Note 2) are decoded here into one preallocated buffer; the predictor and the rest stay geotiff's.
 */
import { getDecoder } from 'geotiff';
import { inflateBounded } from './inflate';

/** A block decoded to more bytes than its header allows, or a compressed stream that is damaged. */
export class BlockError extends Error {
  constructor(readonly overflow: boolean, message: string) { super(message); }
}

const CLEAR = 256;
const EOI = 257;

/**
 * TIFF LZW: codes of 9 to 12 bits, most significant bit first, Clear 256, end of information 257, the code
 * width growing one code early (at 511, 1023 and 2047), as TIFF 6.0 section 13 and libtiff write it.
 *
 * @param input the compressed strip or tile
 * @param limit the most bytes it may decode to
 * @returns the decoded bytes (possibly fewer than `limit`)
 * @throws BlockError on overflow or a code that the table does not hold yet
 */
export function decodeLzw(input: Uint8Array, limit: number): Uint8Array {
  const prefix = new Uint16Array(4096);
  const suffix = new Uint8Array(4096);
  const first = new Uint8Array(4096);
  const length = new Uint16Array(4096);
  for (let i = 0; i < 256; i++) { suffix[i] = i; first[i] = i; length[i] = 1; }
  const out = new Uint8Array(limit);
  let o = 0;
  let bits = 9;
  let next = 258;
  let old = -1;
  let pos = 0;
  const totalBits = input.length * 8;
  const emit = (code: number) => {
    const n = length[code]!;
    if (o + n > limit) throw new BlockError(true, 'LZW data decodes to more than the block size');
    let c = code;
    for (let k = o + n - 1; k >= o; k--) { out[k] = suffix[c]!; c = prefix[c]!; }
    o += n;
  };
  const add = (p: number, ch: number) => {
    if (next >= 4096) return;
    prefix[next] = p; suffix[next] = ch; first[next] = first[p]!; length[next] = length[p]! + 1;
    next++;
  };
  for (;;) {
    if (pos + bits > totalBits) break; // ran out of data without an end code: keep what was decoded
    let code = 0;
    for (let b = 0; b < bits; b++, pos++) code = (code << 1) | ((input[pos >> 3]! >> (7 - (pos & 7))) & 1);
    if (code === EOI) break;
    if (code === CLEAR) { bits = 9; next = 258; old = -1; continue; }
    if (old < 0) {
      if (code > 255) throw new BlockError(false, `LZW code ${code} after a clear code`);
      emit(code);
    } else if (code < next) {
      emit(code);
      add(old, first[code]!);
    } else if (code === next) {
      add(old, first[old]!);
      emit(code);
    } else {
      throw new BlockError(false, `LZW code ${code} is not in the table yet (next is ${next})`);
    }
    old = code;
    if (next + 1 >= 1 << bits && bits < 12) bits++;
  }
  return out.subarray(0, o);
}

/**
 * PackBits (TIFF 6.0 section 9): a header byte n, then n + 1 literal bytes (0 ≤ n ≤ 127), or one byte
 * repeated 1 − n times (−127 ≤ n ≤ −1); −128 is no operation.
 *
 * @throws BlockError on overflow
 */
export function decodePackBits(input: Uint8Array, limit: number): Uint8Array {
  const out = new Uint8Array(limit);
  let o = 0;
  for (let i = 0; i < input.length;) {
    const n = (input[i]! << 24) >> 24;
    i++;
    if (n >= 0) {
      const end = Math.min(input.length, i + n + 1);
      if (o + (end - i) > limit) throw new BlockError(true, 'PackBits data decodes to more than the block size');
      out.set(input.subarray(i, end), o);
      o += end - i;
      i = end;
    } else if (n !== -128) {
      if (i >= input.length) break;
      const count = 1 - n;
      if (o + count > limit) throw new BlockError(true, 'PackBits data decodes to more than the block size');
      out.fill(input[i]!, o, o + count);
      o += count;
      i++;
    }
  }
  return out.subarray(0, o);
}

/** Deflate (zlib) data, inflated to at most `limit` bytes. @throws BlockError on overflow or damage */
export function decodeDeflate(input: Uint8Array, limit: number): Uint8Array {
  const r = inflateBounded([input], limit, true);
  if (r.ok) return r.bytes ?? new Uint8Array(0);
  if (r.overflow) throw new BlockError(true, 'Deflate data inflates to more than the block size');
  throw new BlockError(false, `Deflate data is damaged (${r.error})`);
}

const BOUNDED: Record<number, (input: Uint8Array, limit: number) => Uint8Array> = {
  5: decodeLzw,
  8: decodeDeflate,
  32946: decodeDeflate,
  32773: decodePackBits,
};

/** The bytes as an ArrayBuffer of their own (no copy when they fill theirs already). */
function wholeBuffer(u: Uint8Array): ArrayBuffer {
  return u.byteOffset === 0 && u.byteLength === u.buffer.byteLength ? (u.buffer as ArrayBuffer) : (u.slice().buffer as ArrayBuffer);
}

/** What geotiff passes a decoder pool for one page (its BaseDecoderParameters). */
interface DecoderParameters {
  tileWidth: number;
  tileHeight: number;
  planarConfiguration?: number;
  bitsPerSample: number | ArrayLike<number>;
}

/** A geotiff decoder: `decode` takes one compressed block and gives its bytes (after the predictor). */
interface BlockDecoder {
  decode(buffer: ArrayBuffer): Promise<ArrayBuffer>;
  decodeBlock(buffer: ArrayBuffer): ArrayBuffer | Promise<ArrayBuffer>;
}

/**
 * The largest number of bytes one block (strip or tile) of a page may decode to: tile width x rows x bytes
 * per pixel. A tile is stored whole, even where it reaches past the page; a strip has at most as many rows
 * as the page (RowsPerStrip may say 2³² − 1, "all").
 *
 * @param imageHeight the page's height, px, which bounds a strip's rows; null for a tiled page
 */
export function blockLimit(p: DecoderParameters, imageHeight: number | null): number {
  const bits = typeof p.bitsPerSample === 'number' ? [p.bitsPerSample] : Array.from(p.bitsPerSample);
  const bitsPerPixel = p.planarConfiguration === 2 ? bits[0] ?? 8 : bits.reduce((s, b) => s + b, 0);
  const rows = imageHeight === null ? p.tileHeight : Math.min(p.tileHeight, Math.max(imageHeight, 1));
  return Math.ceil((p.tileWidth * rows * bitsPerPixel) / 8);
}

/**
 * A stand-in for geotiff's decoder pool (the `pool` option of readRasters) that decodes LZW, Deflate and
 * PackBits blocks with the bounded decoders above, and leaves uncompressed blocks (which cannot grow) and
 * the predictor to geotiff.
 *
 * @param imageHeight the page's height in px, which bounds a strip's rows; null for a tiled page
 */
export function boundedPool(imageHeight: number | null): { bindParameters(compression: number, params: DecoderParameters): { decode(buffer: ArrayBuffer): Promise<ArrayBuffer> } } {
  return {
    bindParameters(compression, params) {
      let decoder: Promise<BlockDecoder> | null = null;
      const limit = blockLimit(params, imageHeight);
      return {
        decode(buffer: ArrayBuffer): Promise<ArrayBuffer> {
          decoder ??= (async () => {
            const d = (await getDecoder(compression, params as never)) as unknown as BlockDecoder;
            const bounded = BOUNDED[compression];
            if (bounded) d.decodeBlock = (b: ArrayBuffer) => wholeBuffer(bounded(new Uint8Array(b), limit));
            return d;
          })();
          return decoder.then((d) => d.decode(buffer));
        },
      };
    },
  };
}
