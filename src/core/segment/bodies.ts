/**
 * Bodies pattern: separate or touching objects on a background (nuclei, bubbles, particles).
 * Validate -> convert -> kernels -> label image (0 = background).
 *
 * 1. Smooth and stretch (no flattening by default: bodies can be large relative to the field).
 * 2. Threshold (Otsu by default). The background is the class holding the largest connected region,
 *    unless the polarity is set.
 * 3. Fill holes: background components that do not reach the border become body (after splitting, and
 *    only when one body surrounds them: a gap among several touching bodies stays background).
 * 4. Split touching bodies: markers are the maxima of the distance transform with a dynamic of at least
 *    (1 − splitSensitivity)·R/2, R the median body radius (src/core/segment/peaks.ts), then a watershed on
 *    the inverted distance inside the body mask (Beucher & Lantuéjoul 1979; trade).
 */
import { connectedComponents, distanceTransform, prepareGrey } from '../cv/kernels';
import { thresholdPrepared } from './threshold';
import type { CV } from '../cv/index';
import { NoCellsError } from '../errors';
import type { Settings } from '../settings';
import type { GreyImage } from '../types';
import { floodFromMarkers, relabelSequential } from './flood';
import { dynamicPeaks } from './peaks';
import type { SegmentResult } from './walls';

/** Segments a bodies pattern. */
export function segmentBodies(cv: CV, img: GreyImage, settings: Settings): SegmentResult {
  const { width: w, height: h } = img;
  const s = settings.bodies;
  const prepared = prepareGrey(cv, img, { flattenRadiusPx: 0, smoothSigmaPx: s.smoothSigmaPx });
  const { bright: mask, level: threshold } = thresholdPrepared(cv, prepared, w, h, s, 'bodies');
  let polarity = s.polarity;
  if (polarity === 'auto') {
    // The background is one large connected region around separate objects, so the class holding the
    // largest single component is the background. Neither the border nor the area fraction is a safe cue:
    // dense bodies can cover most of the border and most of the image.
    const inv = new Uint8Array(mask.length);
    for (let i = 0; i < mask.length; i++) inv[i] = 1 - mask[i]!;
    const bigBright = largest(connectedComponents(cv, mask, w, h, 8).areas);
    const bigDark = largest(connectedComponents(cv, inv, w, h, 8).areas);
    polarity = bigDark >= bigBright ? 'bright' : 'dark';
  }
  if (polarity === 'dark') for (let i = 0; i < mask.length; i++) mask[i] = 1 - mask[i]!;

  const minArea = settings.minCellAreaPx < 0 ? 9 : settings.minCellAreaPx;
  let labels: Int32Array;
  let maxLabel: number;
  if (s.splitTouching) {
    const dist = distanceTransform(cv, mask, w, h);
    const blobs = connectedComponents(cv, mask, w, h, 8);
    // Median body radius from the per-blob maximum of the distance.
    const peak = new Float32Array(blobs.count + 1);
    for (let i = 0; i < dist.length; i++) {
      const l = blobs.labels[i]!;
      if (l > 0 && dist[i]! > peak[l]!) peak[l] = dist[i]!;
    }
    const radii = Array.from(peak.subarray(1)).filter((r) => r > 0).sort((a, b) => a - b);
    const R = radii.length ? radii[radii.length >> 1]! : 1;
    // Minimum dynamic: (1 − sensitivity)·R/2, at least 1 px. At the default 0.85 (h = 0.075 R) two discs
    // of radius R are split when their centres are more than about 0.76 R apart (R − √(R² − d²/4) ≥ h),
    // while boundary noise (dynamics under a pixel) still makes no extra bodies.
    const hMin = Math.max(1, ((1 - s.splitSensitivity) * R) / 2);
    const peaks = dynamicPeaks(dist, w, h, hMin);
    labels = peaks.markers;
    maxLabel = peaks.count;
    // Small blobs without a peak above the floor still get one marker at their maximum.
    const hasMarker = new Uint8Array(blobs.count + 1);
    for (let i = 0; i < labels.length; i++) if (labels[i]! > 0) hasMarker[blobs.labels[i]!] = 1;
    for (let i = 0; i < labels.length; i++) {
      const b = blobs.labels[i]!;
      if (b > 0 && !hasMarker[b] && dist[i]! >= peak[b]! - 1e-4) {
        labels[i] = ++maxLabel;
        hasMarker[b] = 1;
      }
    }
    let dmax = 0;
    for (let i = 0; i < dist.length; i++) if (dist[i]! > dmax) dmax = dist[i]!;
    const relief = new Uint8Array(w * h);
    const k = dmax > 0 ? 255 / dmax : 0;
    for (let i = 0; i < relief.length; i++) relief[i] = 255 - Math.round(dist[i]! * k);
    floodFromMarkers(labels, relief, w, h, { allowed: mask });
    if (s.fillHoles) fillHoles(cv, labels, mask, w, h);
  } else {
    if (s.fillHoles) fillHoles(cv, null, mask, w, h);
    const cc = connectedComponents(cv, mask, w, h, 8);
    labels = cc.labels;
    maxLabel = cc.count;
  }
  // Drop bodies below the minimum area.
  const area = new Int32Array(maxLabel + 1);
  for (let i = 0; i < labels.length; i++) area[labels[i]!]!++;
  for (let i = 0; i < labels.length; i++) if (labels[i]! > 0 && area[labels[i]!]! < minArea) labels[i] = 0;
  const count = relabelSequential(labels, maxLabel);
  if (count === 0) throw new NoCellsError(`No bodies found larger than the minimum area of ${minArea} px²; lower the minimum cell area or check the threshold.`);
  return { labels: { width: w, height: h, labels, count }, threshold, polarity, minCellAreaPx: minArea };
}

