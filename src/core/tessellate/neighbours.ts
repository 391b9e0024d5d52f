/** Neighbour lists of a Delaunay triangulation. */

/**
 * The Delaunay neighbours of each point in CSR form: every edge of the triangulation, listed at both of
 * its points, in the order of the halfedges (a hull edge, which has no twin, is listed from both ends).
 * @param d a triangulation (d3-delaunay's Delaunay or Delaunator): triangles and halfedges
 * @param n number of points
 */
export function delaunayNeighbours(d: { triangles: ArrayLike<number>; halfedges: ArrayLike<number> }, n: number): { offsets: Int32Array; index: Int32Array } {
  const { triangles, halfedges } = d;
  const m = triangles.length;
  const offsets = new Int32Array(n + 1);
  // Halfedge e runs from triangles[e] to the next vertex of its triangle.
  const to = (e: number): number => triangles[e % 3 === 2 ? e - 2 : e + 1]!;
  for (let e = 0; e < m; e++) {
    offsets[triangles[e]! + 1]!++;
    if (halfedges[e]! < 0) offsets[to(e) + 1]!++;
  }
  for (let i = 0; i < n; i++) offsets[i + 1] = offsets[i + 1]! + offsets[i]!;
  const fill = offsets.slice(0, n);
  const index = new Int32Array(offsets[n]!);
  for (let e = 0; e < m; e++) {
    index[fill[triangles[e]!]!++] = to(e);
    if (halfedges[e]! < 0) index[fill[to(e)]!++] = triangles[e]!;
  }
  return { offsets, index };
}
