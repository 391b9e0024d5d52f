/**
 * Which cuts between touching bodies to keep. The watershed on the distance transform proposes a cut
 * between every pair of neighbouring markers; a cut between two bodies runs across a neck, so where it meets
 * the outline it meets it at a concave point (the deepest point of a convexity defect). A cut that meets the
 * outline at a convex point goes through one body, a textured or irregular one, and its two parts are joined
 * again; so is a cut that meets no concave point at all. A convex body is therefore never cut
 * (concave-point splitting of touching objects; trade).
 *
 * The ends of a cut are where it meets the outside of the bodies. An end on the image border (the outline
 * is cut off there), or at a hole the bodies enclose (a gap among several bodies), is neither concave nor
 * convex; where three bodies meet, a cut ends at the others, not at the outline, and has one end only.
 */

/** Why a proposed cut was kept or refused, for tests and the Detect panel. */
export interface CutReport {
  /** Pairs of neighbouring regions proposed by the watershed. */
  proposed: number;
  /** Cuts kept: at least one end concave and none convex. */
  kept: number;
}

/**
 * Joins the regions of every refused cut, in place.
 *
 * @param labels regions 1..count inside the bodies, 0 outside (w*h); relabelled in place (labels of joined
 *   regions take the smallest label of their group; the caller renumbers)
 * @param inside 1 inside the bodies (the mask the regions tile), 0 outside
 * @param hole 1 at the pixels outside the bodies that the bodies enclose (not connected to the image border)
 * @param cusp 1 at the cusps of the holes that are gaps among bodies (src/core/cv/concavity.ts holeCusps)
 * @param depth concavity depth (px) of each outline pixel (src/core/cv/concavity.ts), 0 elsewhere
 * @param height per region, its peak distance to the outside (the radius of the body it marks)
 * @param minDepth the least concavity depth (px) of a cut's end for a body of radius r
 */
export function keepConcaveCuts(
  labels: Int32Array,
  count: number,
  inside: Uint8Array,
  hole: Uint8Array,
  cusp: Uint8Array,
  depth: Float32Array,
  height: Float32Array,
  width: number,
  h: number,
  minDepth: (r: number) => number,
): CutReport {
  // End pixels of each cut: pixels of the cut (one side or the other) that touch the outside or the border.
  const ends = new Map<number, number[]>();
  const pairKey = (a: number, b: number): number => (a < b ? a * (count + 1) + b : b * (count + 1) + a);
  const proposed = new Set<number>();
  const atOutline = (p: number): boolean => {
    const x = p % width;
    const y = (p - x) / width;
    if (x === 0 || y === 0 || x === width - 1 || y === h - 1) return true;
    for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) if (!inside[p + dy * width + dx]) return true;
    return false;
  };
  const addEnd = (k: number, p: number): void => {
    let list = ends.get(k);
    if (!list) ends.set(k, (list = []));
    list.push(p);
  };
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < width; x++) {
      const p = y * width + x;
      const a = labels[p]!;
      if (a <= 0) continue;
      for (const q of [x + 1 < width ? p + 1 : -1, y + 1 < h ? p + width : -1]) {
        if (q < 0) continue;
        const b = labels[q]!;
        if (b <= 0 || b === a) continue;
        const k = pairKey(a, b);
        proposed.add(k);
        if (atOutline(p)) addEnd(k, p);
        if (atOutline(q)) addEnd(k, q);
      }
    }
  }
  const parent = Int32Array.from({ length: count + 1 }, (_, i) => i);
  const find = (x: number): number => {
    while (parent[x] !== x) x = parent[x] = parent[parent[x]!]!;
    return x;
  };
  let kept = 0;
  for (const k of proposed) {
    const a = Math.floor(k / (count + 1));
    const b = k % (count + 1);
    if (cutIsConcave(ends.get(k) ?? [], inside, hole, cusp, depth, width, h, minDepth(Math.min(height[a]!, height[b]!)))) kept++;
    else {
      const ra = find(a);
      const rb = find(b);
      if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
    }
  }
  if (kept < proposed.size) for (let i = 0; i < labels.length; i++) if (labels[i]! > 0) labels[i] = find(labels[i]!);
  return { proposed: proposed.size, kept };
}

/**
 * A cut is kept when it has at least one concave end and no convex one, or no end at all. Its end pixels are grouped into
 * ends (pixels within 2 px of each other). An end where the cut meets the outer outline is concave when an
 * outline pixel within 2 px of it is at least `need` deep, convex otherwise. An end within 2 px of the image
 * border is never convex (the outline is cut off there). An end at an enclosed hole is concave when a cusp
 * of the hole (src/core/cv/concavity.ts holeCusps: a gap among several bodies narrows to a point at each
 * neck) lies within 2 px of it; otherwise it is neither.
 */
function cutIsConcave(
  ends: number[],
  inside: Uint8Array,
  hole: Uint8Array,
  cusp: Uint8Array,
  depth: Float32Array,
  width: number,
  h: number,
  need: number,
): boolean {
  // A cut that never meets the outside runs from junction to junction inside a packed cluster; the cuts
  // that reach the outline decide whether the bodies around it stand (refused ones join their regions).
  if (ends.length === 0) return true;
  // Group the end pixels (Chebyshev distance ≤ 2 joins two pixels).
  const group = new Int32Array(ends.length).fill(-1);
  let groups = 0;
  for (let i = 0; i < ends.length; i++) {
    if (group[i]! >= 0) continue;
    group[i] = groups;
    const stack = [i];
    while (stack.length) {
      const u = stack.pop()!;
      const ux = ends[u]! % width;
      const uy = (ends[u]! - ux) / width;
      for (let j = 0; j < ends.length; j++) {
        if (group[j]! >= 0) continue;
        const vx = ends[j]! % width;
        const vy = (ends[j]! - vx) / width;
        if (Math.abs(ux - vx) <= 2 && Math.abs(uy - vy) <= 2) {
          group[j] = groups;
          stack.push(j);
        }
      }
    }
    groups++;
  }
  const concave = new Uint8Array(groups);
  const nearBorder = new Uint8Array(groups);
  const outer = new Uint8Array(groups);
  for (let i = 0; i < ends.length; i++) {
    const p = ends[i]!;
    const g = group[i]!;
    const x = p % width;
    const y = (p - x) / width;
    if (x <= 2 || y <= 2 || x >= width - 3 || y >= h - 3) nearBorder[g] = 1;
    let atHole = false;
    for (let yy = Math.max(0, y - 1); yy <= Math.min(h - 1, y + 1); yy++) {
      for (let xx = Math.max(0, x - 1); xx <= Math.min(width - 1, x + 1); xx++) {
        const q = yy * width + xx;
        if (inside[q]) continue;
        if (hole[q]) atHole = true;
        else outer[g] = 1;
      }
    }
    if (concave[g]) continue;
    let deepest = 0;
    let nearCusp = 0;
    for (let yy = Math.max(0, y - 2); yy <= Math.min(h - 1, y + 2); yy++) {
      for (let xx = Math.max(0, x - 2); xx <= Math.min(width - 1, x + 2); xx++) {
        deepest = Math.max(deepest, depth[yy * width + xx]!);
        nearCusp |= cusp[yy * width + xx]!;
      }
    }
    if (deepest >= need || (atHole && nearCusp)) concave[g] = 1;
  }
  let nConcave = 0;
  for (let g = 0; g < groups; g++) {
    if (concave[g]) nConcave++;
    else if (outer[g] && !nearBorder[g]) return false;
  }
  return nConcave >= 1;
}
