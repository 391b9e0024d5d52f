/**
 * What a new user hit, each checked in headless Chromium on the built app: the Cells table's first row
 * under its header, images lost by a reload while others were being analysed, the header wrapping when
 * Cancel appears, the Bench's tool bars covering a layer at 1024 × 768 and its view not refitted after a
 * resize, the cell card covering the scale tool's instructions, an adaptive threshold read as "-1", and
 * one palette with a legend on the Bench and in the exports. Images come from the project's generator.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import type { PreviewServer } from 'vite';
import { SCREENSHOTS, launch, serveApp, screenshotsAt } from './harness';
import { wallsPng, type Fixture } from './fixtures';
import { withPhys } from '../unit/image/handmade';
import { GRAIN_COLOURS, LAYER_COLOURS } from '../../src/core/export/palette';

let server: PreviewServer;
let url = '';
let context: BrowserContext;
let closeBrowser: () => Promise<void>;
let page: Page;
let work: string;
let frames: Fixture[];
const pageErrors: string[] = [];

type Win = { __tessellab: { cvStatus: string; entries: { name: string; status: string; count: number | null; error: string | null }[] } };

async function settledAll(): Promise<{ name: string; status: string; error: string | null }[]> {
  await page.waitForFunction(() => {
    const a = (globalThis as unknown as Win).__tessellab;
    return !!a && a.entries.length > 0 && a.entries.every((e) => e.status === 'done' || e.status === 'error');
  }, null);
  return page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.map((e) => ({ name: e.name, status: e.status, error: e.error })));
}

async function selectEntry(name: string): Promise<void> {
  await page.getByTestId('entry').filter({ hasText: name }).locator('button.pick').click();
}

/** Records in one store of the session database. */
function storeCount(store: string): Promise<number> {
  return page.evaluate((s) => new Promise<number>((ok, fail) => {
    const req = indexedDB.open('tessellab');
    req.onerror = () => fail(req.error);
    req.onsuccess = () => {
      const db = req.result;
      const c = db.transaction(s).objectStore(s).count();
      c.onsuccess = () => { db.close(); ok(c.result); };
    };
  }), store);
}

async function box(sel: string): Promise<{ x: number; y: number; width: number; height: number }> {
  const b = await page.locator(sel).first().boundingBox();
  if (!b) throw new Error(`${sel} is not on screen`);
  return b;
}

function overlap(a: { x: number; y: number; width: number; height: number }, b: { x: number; y: number; width: number; height: number }): boolean {
  return a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
}

const shots = (name: string): Promise<void> => screenshotsAt(page, name);

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  work = mkdtempSync(join(tmpdir(), 'tessellab-e2e-defects-'));
  frames = [wallsPng(200, 560, 420, 31, work), wallsPng(200, 560, 420, 32, work), wallsPng(200, 560, 420, 33, work)];
  ({ url, server } = await serveApp(join(tmpdir(), 'tessellab-e2e-defects-dist')));
  const b = await launch();
  context = b.context;
  closeBrowser = b.close;
  page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => pageErrors.push(e.message));
  await page.goto(url);
  await settledAll();
});

