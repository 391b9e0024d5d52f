/** The largest gap of a point pattern: the largest empty circle centred in the field. */
import type { Tessellation } from '../tessellate';

export interface LargestGap {
  /** Centre (px). */
  x: number;
  y: number;
  /** Radius (px): the distance from the centre to the nearest point. */
  radius: number;
  /** 0-based index of one of the nearest points (the cell whose vertex the centre is). */
  cell: number;
}

/**
 * The largest circle centred in the field that contains no point. Its centre is a vertex of the clipped
 * Voronoi diagram: a Voronoi vertex inside the field, a crossing of a Voronoi edge with the border, or a
 * field corner (Shamos & Hoey 1975, "Closest-point problems", FOCS; Toussaint 1983; pub, memory), and
 * there the distance to the nearest point is the distance to the cell's own point. So the answer is the
 * maximum over the clipped cells' vertices of their distance to the cell's point. The circle may reach
 * past the border; only its centre is held to the field.
 *
 * @param t a tessellation of the points (its polygons are used)
 * @param inside where a centre may lie (a tissue mask): the vertices outside are passed over
 */
export function largestGap(t: Tessellation, inside?: (x: number, y: number) => boolean): LargestGap {
  const n = t.area.length;
  let best = -1;
  let bx = Number.NaN;
  let by = Number.NaN;
  let bc = -1;
  for (let i = 0; i < n; i++) {
    const px = t.points[2 * i]!;
    const py = t.points[2 * i + 1]!;
    for (let v = t.polygonOffsets[i]!; v < t.polygonOffsets[i + 1]!; v++) {
      const x = t.polygonCoords[2 * v]!;
      const y = t.polygonCoords[2 * v + 1]!;
      const d2 = (x - px) * (x - px) + (y - py) * (y - py);
      if (d2 > best && (!inside || inside(x, y))) {
        best = d2;
        bx = x;
        by = y;
        bc = i;
      }
    }
  }
  return { x: bx, y: by, radius: best >= 0 ? Math.sqrt(best) : Number.NaN, cell: bc };
}
