/**
 * Analysis and preview: opening a file (its bytes given or stored), analysing it (with the edits of the
 * page, see edits.ts), the quick preview while a slider moves, restoring a stored result, the Bench's
 * reduced vector layers, cancelling and forgetting.
 */
import * as Comlink from 'comlink';
import type { OpenedFile } from '../../src/app/open';
import type { Analysis } from '../../src/core/analysis.types';
import { MissingError } from '../../src/core/errors';
import { LAYER_COLOURS, rgba } from '../../src/core/export/palette';
import type { LabelImage } from '../../src/core/types';
import { displayBitmap, bitmapOf, makeOverlay, thumbOf } from '../bitmaps';
import { collectTransfers, downscaleGrey, outlineRgba, scaleSettings } from '../helpers';
import type { AnalysisResult, OpenResult, PageAnalysis, PreviewResult, WorkerApi } from '../protocol';
import { exporters, pipeline, referencePool } from '../runtime';
import { openedFile, type Session } from '../session';
import { forgetStored, storeBase, storedBase, storedImage, storedResult, storeImage, storeResult } from '../storage';
import { analyseWithEdits } from './edits';

export type AnalysisApi = Pick<WorkerApi, 'warmUp' | 'open' | 'adopt' | 'analyze' | 'preview' | 'restore' | 'vectorLayers' | 'forget' | 'cancel'>;

/** A finished analysis for the page: all but the label image (kept here), transferred, with its overlay. */
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

/** Stores a result (and new base labels) unless a newer result of the image replaced it meanwhile. */
async function persist(s: Session, id: string, a: Analysis, base: LabelImage | null): Promise<void> {
  try {
    if (s.current.get(id) !== a) return;
    await storeResult(id, a);
    if (base) await storeBase(id, base);
  } catch (e) {
    // A full disk must not lose the result on screen; the page says the session could not be saved.
    console.warn('Tessellab: could not store the result', e);
  }
}

/** What the page learns of an opened file (an image's bitmaps are transferred). */
async function openResult(id: string, o: OpenedFile): Promise<OpenResult> {
  if (o.kind === 'points') {
    return { id, kind: 'points', width: o.width, height: o.height, umPerPxFromFile: null, pages: 0, wasColour: false, bitDepth: 8, bitmap: null, thumb: null };
  }
  const bitmap = await displayBitmap(o.image);
  const thumb = await thumbOf(bitmap, 'high');
  const r: OpenResult = {
    id, kind: 'image', width: o.width, height: o.height, umPerPxFromFile: o.umPerPxFromFile, pages: o.pages.length,
    wasColour: o.wasColour, bitDepth: o.image.bitDepth, bitmap, thumb,
  };
  return Comlink.transfer(r, thumb ? [bitmap, thumb] : [bitmap]);
}

