/**
 * Gathering and running a kinetics series (src/app/series.ts), the steps the command line and the worker
 * share: frames and their sources, times from a list, a CSV or the file names (which fix the order), the
 * pixel size of the settings else the files'. Expected orders and names follow from the inputs written here.
 */
import { describe, expect, it } from 'vitest';
import type { OpenedFile, OpenedImage } from '../../../src/app/open';
import { analyseSeries, gatherSeries, seriesFiles } from '../../../src/app/series';
import { SeriesError } from '../../../src/core/errors';
import { simulateGrowth } from '../../../src/core/kinetics/index';
import { resolveSettings } from '../../../src/core/settings';
import type { GreyImage } from '../../../src/core/types';

function grey(v: number): GreyImage {
  return { width: 16, height: 16, data: new Uint8Array(256).fill(v), bitDepth: 8 };
}

function image(name: string, pages: GreyImage[], umPerPxFromFile: number | null = null): OpenedImage {
  return { kind: 'image', name, image: pages[0]!, pages, width: 16, height: 16, umPerPxFromFile, wasColour: false };
}

describe('gatherSeries', () => {
  it('puts frames in the order of the times in their names (t9 before t10), and says so', () => {
    const [a, b, c] = [grey(10), grey(9), grey(11)];
    const s = gatherSeries([image('q_t10.png', [a]), image('q_t9.png', [b]), image('q_t11.png', [c])], { kind: 'names' });
    expect(s.sources).toEqual(['q_t9.png', 'q_t10.png', 'q_t11.png']);
    expect(s.times).toEqual([9, 10, 11]);
    expect(s.frames).toEqual([b, a, c]);
    expect(s.frames[0]).toBe(b);
    expect(s.reordered).toBe(true);
  });

  it('keeps the order given for typed times and names the pages of a multi-page file', () => {
    const pages = [grey(1), grey(2), grey(3)];
    const s = gatherSeries([image('stack.tif', pages)], { kind: 'list', text: '0, 30; 60' });
    expect(s.sources).toEqual(['stack.tif[1]', 'stack.tif[2]', 'stack.tif[3]']);
    expect(s.times).toEqual([0, 30, 60]);
    expect(s.frames).toEqual(pages);
    expect(s.reordered).toBe(false);
  });

  it('reads times from a CSV of file,time matched by name, in the order given', () => {
    const s = gatherSeries([image('b.png', [grey(1)]), image('a.png', [grey(2)])], { kind: 'csv', text: 'file,time\na.png,5\nb.png,2\n' });
    expect(s.sources).toEqual(['b.png', 'a.png']);
    expect(s.times).toEqual([2, 5]);
    expect(s.reordered).toBe(false);
  });

  it('takes the pixel size of the first file that has one', () => {
    const s = gatherSeries([image('t1.png', [grey(1)]), image('t2.png', [grey(2)], 0.8), image('t3.png', [grey(3)], 0.3)], { kind: 'names' });
    expect(s.fileUmPerPx).toBe(0.8);
  });

  it('refuses a point set with a typed error naming it', () => {
    const pts: OpenedFile = { kind: 'points', name: 'p.csv', points: new Float64Array([1, 2]), width: 2, height: 3, umPerPxFromFile: null };
    expect(() => gatherSeries([image('t1.png', [grey(1)]), pts], { kind: 'names' })).toThrow(SeriesError);
    expect(() => gatherSeries([pts], { kind: 'names' })).toThrow(/p\.csv is a point set/);
  });
});

describe('analyseSeries', () => {
  const times = [2, 4, 6, 9, 13, 18, 25];
  const { frames } = simulateGrowth({ width: 160, height: 160, mode: 'site-saturation', density: 3e-3, speed: 0.8, times, seed: 5 });
  const files = frames.map((f, i) => image(`f_t${times[i]}.png`, [f], 0.5));

  it('uses the settings\' pixel size, else the files\', and writes the files of the run', async () => {
    const series = gatherSeries(files, { kind: 'names' });
    const fromFile = await analyseSeries(series, resolveSettings({}), { timeUnit: 'min' });
    expect(fromFile.settings.umPerPx).toBe(0.5);
    expect(fromFile.result.timeUnit).toBe('min');
    expect(fromFile.result.frames.map((f) => f.source)).toEqual(series.sources);
    const own = await analyseSeries(series, resolveSettings({ umPerPx: 0.2 }));
    expect(own.settings.umPerPx).toBe(0.2);
    const out = seriesFiles(fromFile);
    expect(out.map((f) => f.name)).toEqual(['kinetics.csv', 'kinetics.json', 'settings.json']);
    expect(JSON.parse(out[2]!.text).umPerPx).toBe(0.5);
    expect(out[0]!.text.split('\n')[0]).toContain('time_min');
  });
});
