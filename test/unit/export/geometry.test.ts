/**
 * The GeoJSON and SVG writers. Sources: RFC 7946 (GeoJSON: a Polygon's linear ring is closed, its first and
 * last positions equal; a FeatureCollection holds Features with "type", "properties", "geometry"); the
 * JSON grammar as the engine's own JSON.parse reads it; ECMA-262 Number::toString for the numbers
 * (String(Math.round(v · 100) / 100) is the text the writers promise for a coordinate).
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../../src/core/analyze';
import { cellsCsv, cellsGeoJson, cellsGeoJsonBytes, overlaySvg, overlaySvgBytes } from '../../../src/core/export/index';
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

describe('cells.geojson as bytes', () => {
  it('is the UTF-8 of the text, byte for byte, whatever the batch size (WHATWG Encoding: TextEncoder writes UTF-8)', async () => {
    const pts = seedPoints(200, 300, 300, 'random', 8);
    const a = await analyze({ kind: 'points', points: pts, width: 300, height: 300 }, { pattern: 'points', reference: { replicates: 0 } });
    // A column name outside ASCII (2- and 3-byte UTF-8: µ, ², and a 4-byte one as a surrogate pair) tests the
    // buffer's growth as well.
    a.columns['area_µm²_𝔸'] = a.columns[Object.keys(a.columns)[0]!]!;
    const text = cellsGeoJson(a, null);
    const utf8 = new TextEncoder().encode(text);
    for (const batch of [1, 7, 1000, 1 << 20]) {
      const b = cellsGeoJsonBytes(a, null, batch);
      expect(b.length).toBe(utf8.length);
      expect(Buffer.compare(Buffer.from(b), Buffer.from(utf8))).toBe(0);
    }
    expect(new TextDecoder().decode(cellsGeoJsonBytes(a, null))).toBe(text);
    expect(Object.keys((JSON.parse(text) as { features: { properties: object }[] }).features[0]!.properties)).toContain('area_µm²_𝔸');
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

describe('overlay.svg as bytes', () => {
  it('is the UTF-8 of the text, byte for byte, in every style (WHATWG Encoding: TextEncoder writes UTF-8)', async () => {
    // More commands than one batch of SvgPath, and a calibrated title (µ: two bytes in UTF-8).
    const pts = seedPoints(3000, 1200, 900, 'random', 4);
    const a = await analyze({ kind: 'points', points: pts, width: 1200, height: 900 }, { pattern: 'points', umPerPx: 0.25, reference: { replicates: 0 } });
    for (const style of [{}, { voronoi: false }, { centroids: false }]) {
      const text = overlaySvg(a, null, style);
      expect(text).toContain('0.25 µm per px');
      expect(Buffer.compare(Buffer.from(overlaySvgBytes(a, null, style)), Buffer.from(new TextEncoder().encode(text)))).toBe(0);
    }
  });
});

describe('UTF-8 builder', () => {
  it('gives what TextEncoder gives for the whole text, for text of 1- to 4-byte characters and any first buffer size (WHATWG Encoding Standard, UTF-8 encoder)', async () => {
    const { Utf8Builder } = await import('../../../src/core/export/utf8');
    const rng = mulberry32(21);
    const alphabet = ['a', '7', '"', 'µ', 'é', '²', '€', '中', '𝔸', '😀'];
    for (const initial of [1, 2, 3, 5, 64, 1 << 16]) {
      const b = new Utf8Builder(initial);
      const pieces: string[] = [];
      for (let k = 0; k < 300; k++) {
        let p = '';
        const len = Math.floor(rng() * 12);
        for (let j = 0; j < len; j++) p += alphabet[Math.floor(rng() * alphabet.length)]!;
        pieces.push(p);
        b.append(p);
      }
      const want = new TextEncoder().encode(pieces.join(''));
      expect(Buffer.compare(Buffer.from(b.bytes()), Buffer.from(want))).toBe(0);
    }
  });
});
