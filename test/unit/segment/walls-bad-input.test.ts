/**
 * Bad input to the walls and bodies segmenters: an image with nothing to threshold, and a minimum cell
 * area no cell reaches. Each gives a NoCellsError whose message says what to do, frees what it used in
 * opencv.js (the next analysis works), and a uniform image is refused the same way by both patterns.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { loadCv, type CV } from '../../../src/core/cv/index';
import { NoCellsError } from '../../../src/core/errors';
import { segmentBodies } from '../../../src/core/segment/bodies';
import { segmentWalls } from '../../../src/core/segment/walls';
import { resolveSettings } from '../../../src/core/settings';
import { synthesize } from '../../../src/core/synth/index';
import type { GreyImage } from '../../../src/core/types';

let cv: CV;
beforeAll(async () => {
  ({ cv } = await loadCv());
});

const uniform = (v: number): GreyImage => ({ width: 120, height: 90, data: new Uint8Array(120 * 90).fill(v), bitDepth: 8 });

describe('walls segmentation, bad input', () => {
  for (const v of [0, 128, 255]) {
    it(`a uniform image (every pixel ${v}): NoCellsError saying it is uniform and what to check`, () => {
      const run = () => segmentWalls(cv, uniform(v), resolveSettings({}));
      expect(run).toThrow(NoCellsError);
      expect(run).toThrow(/No cells found: the image is uniform .*check that this is the right image, or set a manual threshold/);
    });
  }

  it('a uniform image as bodies: the same kind of error, naming bodies', () => {
    expect(() => segmentBodies(cv, uniform(90), resolveSettings({ pattern: 'bodies' }))).toThrow(/No bodies found: the image is uniform/);
  });

  it('a minimum cell area larger than every cell: NoCellsError saying to lower it; the count is never told', () => {
    const img = synthesize({ pattern: 'walls', cells: 40, width: 200, height: 160, order: 'random', seed: 9 }).image;
    const told: number[] = [];
    const run = () => segmentWalls(cv, img, resolveSettings({ minCellAreaPx: 1e6 }), (n) => told.push(n));
    expect(run).toThrow(NoCellsError);
    expect(run).toThrow(/no cell interior is larger than the minimum cell area of 1000000 px²; lower the minimum cell area/);
    expect(told).toEqual([]);
  });

  it('after those errors the next segmentation works and gives the same cells as before them', () => {
    const img = synthesize({ pattern: 'walls', cells: 40, width: 200, height: 160, order: 'random', seed: 9 }).image;
    const before = segmentWalls(cv, img, resolveSettings({}));
    for (let k = 0; k < 3; k++) expect(() => segmentWalls(cv, uniform(7), resolveSettings({}))).toThrow(NoCellsError);
    const after = segmentWalls(cv, img, resolveSettings({}));
    expect(after.labels.count).toBe(before.labels.count);
    expect(after.labels.count).toBeGreaterThan(25);
    expect(Array.from(after.labels.labels)).toEqual(Array.from(before.labels.labels));
  });
});