/** Size of the largest component (label 0, the other class, excluded). */
function largest(areas: Int32Array): number {
  let m = 0;
  for (let i = 1; i < areas.length; i++) if (areas[i]! > m) m = areas[i]!;
  return m;
}

/**
 * Fills holes: background regions that do not reach the image border. With labels (after splitting), a
 * hole goes to the body that surrounds it alone; a gap enclosed by several touching bodies stays
 * background (it is the space between them, not a hole in one). Without labels every hole is filled.
 * Splitting runs on the unfilled mask, so such gaps never raise a distance peak of their own.
 */
function fillHoles(cv: CV, labels: Int32Array | null, mask: Uint8Array, w: number, h: number): void {
  const inv = new Uint8Array(mask.length);
  for (let i = 0; i < mask.length; i++) inv[i] = 1 - mask[i]!;
  const cc = connectedComponents(cv, inv, w, h, 4);
  const outer = new Uint8Array(cc.count + 1);
  for (let x = 0; x < w; x++) (outer[cc.labels[x]!] = 1), (outer[cc.labels[(h - 1) * w + x]!] = 1);
  for (let y = 0; y < h; y++) (outer[cc.labels[y * w]!] = 1), (outer[cc.labels[y * w + w - 1]!] = 1);
  // For each hole: the one surrounding label, 0 if none yet, -1 if several.
  const owner = new Int32Array(cc.count + 1);
  if (labels) {
    for (let i = 0; i < mask.length; i++) {
      const hole = cc.labels[i]!;
      if (hole === 0 || outer[hole] || owner[hole] === -1) continue;
      const x = i % w;
      for (const j of [x > 0 ? i - 1 : -1, x < w - 1 ? i + 1 : -1, i - w, i + w]) {
        if (j < 0 || j >= mask.length) continue;
        const l = labels[j]!;
        if (l <= 0) continue;
        if (owner[hole] === 0) owner[hole] = l;
        else if (owner[hole] !== l) owner[hole] = -1;
      }
    }
  }
  for (let i = 0; i < mask.length; i++) {
    const hole = cc.labels[i]!;
    if (hole === 0 || outer[hole]) continue;
    if (!labels) mask[i] = 1;
    else if (owner[hole] > 0) (labels[i] = owner[hole]!), (mask[i] = 1);
  }
}
