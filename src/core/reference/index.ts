/** The random-seeding reference: published constants and the Monte Carlo reference in the same field. */
export * from './constants';
export {
  referenceMonteCarlo, clearReferenceCache, planReference, drawReplicates, combineReplicates, batchBuffers,
  REFERENCE_STATISTICS, REFERENCE_CACHE_SIZE,
} from './montecarlo';
export type { Reference, ReferenceOptions, ReferenceLayout, ReferenceStatistic, ReferencePlan, ReplicateBatch } from './montecarlo';
export type { Envelope } from './envelope';
export { referenceSummary, type ReferenceSummary } from './summary';
export { startReference, chunkSize, type ReferencePool, type ReferenceJob } from './parallel';
export { windowCells } from './window';
