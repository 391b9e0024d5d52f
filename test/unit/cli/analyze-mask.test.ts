/**
 * `tessellab analyze IMAGE --mask FILE.png`: a mask of the image's size is the field of the statistics and
 * summary.json records it; a mask of another size or without tissue gets one line saying what is wrong and
 * what to do, and a non-zero exit.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { main } from '../../../src/cli/main';
import { encodePng } from '../../../src/core/image/encode';
import { synthesize } from '../../../src/core/synth/index';
import { expectValidSummary } from '../../helpers/summary-schema';

let dir: string;
let image: string;
const W = 300;
const H = 240;

async function run(args: string[]): Promise<{ code: number; err: string }> {
  let err = '';
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
  try {
    return { code: await main(args), err };
  } finally {
    e.mockRestore();
  }
}

function png(name: string, w: number, h: number, inside: (x: number, y: number) => boolean): string {
  const data = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) data[y * w + x] = inside(x, y) ? 255 : 0;
  const p = join(dir, name);
  writeFileSync(p, encodePng({ width: w, height: h, data, channels: 1, bitDepth: 8 }));
  return p;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'tessellab-mask-'));
  const r = synthesize({ pattern: 'walls', cells: 150, width: W, height: H, order: 'random', seed: 3, window: true });
  image = join(dir, 'tissue.png');
  writeFileSync(image, encodePng({ width: W, height: H, data: r.image.data, channels: 1, bitDepth: 8 }));
});
afterEach(() => vi.restoreAllMocks());

describe('tessellab analyze --mask', () => {
  it('analyses the cells in the mask and records it in summary.json', async () => {
    // A disc of radius 100 px: πr² ≈ 31 416 px² (derived; a digital disc is within a few px² per px of outline).
    const mask = png('disc.png', W, H, (x, y) => (x + 0.5 - 150) ** 2 + (y + 0.5 - 120) ** 2 < 100 * 100);
    const out = join(dir, 'out');
    const { code, err } = await run(['analyze', image, '--mask', mask, '--out', out]);
    expect(err).not.toMatch(/tessellab analyze:/);
    expect(code).toBe(0);
    const s = JSON.parse(readFileSync(join(out, 'tissue.summary.json'), 'utf8'));
    expectValidSummary(s);
    expect(s.field.mask.pixels / (Math.PI * 100 * 100)).toBeCloseTo(1, 2);
    expect(s.field.mask.perimeter / (2 * Math.PI * 100)).toBeCloseTo(1, 2);
    // Every kept cell's centroid lies in the disc (cut to it).
    const rows = readFileSync(join(out, 'tissue.cells.csv'), 'utf8').trim().split('\n');
    const head = rows[0]!.split(',');
    const xi = head.indexOf('x_px');
    const yi = head.indexOf('y_px');
    expect(rows.length - 1).toBe(s.cells.count);
    for (const row of rows.slice(1)) {
      const v = row.split(',');
      expect(Math.hypot(Number(v[xi]) - 150, Number(v[yi]) - 120)).toBeLessThan(100);
    }
  });

  it('a mask of another size: one line naming both sizes', async () => {
    const mask = png('small.png', 200, 240, () => true);
    const { code, err } = await run(['analyze', image, '--mask', mask, '--out', join(dir, 'o2')]);
    expect(code).toBe(1);
    const lines = err.split('\n').filter((l) => l.startsWith('tessellab analyze:'));
    expect(lines.length).toBe(1);
    expect(lines[0]).toMatch(/small\.png is 200 x 240 px but the image is 300 x 240 px; give a mask of the image's size/);
    expect(err).not.toMatch(/\n\s+at /);
  });

  it('a mask without tissue: one line saying so', async () => {
    const mask = png('blank.png', W, H, () => false);
    const { code, err } = await run(['analyze', image, '--mask', mask, '--out', join(dir, 'o3')]);
    expect(code).not.toBe(0);
    const lines = err.split('\n').filter((l) => /blank\.png/.test(l));
    expect(lines.length).toBe(1);
    expect(lines[0]).toMatch(/marks no tissue .*mark the tissue with nonzero/);
    expect(err).not.toMatch(/\n\s+at /);
  });
});
