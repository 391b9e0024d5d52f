/** Shared data types of the core. Pixels are row-major, index = y * width + x. */

/** A single-channel image. 16-bit precision is kept until thresholding. */
export interface GreyImage {
  width: number;
  height: number;
  /** Grey values, 0..255 for 8-bit, 0..65535 for 16-bit. */
  data: Uint8Array | Uint16Array;
  bitDepth: 8 | 16;
}

/** What a decoder returns: one or more pages (multi-page TIFF) and the pixel size if the file says it. */
export interface DecodedImage {
  format: 'png' | 'jpeg' | 'tiff';
  pages: GreyImage[];
  /** Micrometres per pixel read from the file (TIFF resolution tags, OME PhysicalSizeX), or null. */
  umPerPx: number | null;
  /** Why a pixel size the file gives is not used (a screen or print resolution such as 72 dpi); absent otherwise. */
  pixelSizeNotice?: string;
  /** Whether the source had colour channels that were converted to grey. */
  wasColour: boolean;
}

/**
 * A label image: 0 is wall / background, 1..count are cells. Every label in 1..count is present.
 */
export interface LabelImage {
  width: number;
  height: number;
  labels: Int32Array;
  count: number;
}

/** Per-cell results as columns, index i is cell i + 1. */
export type Columns = Record<string, Float64Array | Int32Array>;

/** An axis-aligned rectangle in pixels: [x0, x1) x [y0, y1). */
export interface Rect {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Progress callback: stage name and fraction done in [0, 1]. */
export type Progress = (stage: string, fraction: number) => void;
