/**
 * One benchmark case in its own process (so its peak RSS is its own): a warm-up run, then `runs` timed
 * runs of the whole job, each stage timed from the pipeline's progress events. Prints one JSON line.
 * Run by test/bench/run.ts as: node --expose-gc --import tsx/esm test/bench/case.ts '<json>'
 */
import { readFileSync } from 'node:fs';
import { analyze, outlinesOf } from '../../src/core/analyze';
import type { Analysis } from '../../src/core/analysis.types';
import { loadCv } from '../../src/core/cv/index';
import { cellsCsv, cellsGeoJsonBytes, labelsPng, overlaySvgBytes, summaryJson } from '../../src/core/export/index';
import { decodeImage } from '../../src/core/image/decode';
import { clearReferenceCache } from '../../src/core/reference/montecarlo';
import { sharedReferencePool } from '../../src/node/referencePool';
import { pointSet, type BenchCase } from './inputs';

/** The command line's reference threads, as `tessellab analyze` uses them. */
const referencePool = sharedReferencePool();
import type { CaseResult, RunTimes, Stage } from './stages';

const gc = (globalThis as { gc?: () => void }).gc ?? (() => {});

/** Milliseconds between the first (stage, 0) and the last (stage, 1) event, plus named gaps. */
function stageTimes(events: [string, number, number][], end: number): Omit<Record<Stage, number>, 'decode' | 'export'> {
  const first = (s: string, f: number): number | undefined => events.find((e) => e[0] === s && e[1] === f)?.[2];
  const last = (s: string, f: number): number | undefined => [...events].reverse().find((e) => e[0] === s && e[1] === f)?.[2];
  const span = (a?: number, b?: number): number => (a !== undefined && b !== undefined ? b - a : 0);
  const tess1 = last('tessellate', 1);
  const stat0 = first('statistics', 0);
  const stat1 = last('statistics', 1);
  const grain0 = first('grain size', 0);
  const grain1 = last('grain size', 1);
  // Grain size (walls) runs between the column registry and the statistics, while the reference pool draws.
  return {
    segment: span(first('segment', 0), last('segment', 1)),
    // Cell sums before the tessellation, the column registry after it.
    measure: span(first('measure', 0), last('measure', 1)) + span(tess1, grain0 ?? stat0),
    tessellate: span(first('tessellate', 0), tess1),
    statistics: span(stat0, stat1) + span(stat1, end),
    grain: span(grain0, grain1),
  };
}

async function exportAll(a: Analysis, errors: Record<string, string>): Promise<number> {
  let bytes = 0;
  const tryOne = (name: string, f: () => string | Uint8Array): void => {
    try {
      bytes += f().length;
    } catch (e) {
      errors[name] = e instanceof Error ? `${e.name}: ${e.message}` : String(e);
    }
  };
  tryOne('cells.csv', () => cellsCsv(a));
  tryOne('summary.json', () => summaryJson(a));
  const outlines = await outlinesOf(a);
  tryOne('cells.geojson', () => cellsGeoJsonBytes(a, outlines));
  tryOne('overlay.svg', () => overlaySvgBytes(a, outlines));
  if (a.labels) tryOne('labels.png', () => labelsPng(a));
  return bytes;
}

async function runOnce(c: BenchCase, bytes: Uint8Array | null, points: Float64Array | null, errors: Record<string, string>): Promise<{ t: RunTimes; a: Analysis; peakBeforeExport: number }> {
  let rssMax = process.memoryUsage.rss();
  const sample = (): void => {
    const r = process.memoryUsage.rss();
    if (r > rssMax) rssMax = r;
  };
  const t0 = performance.now();
  let decode = 0;
  let a: Analysis;
  const events: [string, number, number][] = [];
  const onProgress = (s: string, f: number): void => {
    events.push([s, f, performance.now()]);
    sample();
  };
  let ta: number;
  if (c.kind === 'image') {
    const img = (await decodeImage(bytes!)).pages[0]!;
    decode = performance.now() - t0;
    sample();
    ta = performance.now();
    a = await analyze({ kind: 'image', image: img }, c.settings, { onProgress, referencePool });
  } else {
    ta = performance.now();
    a = await analyze({ kind: 'points', points: points!, width: c.side, height: c.side }, c.settings, { onProgress, referencePool });
  }
  const tEnd = performance.now();
  sample();
  const peakBeforeExport = process.resourceUsage().maxRSS * 1024;
  await exportAll(a, errors);
  const tExp = performance.now();
  sample();
  const st = stageTimes(events, tEnd);
  return {
    t: { stages: { decode, ...st, export: tExp - tEnd }, analysis: tEnd - ta, total: tExp - t0, rssMax },
    a,
    peakBeforeExport,
  };
}

async function main(): Promise<void> {
  const { c, runs, file } = JSON.parse(process.argv[2]!) as { c: BenchCase; runs: number; file: string | null };
  const t0 = performance.now();
  await loadCv();
  const cvLoad = performance.now() - t0;
  const bytes = file ? new Uint8Array(readFileSync(file)) : null;
  const points = c.kind === 'points' ? pointSet(c) : null;
  const errors: Record<string, string> = {};
  const out: RunTimes[] = [];
  let cells = 0;
  let peakRssAnalysis = 0;
  for (let r = 0; r <= runs; r++) {
    // Every run draws its random-seeding reference afresh, as the first analysis of a new image does:
    // the in-memory cache would otherwise serve the warm-up's to the timed runs.
    clearReferenceCache();
    gc();
    const { t, a, peakBeforeExport } = await runOnce(c, bytes, points, errors);
    if (r === 0) peakRssAnalysis = peakBeforeExport;
    cells = a.tessellation.points.length / 2;
    if (r > 0) out.push(t);
  }
  const res: CaseResult = {
    id: c.id,
    cells,
    megapixels: c.kind === 'image' ? (c.synth.width * c.synth.height) / 1e6 : null,
    runs: out,
    peakRss: process.resourceUsage().maxRSS * 1024,
    peakRssAnalysis,
    cvLoad,
    exportErrors: errors,
  };
  process.stdout.write(`${JSON.stringify(res)}\n`);
}

await main();
