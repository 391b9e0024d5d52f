/**
 * The real-photograph corpus (test/fixtures/real): loading an image from the cache that
 * scripts/fetch-real-images.sh fills, its hand-made truth file, and matching segmented cells to the truth
 * marks.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Analysis } from '../../src/core/analysis.types';
import { decodeImage } from '../../src/core/image/index';
import type { GreyImage, LabelImage, Rect } from '../../src/core/types';

const DIR = fileURLToPath(new URL('../fixtures/real/', import.meta.url));

/** A truth file, test/fixtures/real/<name>.truth.json, made by a person looking at the image. */
export interface RealTruth {
  image: string;
  size: [number, number];
  source: string;
  licence: string;
  pattern: 'walls' | 'bodies';
  /** The phase of the bodies, as seen. */
  polarity?: 'bright' | 'dark';
  /** Cells counted by eye: in the whole image, or in marks.crop when there is one. */
  countByEye: number;
  /** Where some calls are doubtful: the least and most the count by eye could be. */
  countByEyeRange?: [number, number];
  /** Cells counted by eye that touch no edge of the counted rectangle. */
  interiorByEye?: number;
  howMade: string;
  marks: {
    /**
     * The counted rectangle (px, image coordinates, [x0, x1) x [y0, y1)), which the tests analyse as the
     * field; null = the whole image.
     */
    crop: Rect | null;
    /** [x, y] or [x, y, radius] per cell counted, px. */
    points: number[][];
  };
}

export function loadTruth(name: string): RealTruth {
  return JSON.parse(readFileSync(join(DIR, `${name}.truth.json`), 'utf8')) as RealTruth;
}

/** The image as the pipeline reads it (src/core/image); a clear failure when the cache has not been filled. */
export async function loadRealImage(file: string): Promise<GreyImage> {
  const path = join(DIR, 'cache', file);
  if (!existsSync(path)) throw new Error(`${path} is missing; run scripts/fetch-real-images.sh (it takes the real-photograph corpus out of Debian's python3-skimage).`);
  const dec = await decodeImage(new Uint8Array(readFileSync(path)), { name: file });
  return dec.pages[0]!;
}

export interface MarkMatch {
  /** Cells of the analysis (in the field). */
  cells: number;
  /** Marks (truth cells). */
  marks: number;
  /**
   * Marks matched one-to-one: the mark lies in a cell that holds no other mark, and (with a radius) the cell's
   * centroid is within `centroidTol`·radius of the mark, its area within `areaTol` of π·radius², and no other
   * cell has its centroid within the radius.
   */
  matched: number;
  /** Cells that hold no mark: background cells or fragments of a body. */
  unmarked: number;
  /** With radii: unmarked cells whose centroid lies farther than the radius from every mark (off every body); null without radii. */
  background: number | null;
  /** Cells holding two marks or more (merged). */
  merged: number;
  /** Per mark: the cell label it fell in (0 = background / none), and whether it matched. */
  perMark: { label: number; ok: boolean }[];
}

/**
 * Matches the cells of an analysis to the truth marks (common practice for counting objects against a
 * hand-marked reference: a detection is correct when it holds exactly one mark).
 */
export function matchMarks(a: Analysis, truth: RealTruth, opts: { centroidTol?: number; areaTol?: number } = {}): MarkMatch {
  const centroidTol = opts.centroidTol ?? 0.25;
  const areaTol = opts.areaTol ?? 0.35;
  const L = a.labels as LabelImage;
  const f = a.field;
  const xs = a.columns['x_px']!;
  const ys = a.columns['y_px']!;
  const area = a.columns['area_px2']!;
  const holds = new Int32Array(L.count + 1);
  const labelOf = truth.marks.points.map(([x, y]) => {
    const px = Math.floor(x!) - f.x0;
    const py = Math.floor(y!) - f.y0;
    if (px < 0 || py < 0 || px >= L.width || py >= L.height) return 0;
    return L.labels[py * L.width + px]!;
  });
  for (const l of labelOf) if (l > 0) holds[l]!++;
  const perMark = truth.marks.points.map(([x, y, r], k) => {
    const l = labelOf[k]!;
    let ok = l > 0 && holds[l] === 1;
    if (ok && r !== undefined) {
      const d = Math.hypot(xs[l - 1]! - x!, ys[l - 1]! - y!);
      const ratio = area[l - 1]! / (Math.PI * r * r);
      ok = d <= centroidTol * r && Math.abs(ratio - 1) <= areaTol;
      // One-to-one: no other cell has its centroid on this body (a fragment cut off it).
      for (let c = 1; ok && c <= L.count; c++) if (c !== l && Math.hypot(xs[c - 1]! - x!, ys[c - 1]! - y!) < r) ok = false;
    }
    return { label: l, ok };
  });
  let unmarked = 0;
  let merged = 0;
  let background = 0;
  const withRadius = truth.marks.points.length > 0 && truth.marks.points.every((p) => p.length > 2);
  for (let l = 1; l <= L.count; l++) {
    if (holds[l]! > 1) merged++;
    if (holds[l]! > 0) continue;
    unmarked++;
    if (withRadius && truth.marks.points.every(([x, y, r]) => Math.hypot(xs[l - 1]! - x!, ys[l - 1]! - y!) > r!)) background++;
  }
  return { cells: L.count, marks: truth.marks.points.length, matched: perMark.filter((m) => m.ok).length, unmarked, background: withRadius ? background : null, merged, perMark };
}
