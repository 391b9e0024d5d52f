import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { command } from '../../../src/cli/commands/kinetics';
import { SeriesError } from '../../../src/core/errors';
import { encodePng } from '../../../src/core/image/encode';
import { simulateGrowth } from '../../../src/core/kinetics/index';

const times = [2, 3, 4, 5, 6.5, 8, 10, 12.5, 15, 18, 22, 26, 31];
let dir: string;
let files: string[];

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tessellab-kinetics-'));
  const { frames } = simulateGrowth({ width: 320, height: 320, mode: 'site-saturation', density: 2e-3, speed: 0.7, times, seed: 8 });
  files = [];
  for (const [i, f] of frames.entries()) {
    const name = join(dir, `quench_${String(i + 1).padStart(2, '0')}_t${times[i]}.png`);
    await writeFile(name, encodePng({ width: f.width, height: f.height, data: f.data, channels: 1, bitDepth: 8 }));
    files.push(name);
  }
  await writeFile(join(dir, 'times.csv'), 'file,time\n' + files.map((f, i) => `${f.split('/').pop()},${times[i]}`).join('\n') + '\n');
  vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
  vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
});
/** Indices of the frames whose fraction lies strictly inside (lo, hi). */
function framesInRange(json: { frames: { fraction: number }[] }, lo: number, hi: number): number[] {
  return json.frames.flatMap((f, j) => (f.fraction > lo && f.fraction < hi ? [j] : []));
}

afterAll(async () => {
  vi.restoreAllMocks();
  await rm(dir, { recursive: true, force: true });
});

describe('tessellab kinetics', () => {
  it('writes kinetics.csv and kinetics.json from PNG frames with --times', async () => {
    const out = join(dir, 'out-times');
    expect(await command.run([...files, '--times', times.join(','), '--out', out, '--time-unit', 'min'])).toBe(0);
    const csv = (await readFile(join(out, 'kinetics.csv'), 'utf8')).trim().split('\n');
    expect(csv[0]).toBe('frame,file,time_min,fraction,domains,mean_domain_area_px2,new_domains');
    expect(csv).toHaveLength(times.length + 1);
    expect(csv[1]!.startsWith('1,quench_01_t2.png,2,')).toBe(true);
    const json = JSON.parse(await readFile(join(out, 'kinetics.json'), 'utf8'));
    for (const key of ['n', 'k', 'tHalf', 'r2']) expect(typeof json.avrami[key]).toBe('number');
    expect(json.avrami.ci95.n).toHaveLength(2);
    expect(json.fit.method).toBe('nonlinear');
    expect(json.frames).toHaveLength(times.length);
    // The settings it records are the ones the fit used (frames with fitMin < f < fitMax).
    expect(json.fit.avramiPlot.frames).toEqual(framesInRange(json, json.settings.kinetics.fitMin, json.settings.kinetics.fitMax));
    // derived: site saturation, n = 2 (docs/check-values.md §4); a small field, so a loose tolerance
    expect(Math.abs(json.avrami.n - 2)).toBeLessThan(0.2);
    const settings = JSON.parse(await readFile(join(out, 'settings.json'), 'utf8'));
    expect(settings.kinetics.threshold).toBe('otsu');
  });

  it('reads the same times from a CSV of file,time and from the numbers in the file names', async () => {
    const a = join(dir, 'out-csv');
    const b = join(dir, 'out-names');
    expect(await command.run([...files, '--times-csv', join(dir, 'times.csv'), '--out', a])).toBe(0);
    // the file names hold two numbers each; the last is the time, and the glob order is restored by time
    expect(await command.run([...files.slice().reverse(), '--out', b])).toBe(0);
    const ja = JSON.parse(await readFile(join(a, 'kinetics.json'), 'utf8'));
    const jb = JSON.parse(await readFile(join(b, 'kinetics.json'), 'utf8'));
    expect(ja.frames.map((f: { time: number }) => f.time)).toEqual(times);
    expect(jb.frames.map((f: { time: number }) => f.time)).toEqual(times);
    expect(jb.avrami.n).toBe(ja.avrami.n);
  });

  it('passes settings on: manual threshold, fit method, fit range', async () => {
    const out = join(dir, 'out-set');
    expect(await command.run([...files, '--times', times.join(','), '--out', out, '--threshold', '120', '--fit-method', 'avrami-plot', '--fit-min', '0.05'])).toBe(0);
    const json = JSON.parse(await readFile(join(out, 'kinetics.json'), 'utf8'));
    expect(json.phase).toEqual({ threshold: 120, source: 'manual', phase: 'bright' });
    expect(json.fit.method).toBe('avrami-plot');
    expect(json.avrami.method).toBe('avrami-plot');
    // --fit-min 0.05 changes which frames the fit takes: exactly those with 0.05 < f < 0.98 (default upper end).
    expect(json.fit.avramiPlot.frames).toEqual(framesInRange(json, 0.05, 0.98));
    expect(framesInRange(json, 0.05, 0.98)).not.toEqual(framesInRange(json, 0.02, 0.98));
  });

  it('--final-analysis measures the mosaic of the last frame as a walls pattern', async () => {
    const out = join(dir, 'out-final');
    expect(await command.run([...files, '--times', times.join(','), '--out', out, '--final-analysis'])).toBe(0);
    const fin = JSON.parse(await readFile(join(out, 'final.summary.json'), 'utf8'));
    const json = JSON.parse(await readFile(join(out, 'kinetics.json'), 'utf8'));
    expect(fin.summary.cells.count).toBe(json.final.domains);
    expect(fin.nuclei).toHaveLength(json.final.domains);
    // derived: one domain per nucleus (≈ 205 nuclei in the field), give or take domains cut by the periodic border
    expect(Math.abs(json.final.domains / (2e-3 * 320 * 320) - 1)).toBeLessThan(0.15);
    const png = await readFile(join(out, 'final.labels.png'));
    expect(png.subarray(1, 4).toString()).toBe('PNG');
  });

  it('bad input: a one-line typed error', async () => {
    await expect(command.run([...files.slice(0, 3), '--times', '1,3,2'])).rejects.toThrow(SeriesError);
    await expect(command.run([...files.slice(0, 3), '--times', '1,2'])).rejects.toThrow(/2 times for 3 frames/);
    await expect(command.run([...files, '--times', times.join(','), '--fit-min', '2'])).rejects.toThrow(/--fit-min must be a number from 0 to 1/);
  });
});
