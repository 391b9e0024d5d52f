import type { Rect } from '../types';

/**
 * The Voronoi tessellation of a point set clipped to a rectangular field, with its Delaunay dual.
 * All coordinates in px. Arrays are indexed by point i (0-based).
 */
export interface Tessellation {
  /** Seeds, interleaved x0, y0, x1, y1, ... (px). */
  points: Float64Array;
  field: Rect;
  /** Area of each clipped Voronoi cell (px²). Sums to the field area. */
  area: Float64Array;
  /** Perimeter of each clipped cell (px), field border included. */
  perimeter: Float64Array;
  /**
   * Number of sides of each cell: for a cell that does not touch the field border this is its number of
   * Voronoi neighbours; for a border cell it counts the sides of the clipped polygon.
   */
  sides: Int32Array;
  /** Centroid of each clipped cell polygon, interleaved x, y (px). */
  centroid: Float64Array;
  /** 1 if the clipped cell touches the field border. */
  edge: Uint8Array;
  /** Bounding box of each clipped cell, 4 per cell: x0, y0, x1, y1 (px). */
  bbox: Float64Array;
  /** Voronoi neighbours (cells sharing an edge of positive length inside the field), CSR form. */
  neighbourOffsets: Int32Array;
  neighbourIndex: Int32Array;
  /** Delaunay triangles, 3 point indices each. */
  triangles: Uint32Array;
  /** Clipped cell polygons, CSR form: vertices of cell i are polygonCoords[2*polygonOffsets[i] .. 2*polygonOffsets[i+1]). */
  polygonOffsets: Int32Array;
  polygonCoords: Float64Array;
}
