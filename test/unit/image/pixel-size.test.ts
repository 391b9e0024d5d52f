import { describe, it, expect } from 'vitest';
import { decodeImage, readOmePixelSize, resolvePixelSize } from '../../../src/core/image';
import { CalibrationError } from '../../../src/core/errors';
import { fixture } from './fixtures';

// 1 inch = 25.4 mm = 25 400 µm exactly (international inch, 1959; derived). TIFF 6.0 (Adobe 1992), section 8:
// XResolution = pixels per ResolutionUnit, unit 2 = inch, 3 = centimetre, 1 = no absolute unit (pub, read in text
// long ago; recalled from memory, but the file values are set by libtiff's tiffset, which follows the same tags).
describe('pixel size from TIFF resolution tags', () => {
  it('2540 px/inch -> 25400 / 2540 = 10 µm/px', async () => {
    expect((await decodeImage(fixture('res-inch.tif'))).umPerPx).toBeCloseTo(10, 12);
  });
  it('2000 px/cm -> 10000 / 2000 = 5 µm/px', async () => {
    expect((await decodeImage(fixture('res-cm.tif'))).umPerPx).toBeCloseTo(5, 12);
  });
  it('ResolutionUnit 1 (no unit) -> null', async () => {
    expect((await decodeImage(fixture('res-none.tif'))).umPerPx).toBeNull();
  });
  it('no resolution tags -> null', async () => {
    expect((await decodeImage(fixture('grey8-none.tif'))).umPerPx).toBeNull();
  });
  it('X and Y differ (10 vs 20 µm/px): refused, saying to resample to square pixels', async () => {
    const d = decodeImage(fixture('res-anisotropic.tif'), { name: 'aniso.tif' });
    await expect(d).rejects.toThrow(CalibrationError);
    await expect(decodeImage(fixture('res-anisotropic.tif'), { name: 'aniso.tif' })).rejects.toThrow(
      /^aniso\.tif: the file's pixels are not square \(10 µm wide, 20 µm high\); resample the image to square pixels/,
    );
  });
});

// OME-XML PhysicalSizeX with PhysicalSizeXUnit, default µm (OME Data Model schema 2016-06; pub, recalled
// from memory). 1 nm = 0.001 µm, 1 mm = 1000 µm (SI; derived).
describe('pixel size from OME-XML in ImageDescription', () => {
  it('PhysicalSizeX 250 nm -> 0.25 µm/px', async () => {
    expect((await decodeImage(fixture('ome-nm.tif'))).umPerPx).toBeCloseTo(0.25, 12);
  });
  it('PhysicalSizeX 0.65 µm (micro sign) -> 0.65 µm/px', async () => {
    expect((await decodeImage(fixture('ome-um.tif'))).umPerPx).toBeCloseTo(0.65, 12);
  });
  it('PhysicalSizeX 1.5 without a unit -> µm by default', async () => {
    expect((await decodeImage(fixture('ome-default-unit.tif'))).umPerPx).toBeCloseTo(1.5, 12);
  });
  it('OME (0.002 mm = 2 µm) wins over the resolution tags (10 µm/px)', async () => {
    expect((await decodeImage(fixture('ome-and-res.tif'))).umPerPx).toBeCloseTo(2, 12);
  });
  it('units and spellings', () => {
    const px = (attrs: string) => readOmePixelSize(`<OME xmlns="x"><Image><Pixels ${attrs} SizeX="4"/></Image></OME>`);
    expect(px('PhysicalSizeX="0.5" PhysicalSizeXUnit="um"')?.xUm).toBeCloseTo(0.5, 12);
    expect(px('PhysicalSizeX="0.5" PhysicalSizeXUnit="\u03bcm"')?.xUm).toBeCloseTo(0.5, 12); // Greek mu
    expect(px('PhysicalSizeX="0.5" PhysicalSizeXUnit="&#181;m"')?.xUm).toBeCloseTo(0.5, 12); // entity
    expect(px("PhysicalSizeX='3' PhysicalSizeXUnit='mm'")?.xUm).toBeCloseTo(3000, 9);
    expect(px('PhysicalSizeX="500" PhysicalSizeXUnit="pm"')?.xUm).toBeCloseTo(5e-4, 15);
    expect(px('PhysicalSizeX="2" PhysicalSizeXUnit="\u00c5"')?.xUm).toBeCloseTo(2e-4, 15);
    expect(px('PhysicalSizeX="2" PhysicalSizeXUnit="furlong"')?.xUm).toBeNull();
    expect(px('PhysicalSizeX="-1"')?.xUm).toBeNull();
    expect(px('PhysicalSizeX="0.2" PhysicalSizeY="0.4"')).toEqual({ xUm: 0.2, yUm: 0.4 });
    expect(readOmePixelSize('ImageJ-free plain description, PhysicalSizeX="3"')).toBeNull();
  });
});

// PNG pHYs: pixels per unit, unit 1 = metre (PNG specification, W3C 2003, section 11.3.5.3; pub, memory).
// ImageMagick writes 4000 px/cm as 400000 px/m -> 10^6 / 400000 = 2.5 µm/px.
describe('pixel size from PNG pHYs', () => {
  it('400000 px/m -> 2.5 µm/px', async () => {
    expect((await decodeImage(fixture('grey8-phys.png'))).umPerPx).toBeCloseTo(2.5, 9);
  });
  it('no pHYs -> null; JPEG -> null', async () => {
    expect((await decodeImage(fixture('grey8.png'))).umPerPx).toBeNull();
    expect((await decodeImage(fixture('grey8.jpg'))).umPerPx).toBeNull();
  });
});

describe('resolvePixelSize: the user wins over the file', () => {
  it('chooses and says which', () => {
    expect(resolvePixelSize(0.8, 2)).toEqual({ umPerPx: 0.8, source: 'user' });
    expect(resolvePixelSize(null, 2)).toEqual({ umPerPx: 2, source: 'file' });
    expect(resolvePixelSize(undefined, 2)).toEqual({ umPerPx: 2, source: 'file' });
    expect(resolvePixelSize(undefined, null)).toEqual({ umPerPx: null, source: 'none' });
    expect(resolvePixelSize(null, 0)).toEqual({ umPerPx: null, source: 'none' });
  });
  it('a given but unusable user value is an error, not silently replaced', () => {
    for (const bad of [0, -1, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => resolvePixelSize(bad, 2)).toThrow(CalibrationError);
    }
    expect(() => resolvePixelSize(-1, null)).toThrow(/-1 µm\/px is not a positive number/);
  });
});
