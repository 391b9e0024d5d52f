import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { calibrated } from '../../../src/app/calibration';
import { CalibrationError } from '../../../src/core/errors';
import { decodeImage } from '../../../src/core/image/decode';
import { encodePng } from '../../../src/core/image/encode';
import { filePixelSize, screenDpi } from '../../../src/core/image/calibration';
import { resolveSettings } from '../../../src/core/settings';
import { tiff, withPhys } from './handmade';

// 1 inch = 0.0254 m = 25 400 µm exactly (international inch, 1959). PNG pHYs holds whole pixels per metre
// (PNG specification, W3C 2003, section 11.3.5.3; pub, memory), so 72 dpi is written as
// round(72 / 0.0254) = 2835 px/m and 96 dpi as round(96 / 0.0254) = 3780 px/m (derived; these are the values
// common image editors write, common practice, recalled from memory). TIFF 6.0 (Adobe 1992) section 8:
// XResolution / YResolution are RATIONAL pixels per ResolutionUnit, 2 = inch, 3 = centimetre (pub, memory).
const grey = () => encodePng({ width: 16, height: 16, data: new Uint8Array(256).fill(90), channels: 1, bitDepth: 8 });
const tif = (x: [number, number], y: [number, number], unit: number) =>
  tiff({ width: 16, height: 16, pixels: new Uint8Array(256).fill(90), resolution: { x, y, unit } });

describe('a screen or print resolution is not a calibration', () => {
  it('PNG pHYs 2835 px/m (72 dpi): no pixel size, a notice naming 72 dpi and --um-per-px', async () => {
    const d = await decodeImage(withPhys(grey(), 2835, 2835));
    expect(d.umPerPx).toBeNull();
    expect(d.pixelSizeNotice).toMatch(/72 dpi/);
    expect(d.pixelSizeNotice).toMatch(/--um-per-px 352\.7\b/); // 10^6 / 2835 = 352.73 µm/px (derived)
  });
  it('PNG pHYs 3780 px/m (96 dpi): no pixel size, a notice', async () => {
    const d = await decodeImage(withPhys(grey(), 3780, 3780));
    expect(d.umPerPx).toBeNull();
    expect(d.pixelSizeNotice).toMatch(/96 dpi/);
  });
  it('TIFF XResolution 300/1 per inch: no pixel size, a notice', async () => {
    const d = await decodeImage(tif([300, 1], [300, 1], 2));
    expect(d.umPerPx).toBeNull();
    expect(d.pixelSizeNotice).toMatch(/300 dpi/);
  });
  it('TIFF 118.11 px/cm (300 dpi written in cm, 11811/100): no pixel size', async () => {
    const d = await decodeImage(tif([11811, 100], [11811, 100], 3));
    expect(d.umPerPx).toBeNull();
    expect(d.pixelSizeNotice).toMatch(/300 dpi/);
  });
  it('a microscope pixel size stays a calibration: 2 000 000 px/m = 0.5 µm/px; 2540 px/inch = 10 µm/px', async () => {
    const png = await decodeImage(withPhys(grey(), 2_000_000, 2_000_000));
    expect(png.umPerPx).toBeCloseTo(0.5, 12);
    expect(png.pixelSizeNotice).toBeUndefined();
    const t = await decodeImage(tif([2540, 1], [2540, 1], 2));
    expect(t.umPerPx).toBeCloseTo(10, 12);
  });
  it('the sample grains-calibrated.png keeps its 0.5 µm/px', async () => {
    const d = await decodeImage(new Uint8Array(readFileSync('sample-images/grains-calibrated.png')));
    expect(d.umPerPx).toBeCloseTo(0.5, 9);
    expect(d.pixelSizeNotice).toBeUndefined();
  });
  it('microscope metadata is never taken for a screen resolution', () => {
    // 25 400 / 72 µm/px would be 72 dpi, but OME PhysicalSizeX is a microscope's own statement.
    expect(filePixelSize({ xUm: 25400 / 72, yUm: 25400 / 72, kind: 'microscope' })).toEqual({ umPerPx: 25400 / 72, notice: null });
  });
  it('which values count as round dpi', () => {
    for (const dpi of [72, 75, 96, 100, 150, 200, 300, 600, 1200, 2400, 4800]) expect(screenDpi(25400 / dpi)).toBe(dpi);
    // 2540 dpi = 10 µm/px, 1270 dpi = 20 µm/px, 5080 dpi = 5 µm/px, 50 800 dpi = 0.5 µm/px, 72.5 dpi: not screen settings.
    for (const um of [10, 20, 5, 0.5, 25400 / 72.5, 0.65]) expect(screenDpi(um)).toBeNull();
  });
  it('the notice reaches the analysis unless the user gives a pixel size', () => {
    const notice = 'screen';
    const none = calibrated(resolveSettings({}), null, notice);
    expect(none).toMatchObject({ source: 'none', notice });
    expect(none.settings.umPerPx).toBeNull();
    const user = calibrated(resolveSettings({ umPerPx: 352.7 }), null, notice);
    expect(user.source).toBe('user');
    expect(user.notice).toBeUndefined();
  });
});

// Non-square pixels: x and y pixels per unit differ (PNG pHYs x ≠ y; TIFF XResolution ≠ YResolution).
describe('non-square pixels are refused with one line saying what to do', () => {
  it('PNG pHYs 2 000 000 x 1 000 000 px/m (0.5 x 1 µm): CalibrationError', async () => {
    const p = decodeImage(withPhys(grey(), 2_000_000, 1_000_000), { name: 'a.png' });
    await expect(p).rejects.toThrow(CalibrationError);
    await expect(decodeImage(withPhys(grey(), 2_000_000, 1_000_000), { name: 'a.png' })).rejects.toThrow(
      /^a\.png: the file's pixels are not square \(0\.5 µm wide, 1 µm high\); resample the image to square pixels[^\n]*$/,
    );
  });
  it('TIFF 300 x 600 dpi is refused too (the pixels are stretched whatever the unit means)', async () => {
    await expect(decodeImage(tif([300, 1], [600, 1], 2))).rejects.toThrow(/not square/);
  });
  it('a difference within 1 % counts as square (2835 x 2834 px/m rounds the same 72 dpi)', async () => {
    const d = await decodeImage(withPhys(grey(), 2835, 2834));
    expect(d.umPerPx).toBeNull();
    expect(d.pixelSizeNotice).toMatch(/72 dpi/);
  });
});
