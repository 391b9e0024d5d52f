/**
 * Opening an input file, as the command line and the web app's worker both do: a points CSV or an image,
 * decoded from its bytes, with the field of a point set and the pixel size the file carries.
 * Pure: bytes in, typed values out (no file system, no DOM). The decoders load on first use, so that a
 * caller that only sniffs or measures a field does not pay for them.
 */
import type { GreyImage } from '../core/types';

/** A point set read from a CSV of x, y (px): its field runs from the origin to `width` x `height`. */
export interface OpenedPoints {
  kind: 'points';
  name: string;
  /** Interleaved x, y in px. */
  points: Float64Array;
  width: number;
  height: number;
  umPerPxFromFile: null;
  /** What to tell the user about the file (coincident points merged, and how many), one sentence each; absent = nothing. */
  warnings?: string[];
}

/** An image decoded into grey pages (a multi-page TIFF has several; the first is the one analysed). */
export interface OpenedImage {
  kind: 'image';
  name: string;
  /** The first page. */
  image: GreyImage;
  /** Every page of the file: a multi-page TIFF is a series. */
  pages: GreyImage[];
  width: number;
  height: number;
  /** µm per px read from the file's tags, or null. */
  umPerPxFromFile: number | null;
  /** Why a pixel size the file gives is not used (a screen or print resolution such as 72 dpi); absent otherwise. */
  calibrationNotice?: string;
  wasColour: boolean;
}

export type OpenedFile = OpenedPoints | OpenedImage;

export interface OpenOptions {
  /**
   * 'points' reads the bytes as a CSV of x, y, 'image' decodes them; without it the name and the first
   * bytes decide ({@link looksLikePoints}).
   */
  as?: 'points' | 'image';
  /** Field of a point set (width, height in px); without it, {@link pointsField} of the points. */
  size?: readonly [number, number] | null;
  /** Limit on the pixels of one image page (the decoder's default when absent). */
  maxPixels?: number;
}

/**
 * Whether a file is a points CSV rather than an image: a .csv or .txt name, or text without an image
 * signature that contains digits.
 */
export function looksLikePoints(name: string, bytes: Uint8Array): boolean {
  if (/\.(csv|txt)$/i.test(name)) return true;
  // A text file without an image signature: treat as points only when it looks like numbers.
  const head = new TextDecoder().decode(bytes.subarray(0, 64));
  return /^[\s\w",;.\-+]*$/.test(head) && /\d/.test(head) && !/^\x89PNG|^II\*|^MM\0\*/.test(head) && bytes[0] !== 0xff;
}

/**
 * The field of a point set without a given size: from the origin to the largest coordinate in x and in y,
 * rounded up to whole px (at least 1 x 1).
 *
 * @param points interleaved x, y in px
 */
export function pointsField(points: Float64Array): { width: number; height: number } {
  let mx = 0;
  let my = 0;
  for (let i = 0; i < points.length; i += 2) {
    mx = Math.max(mx, points[i]!);
    my = Math.max(my, points[i + 1]!);
  }
  return { width: Math.max(1, Math.ceil(mx)), height: Math.max(1, Math.ceil(my)) };
}

/**
 * Reads one input file from its bytes.
 *
 * @param name the file's name (without folders is best: it starts every error message)
 * @param bytes the whole file
 * @throws CsvError for a points file that cannot be read; the decoder's typed errors for an image
 */
export async function openFile(name: string, bytes: Uint8Array, opts: OpenOptions = {}): Promise<OpenedFile> {
  const asPoints = opts.as ? opts.as === 'points' : looksLikePoints(name, bytes);
  if (asPoints) {
    const { parsePointsCsv } = await import('../core/segment/points');
    // Coincident points are merged, with a warning that says how many.
    const { points, warnings } = parsePointsCsv(new TextDecoder().decode(bytes), { name });
    const field = opts.size ? { width: opts.size[0], height: opts.size[1] } : pointsField(points);
    return { kind: 'points', name, points, width: field.width, height: field.height, umPerPxFromFile: null, warnings };
  }
  const { decodeImage } = await import('../core/image/decode');
  const d = await decodeImage(bytes, { name, maxPixels: opts.maxPixels });
  const image = d.pages[0]!;
  return {
    kind: 'image', name, image, pages: d.pages, width: image.width, height: image.height,
    umPerPxFromFile: d.umPerPx, wasColour: d.wasColour, ...(d.pixelSizeNotice ? { calibrationNotice: d.pixelSizeNotice } : {}),
  };
}
