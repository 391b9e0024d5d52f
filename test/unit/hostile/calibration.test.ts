/**
 * Pixel sizes far outside what any micrograph has (1e308, 1e-308, 5e-324 µm/px, an OME-TIFF saying
 * PhysicalSizeX="1e200") made areas overflow to infinity or underflow to zero, and the per-grain G
 * histogram then looped for ever. Every calibration is now checked against the plausible band of light and
 * electron microscopy, 1e-5 to 1e4 µm/px (src/core/image/calibration.ts; the band is a choice of ours, stated
 * in docs/limits.md and docs/check-values.md), and every computed G must be finite.
 */
import { describe, expect, it } from 'vitest';
import { analyseFile } from '../../../src/app/analyse';
import { openFile } from '../../../src/app/open';
import { CalibrationError } from '../../../src/core/errors';
import { gHistogram, grainSize } from '../../../src/core/grain/index';
import { PIXEL_SIZE_BAND, UM_PER_PX_MAX, UM_PER_PX_MIN, plausiblePixelSize, resolvePixelSize } from '../../../src/core/image/calibration';
import { defaultSettings, resolveSettings } from '../../../src/core/settings';
import { synthesize } from '../../../src/core/synth/index';
import { squareGrid } from '../grain/helpers';
import { tiffFile } from './craft';

const band = /outside the plausible range for light and electron micrographs \(1e-5 to 1e4 µm\/px\)/;

describe('the plausible band of pixel sizes', () => {
  it('the band in the messages is the band of the check', () => {
    const [lo, hi] = PIXEL_SIZE_BAND.split(' to ').map((t) => Number.parseFloat(t));
    expect([lo, hi]).toEqual([UM_PER_PX_MIN, UM_PER_PX_MAX]);
    for (const v of [UM_PER_PX_MIN, 0.065, 1, 500, UM_PER_PX_MAX]) expect(plausiblePixelSize(v)).toBe(true);
    for (const v of [UM_PER_PX_MIN / 2, UM_PER_PX_MAX * 2, 0, -1, Number.NaN, Infinity]) expect(plausiblePixelSize(v)).toBe(false);
  });

  it('a typed or settings pixel size outside it is refused in one line that gives the band', () => {
    for (const v of [1e308, 1e-308, 5e-324, 1e200, 2e4, 5e-6]) {
      expect(() => resolveSettings({ umPerPx: v })).toThrow(CalibrationError);
      expect(() => resolveSettings({ umPerPx: v })).toThrow(band);
      expect(() => resolvePixelSize(v, null)).toThrow(band);
    }
    expect(() => resolveSettings({ umPerPx: 1e308 })).toThrow(/^The pixel size 1e\+308 µm\/px is outside .*check the value and its unit \(µm per pixel\)/);
  });

  it('a file\'s pixel size outside it counts as absent: results in px, never an overflow', () => {
    expect(resolvePixelSize(null, 1e200)).toEqual({ umPerPx: null, source: 'none' });
    expect(resolvePixelSize(null, 25400)).toEqual({ umPerPx: null, source: 'none' }); // 1 dpi
    expect(resolvePixelSize(null, 0.5)).toEqual({ umPerPx: 0.5, source: 'file' });
    expect(resolvePixelSize(2, 1e200)).toEqual({ umPerPx: 2, source: 'user' });
  });
});

describe('grain size never loops on a pixel size that overflows', () => {
  const lab = squareGrid(200, 200, 10);
  const input = { labels: lab, field: { x0: 0, y0: 0, x1: 200, y1: 200 }, pattern: 'walls' as const, settings: defaultSettings() };

  it('grainSize refuses 1e308 and 5e-324 µm/px with the band, instead of looping', () => {
    for (const umPerPx of [1e308, 5e-324]) {
      expect(() => grainSize({ ...input, umPerPx })).toThrow(CalibrationError);
      expect(() => grainSize({ ...input, umPerPx })).toThrow(band);
    }
    expect(grainSize({ ...input, umPerPx: UM_PER_PX_MAX }).meanArea!.histogram.length).toBeGreaterThan(0);
    expect(grainSize({ ...input, umPerPx: UM_PER_PX_MIN }).meanArea!.histogram.length).toBeGreaterThan(0);
  });

  it('the per-grain G histogram refuses areas that give no finite G, or a span no image holds', () => {
    expect(() => gHistogram([0, 1e-6])).toThrow(CalibrationError);
    expect(() => gHistogram([Infinity, 1e-6])).toThrow(CalibrationError);
    expect(() => gHistogram([1e-300, 1])).toThrow(/span G/);
    // G = −3.3223·log₁₀ a − 2.955 (ASTM E1382): a = 1 mm² gives G = −2.955, bin [−3, −2.75).
    expect(gHistogram([1])).toEqual([{ g0: -3, g1: -2.75, count: 1, areaFraction: 1 }]);
  });

  it('an OME-TIFF saying PhysicalSizeX="1e200" is analysed in px', async () => {
    const s = synthesize({ pattern: 'walls', cells: 60, width: 160, height: 128, order: 'random', seed: 5 });
    const description = '<?xml version="1.0"?><OME><Image><Pixels PhysicalSizeX="1e200" PhysicalSizeY="1e200"/></Image></OME>';
    const { bytes } = tiffFile({ width: 160, height: 128, strips: [s.image.data as Uint8Array], description });
    const opened = await openFile('huge-pixel.ome.tif', bytes, { as: 'image' });
    expect(opened.umPerPxFromFile).toBe(1e200);
    const a = await analyseFile(opened, { reference: { replicates: 0 } });
    expect(a.summary.umPerPx).toBeNull();
    expect(a.summary.calibration.source).toBe('none');
    expect(a.summary.cells.count).toBeGreaterThan(30);
  });
});
