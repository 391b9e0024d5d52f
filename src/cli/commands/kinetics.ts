/**
 * `tessellab kinetics IMAGE... [--times t1,t2,... | --times-csv FILE] [--out DIR]`: the transformed fraction
 * of an image series and its JMAK (Avrami) fit; writes kinetics.csv, kinetics.json and settings.json.
 */
import { basename, join } from 'node:path';
import { ensureOutDir, writeOut } from '../files';
import { cropImage, reanalyzeLabels } from '../../core/analyze';
import { sharedReferencePool } from '../../node/referencePool';
import { describeError, SettingsError, TessellabError } from '../../core/errors';
import { encodePng } from '../../core/image/encode';
import { kineticsCsv } from '../../core/export/kinetics';
import type { KineticsResult } from '../../core/kinetics/index';
import { resolveSettings, type SettingsInput } from '../../core/settings';
import { openFile, type OpenedFile } from '../../app/open';
import { analyseSeries, gatherSeries, seriesFiles, type SeriesTimes } from '../../app/series';
import type { GreyImage, Rect } from '../../core/types';
import { parseArgs, positiveNumber } from '../args';
import type { Command } from '../main';
import { readInputFile } from '../../node/inputFile';

const VALUED = ['times', 'times-csv', 'time-unit', 'out', 'threshold', 'phase', 'fit-min', 'fit-max', 'fit-method', 'field', 'um-per-px', 'settings'];
const FLAGS = ['incubation', 'allow-decreasing', 'final-analysis'];

const usage = `tessellab kinetics IMAGE... [--times t1,t2,... | --times-csv FILE] [--time-unit s] [--out DIR]
    [--threshold 0..255] [--phase auto|bright|dark] [--fit-min 0.02] [--fit-max 0.98] [--fit-method nonlinear|avrami-plot]
    [--incubation] [--allow-decreasing] [--field x0,y0,x1,y1] [--um-per-px X] [--settings FILE] [--final-analysis]

  Frames are the images in the order given (every page of a multi-page TIFF is a frame). Times come from
  --times, from a CSV of file,time lines (--times-csv), or else from the last number in each file name.
  One field and one threshold serve the whole series (Otsu on the last frame unless --threshold is given).
  Writes kinetics.csv, kinetics.json and settings.json to --out (default: the current folder).
  --final-analysis also measures the last frame's domain mosaic as a walls pattern: final.summary.json,
  final.labels.png (16-bit labels) and final.walls.png.`;

function fraction01(v: string, name: string): number {
  const x = Number(v);
  if (!Number.isFinite(x) || x < 0 || x > 1) throw new SettingsError(`--${name} must be a number from 0 to 1; got "${v}".`);
  return x;
}

function parseField(v: string): Rect {
  const p = v.split(',').map((s) => Number(s.trim()));
  if (p.length !== 4 || p.some((x) => !Number.isFinite(x))) throw new SettingsError(`--field must be x0,y0,x1,y1 in px; got "${v}".`);
  return { x0: p[0]!, y0: p[1]!, x1: p[2]!, y1: p[3]! };
}

function headline(r: KineticsResult): string {
  const a = r.avrami;
  const ci = (x: [number, number] | null, d = 3): string => (x ? ` [${x[0].toPrecision(d)}, ${x[1].toPrecision(d)}]` : '');
  return [
    `JMAK fit (${a.method}, ${a.frames.length} frames; ${r.convention}):`,
    `  n = ${a.n.toFixed(3)}${ci(a.ci95.n, 4)}  k = ${a.k.toPrecision(4)} ${r.timeUnit}^-${a.n.toFixed(2)}${ci(a.ci95.k)}  K = ${a.K.toPrecision(4)} ${r.timeUnit}^-1`,
    `  t½ = ${a.tHalf.toPrecision(4)} ${r.timeUnit}${ci(a.ci95.tHalf, 4)}${a.t0Fitted ? `  t0 = ${a.t0.toPrecision(4)} ${r.timeUnit}` : ''}  r² = ${a.r2 === null ? 'n/a' : a.r2.toFixed(5)}  (95 % intervals)`,
    `  ${r.interpretation.statement}`,
  ].join('\n');
}

export { kineticsCsv };

