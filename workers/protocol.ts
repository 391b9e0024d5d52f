/**
 * The contract between the page (src/ui/bridge.ts) and the analysis worker. Types only: both sides import
 * this file, so a change in one is a compile error in the other.
 */
import type { Analysis } from '../src/core/analysis.types';
import type { LabelRuns } from '../src/core/labelRuns';
import type { SettingsInput } from '../src/core/settings';
import type { EditOp } from '../src/core/edit/labels';

/** Progress report from the worker: stage name and fraction done in [0, 1]. */
export type ProgressFn = (stage: string, fraction: number) => void;

/**
 * How every failure of a call reaches the page: the core error's kind and its message, as plain data
 * (class instances do not survive cloning). The bridge re-creates an error of that kind.
 */
export type { WireError } from '../src/app/wire';

/** What opening an image gives the page: its size, tags and a display bitmap. */
export interface OpenResult {
  id: string;
  kind: 'image' | 'points';
  width: number;
  height: number;
  /** µm per px read from the file's tags, or null. */
  umPerPxFromFile: number | null;
  pages: number;
  wasColour: boolean;
  bitDepth: 8 | 16;
  /** The (8-bit, contrast-stretched) image for the Bench; null for a points pattern. */
  bitmap: ImageBitmap | null;
  /** The same, at most THUMB_SIDE px on its long side, drawn when the Bench is zoomed out (null when the image is small). */
  thumb: ImageBitmap | null;
}

/** Long side (px) of the reduced copies the Bench draws when zoomed out, so that a frame stays cheap. */
export const THUMB_SIDE = 2048;

/** Helpers for drawing an analysis, made in the worker so the page does no per-pixel work. */
export interface Overlay {
  /** Cell outlines as an RGBA bitmap of the label image's size (transparent elsewhere); null for points. */
  outlines: ImageBitmap | null;
  /** Outlines reduced to at most THUMB_SIDE px (null when the labels are small). */
  outlinesThumb: ImageBitmap | null;
  /** Bounding box of each cell in the label image, 4 per cell: x0, y0, x1, y1 (px, exclusive end). */
  cellBoxes: Int32Array;
  /**
   * The label image in run-length form (the cell under the pointer, a selected cell's pixels); null for
   * points. The page gets this instead of the label image, which stays in the worker.
   */
  runs: LabelRuns | null;
}

/** An analysis as the page holds it: everything but the label image (see {@link Overlay.runs}). */
export type PageAnalysis = Omit<Analysis, 'labels'>;

/** A finished analysis as it reaches the page. */
export interface AnalysisResult {
  id: string;
  analysis: PageAnalysis;
  overlay: Overlay;
  /** Milliseconds spent in the worker. */
  elapsedMs: number;
}

/** A quick look at the segmentation on a downscaled copy, while a slider moves. */
export interface PreviewResult {
  id: string;
  /** Outlines of the downscaled labels; the Bench stretches them over the image. */
  outlines: ImageBitmap | null;
  count: number;
  scale: number;
}

/** One file to save: a name and its bytes. */
export interface ExportFile {
  name: string;
  bytes: Uint8Array;
  mime: string;
}

/** The export formats the worker writes with the core's export functions. */
import type { ImageFileKind } from '../src/core/export/files';
export type ExportKind = ImageFileKind;

export interface AnalyzeRequest {
  id: string;
  /**
   * The entry's own settings: `umPerPx` is the person's (null when none was set); the worker falls back
   * to the file's pixel size and records which one it used.
   */
  settings: SettingsInput;
  /** Edits to replay on the fresh labels before measuring (kept when only the scale changed). */
  ops?: EditOp[];
  /** Re-measure the stored labels instead of segmenting again (scale change, edits). */
  reuseLabels?: boolean;
}

/** A grain size rating of the current result, with its printable report. */
export interface GrainResult {
  id: string;
  result: import('../src/core/grain/types').GrainSizeResult;
  /** Self-contained HTML report (inline CSS and SVG). */
  reportHtml: string;
  /** Offset (px) of the label image in the full image: marks and figures are in label coordinates. */
  offsetX: number;
  offsetY: number;
}

/** Where the times of a kinetics series come from: typed, the last number in each file name, or a CSV of file,time. */
export type KineticsTimes = import('../src/app/series').SeriesTimes;

