/**
 * The first visit and a reload, in headless Chromium: the demo's result and its Results card are on screen
 * before the engine (opencv.js) has loaded, since the build ships the demo's result made by the project's
 * own pipeline and a reload restores the stored results; the count is the command line's on the same
 * image. The engine's file is held back by the test (it never reaches the page until released), so nothing
 * here depends on how fast anything is.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BrowserContext, Page, Route } from 'playwright-core';
import type { PreviewServer } from 'vite';
import { ROOT, SCREENSHOTS, launch, serveApp, screenshotsAt } from './harness';

let server: PreviewServer;
let url = '';
let context: BrowserContext;
let closeBrowser: () => Promise<void>;
let page: Page;
let work: string;
let cliCount = 0;
const pageErrors: string[] = [];

/** The engine's chunk: opencv.js, named by vite.config.ts (worker chunks). */
const ENGINE = '**/assets/opencv-*.js';
let held: Route[] = [];
let engineDelivered = 0;

/** Holds every request for the engine until {@link release}. */
async function holdEngine(): Promise<void> {
  held = [];
  await context.route(ENGINE, (route) => { held.push(route); });
}

async function release(): Promise<void> {
  for (const r of held.splice(0)) await r.continue();
  await context.unroute(ENGINE);
}

type Win = { __tessellab: { cvStatus: string; entries: { name: string; status: string; count: number | null }[] } };

const sizes = (name: string): Promise<void> => screenshotsAt(page, name);

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  work = mkdtempSync(join(tmpdir(), 'tessellab-e2e-start-'));
  // The reference: the command line on the demo image (sample-images/manifest.json: foam-random.png, walls).
  execFileSync(process.execPath, [join(ROOT, 'bin/tessellab.mjs'), 'analyze', join(ROOT, 'sample-images/foam-random.png'), '--out', work], { cwd: ROOT, stdio: 'pipe' });
  cliCount = (JSON.parse(readFileSync(join(work, 'foam-random.summary.json'), 'utf8')) as { cells: { count: number } }).cells.count;
  ({ url, server } = await serveApp(join(tmpdir(), 'tessellab-e2e-start-dist')));
  const b = await launch();
  context = b.context;
  closeBrowser = b.close;
  context.on('requestfinished', (r) => { if (/\/assets\/opencv-[^/]+\.js$/.test(r.url())) engineDelivered++; });
  page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => pageErrors.push(e.message));
});

afterAll(async () => {
  await closeBrowser?.();
  await server?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

describe('start', () => {
  it('shows the demo\'s result on a Results card before the engine has loaded', async () => {
    await holdEngine();
    await page.goto(url);
    await page.getByTestId('results-count').waitFor();
    expect(Number(await page.getByTestId('results-count').textContent())).toBe(cliCount);
    expect(await page.getByTestId('results-verdict').textContent()).toMatch(/more regular than random|consistent with random seeding|more irregular than random|not rated/);
    expect(await page.getByTestId('results-density').textContent()).toMatch(/^\d/);
    expect(await page.getByRole('tab', { name: 'Results' }).getAttribute('aria-selected')).toBe('true');
    // The engine was asked for (or not yet), never delivered: the result did not need it.
    expect(engineDelivered).toBe(0);
    expect(await page.evaluate(() => (globalThis as unknown as Win).__tessellab.cvStatus)).not.toBe('ready');
    await page.screenshot({ path: join(SCREENSHOTS, 'start-before-engine.png') });
    await release();
    await page.waitForFunction(() => (globalThis as unknown as Win).__tessellab.cvStatus === 'ready', null);
    expect(engineDelivered).toBeGreaterThan(0);
    await sizes('results');
  });

  it('sends its built files as kept for good (their names change with their content), and index.html as checked each time', async () => {
    const html = await (await fetch(url)).text();
    const asset = /src="\.\/(assets\/[^"]+\.js)"/.exec(html)?.[1];
    expect(asset).toBeTruthy();
    const res = await fetch(new URL(asset!, url));
    expect(res.headers.get('cache-control')).toMatch(/immutable/);
    expect((await fetch(url)).headers.get('cache-control') ?? '').not.toMatch(/immutable/);
  });

  it('a reload shows the stored result before the engine has loaded', async () => {
    // The stored result is written once the page has it; wait for the record before reloading.
    await page.waitForFunction(() => new Promise<boolean>((ok) => {
      const req = indexedDB.open('tessellab');
      req.onsuccess = () => {
        const db = req.result;
        const c = db.transaction('results').objectStore('results').count();
        c.onsuccess = () => { db.close(); ok(c.result === 1); };
      };
      req.onerror = () => ok(false);
    }), null, { polling: 250 });
    const before = engineDelivered;
    await holdEngine();
    await page.reload();
    await page.getByTestId('results-count').waitFor();
    expect(Number(await page.getByTestId('results-count').textContent())).toBe(cliCount);
    expect(engineDelivered).toBe(before);
    expect(await page.evaluate(() => (globalThis as unknown as Win).__tessellab.cvStatus)).not.toBe('ready');
    await release();
    expect(pageErrors).toEqual([]);
  });
});
