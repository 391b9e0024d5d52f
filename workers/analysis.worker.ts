/**
 * The analysis worker: every heavy step of the web app runs here (decoding, opencv.js, measuring,
 * tessellating, exports, and storing results in IndexedDB), so the page never blocks.
 * opencv.js and the core load lazily, on the first call that needs them.
 */
import * as Comlink from 'comlink';
import { zipSync } from 'fflate';
import { KINETICS_THUMB_SIDE, THUMB_SIDE } from './protocol';
import type {
  AnalysisResult, AnalyzeRequest, ExportFile, ExportKind, KineticsRequest, OpenResult, Overlay, PageAnalysis, PreviewResult, ProgressFn, WorkerApi,
} from './protocol';
import type { Analysis } from '../src/core/analysis.types';
import type { GreyImage, LabelImage } from '../src/core/types';
import { resolveSettings, type SettingsInput } from '../src/core/settings';
import { applyEdits } from '../src/core/edit/labels';
import { labelRuns } from '../src/core/labelRuns';
import { openSessionDb } from '../src/ui/db';
import type { ClosablePool } from '../src/core/reference/workerPool';
import { createBrowserReferencePool } from './referencePool';
import { displayRgba, outlineRgba, cellBoxes, downscaleGrey, scaleSettings, collectTransfers, baseName } from './helpers';

type AnalyzeModule = typeof import('../src/core/analyze');

let analyzeMod: Promise<AnalyzeModule> | null = null;

/** The core pipeline with opencv.js registered; loaded once, on first use. */
function pipeline(onProgress?: ProgressFn): Promise<AnalyzeModule> {
  if (!analyzeMod) {
    analyzeMod = (async () => {
      onProgress?.('Loading opencv.js', 0);
      await import('../src/core/cv/browser');
      const cvIndex = await import('../src/core/cv/index');
      // loadCv resolves to a plain { cv } handle; awaiting it only waits for the WebAssembly runtime.
      await cvIndex.loadCv();
      onProgress?.('Loading opencv.js', 1);
      return import('../src/core/analyze');
    })();
    analyzeMod.catch(() => { analyzeMod = null; });
  }
  return analyzeMod;
}

let pool: ClosablePool | null = null;

/** The reference's web workers, started on the first analysis that draws a reference. */
function referencePool(): ClosablePool {
  return (pool ??= createBrowserReferencePool());
}

function exporters(): Promise<typeof import('../src/core/export/index')> {
  return import('../src/core/export/index');
}

interface Opened {
  name: string;
  kind: 'image' | 'points';
  image: GreyImage | null;
  /** Every page of the file (a multi-page TIFF is a series); [image] for one page, [] for points. */
  pages: GreyImage[];
  points: Float64Array | null;
  width: number;
  height: number;
  umPerPxFromFile: number | null;
}

const opened = new Map<string, Opened>();
/** The last kinetics run's frames and mosaic, for "Analyse the final frame as a tessellation". */
let lastSeries: {
  last: GreyImage; mosaic: import('../src/core/kinetics/series').FinalMosaic; result: import('../src/core/kinetics/types').KineticsResult;
  umPerPx: number | null; minCellAreaPx: number;
} | null = null;
const current = new Map<string, Analysis>();
const bases = new Map<string, LabelImage>();
const controllers = new Map<string, AbortController>();

async function storedBytes(id: string): Promise<{ name: string; bytes: Uint8Array } | null> {
  const db = await openSessionDb();
  const rec = await db.get('images', id);
  return rec ? { name: rec.name, bytes: rec.bytes } : null;
}

