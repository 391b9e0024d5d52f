/** What summary.json and the `reference` command say of a random-seeding reference (plain JSON). */
import type { EdgeRule } from '../settings';
import { MAX_SIDES } from '../stats/pattern';
import type { Rect } from '../types';
import type { Envelope } from './envelope';
import { AREA_GRID_STEP, REFERENCE_STATISTICS, type Reference, type ReferenceLayout } from './montecarlo';

const round = (v: number, d = 6): number | null => (Number.isFinite(v) ? Number(v.toPrecision(d)) : null);
const arr = (a: ArrayLike<number>, d = 6): (number | null)[] => Array.from(a as ArrayLike<number>, (v) => round(v, d));

/** An envelope in JSON: numbers rounded, null where a value is missing. */
export interface EnvelopeJson {
  mean: (number | null)[];
  lo: (number | null)[];
  hi: (number | null)[];
  min: (number | null)[];
  max: (number | null)[];
}

/** What summary.json and the `reference` command say of a reference. */
export interface ReferenceSummary {
  cells: number;
  field: Rect;
  replicates: number;
  seed: number;
  edgeRule: EdgeRule;
  minCellAreaPx: number;
  layout: ReferenceLayout;
  /** The tissue mask the reference was drawn in (area px², perimeter px); absent when it was drawn in the field. */
  mask?: { areaPx2: number; perimeterPx: number };
  densityPerPx2: number | null;
  seedsPerReplicate: number;
  interiorCellsTotal: number;
  /** Mean and sd over the replicates of each statistic of the registry (and its values when asked for). */
  statistics: Record<string, { mean: number | null; sd: number | null; values?: (number | null)[] }>;
  sides: { n: number[] } & EnvelopeJson;
  areaEcdf: { y: (number | null)[] } & EnvelopeJson;
  areaHistogram: { y0: (number | null)[]; binWidth: number } & EnvelopeJson;
  lFunction: { rPx: (number | null)[] } & EnvelopeJson;
  lewis: { n: number[]; meanNormalisedArea: (number | null)[] };
  aboavWeaire: { n: number[]; meanNeighbourSides: (number | null)[] };
  warnings: string[];
}

/**
 * A JSON-serialisable summary of a reference: its options, mean and sd of each statistic, the side
 * distribution and area and L-function envelopes. Replicate values are included only if asked for.
 */
export function referenceSummary(ref: Reference, opts: { includeValues?: boolean } = {}): ReferenceSummary {
  const stats: ReferenceSummary['statistics'] = {};
  for (const name of REFERENCE_STATISTICS) {
    stats[name] = { mean: round(ref.mean[name]), sd: round(ref.sd[name]), ...(opts.includeValues ? { values: arr(ref.values[name]) } : {}) };
  }
  const env = (e: Envelope): EnvelopeJson => ({ mean: arr(e.mean), lo: arr(e.lo), hi: arr(e.hi), min: arr(e.min), max: arr(e.max) });
  return {
    cells: ref.options.cells,
    field: ref.options.field,
    replicates: ref.options.replicates,
    seed: ref.options.seed,
    edgeRule: ref.options.edgeRule,
    minCellAreaPx: ref.options.minCellAreaPx,
    layout: ref.options.layout,
    ...(ref.options.mask ? { mask: { areaPx2: ref.options.mask.area, perimeterPx: round(ref.options.mask.perimeter)! } } : {}),
    densityPerPx2: round(ref.options.density),
    seedsPerReplicate: ref.seedsPerReplicate,
    interiorCellsTotal: ref.interiorCellsTotal,
    statistics: stats,
    sides: { n: Array.from({ length: MAX_SIDES + 1 }, (_, n) => n), ...env(ref.sides) },
    areaEcdf: { y: arr(ref.areaGrid), ...env(ref.areaEcdf) },
    areaHistogram: { y0: arr(ref.areaGrid.subarray(0, ref.areaGrid.length - 1)), binWidth: AREA_GRID_STEP, ...env(ref.areaHistogram) },
    lFunction: { rPx: arr(ref.lRadii), ...env(ref.lFunction) },
    lewis: { n: ref.lewis.n, meanNormalisedArea: arr(ref.lewis.value) },
    aboavWeaire: { n: ref.aboav.n, meanNeighbourSides: arr(ref.aboav.value) },
    warnings: ref.warnings,
  };
}
