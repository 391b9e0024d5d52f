/**
 * Follows the domains of the transformed phase from frame to frame. Each domain keeps its id while it grows:
 * the pixels newly transformed in a frame go to the nearest (4-connected geodesic) domain of the previous
 * frame, and a connected region that holds no earlier domain is a new domain, whose centroid there
 * estimates its nucleus. The final labels are the mosaic of domains ordered by arrival, the tessellation
 * that the walls analysis reads.
 */
import type { PhaseComponents } from '../cv/phase';

export interface DomainRecord {
  /** Frame index (0-based) in which the domain first appears. */
  firstFrame: number;
  /** Centroid (field px) of the domain in its first frame: the estimate of its nucleus. */
  x: number;
  y: number;
  /** Whether it touched the field border when it appeared (its nucleus may lie outside the field). */
  edge: boolean;
}

export interface FrameTrack {
  /** New domains that appeared in this frame. */
  newDomains: number;
  /** Those of them that did not touch the field border when they appeared. */
  newInside: number;
  /** Area (px) of each domain id in this frame (index = id; 0 unused). */
  area: Int32Array;
  /** 1 when the domain is alone in its connected region, that region misses the border and is not split. */
  isolated: Uint8Array;
}

/** The state of the tracker between frames. */
export class DomainTracker {
  readonly width: number;
  readonly height: number;
  /** Current domain id per field pixel (0 = untransformed or too small to count). */
  labels: Int32Array;
  readonly domains: DomainRecord[] = [];
  readonly frames: FrameTrack[] = [];
  private readonly minArea: number;
  private readonly queue: Int32Array;

  /** @param minArea connected regions smaller than this (px) do not start a domain */
  constructor(width: number, height: number, minArea: number) {
    this.width = width;
    this.height = height;
    this.minArea = minArea;
    this.labels = new Int32Array(width * height);
    this.queue = new Int32Array(width * height);
  }

  /** Number of domain ids given out so far. */
  get count(): number {
    return this.domains.length;
  }

  /**
   * Advances by one frame: `mask` is the 0/1 transformed phase, `cc` its connected components.
   */
  step(mask: Uint8Array, cc: PhaseComponents): FrameTrack {
    const { width: w, height: h } = this;
    const old = this.labels;
    const lab = new Int32Array(w * h);
    const q = this.queue;
    let head = 0;
    let tail = 0;
    for (let p = 0; p < w * h; p++) {
      if (mask[p] && old[p]! > 0) {
        lab[p] = old[p]!;
        q[tail++] = p;
      }
    }
    // Multi-source breadth-first growth: all seeds are at distance 0, so the queue runs level by level and
    // a pixel joins the domain whose front is nearest along the phase.
    while (head < tail) {
      const p = q[head++]!;
      const id = lab[p]!;
      const x = p % w;
      if (x > 0 && mask[p - 1] && !lab[p - 1]) { lab[p - 1] = id; q[tail++] = p - 1; }
      if (x < w - 1 && mask[p + 1] && !lab[p + 1]) { lab[p + 1] = id; q[tail++] = p + 1; }
      if (p >= w && mask[p - w] && !lab[p - w]) { lab[p - w] = id; q[tail++] = p - w; }
      if (p < w * (h - 1) && mask[p + w] && !lab[p + w]) { lab[p + w] = id; q[tail++] = p + w; }
    }
    // Regions the growth did not reach contain no earlier domain: each big enough one is a new domain.
    const ccNew = new Int32Array(cc.count + 1);
    const sumX = new Float64Array(cc.count + 1);
    const sumY = new Float64Array(cc.count + 1);
    for (let p = 0; p < w * h; p++) {
      if (mask[p] && !lab[p]) {
        const c = cc.labels[p]!;
        sumX[c] = sumX[c]! + (p % w) + 0.5;
        sumY[c] = sumY[c]! + Math.floor(p / w) + 0.5;
      }
    }
    const frameIndex = this.frames.length;
    let newDomains = 0;
    let newInside = 0;
    for (let c = 1; c <= cc.count; c++) {
      const a = cc.area[c - 1]!;
      if (sumX[c]! > 0 && a >= this.minArea) {
        const edge = cc.touchesBorder[c - 1] === 1;
        this.domains.push({ firstFrame: frameIndex, x: sumX[c]! / a, y: sumY[c]! / a, edge });
        ccNew[c] = this.domains.length;
        newDomains++;
        if (!edge) newInside++;
      }
    }
    for (let p = 0; p < w * h; p++) if (mask[p] && !lab[p]) lab[p] = ccNew[cc.labels[p]!]!;
    const n = this.domains.length;
    const area = new Int32Array(n + 1);
    const domCc = new Int32Array(n + 1);
    const split = new Uint8Array(n + 1);
    const ccDom = new Int32Array(cc.count + 1);
    const ccMixed = new Uint8Array(cc.count + 1);
    for (let p = 0; p < w * h; p++) {
      const id = lab[p]!;
      if (!id) continue;
      area[id] = area[id]! + 1;
      const c = cc.labels[p]!;
      if (!domCc[id]) domCc[id] = c;
      else if (domCc[id] !== c) split[id] = 1;
      if (!ccDom[c]) ccDom[c] = id;
      else if (ccDom[c] !== id) ccMixed[c] = 1;
    }
    const isolated = new Uint8Array(n + 1);
    for (let id = 1; id <= n; id++) {
      const c = domCc[id]!;
      if (c && !split[id] && !ccMixed[c] && !cc.touchesBorder[c - 1]) isolated[id] = 1;
    }
    this.labels = lab;
    const track = { newDomains, newInside, area, isolated };
    this.frames.push(track);
    return track;
  }
}
