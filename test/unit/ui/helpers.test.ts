import { describe, it, expect } from 'vitest';
import { displayRgba, outlineRgba, cellBoxes, downscaleGrey, scaleSettings, collectTransfers, baseName } from '../../../workers/helpers';
import { sortedRows, visibleWindow } from '../../../src/ui/table';
import { parsePixelSize } from '../../../src/ui/state/app.svelte';
import { formatValue, formatP } from '../../../src/ui/format';
import type { LabelImage } from '../../../src/core/types';

const lab: LabelImage = {
  width: 4, height: 3, count: 2,
  labels: new Int32Array([
    1, 1, 0, 2,
    1, 1, 0, 2,
    1, 1, 0, 2,
  ]),
};

describe('worker helpers', () => {
  it('outlines mark cell pixels with a differing 4-neighbour or on the border', () => {
    const o = outlineRgba(lab);
    const on = (x: number, y: number) => o[(y * 4 + x) * 4 + 3] === 255;
    expect(on(0, 0) && on(1, 1) && on(3, 1)).toBe(true);
    expect(on(2, 1)).toBe(false); // a wall pixel
  });
  it('cell boxes are [x0, y0, x1, y1) per cell', () => {
    expect([...cellBoxes(lab)]).toEqual([0, 0, 2, 3, 3, 0, 4, 3]);
  });
  it('the display stretch maps the 0.1 % and 99.9 % points to 0 and 255', () => {
    const data = new Uint16Array(2000);
    for (let i = 0; i < data.length; i++) data[i] = 1000 + (i % 1000);
    const rgba = displayRgba({ width: 2000, height: 1, data, bitDepth: 16 });
    expect(rgba[0]).toBe(0);
    expect(rgba[4 * 999]).toBe(255);
    expect(rgba[3]).toBe(255);
  });
  it('downscaling averages blocks and keeps the bit depth', () => {
    const img = { width: 3, height: 2, data: new Uint8Array([0, 10, 20, 30, 40, 50]), bitDepth: 8 as const };
    const s = downscaleGrey(img, 2);
    expect([s.width, s.height]).toEqual([2, 1]);
    expect([...s.data]).toEqual([20, 35]);
  });
  it('preview settings divide lengths by the factor and keep block sizes odd', () => {
    const s = scaleSettings({ umPerPx: 0.5, minCellAreaPx: 400, walls: { smoothSigmaPx: 2, adaptiveBlockPx: 51, seedErodePx: 4, flattenRadiusPx: -1 } }, 4);
    expect(s.umPerPx).toBe(2);
    expect(s.minCellAreaPx).toBe(25);
    expect(s.walls?.smoothSigmaPx).toBe(0.5);
    expect((s.walls?.adaptiveBlockPx ?? 0) % 2).toBe(1);
    expect(s.walls?.flattenRadiusPx).toBe(-1);
    expect(s.walls?.seedErodePx).toBe(1);
    // The size hint and the split dynamic are lengths too (derived: a 4× smaller preview has 4× smaller cells);
    // -1 (auto) and 0 (never split) keep their meaning.
    const h = scaleSettings({ walls: { cellDiameterPx: 40, markerDynamicPx: 6 } }, 4);
    expect([h.walls?.cellDiameterPx, h.walls?.markerDynamicPx]).toEqual([10, 1.5]);
    const auto = scaleSettings({ walls: { cellDiameterPx: -1, markerDynamicPx: 0 } }, 4);
    expect([auto.walls?.cellDiameterPx, auto.walls?.markerDynamicPx]).toEqual([-1, 0]);
  });
  it('lists each buffer to transfer once', () => {
    const a = new Float64Array(4);
    expect(collectTransfers({ a, b: { c: a, d: [new Int32Array(2)] } }).length).toBe(2);
    expect(baseName('x/y/grains.tif')).toBe('grains');
    expect(baseName('noext')).toBe('noext');
  });
});

describe('cells table', () => {
  const cols = { area: new Float64Array([3, 1, NaN, 2]) };
  it('sorts by a column, NaN last, ties in cell order', () => {
    expect([...sortedRows(cols, 4, 'area', false)]).toEqual([1, 3, 0, 2]);
    expect([...sortedRows(cols, 4, 'area', true)]).toEqual([0, 3, 1, 2]);
    expect([...sortedRows(cols, 4, null, false)]).toEqual([0, 1, 2, 3]);
  });
  it('renders only the rows in view: 20 000 rows, a 400 px view of 24 px rows', () => {
    const [a, b] = visibleWindow(240_000, 400, 24, 20_000);
    expect(a).toBe(10_000 - 8);
    expect(b - a).toBeLessThan(40);
    expect(visibleWindow(1e9, 400, 24, 20_000)[1]).toBe(20_000);
  });
});

