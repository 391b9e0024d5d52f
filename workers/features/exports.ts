/**
 * Exports: the files `tessellab analyze` writes for one image (the core's one list, so they match byte
 * for byte), a zip of several images with summary.csv, and the grain size rating with its report.
 */
import type { Summary } from '../../src/core/summary';
import * as Comlink from 'comlink';
import { zipSync } from 'fflate';
import type { Analysis } from '../../src/core/analysis.types';
import { MissingError, SettingsError } from '../../src/core/errors';
import { baseName, displayRgba } from '../helpers';
import type { ExportFile, ExportKind, WorkerApi } from '../protocol';
import { exporters, pipeline } from '../runtime';
import { findResult, nameOf, resultOf, type Session } from '../session';

export type ExportsApi = Pick<WorkerApi, 'exportFiles' | 'exportZip' | 'grain'>;

/** The files of one image's result, as the command line writes them. */
async function filesFor(a: Analysis, fileName: string, kinds: ExportKind[]): Promise<ExportFile[]> {
  const ex = await exporters();
  const outlines = ex.needsOutlines(kinds) ? await (await pipeline()).core.outlinesOf(a) : null;
  return ex.imageFiles(a, fileName, outlines, kinds).map((f) => ({ name: f.name, bytes: f.data, mime: f.mime }));
}

/** A grey image as an 8-bit PNG data URL, contrast-stretched as the Bench shows it (for the report). */
async function pngDataUrl(img: import('../../src/core/types').GreyImage): Promise<string> {
  const { encodePng } = await import('../../src/core/image/encode');
  const rgba = displayRgba(img);
  const grey = new Uint8Array(img.width * img.height);
  for (let i = 0; i < grey.length; i++) grey[i] = rgba[4 * i]!;
  const png = encodePng({ width: img.width, height: img.height, data: grey, channels: 1, bitDepth: 8 });
  let bin = '';
  for (let i = 0; i < png.length; i += 0x8000) bin += String.fromCharCode(...png.subarray(i, i + 0x8000));
  return `data:image/png;base64,${btoa(bin)}`;
}

export function exportsFeature(s: Session): ExportsApi {
  return {
    async exportFiles(id, kinds) {
      const a = await resultOf(s, id);
      const files = await filesFor(a, await nameOf(s, id), kinds);
      return Comlink.transfer(files, files.map((f) => f.bytes.buffer as ArrayBuffer));
    },

    async exportZip(ids, kinds) {
      const ex = await exporters();
      const entries: Record<string, Uint8Array> = {};
      const rows: { name: string; summary: Summary | null }[] = [];
      const used = new Set<string>();
      for (const id of ids) {
        const a = await findResult(s, id);
        if (!a) continue;
        const name = await nameOf(s, id);
        let dir = baseName(name);
        for (let k = 2; used.has(dir); k++) dir = `${baseName(name)}-${k}`;
        used.add(dir);
        for (const f of await filesFor(a, name, kinds)) entries[`${dir}/${f.name}`] = f.bytes;
        rows.push({ name, summary: a.summary });
      }
      if (rows.length === 0) throw new MissingError('No image has a result yet; analyse one first.');
      entries['summary.csv'] = new TextEncoder().encode(ex.summaryCsv(rows));
      const zip = zipSync(entries, { level: 6 });
      return Comlink.transfer(zip, [zip.buffer as ArrayBuffer]);
    },

    async grain(id) {
      const a = await resultOf(s, id);
      if (!a.labels) throw new SettingsError('Grain size needs a segmented image (walls pattern); a points pattern has no grains.');
      const { grainSize } = await import('../../src/core/grain/index');
      const { grainReportHtml } = await import('../../src/core/export/grainReport');
      const l = a.labels;
      const result = grainSize({
        labels: l, umPerPx: a.settings.umPerPx, field: { x0: 0, y0: 0, x1: l.width, y1: l.height }, pattern: a.settings.pattern, settings: a.settings,
      });
      const o = s.opened.get(id);
      let imagePngDataUrl: string | undefined;
      if (o?.kind === 'image') {
        const { core } = await pipeline();
        imagePngDataUrl = await pngDataUrl(core.cropImage(o.image, a.field));
      }
      const name = await nameOf(s, id);
      const reportHtml = grainReportHtml({ name, result, umPerPx: a.settings.umPerPx as number, width: l.width, height: l.height, imagePngDataUrl });
      return { id, result, reportHtml, offsetX: a.field.x0, offsetY: a.field.y0 };
    },
  };
}
