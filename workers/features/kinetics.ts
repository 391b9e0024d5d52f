/**
 * Kinetics: a series of opened images run through the application layer as `tessellab kinetics` runs
 * it (the same frames, times, order, pixel size and files), with filmstrip thumbnails; and its final
 * mosaic prepared as a new entry measured on the mosaic's labels.
 */
import * as Comlink from 'comlink';
import { SeriesError } from '../../src/core/errors';
import type { SettingsInput } from '../../src/core/settings';
import { resolveSettings } from '../../src/core/settings';
import { frameThumb } from '../bitmaps';
import type { ExportFile, WorkerApi } from '../protocol';
import { pipeline } from '../runtime';
import { openedFile, type Session } from '../session';
import { keepBase } from './edits';

export type KineticsApi = Pick<WorkerApi, 'kinetics' | 'kineticsFinal'>;

/** A file's name without its folders. */
function leafName(name: string): string {
  return name.split(/[\\/]/).pop() ?? name;
}

export function kineticsFeature(s: Session): KineticsApi {
  return {
    async kinetics(req, onProgress) {
      await pipeline();
      const { analyseSeries, gatherSeries, seriesFiles } = await import('../../src/app/series');
      const files = req.ids.map((id) => {
        const o = openedFile(s, id);
        return { ...o, name: leafName(o.name) };
      });
      const series = gatherSeries(files, req.times);
      const run = await analyseSeries(series, resolveSettings(req.settings), {
        timeUnit: req.timeUnit || 's', allowDecreasing: req.allowDecreasing, onProgress: (st, f) => onProgress?.(st, f),
      });
      const { result, mosaic, settings } = run;
      const frames = series.frames;
      s.lastSeries = { last: frames[frames.length - 1]!, mosaic, result, umPerPx: settings.umPerPx, minCellAreaPx: settings.minCellAreaPx };
      const thumbs: ImageBitmap[] = [];
      for (const f of frames) thumbs.push(await frameThumb(f));
      const enc = new TextEncoder();
      const out: ExportFile[] = seriesFiles(run).map((f) => ({ name: f.name, bytes: enc.encode(f.text), mime: f.mime }));
      const r = { result, thumbs, files: out, width: frames[0]!.width, height: frames[0]!.height };
      return Comlink.transfer(r, [...thumbs, ...out.map((f) => f.bytes.buffer as ArrayBuffer)]);
    },

    async kineticsFinal(id) {
      const last = s.lastSeries;
      if (!last) throw new SeriesError('Run the kinetics of a series first; the final frame comes from that run.');
      const { encodePng } = await import('../../src/core/image/encode');
      const bytes = encodePng({ width: last.last.width, height: last.last.height, data: last.last.data, channels: 1, bitDepth: last.last.bitDepth });
      // As `tessellab kinetics --final-analysis`: the mosaic's labels measured on the last frame in the series' field.
      await keepBase(s, id, last.mosaic.labels);
      const settings: SettingsInput = { pattern: 'walls', field: last.result.field, umPerPx: last.umPerPx, minCellAreaPx: last.minCellAreaPx };
      return Comlink.transfer({ bytes, settings, domains: last.mosaic.labels.count, complete: last.mosaic.complete }, [bytes.buffer as ArrayBuffer]);
    },
  };
}
