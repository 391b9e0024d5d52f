/** The random-seeding reference: published constants and the Monte Carlo reference in the same field. */
export * from './constants';
export { referenceMonteCarlo, referenceSummary, clearReferenceCache, REFERENCE_STATISTICS, REFERENCE_CACHE_SIZE } from './montecarlo';
export type { Reference, ReferenceOptions, ReferenceLayout, ReferenceStatistic, Envelope } from './montecarlo';
export { windowCells } from './window';
