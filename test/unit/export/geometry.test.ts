/**
 * The GeoJSON and SVG writers. Sources: RFC 7946 (GeoJSON: a Polygon's linear ring is closed, its first and
 * last positions equal; a FeatureCollection holds Features with "type", "properties", "geometry"); the
 * JSON grammar as the engine's own JSON.parse reads it; ECMA-262 Number::toString for the numbers
 * (String(Math.round(v · 100) / 100) is the text the writers promise for a coordinate).
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../../src/core/analyze';
import { cellsCsv, cellsGeoJson, overlaySvg } from '../../../src/core/export/index';
import { r2 } from '../../../src/core/export/path';
import { mulberry32 } from '../../../src/core/random';
import { seedPoints } from '../../../src/core/synth/seeds';
import Papa from 'papaparse';

describe('coordinates to 0.01 px', () => {
  it('r2 writes exactly what String(Math.round(v * 100) / 100) writes (ECMA-262 Number::toString)', () => {
    const rng = mulberry32(11);
    const values = [0, -0, 0.004, -0.004, 0.005, -0.005, 0.015, 1.005, 2.675, 0.1, 0.29, 1.1, 4095.995, -0.5, 1e-7, 1e13, -9e13, 1e16, Infinity, Number.NaN];
    for (let i = 0; i < 200_000; i++) values.push((rng() - 0.5) * 10 ** (rng() * 12), Math.round(rng() * 1e7) / 100, Math.round(rng() * 1e5) / 100 + 0.005);
    const diffs = values.filter((v) => r2(v) !== String(Math.round(v * 100) / 100));
    expect(diffs).toEqual([]);
  });
});

describe('cells.geojson', () => {
  it('is JSON with one closed Polygon and one Point per cell, carrying the table row of cells.csv', async () => {
    const pts = seedPoints(300, 400, 300, 'random', 5);
    const a = await analyze({ kind: 'points', points: pts, width: 400, height: 300 }, { pattern: 'points', reference: { replicates: 0 } });
    const g = JSON.parse(cellsGeoJson(a, null)) as {
      type: string; properties: Record<string, unknown>;
      features: { type: string; properties: Record<string, number | string | null>; geometry: { type: string; coordinates: unknown } }[];
    };
    expect(g.type).toBe('FeatureCollection');
    expect(g.properties).toEqual({ units: 'px', umPerPx: null, width: 400, height: 300 });
    const polys = g.features.filter((f) => f.geometry.type === 'Polygon');
    const points = g.features.filter((f) => f.geometry.type === 'Point');
    expect(polys.length).toBe(300);
    expect(points.length).toBe(300);
    const t = a.tessellation;
    const csv = Papa.parse<Record<string, string>>(cellsCsv(a).trim(), { header: true }).data;
    polys.forEach((f, i) => {
      expect(f.type).toBe('Feature');
      const ring = (f.geometry.coordinates as number[][][])[0]!;
      expect(ring[0]).toEqual(ring[ring.length - 1]);
      expect(ring.length).toBe(t.polygonOffsets[i + 1]! - t.polygonOffsets[i]! + 1);
      expect(ring[1]).toEqual([Math.round(t.polygonCoords[2 * (t.polygonOffsets[i]! + 1)]! * 100) / 100, Math.round(t.polygonCoords[2 * (t.polygonOffsets[i]! + 1) + 1]! * 100) / 100]);
      expect(f.properties.kind).toBe('outline');
      for (const [k, v] of Object.entries(csv[i]!)) expect(f.properties[k], k).toBe(v === '' ? null : Number(v));
    });
    points.forEach((f, i) => {
      expect(f.properties).toEqual({ cell: i + 1, kind: 'centroid' });
      expect(f.geometry.coordinates).toEqual([Math.round(pts[2 * i]! * 100) / 100, Math.round(pts[2 * i + 1]! * 100) / 100]);
    });
  });
});

describe('overlay.svg', () => {
  it('draws each Voronoi cell as a closed subpath with coordinates to 0.01 px', async () => {
    const pts = seedPoints(50, 200, 200, 'random', 2);
    const a = await analyze({ kind: 'points', points: pts, width: 200, height: 200 }, { pattern: 'points', reference: { replicates: 0 } });
    const svg = overlaySvg(a, null, { centroids: false });
    const d = /<path id="voronoi" d="([^"]*)"/.exec(svg)![1]!;
    expect(d.split('Z').filter(Boolean).length).toBe(50);
    const t = a.tessellation;
    expect(d.startsWith(`M${String(Math.round(t.polygonCoords[0]! * 100) / 100)} ${String(Math.round(t.polygonCoords[1]! * 100) / 100)}L`)).toBe(true);
  });
});
