/**
 * Opening an input file (src/app/open.ts): points CSV or image, the field of a point set, the pixel size
 * a PNG carries. Expected values follow from the inputs written here (hand-made points, a PNG whose pHYs
 * chunk says 2 000 000 px per metre, i.e. 0.5 µm/px by the PNG specification's unit of the metre).
 */
import { describe, expect, it } from 'vitest';
import { looksLikePoints, openFile, pointsField } from '../../../src/app/open';
import { CsvError, ImageDecodeError } from '../../../src/core/errors';
import { encodePng } from '../../../src/core/image/encode';
import { withPixelSize } from '../../../src/core/image/phys';

const text = (s: string) => new TextEncoder().encode(s);

function greyPng(w: number, h: number): Uint8Array {
  const data = new Uint8Array(w * h);
  for (let i = 0; i < data.length; i++) data[i] = (i * 7) % 256;
  return encodePng({ width: w, height: h, data, channels: 1, bitDepth: 8 });
}

describe('looksLikePoints', () => {
  it('takes a .csv or .txt name as points whatever the bytes', () => {
    expect(looksLikePoints('cells.CSV', greyPng(16, 16))).toBe(true);
    expect(looksLikePoints('cells.txt', text('hello'))).toBe(true);
  });
  it('takes numeric text without an image signature as points, and image bytes as an image', () => {
    expect(looksLikePoints('points', text('x,y\n1.5,2\n3,4\n'))).toBe(true);
    expect(looksLikePoints('grains', greyPng(16, 16))).toBe(false);
    expect(looksLikePoints('photo', new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0x31, 0x32]))).toBe(false);
    expect(looksLikePoints('notes', text('no digits here'))).toBe(false);
  });
});

describe('pointsField', () => {
  it('runs from the origin to the largest coordinate, rounded up to whole px', () => {
    expect(pointsField(new Float64Array([0.5, 3.2, 10, 1, 4, 0]))).toEqual({ width: 10, height: 4 });
    expect(pointsField(new Float64Array([10.01, 0.2]))).toEqual({ width: 11, height: 1 });
  });
  it('is at least 1 x 1 px', () => {
    expect(pointsField(new Float64Array(0))).toEqual({ width: 1, height: 1 });
  });
});

describe('openFile', () => {
  it('reads a points CSV with the field from its bounds, or the size given', async () => {
    const csv = text('x,y\n1,2\n30.5,7\n12,19.2\n');
    const a = await openFile('p.csv', csv);
    expect(a.kind).toBe('points');
    if (a.kind !== 'points') return;
    expect(Array.from(a.points)).toEqual([1, 2, 30.5, 7, 12, 19.2]);
    expect([a.width, a.height]).toEqual([31, 20]);
    expect(a.umPerPxFromFile).toBeNull();
    const b = await openFile('p.csv', csv, { size: [100, 80] });
    expect([b.width, b.height]).toEqual([100, 80]);
  });

  it('decodes an image with its pixel size from the pHYs chunk', async () => {
    const o = await openFile('g.png', withPixelSize(greyPng(40, 24), 0.5));
    expect(o.kind).toBe('image');
    if (o.kind !== 'image') return;
    expect([o.width, o.height, o.pages.length]).toEqual([40, 24, 1]);
    expect(o.image).toBe(o.pages[0]);
    expect(o.image.data[3]).toBe(21);
    expect(o.umPerPxFromFile).toBeCloseTo(0.5, 12);
    expect(o.wasColour).toBe(false);
  });

  it('follows `as` over the name, with the typed error of the reader it chose', async () => {
    await expect(openFile('p.csv', greyPng(16, 16), { as: 'image' })).resolves.toMatchObject({ kind: 'image' });
    await expect(openFile('g.png', text(''), { as: 'points' })).rejects.toBeInstanceOf(CsvError);
    await expect(openFile('g.png', text('not an image at all'), { as: 'image' })).rejects.toBeInstanceOf(ImageDecodeError);
  });
});
