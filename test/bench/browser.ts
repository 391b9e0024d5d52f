/**
 * The browser half of the benchmark: the built web app in headless Chromium analyses the 16 MP walls image
 * through its worker, as a user would (the file goes through the page's file input). Reports the time from
 * choosing the file to the finished result on the page, the worker's own figure, and the longest
 * main-thread task seen meanwhile (PerformanceObserver 'longtask': tasks of 50 ms and more).
 * opencv.js is loaded first (the app's demo image is analysed on first visit), so its load is excluded.
 */
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { build, preview } from 'vite';
import { defaultCases, imageFile, type BenchCase } from './inputs';

const CHROMIUM = process.env.TESSELLAB_CHROMIUM ?? '/usr/bin/chromium';
const ARGS = ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-quic'];

interface AppLike {
  busy: boolean;
  entries: { name: string; status: string; error: string | null; result: { elapsedMs: number } | null }[];
}
type Win = typeof globalThis & { __tessellab?: AppLike; __longTasks?: [number, number][] };

/**
 * Runs the browser benchmark.
 * @param root the repository
 * @param runs timed analyses (each a fresh copy of the file under its own name)
 * @returns times in ms: per run the total on the page, the worker's elapsed figure and the longest task
 */
export async function browserBench(root: string, runs: number): Promise<Record<string, unknown>> {
  const c = defaultCases().find((x) => x.id === 'walls-4096') as Extract<BenchCase, { kind: 'image' }>;
  const src = imageFile(root, c).path;
  const outDir = join(root, 'bench-results/dist');
  process.stderr.write('browser: building the app...\n');
  await build({ root, logLevel: 'error', build: { outDir, emptyOutDir: true } });
  const server = await preview({ root, logLevel: 'error', build: { outDir }, preview: { host: '127.0.0.1', port: 0, strictPort: false, open: false } });
  const profile = mkdtempSync(join(tmpdir(), 'tessellab-bench-'));
  const files = mkdtempSync(join(tmpdir(), 'tessellab-bench-files-'));
  const context = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM, headless: true, args: ARGS, viewport: { width: 1280, height: 800 } });
  try {
    const addr = server.httpServer.address();
    if (!addr || typeof addr === 'string') throw new Error('the preview server has no port');
    const page = context.pages()[0] ?? (await context.newPage());
    await page.addInitScript(() => {
      const w = globalThis as Win;
      w.__longTasks = [];
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.__longTasks!.push([e.startTime, e.duration]);
      }).observe({ type: 'longtask', buffered: true });
    });
    await page.goto(`http://127.0.0.1:${addr.port}/`);
    // The first visit analyses the demo image: opencv.js is loaded in the worker once that is done.
    await page.waitForFunction(() => {
      const app = (globalThis as Win).__tessellab;
      return !!app && app.entries.length > 0 && !app.busy && app.entries.every((e) => e.status === 'done' || e.status === 'error');
    }, null, { timeout: 300_000 });
    // The observer must see a task we know of, or a zero below would mean nothing.
    const probe = await page.evaluate(async () => {
      const w = globalThis as Win;
      w.__longTasks = [];
      await new Promise<void>((done) => setTimeout(() => {
        const t = performance.now();
        while (performance.now() - t < 150) { /* a known 150 ms task */ }
        done();
      }, 0));
      await new Promise((r) => setTimeout(r, 200));
      return w.__longTasks.reduce((m, [, d]) => Math.max(m, d), 0);
    });
    if (probe < 140) throw new Error(`the long-task observer missed a known 150 ms task (saw ${probe.toFixed(0)} ms); the main-thread figure would be meaningless`);
    const out: { totalMs: number; workerMs: number | null; longestTaskMs: number; longTasks: number }[] = [];
    // First a 4 MP image of about 3 000 cells (the default reference's size), once, cold.
    const c4 = defaultCases().find((x) => x.id === 'walls-2048') as Extract<BenchCase, { kind: 'image' }>;
    const jobs = [{ name: 'bench-walls-4mp.png', src: imageFile(root, c4).path }, ...Array.from({ length: runs }, (_, r) => ({ name: `bench-walls-16mp-${r + 1}.png`, src }))];
    let fourMp: { totalMs: number; workerMs: number | null; longestTaskMs: number } | null = null;
    for (const job of jobs) {
      const name = job.name;
      const file = join(files, name);
      copyFileSync(job.src, file);
      await page.evaluate(() => ((globalThis as Win).__longTasks = []));
      const t0 = await page.evaluate(() => performance.now());
      await page.getByTestId('file-input').setInputFiles(file);
      await page.waitForFunction((n) => {
        const e = (globalThis as Win).__tessellab!.entries.find((x) => x.name === n);
        return !!e && (e.status === 'done' || e.status === 'error');
      }, name, { timeout: 600_000, polling: 20 });
      const res = await page.evaluate(({ n, t0 }) => {
        const w = globalThis as Win;
        const e = w.__tessellab!.entries.find((x) => x.name === n)!;
        const tasks = w.__longTasks!.filter(([s]) => s >= t0);
        return { status: e.status, error: e.error, workerMs: e.result?.elapsedMs ?? null, totalMs: performance.now() - t0, tasks };
      }, { n: name, t0 });
      if (res.status === 'error') throw new Error(`the app could not analyse the image: ${res.error}`);
      // Tasks until the page has painted the result belong to the run too.
      await page.waitForTimeout(1000);
      const late = await page.evaluate((t) => (globalThis as Win).__longTasks!.filter(([s]) => s >= t), t0);
      const longest = late.reduce((m, [, d]) => Math.max(m, d), 0);
      process.stderr.write(`browser: ${name}: ${res.totalMs.toFixed(0)} ms on the page, longest main-thread task ${longest.toFixed(0)} ms\n`);
      if (job.src !== src) fourMp = { totalMs: res.totalMs, workerMs: res.workerMs, longestTaskMs: longest };
      else out.push({ totalMs: res.totalMs, workerMs: res.workerMs, longestTaskMs: longest, longTasks: late.length });
    }
    const version = context.browser()?.version() ?? (await page.evaluate(() => navigator.userAgent));
    return {
      chromium: version,
      image: c.label,
      probeTaskMs: probe,
      fourMp: { image: c4.label, ...fourMp },
      runs: out,
      // The first run is the cold one: later runs of the same image reuse the worker's cached reference.
      totalMs: out[0]!.totalMs,
      warmTotalMs: out.length > 1 ? [...out.slice(1).map((o) => o.totalMs)].sort((a, b) => a - b)[(out.length - 2) >> 1] : null,
      longestTaskMs: Math.max(...out.map((o) => o.longestTaskMs)),
    };
  } finally {
    await context.close();
    await server.close();
    rmSync(profile, { recursive: true, force: true });
    rmSync(files, { recursive: true, force: true });
  }
}
