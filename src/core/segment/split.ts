/**
 * Markers that hold up when walls have gaps: a marker (a connected cell interior) that holds several
 * distance-transform maxima of sufficient dynamic is split among them (Grimaud 1992 dynamics, in
 * src/core/segment/peaks.ts; the split by a watershed on the inverted distance inside the marker, Beucher &
 * Lantuéjoul 1979; trade). A gap in a wall joins two cell interiors by a neck: the distance at the neck is
 * about half the gap's width, well below each cell's own peak, so the two peaks both stand above the saddle
 * by more than the dynamic and the marker is cut at the neck. A dark speck inside a cell (a textured
 * interior) raises a dynamic of a fraction of the cell's inscribed radius at most, below the dynamic.
 * A marker with one such peak (every marker of a clean image) is left exactly as it was.
 */
import { distanceTransform } from '../cv/kernels';
import type { CV } from '../cv/index';
import { floodFromMarkers } from './flood';
import { dynamicPeaks } from './peaks';

/** The distance (px) of each marker pixel to the nearest non-marker pixel (0 off the markers). */
export function markerDistance(cv: CV, labels: Int32Array, width: number, height: number): Float32Array {
  const mask = new Uint8Array(width * height);
  for (let i = 0; i < mask.length; i++) mask[i] = labels[i]! > 0 ? 1 : 0;
  return distanceTransform(cv, mask, width, height);
}

/**
 * Splits markers in place.
 * @param labels marker labels 1..count (0 = wall or dropped), modified in place
 * @param dist their distance transform (markerDistance)
 * @param h minimum dynamic (px) of a peak that becomes a marker of its own
 * @returns the new largest label (count when nothing was split)
 */
export function splitMarkers(labels: Int32Array, dist: Float32Array, count: number, width: number, height: number, h: number): number {
  const n = width * height;
  const peaks = dynamicPeaks(dist, width, height, h);
  // Peaks per marker (a peak's pixel lies in one marker).
  const perMarker = new Int32Array(count + 1);
  for (let i = 0; i < n; i++) if (peaks.markers[i]! > 0 && labels[i]! > 0) perMarker[labels[i]!]!++;
  let split = 0;
  for (let l = 1; l <= count; l++) if (perMarker[l]! > 1) split++;
  if (split === 0) return count;
  // The markers split: their pixels cleared, their peaks labelled anew, then flooded back on the inverted
  // distance within the cleared pixels only (the other markers stay whole).
  const allowed = new Uint8Array(n);
  let next = count;
  const peakLabel = new Int32Array(peaks.count + 1);
  for (let i = 0; i < n; i++) {
    const l = labels[i]!;
    if (l > 0 && perMarker[l]! > 1) {
      allowed[i] = 1;
      const p = peaks.markers[i]!;
      if (p > 0) {
        if (peakLabel[p] === 0) peakLabel[p] = ++next;
        labels[i] = peakLabel[p]!;
      } else labels[i] = 0;
    }
  }
  let dmax = 0;
  for (let i = 0; i < n; i++) if (dist[i]! > dmax) dmax = dist[i]!;
  const relief = new Uint8Array(n);
  const k = dmax > 0 ? 255 / dmax : 0;
  for (let i = 0; i < n; i++) relief[i] = 255 - Math.round(dist[i]! * k);
  floodFromMarkers(labels, relief, width, height, { allowed });
  return next;
}
