/** Statistics of cell patterns against random seeding: the public entry points. */
export { randomness, monteCarloP, combinedMaxZ, MIN_INTERIOR_CELLS } from './randomness';
export type { RandomnessInput, RandomnessResult, TestRow, Verdict } from './randomness';
export { assignEvents, assignEventsDetailed, eventsDensity, eventsDispersion, parseEventsCsv, analyseEvents } from './events';
export type { EventAssignment, EventsDispersion, EventsAnalysis } from './events';
export { largestGap } from './gap';
export type { LargestGap } from './gap';
export { voronoiLikeness } from './likeness';
export type { VoronoiLikeness } from './likeness';
export {
  cellSample, sideStats, areaStats, lewisLaw, aboavWeaireLaw, clarkEvans, lFunction, lRadii, ksDistance, gammaShapeMle, weightedLine, MAX_SIDES,
} from './pattern';
