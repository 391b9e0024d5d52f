import { beforeAll, describe, expect, it } from 'vitest';
import { SeriesError, SettingsError } from '../../../src/core/errors';
import { analyzeSeries, simulateGrowth } from '../../../src/core/kinetics/index';
import type { GreyImage } from '../../../src/core/types';

// A small series is enough for the messages: 256 x 256 px, about 260 nuclei.
const times = [2, 4, 6, 8, 10, 13, 16, 20, 25];
let frames: GreyImage[];
beforeAll(() => {
  frames = simulateGrowth({ width: 256, height: 256, mode: 'site-saturation', density: 4e-3, speed: 0.5, times, seed: 3 }).frames;
});

const uniform = (level: number, w = 64, h = 64): GreyImage => ({ width: w, height: h, data: new Uint8Array(w * h).fill(level), bitDepth: 8 });

describe('kinetics: bad input gets a SeriesError that says what to do', () => {
  it('the small series itself is fine', async () => {
    const r = await analyzeSeries(frames, times, {});
    expect(r.frames).toHaveLength(times.length);
    expect(r.avrami.n).toBeGreaterThan(1.5);
  });

  it('fewer than three frames', async () => {
    await expect(analyzeSeries(frames.slice(0, 2), times.slice(0, 2), {})).rejects.toThrow(SeriesError);
    await expect(analyzeSeries(frames.slice(0, 2), times.slice(0, 2), {})).rejects.toThrow(/has 2 frames; kinetics needs at least 3/);
  });

  it('fewer than three usable frames: says how many have 0.02 < f < 0.98', async () => {
    // frames 1 and 9 are in range at a fit range made narrow around the middle ones
    const r = await analyzeSeries(frames, times, {});
    const f = r.frames.map((x) => x.fraction);
    const lo = (f[3]! + f[4]!) / 2;
    const hi = (f[4]! + f[5]!) / 2;
    await expect(analyzeSeries(frames, times, { kinetics: { fitMin: lo, fitMax: hi } })).rejects.toThrow(
      /Only 1 of 9 frames have .* < f < .* \(frame 5\); the fit needs at least 3/,
    );
  });

  it('times missing, of the wrong count, or not increasing', async () => {
    await expect(analyzeSeries(frames, times.slice(0, 8), {})).rejects.toThrow(/8 times for 9 frames/);
    const withNaN = times.slice();
    withNaN[4] = Number.NaN;
    await expect(analyzeSeries(frames, withNaN, {})).rejects.toThrow(/time of frame 5 is missing/);
    const swapped = times.slice();
    swapped[3] = 5;
    await expect(analyzeSeries(frames, swapped, {})).rejects.toThrow(/Times must increase.*frame 4 \(t = 5\) after frame 3 \(t = 6\)/);
  });

  it('frames of different sizes', async () => {
    const mixed = frames.slice(0, 3).concat([uniform(60, 128, 256)]);
    await expect(analyzeSeries(mixed, times.slice(0, 4), {})).rejects.toThrow(/Frame 4 is 128 x 256 px but frame 1 is 256 x 256 px/);
  });

  it('a fraction that decreases: names the frames, and fits anyway when allowed', async () => {
    const shuffled = frames.slice();
    shuffled[5] = frames[3]!;
    await expect(analyzeSeries(shuffled, times, {})).rejects.toThrow(/fraction decreases: frame 6 \(f = .*\) after frame 5/);
    const r = await analyzeSeries(shuffled, times, {}, { allowDecreasing: true });
    expect(r.warnings.join(' ')).toMatch(/frame 6 .* fitted anyway/);
    expect(Number.isFinite(r.avrami.n)).toBe(true);
  });

  it('f = 0 everywhere and f = 1 everywhere', async () => {
    const dark = [uniform(50), uniform(52), uniform(51)];
    await expect(analyzeSeries(dark, [1, 2, 3], { kinetics: { threshold: 'manual', manualThreshold: 128, phase: 'bright' } })).rejects.toThrow(
      /Every frame is untransformed \(f = 0\) at threshold 128 \(bright phase\)/,
    );
    await expect(analyzeSeries(dark, [1, 2, 3], { kinetics: { threshold: 'manual', manualThreshold: 20, phase: 'bright' } })).rejects.toThrow(
      /Every frame is fully transformed \(f = 1\)/,
    );
    const jump = [uniform(50), uniform(50), uniform(200), uniform(200)];
    await expect(analyzeSeries(jump, [1, 2, 3, 4], { kinetics: { threshold: 'manual', manualThreshold: 128, phase: 'bright' } })).rejects.toThrow(
      /either untransformed or fully transformed/,
    );
  });

  it('a field outside the frames, and bad settings', async () => {
    await expect(analyzeSeries(frames, times, {}, { field: { x0: 0, y0: 0, x1: 300, y1: 100 } })).rejects.toThrow(/does not fit the 256 x 256 px frames/);
    await expect(analyzeSeries(frames, times, { kinetics: { fitMethod: 'spline' as never } })).rejects.toThrow(SettingsError);
    await expect(analyzeSeries(frames, times, { kinetics: { fitMin: 0.9, fitMax: 0.1 } })).rejects.toThrow(/fitMin must be below/);
  });
});

describe('kinetics: threshold and phase', () => {
  it('uses one threshold for the series and the phase that grows; a manual threshold and a dark phase work too', async () => {
    const r = await analyzeSeries(frames, times, {});
    expect(r.phase.source).toBe('otsu-last-frame');
    expect(r.phase.phase).toBe('bright');
    expect(r.phase.threshold).toBeGreaterThan(60);
    expect(r.phase.threshold).toBeLessThan(190);
    // inverted frames: the dark phase grows; the fractions are the same
    const inv = frames.map((f) => ({ ...f, data: (f.data as Uint8Array).map((x) => 255 - x) }));
    const ri = await analyzeSeries(inv, times, {});
    expect(ri.phase.phase).toBe('dark');
    ri.frames.forEach((fr, j) => expect(Math.abs(fr.fraction - r.frames[j]!.fraction)).toBeLessThan(1e-3));
    const rm = await analyzeSeries(frames, times, { kinetics: { threshold: 'manual', manualThreshold: 125 } });
    expect(rm.phase).toEqual({ threshold: 125, source: 'manual', phase: 'bright' });
  });

  it('16-bit frames give the same fractions as 8-bit ones', async () => {
    const wide = frames.map((f) => ({ width: f.width, height: f.height, bitDepth: 16 as const, data: Uint16Array.from(f.data, (x) => x * 257) }));
    const a = await analyzeSeries(frames, times, {});
    const b = await analyzeSeries(wide, times, {});
    b.frames.forEach((fr, j) => expect(fr.fraction).toBe(a.frames[j]!.fraction));
  });

  it('falls back to the first and last frames when the last frame is one phase', async () => {
    // completed series: the last frame is all transformed, its histogram has one mode
    const more = simulateGrowth({ width: 256, height: 256, mode: 'site-saturation', density: 4e-3, speed: 0.5, times: [...times, 60], seed: 3 }).frames;
    const r = await analyzeSeries(more, [...times, 60], {});
    expect(r.frames[r.frames.length - 1]!.fraction).toBe(1);
    expect(r.phase.source).toBe('otsu-first-and-last-frames');
    expect(r.phase.threshold).toBeGreaterThan(80);
    expect(r.phase.threshold).toBeLessThan(170);
    expect(r.warnings.join(' ')).toMatch(/one phase/);
  });
});
