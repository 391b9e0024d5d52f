/**
 * Bodies pattern: separate or touching objects on a background (nuclei, bubbles, particles, coins).
 * Validate -> convert -> kernels -> label image (0 = background).
 *
 * 1. A first look: flatten as the walls pattern does (divide by a wide Gaussian of the image), smooth,
 *    threshold, and decide which phase is the background (bodyPolarity below).
 * 2. The real pass: the background level estimated from the first look's background only (a normalised
 *    convolution, so that the bodies do not lift the estimate around them) and subtracted
 *    (src/core/cv/kernels prepareGrey), smooth, threshold (Otsu by default), and with Otsu the bodies grown by
 *    hysteresis over their dimmer rims (src/core/segment/threshold.ts). A lighter band of background is taken
 *    out, and a body on it keeps its contrast.
 * 3. Split touching bodies: markers are the maxima of the distance transform whose dynamic is at least
 *    (1 − splitSensitivity)/2 of their own height, the radius of the body they mark
 *    (src/core/segment/peaks.ts), a watershed on the inverted distance inside the bodies (Beucher &
 *    Lantuéjoul 1979; trade), and then only the cuts that meet the outline at concave points are kept
 *    (src/core/segment/bodySplit.ts): a convex body, however textured, is never cut.
 * 4. Fill the holes that one body surrounds alone; drop bodies below the minimum area.
 */
import { concavityDepth, holeCusps } from '../cv/concavity';
import { connectedComponents, distanceTransform, erodeMask, prepareGrey } from '../cv/kernels';
import type { CV } from '../cv/index';
import { NoCellsError } from '../errors';
import type { Settings } from '../settings';
import type { GreyImage } from '../types';
import { keepConcaveCuts } from './bodySplit';
import { floodFromMarkers, relabelSequential } from './flood';
import { dynamicPeaks } from './peaks';
import { hysteresis, thresholdPrepared } from './threshold';
import { autoFlattenRadius, autoMinArea, type SegmentResult } from './walls';

/** Which phase holds the bodies, and the cue that decided it. */
export interface BodyPolarity {
  polarity: 'bright' | 'dark';
  /**
   * 'border': the background holds most of the image border; 'connected': the border is shared, and the
   * background is the phase that forms one connected region; 'area': neither decides, the bodies are the
   * smaller phase; 'ring': the phase those cues chose forms rings (a halo, a bubble's wall), and the bodies
   * are what the rings enclose.
   */
  cue: 'border' | 'connected' | 'area' | 'ring';
}

/**
 * A hole's hull corner this sharp or sharper (degrees) is a cusp, where a gap among bodies narrows to a neck:
 * the gap among three touching discs has corners of 0° (tangent arcs) and an equilateral triangle's are 60°,
 * while a disc's outline measured over 3 px turns by at most 60° once its radius is 3 px or more (derived).
 */
const CUSP_ANGLE_DEG = 100;

/** A share of the image border this far from one half decides the polarity alone. */
const BORDER_DECIDES = 0.2;
/** A difference in connectedness this large decides the polarity when the border does not. */
const CONNECTED_DECIDES = 0.2;
/** A phase whose holes make up this share of it with its holes filled forms rings, not bodies. */
const RING_SHARE = 0.3;

/**
 * Which phase is the background: the one that holds most of the image border (bodies lie inside the field,
 * the background surrounds them); when the border is shared (dense bodies that reach the border all round),
 * the one whose largest connected region holds the greater share of its area (the background is one
 * matrix, the bodies are many pieces); when that too is close, the larger phase (bodies are the minority).
 * Should the phase so chosen for the bodies form rings around the other phase (a dark halo round a bright
 * cell, the walls of bubbles: at least RING_SHARE of it with its holes filled is holes), the bodies are the
 * other phase's pieces enclosed by the rings (see bodyMasks).
 *
 * @param bright 1 = bright phase, row-major
 */
