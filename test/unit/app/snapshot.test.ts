/**
 * A packed analysis (src/app/snapshot.ts) comes back equal to the analysis that was packed, typed arrays
 * of the same type and values, and a non-finite number as itself; and it is only taken for the image and
 * the settings it was made from. The analysis is the project's own pipeline on an image of its generator.
 */
import { describe, expect, it } from 'vitest';
import { openFile } from '../../../src/app/open';
import { analyseFile } from '../../../src/app/analyse';
import { greyDigest, packAnalysis, snapshotMatches, unpackAnalysis } from '../../../src/app/snapshot';
import { encodePng } from '../../../src/core/image/encode';
import { defaultSettings } from '../../../src/core/settings';
import { synthesize } from '../../../src/core/synth/index';

const s = synthesize({ pattern: 'walls', cells: 60, width: 240, height: 180, order: 'random', seed: 5 });
const png = encodePng({ width: 240, height: 180, data: s.image.data as Uint8Array, channels: 1, bitDepth: 8 });
const settings = { ...defaultSettings(), reference: { ...defaultSettings().reference, replicates: 19 } };

describe('packed analyses', () => {
  it('unpack to the analysis that was packed', async () => {
    const file = await openFile('w.png', png, { as: 'image' });
    if (file.kind !== 'image') throw new Error('not an image');
    const a = await analyseFile(file, settings);
    const source = { name: 'w.png', width: 240, height: 180, greySha256: await greyDigest(file.image) };
    const packed = packAnalysis(a, source);
    const back = unpackAnalysis(packed);
    expect(back.source).toEqual(source);
    expect(back.analysis).toEqual(a);
    // Typed arrays keep their type (toEqual alone would accept a plain array).
    expect(back.analysis.labels?.labels.constructor).toBe(a.labels?.labels.constructor);
    expect(back.analysis.tessellation.points).toBeInstanceOf(Float64Array);
    expect(Object.keys(back.analysis.columns)).toEqual(Object.keys(a.columns));
    expect(await snapshotMatches(back, 'w.png', file.image, null, settings)).toBe(true);
    // Another setting, another name, or another image: not this result.
    expect(await snapshotMatches(back, 'w.png', file.image, null, { ...settings, minCellAreaPx: 40 })).toBe(false);
    expect(await snapshotMatches(back, 'x.png', file.image, null, settings)).toBe(false);
    expect(await snapshotMatches(back, 'w.png', file.image, 0.5, settings)).toBe(false);
    const other = { ...file.image, data: Uint8Array.from(file.image.data as Uint8Array, (v, i) => (i === 7 ? 255 - v : v)) };
    expect(await snapshotMatches(back, 'w.png', other, null, settings)).toBe(false);
  });

  it('keep non-finite numbers and refuse bytes that are not a packed analysis', () => {
    const a = { width: 1, n: Number.NaN, inf: Number.POSITIVE_INFINITY, v: new Uint16Array([1, 65535]) } as unknown as Parameters<typeof packAnalysis>[0];
    const back = unpackAnalysis(packAnalysis(a, { name: 'a', width: 1, height: 1, greySha256: '' })).analysis as unknown as typeof a & { n: number; inf: number; v: Uint16Array };
    expect(back.n).toBeNaN();
    expect(back.inf).toBe(Number.POSITIVE_INFINITY);
    expect(Array.from(back.v)).toEqual([1, 65535]);
    expect(() => unpackAnalysis(new TextEncoder().encode('<!doctype html>'))).toThrow(/not a packed analysis/);
  });
});
