import { describe, it, expect } from 'vitest';
import { decodeImage, encodePng, MAX_PIXELS } from '../../../src/core/image';
import {
  ImageDecodeError, ImageTooLargeError, ImageTooSmallError, UnsupportedFormatError, TessellabError,
} from '../../../src/core/errors';
import { mulberry32 } from '../../../src/core/random';
import { fixture, grey8, W, H } from './fixtures';
import { jpegHeaderOnly, pngHeaderOnly, tiff } from './handmade';

async function failure(bytes: Uint8Array, name?: string, maxPixels?: number): Promise<TessellabError> {
  try {
    await decodeImage(bytes, { name, maxPixels });
  } catch (e) {
    expect(e).toBeInstanceOf(TessellabError);
    const err = e as TessellabError;
    expect(err.message).not.toMatch(/\n/); // one line
    return err;
  }
  throw new Error('decodeImage did not throw');
}

describe('bad input gets a typed, one-line error', () => {
  it('a zero-byte file', async () => {
    const e = await failure(new Uint8Array(0), 'empty.png');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^empty\.png: the file is empty \(0 bytes\)/);
  });

  it('a truncated PNG (cut in half)', async () => {
    const whole = fixture('grey16.png');
    const e = await failure(whole.slice(0, whole.length >> 1), 'cut.png');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^cut\.png: the PNG file is truncated/);
  });

  it('a PNG whose last 12 bytes (IEND) are missing', async () => {
    const whole = fixture('grey8.png');
    const e = await failure(whole.slice(0, whole.length - 12));
    expect(e.message).toMatch(/PNG file is truncated/);
  });

  it('a truncated JPEG (cut at 60 %)', async () => {
    const whole = fixture('rgb8.jpg');
    const e = await failure(whole.slice(0, Math.floor(whole.length * 0.6)), 'cut.jpg');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^cut\.jpg: the JPEG file is truncated/);
  });

  it('a JPEG without its last two bytes (EOI)', async () => {
    const whole = fixture('grey8.jpg');
    const e = await failure(whole.slice(0, whole.length - 2));
    expect(e.message).toMatch(/JPEG file is truncated/);
  });

  it('a TIFF cut inside its pixel data (IFD first, strip past the end)', async () => {
    const pixels = grey8();
    const whole = tiff({ width: W, height: H, pixels });
    // control: the same hand-built file, uncut, decodes to the pattern
    const ok = await decodeImage(whole);
    expect(Array.from(ok.pages[0]!.data)).toEqual(Array.from(pixels));
    const e = await failure(whole.slice(0, whole.length - 300), 'cut.tif');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^cut\.tif: the TIFF file is truncated/);
  });

  it('a TIFF cut before its IFD (IFD at the end, as libtiff writes it)', async () => {
    const whole = fixture('grey8-none.tif');
    const e = await failure(whole.slice(0, 600));
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/TIFF file is truncated or damaged/);
  });

  it('random bytes named like an image', async () => {
    const rng = mulberry32(20240611);
    const bytes = new Uint8Array(4096);
    for (let i = 0; i < bytes.length; i++) bytes[i] = Math.floor(rng() * 256);
    const e = await failure(bytes, 'noise.tif');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^noise\.tif: the file is not a PNG, JPEG or TIFF image/);
  });

  it('a text file', async () => {
    const text = new TextEncoder().encode('x,y\n12.5,3.25\n7,8\nµm façade — UTF-8 text\n');
    const e = await failure(text, 'points.png');
    expect(e).toBeInstanceOf(ImageDecodeError);
    expect(e.message).toMatch(/^points\.png: this looks like a text file, not an image/);
  });

  it('a GIF is named as an unsupported format', async () => {
    const gif = new TextEncoder().encode('GIF89a\x10\x00\x10\x00');
    const e = await failure(gif);
    expect(e).toBeInstanceOf(UnsupportedFormatError);
    expect(e.message).toMatch(/GIF images are not supported; re-save/);
  });

  it('a text file that starts with "BM" is still called text, and a real BMP header is named', async () => {
    const e = await failure(new TextEncoder().encode('BMI,age\n22.1,40\n24.3,51\n'));
    expect(e.message).toMatch(/this looks like a text file, not an image/);
    const bmp = new Uint8Array(54);
    bmp.set([0x42, 0x4d]);
    bmp[14] = 40; // BITMAPINFOHEADER size
    expect((await failure(bmp)).message).toMatch(/BMP images are not supported/);
  });

  it('an unsupported TIFF compression (Zstandard, code 50000, written by libtiff)', async () => {
    const e = await failure(fixture('grey8-zstd.tif'), 'z.tif');
    expect(e).toBeInstanceOf(UnsupportedFormatError);
    expect(e.message).toBe(
      'z.tif: TIFF compression 50000 (Zstandard) is not supported; re-save as uncompressed, LZW or Deflate TIFF',
    );
  });

  it('an unknown TIFF compression code names the code', async () => {
    const e = await failure(tiff({ width: W, height: H, pixels: grey8(), compression: 4242 }));
    expect(e).toBeInstanceOf(UnsupportedFormatError);
    expect(e.message).toBe('TIFF compression 4242 is not supported; re-save as uncompressed, LZW or Deflate TIFF');
  });

  it('32-bit float TIFF samples', async () => {
    const e = await failure(fixture('grey-float32.tif'));
    expect(e).toBeInstanceOf(UnsupportedFormatError);
    expect(e.message).toMatch(/32-bit floating-point TIFF samples are not supported; convert/);
  });

  it('32-bit integer TIFF samples', async () => {
    const e = await failure(fixture('grey-uint32.tif'));
    expect(e).toBeInstanceOf(UnsupportedFormatError);
    expect(e.message).toMatch(/32-bit TIFF samples are not supported; convert the image to 16-bit first/);
  });

  it('an image smaller than 16 x 16 px', async () => {
    const png = encodePng({ width: 1, height: 1, data: new Uint8Array([7]), channels: 1, bitDepth: 8 });
    const e = await failure(png);
    expect(e).toBeInstanceOf(ImageTooSmallError);
    expect(e.message).toBe('1 x 1 px is too small to analyse; the minimum is 16 x 16');
    const named = await failure(png, 'dot.png');
    expect(named.message).toBe('dot.png: 1 x 1 px is too small to analyse; the minimum is 16 x 16');
    // 15 x 40 fails on the short side, 16 x 16 passes
    const thin = encodePng({ width: 15, height: 40, data: new Uint8Array(600), channels: 1, bitDepth: 8 });
    expect(await failure(thin)).toBeInstanceOf(ImageTooSmallError);
    const least = encodePng({ width: 16, height: 16, data: new Uint8Array(256), channels: 1, bitDepth: 8 });
    expect((await decodeImage(least)).pages[0]!.width).toBe(16);
  });

  const huge = 'huge.png: 30000 x 30000 px exceeds the limit of 100 megapixels; crop or downsample first';
  it('a PNG header claiming 30000 x 30000 px (no pixel data at all, so nothing was decoded)', async () => {
    expect(30000 * 30000).toBeGreaterThan(MAX_PIXELS);
    const e = await failure(pngHeaderOnly(30000, 30000), 'huge.png');
    expect(e).toBeInstanceOf(ImageTooLargeError);
    expect(e.message).toBe(huge);
  });

  it('a JPEG frame header claiming 30000 x 30000 px', async () => {
    const e = await failure(jpegHeaderOnly(30000, 30000), 'huge.png');
    expect(e).toBeInstanceOf(ImageTooLargeError);
    expect(e.message).toBe(huge);
  });

  it('a TIFF IFD claiming 30000 x 30000 px with 960 bytes of data', async () => {
    const e = await failure(tiff({ width: 30000, height: 30000, pixels: grey8() }), 'huge.png');
    expect(e).toBeInstanceOf(ImageTooLargeError);
    expect(e.message).toBe(huge);
  });

  it('maxPixels lowers the limit', async () => {
    const e = await failure(fixture('grey8.png'), undefined, 900);
    expect(e).toBeInstanceOf(ImageTooLargeError);
    expect(e.message).toBe('40 x 24 px exceeds the limit of 0.0009 megapixels; crop or downsample first');
    expect((await decodeImage(fixture('grey8.png'), { maxPixels: 960 })).pages).toHaveLength(1);
  });
});