export function analysisFeature(s: Session): AnalysisApi {
  return {
    async warmUp(onProgress) {
      await pipeline(onProgress);
    },

    async open(id, name, bytes, maxPixels, stored) {
      let data = bytes;
      if (!data) {
        const rec = await storedImage(id);
        if (!rec) throw new MissingError(`${name}: the stored copy of this image is gone; add the file again.`);
        data = rec.bytes;
      } else if (!stored) {
        await storeImage(id, name, data);
      }
      const { openFile } = await import('../../src/app/open');
      const o = await openFile(name, data, { maxPixels });
      s.opened.set(id, o);
      return openResult(id, o);
    },

    async adopt(id, packed, settings) {
      const o = openedFile(s, id);
      if (o.kind !== 'image') return null;
      const t0 = performance.now();
      const { snapshotMatches, unpackAnalysis } = await import('../../src/app/snapshot');
      let p: ReturnType<typeof unpackAnalysis>;
      try {
        p = unpackAnalysis(packed);
      } catch {
        return null;
      }
      if (!(await snapshotMatches(p, o.name, o.image, o.umPerPxFromFile, settings))) return null;
      const a = p.analysis;
      s.current.set(id, a);
      if (a.labels) s.bases.set(id, a.labels);
      try {
        return await sendResult(id, a, t0);
      } finally {
        setTimeout(() => void persist(s, id, a, a.labels), 0);
      }
    },

    async analyze(req, onProgress) {
      const t0 = performance.now();
      const o = openedFile(s, req.id);
      s.controllers.get(req.id)?.abort();
      const ctl = new AbortController();
      s.controllers.set(req.id, ctl);
      try {
        const p = await pipeline(onProgress);
        const opts = { onProgress: (st: string, f: number) => onProgress?.(st, f), signal: ctl.signal, referencePool: referencePool() };
        const { analysis: a, newBase } = await analyseWithEdits(s, p, o, req, opts);
        s.current.set(req.id, a);
        try {
          return await sendResult(req.id, a, t0);
        } finally {
          // Stored once the page has the result: copying a large analysis into IndexedDB takes a second or
          // more for 16 MP, and the page need not wait for it (a reload before it is done measures again).
          // A newer result of the same image stores itself instead.
          setTimeout(() => void persist(s, req.id, a, newBase), 0);
        }
      } finally {
        if (s.controllers.get(req.id) === ctl) s.controllers.delete(req.id);
      }
    },

    async preview(id, settings, maxSide): Promise<PreviewResult> {
      const o = openedFile(s, id);
      if (o.kind !== 'image') return { id, outlines: null, count: 0, scale: 1 };
      const { core } = await pipeline();
      const f = Math.max(1, Math.ceil(Math.max(o.width, o.height) / maxSide));
      const small = f === 1 ? o.image : downscaleGrey(o.image, f);
      const a = await core.analyze({ kind: 'image', image: small, name: o.name }, scaleSettings(settings, f));
      const outlines = a.labels ? await bitmapOf(outlineRgba(a.labels), a.labels.width, a.labels.height) : null;
      const r: PreviewResult = { id, outlines, count: a.labels ? a.labels.count : 0, scale: f };
      return Comlink.transfer(r, outlines ? [outlines] : []);
    },

    async restore(id) {
      const t0 = performance.now();
      const a = await storedResult(id);
      if (!a) return null;
      s.current.set(id, a);
      const base = await storedBase(id);
      if (base) s.bases.set(id, base);
      return sendResult(id, a, t0);
    },

    async vectorLayers(id, req) {
      const a = s.current.get(id);
      if (!a || typeof OffscreenCanvas === 'undefined') return null;
      const t = a.tessellation;
      const f = t.field;
      const fw = f.x1 - f.x0, fh = f.y1 - f.y0;
      const k = Math.min(1, req.side / Math.max(fw, fh));
      const c = new OffscreenCanvas(Math.max(1, Math.round(fw * k)), Math.max(1, Math.round(fh * k)));
      const ctx = c.getContext('2d');
      if (!ctx) return null;
      const { drawVoronoi, drawDelaunay, drawCentroids } = await exporters();
      // The same colours (the one palette) and order as the Bench strokes them when zoomed in.
      ctx.setTransform(k, 0, 0, k, -f.x0 * k, -f.y0 * k);
      const closing = { x0: 0, y0: 0, moveTo(x: number, y: number) { this.x0 = x; this.y0 = y; ctx.moveTo(x, y); }, lineTo(x: number, y: number) { ctx.lineTo(x, y); }, closePath() { ctx.lineTo(this.x0, this.y0); } };
      ctx.lineWidth = req.lineWidth / k;
      if (req.voronoi) { ctx.beginPath(); drawVoronoi(closing, t); ctx.strokeStyle = rgba(LAYER_COLOURS.voronoi.colour, 0.95); ctx.stroke(); }
      if (req.delaunay) { ctx.beginPath(); drawDelaunay(closing, t); ctx.strokeStyle = rgba(LAYER_COLOURS.delaunay.colour, 0.95); ctx.stroke(); }
      if (req.centroids) {
        const n = t.points.length / 2;
        const spacing = Math.sqrt((fw * fh) / Math.max(1, n));
        ctx.beginPath();
        drawCentroids(closing, t.points, Math.max(1.5, spacing * 0.08));
        ctx.lineWidth = (req.lineWidth * 1.2) / k;
        ctx.strokeStyle = LAYER_COLOURS.centroids.colour;
        ctx.stroke();
      }
      const b = c.transferToImageBitmap();
      return Comlink.transfer(b, [b]);
    },

    async forget(id) {
      s.opened.delete(id);
      s.current.delete(id);
      s.bases.delete(id);
      await forgetStored(id);
    },

    cancel(id) {
      s.controllers.get(id)?.abort();
    },
  };
}
