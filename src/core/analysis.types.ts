import type { Columns, LabelImage, Rect } from './types';
import type { Settings } from './settings';
import type { Tessellation } from './tessellate/types';
import type { GrainSizeResult } from './grain/types';
import type { RandomnessResult } from './stats/randomness';

export type { Summary } from './summary';
import type { Summary } from './summary';

/** Everything one analysis of one image (or point set) produces. */
export interface Analysis {
  width: number;
  height: number;
  field: Rect;
  settings: Settings;
  /** Segmentation labels (walls, bodies); null for a points pattern. */
  labels: LabelImage | null;
  /** Per-cell measurement columns, names from the measurement registry (units in the names). */
  columns: Columns;
  /** Voronoi/Delaunay of the centroids, clipped to the field. */
  tessellation: Tessellation;
  summary: Summary;
  /** ASTM E112 rating with its audit marks (walls pattern with a pixel size), in field coordinates. */
  grain?: GrainSizeResult | null;
  /** Observed versus random seeding: tests, verdict and plot data (px units). */
  randomness?: RandomnessResult | null;
}
