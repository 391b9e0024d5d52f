import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/image/decode';
import { exifOrientation } from '../../../src/core/image/orient';
import { fixture, maxAbsDiff } from './fixtures';
import { exifApp1 } from './handmade';

/** A binary PGM (P5, 8-bit) as width, height and samples. */
function readPgm(bytes: Uint8Array): { width: number; height: number; data: Uint8Array } {
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, 64));
  const m = /^P5\s+(\d+)\s+(\d+)\s+255\s/.exec(head);
  if (!m) throw new Error('not an 8-bit binary PGM');
  const width = Number(m[1]);
  const height = Number(m[2]);
  return { width, height, data: bytes.subarray(m[0].length, m[0].length + width * height) };
}

// orient-N.jpg: the stored picture grey8(x, y) = 4x + 3y + 10 (40 x 24) with EXIF Orientation N; orient-N.pgm:
// ImageMagick's -auto-orient of the same file (test/fixtures/images/make-orient.mts). The Exif 2.3 table
// (CIPA DC-008; pub, recalled from memory) says where the stored row 0 and column 0 are shown:
// 1 top/left, 2 top/right, 3 bottom/right, 4 bottom/left, 5 left/top, 6 right/top, 7 right/bottom, 8 left/bottom.
const TABLE: Record<number, [row0: string, col0: string]> = {
  1: ['top', 'left'], 2: ['top', 'right'], 3: ['bottom', 'right'], 4: ['bottom', 'left'],
  5: ['left', 'top'], 6: ['right', 'top'], 7: ['right', 'bottom'], 8: ['left', 'bottom'],
};

describe('JPEG EXIF orientation is applied, so the image is upright as viewers show it', () => {
  for (let n = 1; n <= 8; n++) {
    it(`Orientation ${n}: the same pixels as ImageMagick's -auto-orient`, async () => {
      const d = await decodeImage(fixture(`orient-${n}.jpg`));
      const ref = readPgm(fixture(`orient-${n}.pgm`));
      const page = d.pages[0]!;
      expect([page.width, page.height]).toEqual([ref.width, ref.height]);
      // Two JPEG decoders (jpeg-js, libjpeg) differ by a few grey levels; a wrong turn differs by up to 225.
      expect(maxAbsDiff(page.data, ref.data)).toBeLessThanOrEqual(4);
    });
    it(`Orientation ${n}: the stored corner (0, 0) = 10 sits where the table puts row 0 (${TABLE[n]![0]}) and column 0 (${TABLE[n]![1]})`, async () => {
      const page = (await decodeImage(fixture(`orient-${n}.jpg`))).pages[0]!;
      const [row0, col0] = TABLE[n]!;
      const sides = [row0, col0];
      const X = sides.includes('right') ? page.width - 1 : 0;
      const Y = sides.includes('bottom') ? page.height - 1 : 0;
      expect(Math.abs(page.data[Y * page.width + X]! - 10)).toBeLessThanOrEqual(4);
      // The stored row 0 runs along the side the table names: its far end (39, 0) = 166 is on that side too.
      const alongRow = row0 === 'top' || row0 === 'bottom';
      const X2 = alongRow ? page.width - 1 - X : X;
      const Y2 = alongRow ? Y : page.height - 1 - Y;
      expect(Math.abs(page.data[Y2 * page.width + X2]! - 166)).toBeLessThanOrEqual(4);
    });
  }
  it('reads the tag in either byte order, and ignores values outside 1..8 and non-Exif APP1', () => {
    expect(exifOrientation(exifApp1(6).subarray(4))).toBe(6);
    const mm = new Uint8Array([0x45, 0x78, 0x69, 0x66, 0, 0, 0x4d, 0x4d, 0, 42, 0, 0, 0, 8, 0, 1, 0x01, 0x12, 0, 3, 0, 0, 0, 1, 0, 8, 0, 0, 0, 0, 0, 0]);
    expect(exifOrientation(mm)).toBe(8);
    expect(exifOrientation(exifApp1(9).subarray(4))).toBe(1);
    expect(exifOrientation(new TextEncoder().encode('http://ns.adobe.com/xap/1.0/\0<x/>'))).toBe(1);
  });
});
