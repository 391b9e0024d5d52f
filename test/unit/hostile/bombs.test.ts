/**
 * Files made to exhaust memory or time: a decoder must stop at what the header promises (PNG and TIFF
 * image data that inflate to far more than width x height, a JPEG too short for the size it claims, tiles
 * far larger than their page, a chain of TIFF pages that loops back on itself) and say so in one line.
 */
import { describe, expect, it } from 'vitest';
import { zlibSync } from 'fflate';
import { decodeImage } from '../../../src/core/image/decode';
import { pngRawSize } from '../../../src/core/image/png';
import { decodeLzw, decodePackBits } from '../../../src/core/image/tiffCodecs';
import { ImageDecodeError, TessellabError, UnsupportedFormatError } from '../../../src/core/errors';
import { jpegHeaderOnly } from '../image/handmade';
import { concat, lzwZeroRuns, png, pngChunk, rawRows, tiffFile, zlibZeros } from './craft';

async function failure(bytes: Uint8Array, name = 'bomb.x'): Promise<TessellabError> {
  try {
    await decodeImage(bytes, { name });
  } catch (e) {
    return e as TessellabError;
  }
  throw new Error('expected the decoder to refuse the file');
}

const grey16x16 = Array.from({ length: 16 }, (_, y) => Array.from({ length: 16 }, (_, x) => 8 * x + y));

describe('PNG: image data bounded by the header', () => {
  it('the raw size of a PNG follows from its header (PNG spec 7.2, 8.2; derived by hand)', () => {
    // 40 x 24 grey 8-bit: 24 rows of 1 + 40 bytes.
    expect(pngRawSize({ width: 40, height: 24, bitDepth: 8, colorType: 0, interlace: 0 })).toBe(24 * 41);
    // RGBA 16-bit: 8 bytes a pixel. 1-bit grey: ceil(13/8) = 2 bytes a row.
    expect(pngRawSize({ width: 10, height: 3, bitDepth: 16, colorType: 6, interlace: 0 })).toBe(3 * 81);
    expect(pngRawSize({ width: 13, height: 2, bitDepth: 1, colorType: 0, interlace: 0 })).toBe(2 * 3);
    // Adam7 on 40 x 24 grey: passes of 5x3, 5x3, 10x3, 10x6, 20x6, 20x12, 40x12 pixels, each row + 1 byte:
    // 18 + 18 + 33 + 66 + 126 + 252 + 492 = 1005.
    expect(pngRawSize({ width: 40, height: 24, bitDepth: 8, colorType: 0, interlace: 1 })).toBe(1005);
  });

  it('an interlaced PNG built pass by pass still decodes to its pixels', async () => {
    const W = 40;
    const H = 24;
    const value = (x: number, y: number) => (5 * x + 7 * y) & 0xff;
    const rows: number[][] = [];
    for (const [x0, y0, dx, dy] of [[0, 0, 8, 8], [4, 0, 8, 8], [0, 4, 4, 8], [2, 0, 4, 4], [0, 2, 2, 4], [1, 0, 2, 2], [0, 1, 1, 2]] as const) {
      for (let y = y0; y < H; y += dy) {
        const row: number[] = [];
        for (let x = x0; x < W; x += dx) row.push(value(x, y));
        if (row.length) rows.push(row);
      }
    }
    const d = await decodeImage(png({ width: W, height: H, interlace: 1, idat: rawRows(rows) }));
    const page = d.pages[0]!;
    expect(page.width).toBe(W);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) expect(page.data[y * W + x]).toBe(value(x, y));
  });

  it('a 16 x 16 header over image data that inflates to 16 MiB is refused, naming the header size', async () => {
    const bomb = png({ width: 16, height: 16, idat: zlibZeros(16 * 2 ** 20) });
    expect(bomb.length).toBeLessThan(200_000);
    const e = await failure(bomb, 'bomb.png');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^bomb\.png: the PNG's image data inflates to more than the 16 x 16 px its header gives \(272 bytes\).*re-save it$/);
  });

  it('a 10000 x 10000 header over a few bytes of image data is refused before the image is allocated', async () => {
    const e = await failure(png({ width: 10_000, height: 10_000, idat: rawRows([[1, 2, 3]]) }), 'short.png');
    expect(e).toBeInstanceOf(ImageDecodeError);
    // 10000 rows of 1 + 10000 bytes (PNG spec 7.2; derived).
    expect(e.message).toBe("short.png: the PNG's image data holds 4 of the 100010000 bytes its 10000 x 10000 px header gives; the file is damaged or cut short: copy or export it again");
  });

  it('an embedded colour profile that inflates to 40 MiB is refused', async () => {
    const iccp = pngChunk('iCCP', concat([new TextEncoder().encode('bomb'), new Uint8Array([0, 0]), zlibZeros(40 * 2 ** 20)]));
    const e = await failure(png({ width: 16, height: 16, idat: rawRows(grey16x16), before: [iccp] }), 'icc.png');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^icc\.png: the PNG's colour profile \(iCCP\) inflates to more than 32 MiB/);
  });

  it('a palette shorter than the colour numbers the pixels use: one line, not an unexpected error', async () => {
    const rows = grey16x16.map((r) => r.map((v) => v % 5)); // numbers 0..4, palette of 2
    const e = await failure(png({ width: 16, height: 16, colorType: 3, palette: [[0, 0, 0], [255, 255, 255]], idat: rawRows(rows) }), 'pal.png');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toBe("pal.png: the PNG's palette (2 colours) does not cover the colour numbers its pixels use; the file is damaged: re-save it");
  });
});

