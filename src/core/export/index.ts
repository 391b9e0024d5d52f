export { cellsCsv, summaryCsv, flattenSummary, formatNumber, SUMMARY_CSV_KEYS } from './csv';
export { summaryJson, settingsJson } from './json';
export { cellsGeoJson, cellsGeoJsonBytes, overlaySvg, overlaySvgBytes, type OverlayStyle } from './geometry';
export { labelsPng } from './labels';
export { drawPolygons, drawVoronoi, drawDelaunay, drawCentroids, SvgPath, type PathSink } from './path';
export { imageFiles, needsOutlines, fileStem, IMAGE_FILE_KINDS, type ImageFileKind, type OutputFile } from './files';
export { kineticsCsv, kineticsJson } from './kinetics';
