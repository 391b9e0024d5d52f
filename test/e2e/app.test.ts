/**
 * End-to-end tests of the web app in headless Chromium (playwright-core, the system browser). The app is
 * built and served from a loopback port; the checks compare the page with the command line run on the
 * same file, so the reference is the project's own `tessellab analyze`, and the image comes from the
 * project's generator.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { unzipSync, strFromU8 } from 'fflate';
import type { BrowserContext, Page } from 'playwright-core';
import type { PreviewServer } from 'vite';
import { ROOT, SCREENSHOTS, launch, serveApp } from './harness';
import { corruptPng, pointsCsv, wallsPng, type Fixture } from './fixtures';

let server: PreviewServer;
let url = '';
let context: BrowserContext;
let closeBrowser: () => Promise<void>;
let page: Page;
let work: string;
let fixture: Fixture;
let cliOut: string;
const requests: string[] = [];
const pageErrors: string[] = [];

type Win = { __tessellab: { entries: { name: string; status: string; count: number | null; error: string | null; result: unknown }[] } };

/** Paths where two JSON values differ (numbers compared to 1e-12 relative). */
function closeJson(a: unknown, b: unknown, path = ''): string[] {
  if (typeof a === 'number' && typeof b === 'number') return Math.abs(a - b) <= 1e-12 * Math.max(1, Math.abs(a), Math.abs(b)) ? [] : [path];
  if (typeof a !== 'object' || a === null || typeof b !== 'object' || b === null) return a === b ? [] : [path];
  if (Array.isArray(a) !== Array.isArray(b)) return [path];
  const ka = Object.keys(a), kb = Object.keys(b);
  if (ka.join() !== kb.join()) return [`${path} (keys)`];
  return ka.flatMap((k) => closeJson((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`));
}

async function shot(name: string): Promise<void> {
  await page.screenshot({ path: join(SCREENSHOTS, `${name}.png`) });
}

/** Waits until the entry with this name is done (or failed) and returns its state. */
async function settled(name: string): Promise<{ status: string; count: number | null; error: string | null }> {
  await page.waitForFunction(
    (n) => {
      const e = (globalThis as unknown as Win).__tessellab.entries.find((x) => x.name === n);
      return !!e && (e.status === 'done' || e.status === 'error');
    },
    name,
  );
  return page.evaluate((n) => {
    const e = (globalThis as unknown as Win).__tessellab.entries.find((x) => x.name === n)!;
    return { status: e.status, count: e.count, error: e.error };
  }, name);
}

async function selectEntry(name: string): Promise<void> {
  await page.getByTestId('entry').filter({ hasText: name }).locator('button.pick').click();
}

async function download(testId: string): Promise<{ name: string; bytes: Buffer }> {
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
  const p = await d.path();
  return { name: d.suggestedFilename(), bytes: readFileSync(p) };
}

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  work = mkdtempSync(join(tmpdir(), 'tessellab-e2e-work-'));
  fixture = wallsPng(250, 640, 480, 21, work);
  cliOut = join(work, 'cli');
  // The reference: the command line on the same file with default settings.
  execFileSync(process.execPath, [join(ROOT, 'bin/tessellab.mjs'), 'analyze', fixture.path, '--out', cliOut], { cwd: ROOT, stdio: 'pipe' });
  ({ url, server } = await serveApp());
  const b = await launch();
  context = b.context;
  closeBrowser = b.close;
  context.on('request', (r) => requests.push(r.url()));
  page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => pageErrors.push(e.message));
  await page.goto(url);
});

afterAll(async () => {
  await closeBrowser?.();
  await server?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

describe('Tessellab web app', () => {
  it('opens with the demo analysed: cells, tessellation and a cell count', async () => {
    const demo = await page.waitForFunction(() => (globalThis as unknown as Win).__tessellab.entries[0]?.name ?? null, null);
    const name = (await demo.jsonValue()) as string;
    const s = await settled(name);
    expect(s.status).toBe('done');
    // The app opens on the Results card.
    const shown = Number(await page.getByTestId('results-count').textContent());
    expect(shown).toBe(s.count);
    // sample-images/manifest.json: foam-random.png is a window on a random foam of about 600 cells (586 in its truth); the count must be near it.
    expect(shown).toBeGreaterThan(500);
    expect(shown).toBeLessThan(700);
    await expect.poll(() => page.getByText('Use your own').count()).toBeGreaterThan(0);
    await shot('01-demo');
  });

  it('an added image gives a table whose cell count equals the command line\'s, and the same files', async () => {
    await page.getByTestId('file-input').setInputFiles(fixture.path);
    const s = await settled(fixture.name);
    expect(s.status).toBe('done');
    const cli = JSON.parse(readFileSync(join(cliOut, fixture.name.replace('.png', '.summary.json')), 'utf8')) as { cells: { count: number } };
    expect(s.count).toBe(cli.cells.count);
    await selectEntry(fixture.name);
    await page.getByRole('tab', { name: 'Cells' }).click();
    await expect.poll(async () => Number(await page.getByTestId('table-count').textContent())).toBe(cli.cells.count);
    await shot('02-cells-table');

    await page.getByRole('tab', { name: 'Export' }).click();
    for (const [id, file] of [
      ['export-cells.csv', fixture.name.replace('.png', '.cells.csv')],
      ['export-summary.json', fixture.name.replace('.png', '.summary.json')],
      ['export-cells.geojson', fixture.name.replace('.png', '.cells.geojson')],
      ['export-overlay.svg', fixture.name.replace('.png', '.overlay.svg')],
      ['export-labels.png', fixture.name.replace('.png', '.labels.png')],
      ['export-settings.json', 'settings.json'],
    ] as const) {
      const d = await download(id);
      expect(d.name).toBe(file);
      const ref = readFileSync(join(cliOut, file));
      if (file.endsWith('.summary.json')) {
        // Monte Carlo statistics are printed at full double precision, and the browser's and Node's maths
        // libraries may differ in the last bit: equal structure, numbers equal to 1e-12 relative.
        // The command line also records the input's path and its own version (provenance the page does not have).
        const { input, version, ...fromCli } = JSON.parse(ref.toString('utf8')) as Record<string, unknown>;
        expect([typeof input, typeof version]).toEqual(['string', 'string']);
        expect(closeJson(JSON.parse(d.bytes.toString('utf8')), fromCli)).toEqual([]);
      } else {
        expect(d.bytes.equals(ref), `${file} equals the command line's`).toBe(true);
      }
    }
    const csv = (await download('export-cells.csv')).bytes.toString('utf8').trim().split('\n');
    expect(csv.length - 1).toBe(cli.cells.count);
    expect(csv[0]!.split(',')[0]).toBe('cell');

    const zip = unzipSync(new Uint8Array((await download('export-zip')).bytes));
    const names = Object.keys(zip);
    expect(names).toContain('summary.csv');
    const stem = fixture.name.replace('.png', '');
    expect(strFromU8(zip[`${stem}/${stem}.cells.csv`]!)).toBe(readFileSync(join(cliOut, `${stem}.cells.csv`), 'utf8'));
    const summaryRows = strFromU8(zip['summary.csv']!).trim().split('\n');
    expect(summaryRows.length).toBe(3); // header + demo + fixture
    expect(summaryRows[2]!.split(',')[0]).toBe(fixture.name);
    await shot('03-export');
  });

  it('the random-seeding reference is drawn with a web worker of its own beside the analysis worker', async () => {
    // The added image's analysis drew a 199-replicate reference (the demo's result was made at build time):
    // its reference worker was started from the analysis worker, from this origin, and is alive. (That the figures do not depend on it is checked
    // in Node: test/unit/reference/parallel.test.ts, test/integration/threads.test.ts.)
    expect(requests.some((u) => u.startsWith(url) && /reference\.worker/.test(u))).toBe(true);
    const w = page.workers().find((x) => /reference\.worker/.test(x.url()));
    expect(w, 'a reference worker is running').toBeTruthy();
    expect(await w!.evaluate(() => typeof (self as unknown as { onmessage: unknown }).onmessage)).toBe('function');
    expect(pageErrors).toEqual([]);
  });

  it('merging two neighbours lowers the count by one; Ctrl+Z restores it; Ctrl+Shift+Z redoes it', async () => {
    await selectEntry(fixture.name);
    await page.getByRole('tab', { name: 'Cells' }).click();
    const before = (await settled(fixture.name)).count as number;
    // Pick an interior cell and one of its Voronoi neighbours, then use the real buttons and keys.
    await page.evaluate(() => {
      const app = (globalThis as unknown as { __tessellab: { selected: { result: { analysis: { tessellation: { edge: Uint8Array; neighbourOffsets: Int32Array; neighbourIndex: Int32Array } } } }; selectCell: (c: number, add?: boolean) => void } }).__tessellab;
      const t = app.selected.result.analysis.tessellation;
      let i = 0;
      while (t.edge[i]) i++;
      const j = t.neighbourIndex[t.neighbourOffsets[i]!]!;
      app.selectCell(i + 1);
      app.selectCell(j + 1, true);
    });
    await page.getByRole('button', { name: 'Merge' }).click();
    await expect.poll(async () => Number(await page.getByTestId('table-count').textContent())).toBe(before - 1);
    await shot('04-merged');
    await page.getByTestId('bench').focus();
    await page.keyboard.press('Control+z');
    await expect.poll(async () => Number(await page.getByTestId('table-count').textContent())).toBe(before);
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(async () => Number(await page.getByTestId('table-count').textContent())).toBe(before - 1);
    await page.keyboard.press('Control+z');
    await expect.poll(async () => Number(await page.getByTestId('table-count').textContent())).toBe(before);
  });

  it('a line drawn across a cell splits it; undo restores the count', async () => {
    const before = (await settled(fixture.name)).count as number;
    // Screen position of an interior cell's centroid and the extent of its bounding box, from the Bench's view.
    const target = await page.evaluate(() => {
      const app = (globalThis as unknown as { __tessellab: { selected: { result: { analysis: { field: { x0: number; y0: number }; tessellation: { points: Float64Array; edge: Uint8Array; area: Float64Array } }; overlay: { cellBoxes: Int32Array } } } } }).__tessellab;
      const { analysis, overlay } = app.selected.result;
      const t = analysis.tessellation;
      let best = 0;
      for (let i = 0; i < t.edge.length; i++) if (!t.edge[i] && t.area[i]! > t.area[best]!) best = i;
      const b = overlay.cellBoxes;
      return { x: t.points[2 * best]!, y: t.points[2 * best + 1]!, y0: b[4 * best + 1]! + analysis.field.y0, y1: b[4 * best + 3]! + analysis.field.y0 };
    });
    const box = (await page.getByTestId('bench').boundingBox())!;
    // The Bench fits the image: scale = min((w - 24) / W, (h - 24) / H), centred.
    const [W, H] = [640, 480];
    const k = Math.min((box.width - 24) / W, (box.height - 24) / H);
    const ox = box.x + (box.width - W * k) / 2, oy = box.y + (box.height - H * k) / 2;
    await page.getByRole('button', { name: 'Split', exact: true }).first().click();
    const h = (target.y1 - target.y0) * 0.3;
    await page.mouse.move(ox + target.x * k, oy + (target.y - h) * k);
    await page.mouse.down();
    await page.mouse.move(ox + target.x * k, oy + target.y * k, { steps: 4 });
    await page.mouse.move(ox + target.x * k, oy + (target.y + h) * k, { steps: 4 });
    await page.mouse.up();
    await expect.poll(async () => Number(await page.getByTestId('table-count').textContent())).toBe(before + 1);
    await shot('04b-split');
    await page.keyboard.press('Escape');
    await page.keyboard.press('Control+z');
    await expect.poll(async () => Number(await page.getByTestId('table-count').textContent())).toBe(before);
  });

  it('moving a Detect slider shows a preview on a downscaled copy, then the full result on release', async () => {
    await page.getByRole('tab', { name: 'Detect' }).click();
    const slider = page.getByLabel(/Smoothing/);
    type Sel = { __tessellab: { selected: { preview: { count: number; scale: number } | null; status: string; result: unknown } } };
    const resultBefore = await page.evaluate(() => (globalThis as unknown as { __tessellab: { selected: { result: { elapsedMs: number } } } }).__tessellab.selected.result.elapsedMs);
    // Dragging: 'input' events only. The preview arrives while the full result stays as it was.
    await slider.evaluate((el: HTMLInputElement) => { el.value = '1.5'; el.dispatchEvent(new Event('input', { bubbles: true })); });
    await expect.poll(() => page.evaluate(() => (globalThis as unknown as Sel).__tessellab.selected.preview?.count ?? 0)).toBeGreaterThan(100);
    expect(await page.evaluate(() => (globalThis as unknown as { __tessellab: { selected: { result: { elapsedMs: number } } } }).__tessellab.selected.result.elapsedMs)).toBe(resultBefore);
    await shot('04c-preview');
    // Release: 'change' runs the full analysis, which replaces the preview.
    await slider.evaluate((el: HTMLInputElement) => el.dispatchEvent(new Event('change', { bubbles: true })));
    await expect.poll(() => page.evaluate(() => (globalThis as unknown as Sel).__tessellab.selected.preview)).toBeNull();
    const s = await settled(fixture.name);
    expect(s.status).toBe('done');
    // Put it back, so later tests see the default settings.
    await slider.evaluate((el: HTMLInputElement) => { el.value = '0.7'; el.dispatchEvent(new Event('input', { bubbles: true })); el.dispatchEvent(new Event('change', { bubbles: true })); });
    await expect.poll(() => page.evaluate(() => (globalThis as unknown as Sel).__tessellab.selected.preview)).toBeNull();
    await settled(fixture.name);
  });

  it('a scale line of zero length is refused next to it', async () => {
    await page.getByRole('tab', { name: 'Scale' }).click();
    await page.getByRole('button', { name: 'Scale line' }).first().click();
    const box = (await page.getByTestId('bench').boundingBox())!;
    // A click without dragging draws no line; the panel asks for one.
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await page.getByLabel('Bar length (µm)').fill('100');
    await page.getByRole('button', { name: 'Calibrate from a bar' }).click();
    await expect.poll(() => page.getByTestId('bar-error').textContent()).toMatch(/Draw a line|zero length/);
    await page.keyboard.press('Escape');
  });

  it('clicking a cell on the Bench selects it and highlights its row', async () => {
    await page.getByRole('tab', { name: 'Cells' }).click();
    const box = (await page.getByTestId('bench').boundingBox())!;
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await expect.poll(() => page.locator('[role=row][aria-selected=true]').count()).toBe(1);
    await shot('05-selected');
  });

  it('a points CSV is analysed as a points pattern with the command line\'s count and table', async () => {
    const pts = pointsCsv(300, 500, 400, 9, work);
    const out = join(work, 'cli-points');
    execFileSync(process.execPath, [join(ROOT, 'bin/tessellab.mjs'), 'analyze', pts.path, '--pattern', 'points', '--out', out], { cwd: ROOT, stdio: 'pipe' });
    await page.getByTestId('file-input').setInputFiles(pts.path);
    const s = await settled(pts.name);
    expect(s.status).toBe('done');
    const cli = JSON.parse(readFileSync(join(out, pts.name.replace('.csv', '.summary.json')), 'utf8')) as { cells: { count: number } };
    expect(s.count).toBe(300);
    expect(s.count).toBe(cli.cells.count);
    await selectEntry(pts.name);
    await page.getByRole('tab', { name: 'Export' }).click();
    const d = await download('export-cells.csv');
    expect(d.bytes.equals(readFileSync(join(out, pts.name.replace('.csv', '.cells.csv'))))).toBe(true);
    await shot('05b-points');
    await page.getByTestId('entry').filter({ hasText: pts.name }).getByRole('button', { name: /Remove/ }).click();
    await selectEntry(fixture.name);
  });

  it('a corrupt file shows its message beside it and leaves the rest working', async () => {
    const bad = corruptPng(work);
    await page.getByTestId('file-input').setInputFiles(bad.path);
    const s = await settled(bad.name);
    expect(s.status).toBe('error');
    expect(s.error).toMatch(/broken\.png: .*truncated/);
    await expect.poll(() => page.getByTestId('entry-error').first().textContent()).toMatch(/truncated/);
    const others = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.filter((e) => e.name !== 'broken.png').map((e) => e.status));
    expect(others.every((x) => x === 'done')).toBe(true);
    await shot('06-corrupt');
  });

  it('a pixel size of zero, a negative one or text is refused next to the field', async () => {
    await selectEntry(fixture.name);
    await page.getByRole('tab', { name: 'Scale' }).click();
    for (const [typed, msg] of [['0', /above 0/], ['-2', /above 0/], ['abc', /not a number/]] as const) {
      await page.getByTestId('um-per-px').fill(typed);
      await page.getByRole('button', { name: 'Apply', exact: true }).click();
      await expect.poll(() => page.getByTestId('um-per-px-error').textContent()).toMatch(msg);
    }
    await page.getByTestId('um-per-px').fill('0.5');
    await page.getByRole('button', { name: 'Apply', exact: true }).click();
    await expect.poll(() => page.getByTestId('calibration').textContent()).toMatch(/0\.5 µm per pixel/);
    await shot('07-scale');
  });

  it('a crashed worker is restarted, the user is told, and the results stay', async () => {
    const before = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.map((e) => e.count));
    await page.evaluate(() => (globalThis as unknown as { __tessellab: { bridge: { crashForTest(): void } } }).__tessellab.bridge.crashForTest());
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'restarted' }).count()).toBeGreaterThan(0);
    const after = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.map((e) => e.count));
    expect(after).toEqual(before);
    // The restarted worker works: re-detect the selected image.
    await page.getByRole('tab', { name: 'Detect' }).click();
    await page.getByLabel('Edge cells in statistics').selectOption('weight');
    const s = await settled(fixture.name);
    expect(s.status).toBe('done');
    await shot('08-crash-recovered');
  });

  it('a reload restores the session: images, settings and results', async () => {
    const names = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.map((e) => e.name));
    for (const n of names) await settled(n);
    const before = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.map((e) => [e.name, e.status, e.count]));
    await page.reload();
    await page.waitForFunction((n) => (globalThis as unknown as Win).__tessellab.entries.length === n, before.length);
    for (const [name] of before) await settled(name as string);
    const after = await page.evaluate(() => (globalThis as unknown as Win).__tessellab.entries.map((e) => [e.name, e.status, e.count]));
    expect(after).toEqual(before);
    await selectEntry(fixture.name);
    await page.getByRole('tab', { name: 'Scale' }).click();
    await expect.poll(() => page.getByTestId('calibration').textContent()).toMatch(/0\.5 µm per pixel/);
    await page.getByRole('tab', { name: 'Randomness' }).click();
    // Plots are drawn as they come into view.
    await page.getByTestId('plot-pair').scrollIntoViewIfNeeded();
    await page.waitForSelector('[data-testid=plot-pair] .main-svg');
    // The panel plots L(r) − r as the core returns it (scaled to µm once), not with r subtracted again.
    const pair = await page.evaluate((n) => {
      const el = document.querySelector('[data-testid=plot-pair]') as unknown as { data: { name: string; x: number[]; y: (number | null)[] }[] };
      const plotted = el.data.find((t) => t.name === 'observed (centroids)')!;
      const entry = (globalThis as unknown as Win).__tessellab.entries.find((x) => x.name === n)!;
      const a = (entry.result as { analysis: { settings: { umPerPx: number | null }; randomness: { lFunction: { rPx: number[]; observed: (number | null)[] } } } }).analysis;
      return { plotted: plotted.y, x: plotted.x, core: a.randomness.lFunction.observed, r: a.randomness.lFunction.rPx, um: a.settings.umPerPx ?? 1 };
    }, fixture.name);
    expect(pair.plotted.length).toBe(pair.core.length);
    pair.plotted.forEach((v, i) => expect(v).toBeCloseTo((pair.core[i] ?? Number.NaN) * pair.um, 9));
    expect(pair.x.at(-1)).toBeCloseTo(pair.r.at(-1)! * pair.um, 9);
    await page.getByTestId('verdict').scrollIntoViewIfNeeded();
    // The verdict uses the project's words, with the statistic and p-value behind it.
    await expect.poll(() => page.getByTestId('verdict').textContent()).toMatch(/more regular than random|consistent with random seeding|more irregular than random/);
    expect(await page.getByTestId('tests').textContent()).toMatch(/Clark–Evans/);
    await shot('09-reloaded-randomness');
    await page.getByTestId('plot-area').scrollIntoViewIfNeeded();
    await page.waitForSelector('[data-testid=plot-area] .main-svg');
    await shot('09b-randomness-plots');
    await page.getByTestId('plot-pair').scrollIntoViewIfNeeded();
    await shot('09c-randomness-pair');
  });

  it('a sample with a pixel size in its tags is calibrated from them and gets a grain size number', async () => {
    await page.getByLabel('Add a sample image').selectOption('grains-calibrated.png');
    const s = await settled('grains-calibrated.png');
    expect(s.status).toBe('done');
    await selectEntry('grains-calibrated.png');
    await page.getByRole('tab', { name: 'Scale' }).click();
    // sample-images/manifest.json: 0.5 µm/px stored in the PNG pHYs chunk.
    await expect.poll(() => page.getByTestId('calibration').textContent()).toMatch(/0\.5 µm per pixel.*from the file's tags/);
    await page.getByRole('tab', { name: 'Grain size' }).click();
    await expect.poll(() => page.getByTestId('grain-g').textContent()).toMatch(/G = \d+\.\d/);
    const text = (await page.getByTestId('grain-g').textContent()) as string;
    const G = Number(/G = (-?\d+\.\d)/.exec(text)?.[1]);
    // ASTM E112 planimetric: G = 3.321928 log10 N_A − 2.954 (docs/check-values.md, derived). 700 grains in
    // 1000 x 800 px at 0.5 µm/px = 0.2 mm² gives N_A ≈ 3500 mm⁻², G ≈ 8.8; edge grains and the count rule move it a few tenths.
    expect(G).toBeGreaterThan(8.2);
    expect(G).toBeLessThan(9.4);
    await shot('10-grain-size');
    const [popup] = await Promise.all([context.waitForEvent('page'), page.getByTestId('grain-report').click()]);
    await popup.waitForLoadState();
    expect(await popup.content()).toMatch(/ASTM E112/);
    await popup.screenshot({ path: join(SCREENSHOTS, '11-grain-report.png') });
    await popup.close();
  });

  it('the dark theme and the help overlay read well', async () => {
    await page.getByRole('button', { name: /Switch to dark theme/ }).click();
    await page.keyboard.press('?');
    await expect.poll(() => page.getByRole('dialog').count()).toBe(1);
    await shot('12-dark-help');
    await page.keyboard.press('Escape');
    await page.getByRole('button', { name: /Switch to light theme/ }).click();
  });

  it('its Content Security Policy refuses any other origin, on the page and in the worker', async () => {
    const blocked = await page.evaluate(async () => {
      const seen: string[] = [];
      const reported = new Promise<void>((res) => document.addEventListener('securitypolicyviolation', (e) => (seen.push(e.violatedDirective), res())));
      // A loopback address on this machine: the policy must stop it before any packet is sent.
      const r = await fetch('http://127.0.0.2:9/x').then(() => 'sent', () => 'refused');
      // The violation is reported by an event of its own, which may come after the refusal: wait for it
      // (not for a fixed time). A request that went out has nothing to wait for.
      if (r === 'refused') await reported;
      return { r, seen };
    });
    expect(blocked.r).toBe('refused');
    expect(blocked.seen).toContain('connect-src');
    const res = await fetch(url);
    expect(res.headers.get('content-security-policy')).toMatch(/connect-src 'self'/);
    const html = await res.text();
    expect(html).toMatch(/http-equiv="Content-Security-Policy"[\s\S]*connect-src 'self'/);
  });

  it('a reload before the demo\'s bytes were stored fetches the demo again instead of failing', async () => {
    // A fresh profile of its own; the stored copy of the demo is deleted, as when the page reloads before
    // the worker has written it (seen on a cold development server).
    const b = await launch();
    try {
      const p = b.context.pages()[0] ?? (await b.context.newPage());
      await p.goto(url);
      const doneCount = () => p.evaluate(() => {
        const e = (globalThis as unknown as Win).__tessellab?.entries[0];
        return e && (e.status === 'done' || e.status === 'error') ? { status: e.status, count: e.count, error: e.error } : null;
      });
      await expect.poll(doneCount).not.toBeNull();
      const first = (await doneCount())!;
      expect(first.status).toBe('done');
      const removed = await p.evaluate(() => new Promise<number>((resolve, reject) => {
        const req = indexedDB.open('tessellab');
        req.onerror = () => reject(req.error);
        req.onsuccess = () => {
          const db = req.result;
          const tx = db.transaction(['images', 'results', 'base'], 'readwrite');
          const images = tx.objectStore('images');
          const count = images.count();
          images.clear();
          tx.objectStore('results').clear();
          tx.objectStore('base').clear();
          tx.oncomplete = () => { db.close(); resolve(count.result); };
          tx.onerror = () => reject(tx.error);
        };
      }));
      expect(removed).toBe(1);
      await p.reload();
      await expect.poll(doneCount).not.toBeNull();
      const again = (await doneCount())!;
      expect(again.error).toBeNull();
      expect(again).toEqual(first);
    } finally {
      await b.close();
    }
  });

  it('makes no request beyond its own origin, and no page error occurred', () => {
    const origin = new URL(url).origin;
    const outside = requests.filter((r) => !r.startsWith(origin) && !r.startsWith('data:') && !r.startsWith('blob:') && !r.startsWith('http://127.0.0.2:9/'));
    expect(requests.length).toBeGreaterThan(5);
    expect(outside).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