describe('typed pixel size', () => {
  it('accepts positive numbers (a decimal comma too) and names what is wrong otherwise', () => {
    expect(parsePixelSize('0.5')).toEqual({ value: 0.5 });
    expect(parsePixelSize(' 1,25 ')).toEqual({ value: 1.25 });
    expect(parsePixelSize('0')).toEqual({ error: expect.stringMatching(/above 0/) });
    expect(parsePixelSize('-1')).toEqual({ error: expect.stringMatching(/above 0/) });
    expect(parsePixelSize('abc')).toEqual({ error: expect.stringMatching(/not a number/) });
    expect(parsePixelSize('')).toEqual({ error: expect.stringMatching(/Type a pixel size/) });
    expect(parsePixelSize('Infinity')).toEqual({ error: expect.stringMatching(/not a number/) });
  });
  it('formats values for the table', () => {
    expect(formatValue(12.3456, 'area_px2')).toBe('12.35');
    expect(formatValue(7, 'neighbours')).toBe('7');
    expect(formatValue(NaN, 'x')).toBe('–');
    expect(formatP(0.0004)).toBe('< 0.001');
  });
});

describe('worker helpers against their plain statements', () => {
  // Straightforward versions of the definitions above (derived), pixel by pixel with every bounds test.
  const plainOutline = (l: LabelImage): number[] => {
    const out: number[] = [];
    for (let y = 0; y < l.height; y++) for (let x = 0; x < l.width; x++) {
      const i = y * l.width + x;
      const v = l.labels[i]!;
      const edge = v !== 0 && (x === 0 || y === 0 || x === l.width - 1 || y === l.height - 1
        || l.labels[i - 1] !== v || l.labels[i + 1] !== v || l.labels[i - l.width] !== v || l.labels[i + l.width] !== v);
      out.push(...(edge ? [240, 228, 66, 255] : [0, 0, 0, 0]));
    }
    return out;
  };
  const plainBoxes = (l: LabelImage): number[] => {
    const b: number[] = [];
    for (let c = 1; c <= l.count; c++) {
      let x0 = 2 ** 31 - 1, y0 = 2 ** 31 - 1, x1 = -1, y1 = -1;
      for (let i = 0; i < l.labels.length; i++) {
        if (l.labels[i] !== c) continue;
        const x = i % l.width, y = Math.floor(i / l.width);
        x0 = Math.min(x0, x); y0 = Math.min(y0, y); x1 = Math.max(x1, x + 1); y1 = Math.max(y1, y + 1);
      }
      b.push(x0, y0, x1, y1);
    }
    return b;
  };
  let seed = 5;
  const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
  for (const [w, h] of [[1, 1], [1, 7], [9, 1], [2, 2], [13, 11], [40, 3]] as const) {
    it(`random ${w} x ${h} label image: the same outline pixels and boxes`, () => {
      const count = 4;
      // Runs of labels so that cells are not all single pixels; a missing label keeps its empty box.
      const labels = new Int32Array(w * h);
      let v = 0;
      for (let i = 0; i < labels.length; i++) { if (rnd() < 0.3) v = Math.floor(rnd() * count); labels[i] = v === 3 ? 0 : v; }
      const l: LabelImage = { width: w, height: h, labels, count };
      expect(Array.from(outlineRgba(l))).toEqual(plainOutline(l));
      expect(Array.from(cellBoxes(l))).toEqual(plainBoxes(l));
    });
  }
  it('the display image of an 8-bit ramp: grey in R, G and B, opaque, from the stretch table', () => {
    const data = Uint8Array.from({ length: 256 * 4 }, (_, i) => i % 256);
    const rgba = displayRgba({ width: 1024, height: 1, data, bitDepth: 8 });
    for (let i = 0; i < data.length; i++) {
      expect([rgba[4 * i + 1], rgba[4 * i + 2], rgba[4 * i + 3]]).toEqual([rgba[4 * i], rgba[4 * i], 255]);
    }
    // The 0.1 % tails of 1 024 pixels are one pixel each: level 0 stays 0, 255 stays 255, 128 maps to 128.
    expect([rgba[0], rgba[4 * 128], rgba[4 * 255]]).toEqual([0, 128, 255]);
  });
});
