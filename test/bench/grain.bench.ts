/**
 * Benchmark of the grain size stage alone (src/core/grain: grainSize and grainSizeSummary, called as
 * analyze.ts calls them) on label images segmented by the pipeline. Run: npx tsx test/bench/grain.bench.ts
 *
 * Inputs: walls images from the generator like the benchmark's (random seeds, seed 1): 4096² with 12 577
 * cells and 1024² with 786, and sample-images/grains-calibrated.png, each analysed once by `analyze` with
 * the Monte Carlo reference off. Their label images are kept under the system's temporary folder (keyed by
 * a hash of the sources that make them), so later runs time the grain stage without segmenting again.
 *
 * Prints the best of a few runs per input (wall clock and CPU time, with the load average: the machine is
 * shared), and the first run, which is the one an analysis pays: the stage runs once per image, before the
 * engine has optimised its loops (the first input is the coldest). Arguments:
 *   --runs N       timed runs per input (default 5)
 *   --only NAME    keep only the inputs whose name contains NAME
 *   --dump DIR     also write DIR/<name>.json: the full result and the summary, JSON.stringify'd
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyze } from '../../src/core/analyze';
import { grainSize, grainSizeSummary } from '../../src/core/grain/index';
import { decodeImage } from '../../src/core/image/decode';
import { resolveSettings, type Settings } from '../../src/core/settings';
import { synthesize } from '../../src/core/synth/index';
import type { GreyImage, LabelImage } from '../../src/core/types';

const root = join(import.meta.dirname, '../..');

interface Input {
  name: string;
  image: () => Promise<GreyImage>;
}

const walls = (side: number, cells: number): Input => ({
  name: `walls-${side}`,
  image: async () => synthesize({ pattern: 'walls', cells, width: side, height: side, order: 'random', seed: 1 }).image,
});

const INPUTS: Input[] = [
  walls(4096, 12577),
  walls(1024, 786),
  { name: 'grains-calibrated', image: async () => (await decodeImage(new Uint8Array(readFileSync(join(root, 'sample-images/grains-calibrated.png'))))).pages[0]! },
];

const SETTINGS = { umPerPx: 0.5, reference: { replicates: 0 } };

/** A hash of what makes the label images (generator, segmenters, sample image): a cached one is remade when they change. */
function sourceHash(): string {
  const h = createHash('sha256');
  for (const d of ['src/core/synth', 'src/core/segment', 'src/core/cv', 'src/core/image']) {
    const dir = join(root, d);
    for (const f of readdirSync(dir).sort()) if (f.endsWith('.ts')) h.update(readFileSync(join(dir, f)));
  }
  for (const f of ['src/core/analyze.ts', 'src/core/settings.ts']) h.update(readFileSync(join(root, f)));
  h.update(readFileSync(join(root, 'sample-images/grains-calibrated.png')));
  h.update(JSON.stringify(SETTINGS));
  return h.digest('hex').slice(0, 10);
}

/** The label image and settings of an input, from the cache or by analysing it once. */
async function labelsOf(input: Input, hash: string): Promise<{ labels: LabelImage; settings: Settings }> {
  const dir = join(tmpdir(), 'tessellab-grain-bench');
  mkdirSync(dir, { recursive: true });
  const base = join(dir, `${input.name}-${hash}`);
  const settings = resolveSettings(SETTINGS);
  if (existsSync(`${base}.json`) && existsSync(`${base}.bin`)) {
    const meta = JSON.parse(readFileSync(`${base}.json`, 'utf8')) as { width: number; height: number; count: number };
    const buf = readFileSync(`${base}.bin`);
    const labels = new Int32Array(buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength));
    return { labels: { ...meta, labels }, settings };
  }
  const a = await analyze({ kind: 'image', image: await input.image() }, SETTINGS);
  const labels = a.labels!;
  writeFileSync(`${base}.json`, JSON.stringify({ width: labels.width, height: labels.height, count: labels.count }));
  writeFileSync(`${base}.bin`, new Uint8Array(labels.labels.buffer, labels.labels.byteOffset, labels.labels.byteLength));
  return { labels, settings: a.settings };
}

/** The grain stage as analyze.ts runs it: the field is the whole label image (field coordinates). */
function stage(labels: LabelImage, settings: Settings) {
  const result = grainSize({ labels, umPerPx: settings.umPerPx, field: { x0: 0, y0: 0, x1: labels.width, y1: labels.height }, pattern: 'walls', settings });
  return { result, summary: grainSizeSummary(result) };
}

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

const runs = Math.max(1, Number(arg('--runs') ?? 5));
const only = arg('--only') ?? '';
const dump = arg('--dump');
const hash = sourceHash();
if (dump) mkdirSync(dump, { recursive: true });

for (const input of INPUTS) {
  if (!input.name.includes(only)) continue;
  const { labels, settings } = await labelsOf(input, hash);
  let ms = Infinity;
  let cpu = Infinity;
  let first = 0;
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    const u0 = process.cpuUsage();
    const out = stage(labels, settings);
    const u = process.cpuUsage(u0);
    const t = performance.now() - t0;
    if (r === 0) {
      first = t;
      if (dump) writeFileSync(join(dump, `${input.name}.json`), JSON.stringify(out));
    }
    ms = Math.min(ms, t);
    cpu = Math.min(cpu, (u.user + u.system) / 1000);
  }
  const label = `${input.name} (${labels.width} x ${labels.height}, ${labels.count} grains)`;
  process.stdout.write(`${label.padEnd(44)} grain ${ms.toFixed(1).padStart(7)} ms  (cpu ${cpu.toFixed(1).padStart(7)} ms)  best of ${runs}; first ${first.toFixed(1).padStart(7)} ms; load ${loadavg()[0]!.toFixed(2)}\n`);
}
