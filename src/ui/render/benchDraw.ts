/**
 * One frame of the Bench: the image, the layers (in the one palette, src/core/export/palette.ts), the
 * selection, the grain size audit (alone, when the Grain size panel is open), the field, the line or
 * rectangle being drawn, and the scale bar. The Bench component owns the view and the state; this draws it.
 */
import { GRAIN_COLOURS, LAYER_COLOURS, rgba } from '../../core/export/palette';
import { forEachSpan } from '../../core/labelRuns';
import type { Rect } from '../../core/types';
import type { Layers } from '../../storage/db';
import type { AnalysisResult, GrainResult, PageAnalysis } from '../../../workers/protocol';
import type { Entry } from '../state/entry.svelte';
import type { Tool } from '../state/panels';
import { drawCircle, drawRect, drawVoronoi, largestGap, LineClosingSink, niceScaleLength, type TiledSink } from './overlay';

type Tiles = TiledSink<Path2D>;

/** The layers' paths, built once per result. */
export interface BuiltPaths { of: PageAnalysis; vor: Tiles; cen: Tiles; del: Tiles | null; spacing: number; gap: ReturnType<typeof largestGap> }

/** Everything one frame shows. */
export interface BenchFrame {
  cssW: number;
  cssH: number;
  /** View: screen = image * scale + (tx, ty), in CSS px. */
  scale: number;
  tx: number;
  ty: number;
  entry: Entry | null;
  result: AnalysisResult | null;
  analysis: PageAnalysis | null;
  imgW: number;
  imgH: number;
  paths: BuiltPaths | null;
  /** The worker's reduced bitmap of the vector layers, when the view is zoomed out over many cells. */
  vector: ImageBitmap | null;
  /** Whether the reduced bitmap stands for the vector layers in this view (then the paths are not stroked). */
  useVector: boolean;
  layers: Layers;
  selectedCells: number[];
  /** The grain size rating shown alone (the Grain size panel is open), or null. */
  grain: GrainResult | null;
  drag: { kind: 'pan' | 'line' | 'rect'; x0: number; y0: number; x1: number; y1: number; moved: boolean } | null;
  tool: Tool;
  scaleLine: { x0: number; y0: number; x1: number; y1: number } | null;
}

/** Strokes the tiles of a layer that meet the view. */
function strokeTiles(ctx: CanvasRenderingContext2D, f: BenchFrame, t: Tiles, pad: number): void {
  const x0 = -f.tx / f.scale, y0 = -f.ty / f.scale;
  const x1 = (f.cssW - f.tx) / f.scale, y1 = (f.cssH - f.ty) / f.scale;
  for (const tile of t.visible(x0, y0, x1, y1, pad)) ctx.stroke(tile.path);
}

/** Draws one frame into the canvas (sized to the view at the device's pixel ratio). */
export function drawBench(c: HTMLCanvasElement, f: BenchFrame): void {
  const dpr = window.devicePixelRatio || 1;
  if (c.width !== Math.round(f.cssW * dpr) || c.height !== Math.round(f.cssH * dpr)) {
    c.width = Math.round(f.cssW * dpr);
    c.height = Math.round(f.cssH * dpr);
  }
  const ctx = c.getContext('2d');
  if (!ctx) return;
  ctx.setTransform(1, 0, 0, 1, 0, 0);
  ctx.clearRect(0, 0, c.width, c.height);
  const { entry, result, analysis, paths, scale } = f;
  if (!entry) return;
  ctx.setTransform(dpr * scale, 0, 0, dpr * scale, dpr * f.tx, dpr * f.ty);
  ctx.imageSmoothingEnabled = scale < 2;
  const px = 1 / scale;
  // Zoomed out, the reduced copies are drawn: scaling 16 megapixels down every frame is too slow.
  const reduced = (full: ImageBitmap, thumb: ImageBitmap | null | undefined): ImageBitmap =>
    thumb && scale * full.width <= thumb.width * 1.25 ? thumb : full;
  if (entry.bitmap) ctx.drawImage(reduced(entry.bitmap, entry.thumb), 0, 0, f.imgW, f.imgH);
  else if (f.imgW) { ctx.fillStyle = '#fafafa'; ctx.fillRect(0, 0, f.imgW, f.imgH); }

  const field = analysis?.field;
  const pv = entry.preview;
  const L = f.layers;
  // The grain size audit shows only what the rating counted: the cells' outlines and its own marks.
  const audit = f.grain !== null;
  if (L.outlines || audit) {
    ctx.imageSmoothingEnabled = false;
    if (pv?.outlines) {
      const fx = entry.settings.field ? Math.floor(entry.settings.field.x0 / pv.scale) * pv.scale : 0;
      const fy = entry.settings.field ? Math.floor(entry.settings.field.y0 / pv.scale) * pv.scale : 0;
      ctx.drawImage(pv.outlines, fx, fy, pv.outlines.width * pv.scale, pv.outlines.height * pv.scale);
    } else if (result?.overlay.outlines && field) {
      const o = result.overlay.outlines;
      ctx.drawImage(reduced(o, result.overlay.outlinesThumb), field.x0, field.y0, o.width, o.height);
    }
  }
  if (analysis && field && paths && !audit) drawCells(ctx, f, analysis, field, paths, px);
  if (f.grain) drawGrain(ctx, f.grain, px);

  // The field (when limited) and the rectangle being drawn.
  ctx.lineWidth = 2 * px;
  const limited = entry.settings.field;
  if (limited) {
    const p = new Path2D();
    drawRect(p, limited);
    ctx.setLineDash([8 * px, 5 * px]);
    ctx.strokeStyle = LAYER_COLOURS.field.colour;
    ctx.stroke(p);
    ctx.setLineDash([]);
  }
  const d = f.drag;
  if (d && (d.kind === 'rect' || d.kind === 'line') && d.moved) {
    ctx.strokeStyle = d.kind === 'rect' ? LAYER_COLOURS.field.colour : f.tool === 'split' ? LAYER_COLOURS.centroids.colour : LAYER_COLOURS.voronoi.colour;
    if (d.kind === 'rect') {
      const p = new Path2D();
      drawRect(p, { x0: Math.min(d.x0, d.x1), y0: Math.min(d.y0, d.y1), x1: Math.max(d.x0, d.x1), y1: Math.max(d.y0, d.y1) });
      ctx.stroke(p);
    } else {
      ctx.beginPath(); ctx.moveTo(d.x0, d.y0); ctx.lineTo(d.x1, d.y1); ctx.stroke();
    }
  }
  const sl = f.scaleLine;
  if (sl && f.tool === 'scale') {
    ctx.strokeStyle = LAYER_COLOURS.voronoi.colour;
    ctx.beginPath(); ctx.moveTo(sl.x0, sl.y0); ctx.lineTo(sl.x1, sl.y1); ctx.stroke();
  }
  drawScaleBar(ctx, f, dpr);
}

