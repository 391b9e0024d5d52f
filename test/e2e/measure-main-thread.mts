/**
 * Measurement (not a test): long tasks on the page's main thread while a 16-megapixel image (4000 x 4000 px,
 * 20 000 cells, from the project's generator) is analysed, and after it when its Bench, Cells table and
 * Randomness plots are shown. Run: `npx tsx test/e2e/measure-main-thread.mts` (takes about a minute).
 * Prints the long tasks (start ms, duration ms) in each phase, from the browser's Long Tasks API.
 */
import { serveApp, launch } from './harness.ts';
import { wallsPng } from './fixtures.ts';

const fx = wallsPng(20000, 4000, 4000, 5);
const { url, server } = await serveApp();
const { context, close } = await launch();
const page = context.pages()[0] ?? (await context.newPage());
await page.addInitScript(() => {
  const g = globalThis as unknown as { __long: [number, number][] };
  g.__long = [];
  new PerformanceObserver((l) => { for (const e of l.getEntries()) g.__long.push([Math.round(e.startTime), Math.round(e.duration)]); }).observe({ type: 'longtask', buffered: true });
});
type G = { __long: [number, number][]; __tessellab: { entries: { name: string; status: string; count: number | null }[] } };
await page.goto(url);
await page.waitForFunction(() => (globalThis as unknown as G).__tessellab.entries[0]?.status === 'done', null, { timeout: 60_000 });
await page.waitForTimeout(3000);
const take = () => page.evaluate(() => { const g = globalThis as unknown as G; const l = g.__long; g.__long = []; return l; });
await take();
const t0 = Date.now();
await page.getByTestId('file-input').setInputFiles(fx.path);
await page.waitForFunction((n) => (globalThis as unknown as G).__tessellab.entries.find((e) => e.name === n)?.status === 'done', fx.name, { timeout: 600_000 });
console.log(`analysis of ${fx.name}: ${Date.now() - t0} ms; long tasks meanwhile:`, JSON.stringify(await take()));
await page.getByTestId('entry').filter({ hasText: fx.name }).locator('button.pick').click();
await page.waitForTimeout(2000);
console.log('showing it on the Bench:', JSON.stringify(await take()));
await page.getByRole('tab', { name: 'Cells' }).click();
await page.waitForTimeout(2000);
console.log('Cells panel (table of 20 000 rows):', JSON.stringify(await take()));
await page.getByRole('tab', { name: 'Randomness' }).click();
await page.waitForTimeout(5000);
console.log('Randomness panel (plots):', JSON.stringify(await take()));
await close();
await server.close();
