/**
 * Measures the largest image the analysis handles inside opencv.js's memory (its WebAssembly heap is capped
 * at 1 GiB in this build): analyses a synthetic image of the given size, one size per process (the heap
 * never shrinks), and prints one JSON line: pattern, megapixels, ok, and the error or the heap reached.
 *
 *   npx tsx scripts/measure-pixel-limit.ts walls 120        # one size
 *   npx tsx scripts/measure-pixel-limit.ts walls 100 3      # the same size 3 times in one process (a batch)
 *   npx tsx scripts/measure-pixel-limit.ts search walls 100 140   # bisection, a child process per size
 *
 * The image is a 1024 x 1024 window of the project's generator tiled to the size asked (cut cells at the
 * seams do not change the memory a segmentation needs). Only the steps that run in opencv.js are run: the
 * segmentation and the outlines of the cells (the rest of the analysis is plain JavaScript, whose typed
 * arrays are not bound by that heap). Used to set MAX_PIXELS in src/core/image/limits.ts.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { cellOutlines } from '../src/core/cv/contours';
import { loadCv } from '../src/core/cv/index';
import { describeError } from '../src/core/errors';
import { MAX_PIXELS } from '../src/core/image/limits';
import { segmentBodies } from '../src/core/segment/bodies';
import { segmentWalls } from '../src/core/segment/walls';
import { resolveSettings } from '../src/core/settings';
import { synthesize } from '../src/core/synth/index';

async function one(pattern: 'walls' | 'bodies', mp: number, round = 1): Promise<void> {
  const side = Math.round(Math.sqrt(mp * 1e6));
  const tile = synthesize({ pattern, cells: 400, width: 1024, height: 1024, order: 'random', seed: 3, window: pattern === 'walls' });
  const data = new Uint8Array(side * side);
  for (let y = 0; y < side; y++) {
    const row = tile.image.data.subarray((y % 1024) * 1024, (y % 1024) * 1024 + 1024) as Uint8Array;
    for (let x = 0; x < side; x += 1024) data.set(row.subarray(0, Math.min(1024, side - x)), y * side + x);
  }
  const { cv } = await loadCv();
  const t0 = performance.now();
  let line: Record<string, unknown> = { pattern, megapixels: (side * side) / 1e6, side, round };
  try {
    // The two steps that run in opencv.js, called directly: the analysis's own size check would refuse the
    // sizes beyond the limit that this script is there to measure.
    const settings = resolveSettings({ pattern });
    const image = { width: side, height: side, data, bitDepth: 8 as const };
    const seg = pattern === 'walls' ? segmentWalls(cv, image, settings) : segmentBodies(cv, image, settings);
    const outlines = cellOutlines(cv, seg.labels);
    line = { ...line, ok: true, cells: seg.labels.count, outlines: outlines.offsets.length - 1 };
  } catch (e) {
    line = { ...line, ok: false, error: describeError(e).slice(0, 200) };
  }
  line.heapMiB = Math.round(cv.HEAP8.buffer.byteLength / 2 ** 20);
  line.seconds = Math.round((performance.now() - t0) / 1000);
  process.stdout.write(JSON.stringify(line) + '\n');
}

function search(pattern: string, lo: number, hi: number): void {
  // lo is known (or assumed) to work, hi to fail; halve until 2 MP apart.
  const self = fileURLToPath(import.meta.url);
  while (hi - lo > 2) {
    const mid = Math.round((lo + hi) / 2);
    const r = spawnSync(process.execPath, ['--import', 'tsx', self, pattern, String(mid)], { encoding: 'utf8', env: { ...process.env, TESSELLAB_MEASURE: '1' } });
    const out = (r.stdout || '').trim().split('\n').pop() ?? '';
    process.stdout.write(`${out || `{"pattern":"${pattern}","megapixels":${mid},"ok":false,"error":"process ended: ${r.status ?? r.signal}"}`}\n`);
    let ok = false;
    try { ok = JSON.parse(out).ok === true; } catch { ok = false; }
    if (ok) lo = mid; else hi = mid;
  }
  process.stdout.write(JSON.stringify({ pattern, worksUpToMP: lo, failsAtMP: hi, currentLimitMP: MAX_PIXELS / 1e6 }) + '\n');
}

const [a, b, c, d] = process.argv.slice(2);
if (a === 'search') search(b!, Number(c), Number(d));
else for (let k = 1; k <= Number(c ?? 1); k++) await one(a as 'walls' | 'bodies', Number(b), k);
