/**
 * `tessellab analyze IMAGE... [--files-from LIST] [--shard I/N] [--skip-existing] [--threads N] [--out DIR] ...`
 * For each input: <name>.cells.csv, .cells.geojson, .overlay.svg, .labels.png and, last, .summary.json; an
 * input that fails gets a <name>.summary.json with its reason instead (src/core/summary.ts FailedSummary).
 * For the run: settings.json (the settings the user gave) and, unless sharded, summary.csv. Every file is
 * written atomically (../files.ts). A bad input gets one line on stderr; the others are still analysed.
 */
import { readInputFile } from '../../node/inputFile';
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { outlinesOf } from '../../core/analyze';
import { describeError, SettingsError } from '../../core/errors';
import { fileStem, imageFiles, IMAGE_FILE_KINDS, settingsJson, summaryJson } from '../../core/export/index';
import { summaryTableRow, summaryTableText } from '../../core/export/summaryTable';
import { parsePointsCsv } from '../../core/segment/points';
import { SUMMARY_VERSION, type FailedSummary } from '../../core/summary';
import { analyseFile } from '../../app/analyse';
import { openFile } from '../../app/open';
import { maskFor, openMask, type OpenedMask } from '../../app/mask';
import { toWireError } from '../../app/wire';
import { resolveSettings, type Settings, type SettingsInput } from '../../core/settings';
import type { ClosablePool } from '../../core/reference/workerPool';
import type { Command } from '../main';
import { parseArgs, parseSize, positiveInt, positiveNumber } from '../args';
import { ensureOutDir, removeOut, withCleanStop, writeOut } from '../files';
import { existingResults, resultFiles } from '../existing';
import { parseShard, planInputs, readList, shardOf, type Input, type Shard } from '../inputs';
import { allowedCpus } from '../../node/cpus';
import { createNodeReferencePool } from '../../node/referencePool';
import { softwareVersion } from '../../node/version';
import { answerLine } from '../answer';

const USAGE = [
  'tessellab analyze IMAGE... [--files-from LIST|-] [--shard I/N] [--skip-existing] [--threads N]',
  '                         [--pattern walls|bodies|points] [--um-per-px X] [--out DIR] [--settings FILE.json]',
  '                         [--events FILE.csv] [--size WxH (points)] [--mask FILE.png]',
].join('\n');

/** At most this many threads unless --threads asks for more (the reference gains little beyond). */
const DEFAULT_MAX_THREADS = 8;

export const command: Command = {
  name: 'analyze',
  summary: [
    'Segment cells, measure them, tessellate their centroids and compare with random seeding.',
    '',
    '  --files-from LIST  more inputs, one path per line (relative to the current folder); "-" reads standard input',
    '  --shard I/N        analyse only shard I of N: every N-th input of the sorted list, from the I-th; the same',
    '                     split on every machine. Shards write no summary.csv: run `tessellab merge` after the last.',
    '  --skip-existing    keep an input whose complete results (same input, same settings) are in the output folder',
    `  --threads N        threads for the analysis and its random-seeding reference; default: the CPUs this process`,
    `                     may use (CPU affinity and cgroup CPU quota, not the machine's core count), at most ${DEFAULT_MAX_THREADS}`,
  ].join('\n'),
  usage: USAGE,
  async run(argv) {
    const a = parseArgs(argv, ['pattern', 'um-per-px', 'out', 'settings', 'events', 'size', 'files-from', 'shard', 'threads', 'mask'], ['skip-existing']);
    const paths = [...a.positional];
    if (a.options.has('files-from')) paths.push(...(await readList(a.options.get('files-from')!)));
    if (paths.length === 0) throw new SettingsError(`No input given. Usage: ${USAGE}`);
    const base = resolveSettings(await settingsInput(a.options));
    const shard = a.options.has('shard') ? parseShard(a.options.get('shard')!) : null;
    const threads = a.options.has('threads') ? positiveInt(a.options.get('threads')!, 'threads') : Math.min(DEFAULT_MAX_THREADS, allowedCpus().count);
    const size = base.pattern === 'points' && a.options.has('size') ? parseSize(a.options.get('size')!) : null;
    const outDir = a.options.get('out') ?? '.';
    await ensureOutDir(outDir);
    let events: Float64Array | undefined;
    if (a.options.has('events')) {
      const f = a.options.get('events')!;
      // Two events at one spot are two events: duplicates are kept.
      events = parsePointsCsv(await readText(f), { name: basename(f), duplicates: 'keep' }).points;
    }
    // A tissue mask (nonzero = tissue) of the images' size: the field of the statistics.
    const maskFile = a.options.get('mask');
    const mask = maskFile ? await openMask(basename(maskFile), await readBytes(maskFile)) : null;
    const plan = planInputs(paths);
    for (const n of plan.notes) process.stderr.write(`tessellab analyze: ${n}\n`);
    const inputs = shardOf(plan.inputs, shard);
    // Worker threads draw each image's random-seeding reference while the rest of its analysis runs; one
    // thread is the caller's own.
    const referencePool = threads > 1 ? createNodeReferencePool(threads - 1) : null;
    try {
      return await withCleanStop(() => runBatch({ inputs, shard, total: plan.inputs.length, base, outDir, events, size, skipExisting: a.flags.has('skip-existing'), referencePool, mask }));
    } finally {
      await referencePool?.close();
    }
  },
};