describe('TIFF: strips bounded by the header', () => {
  const plain = new Uint8Array(grey16x16.flat());

  it('plain and Deflate 16 x 16 strips still decode', async () => {
    for (const [compression, strip] of [[1, plain], [8, zlibSync(plain)]] as const) {
      const d = await decodeImage(tiffFile({ width: 16, height: 16, compression, strips: [strip] }).bytes);
      expect(Array.from(d.pages[0]!.data)).toEqual(Array.from(plain));
    }
  });

  it('a tile taller and wider than its page (32 x 32 on 20 x 20) decodes: a tile is bounded by its own size', async () => {
    const tile = new Uint8Array(32 * 32).map((_, i) => ((i % 32) * 7 + Math.floor(i / 32)) & 0xff);
    const d = await decodeImage(tiffFile({ width: 20, height: 20, compression: 8, strips: [zlibSync(tile)], tile: { width: 32, height: 32 } }).bytes);
    const page = d.pages[0]!;
    for (let y = 0; y < 20; y++) for (let x = 0; x < 20; x++) expect(page.data[y * 20 + x]).toBe(tile[y * 32 + x]);
  });

  it('a Deflate strip that inflates to 16 MiB under a 16 x 16 header is refused', async () => {
    const { bytes } = tiffFile({ width: 16, height: 16, compression: 8, strips: [zlibZeros(16 * 2 ** 20)] });
    const e = await failure(bytes, 'bomb.tif');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^bomb\.tif: page 1 of the TIFF decodes to more than the 16 x 16 px its header gives/);
  });

  it('an LZW strip of zero runs (about 7 MB a cycle) under a 16 x 16 header is refused', async () => {
    const strip = lzwZeroRuns(3);
    // The bounded decoder itself: the same stream decodes in full with room for it (3 cycles of
    // 1 + 2 + ... + 3837 zeros, the lengths of the table entries 0, 258..4093).
    const full = decodeLzw(strip, 3 * 7_363_203 + 10);
    expect(full.length).toBe(3 * ((3837 * 3838) / 2));
    expect(() => decodeLzw(strip, 256)).toThrow(/more than the block size/);
    const e = await failure(tiffFile({ width: 16, height: 16, compression: 5, strips: [strip] }).bytes, 'lzw.tif');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^lzw\.tif: page 1 of the TIFF decodes to more than the 16 x 16 px/);
  });

  it('a PackBits strip of repeats (128 bytes from 2) under a 16 x 16 header is refused', async () => {
    const strip = new Uint8Array(4000).map((_, i) => (i % 2 === 0 ? 0x81 : 0)); // -127: repeat 128 times
    expect(decodePackBits(new Uint8Array([0x81, 7, 0x80, 0x01, 1, 2]), 200)).toEqual(new Uint8Array([...Array(128).fill(7), 1, 2]));
    const e = await failure(tiffFile({ width: 16, height: 16, compression: 32773, strips: [strip] }).bytes, 'pb.tif');
    expect(e.message).toMatch(/^pb\.tif: page 1 of the TIFF decodes to more than the 16 x 16 px/);
  });

  it('a 10000 x 10000 page over a few stored bytes is refused before its raster is allocated', async () => {
    // Deflate expands at most 1032 : 1 (a 258-byte match in two bits, RFC 1951; derived): 100 MB needs
    // at least 96 900 stored bytes.
    for (const [compression, strip] of [[8, zlibSync(plain)], [5, lzwZeroRuns(1)], [32773, new Uint8Array([0x81, 0])], [1, plain]] as const) {
      const e = await failure(tiffFile({ width: 10_000, height: 10_000, compression, strips: [strip] }).bytes, 'short.tif');
      expect(e).toBeInstanceOf(ImageDecodeError);
      expect(e.message).toBe(`short.tif: the TIFF's image data (${strip.length} bytes) is too short for the 10000 x 10000 px its header gives; the file is damaged or cut short: copy or export it again`);
    }
  });

  it('tiles of 65536 x 65536 px on a 16 x 16 page are refused before any is decoded', async () => {
    const { bytes } = tiffFile({
      width: 16, height: 16, strips: [plain],
      extra: [[322, 4, 65536], [323, 4, 65536], [324, 4, 8], [325, 4, 256]],
    });
    // The strip tags stay too; the tile tags are what a reader uses.
    const e = await failure(bytes, 'tiles.tif');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^tiles\.tif: the TIFF's tiles \(65536 x 65536 px\) do not fit its 16 x 16 px page/);
  });

  it('a chain of pages that points back to itself is refused, not followed for ever', async () => {
    const self = tiffFile({ width: 16, height: 16, strips: [plain], next: 'self' }).bytes;
    const e = await failure(self, 'loop.tif');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toBe("loop.tif: the TIFF's list of pages loops back on itself after page 1 (the file is damaged); re-save it");
    // Two pages that point at each other: the second IFD is a copy of the first, placed after it.
    const one = tiffFile({ width: 16, height: 16, strips: [plain] });
    const twoAt = one.bytes.length;
    const ifd = one.bytes.subarray(one.ifdAt);
    const both = concat([one.bytes, ifd]);
    const v = new DataView(both.buffer);
    const entries = v.getUint16(one.ifdAt, true);
    v.setUint32(one.ifdAt + 2 + entries * 12, twoAt, true);
    v.setUint32(twoAt + 2 + entries * 12, one.ifdAt, true);
    const e2 = await failure(both, 'loop2.tif');
    expect(e2.message).toBe("loop2.tif: the TIFF's list of pages loops back on itself after page 2 (the file is damaged); re-save it");
  });

  it('an OME description with a character reference beyond Unicode: the image decodes, without a pixel size', async () => {
    const description = '<?xml version="1.0"?><OME><Image><Pixels PhysicalSizeX="&#xFFFFFFFF;" PhysicalSizeY="1"/></Image></OME>';
    const d = await decodeImage(tiffFile({ width: 16, height: 16, strips: [plain], description }).bytes, { name: 'ent.tif' });
    expect(d.pages).toHaveLength(1);
    expect(d.umPerPx).toBeNull();
  });
});

