/**
 * The walls segmentation tells its cell count before its flood, so that the random-seeding reference can
 * start while the flood runs. Derived: the flood only gives unlabelled pixels to markers and never removes
 * one, so each kept marker is exactly one cell.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { loadCv, type CV } from '../../../src/core/cv/index';
import { segmentWalls } from '../../../src/core/segment/walls';
import { resolveSettings } from '../../../src/core/settings';
import { synthesize } from '../../../src/core/synth/index';

let cv: CV;
beforeAll(async () => {
  ({ cv } = await loadCv());
});

describe('segmentWalls onCellCount', () => {
  for (const [name, settings] of [
    ['default settings', {}],
    ['an explicit minimum area and seed erosion', { minCellAreaPx: 60, walls: { seedErodePx: 1 } }],
  ] as const) {
    it(`${name}: called once, before the labels exist, with their final count and the minimum area used`, () => {
      const img = synthesize({ pattern: 'walls', cells: 250, width: 500, height: 400, order: 'random', seed: 12, noise: 6 }).image;
      const calls: [number, number][] = [];
      const r = segmentWalls(cv, img, resolveSettings(settings as never), (count, minArea) => calls.push([count, minArea]));
      expect(calls).toEqual([[r.labels.count, r.minCellAreaPx]]);
      expect(r.labels.count).toBeGreaterThan(200);
    });
  }
});