interface Batch {
  inputs: Input[];
  shard: Shard | null;
  total: number;
  base: Settings;
  outDir: string;
  events: Float64Array | undefined;
  size: [number, number] | null;
  skipExisting: boolean;
  referencePool: ClosablePool | null;
  mask: OpenedMask | null;
}

async function runBatch(b: Batch): Promise<number> {
  const { inputs, base, outDir } = b;
  const version = softwareVersion();
  const rows: string[][] = [];
  let failed = 0;
  let kept = 0;
  for (let i = 0; i < inputs.length; i++) {
    const input = inputs[i]!;
    const file = basename(input.path);
    const say = (stage: string) => process.stderr.write(`[${i + 1}/${inputs.length}] ${input.path}: ${stage}\n`);
    if (b.skipExisting) {
      const ex = await existingResults(outDir, input.name, input.path, base);
      if (ex.complete) {
        say('kept (complete results already in the output folder)');
        rows.push(summaryTableRow(ex.summary));
        kept++;
        continue;
      }
      if (ex.why) say(`analysing again: ${ex.why}`);
    }
    try {
      say('reading');
      const bytes = await readBytes(input.path);
      const opened = await openFile(file, bytes, { as: base.pattern === 'points' ? 'points' : 'image', size: b.size });
      if (opened.kind === 'points') for (const w of opened.warnings ?? []) say(`warning: ${w}`);
      if (opened.kind === 'image' && opened.pages.length > 1) say(`${opened.pages.length} pages; analysing the first (use kinetics for a series)`);
      const analysis = await analyseFile(opened, base, {
        events: b.events, referencePool: b.referencePool, onProgress: (s, f) => f === 0 && say(s), ...(b.mask ? { mask: maskFor(b.mask, opened.width, opened.height) } : {}),
      });
      if (analysis.summary.calibration.notice) say(`notice: ${analysis.summary.calibration.notice}`);
      say('writing');
      const outlines = await outlinesOf(analysis);
      // imageFiles names the files after the file's stem; this run's name for the input replaces it.
      const stem = fileStem(file);
      const files = imageFiles(analysis, file, outlines, IMAGE_FILE_KINDS.filter((k) => k !== 'summary.json'));
      const summary = summaryJson(analysis, { image: file, input: input.path, version });
      // The set is incomplete from here until its new summary.json lands: an earlier one goes first.
      await removeOut(outDir, `${input.name}.summary.json`);
      for (const f of files) await writeOut(outDir, input.name + f.name.slice(stem.length), f.data);
      await writeOut(outDir, `${input.name}.summary.json`, summary);
      const s = analysis.summary;
      say(`done: ${s.cells.count} cells (${s.cells.interior} interior)`);
      // The answer, on standard output: cells, verdict, grain size.
      process.stdout.write(`${answerLine(file, s)}\n`);
      rows.push(summaryTableRow(JSON.parse(summary)));
    } catch (e) {
      failed++;
      const msg = describeError(e);
      process.stderr.write(`tessellab analyze: ${msg.startsWith(file) ? msg : `${file}: ${msg}`}\n`);
      if (process.env.TESSELLAB_DEBUG && e instanceof Error) process.stderr.write(`${e.stack}\n`);
      const result: FailedSummary = { tessellab: SUMMARY_VERSION, image: file, input: input.path, version, error: toWireError(e) };
      rows.push(summaryTableRow(result));
      await recordFailure(outDir, input.name, result);
    }
  }
  await writeOut(outDir, 'settings.json', settingsJson(base));
  const where = b.shard ? `${outDir} (this shard's *.summary.json)` : `summary.csv in ${outDir}`;
  if (b.shard) {
    process.stderr.write(`Shard ${b.shard.index}/${b.shard.count}: ${inputs.length} of ${b.total} inputs; after the last shard, \`tessellab merge ${outDir} --out ${outDir}/summary.csv\` makes the table.\n`);
  } else {
    await writeOut(outDir, 'summary.csv', summaryTableText(rows));
  }
  if (kept) process.stderr.write(`${kept} of ${inputs.length} inputs kept from earlier runs (--skip-existing).\n`);
  // The folder is not followed by a full stop: "." or "out/." would read as part of the path.
  if (failed > 0 && failed === inputs.length) process.stderr.write(`${failed === 1 ? 'The input' : `All ${failed} inputs`} failed; ${where} lists why.\n`);
  else if (failed) process.stderr.write(`${failed} of ${inputs.length} inputs failed; the others were written to ${outDir} (${b.shard ? 'each failed input has a summary.json saying why' : 'summary.csv lists why each failed'}).\n`);
  return failed ? 1 : 0;
}