describe('JPEG: a header that claims more than the file holds', () => {
  it('8000 x 8000 px claimed by a 29-byte file is refused at once', async () => {
    const e = await failure(jpegHeaderOnly(8000, 8000), 'tiny.jpg');
    expect(e).toBeInstanceOf(ImageDecodeError);
    // 1000 x 1000 blocks of 8 x 8, at least one bit each: 125000 bytes (ITU-T T.81; derived).
    expect(e.message).toBe("tiny.jpg: the JPEG's image data (2 bytes) is too short for the 8000 x 8000 px its header gives (at least 125000 bytes); the file is damaged or cut short: copy or export it again");
  });

  it('lossless and arithmetic-coded frames are named as not supported', async () => {
    const lossless = jpegHeaderOnly(64, 64);
    lossless[3] = 0xc3;
    expect(await failure(lossless, 'll.jpg')).toBeInstanceOf(UnsupportedFormatError);
    expect((await failure(lossless, 'll.jpg')).message).toMatch(/^ll\.jpg: lossless JPEG is not supported/);
    const arith = jpegHeaderOnly(64, 64);
    arith[3] = 0xc9;
    expect((await failure(arith, 'ar.jpg')).message).toMatch(/^ar\.jpg: arithmetic-coded JPEG is not supported/);
  });
});
