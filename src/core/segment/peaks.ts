/**
 * Markers for splitting touching bodies: the regional maxima of the distance transform whose dynamic
 * (height above the saddle that joins them to a higher maximum) is at least h. A union–find sweep over the
 * pixels in decreasing order of distance merges a younger component into an older one when its dynamic is
 * below h (Grimaud 1992, "New measure of contrast: the dynamics", Proc. SPIE 1769; pub, memory; the
 * h-maxima of Soille 2003, Morphological Image Analysis, ch. 6; trade).
 *
 * For two discs of radius R whose centres are d apart, the smaller peak's dynamic is R − √(R² − d²/4), so
 * h separates bodies that overlap less than a known amount, while boundary noise (dynamics of about a
 * pixel) makes no markers.
 */

/**
 * With `relative` > 0 the minimum dynamic of a peak grows with the peak's own height (the radius of the body
 * it marks): max(h, relative·height), so a small body beside a large one is judged by its own size.
 *
 * @param dist distance transform (px), 0 outside the bodies
 * @param h minimum dynamic (px)
 * @param relative minimum dynamic as a fraction of the peak's own height (0 = h alone)
 * @returns Int32Array of marker labels (one pixel per marker: the peak), 0 elsewhere, and the count
 */
export function dynamicPeaks(
  dist: Float32Array,
  width: number,
  height: number,
  h: number,
  relative = 0,
): { markers: Int32Array; count: number } {
  const n = width * height;
  // Order the body pixels by decreasing distance (counting sort on 1/32 px steps).
  let max = 0;
  let m = 0;
  for (let i = 0; i < n; i++) {
    const v = dist[i]!;
    if (v > 0) {
      m++;
      if (v > max) max = v;
    }
  }
  const q = 32;
  const levels = Math.ceil(max * q) + 1;
  const start = new Int32Array(levels + 1);
  for (let i = 0; i < n; i++) if (dist[i]! > 0) start[levels - 1 - Math.floor(dist[i]! * q)]!++;
  for (let l = 0, acc = 0; l <= levels; l++) {
    const c = start[l]!;
    start[l] = acc;
    acc += c;
  }
  const order = new Int32Array(m);
  for (let i = 0; i < n; i++) if (dist[i]! > 0) order[start[levels - 1 - Math.floor(dist[i]! * q)]!++] = i;

  const parent = new Int32Array(n).fill(-1); // -1 = not yet processed
  const peak = new Int32Array(n); // for a root: the pixel of its highest point
  const alive = new Uint8Array(n); // for a root: its peak still counts as a marker
  const recorded: number[] = [];
  const find = (x: number): number => {
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]!]!;
      x = parent[x]!;
    }
    return x;
  };
  for (let k = 0; k < m; k++) {
    const p = order[k]!;
    parent[p] = p;
    peak[p] = p;
    alive[p] = 1;
    const x = p % width;
    const y = (p - x) / width;
    const level = dist[p]!;
    // The root of p's component, kept through the merges below (each merge makes `old` the root of both).
    let b = p;
    for (let dy = -1; dy <= 1; dy++) {
      const yy = y + dy;
      if (yy < 0 || yy >= height) continue;
      for (let dx = -1; dx <= 1; dx++) {
        const xx = x + dx;
        if ((dx === 0 && dy === 0) || xx < 0 || xx >= width) continue;
        const r = yy * width + xx;
        if (parent[r] === -1) continue;
        const a = find(r);
        if (a === b) continue;
        // The root with the lower peak is the younger one (no pair array: this runs for most pixels).
        const aOlder = dist[peak[a]!]! >= dist[peak[b]!]!;
        const old = aOlder ? a : b;
        const young = aOlder ? b : a;
        const top = dist[peak[young]!]!;
        if (alive[young] && top - level < Math.max(h, relative * top)) alive[young] = 0;
        // A young peak that stands at least h above the saddle stays a marker.
        if (alive[young]) recorded.push(peak[young]!);
        parent[young] = old;
        b = old;
      }
    }
  }
  // Roots left at the end are the highest peak of each body.
  for (let k = 0; k < m; k++) {
    const p = order[k]!;
    if (parent[p] === p) recorded.push(peak[p]!);
  }
  const markers = new Int32Array(n);
  let count = 0;
  for (const p of recorded) if (markers[p] === 0) markers[p] = ++count;
  return { markers, count };
}