export function bodyPolarity(cv: CV, bright: Uint8Array, width: number, height: number): BodyPolarity {
  const choice = phaseCue(cv, bright, width, height);
  const ring = new Uint8Array(bright.length);
  const v = choice.polarity === 'bright' ? 1 : 0;
  let area = 0;
  for (let i = 0; i < bright.length; i++) area += ring[i] = bright[i] === v ? 1 : 0;
  let enclosed = 0;
  for (const x of holesOf(cv, ring, width, height)) enclosed += x;
  if (enclosed >= RING_SHARE * (enclosed + area)) return { polarity: choice.polarity === 'bright' ? 'dark' : 'bright', cue: 'ring' };
  return choice;
}

/** The border, connectedness and area cues of bodyPolarity. */
function phaseCue(cv: CV, bright: Uint8Array, width: number, height: number): BodyPolarity {
  let onBorder = 0;
  let brightOnBorder = 0;
  const edge = (i: number): void => {
    onBorder++;
    brightOnBorder += bright[i]!;
  };
  for (let x = 0; x < width; x++) edge(x), edge((height - 1) * width + x);
  for (let y = 1; y < height - 1; y++) edge(y * width), edge(y * width + width - 1);
  const share = brightOnBorder / onBorder;
  if (share >= 0.5 + BORDER_DECIDES) return { polarity: 'dark', cue: 'border' };
  if (share <= 0.5 - BORDER_DECIDES) return { polarity: 'bright', cue: 'border' };
  const dark = new Uint8Array(bright.length);
  let nBright = 0;
  for (let i = 0; i < bright.length; i++) {
    dark[i] = 1 - bright[i]!;
    nBright += bright[i]!;
  }
  const nDark = bright.length - nBright;
  const connB = largest(connectedComponents(cv, bright, width, height, 8).areas) / Math.max(1, nBright);
  const connD = largest(connectedComponents(cv, dark, width, height, 8).areas) / Math.max(1, nDark);
  if (connD - connB >= CONNECTED_DECIDES) return { polarity: 'bright', cue: 'connected' };
  if (connB - connD >= CONNECTED_DECIDES) return { polarity: 'dark', cue: 'connected' };
  return { polarity: nBright <= nDark ? 'bright' : 'dark', cue: 'area' };
}

/**
 * The bodies and the background of a thresholded image for a polarity: the bodies are the polarity's phase
 * and the background the other, or, when the bodies are enclosed by rings (cue 'ring'), the bodies are the
 * polarity's pieces inside the rings and the background its pieces outside them (the rings are neither).
 */
export function bodyMasks(cv: CV, bright: Uint8Array, width: number, height: number, p: BodyPolarity): { bodies: Uint8Array; background: Uint8Array } {
  const v = p.polarity === 'bright' ? 1 : 0;
  const bodies = new Uint8Array(bright.length);
  const background = new Uint8Array(bright.length);
  if (p.cue !== 'ring') {
    for (let i = 0; i < bright.length; i++) {
      bodies[i] = bright[i] === v ? 1 : 0;
      background[i] = 1 - bodies[i]!;
    }
    return { bodies, background };
  }
  const ring = new Uint8Array(bright.length);
  for (let i = 0; i < bright.length; i++) ring[i] = bright[i] === v ? 0 : 1;
  const inside = holesOf(cv, ring, width, height);
  for (let i = 0; i < bright.length; i++) {
    if (ring[i]) continue;
    if (inside[i]) bodies[i] = 1;
    else background[i] = 1;
  }
  return { bodies, background };
}

