/**
 * Walls pattern: cells that fill the field, separated by thin walls that are darker or lighter than the
 * cells. Validate -> convert -> kernels -> label image.
 *
 * 1. Flatten uneven illumination and smooth (src/core/cv/kernels prepareGrey).
 * 2. Threshold (Otsu by default; adaptive or manual); the walls are the minority class unless the polarity
 *    is set (thin walls cover well under half of a cellular image).
 * 3. The size hint: the typical cell diameter, set (walls.cellDiameterPx) or read from the image
 *    (src/core/segment/size.ts, a granulometry of the cell interiors); it scales the marker dynamic and, when set, the smallest cell.
 * 4. Cell interiors, eroded a little, are the markers. A marker joined to another through a gap in a wall is
 *    split at its distance maxima of dynamic ≥ the marker dynamic (src/core/segment/split.ts); markers
 *    smaller than the minimum cell area go.
 * 5. Markers grow back over the walls by priority flooding on the wall relief (marker watershed), so
 *    the cells tile the field and every pair of touching cells shares a boundary.
 */
import { prepareGrey, thresholdComponents } from '../cv/kernels';
import { maskThreshold, uniformImageError } from './threshold';
import type { CV } from '../cv/index';
import { NoCellsError } from '../errors';
import type { Settings } from '../settings';
import type { GreyImage, LabelImage } from '../types';
import { floodFromMarkers, relabelSequential } from './flood';
import { estimateCellDiameter } from './size';
import { markerDistance, splitMarkers } from './split';

export interface SegmentResult {
  labels: LabelImage;
  /** The threshold level used (0..255 on the prepared image). */
  threshold: number;
  /** The polarity used: walls dark or light / bodies bright or dark. */
  polarity: string;
  /** The minimum cell area (px²) used. */
  minCellAreaPx: number;
  /** Walls: the typical cell diameter (px) used as the size hint, and whether it was set or read from the image. */
  cellDiameterPx?: { value: number; source: 'setting' | 'image' };
  /** Walls: the marker dynamic (px) used; 0 = markers not split. */
  markerDynamicPx?: number;
}

/** The flattening radius used when the setting is 'auto' (-1): an eighth of the shorter side, at least 32 px. */
export function autoFlattenRadius(width: number, height: number): number {
  return Math.max(32, Math.round(Math.min(width, height) / 8));
}

/**
 * The minimum cell area used when the setting is 'auto' (-1): 2 % of the typical cell area, at least 9 px².
 * Noise specks inside walls are far smaller than real cells; a relative floor adapts to magnification. The
 * typical area is the median marker area, or π D²/4 when the cell diameter D is set (walls.cellDiameterPx):
 * a size the user knows wins over one read from markers that texture may have cut into crumbs. (A diameter
 * read from the image is an estimate within about 15 %; the median marker is the better measure then.)
 */
export function autoMinArea(markerAreas: Int32Array, cellDiameterPx: number | null = null): number {
  if (cellDiameterPx !== null) return Math.max(9, Math.round((0.02 * Math.PI * cellDiameterPx * cellDiameterPx) / 4));
  const a: number[] = [];
  for (let i = 1; i < markerAreas.length; i++) if (markerAreas[i]! > 0) a.push(markerAreas[i]!);
  if (a.length === 0) return 9;
  a.sort((x, y) => x - y);
  const med = a[a.length >> 1]!;
  return Math.max(9, Math.round(0.02 * med));
}

/** Called as soon as the walls segmentation knows how many cells it will give and the minimum area it used. */
export type OnCellCount = (count: number, minCellAreaPx: number) => void;

/**
 * Segments a walls pattern into a label image that tiles the image.
 * @param onCellCount told the cell count before the flood (each kept marker becomes exactly one cell), so
 *   that work which needs only the count can start while the flood runs
 */
