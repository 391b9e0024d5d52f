/**
 * A kinetics series, as the command line and the web app's worker both gather and run it: every page of
 * each image a frame, in the order given; times typed, read from a CSV of file,time lines, or read from
 * the file names (which then fix the order too); the pixel size of the settings, else of the first file
 * that has one. Pure: no file system, no DOM.
 */
import { SeriesError } from '../core/errors';
import { kineticsCsv, kineticsJson } from '../core/export/kinetics';
import { settingsJson } from '../core/export/json';
import { analyzeSeriesDetailed, parseTimesCsv, parseTimesList, timesFromNames, type FinalMosaic, type KineticsResult } from '../core/kinetics/index';
import type { Settings } from '../core/settings';
import type { GreyImage, Progress } from '../core/types';
import type { OpenedFile } from './open';

/** Where the times of a series come from: typed, the last number in each file name, or a CSV of file,time. */
export type SeriesTimes = { kind: 'list'; text: string } | { kind: 'names' } | { kind: 'csv'; text: string };

/** The frames of a series with their sources and times, in time order. */
export interface Series {
  frames: GreyImage[];
  /** Each frame's source: the file name, or `name[page]` (1-based) for a page of a multi-page file. */
  sources: string[];
  times: number[];
  /** µm per px of the first file that carries one, or null. */
  fileUmPerPx: number | null;
  /** True when the times of the file names put the frames in another order than given. */
  reordered: boolean;
}

/**
 * Gathers the frames of a series from opened images (their names as given, without folders).
 *
 * @throws SeriesError for a point set among the files; the time parsers' SeriesError and CsvError
 */
export function gatherSeries(files: readonly OpenedFile[], times: SeriesTimes): Series {
  const frames: GreyImage[] = [];
  const sources: string[] = [];
  let fileUmPerPx: number | null = null;
  for (const f of files) {
    if (f.kind !== 'image') throw new SeriesError(`${f.name} is a point set; a kinetics series needs images.`);
    fileUmPerPx ??= f.umPerPxFromFile;
    f.pages.forEach((p, i) => {
      frames.push(p);
      sources.push(f.pages.length > 1 ? `${f.name}[${i + 1}]` : f.name);
    });
  }
  let t = times.kind === 'list' ? parseTimesList(times.text) : times.kind === 'csv' ? parseTimesCsv(times.text, sources) : timesFromNames(sources);
  let reordered = false;
  if (times.kind === 'names') {
    // Times read from the names fix the order too: a shell glob or a file picker sorts 't10' before 't9'.
    const order = t.map((_, i) => i).sort((a, b) => t[a]! - t[b]!);
    if (order.some((k, i) => k !== i)) {
      reordered = true;
      const [f, s] = [frames.slice(), sources.slice()];
      order.forEach((k, i) => {
        frames[i] = f[k]!;
        sources[i] = s[k]!;
      });
      t = order.map((k) => t[k]!);
    }
  }
  return { frames, sources, times: t, fileUmPerPx, reordered };
}

export interface SeriesRunOptions {
  /** Unit of the times (labels, the CSV's column name); 's' when absent. */
  timeUnit?: string;
  /** Fit even when the fraction decreases between frames. */
  allowDecreasing?: boolean;
  onProgress?: Progress;
}

/** A finished series: the result, the final frame's domain mosaic, and the settings used. */
export interface SeriesRun {
  result: KineticsResult;
  mosaic: FinalMosaic;
  /** The settings of the run, with the pixel size used (the settings', else the files'). */
  settings: Settings;
}

/** Transformed fraction and JMAK fit of a gathered series. */
export async function analyseSeries(series: Series, settings: Settings, opts: SeriesRunOptions = {}): Promise<SeriesRun> {
  const s: Settings = { ...settings, umPerPx: settings.umPerPx ?? series.fileUmPerPx };
  const { result, mosaic } = await analyzeSeriesDetailed(series.frames, series.times, s, {
    timeUnit: opts.timeUnit ?? 's',
    sources: series.sources,
    allowDecreasing: opts.allowDecreasing ?? false,
    onProgress: opts.onProgress,
  });
  return { result, mosaic, settings: s };
}

/** One output file of a series: its name, text and media type. */
export interface SeriesFile {
  name: string;
  text: string;
  mime: string;
}

/** The files of a series run: kinetics.csv, kinetics.json and settings.json. */
export function seriesFiles(run: SeriesRun): SeriesFile[] {
  return [
    { name: 'kinetics.csv', text: kineticsCsv(run.result), mime: 'text/csv' },
    { name: 'kinetics.json', text: kineticsJson(run.result), mime: 'application/json' },
    { name: 'settings.json', text: settingsJson(run.settings), mime: 'application/json' },
  ];
}
