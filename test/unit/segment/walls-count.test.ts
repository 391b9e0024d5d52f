/**
 * The walls segmentation tells its cell count before its flood, so that the random-seeding reference can
 * start while the flood runs. Derived: the flood only gives unlabelled pixels to markers and never removes
 * one, so each kept marker is exactly one cell. Also the generator's window option that such tests use.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { loadCv, type CV } from '../../../src/core/cv/index';
import { segmentWalls } from '../../../src/core/segment/walls';
import { resolveSettings } from '../../../src/core/settings';
import { synthesize } from '../../../src/core/synth/index';
import { SettingsError } from '../../../src/core/errors';

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

describe('synthesize window option', () => {
  it('a window is a walls pattern: asked for bodies, a SettingsError says to leave it off (bad input)', () => {
    expect(() => synthesize({ pattern: 'bodies', cells: 50, width: 300, height: 300, order: 'regular', seed: 1, window: true })).toThrow(SettingsError);
    expect(() => synthesize({ pattern: 'bodies', cells: 50, width: 300, height: 300, order: 'regular', seed: 1, window: true })).toThrow(/Leave the window option off for bodies/);
  });
  it('a window keeps the cells seen in the image: truth labels 1..count all present, seeds beyond the border among them', () => {
    const r = synthesize({ pattern: 'walls', cells: 200, width: 400, height: 300, order: 'random', seed: 3, window: true });
    const seen = new Set(r.truth.labels);
    expect(seen.has(0)).toBe(false);
    expect(seen.size).toBe(r.truth.count);
    expect(r.seeds.length / 2).toBe(r.truth.count);
    let outside = 0;
    for (let i = 0; i < r.seeds.length; i += 2) if (r.seeds[i]! < 0 || r.seeds[i]! >= 400 || r.seeds[i + 1]! < 0 || r.seeds[i + 1]! >= 300) outside++;
    expect(outside).toBeGreaterThan(0);
    // About `cells` cells meet the image on average (windowDensity; derived): within 15 % for one draw.
    expect(Math.abs(r.truth.count / 200 - 1)).toBeLessThan(0.15);
  });
});