export function segmentWalls(cv: CV, img: GreyImage, settings: Settings, onCellCount?: OnCellCount): SegmentResult {
  const { width: w, height: h } = img;
  const s = settings.walls;
  const flatten = s.flattenRadiusPx < 0 ? autoFlattenRadius(w, h) : s.flattenRadiusPx;
  const prepared = prepareGrey(cv, img, { flattenRadiusPx: flatten, smoothSigmaPx: s.smoothSigmaPx });

  let polarity = s.polarity;
  // Threshold, cell class, erosion and components inside opencv.js; every component is kept here, the
  // smallest are dropped below once the markers have been split.
  const cc = thresholdComponents(
    cv, prepared, w, h, maskThreshold(s),
    (nBright) => {
      if (nBright === 0 || nBright === w * h) throw uniformImageError('cells');
      // Thin walls cover well under half of a cellular image: the walls are the minority class.
      if (polarity === 'auto') polarity = nBright < (w * h) / 2 ? 'light' : 'dark';
      // Cells are the non-wall class.
      return polarity === 'light' ? 'dark' : 'bright';
    },
    s.seedErodePx, 4,
    (_areas, count) => new Uint8Array(count + 1).fill(1),
  );
  const labels = cc.labels;
  // The size hint: set, or read from the interiors' distance transform (src/core/segment/size.ts).
  const dist = markerDistance(cv, labels, w, h);
  const read = s.cellDiameterPx > 0 ? null : estimateCellDiameter(dist, w, h, s.seedErodePx);
  const hint = s.cellDiameterPx > 0
    ? { diameterPx: s.cellDiameterPx, source: 'setting' as const }
    : { diameterPx: read?.diameterPx ?? Math.min(w, h), source: 'image' as const };
  const dynamic = s.markerDynamicPx < 0 ? autoMarkerDynamic(hint.diameterPx) : s.markerDynamicPx;
  // Markers joined through a gap in a wall are split at their distance maxima (src/core/segment/split.ts).
  const maxLabel = dynamic > 0 ? splitMarkers(labels, dist, cc.count, w, h, dynamic) : cc.count;
  const areas = new Int32Array(maxLabel + 1);
  for (let i = 0; i < labels.length; i++) areas[labels[i]!]!++;
  // Markers below the minimum area are dropped: their pixels are flooded by the neighbours. The area of a
  // marker is smaller than its cell's (walls and erosion removed), so the floor is applied to marker area
  // grown by the erosion ring only when the setting is explicit.
  const minArea = settings.minCellAreaPx < 0 ? autoMinArea(areas, hint.source === 'setting' ? hint.diameterPx : null) : settings.minCellAreaPx;
  const keep = new Uint8Array(maxLabel + 1);
  let kept = 0;
  for (let l = 1; l <= maxLabel; l++) if (areas[l]! > 0 && areas[l]! >= minArea) (keep[l] = 1), kept++;
  if (kept === 0) {
    throw new NoCellsError(`No cells found: no cell interior is larger than the minimum cell area of ${minArea} px²; lower the minimum cell area or check the threshold.`);
  }
  for (let i = 0; i < labels.length; i++) if (!keep[labels[i]!]) labels[i] = 0;
  onCellCount?.(kept, minArea);
  // Relief: walls high; for dark walls the grey levels read upside down (no inverted copy).
  floodFromMarkers(labels, prepared, w, h, { levels: polarity === 'dark' ? INVERTED : undefined });
  const count = relabelSequential(labels, maxLabel);
  return {
    labels: { width: w, height: h, labels, count }, threshold: cc.level, polarity, minCellAreaPx: minArea,
    cellDiameterPx: { value: round2(hint.diameterPx), source: hint.source }, markerDynamicPx: round2(dynamic),
  };
}

/** The marker dynamic used when the setting is 'auto' (-1): an eighth of the typical cell diameter. */
export function autoMarkerDynamic(cellDiameterPx: number): number {
  return Math.max(1, cellDiameterPx / 8);
}

function round2(v: number): number {
  return Math.round(v * 100) / 100;
}

/** Grey level v floods at level 255 − v. */
const INVERTED = Uint8Array.from({ length: 256 }, (_, v) => 255 - v);
