import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/image/decode';
import { encodePng } from '../../../src/core/image/encode';
import { crc32, withPixelSize } from '../../../src/core/image/phys';

describe('pixel size written into PNG (pHYs)', () => {
  it('CRC-32 of "123456789" is 0xCBF43926 (the standard check value of the ISO 3309 CRC; pub, memory)', () => {
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
  });
  it('round-trips through the decoder (fast-png verifies the chunk CRC)', async () => {
    const png = encodePng({ width: 16, height: 16, data: new Uint8Array(256).fill(7), channels: 1, bitDepth: 8 });
    const img = await decodeImage(withPixelSize(png, 0.5));
    expect(img.umPerPx).toBeCloseTo(0.5, 9); // 2 000 000 px/m
    expect(Array.from(img.pages[0]!.data.slice(0, 4))).toEqual([7, 7, 7, 7]);
    expect(() => withPixelSize(png, 0)).toThrow(/positive/);
  });
});
