import { describe, expect, it } from 'vitest';
import { CalibrationError, NoCellsError, SettingsError } from '../../../src/core/errors';
import { grainSize, interceptCount, jeffriesCount } from '../../../src/core/grain/index';
import { defaultSettings, resolveSettings } from '../../../src/core/settings';
import { squareGrid } from './helpers';

const lab = squareGrid(200, 200, 10);
const field = { x0: 0, y0: 0, x1: 200, y1: 200 };
const base = { labels: lab, umPerPx: 1, field, pattern: 'walls' as const, settings: defaultSettings() };

describe('grain size: bad input gets a clear message', () => {
  it('no pixel size: CalibrationError saying how to set it', () => {
    expect(() => grainSize({ ...base, umPerPx: null })).toThrow(CalibrationError);
    expect(() => grainSize({ ...base, umPerPx: null })).toThrow(/pixel size.*Scale panel.*--um-per-px/);
    expect(() => grainSize({ ...base, umPerPx: -2 })).toThrow(CalibrationError);
  });

  it('a pattern that is not walls: SettingsError naming the walls pattern', () => {
    expect(() => grainSize({ ...base, pattern: 'bodies' })).toThrow(SettingsError);
    expect(() => grainSize({ ...base, pattern: 'points' })).toThrow(/walls pattern.*points pattern/);
  });

  it('an empty label image: NoCellsError', () => {
    const empty = { width: 10, height: 10, labels: new Int32Array(100), count: 0 };
    expect(() => grainSize({ ...base, labels: empty, field: { x0: 0, y0: 0, x1: 10, y1: 10 } })).toThrow(NoCellsError);
  });

  it('a field outside the image: SettingsError', () => {
    expect(() => grainSize({ ...base, field: { x0: 0, y0: 0, x1: 300, y1: 200 } })).toThrow(/inside the 200 x 200 image/);
  });

  it('too few grains: warnings name the standard minimum, and every method still reports', () => {
    const few = squareGrid(60, 60, 20);
    const r = grainSize({ ...base, labels: few, field: { x0: 0, y0: 0, x1: 60, y1: 60 } });
    expect(r.warnings.some((w) => /Planimetric: only \d+ grains .*at least 50/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /Intercept: .*about 50 per test pattern/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /Mean area: only 1 grains/.test(w))).toBe(true);
    expect(r.planimetric).not.toBeNull();
    expect(r.intercept).not.toBeNull();
    expect(r.G).not.toBeNull();
  });

  it('test figures larger than the field: SettingsError from the counting functions', () => {
    expect(() => jeffriesCount(lab, field, { shape: 'circle', cx: 100, cy: 100, r: 150 })).toThrow(/larger than the field/);
    expect(() => jeffriesCount(lab, field, { shape: 'rectangle', x0: -10, y0: 0, x1: 100, y1: 100 })).toThrow(SettingsError);
    expect(() => interceptCount(lab, field, [{ kind: 'circle', cx: 100, cy: 100, r: 120 }])).toThrow(/larger than the field/);
    expect(() => interceptCount(lab, field, [{ kind: 'line', angleDeg: 0, x0: 0, y0: 5, x1: 250, y1: 5 }])).toThrow(/outside the field/);
    // The settings cannot ask for a figure larger than the largest that fits.
    expect(() => resolveSettings({ grain: { testSizeFraction: 1.5 } })).toThrow(SettingsError);
  });

  it('grains larger than the field: the planimetric method reports its own problem, the rest stands', () => {
    const one = squareGrid(100, 100, 100);
    const r = grainSize({ ...base, labels: one, field: { x0: 0, y0: 0, x1: 100, y1: 100 } });
    expect(r.intercept).toBeNull();
    expect(r.meanArea).toBeNull();
    expect(r.warnings.some((w) => /Intercept: no grain boundary/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /Mean area: no grain lies wholly inside/.test(w))).toBe(true);
  });

  it('a pixel size that gives an implausible G (outside 00..14): a warning naming the pixel size, results kept', () => {
    const big = grainSize({ ...base, umPerPx: 500 }); // 10 px grains of 5 mm: G far below 00
    expect(big.warnings.some((w) => /outside the range of the standard \(00 to 14\).*500 µm\/px/.test(w))).toBe(true);
    expect(big.planimetric!.G).toBeLessThan(-1);
    const tiny = grainSize({ ...base, umPerPx: 0.001 });
    expect(tiny.planimetric!.G).toBeGreaterThan(14);
    expect(tiny.warnings.filter((w) => /outside the range/.test(w)).length).toBe(3);
  });

  it('the result is plain JSON (no NaN, no typed arrays)', () => {
    const r = grainSize(base);
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
  });
});
