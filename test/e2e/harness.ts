/**
 * End-to-end harness: builds the app once, serves dist/ on a free loopback port with Vite's preview server,
 * and launches the system Chromium headless through playwright-core (no browser download).
 */
import { build, preview, type PreviewServer } from 'vite';
import { chromium, type BrowserContext } from 'playwright-core';
import { mkdtempSync, rmSync, existsSync, statSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
export const SCREENSHOTS = join(ROOT, 'test/e2e/screenshots');
export const CHROMIUM = process.env.TESSELLAB_CHROMIUM ?? '/usr/bin/chromium';

const ARGS = [
  '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update',
  '--disable-sync', '--disable-quic', '--disable-dev-shm-usage',
];

/** Newest modification time under a folder (to skip a rebuild when dist/ is newer than the sources). */
function newest(dir: string): number {
  let t = 0;
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    const s = statSync(p);
    t = Math.max(t, s.isDirectory() ? newest(p) : s.mtimeMs);
  }
  return t;
}

/** Builds dist/ into its own folder (so tests never race another build) and serves it. */
export async function serveApp(outDir = join(ROOT, 'test/e2e/.dist')): Promise<{ url: string; server: PreviewServer }> {
  const fresh = existsSync(join(outDir, 'index.html'))
    && statSync(join(outDir, 'index.html')).mtimeMs > Math.max(newest(join(ROOT, 'src')), newest(join(ROOT, 'workers')), statSync(join(ROOT, 'index.html')).mtimeMs);
  if (!fresh || process.env.CI) {
    await build({ root: ROOT, logLevel: 'error', build: { outDir, emptyOutDir: true } });
  }
  const server = await preview({ root: ROOT, logLevel: 'error', build: { outDir }, preview: { host: '127.0.0.1', port: 0, strictPort: false, open: false } });
  const addr = server.httpServer.address();
  if (!addr || typeof addr === 'string') throw new Error('preview server has no port');
  return { url: `http://127.0.0.1:${addr.port}/`, server };
}

/** A headless Chromium with a fresh profile folder (IndexedDB survives reloads and reopening the same folder). */
export async function launch(dir = mkdtempSync(join(tmpdir(), 'tessellab-e2e-'))): Promise<{ context: BrowserContext; dir: string; close: () => Promise<void> }> {
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: CHROMIUM, headless: true, args: ARGS, viewport: { width: 1280, height: 800 }, acceptDownloads: true,
  });
  // No time limit on any wait or action: a test waits for what it waits for, however loaded the machine.
  // A wait that never ends is stopped by vitest's test timeout (vite.config.ts), a guard against a hang.
  context.setDefaultTimeout(0);
  return { context, dir, close: async () => { await context.close(); rmSync(dir, { recursive: true, force: true }); } };
}

/** Screenshots of the page at the three sizes the app is checked at (1280×800, 1024×768, 1920×1080), named name-WxH.png; the page is left at 1280×800. */
export async function screenshotsAt(page: import('playwright-core').Page, name: string): Promise<void> {
  for (const [w, h] of [[1280, 800], [1024, 768], [1920, 1080]] as const) {
    await page.setViewportSize({ width: w, height: h });
    await page.screenshot({ path: join(SCREENSHOTS, `${name}-${w}x${h}.png`) });
  }
  await page.setViewportSize({ width: 1280, height: 800 });
}
