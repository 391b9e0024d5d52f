/** Helpers of the reference's replicate rows: concatenation, class rows, pooled classes, visible centroids. */
import { MAX_SIDES } from '../stats/pattern';

/** The parts one after another in one array of `length`. */
export function concat(parts: Float64Array[], length: number): Float64Array {
  const out = new Float64Array(length);
  let o = 0;
  for (const p of parts) (out.set(p, o), (o += p.length));
  return out;
}

/** One replicate's class counts and count × class mean into row `offset` of w and v. */
export function classRow(law: { n: number[]; value: number[]; count: number[] }, w: Float64Array, v: Float64Array, offset: number): void {
  for (let k = 0; k < law.n.length; k++) {
    w[offset + law.n[k]!] = law.count[k]!;
    v[offset + law.n[k]!] = law.count[k]! * law.value[k]!;
  }
}

/** Centroids of the cells at least minArea large (the ones a segmentation would see). */
export function visibleCentroids(centroid: Float64Array, area: Float64Array, minArea: number): Float64Array {
  if (!(minArea > 0)) return centroid;
  let m = 0;
  for (let i = 0; i < area.length; i++) if (area[i]! >= minArea) m++;
  const out = new Float64Array(2 * m);
  let k = 0;
  for (let i = 0; i < area.length; i++) {
    if (area[i]! < minArea) continue;
    out[k++] = centroid[2 * i]!;
    out[k++] = centroid[2 * i + 1]!;
  }
  return out;
}

export function pooledClasses(w: Float64Array, v: Float64Array): { n: number[]; value: number[] } {
  const n: number[] = [];
  const value: number[] = [];
  for (let k = 0; k <= MAX_SIDES; k++) {
    if (w[k]! > 0) {
      n.push(k);
      value.push(v[k]! / w[k]!);
    }
  }
  return { n, value };
}
