/**
 * Marker-controlled watershed by priority flooding on an 8-bit relief (Meyer 1991, "Un algorithme optimal
 * de ligne de partage des eaux", Proc. 8e congrès RFIA; Beucher & Meyer 1993; pub, memory).
 *
 * Markers grow into unlabelled pixels in order of relief height, lowest first, with a FIFO per level so
 * that fronts advance evenly across plateaus. A pixel takes the label of the first front that reaches it,
 * so the result has no watershed-line pixels: the cells tile the allowed region completely and every pair
 * of touching cells shares a boundary. O(N) with a 256-level bucket queue.
 */

/**
 * Floods `labels` in place.
 *
 * @param labels Int32Array (w*h): > 0 markers, 0 pixels to flood; pixels with `allowed[p] = 0` stay 0.
 * @param relief Uint8Array (w*h): height to flood over (walls high).
 * @param allowed optional Uint8Array mask of pixels that may be flooded (default: all).
 */
export function floodFromMarkers(labels: Int32Array, relief: Uint8Array, width: number, height: number, allowed?: Uint8Array): void {
  const n = width * height;
  const next = new Int32Array(n).fill(-1);
  const head = new Int32Array(256).fill(-1);
  const tail = new Int32Array(256).fill(-1);
  let level = 0;

  const push = (p: number, l: number): void => {
    if (l < level) l = level;
    if (tail[l] === -1) head[l] = p;
    else next[tail[l]!] = p;
    tail[l] = p;
  };

  const visit = (q: number, lab: number): void => {
    if (labels[q] !== 0 || (allowed && allowed[q] === 0)) return;
    labels[q] = lab;
    push(q, relief[q]!);
  };

  // Seed the queue with marker pixels that border unlabelled ones.
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const p = y * width + x;
      if (labels[p]! <= 0) continue;
      if (
        (x > 0 && labels[p - 1] === 0) ||
        (x < width - 1 && labels[p + 1] === 0) ||
        (y > 0 && labels[p - width] === 0) ||
        (y < height - 1 && labels[p + width] === 0)
      ) {
        push(p, relief[p]!);
      }
    }
  }
  level = 0;
  for (;;) {
    while (level < 256 && head[level] === -1) level++;
    if (level >= 256) break;
    const p = head[level]!;
    head[level] = next[p]!;
    if (head[level] === -1) tail[level] = -1;
    const lab = labels[p]!;
    const x = p % width;
    if (x > 0) visit(p - 1, lab);
    if (x < width - 1) visit(p + 1, lab);
    if (p >= width) visit(p - width, lab);
    if (p < n - width) visit(p + width, lab);
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