/** Segments a bodies pattern. */
export function segmentBodies(cv: CV, img: GreyImage, settings: Settings): SegmentResult {
  const { width: w, height: h } = img;
  const s = settings.bodies;
  const flatten = autoFlattenRadius(w, h);
  // 1. First look: flattened as the walls pattern is, to decide the polarity and find the background.
  const look = prepareGrey(cv, img, { flattenRadiusPx: flatten, smoothSigmaPx: s.smoothSigmaPx });
  const first = thresholdPrepared(cv, look, w, h, s, 'bodies');
  const chosen = (bright: Uint8Array): BodyPolarity => (s.polarity === 'auto' ? bodyPolarity(cv, bright, w, h) : { polarity: s.polarity, cue: 'border' });
  // 2. Flatten with the background as the mask (away from the bodies' blurred edges), threshold again.
  const { background } = bodyMasks(cv, first.bright, w, h, chosen(first.bright));
  const eroded = erodeMask(cv, background, w, h, 2);
  const bgMask = eroded.includes(1) ? eroded : background.includes(1) ? background : null;
  const prepared = bgMask
    ? prepareGrey(cv, img, { flattenRadiusPx: flatten, smoothSigmaPx: s.smoothSigmaPx, backgroundMask: bgMask, flattenBy: 'subtract' })
    : look;
  const second = thresholdPrepared(cv, prepared, w, h, s, 'bodies');
  const threshold = second.level;
  const choice = chosen(second.bright);
  const polarity = choice.polarity;
  const mask = bodyMasks(cv, second.bright, w, h, choice).bodies;
  // Otsu's level sits between the class means, so a body's dim rim can fall below it: grow the bodies by
  // hysteresis. A manual or adaptive threshold is used as it is.
  if (s.threshold === 'otsu') hysteresis(cv, prepared, mask, w, h, threshold, polarity === 'bright');

  // Islands (pieces of body inside a hole of another, such as bright relief inside a coin's dark detail) are
  // part of that hole: they join the body around them when its holes are filled, and go when they are not.
  dropIslands(cv, mask, w, h);

  let labels: Int32Array;
  let maxLabel: number;
  if (s.splitTouching) {
    const dist = distanceTransform(cv, mask, w, h);
    const blobs = connectedComponents(cv, mask, w, h, 8);
    const peak = new Float32Array(blobs.count + 1);
    for (let i = 0; i < dist.length; i++) {
      const l = blobs.labels[i]!;
      if (l > 0 && dist[i]! > peak[l]!) peak[l] = dist[i]!;
    }
    // Markers: a peak stands when its dynamic is at least (1 − sensitivity)/2 of its own height (the radius
    // of the body it marks), and at least 1 px. At the default 0.85 (0.075 r) two discs of radius r are split
    // when their centres are more than about 0.76 r apart (r − √(r² − d²/4) ≥ 0.075 r), while boundary noise
    // (dynamics under a pixel) makes no extra bodies.
    const rel = (1 - s.splitSensitivity) / 2;
    const peaks = dynamicPeaks(dist, w, h, 1, rel);
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
    const height = new Float32Array(maxLabel + 1);
    for (let i = 0; i < labels.length; i++) if (labels[i]! > 0) height[labels[i]!] = dist[i]!;
    let dmax = 0;
    for (let i = 0; i < dist.length; i++) if (dist[i]! > dmax) dmax = dist[i]!;
    const relief = new Uint8Array(w * h);
    const k = dmax > 0 ? 255 / dmax : 0;
    for (let i = 0; i < relief.length; i++) relief[i] = 255 - Math.round(dist[i]! * k);
    floodFromMarkers(labels, relief, w, h, { allowed: mask });
    // Only cuts that meet the outline at concave points stay; the neck of two discs is as deep as the
    // smaller peak's dynamic, so the same fraction of the smaller body's radius is asked of it (half of it,
    // for the pixel or so by which a cut's end can miss the deepest point), and at least 1 px.
    const depth = concavityDepth(cv, mask, w, h);
    const hole = holesOf(cv, mask, w, h);
    const cusp = holeCusps(cv, hole, w, h, CUSP_ANGLE_DEG);
    keepConcaveCuts(labels, maxLabel, mask, hole, cusp, depth, height, w, h, (r) => Math.max(1, 0.5 * rel * r));
    if (s.fillHoles) fillHoles(cv, labels, mask, w, h);
  } else {
    if (s.fillHoles) fillHoles(cv, null, mask, w, h);
    const cc = connectedComponents(cv, mask, w, h, 8);
    labels = cc.labels;
    maxLabel = cc.count;
  }
  // Drop bodies below the minimum area; 'auto' is the walls pattern's rule (2 % of the median, at least
  // 9 px²), on the bodies' areas: crumbs of a body that the threshold cut off go, small bodies stay.
  const area = new Int32Array(maxLabel + 1);
  for (let i = 0; i < labels.length; i++) area[labels[i]!]!++;
  // (Labels joined to others by the cut check have no pixels left and do not count; index 0 is skipped.)
  const minArea = settings.minCellAreaPx < 0 ? autoMinArea(Int32Array.from([0, ...area.subarray(1).filter((a) => a > 0)])) : settings.minCellAreaPx;
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

/** The holes of a mask: pixels outside the bodies that are not connected (4-neighbours) to the image border. */
function holesOf(cv: CV, mask: Uint8Array, w: number, h: number): Uint8Array {
  const inv = new Uint8Array(mask.length);
  for (let i = 0; i < mask.length; i++) inv[i] = 1 - mask[i]!;
  const cc = connectedComponents(cv, inv, w, h, 4);
  const outer = outerComponents(cc.labels, cc.count, w, h);
  const hole = new Uint8Array(mask.length);
  for (let i = 0; i < mask.length; i++) hole[i] = cc.labels[i]! > 0 && !outer[cc.labels[i]!] ? 1 : 0;
  return hole;
}

/** Clears, in place, the pieces of the mask (8-connected) that touch neither the image border nor the outer background. */
function dropIslands(cv: CV, mask: Uint8Array, w: number, h: number): void {
  const hole = holesOf(cv, mask, w, h);
  const blobs = connectedComponents(cv, mask, w, h, 8);
  const outside = new Uint8Array(blobs.count + 1);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      const b = blobs.labels[i]!;
      if (b === 0 || outside[b]) continue;
      if (x === 0 || y === 0 || x === w - 1 || y === h - 1) {
        outside[b] = 1;
        continue;
      }
      for (const j of [i - 1, i + 1, i - w, i + w]) if (!mask[j] && !hole[j]) outside[b] = 1;
    }
  }
  for (let i = 0; i < mask.length; i++) if (blobs.labels[i]! > 0 && !outside[blobs.labels[i]!]) mask[i] = 0;
}