/** A kinetics run: the frames are every page of each listed image, in the order given. */
export interface KineticsRequest {
  /** Images (already opened) whose pages are the frames, in order. */
  ids: string[];
  times: KineticsTimes;
  /** Unit of the times, for labels and the CSV column name. */
  timeUnit: string;
  /** settings.kinetics, umPerPx, field and minCellAreaPx are used (the pixel size of the first file when none is given). */
  settings: SettingsInput;
  /** Fit even when the fraction decreases between frames. */
  allowDecreasing: boolean;
}

/** The result of a kinetics run as the page gets it. */
export interface KineticsRun {
  result: import('../src/core/kinetics/types').KineticsResult;
  /** One small bitmap per frame (at most KINETICS_THUMB_SIDE px on its long side), in the order analysed. */
  thumbs: ImageBitmap[];
  /** The files `tessellab kinetics` writes for the same frames and settings. */
  files: ExportFile[];
  /** Size (px) of the frames. */
  width: number;
  height: number;
}

/** Long side (px) of the filmstrip's thumbnails. */
export const KINETICS_THUMB_SIDE = 96;

/** The final frame of the last kinetics run, ready to be added as a walls entry measured on the mosaic's labels. */
export interface KineticsFinal {
  /** The last frame as a PNG (its own bit depth): the image of the new entry. */
  bytes: Uint8Array;
  /** Settings for the new entry: walls pattern, the series' field, pixel size and minimum area. */
  settings: SettingsInput;
  /** Domains in the final mosaic. */
  domains: number;
  complete: boolean;
}

/** Which vector layers to draw into a reduced bitmap for the zoomed-out Bench, and how. */
export interface VectorLayerRequest {
  voronoi: boolean;
  delaunay: boolean;
  centroids: boolean;
  /** Long side of the bitmap (px); the field is scaled to fit it. */
  side: number;
  /** Line width in bitmap px. */
  lineWidth: number;
}

export interface WorkerApi {
  /**
   * The Voronoi, Delaunay and centroid layers of the current result drawn into one transparent bitmap of the
   * field, at most `side` px on its long side, so the zoomed-out Bench draws one image instead of stroking
   * tens of thousands of cells on the page's thread.
   */
  vectorLayers(id: string, req: VectorLayerRequest): Promise<ImageBitmap | null>;
  /** Kinetics of an image series (frames from opened images), with thumbnails and the command line's files. */
  kinetics(req: KineticsRequest, onProgress?: ProgressFn): Promise<KineticsRun>;
  /**
   * Prepares the final mosaic of the last kinetics run as the entry `id`: its domain labels become that
   * entry's stored labels, so a re-measure ('reuseLabels') analyses the mosaic as a walls pattern.
   */
  kineticsFinal(id: string): Promise<KineticsFinal>;
  /** Grain size (ASTM E112) of the current result of an image. */
  grain(id: string): Promise<GrainResult>;
  /** Loads opencv.js (lazily; the page calls it early so that it loads while the person looks around). */
  warmUp(onProgress?: ProgressFn): Promise<void>;
  /**
   * Decodes an image (bytes given, or the copy stored in IndexedDB) and keeps it for later calls. Given
   * bytes are stored first unless `stored` says the page has stored them already.
   */
  open(id: string, name: string, bytes: Uint8Array | null, maxPixels: number, stored?: boolean): Promise<OpenResult>;
  /**
   * Takes a result made ahead of time (packed, src/app/snapshot.ts) as the analysis of an opened image when
   * it was made from the same image with the same settings, without loading the engine; null when it does
   * not fit (then analyse).
   */
  adopt(id: string, packed: Uint8Array, settings: SettingsInput): Promise<AnalysisResult | null>;
  /** Analyses an opened image; the result is also stored in IndexedDB. */
  analyze(req: AnalyzeRequest, onProgress?: ProgressFn): Promise<AnalysisResult>;
  /** Segments a downscaled copy for the live preview. */
  preview(id: string, settings: SettingsInput, maxSide: number): Promise<PreviewResult>;
  /** The stored result of an earlier session, or null. */
  restore(id: string): Promise<AnalysisResult | null>;
  /** Files of the current result of one image. */
  exportFiles(id: string, kinds: ExportKind[]): Promise<ExportFile[]>;
  /** One zip of every listed image's files plus summary.csv and settings.json. */
  exportZip(ids: string[], kinds: ExportKind[]): Promise<Uint8Array>;
  /** Forgets an image and deletes its stored copies. */
  forget(id: string): Promise<void>;
  /** Cancels a running analysis of `id` at the next stage boundary. */
  cancel(id: string): void;
  /** For tests of the crash recovery: throws outside any call, which kills the worker's event loop task. */
  crash(): void;
}
