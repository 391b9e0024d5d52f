import { describe, it, expect } from 'vitest';
import { decodeImage, encodePng, greyTo8, toGrey } from '../../../src/core/image';
import { mulberry32 } from '../../../src/core/random';

// ITU-R BT.601 luma weights 0.299, 0.587, 0.114 (pub, recalled from memory; the weights sum to 1 exactly).
describe('toGrey', () => {
  it('pure primaries and white give the BT.601 weights times 255 and 65535', () => {
    const rgb8 = new Uint8Array([255, 0, 0, 0, 255, 0, 0, 0, 255, 255, 255, 255]);
    expect(Array.from(toGrey({ width: 4, height: 1, data: rgb8, channels: 3, bitDepth: 8 }).data))
      .toEqual([Math.round(0.299 * 255), Math.round(0.587 * 255), Math.round(0.114 * 255), 255]); // 76, 150, 29, 255
    const rgb16 = new Uint16Array([65535, 0, 0, 0, 65535, 0, 0, 0, 65535, 65535, 65535, 65535]);
    const g16 = toGrey({ width: 4, height: 1, data: rgb16, channels: 3, bitDepth: 16 });
    expect(g16.data).toBeInstanceOf(Uint16Array);
    expect(Array.from(g16.data)).toEqual([19595, 38469, 7471, 65535]); // round(0.299 * 65535) = 19594.965 -> 19595
  });
  it('alpha is ignored (RGBA and grey + alpha)', () => {
    const rgba = new Uint8Array([100, 150, 200, 0, 100, 150, 200, 255]);
    const g = toGrey({ width: 2, height: 1, data: rgba, channels: 4, bitDepth: 8 }).data;
    expect(g[0]).toBe(g[1]);
    expect(g[0]).toBe(Math.round(0.299 * 100 + 0.587 * 150 + 0.114 * 200)); // 141
    const ga = new Uint16Array([1234, 0, 60000, 65535]);
    expect(Array.from(toGrey({ width: 2, height: 1, data: ga, channels: 2, bitDepth: 16 }).data)).toEqual([1234, 60000]);
  });
  it('a sample count that does not fit the size is refused', () => {
    expect(() => toGrey({ width: 2, height: 2, data: new Uint8Array(5), channels: 1, bitDepth: 8 })).toThrow(RangeError);
  });
});

describe('greyTo8', () => {
  it('8-bit passes through as a copy', () => {
    const data = new Uint8Array([0, 17, 255, 3]);
    const out = greyTo8({ width: 2, height: 2, data, bitDepth: 8 });
    expect(Array.from(out)).toEqual([0, 17, 255, 3]);
    expect(out).not.toBe(data);
  });
  it('16-bit is stretched linearly from min..max to 0..255', () => {
    // min 1000 -> 0, max 3000 -> 255, midpoint 2000 -> round(127.5) = 128, 1500 -> round(63.75) = 64 (derived)
    const out = greyTo8({ width: 2, height: 2, data: new Uint16Array([1000, 3000, 2000, 1500]), bitDepth: 16 });
    expect(Array.from(out)).toEqual([0, 255, 128, 64]);
  });
  it('a constant 16-bit image maps to 0', () => {
    expect(Array.from(greyTo8({ width: 2, height: 1, data: new Uint16Array([500, 500]), bitDepth: 16 }))).toEqual([0, 0]);
  });
});

describe('encodePng round-trips through decodeImage', () => {
  it('16-bit label values 0..65535 survive exactly', async () => {
    const width = 256, height = 256; // 65536 pixels: every value 0..65535 once, shuffled
    const data = new Uint16Array(width * height);
    for (let i = 0; i < data.length; i++) data[i] = i;
    const rng = mulberry32(7);
    for (let i = data.length - 1; i > 0; i--) {
      const j = Math.floor(rng() * (i + 1));
      const t = data[i]!; data[i] = data[j]!; data[j] = t;
    }
    const back = await decodeImage(encodePng({ width, height, data, channels: 1, bitDepth: 16 }));
    expect(back.format).toBe('png');
    const page = back.pages[0]!;
    expect([page.width, page.height, page.bitDepth]).toEqual([width, height, 16]);
    expect(page.data).toBeInstanceOf(Uint16Array);
    expect(page.data).toEqual(data);
  });
  it('8-bit grey, RGB and RGBA', async () => {
    const width = 20, height = 16, n = width * height;
    const grey = Uint8Array.from({ length: n }, (_, i) => (i * 7) % 256);
    expect((await decodeImage(encodePng({ width, height, data: grey, channels: 1, bitDepth: 8 }))).pages[0]!.data).toEqual(grey);
    const rgb = Uint8Array.from({ length: 3 * n }, (_, i) => (i * 13) % 256);
    const fromRgb = await decodeImage(encodePng({ width, height, data: rgb, channels: 3, bitDepth: 8 }));
    expect(fromRgb.wasColour).toBe(true);
    expect(fromRgb.pages[0]!.data).toEqual(toGrey({ width, height, data: rgb, channels: 3, bitDepth: 8 }).data);
    const rgba = Uint8Array.from({ length: 4 * n }, (_, i) => (i * 5) % 256);
    const fromRgba = await decodeImage(encodePng({ width, height, data: rgba, channels: 4, bitDepth: 8 }));
    expect(fromRgba.pages[0]!.data).toEqual(toGrey({ width, height, data: rgba, channels: 4, bitDepth: 8 }).data);
  });
  it('refuses mismatched input', () => {
    expect(() => encodePng({ width: 2, height: 2, data: new Uint8Array(3), channels: 1, bitDepth: 8 })).toThrow(RangeError);
    expect(() => encodePng({ width: 2, height: 2, data: new Uint8Array(4), channels: 1, bitDepth: 16 })).toThrow(RangeError);
  });
});