/** Selected cells, the vector layers, the largest gap and the cell ids. */
function drawCells(ctx: CanvasRenderingContext2D, f: BenchFrame, analysis: PageAnalysis, field: Rect, paths: BuiltPaths, px: number): void {
  const { result, layers: L } = f;
  // Selected cells: fill their pixels (walls, bodies) or their Voronoi cell (points).
  ctx.fillStyle = rgba(LAYER_COLOURS.selection.colour, 0.45);
  const runs = result?.overlay.runs;
  for (const cell of f.selectedCells) {
    if (runs && result) {
      const b = result.overlay.cellBoxes;
      forEachSpan(runs, cell, b[4 * (cell - 1) + 1]!, b[4 * (cell - 1) + 3]!, (x0, x1, y) => ctx.fillRect(x0 + field.x0, y + field.y0, x1 - x0, 1));
    } else {
      const p = new Path2D();
      drawVoronoi(new LineClosingSink(p), analysis.tessellation, [cell - 1]);
      ctx.fill(p);
    }
  }
  ctx.lineWidth = 1.25 * px;
  const tf = analysis.tessellation.field;
  if (f.useVector && f.vector) {
    ctx.imageSmoothingEnabled = true;
    ctx.drawImage(f.vector, tf.x0, tf.y0, tf.x1 - tf.x0, tf.y1 - tf.y0);
  } else if (!f.useVector) {
    const pad = paths.spacing;
    if (L.voronoi) { ctx.strokeStyle = rgba(LAYER_COLOURS.voronoi.colour, 0.95); strokeTiles(ctx, f, paths.vor, pad); }
    if (L.delaunay && paths.del) { ctx.strokeStyle = rgba(LAYER_COLOURS.delaunay.colour, 0.95); strokeTiles(ctx, f, paths.del, pad); }
    if (L.centroids) { ctx.lineWidth = 1.5 * px; ctx.strokeStyle = LAYER_COLOURS.centroids.colour; strokeTiles(ctx, f, paths.cen, pad); }
  }
  if (f.selectedCells.length) {
    const p = new Path2D();
    drawVoronoi(new LineClosingSink(p), analysis.tessellation, f.selectedCells.map((c) => c - 1));
    ctx.lineWidth = 2.5 * px;
    ctx.strokeStyle = LAYER_COLOURS.selection.colour;
    ctx.stroke(p);
  }
  if (L.gap && paths.gap) {
    const p = new Path2D();
    drawCircle(p, paths.gap.x, paths.gap.y, paths.gap.r);
    ctx.lineWidth = 2.5 * px;
    ctx.strokeStyle = LAYER_COLOURS.gap.colour;
    ctx.setLineDash([6 * px, 4 * px]);
    ctx.stroke(p);
    ctx.setLineDash([]);
  }
  if (L.ids && paths.spacing * f.scale > 26) {
    const pts = analysis.tessellation.points;
    const x0 = -f.tx / f.scale, y0 = -f.ty / f.scale, x1 = (f.cssW - f.tx) / f.scale, y1 = (f.cssH - f.ty) / f.scale;
    ctx.font = `${12 * px}px system-ui, sans-serif`;
    ctx.textAlign = 'center';
    ctx.textBaseline = 'middle';
    ctx.lineWidth = 3 * px;
    ctx.strokeStyle = 'rgba(0,0,0,0.8)';
    ctx.fillStyle = '#ffffff';
    for (let i = 0; i < pts.length / 2; i++) {
      const x = pts[2 * i]!, y = pts[2 * i + 1]!;
      if (x < x0 || y < y0 || x > x1 || y > y1) continue;
      ctx.strokeText(String(i + 1), x, y);
      ctx.fillText(String(i + 1), x, y);
    }
  }
}

