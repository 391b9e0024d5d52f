/**
 * Marker-controlled watershed by priority flooding on an 8-bit relief (Meyer 1991, "Un algorithme optimal
 * de ligne de partage des eaux", Proc. 8e congrès RFIA; Beucher & Meyer 1993; pub, memory).
 *
 * Markers grow into unlabelled pixels in order of relief height, lowest first, with a FIFO per level so
 * that fronts advance evenly across plateaus. A pixel takes the label of the first front that reaches it,
 * so the result has no watershed-line pixels: the cells tile the allowed region completely and every pair
 * of touching cells shares a boundary. O(N) with a 256-level bucket queue.
 */

/** Options of {@link floodFromMarkers}. */
export interface FloodOptions {
  /** Mask of the pixels that may be flooded (default: all); pixels with allowed[p] = 0 stay 0. */
  allowed?: Uint8Array;
  /**
   * The level each relief value floods at (256 entries; default: the value itself), so that an image can
   * be flooded as its inverse, say, without building the inverted copy.
   */
  levels?: Uint8Array;
}

const IDENTITY_LEVELS = Uint8Array.from({ length: 256 }, (_, v) => v);

/**
 * Floods `labels` in place.
 *
 * @param labels Int32Array (w*h): > 0 markers, 0 pixels to flood; pixels with `allowed[p] = 0` stay 0.
 * @param relief Uint8Array (w*h): height to flood over (walls high), through `levels` when given.
 */
export function floodFromMarkers(labels: Int32Array, relief: Uint8Array, width: number, height: number, opts: FloodOptions = {}): void {
  const { allowed } = opts;
  const levelOf = opts.levels ?? IDENTITY_LEVELS;
  const n = width * height;
  // The pixels still to be taken as a bitmap (n/8 bytes): the neighbour tests, which are most of the work,
  // then stay in cache on large images instead of missing it in the label image.
  const free = new Int32Array((n + 31) >>> 5);
  // One FIFO per relief level, each a contiguous growable array of (pixel, label) pairs: pops read in
  // order and never go back to the label image.
  const queues: Int32Array[] = [];
  const head = new Int32Array(256);
  const tail = new Int32Array(256);
  const initial = Math.max(32, (n >> 7) & ~1);
  for (let l = 0; l < 256; l++) queues.push(new Int32Array(0));
  const grow = (l: number): Int32Array => {
    const q = queues[l]!;
    const h0 = head[l]!;
    const live = tail[l]! - h0;
    let out: Int32Array;
    if (q.length > 0 && live * 2 <= q.length) {
      // Reuse the consumed front before doubling.
      q.copyWithin(0, h0, tail[l]!);
      out = q;
    } else {
      out = new Int32Array(Math.max(initial, q.length * 2));
      out.set(q.subarray(h0, tail[l]!));
    }
    queues[l] = out;
    head[l] = 0;
    tail[l] = live;
    return out;
  };
  const push = (p: number, lab: number, l: number): void => {
    let q = queues[l]!;
    if (tail[l]! + 2 > q.length) q = grow(l);
    q[tail[l]!++] = p;
    q[tail[l]!++] = lab;
  };

  // Seed the queues with marker pixels that border unlabelled ones, in raster order; mark the free pixels.
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let x = 0; x < width; x++) {
      const p = row + x;
      const lab = labels[p]!;
      if (lab === 0 && (allowed === undefined || allowed[p] !== 0)) free[p >>> 5]! |= 1 << (p & 31);
      if (lab <= 0) continue;
      if (
        (x > 0 && labels[p - 1] === 0) ||
        (x < width - 1 && labels[p + 1] === 0) ||
        (y > 0 && labels[p - width] === 0) ||
        (y < height - 1 && labels[p + width] === 0)
      ) {
        push(p, lab, levelOf[relief[p]!]!);
      }
    }
  }
  const last = n - width;
  for (let level = 0; level < 256; ) {
    if (head[level] === tail[level]) {
      level++;
      continue;
    }
    const cur = queues[level]!;
    const p = cur[head[level]!++]!;
    const lab = cur[head[level]!++]!;
    const x = p % width;
    // Neighbours in a fixed order (left, right, up, down): the first front to reach a pixel takes it.
    // Written out four times: a loop over the four costs a third more here.
    if (x > 0) {
      const q = p - 1;
      if ((free[q >>> 5]! & (1 << (q & 31))) !== 0) {
        free[q >>> 5]! &= ~(1 << (q & 31));
        labels[q] = lab;
        const l = levelOf[relief[q]!]!;
        push(q, lab, l < level ? level : l);
      }
    }
    if (x < width - 1) {
      const q = p + 1;
      if ((free[q >>> 5]! & (1 << (q & 31))) !== 0) {
        free[q >>> 5]! &= ~(1 << (q & 31));
        labels[q] = lab;
        const l = levelOf[relief[q]!]!;
        push(q, lab, l < level ? level : l);
      }
    }
    if (p >= width) {
      const q = p - width;
      if ((free[q >>> 5]! & (1 << (q & 31))) !== 0) {
        free[q >>> 5]! &= ~(1 << (q & 31));
        labels[q] = lab;
        const l = levelOf[relief[q]!]!;
        push(q, lab, l < level ? level : l);
      }
    }
    if (p < last) {
      const q = p + width;
      if ((free[q >>> 5]! & (1 << (q & 31))) !== 0) {
        free[q >>> 5]! &= ~(1 << (q & 31));
        labels[q] = lab;
        const l = levelOf[relief[q]!]!;
        push(q, lab, l < level ? level : l);
      }
    }
  }
}

/**
 * Renumbers labels to 1..count in order of first appearance (row-major scan), keeping 0 as 0.
 * @returns the new count
 */
export function relabelSequential(labels: Int32Array, maxLabel: number): number {
  const map = new Int32Array(maxLabel + 1).fill(-1);
  map[0] = 0;
  let count = 0;
  for (let i = 0; i < labels.length; i++) {
    const l = labels[i]!;
    let m = map[l]!;
    if (m === -1) {
      m = ++count;
      map[l] = m;
    }
    labels[i] = m;
  }
  return count;
}
