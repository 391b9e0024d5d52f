/**
 * GeoJSON and SVG writers for the cells (RFC 7946 GeoJSON; SVG 1.1). Coordinates are image pixels
 * (x right, y down), a plain Cartesian frame: GeoJSON readers should treat them as such, not as
 * longitude/latitude. Calibrated µm values are in the properties.
 */
import type { Analysis } from '../analysis.types';
import type { Polygons } from '../cv/contours';
import { drawCentroids, drawPolygons, drawVoronoi, r2, SvgPath } from './path';
import { formatNumber } from './csv';
import { utf8OfPieces } from './utf8';
import { LAYER_COLOURS, legendBox, legendSvg } from './palette';

/**
 * cells.geojson: a FeatureCollection with, per cell, a Polygon feature (the segmented outline, or the
 * Voronoi cell for a points pattern) and a Point feature (the centroid), both carrying the table's row.
 * Properties are the table's values as cells.csv prints them (formatNumber; null where not finite),
 * coordinates rounded to 0.01 px. The text is written directly, as JSON.stringify would write the same
 * objects (numbers as String gives them), without building a million objects first.
 *
 * As one string: for a million cells that is about 450 MB of text, near the longest string JavaScript
 * engines make (2^29 − 24 characters in V8); files are written from {@link cellsGeoJsonBytes}, which has no
 * such limit.
 */
export function cellsGeoJson(analysis: Analysis, outlines: Polygons | null): string {
  return Array.from(geoJsonPieces(analysis, outlines)).join('');
}

/**
 * cells.geojson as UTF-8 bytes, the same text as {@link cellsGeoJson} byte for byte, encoded a batch of
 * features at a time into one growing buffer: no string of the whole file is ever made.
 * @param batchChars characters of text gathered before each encoding (a parameter for tests)
 */
export function cellsGeoJsonBytes(analysis: Analysis, outlines: Polygons | null, batchChars = 1 << 20): Uint8Array {
  return utf8OfPieces(geoJsonPieces(analysis, outlines), batchChars);
}

/** The text of cells.geojson in pieces (the head, then each feature with its separator, then the tail). */
function* geoJsonPieces(analysis: Analysis, outlines: Polygons | null): Generator<string> {
  const t = analysis.tessellation;
  const polys = outlines ?? { offsets: t.polygonOffsets, coords: t.polygonCoords };
  const n = t.points.length / 2;
  const names = Object.keys(analysis.columns);
  const cols = names.map((k) => analysis.columns[k]!);
  // Keys as JSON writes them; a column called "kind" would be overwritten in place by the feature kind.
  const keys = names.map((k) => `${JSON.stringify(k)}:`);
  const kindAt = names.indexOf('kind');
  const coords = polys.coords;
  const head = JSON.stringify({ type: 'FeatureCollection', properties: { units: 'px', umPerPx: analysis.settings.umPerPx, width: analysis.width, height: analysis.height } });
  yield `${head.slice(0, -1)},"features":[`;
  let sep = '';
  for (let i = 0; i < n; i++) {
    const a = polys.offsets[i]!;
    const b = polys.offsets[i + 1]!;
    if (b - a >= 3) {
      // Pieces joined once per feature: one flat string each, not a rope of hundreds of small ones.
      const f: string[] = [sep, '{"type":"Feature","properties":{'];
      for (let c = 0; c < cols.length; c++) {
        const v = cols[c]![i]!;
        if (c) f.push(',');
        f.push(keys[c]!, c === kindAt ? '"outline"' : Number.isFinite(v) ? formatNumber(v) : 'null');
      }
      if (kindAt < 0) f.push(cols.length ? ',"kind":"outline"' : '"kind":"outline"');
      f.push('},"geometry":{"type":"Polygon","coordinates":[[');
      for (let k = a; k < b; k++) f.push('[', r2(coords[2 * k]!), ',', r2(coords[2 * k + 1]!), '],');
      f.push('[', r2(coords[2 * a]!), ',', r2(coords[2 * a + 1]!), ']]]}}');
      yield f.join('');
      sep = ',';
    }
    yield `${sep}{"type":"Feature","properties":{"cell":${i + 1},"kind":"centroid"},"geometry":{"type":"Point","coordinates":[${r2(t.points[2 * i]!)},${r2(t.points[2 * i + 1]!)}]}}`;
    sep = ',';
  }
  yield ']}\n';
}

export interface OverlayStyle {
  outlines?: boolean;
  centroids?: boolean;
  voronoi?: boolean;
}

/**
 * overlay.svg: outlines (blue), Voronoi edges (orange, dashed) and centroids (black crosses) in image pixel
 * coordinates, the same size as the image, for laying over it. Colours from the Okabe–Ito palette, which
 * stays distinct under the common colour-vision deficiencies (Okabe & Ito 2008; trade).
 */
export function overlaySvg(analysis: Analysis, outlines: Polygons | null, style: OverlayStyle = {}): string {
  return Array.from(overlayPieces(analysis, outlines, style)).join('');
}

/**
 * overlay.svg as UTF-8 bytes, the same text as {@link overlaySvg} byte for byte, without a string of the
 * whole file (about 150 MB of text for a million cells).
 */
export function overlaySvgBytes(analysis: Analysis, outlines: Polygons | null, style: OverlayStyle = {}): Uint8Array {
  return utf8OfPieces(overlayPieces(analysis, outlines, style));
}

/** The text of overlay.svg in pieces: its lines, each path's data in the batches SvgPath joined. */
function* overlayPieces(analysis: Analysis, outlines: Polygons | null, style: OverlayStyle): Generator<string> {
  const s = { outlines: true, centroids: true, voronoi: true, ...style };
  const { width: w, height: h } = analysis;
  yield `<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}">\n`;
  const u = analysis.settings.umPerPx;
  yield `<title>Tessellab overlay: ${analysis.tessellation.points.length / 2} cells; ${u === null ? 'uncalibrated (px)' : `${u} µm per px`}</title>\n`;
  if (s.outlines && outlines) {
    const p = new SvgPath();
    drawPolygons(p, outlines.offsets, outlines.coords);
    yield '<path id="outlines" d="';
    yield* p.pieces();
    yield `" fill="none" stroke="${LAYER_COLOURS.outlines.colour}" stroke-width="1"/>\n`;
  }
  if (s.voronoi) {
    const p = new SvgPath();
    drawVoronoi(p, analysis.tessellation);
    yield '<path id="voronoi" d="';
    yield* p.pieces();
    yield `" fill="none" stroke="${LAYER_COLOURS.voronoi.colour}" stroke-width="1"/>\n`;
  }
  if (s.centroids) {
    const p = new SvgPath();
    drawCentroids(p, analysis.tessellation.points, 2);
    yield '<path id="centroids" d="';
    yield* p.pieces();
    yield `" fill="none" stroke="${LAYER_COLOURS.centroids.colour}" stroke-width="1"/>\n`;
  }
  // The legend of what is drawn, in the lower right corner (its own group: delete it to lay the overlay bare).
  const shown = [s.outlines && outlines ? LAYER_COLOURS.outlines : null, s.voronoi ? LAYER_COLOURS.voronoi : null, s.centroids ? LAYER_COLOURS.centroids : null]
    .filter((x): x is NonNullable<typeof x> => x !== null);
  if (shown.length) {
    const size = Math.max(8, Math.round(Math.min(w, h) / 60));
    const box = legendBox(shown, size);
    yield legendSvg(shown, Math.max(0, w - box.w - size), Math.max(0, h - box.h - size), size);
  }
  yield '</svg>\n';
}
