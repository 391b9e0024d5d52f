/**
 * The pixel limit is the one opencv.js really handles. Its 1 GiB WebAssembly heap was measured by
 * scripts/measure-pixel-limit.ts (one size per process; the figures are in pixel-limit.json beside this
 * file), and MAX_PIXELS must stay below the largest size that worked for every pattern. Beyond the limit an
 * image is refused from its header with the usual one line, and an out-of-memory inside opencv.js becomes
 * that line too, never "Unexpected error: 7078392".
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/image/decode';
import { ImageDecodeError, ImageTooLargeError, describeError } from '../../../src/core/errors';
import { MAX_PIXELS, checkDimensions, outOfCvMemory } from '../../../src/core/image/limits';
import { analyze } from '../../../src/core/analyze';
import { pngHeaderOnly } from '../image/handmade';

interface Measured { pattern: string; worksUpToMP: number; failsAtMP: number | null }
const measured = JSON.parse(readFileSync(new URL('./pixel-limit.json', import.meta.url), 'utf8')) as { runs: Measured[] };

describe('the pixel limit', () => {
  it('stays below what opencv.js was measured to handle, for every pattern', () => {
    expect(measured.runs.map((r) => r.pattern).sort()).toEqual(['bodies', 'walls']);
    for (const r of measured.runs) expect(MAX_PIXELS / 1e6).toBeLessThan(r.worksUpToMP);
    // The walls segmentation failed above 118 MP: the old limit of 268 MP was never true.
    const walls = measured.runs.find((r) => r.pattern === 'walls')!;
    expect(walls.failsAtMP).not.toBeNull();
    expect(268).toBeGreaterThan(walls.failsAtMP!);
  });

  it('an image just over it is refused from its header in one line; one at it is not', async () => {
    expect(() => checkDimensions(10_000, 10_001, MAX_PIXELS, 'big.png')).toThrow(ImageTooLargeError);
    expect(() => checkDimensions(10_000, 10_001, MAX_PIXELS, 'big.png')).toThrow('big.png: 10000 x 10001 px exceeds the limit of 100 megapixels; crop or downsample first');
    expect(() => checkDimensions(10_000, 10_000, MAX_PIXELS, 'ok.png')).not.toThrow();
    // 11 000 x 11 000 (121 MP) failed inside opencv.js before; now the header is enough to refuse it.
    await expect(decodeImage(pngHeaderOnly(11_000, 11_000), { name: 'b.png' })).rejects.toThrow(/^b\.png: 11000 x 11000 px exceeds the limit of 100 megapixels/);
    // At the limit the header passes and the missing pixel data is what fails.
    await expect(decodeImage(pngHeaderOnly(10_000, 10_000), { name: 'c.png' })).rejects.toThrow(ImageDecodeError);
  });

  it('analyze refuses an image over the limit with the same words', async () => {
    const image = { width: 10_001, height: 10_000, data: new Uint8Array(0), bitDepth: 8 as const };
    await expect(analyze({ kind: 'image', image })).rejects.toThrow('10001 x 10000 px exceeds the limit of 100 megapixels; crop or downsample first.');
  });

  it('an out-of-memory thrown by opencv.js becomes one line that says what to do', () => {
    for (const thrown of [7078392, new Error('memory access out of bounds'), new RangeError('Array buffer allocation failed')]) {
      const e = outOfCvMemory(thrown, 11_000, 11_000);
      expect(e).toBeInstanceOf(ImageTooLargeError);
      expect(describeError(e)).toBe('11000 x 11000 px needs more memory than the image analysis has (opencv.js holds at most 1 GiB; the limit is 100 megapixels); crop or downsample first');
    }
    const other = new TypeError('x is not a function');
    expect(outOfCvMemory(other, 10, 10)).toBe(other);
  });
});
