/** The benchmark's stages and the shape of one case's result (shared by the runner and the case process). */

/** Stage names of the table, in order. */
export const STAGES = ['decode', 'segment', 'measure', 'tessellate', 'statistics', 'grain', 'export'] as const;
export type Stage = (typeof STAGES)[number];

export interface RunTimes {
  stages: Record<Stage, number>;
  /** The analyze() call alone (opencv.js already loaded), ms. */
  analysis: number;
  /** decode + analysis + export, ms. */
  total: number;
  /** Highest RSS sampled at the stage boundaries of this run, bytes. */
  rssMax: number;
}

export interface CaseResult {
  id: string;
  cells: number;
  megapixels: number | null;
  runs: RunTimes[];
  /** Peak resident set of the whole process (warm-up and runs included), bytes. */
  peakRss: number;
  /** Peak resident set up to the end of the first analysis (decode and analysis, before any export), bytes. */
  peakRssAnalysis: number;
  /** opencv.js load, ms (excluded from every figure). */
  cvLoad: number;
  /** Exports that could not be written (e.g. a string too long for V8), by name. */
  exportErrors: Record<string, string>;
}