/**
 * A failed input's result: its FailedSummary as <name>.summary.json, and no files of an earlier analysis
 * under its name (they would not be this input's results any more).
 */
async function recordFailure(outDir: string, name: string, result: FailedSummary): Promise<void> {
  try {
    await removeOut(outDir, `${name}.summary.json`);
    for (const f of resultFiles(name, 'walls')) await removeOut(outDir, f);
    await writeOut(outDir, `${name}.summary.json`, `${JSON.stringify(result, null, 2)}\n`);
  } catch (w) {
    process.stderr.write(`tessellab analyze: ${result.image}: could not record the failure (${describeError(w)})\n`);
  }
}

async function settingsInput(options: Map<string, string>): Promise<SettingsInput> {
  let input: SettingsInput = {};
  if (options.has('settings')) {
    const f = options.get('settings')!;
    let text: string;
    try {
      text = new TextDecoder().decode(await readInputFile(f, `the settings file ${f}`));
    } catch (e) {
      throw new SettingsError(e instanceof Error ? e.message : `Cannot read the settings file ${f}; check the path.`);
    }
    try {
      input = JSON.parse(text) as SettingsInput;
    } catch {
      throw new SettingsError(`The settings file ${f} is not valid JSON.`);
    }
  }
  if (options.has('pattern')) input.pattern = options.get('pattern') as SettingsInput['pattern'];
  if (options.has('um-per-px')) input.umPerPx = positiveNumber(options.get('um-per-px')!, 'um-per-px');
  return input;
}

/** An input's bytes: regular files only (not /dev/zero, a pipe or a device), of a size an image can have. */
function readBytes(file: string): Promise<Uint8Array> {
  return readInputFile(file);
}

async function readText(file: string): Promise<string> {
  return new TextDecoder().decode(await readBytes(file));
}
