/** Transformation kinetics of an image series: transformed fraction per frame and the JMAK (Avrami) fits. */
export { analyzeSeries, analyzeSeriesDetailed, finalMosaic, DECREASE_TOLERANCE, type SeriesOptions, type FinalMosaic } from './series';
export { fitAvrami, fitJmakNonlinear, avramiFrames, type JmakFit, type Interval, type AvramiOptions, type NonlinearOptions } from './fit';
export { jmak, halfTime, rateK, avramiPoint, JMAK_CONVENTION } from './jmak';
export { simulateGrowth, type GrowthOptions, type GrowthTruth, type GrowthMode, type Nucleus } from './simulate';
export { interpret, ASSUMPTIONS, EARLY_MAX_FRACTION } from './interpret';
export { parseTimesList, parseTimesCsv, timesFromNames } from './times';
export type * from './types';
