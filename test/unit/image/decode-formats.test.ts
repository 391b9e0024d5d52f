import { describe, it, expect } from 'vitest';
import { decodeImage } from '../../../src/core/image';
import { fixture, grey8, grey16, rgb8, rgbpal, maxAbsDiff, W, H } from './fixtures';

// Expected pixels: the pattern formulas of test/fixtures/images/make.sh, written into the files by
// ImageMagick and libtiff. Status: derived (the values follow exactly from the pattern definition).
// Grey of a colour file: ITU-R BT.601 luma, Y = 0.299 R + 0.587 G + 0.114 B (pub, recalled from memory;
// the three weights are quoted in countless texts), rounded, so ±1 is allowed.
function bt601(rgb: Uint8Array, channels = 3): number[] {
  const out: number[] = [];
  for (let i = 0; i < rgb.length; i += channels) out.push(0.299 * rgb[i]! + 0.587 * rgb[i + 1]! + 0.114 * rgb[i + 2]!);
  return out;
}

describe('the same 8-bit grey gradient decodes to identical pixels in every lossless format', () => {
  const files = [
    'grey8.png', 'grey8-alpha.png', 'grey8-palette.png', 'grey8-phys.png',
    'grey8-none.tif', 'grey8-lzw.tif', 'grey8-lzw-predictor.tif', 'grey8-deflate.tif', 'grey8-packbits.tif',
    'grey8-tiles-lzw.tif', 'grey8-tiles-none.tif',
  ];
  for (const f of files) {
    it(f, async () => {
      const d = await decodeImage(fixture(f), { name: f });
      expect(d.pages).toHaveLength(1);
      const page = d.pages[0]!;
      expect([page.width, page.height, page.bitDepth]).toEqual([W, H, 8]);
      expect(page.data).toBeInstanceOf(Uint8Array);
      expect(Array.from(page.data)).toEqual(Array.from(grey8()));
      expect(d.wasColour).toBe(false);
      expect(d.format).toBe(f.endsWith('.png') ? 'png' : 'tiff');
    });
  }
});

describe('16-bit grey keeps every value exactly', () => {
  for (const f of ['grey16.png', 'grey16-none.tif', 'grey16-lzw.tif', 'grey16-tiles-deflate.tif', 'grey16-bigendian.tif']) {
    it(f, async () => {
      const page = (await decodeImage(fixture(f))).pages[0]!;
      expect(page.bitDepth).toBe(16);
      expect(page.data).toBeInstanceOf(Uint16Array);
      expect(Array.from(page.data)).toEqual(Array.from(grey16()));
      // the pattern reaches high values, so a lost high byte could not pass
      expect(Math.max(...page.data)).toBeGreaterThan(60000);
    });
  }
});

describe('colour becomes BT.601 grey', () => {
  const cases: [string, Uint8Array][] = [
    ['rgb8.png', rgb8()], ['rgba8.png', rgb8()], ['rgb8-lzw.tif', rgb8()], ['rgb8-planar.tif', rgb8()],
    ['rgbpal-palette.png', rgbpal()], ['rgbpal-palette.tif', rgbpal()],
  ];
  for (const [f, rgb] of cases) {
    it(`${f} equals 0.299 R + 0.587 G + 0.114 B rounded (within 0.5, so within the brief's ±1)`, async () => {
      const d = await decodeImage(fixture(f));
      expect(d.wasColour).toBe(true);
      const page = d.pages[0]!;
      expect([page.width, page.height, page.bitDepth]).toEqual([W, H, 8]);
      expect(maxAbsDiff(page.data, bt601(rgb))).toBeLessThanOrEqual(0.5);
    });
  }
});

describe('JPEG (lossy, quality 100, no chroma subsampling)', () => {
  it('grey JPEG is within a few grey levels of the pattern', async () => {
    const d = await decodeImage(fixture('grey8.jpg'));
    expect(d.format).toBe('jpeg');
    expect(d.wasColour).toBe(false);
    const page = d.pages[0]!;
    expect([page.width, page.height, page.bitDepth]).toEqual([W, H, 8]);
    // trade: quality-100 JPEG of a smooth ramp differs by a few levels at most
    expect(maxAbsDiff(page.data, grey8())).toBeLessThanOrEqual(4);
  });
  it('colour JPEG gives BT.601 grey within a few levels', async () => {
    const d = await decodeImage(fixture('rgb8.jpg'));
    expect(d.wasColour).toBe(true);
    expect(maxAbsDiff(d.pages[0]!.data, bt601(rgb8()))).toBeLessThanOrEqual(4);
  });
});

describe('TIFF specifics', () => {
  it('multi-page: every page becomes one entry, in file order', async () => {
    const d = await decodeImage(fixture('multipage.tif'));
    expect(d.pages).toHaveLength(3);
    for (let k = 0; k < 3; k++) expect(Array.from(d.pages[k]!.data)).toEqual(Array.from(grey8(k)));
  });
  it('WhiteIsZero is inverted to black-is-zero (TIFF 6.0, PhotometricInterpretation 0; derived)', async () => {
    const page = (await decodeImage(fixture('grey8-whiteiszero.tif'))).pages[0]!;
    expect(Array.from(page.data)).toEqual(Array.from(grey8(), (v) => 255 - v));
  });
});