function isPointsFile(name: string, bytes: Uint8Array): boolean {
  if (/\.(csv|txt)$/i.test(name)) return true;
  // A text file without an image signature: treat as points only when it looks like numbers.
  const head = new TextDecoder().decode(bytes.subarray(0, 64));
  return /^[\s\w",;.\-+]*$/.test(head) && /\d/.test(head) && !/^\x89PNG|^II\*|^MM\0\*/.test(head) && bytes[0] !== 0xff;
}

async function bitmapOf(rgba: Uint8ClampedArray, width: number, height: number): Promise<ImageBitmap> {
  return createImageBitmap(new ImageData(rgba as Uint8ClampedArray<ArrayBuffer>, width, height));
}

/** A reduced copy of a bitmap for the zoomed-out Bench, or null when it is small already. */
async function thumbOf(b: ImageBitmap, quality: ResizeQuality): Promise<ImageBitmap | null> {
  const k = THUMB_SIDE / Math.max(b.width, b.height);
  if (k >= 1) return null;
  return createImageBitmap(b, { resizeWidth: Math.max(1, Math.round(b.width * k)), resizeHeight: Math.max(1, Math.round(b.height * k)), resizeQuality: quality });
}

async function makeOverlay(a: Analysis): Promise<Overlay> {
  if (!a.labels) return { outlines: null, outlinesThumb: null, cellBoxes: new Int32Array(0), runs: null };
  const rgba = outlineRgba(a.labels);
  const outlines = await bitmapOf(rgba, a.labels.width, a.labels.height);
  return { outlines, outlinesThumb: await thumbOf(outlines, 'medium'), cellBoxes: cellBoxes(a.labels), runs: labelRuns(a.labels) };
}

async function sendResult(id: string, a: Analysis, t0: number): Promise<AnalysisResult> {
  const overlay = await makeOverlay(a);
  // The worker keeps the analysis (for edits and exports); the page gets a transferred clone of all
  // but the label image, whose run-length form (overlay.runs) is a small fraction of it to make.
  const { labels: _kept, ...rest } = a;
  const copy: PageAnalysis = structuredClone(rest);
  const result: AnalysisResult = { id, analysis: copy, overlay, elapsedMs: performance.now() - t0 };
  const transfers: Transferable[] = collectTransfers(copy);
  transfers.push(overlay.cellBoxes.buffer as ArrayBuffer);
  if (overlay.runs) transfers.push(...collectTransfers(overlay.runs));
  if (overlay.outlines) transfers.push(overlay.outlines);
  if (overlay.outlinesThumb) transfers.push(overlay.outlinesThumb);
  return Comlink.transfer(result, transfers);
}

async function persist(id: string, a: Analysis, base: LabelImage | null): Promise<void> {
  try {
    const db = await openSessionDb();
    // Forgotten or replaced meanwhile: nothing of this one to store.
    if (current.get(id) !== a) return;
    await db.put('results', { id, analysis: a });
    if (base) await db.put('base', { id, labels: base });
  } catch (e) {
    // A full disk must not lose the result on screen; the page says the session could not be saved.
    console.warn('Tessellab: could not store the result', e);
  }
}

async function ensureOpened(id: string): Promise<Opened> {
  const o = opened.get(id);
  if (o) return o;
  throw new Error(`Image ${id} is not open in the worker; open it first.`);
}

/** A filmstrip thumbnail of a frame (contrast-stretched like the Bench). */
async function frameThumb(img: GreyImage): Promise<ImageBitmap> {
  const b = await bitmapOf(displayRgba(img), img.width, img.height);
  const k = Math.min(1, KINETICS_THUMB_SIDE / Math.max(img.width, img.height));
  if (k >= 1) return b;
  const t = await createImageBitmap(b, { resizeWidth: Math.max(1, Math.round(img.width * k)), resizeHeight: Math.max(1, Math.round(img.height * k)), resizeQuality: 'medium' });
  b.close();
  return t;
}

/** Frames, their sources and times as `tessellab kinetics` gathers them (names give the order too). */
async function seriesOf(req: KineticsRequest): Promise<{ frames: GreyImage[]; sources: string[]; times: number[]; fileUmPerPx: number | null }> {
  const k = await import('../src/core/kinetics/index');
  const frames: GreyImage[] = [];
  const sources: string[] = [];
  let fileUmPerPx: number | null = null;
  for (const id of req.ids) {
    const o = await ensureOpened(id);
    if (o.kind !== 'image') throw new Error(`${o.name} is a point set; a kinetics series needs images.`);
    fileUmPerPx ??= o.umPerPxFromFile;
    const name = o.name.split(/[\\/]/).pop() ?? o.name;
    o.pages.forEach((p, i) => {
      frames.push(p);
      sources.push(o.pages.length > 1 ? `${name}[${i + 1}]` : name);
    });
  }
  let times = req.times.kind === 'list' ? k.parseTimesList(req.times.text)
    : req.times.kind === 'csv' ? k.parseTimesCsv(req.times.text, sources) : k.timesFromNames(sources);
  if (req.times.kind === 'names') {
    const order = times.map((_, i) => i).sort((a, b) => times[a] - times[b]);
    if (order.some((j, i) => j !== i)) {
      const [f, s] = [frames.slice(), sources.slice()];
      order.forEach((j, i) => { frames[i] = f[j]; sources[i] = s[j]; });
      times = order.map((j) => times[j]);
    }
  }
  return { frames, sources, times, fileUmPerPx };
}

const api: WorkerApi = {
  async vectorLayers(id, req) {
    const a = current.get(id);
    if (!a || typeof OffscreenCanvas === 'undefined') return null;
    const t = a.tessellation;
    const f = t.field;
    const fw = f.x1 - f.x0, fh = f.y1 - f.y0;
    const k = Math.min(1, req.side / Math.max(fw, fh));
    const c = new OffscreenCanvas(Math.max(1, Math.round(fw * k)), Math.max(1, Math.round(fh * k)));
    const ctx = c.getContext('2d');
    if (!ctx) return null;
    const { drawVoronoi, drawDelaunay, drawCentroids } = await exporters();
    // The same colours and order as the Bench strokes them when zoomed in.
    ctx.setTransform(k, 0, 0, k, -f.x0 * k, -f.y0 * k);
    const closing = { x0: 0, y0: 0, moveTo(x: number, y: number) { this.x0 = x; this.y0 = y; ctx.moveTo(x, y); }, lineTo(x: number, y: number) { ctx.lineTo(x, y); }, closePath() { ctx.lineTo(this.x0, this.y0); } };
    ctx.lineWidth = req.lineWidth / k;
    if (req.voronoi) { ctx.beginPath(); drawVoronoi(closing, t); ctx.strokeStyle = 'rgba(86, 180, 233, 0.95)'; ctx.stroke(); }
    if (req.delaunay) { ctx.beginPath(); drawDelaunay(closing, t); ctx.strokeStyle = 'rgba(204, 121, 167, 0.95)'; ctx.stroke(); }
    if (req.centroids) {
      const n = t.points.length / 2;
      const spacing = Math.sqrt((fw * fh) / Math.max(1, n));
      ctx.beginPath();
      drawCentroids(closing, t.points, Math.max(1.5, spacing * 0.08));
      ctx.lineWidth = (req.lineWidth * 1.2) / k;
      ctx.strokeStyle = 'rgba(213, 94, 0, 1)';
      ctx.stroke();
    }
    const b = c.transferToImageBitmap();
    return Comlink.transfer(b, [b]);
  },

  async kinetics(req, onProgress) {
    await pipeline();
    const { frames, sources, times, fileUmPerPx } = await seriesOf(req);
    const settings = resolveSettings(req.settings);
    if (settings.umPerPx === null && fileUmPerPx !== null) settings.umPerPx = fileUmPerPx;
    const { analyzeSeriesDetailed } = await import('../src/core/kinetics/index');
    const { kineticsCsv, kineticsJson } = await import('../src/core/export/kinetics');
    const { result, mosaic } = await analyzeSeriesDetailed(frames, times, settings, {
      timeUnit: req.timeUnit || 's', sources, allowDecreasing: req.allowDecreasing, onProgress: (st, f) => onProgress?.(st, f),
    });
    lastSeries = { last: frames[frames.length - 1], mosaic, result, umPerPx: settings.umPerPx, minCellAreaPx: settings.minCellAreaPx };
    const thumbs: ImageBitmap[] = [];
    for (const f of frames) thumbs.push(await frameThumb(f));
    const enc = new TextEncoder();
    const files: ExportFile[] = [
      { name: 'kinetics.csv', bytes: enc.encode(kineticsCsv(result)), mime: 'text/csv' },
      { name: 'kinetics.json', bytes: enc.encode(kineticsJson(result)), mime: 'application/json' },
      { name: 'settings.json', bytes: enc.encode(JSON.stringify(settings, null, 2) + '\n'), mime: 'application/json' },
    ];
    const run = { result, thumbs, files, width: frames[0].width, height: frames[0].height };
    return Comlink.transfer(run, [...thumbs, ...files.map((f) => f.bytes.buffer as ArrayBuffer)]);
  },

  async kineticsFinal(id) {
    const s = lastSeries;
    if (!s) throw new Error('Run the kinetics of a series first; the final frame comes from that run.');
    const { encodePng } = await import('../src/core/image/encode');
    const bytes = encodePng({ width: s.last.width, height: s.last.height, data: s.last.data, channels: 1, bitDepth: s.last.bitDepth });
    // As `tessellab kinetics --final-analysis`: the mosaic's labels measured on the last frame in the series' field.
    bases.set(id, s.mosaic.labels);
    try {
      const db = await openSessionDb();
      await db.put('base', { id, labels: s.mosaic.labels });
    } catch (e) {
      console.warn('Tessellab: could not store the mosaic', e);
    }
    const settings: SettingsInput = { pattern: 'walls', field: s.result.field, umPerPx: s.umPerPx, minCellAreaPx: s.minCellAreaPx };
    return Comlink.transfer({ bytes, settings, domains: s.mosaic.labels.count, complete: s.mosaic.complete }, [bytes.buffer as ArrayBuffer]);
  },

  async warmUp(onProgress) {
    await pipeline(onProgress);
  },

  async open(id, name, bytes, maxPixels) {
    let data = bytes;
    if (!data) {
      const rec = await storedBytes(id);
      if (!rec) throw new Error(`${name}: the stored copy of this image is gone; add the file again.`);
      data = rec.bytes;
    } else {
      const db = await openSessionDb();
      await db.put('images', { id, name, bytes: data });
    }
    let o: Opened;
    if (isPointsFile(name, data)) {
      const { parsePointsCsv } = await import('../src/core/segment/points');
      const p = parsePointsCsv(new TextDecoder().decode(data), { name });
      // The field of a point set is the box from the origin to the farthest point, rounded up to whole px,
      // as `tessellab analyze --pattern points` takes it without --size.
      let mx = 0, my = 0;
      for (let i = 0; i < p.points.length; i += 2) { mx = Math.max(mx, p.points[i]); my = Math.max(my, p.points[i + 1]); }
      const width = Math.max(1, Math.ceil(mx)), height = Math.max(1, Math.ceil(my));
      o = { name, kind: 'points', image: null, pages: [], points: p.points, width, height, umPerPxFromFile: null };
    } else {
      const { decodeImage } = await import('../src/core/image/decode');
      const d = await decodeImage(data, { name, maxPixels });
      const page = d.pages[0];
      o = { name, kind: 'image', image: page, pages: d.pages, points: null, width: page.width, height: page.height, umPerPxFromFile: d.umPerPx };
      opened.set(id, o);
      const bitmap = await bitmapOf(displayRgba(page), page.width, page.height);
      const thumb = await thumbOf(bitmap, 'high');
      const r: OpenResult = {
        id, kind: 'image', width: page.width, height: page.height, umPerPxFromFile: d.umPerPx, pages: d.pages.length,
        wasColour: d.wasColour, bitDepth: page.bitDepth, bitmap, thumb,
      };
      return Comlink.transfer(r, thumb ? [bitmap, thumb] : [bitmap]);
    }
    opened.set(id, o);
    return { id, kind: 'points', width: o.width, height: o.height, umPerPxFromFile: null, pages: 0, wasColour: false, bitDepth: 8, bitmap: null, thumb: null };
  },

  async analyze(req: AnalyzeRequest, onProgress?: ProgressFn) {
    const t0 = performance.now();
    const o = await ensureOpened(req.id);
    controllers.get(req.id)?.abort();
    const ctl = new AbortController();
    controllers.set(req.id, ctl);
    try {
      const core = await pipeline(onProgress);
      const opts = {
        onProgress: (s: string, f: number) => onProgress?.(s, f), signal: ctl.signal, referencePool: referencePool(), calibrationSource: req.calibrationSource,
      };
      let base = bases.get(req.id) ?? null;
      if (req.reuseLabels && !base) {
        const db = await openSessionDb();
        base = (await db.get('base', req.id))?.labels ?? null;
      }
      let a: Analysis;
      let newBase: LabelImage | null = null;
      const size = { width: o.width, height: o.height };
      const fieldImage = (): GreyImage | null => {
        if (!o.image) return null;
        const s = resolveSettings(req.settings);
        return core.cropImage(o.image, core.resolveField(s.field, o.width, o.height));
      };
      if (req.reuseLabels && base) {
        const labels = applyEdits(base, req.ops ?? []);
        a = await core.reanalyzeLabels(labels, fieldImage(), req.settings, size, opts);
      } else {
        const input = o.kind === 'points'
          ? { kind: 'points' as const, points: o.points as Float64Array, width: o.width, height: o.height, name: o.name }
          : { kind: 'image' as const, image: o.image as GreyImage, name: o.name };
        a = await core.analyze(input, req.settings, opts);
        newBase = a.labels;
        if (newBase) bases.set(req.id, newBase);
        if (newBase && req.ops && req.ops.length) {
          a = await core.reanalyzeLabels(applyEdits(newBase, req.ops), fieldImage(), req.settings, size, opts);
        }
      }
      current.set(req.id, a);
      try {
        return await sendResult(req.id, a, t0);
      } finally {
        // Stored once the page has the result: copying a large analysis into IndexedDB takes a second or
        // more for 16 MP, and the page need not wait for it (a reload before it is done measures again).
        // A newer result of the same image stores itself instead.
        setTimeout(() => void persist(req.id, a, newBase), 0);
      }
    } finally {
      if (controllers.get(req.id) === ctl) controllers.delete(req.id);
    }
  },

  async preview(id: string, settings: SettingsInput, maxSide: number): Promise<PreviewResult> {
    const o = await ensureOpened(id);
    if (!o.image) return { id, outlines: null, count: 0, scale: 1 };
    const core = await pipeline();
    const f = Math.max(1, Math.ceil(Math.max(o.width, o.height) / maxSide));
    const small = f === 1 ? o.image : downscaleGrey(o.image, f);
    const a = await core.analyze({ kind: 'image', image: small, name: o.name }, scaleSettings(settings, f));
    const outlines = a.labels ? await bitmapOf(outlineRgba(a.labels), a.labels.width, a.labels.height) : null;
    const r: PreviewResult = { id, outlines, count: a.labels ? a.labels.count : 0, scale: f };
    return Comlink.transfer(r, outlines ? [outlines] : []);
  },

  async grain(id: string) {
    const a = current.get(id) ?? (await (await openSessionDb()).get('results', id))?.analysis;
    if (!a) throw new Error('This image has no result yet; analyse it first.');
    if (!a.labels) throw new Error('Grain size needs a segmented image (walls pattern); a points pattern has no grains.');
    const { grainSize } = await import('../src/core/grain/index');
    const { grainReportHtml } = await import('../src/core/export/grainReport');
    const l = a.labels;
    const result = grainSize({
      labels: l, umPerPx: a.settings.umPerPx, field: { x0: 0, y0: 0, x1: l.width, y1: l.height }, pattern: a.settings.pattern, settings: a.settings,
    });
    const o = opened.get(id);
    let imagePngDataUrl: string | undefined;
    if (o?.image) {
      const { cropImage } = await pipeline();
      const crop = cropImage(o.image, a.field);
      const { encodePng } = await import('../src/core/image/encode');
      const rgba = displayRgba(crop);
      const grey = new Uint8Array(crop.width * crop.height);
      for (let i = 0; i < grey.length; i++) grey[i] = rgba[4 * i];
      const png = encodePng({ width: crop.width, height: crop.height, data: grey, channels: 1, bitDepth: 8 });
      let bin = '';
      for (let i = 0; i < png.length; i += 0x8000) bin += String.fromCharCode(...png.subarray(i, i + 0x8000));
      imagePngDataUrl = `data:image/png;base64,${btoa(bin)}`;
    }
    const name = o?.name ?? (await storedBytes(id))?.name ?? id;
    const reportHtml = grainReportHtml({ name, result, umPerPx: a.settings.umPerPx as number, width: l.width, height: l.height, imagePngDataUrl });
    return { id, result, reportHtml, offsetX: a.field.x0, offsetY: a.field.y0 };
  },

  async restore(id: string) {
    const t0 = performance.now();
    const db = await openSessionDb();
    const rec = await db.get('results', id);
    if (!rec) return null;
    current.set(id, rec.analysis);
    const base = await db.get('base', id);
    if (base) bases.set(id, base.labels);
    return sendResult(id, rec.analysis, t0);
  },

  async exportFiles(id: string, kinds: ExportKind[]) {
    const a = current.get(id) ?? (await (await openSessionDb()).get('results', id))?.analysis;
    if (!a) throw new Error('This image has no result yet; analyse it first.');
    const name = opened.get(id)?.name ?? (await storedBytes(id))?.name ?? id;
    const files = await filesFor(a, name, kinds);
    return Comlink.transfer(files, files.map((f) => f.bytes.buffer as ArrayBuffer));
  },

  async exportZip(ids: string[], kinds: ExportKind[]) {
    const ex = await exporters();
    const entries: Record<string, Uint8Array> = {};
    const rows: { name: string; summary: Analysis['summary'] | null }[] = [];
    const used = new Set<string>();
    for (const id of ids) {
      const a = current.get(id) ?? (await (await openSessionDb()).get('results', id))?.analysis;
      if (!a) continue;
      const name = opened.get(id)?.name ?? (await storedBytes(id))?.name ?? id;
      let dir = baseName(name);
      for (let k = 2; used.has(dir); k++) dir = `${baseName(name)}-${k}`;
      used.add(dir);
      for (const f of await filesFor(a, name, kinds)) entries[`${dir}/${f.name}`] = f.bytes;
      rows.push({ name, summary: a.summary });
    }
    if (rows.length === 0) throw new Error('No image has a result yet; analyse one first.');
    entries['summary.csv'] = new TextEncoder().encode(ex.summaryCsv(rows));
    const zip = zipSync(entries, { level: 6 });
    return Comlink.transfer(zip, [zip.buffer as ArrayBuffer]);
  },

  async forget(id: string) {
    opened.delete(id);
    current.delete(id);
    bases.delete(id);
    const db = await openSessionDb();
    await Promise.all([db.delete('images', id), db.delete('results', id), db.delete('base', id)]);
  },

  cancel(id: string) {
    controllers.get(id)?.abort();
  },

  crash() {
    setTimeout(() => { throw new Error('Tessellab test: the worker was made to fail.'); }, 0);
  },
};

/** The files `tessellab analyze` writes for one image: the core's one list, so they match byte for byte. */
async function filesFor(a: Analysis, fileName: string, kinds: ExportKind[]): Promise<ExportFile[]> {
  const ex = await exporters();
  const outlines = ex.needsOutlines(kinds) ? await (await pipeline()).outlinesOf(a) : null;
  return ex.imageFiles(a, fileName, outlines, kinds).map((f) => ({ name: f.name, bytes: f.data, mime: f.mime }));
}

Comlink.expose(api);