/** Components (1..count) that reach the image border. */
function outerComponents(labels: Int32Array, count: number, w: number, h: number): Uint8Array {
  const outer = new Uint8Array(count + 1);
  for (let x = 0; x < w; x++) (outer[labels[x]!] = 1), (outer[labels[(h - 1) * w + x]!] = 1);
  for (let y = 0; y < h; y++) (outer[labels[y * w]!] = 1), (outer[labels[y * w + w - 1]!] = 1);
  return outer;
}

/**
 * Fills holes: background regions that do not reach the image border. With labels (after splitting), a
 * hole goes to the body that surrounds it alone; a gap enclosed by several touching bodies stays
 * background (it is the space between them, not a hole in one). Without labels every hole is filled.
 * Splitting runs on a mask whose large holes are still open, so such gaps never raise a distance peak.
 */
function fillHoles(cv: CV, labels: Int32Array | null, mask: Uint8Array, w: number, h: number): void {
  const inv = new Uint8Array(mask.length);
  for (let i = 0; i < mask.length; i++) inv[i] = 1 - mask[i]!;
  const cc = connectedComponents(cv, inv, w, h, 4);
  const outer = outerComponents(cc.labels, cc.count, w, h);
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
    else if (owner[hole]! > 0) (labels[i] = owner[hole]!), (mask[i] = 1);
  }
}
