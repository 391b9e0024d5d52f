/**
 * GeoJSON and SVG writers for the cells (RFC 7946 GeoJSON; SVG 1.1). Coordinates are image pixels
 * (x right, y down), a plain Cartesian frame: GeoJSON readers should treat them as such, not as
 * longitude/latitude. Calibrated µm values are in the properties.
 */
import type { Analysis } from '../analysis.types';
import type { Polygons } from '../cv/contours';
import { drawCentroids, drawPolygons, drawVoronoi, SvgPath } from './path';
import { formatNumber } from './csv';

function props(analysis: Analysis, i: number): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [k, col] of Object.entries(analysis.columns)) {
    const v = col[i]!;
    out[k] = Number.isFinite(v) ? Number(formatNumber(v)) : (null as unknown as number);
  }
  return out;
}

/**
 * cells.geojson: a FeatureCollection with, per cell, a Polygon feature (the segmented outline, or the
 * Voronoi cell for a points pattern) and a Point feature (the centroid), both carrying the table's row.
 */
export function cellsGeoJson(analysis: Analysis, outlines: Polygons | null): string {
  const t = analysis.tessellation;
  const polys = outlines ?? { offsets: t.polygonOffsets, coords: t.polygonCoords };
  const features: unknown[] = [];
  const n = t.points.length / 2;
  const r = (v: number) => Math.round(v * 100) / 100;
  for (let i = 0; i < n; i++) {
    const a = polys.offsets[i]!;
    const b = polys.offsets[i + 1]!;
    const ring: [number, number][] = [];
    for (let k = a; k < b; k++) ring.push([r(polys.coords[2 * k]!), r(polys.coords[2 * k + 1]!)]);
    if (ring.length > 0) ring.push(ring[0]!);
    const p = props(analysis, i);
    if (ring.length >= 4) features.push({ type: 'Feature', properties: { ...p, kind: 'outline' }, geometry: { type: 'Polygon', coordinates: [ring] } });
    features.push({ type: 'Feature', properties: { cell: i + 1, kind: 'centroid' }, geometry: { type: 'Point', coordinates: [r(t.points[2 * i]!), r(t.points[2 * i + 1]!)] } });
  }
  return JSON.stringify({ type: 'FeatureCollection', properties: { units: 'px', umPerPx: analysis.settings.umPerPx, width: analysis.width, height: analysis.height }, features }) + '\n';
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
  const s = { outlines: true, centroids: true, voronoi: true, ...style };
  const { width: w, height: h } = analysis;
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}">`);
  const u = analysis.settings.umPerPx;
  out.push(`<title>Tessellab overlay: ${analysis.tessellation.points.length / 2} cells; ${u === null ? 'uncalibrated (px)' : `${u} µm per px`}</title>`);
  if (s.outlines && outlines) {
    const p = new SvgPath();
    drawPolygons(p, outlines.offsets, outlines.coords);
    out.push(`<path id="outlines" d="${p}" fill="none" stroke="#0072B2" stroke-width="1"/>`);
  }
  if (s.voronoi) {
    const p = new SvgPath();
    drawVoronoi(p, analysis.tessellation);
    out.push(`<path id="voronoi" d="${p}" fill="none" stroke="#E69F00" stroke-width="1" stroke-dasharray="3 2"/>`);
  }
  if (s.centroids) {
    const p = new SvgPath();
    drawCentroids(p, analysis.tessellation.points, 2);
    out.push(`<path id="centroids" d="${p}" fill="none" stroke="#000000" stroke-width="1"/>`);
  }
  out.push('</svg>');
  return out.join('\n') + '\n';
}