/** The grain size audit: the test figure, the counted grains, the test lines and their crossings. */
function drawGrain(ctx: CanvasRenderingContext2D, gr: GrainResult, px: number): void {
  ctx.save();
  ctx.translate(gr.offsetX, gr.offsetY);
  const ic = gr.result.intercept;
  if (ic) {
    ctx.lineWidth = 1 * px;
    ctx.strokeStyle = rgba(GRAIN_COLOURS.lines.colour, 0.8);
    const p = new Path2D();
    const ticks = new Path2D();
    for (const pat of ic.patterns) for (const ln of pat.lines) {
      const t = ln.pattern;
      if (t.kind === 'line') { p.moveTo(t.x0, t.y0); p.lineTo(t.x1, t.y1); } else drawCircle(p, t.cx, t.cy, t.r, 96);
      for (const c of ln.crossings) drawCircle(ticks, c.x, c.y, 1.5 * px, 6);
    }
    ctx.stroke(p);
    ctx.fillStyle = GRAIN_COLOURS.crossings.colour;
    ctx.fill(ticks);
  }
  const pl = gr.result.planimetric;
  if (pl) {
    ctx.lineWidth = 2 * px;
    const fig = pl.count.figure;
    const p = new Path2D();
    if (fig.shape === 'circle') drawCircle(p, fig.cx, fig.cy, fig.r, 128); else drawRect(p, fig);
    ctx.strokeStyle = GRAIN_COLOURS.figure.colour;
    ctx.stroke(p);
    for (const m of pl.count.marks) {
      ctx.fillStyle = m.weight >= 1 ? GRAIN_COLOURS.whole.colour : GRAIN_COLOURS.part.colour;
      ctx.fillRect(m.x - 2.5 * px, m.y - 2.5 * px, 5 * px, 5 * px);
    }
  }
  ctx.restore();
}

/** The calibration on the figure: a scale bar in the lower left corner, in screen space. */
function drawScaleBar(ctx: CanvasRenderingContext2D, f: BenchFrame, dpr: number): void {
  if (!f.entry) return;
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
  const um = f.entry.effectiveSettings().umPerPx;
  ctx.font = '12px system-ui, sans-serif';
  ctx.textAlign = 'left';
  ctx.textBaseline = 'bottom';
  const H = f.cssH;
  if (um) {
    const lenUm = niceScaleLength((f.cssW * 0.25 * um) / f.scale);
    const lenPx = (lenUm / um) * f.scale;
    ctx.fillStyle = 'rgba(0,0,0,0.6)';
    ctx.fillRect(8, H - 34, lenPx + 16, 28);
    ctx.fillStyle = '#fff';
    ctx.fillRect(16, H - 14, lenPx, 4);
    ctx.fillText(`${lenUm} µm`, 16, H - 16);
  } else {
    ctx.fillStyle = 'rgba(0,0,0,0.6)';
    ctx.fillRect(8, H - 26, 196, 20);
    ctx.fillStyle = '#fff';
    ctx.fillText('Uncalibrated: values in px', 14, H - 10);
  }
}

/** The legend of what a frame shows, in the palette's order. */
export function legendItems(f: Pick<BenchFrame, 'layers' | 'grain' | 'selectedCells' | 'analysis'> & { field: Rect | null; hasOutlines: boolean }): { colour: string; label: string; dashed?: boolean }[] {
  const L = f.layers;
  const out: { colour: string; label: string; dashed?: boolean }[] = [];
  if ((L.outlines || f.grain) && f.hasOutlines) out.push(LAYER_COLOURS.outlines);
  if (f.grain) {
    if (f.grain.result.planimetric) out.push(GRAIN_COLOURS.figure, GRAIN_COLOURS.whole, GRAIN_COLOURS.part);
    if (f.grain.result.intercept) out.push(GRAIN_COLOURS.lines, GRAIN_COLOURS.crossings);
  } else if (f.analysis) {
    if (L.voronoi) out.push(LAYER_COLOURS.voronoi);
    if (L.delaunay) out.push(LAYER_COLOURS.delaunay);
    if (L.centroids) out.push(LAYER_COLOURS.centroids);
    if (L.gap) out.push(LAYER_COLOURS.gap);
    if (f.selectedCells.length) out.push(LAYER_COLOURS.selection);
  }
  if (f.field) out.push(LAYER_COLOURS.field);
  return out;
}