export const command: Command = {
  name: 'kinetics',
  summary: 'Transformed fraction over an image series and its JMAK (Avrami) fit.',
  usage,
  async run(argv: string[]): Promise<number> {
    const args = parseArgs(argv, VALUED, FLAGS);
    if (args.positional.length === 0) throw new SettingsError('Give the images of the series, in time order: tessellab kinetics IMAGE... --times t1,t2,...');
    const o = args.options;
    const input: SettingsInput = o.has('settings') ? await readSettingsFile(o.get('settings')!) : {};
    const kin: Record<string, unknown> = { ...(input.kinetics ?? {}) };
    if (o.has('threshold')) {
      const t = Number(o.get('threshold'));
      if (!Number.isFinite(t) || t < 0 || t > 255) throw new SettingsError(`--threshold must be a grey level from 0 to 255; got "${o.get('threshold')}".`);
      kin.threshold = 'manual';
      kin.manualThreshold = t;
    }
    if (o.has('phase')) kin.phase = o.get('phase');
    if (o.has('fit-min')) kin.fitMin = fraction01(o.get('fit-min')!, 'fit-min');
    if (o.has('fit-max')) kin.fitMax = fraction01(o.get('fit-max')!, 'fit-max');
    if (o.has('fit-method')) kin.fitMethod = o.get('fit-method');
    if (args.flags.has('incubation')) kin.incubation = true;
    const field = o.has('field') ? parseField(o.get('field')!) : undefined;
    const settingsIn: SettingsInput = { ...input, kinetics: kin as SettingsInput['kinetics'] };
    if (o.has('um-per-px')) settingsIn.umPerPx = positiveNumber(o.get('um-per-px')!, 'um-per-px');
    if (field) settingsIn.field = field;
    const settings = resolveSettings(settingsIn);

    const opened: OpenedFile[] = [];
    for (const [i, path] of args.positional.entries()) {
      process.stderr.write(`kinetics: reading ${i + 1} of ${args.positional.length}: ${path}\n`);
      opened.push(await openFile(basename(path), await readInputFile(path), { as: 'image' }));
    }
    const times: SeriesTimes = o.has('times')
      ? { kind: 'list', text: o.get('times')! }
      : o.has('times-csv')
        ? { kind: 'csv', text: new TextDecoder().decode(await readInputFile(o.get('times-csv')!)) }
        : { kind: 'names' };
    const series = gatherSeries(opened, times);
    if (series.reordered) process.stderr.write('kinetics: frames put in the order of the times in their file names\n');
    const frames = series.frames;

    const run = await analyseSeries(series, settings, {
      timeUnit: o.get('time-unit') ?? 's',
      allowDecreasing: args.flags.has('allow-decreasing'),
      onProgress: (stage) => {
        if (stage.startsWith('frame')) process.stderr.write(`kinetics: ${stage}\n`);
      },
    });
    const { result, mosaic } = run;
    const out = o.get('out') ?? '.';
    await ensureOutDir(out);
    for (const f of seriesFiles(run)) await writeOut(out, f.name, f.text);
    for (const w of result.warnings) process.stderr.write(`kinetics: warning: ${w}\n`);
    process.stdout.write(headline(result) + '\n');

    if (args.flags.has('final-analysis')) {
      process.stderr.write('kinetics: measuring the final mosaic as a walls pattern\n');
      const labels16 = Uint16Array.from(mosaic.labels.labels, (v) => Math.min(v, 65535));
      await writeOut(out, 'final.labels.png', encodePng({ width: mosaic.labels.width, height: mosaic.labels.height, data: labels16, channels: 1, bitDepth: 16 }));
      await writeOut(out, 'final.walls.png', encodePng({ ...mosaic.wallsImage, channels: 1, bitDepth: 8 }));
      try {
        const last = frames[frames.length - 1]!;
        const f = result.field;
        const crop: GreyImage = cropImage(last, f);
        const an = await reanalyzeLabels(mosaic.labels, crop, { ...run.settings, pattern: 'walls', field: f }, { width: last.width, height: last.height }, { referencePool: sharedReferencePool() });
        const nuclei = mosaic.nuclei;
        await writeOut(out, 'final.summary.json', JSON.stringify({ summary: an.summary, nuclei, complete: mosaic.complete }, null, 2) + '\n');
        if (!mosaic.complete) process.stderr.write('kinetics: warning: the last frame has not reached fitMax; the mosaic still has untransformed gaps.\n');
      } catch (e) {
        if (!(e instanceof TessellabError)) throw e;
        process.stderr.write(`kinetics: the final mosaic could not be measured: ${describeError(e)}\n`);
      }
    }
    process.stderr.write(`kinetics: wrote ${join(out, 'kinetics.csv')} and ${join(out, 'kinetics.json')}\n`);
    return 0;
  },
};

/** The settings in a JSON file, or a SettingsError naming the file. */
async function readSettingsFile(path: string): Promise<SettingsInput> {
  const text = new TextDecoder().decode(await readInputFile(path));
  try {
    return JSON.parse(text) as SettingsInput;
  } catch {
    throw new SettingsError(`The settings file ${path} is not valid JSON; fix it or leave out --settings.`);
  }
}
