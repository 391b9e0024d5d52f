/**
 * `tessellab analyze IMAGE... [--pattern walls|bodies|points] [--um-per-px X] [--out DIR]`
 * For each image: <stem>.cells.csv, .summary.json, .cells.geojson, .overlay.svg, .labels.png; for the run:
 * settings.json and summary.csv. A bad image gets one line on stderr; the others are still analysed.
 */
import type { Summary } from '../../core/summary';
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { outlinesOf } from '../../core/analyze';
import { describeError, SettingsError } from '../../core/errors';
import { imageFiles, settingsJson, summaryCsv } from '../../core/export/index';
import { parsePointsCsv } from '../../core/segment/points';
import { analyseFile } from '../../app/analyse';
import { openFile } from '../../app/open';
import { resolveSettings, type SettingsInput } from '../../core/settings';
import type { Command } from '../main';
import { parseArgs, parseSize, positiveNumber } from '../args';
import { ensureOutDir, writeOut } from '../files';
import { sharedReferencePool } from '../../node/referencePool';
import { answerLine } from '../answer';

const USAGE =
  'tessellab analyze IMAGE... [--pattern walls|bodies|points] [--um-per-px X] [--out DIR] [--settings FILE.json] [--events FILE.csv] [--size WxH (points)]';

export const command: Command = {
  name: 'analyze',
  summary: 'Segment cells, measure them, tessellate their centroids and compare with random seeding.',
  usage: USAGE,
  async run(argv) {
    const a = parseArgs(argv, ['pattern', 'um-per-px', 'out', 'settings', 'events', 'size']);
    if (a.positional.length === 0) throw new SettingsError(`No input given. Usage: ${USAGE}`);
    let input: SettingsInput = {};
    if (a.options.has('settings')) {
      const f = a.options.get('settings')!;
      let text: string;
      try {
        text = await readFile(f, 'utf8');
      } catch {
        throw new SettingsError(`Cannot read the settings file ${f}; check the path.`);
      }
      try {
        input = JSON.parse(text) as SettingsInput;
      } catch {
        throw new SettingsError(`The settings file ${f} is not valid JSON.`);
      }
    }
    if (a.options.has('pattern')) input.pattern = a.options.get('pattern') as SettingsInput['pattern'];
    if (a.options.has('um-per-px')) input.umPerPx = positiveNumber(a.options.get('um-per-px')!, 'um-per-px');
    const base = resolveSettings(input);
    const userUm = base.umPerPx;
    const outDir = a.options.get('out') ?? '.';
    await ensureOutDir(outDir);
    let events: Float64Array | undefined;
    if (a.options.has('events')) {
      const f = a.options.get('events')!;
      events = parsePointsCsv(await readText(f), { name: basename(f) }).points;
    }
    const files = a.positional;
    // Worker threads draw each image's random-seeding reference while the rest of its analysis runs.
    const referencePool = sharedReferencePool();
    const rows: { name: string; summary: Summary | null; error?: string }[] = [];
    let failed = 0;
    let lastSettings = base;
    for (let i = 0; i < files.length; i++) {
      const file = files[i]!;
      const name = basename(file);
      const say = (stage: string) => process.stderr.write(`[${i + 1}/${files.length}] ${name}: ${stage}\n`);
      try {
        say('reading');
        const bytes = await readBytes(file);
        const size = base.pattern === 'points' && a.options.has('size') ? parseSize(a.options.get('size')!) : null;
        const opened = await openFile(name, bytes, { as: base.pattern === 'points' ? 'points' : 'image', size });
        if (opened.kind === 'image' && opened.pages.length > 1) process.stderr.write(`[${i + 1}/${files.length}] ${name}: ${opened.pages.length} pages; analysing the first (use kinetics for a series)\n`);
        const analysis = await analyseFile(opened, base, { events, referencePool, onProgress: (s, f) => f === 0 && say(s) });
        lastSettings = analysis.settings;
        say('writing');
        const outlines = await outlinesOf(analysis);
        for (const f of imageFiles(analysis, name, outlines)) await writeOut(outDir, f.name, f.data);
        const s = analysis.summary;
        say(`done: ${s.cells.count} cells (${s.cells.interior} interior)`);
        process.stdout.write(`${answerLine(name, s)}\n`);
        rows.push({ name, summary: analysis.summary });
      } catch (e) {
        failed++;
        const msg = describeError(e);
        process.stderr.write(`tessellab analyze: ${msg.startsWith(name) ? msg : `${name}: ${msg}`}\n`);
        if (process.env.TESSELLAB_DEBUG && e instanceof Error) process.stderr.write(`${e.stack}\n`);
        rows.push({ name, summary: null, error: msg });
      }
    }
    await writeOut(outDir, 'settings.json', settingsJson({ ...lastSettings, umPerPx: userUm ?? lastSettings.umPerPx }));
    await writeOut(outDir, 'summary.csv', summaryCsv(rows));
    // The folder is not followed by a full stop: "." or "out/." would read as part of the path.
    if (failed > 0 && failed === files.length) process.stderr.write(`${failed === 1 ? 'The input' : `All ${failed} inputs`} failed; summary.csv in ${outDir} lists why.\n`);
    else if (failed) process.stderr.write(`${failed} of ${files.length} inputs failed; the others were written to ${outDir} (summary.csv lists why each failed).\n`);
    return failed ? 1 : 0;
  },
};

async function readBytes(file: string): Promise<Uint8Array> {
  try {
    return new Uint8Array(await readFile(file));
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new SettingsError(code === 'ENOENT' ? `${file} does not exist; check the path.` : code === 'EISDIR' ? `${file} is a folder, not an image.` : `cannot read ${file} (${code ?? 'error'}).`);
  }
}

async function readText(file: string): Promise<string> {
  return new TextDecoder().decode(await readBytes(file));
}
