/**
 * The files written for one analysed image, by name: the one list the command line and the web app both
 * use, so that their outputs are equal byte for byte.
 */
import type { Analysis } from '../analysis.types';
import type { Polygons } from '../cv/contours';
import { cellsCsv } from './csv';
import { cellsGeoJsonBytes, overlaySvgBytes } from './geometry';
import { settingsJson, summaryJson } from './json';
import { labelsPng } from './labels';

export type ImageFileKind = 'cells.csv' | 'summary.json' | 'cells.geojson' | 'overlay.svg' | 'labels.png' | 'settings.json';

export const IMAGE_FILE_KINDS: readonly ImageFileKind[] = ['cells.csv', 'summary.json', 'cells.geojson', 'overlay.svg', 'labels.png'];

export interface OutputFile {
  name: string;
  data: Uint8Array;
  mime: string;
}

/** Whether the kinds need the cells' outlines (computed by the caller with outlinesOf). */
export function needsOutlines(kinds: readonly ImageFileKind[]): boolean {
  return kinds.includes('cells.geojson') || kinds.includes('overlay.svg');
}

/** Base name of a file without folders and extension: `a/b/c.tif` -> `c`. */
export function fileStem(fileName: string): string {
  const base = fileName.split(/[\\/]/).pop() ?? fileName;
  const dot = base.lastIndexOf('.');
  return dot > 0 ? base.slice(0, dot) : base;
}

/**
 * `<stem>.cells.csv`, `<stem>.summary.json`, `<stem>.cells.geojson`, `<stem>.overlay.svg`,
 * `<stem>.labels.png` (segmented patterns only) and `settings.json`, as asked for by `kinds`.
 * @param fileName the image's file name (its stem names the files; the name goes into summary.json)
 * @param outlines the cells' outlines, needed for geojson and svg (null for a points pattern)
 */
export function imageFiles(a: Analysis, fileName: string, outlines: Polygons | null, kinds: readonly ImageFileKind[] = IMAGE_FILE_KINDS): OutputFile[] {
  const stem = fileStem(fileName);
  const enc = new TextEncoder();
  const out: OutputFile[] = [];
  for (const k of kinds) {
    switch (k) {
      case 'cells.csv':
        out.push({ name: `${stem}.cells.csv`, data: enc.encode(cellsCsv(a)), mime: 'text/csv' });
        break;
      case 'summary.json':
        out.push({ name: `${stem}.summary.json`, data: enc.encode(summaryJson(a, { image: fileName.split(/[\\/]/).pop() ?? fileName })), mime: 'application/json' });
        break;
      case 'cells.geojson':
        out.push({ name: `${stem}.cells.geojson`, data: cellsGeoJsonBytes(a, outlines), mime: 'application/geo+json' });
        break;
      case 'overlay.svg':
        out.push({ name: `${stem}.overlay.svg`, data: overlaySvgBytes(a, outlines), mime: 'image/svg+xml' });
        break;
      case 'labels.png':
        if (a.labels) out.push({ name: `${stem}.labels.png`, data: labelsPng(a), mime: 'image/png' });
        break;
      case 'settings.json':
        out.push({ name: 'settings.json', data: enc.encode(settingsJson(a.settings)), mime: 'application/json' });
        break;
    }
  }
  return out;
}
