/**
 * End-to-end test of the Kinetics panel in headless Chromium: a short simulated transformation (the core's
 * simulateGrowth, planar site saturation) is added as PNG frames, the panel runs the series, and its n, k,
 * kinetics.csv and kinetics.json are checked against `tessellab kinetics` run in-process on the same files
 * and times. The simulation's own truth (n = 2, k = πλv², docs/check-values.md §4, derived) checks both.
 */
import { describe, it, expect, beforeAll, afterAll, vi } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BrowserContext, Page, Route } from 'playwright-core';
import type { PreviewServer } from 'vite';
import { SCREENSHOTS, launch, serveApp } from './harness';
import { main } from '../../src/cli/main';
import { simulateGrowth } from '../../src/core/kinetics/simulate';
import { encodePng } from '../../src/core/image/encode';

let server: PreviewServer;
let context: BrowserContext;
let closeBrowser: () => Promise<void>;
let page: Page;
let work: string;
let files: string[];
let cliOut: string;
const pageErrors: string[] = [];
const times = [3, 5, 7, 10, 13, 17, 22, 28];
let truth: { n: number; k: number };

type Win = { __tessellab: { entries: { name: string; status: string; count: number | null; error: string | null }[] } };

/** Paths where two JSON values differ (numbers compared to 1e-9 relative: Node's and the browser's maths may differ in the last bits). */
function closeJson(a: unknown, b: unknown, path = ''): string[] {
  if (typeof a === 'number' && typeof b === 'number') return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b)) ? [] : [path];
  if (typeof a !== 'object' || a === null || typeof b !== 'object' || b === null) return a === b ? [] : [path];
  if (Array.isArray(a) !== Array.isArray(b)) return [path];
  const ka = Object.keys(a), kb = Object.keys(b);
  if (ka.join() !== kb.join()) return [`${path} (keys)`];
  return ka.flatMap((k) => closeJson((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`));
}

async function cli(args: string[]): Promise<number> {
  const e = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
  const o = vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
  try { return await main(args); } finally { e.mockRestore(); o.mockRestore(); }
}

async function download(testId: string): Promise<{ name: string; bytes: Buffer }> {
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
  return { name: d.suggestedFilename(), bytes: readFileSync(await d.path()) };
}

async function settled(name: string): Promise<{ status: string; count: number | null; error: string | null }> {
  await page.waitForFunction((n) => {
    const e = (globalThis as unknown as Win).__tessellab.entries.find((x) => x.name === n);
    return !!e && (e.status === 'done' || e.status === 'error');
  }, name);
  return page.evaluate((n) => {
    const e = (globalThis as unknown as Win).__tessellab.entries.find((x) => x.name === n)!;
    return { status: e.status, count: e.count, error: e.error };
  }, name);
}

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  work = mkdtempSync(join(tmpdir(), 'tessellab-e2e-kinetics-'));
  // Site saturation: λ = 2e-3 px⁻², v = 0.7 px per min, so k = πλv² ≈ 3.08e-3 min⁻², t½ ≈ 15 min.
  const sim = simulateGrowth({ width: 256, height: 256, mode: 'site-saturation', density: 2e-3, speed: 0.7, times, seed: 8 });
  truth = { n: sim.truth.n, k: sim.truth.k };
  files = sim.frames.map((f, i) => {
    const p = join(work, `growth_${String(i + 1).padStart(2, '0')}.png`);
    writeFileSync(p, encodePng({ width: f.width, height: f.height, data: f.data as Uint8Array, channels: 1, bitDepth: 8 }));
    return p;
  });
  cliOut = join(work, 'cli');
  expect(await cli(['kinetics', ...files, '--times', times.join(','), '--time-unit', 'min', '--final-analysis', '--out', cliOut])).toBe(0);
  // Its own build folder, so this file never races the other e2e file's build.
  const served = await serveApp(join(tmpdir(), 'tessellab-e2e-kinetics-dist'));
  server = served.server;
  const b = await launch();
  context = b.context;
  closeBrowser = b.close;
  page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => pageErrors.push(e.message));
  await page.goto(served.url);
});

afterAll(async () => {
  await closeBrowser?.();
  await server?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

describe('Kinetics panel', () => {
  it('fits the series to the command line\'s n and k and writes its files', async () => {
    await page.waitForFunction(() => (globalThis as unknown as Win).__tessellab.entries.length > 0, null);
    await page.getByRole('tab', { name: 'Kinetics' }).click();
    // Frames are added as frames of the series: ticked, kept, and not analysed as images of their own.
    await page.getByTestId('kinetics-add-frames').setInputFiles(files);
    await page.waitForFunction((n) => (globalThis as unknown as Win).__tessellab.entries.length >= n, files.length + 1);
    const pick = page.getByTestId('kinetics-images');
    for (const f of files) expect(await pick.getByLabel(new RegExp(f.split('/').pop() as string)).isChecked()).toBe(true);
    await page.getByTestId('kinetics-times').fill(times.join(', '));
    await page.getByTestId('kinetics-unit').fill('min');
    await page.getByTestId('kinetics-run').click();
    await page.waitForSelector('[data-testid=kinetics-n]');
    await page.waitForSelector('[data-testid=kinetics-plot-avrami] .main-svg');
    const frameState = await page.evaluate((names) => (globalThis as unknown as Win).__tessellab.entries.filter((e) => names.includes(e.name)).map((e) => ({ status: e.status, count: e.count, error: e.error })), files.map((f) => f.split('/').pop() as string));
    expect(frameState).toEqual(files.map(() => ({ status: 'frame', count: null, error: null })));

    const ref = JSON.parse(readFileSync(join(cliOut, 'kinetics.json'), 'utf8')) as { avrami: { n: number; k: number; method: string }; frames: unknown[] };
    const shownN = Number(await page.getByTestId('kinetics-n').textContent());
    const shownK = Number((await page.getByTestId('kinetics-k').textContent())?.split(' ')[0]);
    // The panel shows 5 significant digits of the same numbers the command line writes.
    expect(Math.abs(shownN - ref.avrami.n)).toBeLessThanOrEqual(5e-5 * Math.abs(ref.avrami.n));
    expect(Math.abs(shownK - ref.avrami.k)).toBeLessThanOrEqual(5e-5 * Math.abs(ref.avrami.k));
    expect(await page.getByTestId('kinetics-fit-method').textContent()).toMatch(/nonlinear/);
    expect(ref.avrami.method).toBe('nonlinear');
    // derived (docs/check-values.md §4): site saturation gives n = 2 and k = πλv²; a 256 px field holds ~130 nuclei, so loose bounds.
    expect(Math.abs(ref.avrami.n - truth.n)).toBeLessThan(0.25);
    expect(ref.avrami.k / truth.k).toBeGreaterThan(0.5);
    expect(ref.avrami.k / truth.k).toBeLessThan(2);
    expect(await page.getByTestId('kinetics-filmstrip').locator('figure').count()).toBe(times.length);
    // The fit's frames and the range of their fractions, as fitted: the nonlinear fit takes every frame.
    const fr = (ref.frames as { fraction: number }[]).map((f) => f.fraction);
    const fitted = (await page.getByTestId('kinetics-fitted').textContent()) as string;
    expect(fitted).toContain(`all ${times.length} frames fitted (f from ${Math.min(...fr).toFixed(3)} to ${Math.max(...fr).toFixed(3)})`);

    const csv = await download('kinetics-export-kinetics.csv');
    expect(csv.name).toBe('kinetics.csv');
    expect(csv.bytes.toString('utf8')).toBe(readFileSync(join(cliOut, 'kinetics.csv'), 'utf8'));
    const json = await download('kinetics-export-kinetics.json');
    expect(closeJson(JSON.parse(json.bytes.toString('utf8')), ref)).toEqual([]);
    await page.getByTestId('kinetics-filmstrip').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(SCREENSHOTS, '20-kinetics.png') });
    await page.getByTestId('kinetics-plot-fraction').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(SCREENSHOTS, '21-kinetics-plots.png') });
  });

  it('a reload keeps the panel\'s choices and its result, and a plot saved before the plots are drawn is saved once they are', async () => {
    const before = await page.getByTestId('kinetics-n').textContent();
    // The plotting library is held back until the PNG button has been pressed.
    const held: Route[] = [];
    await context.route('**/assets/plotly*.js', (r) => { held.push(r); });
    await page.reload();
    await page.waitForFunction(() => (globalThis as unknown as Win).__tessellab?.entries.length > 0, null);
    await page.getByRole('tab', { name: 'Kinetics' }).click();
    await expect.poll(() => page.getByTestId('kinetics-n').count()).toBe(1);
    expect(await page.getByTestId('kinetics-n').textContent()).toBe(before);
    const download = page.waitForEvent('download');
    await page.getByTestId('kinetics-save-fraction-png').click();
    for (const r of held.splice(0)) await r.continue();
    await context.unroute('**/assets/plotly*.js');
    const png = await download;
    expect(png.suggestedFilename()).toBe('kinetics.fraction.png');
    expect(readFileSync(await png.path()).subarray(1, 4).toString('latin1')).toBe('PNG');
    expect(await page.getByTestId('kinetics-times').inputValue()).toBe(times.join(', '));
    expect(await page.getByTestId('kinetics-unit').inputValue()).toBe('min');
    expect(await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.filter((e) => e.status === 'frame').length)).toBe(times.length);
  });

  it('times that do not increase show their message in the panel, and the earlier result stays', async () => {
    const bad = [...times];
    [bad[2], bad[3]] = [bad[3]!, bad[2]!];
    await page.getByTestId('kinetics-times').fill(bad.join(', '));
    await page.getByTestId('kinetics-run').click();
    await expect.poll(() => page.getByTestId('kinetics-error').textContent()).toMatch(/Times must increase from frame to frame: frame 4 \(t = 7\) after frame 3 \(t = 10\)/);
    expect(await page.getByTestId('kinetics-n').count()).toBe(1);
    await page.getByTestId('kinetics-error').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(SCREENSHOTS, '22-kinetics-bad-times.png') });
    await page.getByTestId('kinetics-times').fill(times.join(', '));
  });

  it('the final frame becomes a walls entry with the command line\'s cell count, and the Randomness panel reads it', async () => {
    await page.getByTestId('kinetics-final').click();
    await expect.poll(() => page.getByTestId('kinetics-final-message').count()).toBe(1);
    const name = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.at(-1)!.name);
    expect(name).toMatch(/final-mosaic\.png$/);
    const s = await settled(name);
    expect(s.error).toBeNull();
    expect(s.status).toBe('done');
    const ref = JSON.parse(readFileSync(join(cliOut, 'final.summary.json'), 'utf8')) as { summary: { cells: { count: number } } };
    expect(s.count).toBe(ref.summary.cells.count);
    // Detection does not apply to a mosaic: its controls are off, and a detection change keeps the mosaic.
    await page.getByTestId('entry').filter({ hasText: name }).locator('button.pick').click();
    await page.getByRole('tab', { name: 'Detect' }).click();
    await expect.poll(() => page.getByTestId('mosaic-note').count()).toBe(1);
    expect(await page.locator('#w-smooth').isDisabled()).toBe(true);
    type Mosaic = { __tessellab: { entries: { name: string; result: unknown; error: string | null }[]; changed(e: unknown, what: string): void }; __before?: unknown };
    await page.evaluate((n) => {
      const g = globalThis as unknown as Mosaic;
      const e = g.__tessellab.entries.find((x) => x.name === n)!;
      g.__before = e.result;
      g.__tessellab.changed(e, 'segment');
    }, name);
    // Wait for the new result (the entry is analysed again) or an error, then read it.
    await page.waitForFunction((n) => {
      const g = globalThis as unknown as Mosaic;
      const e = g.__tessellab.entries.find((x) => x.name === n)!;
      return (e.result !== g.__before && e.result !== null) || e.error !== null;
    }, name);
    const again = await settled(name);
    expect(again.error).toBeNull();
    expect(again.status).toBe('done');
    expect(again.count).toBe(ref.summary.cells.count);
    await page.getByRole('tab', { name: 'Randomness' }).click();
    await expect.poll(() => page.getByTestId('verdict').textContent()).toMatch(/more regular than random|consistent with random seeding|more irregular than random/);
    await page.screenshot({ path: join(SCREENSHOTS, '23-kinetics-final-randomness.png') });
    expect(pageErrors).toEqual([]);
  });
});