afterAll(async () => {
  await closeBrowser?.();
  await server?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

describe('defects a new user hit', () => {
  it('the Cells table shows its first row below the header, and a click there selects that row\'s cell', async () => {
    await page.getByRole('tab', { name: 'Cells' }).click();
    for (const [w, h] of [[1280, 800], [1024, 768]] as const) {
      await page.setViewportSize({ width: w, height: h });
      const header = await box('[data-testid=cells-table] .header');
      const first = await box('[data-testid=cells-table] [role=row][aria-rowindex="2"]');
      expect(first.y, `first row at ${w}×${h}`).toBeGreaterThanOrEqual(header.y + header.height - 0.5);
    }
    await page.setViewportSize({ width: 1280, height: 800 });
    const first = await box('[data-testid=cells-table] [role=row][aria-rowindex="2"]');
    await page.mouse.click(first.x + 20, first.y + first.height / 2);
    await expect.poll(() => page.locator('[data-testid=cells-table] [role=row][aria-rowindex="2"]').getAttribute('aria-selected')).toBe('true');
    await shots('cells-table');
    await page.keyboard.press('Escape');
  });

  it('an adaptive threshold is reported as adaptive, not as "threshold -1"', async () => {
    await page.getByRole('tab', { name: 'Detect' }).click();
    await page.locator('#w-thr').selectOption('adaptive');
    await expect.poll(() => page.getByTestId('segment-used').textContent()).toMatch(/adaptive threshold/);
    expect(await page.getByTestId('segment-used').textContent()).not.toMatch(/-1/);
    await shots('detect-adaptive');
    await page.locator('#w-thr').selectOption('otsu');
    await expect.poll(() => page.getByTestId('segment-used').textContent()).toMatch(/threshold \d+ \(Otsu\)/);
    await settledAll();
    // The size hint: read from the image by default, and the value typed in is the one used.
    await expect.poll(() => page.getByTestId('cell-size-used').textContent()).toMatch(/read from the image/);
    await page.locator('#w-diam').fill('30');
    await page.locator('#w-diam').dispatchEvent('change');
    await expect.poll(() => page.getByTestId('cell-size-used').textContent()).toMatch(/used: 30 px.*as set/);
    await page.locator('#w-diam').fill('-1');
    await page.locator('#w-diam').dispatchEvent('change');
    await expect.poll(() => page.getByTestId('cell-size-used').textContent()).toMatch(/read from the image/);
    await settledAll();
  });

  it('the header stays on one line when Cancel appears, and images added before a reload all come back analysed', async () => {
    await page.setViewportSize({ width: 1280, height: 800 });
    const idle = await box('header');
    await page.getByTestId('file-input').setInputFiles(frames.map((f) => f.path));
    await page.getByRole('button', { name: 'Cancel' }).waitFor();
    const busy = await box('header');
    expect(Math.abs(busy.height - idle.height)).toBeLessThan(1);
    const cancel = await box('header >> role=button[name="Cancel"]');
    expect(cancel.y + cancel.height).toBeLessThanOrEqual(busy.y + busy.height + 0.5);
    await page.screenshot({ path: join(SCREENSHOTS, 'header-busy-1280x800.png') });
    // Every added image is recorded (after its bytes); reload while they are still being analysed.
    await page.waitForFunction(async (n) => {
      const count = await new Promise<number>((ok) => {
        const req = indexedDB.open('tessellab');
        req.onsuccess = () => { const db = req.result; const c = db.transaction('entries').objectStore('entries').count(); c.onsuccess = () => { db.close(); ok(c.result); }; };
        req.onerror = () => ok(0);
      });
      return count === n;
    }, 1 + frames.length, { polling: 50 });
    const statuses = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.map((e) => e.status));
    expect(statuses.filter((s) => s === 'queued' || s === 'opening' || s === 'analysing').length).toBeGreaterThan(0);
    expect(await storeCount('images')).toBe(1 + frames.length);
    await page.reload();
    const after = await settledAll();
    expect(after.map((e) => e.name).sort()).toEqual(['foam-random.png', ...frames.map((f) => f.name)].sort());
    expect(after.filter((e) => e.status !== 'done')).toEqual([]);
  });

  it('at 1024 × 768 no layer hides under the tool bar, the Bench refits after a resize, and the cell card leaves the scale tool\'s instructions free', async () => {
    await selectEntry(frames[0]!.name);
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.getByRole('button', { name: 'Fit' }).click();
    await page.setViewportSize({ width: 1024, height: 768 });
    const gap = await box('[data-testid=layers-toolbar] label:has-text("Largest gap")');
    const tools = await box('[data-testid=tools-toolbar]');
    expect(overlap(gap, tools)).toBe(false);
    await page.getByLabel('Largest gap').click({ timeout: 5000 }); // covered by a tool bar, it would never be clickable: an actionability check, not a speed check
    expect(await page.getByLabel('Largest gap').isChecked()).toBe(true);
    await page.getByLabel('Largest gap').click({ timeout: 5000 }); // covered by a tool bar, it would never be clickable: an actionability check, not a speed check
    // The Bench fits the image again: scale = min((w − 24) / W, (h − 24) / H) for its new size.
    const bench = await box('[data-testid=bench]');
    const want = Math.min((bench.width - 24) / 560, (bench.height - 24) / 420);
    await expect.poll(async () => Number(await page.getByTestId('bench').getAttribute('data-scale'))).toBeCloseTo(want, 6);
    await page.getByRole('button', { name: 'Scale line', exact: true }).click();
    await page.mouse.move(bench.x + bench.width / 2, bench.y + bench.height / 2);
    await page.mouse.move(bench.x + bench.width / 2 + 5, bench.y + bench.height / 2 + 5);
    await page.getByTestId('tool-hint').waitFor();
    expect(await page.getByTestId('hover').count()).toBe(0);
    const hint = await box('[data-testid=tool-hint]');
    expect(overlap(hint, tools)).toBe(false);
    await page.screenshot({ path: join(SCREENSHOTS, 'bench-scale-tool-1024x768.png') });
    await page.keyboard.press('Escape');
    await page.setViewportSize({ width: 1280, height: 800 });
  });

  it('one palette: the Bench\'s legend names the layers shown in their colours, and overlay.svg uses the same colours with the same legend', async () => {
    await page.getByRole('tab', { name: 'Export' }).click();
    const legend = page.getByTestId('bench-legend');
    await legend.waitFor();
    const items = await legend.locator('.item').evaluateAll((els) => els.map((el) => ({
      label: el.textContent?.trim(), colour: getComputedStyle(el.querySelector('.swatch') as Element).borderTopColor,
    })));
    const css = (hex: string) => { const n = parseInt(hex.slice(1), 16); return `rgb(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255})`; };
    expect(items).toEqual([
      { label: 'Outlines', colour: css(LAYER_COLOURS.outlines.colour) },
      { label: 'Voronoi', colour: css(LAYER_COLOURS.voronoi.colour) },
      { label: 'Centroids', colour: css(LAYER_COLOURS.centroids.colour) },
    ]);
    const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-overlay.svg').click()]);
    const svg = readFileSync(await d.path(), 'utf8');
    expect(svg).toMatch(new RegExp(`id="outlines"[^>]*stroke="${LAYER_COLOURS.outlines.colour}"`));
    expect(svg).toMatch(new RegExp(`id="voronoi"[^>]*stroke="${LAYER_COLOURS.voronoi.colour}"`));
    expect(svg).toMatch(new RegExp(`id="centroids"[^>]*stroke="${LAYER_COLOURS.centroids.colour}"`));
    expect(svg).toMatch(/<g id="legend"/);
    for (const l of ['Outlines', 'Voronoi', 'Centroids']) expect(svg).toContain(`>${l}</text>`);
    await shots('export-legend');
  });

  it('the grain size view shows only what the rating counted, with its legend, in the report\'s colours', async () => {
    await page.getByLabel('Add a sample image').selectOption('grains-calibrated.png');
    await settledAll();
    await selectEntry('grains-calibrated.png');
    await page.getByRole('tab', { name: 'Grain size' }).click();
    await page.getByTestId('grain-g').waitFor();
    const labels = await page.getByTestId('bench-legend').locator('.item').allTextContents();
    expect(labels.map((l) => l.trim())).toEqual(['Outlines', 'Test figure', 'Grain counted whole', 'Grain counted in part', 'Test lines', 'Boundary crossings']);
    const [popup] = await Promise.all([context.waitForEvent('page'), page.getByTestId('grain-report').click()]);
    await popup.waitForLoadState();
    const html = await popup.content();
    expect(html).toContain(`.fig{fill:none;stroke:${GRAIN_COLOURS.figure.colour}`);
    expect(html).toMatch(/aria-label="legend"/);
    await popup.close();
    await shots('grain-view');
    expect(pageErrors).toEqual([]);
  });

  it('a PNG saved at 72 dpi is not calibrated, and the Scale panel says why and how to confirm a true size', async () => {
    // 2835 px per metre = 72 dpi, a screen setting (PNG specification, pHYs; 72 dpi = 352.8 µm/px, derived).
    const f = wallsPng(120, 400, 300, 41, work);
    const path = join(work, 'screen-72dpi.png');
    writeFileSync(path, withPhys(f.bytes, 2835, 2835));
    await page.getByTestId('file-input').setInputFiles(path);
    await settledAll();
    await selectEntry('screen-72dpi.png');
    await page.getByRole('tab', { name: 'Scale' }).click();
    await expect.poll(() => page.getByTestId('calibration').textContent()).toMatch(/Uncalibrated/);
    expect(await page.getByTestId('calibration-notice').textContent()).toMatch(/72 dpi .*not a calibration/);
    expect(pageErrors).toEqual([]);
  });
});
