/**
 * The application layer's analysis (src/app/analyse.ts): which pixel size and which calibration source
 * reach the core's pipeline (the settings' value, else the file's, else none), and the field crop of a
 * re-measure. The pipeline itself is replaced by a recorder here: what it computes is tested in the core.
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { OpenedImage, OpenedPoints } from '../../../src/app/open';
import type { GreyImage, LabelImage } from '../../../src/core/types';

const calls: { fn: string; args: unknown[] }[] = [];
vi.mock('../../../src/core/analyze', async (original) => {
  const real = await original<typeof import('../../../src/core/analyze')>();
  return {
    ...real,
    analyze: vi.fn(async (...args: unknown[]) => { calls.push({ fn: 'analyze', args }); return { summary: {} }; }),
    reanalyzeLabels: vi.fn(async (...args: unknown[]) => { calls.push({ fn: 'reanalyzeLabels', args }); return { summary: {} }; }),
  };
});

const { analyseFile, remeasure } = await import('../../../src/app/analyse');
const { calibrated } = await import('../../../src/app/calibration');
const { defaultSettings } = await import('../../../src/core/settings');
const { CalibrationError } = await import('../../../src/core/errors');

const img: GreyImage = { width: 40, height: 30, data: Uint16Array.from({ length: 1200 }, (_, i) => i), bitDepth: 16 };
const file = (umPerPxFromFile: number | null): OpenedImage => ({ kind: 'image', name: 'g.png', image: img, pages: [img], width: 40, height: 30, umPerPxFromFile, wasColour: false });
const points: OpenedPoints = { kind: 'points', name: 'p.csv', points: new Float64Array([1, 1, 5, 2, 3, 4]), width: 6, height: 5, umPerPxFromFile: null };

beforeEach(() => { calls.length = 0; });

describe('calibrated', () => {
  it('takes the settings\' pixel size over the file\'s, the file\'s over none', () => {
    const s = defaultSettings();
    expect(calibrated({ ...s, umPerPx: 0.3 }, 0.5)).toMatchObject({ settings: { umPerPx: 0.3 }, source: 'user' });
    expect(calibrated({ ...s, umPerPx: null }, 0.5)).toMatchObject({ settings: { umPerPx: 0.5 }, source: 'file' });
    expect(calibrated({ ...s, umPerPx: null }, null)).toMatchObject({ settings: { umPerPx: null }, source: 'none' });
  });
  it('refuses a settings value that is not a positive number, rather than use the file\'s', () => {
    expect(() => calibrated({ ...defaultSettings(), umPerPx: 0 }, 0.5)).toThrow(CalibrationError);
  });
});

describe('analyseFile', () => {
  it('gives the pipeline the pixel size used and its source', async () => {
    await analyseFile(file(0.5), { umPerPx: null });
    await analyseFile(file(0.5), { umPerPx: 0.25 });
    await analyseFile(file(null), {});
    const got = calls.map((c) => [(c.args[1] as { umPerPx: number | null }).umPerPx, (c.args[2] as { calibrationSource?: string }).calibrationSource]);
    expect(got).toEqual([[0.5, 'file'], [0.25, 'user'], [null, 'none']]);
    expect(calls[0]!.args[0]).toEqual({ kind: 'image', image: img, name: 'g.png' });
  });

  it('analyses a point set in its field, with no calibration source (a points file carries no pixel size)', async () => {
    await analyseFile(points, { pattern: 'points', umPerPx: 2 });
    expect(calls[0]!.args[0]).toEqual({ kind: 'points', points: points.points, width: 6, height: 5, name: 'p.csv' });
    expect((calls[0]!.args[1] as { umPerPx: number }).umPerPx).toBe(2);
    expect((calls[0]!.args[2] as { calibrationSource?: string }).calibrationSource).toBeUndefined();
  });
});

describe('remeasure', () => {
  it('measures the edited labels on the image cropped to the field, with the same calibration', async () => {
    // two cells side by side in a 20 x 20 px field at (10, 5)
    const labels: LabelImage = { width: 20, height: 20, count: 2, labels: Int32Array.from({ length: 400 }, (_, i) => (i % 20 < 10 ? 1 : 2)) };
    await remeasure(file(0.5), labels, [{ kind: 'merge', a: 1, b: 2 }], { field: { x0: 10, y0: 5, x1: 30, y1: 25 } });
    const [edited, crop, settings, size, opts] = calls[0]!.args as [LabelImage, GreyImage, { umPerPx: number }, unknown, { calibrationSource: string }];
    expect(edited.count).toBe(1);
    expect(edited.labels.every((v) => v === 1)).toBe(true);
    // the field's pixels: in this image a pixel's value is its index y * 40 + x
    expect([crop.width, crop.height]).toEqual([20, 20]);
    const expected = Array.from({ length: 400 }, (_, i) => (5 + Math.floor(i / 20)) * 40 + 10 + (i % 20));
    expect(Array.from(crop.data)).toEqual(expected);
    expect(settings.umPerPx).toBe(0.5);
    expect(size).toEqual({ width: 40, height: 30 });
    expect(opts.calibrationSource).toBe('file');
  });
});
