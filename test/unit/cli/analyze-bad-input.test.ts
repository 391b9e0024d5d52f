/**
 * The command line with bad input: one line on stderr that says what is wrong and what to do, no stack
 * trace, a non-zero exit, and in a batch the other images still analysed and written.
 */
import { mkdtempSync, readFileSync, existsSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { expectValidSummaryTree } from '../../helpers/summary-schema';
import { main } from '../../../src/cli/main';
import { encodePng } from '../../../src/core/image/encode';
import { synthesize } from '../../../src/core/synth/index';
import { pngHeaderOnly } from '../image/handmade';

let dir: string;
let good: string;

async function run(args: string[]): Promise<{ code: number; err: string; out: string }> {
  let err = '';
  let out = '';
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => ((out += String(s)), true));
  try {
    const code = await main(args);
    return { code, err, out };
  } finally {
    e.mockRestore();
    o.mockRestore();
  }
}

function file(name: string, data: string | Uint8Array): string {
  const p = join(dir, name);
  writeFileSync(p, data);
  return p;
}

/** Lines that name the failing input, and none that look like a stack trace. */
function expectOneLine(err: string, name: string, words: RegExp): void {
  const lines = err.split('\n').filter((l) => l.includes(name) && !l.startsWith('['));
  expect(lines.length).toBe(1);
  expect(lines[0]).toMatch(words);
  expect(err).not.toMatch(/\n\s+at /);
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'tessellab-cli-'));
  const r = synthesize({ pattern: 'walls', cells: 120, width: 300, height: 240, order: 'random', seed: 2 });
  good = file('good.png', encodePng({ width: 300, height: 240, data: r.image.data, channels: 1, bitDepth: 8 }));
});
afterEach(() => vi.restoreAllMocks());

describe('tessellab analyze: bad input', () => {
  const cases: [string, () => string, RegExp][] = [
    ['a zero-byte file', () => file('empty.png', new Uint8Array(0)), /empty/i],
    ['a truncated PNG', () => file('cut.png', readFileSync(good).subarray(0, 2000)), /truncated|damaged|incomplete|cut/i],
    ['random bytes with an image extension', () => file('noise.tif', Uint8Array.from({ length: 4096 }, (_, i) => (i * 7919 + 13) % 251)), /not .*image|unrecogni|unknown|format/i],
    ['a text file', () => file('notes.png', 'cell,area\n1,200\n'), /text file/i],
    ['an unsupported TIFF compression', () => file('z.tif', readFileSync('test/fixtures/images/grey8-zstd.tif')), /compression .*not supported/i],
    ['a 1 x 1 image', () => file('dot.png', encodePng({ width: 1, height: 1, data: new Uint8Array([9]), channels: 1, bitDepth: 8 })), /too small.*16 x 16/],
    ['a blank (uniform) image', () => file('blank.png', encodePng({ width: 64, height: 64, data: new Uint8Array(64 * 64).fill(128), channels: 1, bitDepth: 8 })), /No cells found.*uniform/],
    ['an image over the pixel limit', () => file('huge.png', pngHeaderOnly(30000, 30000)), /exceeds the limit of 100 megapixels; crop or downsample/],
  ];
  for (const [what, make, words] of cases) {
    it(`${what}: one clear line, exit 1, and the good image of the batch is still written`, async () => {
      const bad = make();
      const out = join(dir, `out-${what.replace(/\W+/g, '-')}`);
      const r = await run(['analyze', bad, good, '--out', out]);
      expect(r.code).toBe(1);
      expectOneLine(r.err, bad.split('/').pop()!, words);
      expect(existsSync(join(out, 'good.cells.csv'))).toBe(true);
      const summary = readFileSync(join(out, 'summary.csv'), 'utf8');
      expect(summary).toMatch(/good\.png,300,240,walls/);
      expect(r.err).toContain(`1 of 2 inputs failed; the others were written to ${out} (summary.csv lists why each failed).`);
    });
  }

  it('a batch in which every input fails says so, and where the errors are listed', async () => {
    const out = join(dir, 'o-all-failed');
    const r = await run(['analyze', join(dir, 'nope1.png'), join(dir, 'nope2.png'), '--out', out]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`All 2 inputs failed; summary.csv in ${out} lists why.`);
    expect(readFileSync(join(out, 'summary.csv'), 'utf8')).toMatch(/nope2\.png,.*does not exist/);
    const one = await run(['analyze', join(dir, 'nope1.png'), '--out', out]);
    expect(one.err).toContain(`The input failed; summary.csv in ${out} lists why.`);
  });

  it('a points CSV with a non-numeric value names the line', async () => {
    const p = file('pts.csv', 'x,y\n1,2\n3,4\nfive,6\n');
    const r = await run(['analyze', p, '--pattern', 'points', '--out', join(dir, 'o-pts')]);
    expect(r.code).toBe(1);
    expectOneLine(r.err, 'pts.csv', /line 4 .*not a number/);
  });

  it('a points CSV with a missing value names the line', async () => {
    const p = file('pts2.csv', '1,2\n3,4\n\n5,\n');
    const r = await run(['analyze', p, '--pattern', 'points', '--out', join(dir, 'o-pts2')]);
    expect(r.code).toBe(1);
    expectOneLine(r.err, 'pts2.csv', /line 4 is missing y/);
  });

  it('a points CSV with duplicated points is analysed, with a warning that says how many were merged', async () => {
    // 30 distinct points on a jittered 6 x 5 grid (hand-made), then lines 2, 9 and 9 again repeated.
    const rows: string[] = [];
    for (let k = 0; k < 30; k++) rows.push(`${10 + (k % 6) * 15 + (k % 4)},${10 + Math.floor(k / 6) * 18 + (k % 3)}`);
    rows.push(rows[0]!, rows[7]!, rows[7]!);
    const p = file('dups.csv', `x,y\n${rows.join('\n')}\n`);
    const out = join(dir, 'o-dups');
    const r = await run(['analyze', p, '--pattern', 'points', '--size', '100x100', '--out', out]);
    expect(r.code).toBe(0);
    expect(r.err).toContain('warning: dups.csv: 3 duplicated points (the same x and y as an earlier line, first at line 32) merged; 30 distinct points of 33 are analysed.');
    const summary = JSON.parse(readFileSync(join(out, 'dups.summary.json'), 'utf8')) as { cells: { count: number } };
    expect(summary.cells.count).toBe(30);
  });

  it('two points: analysed, with the reason there is no verdict; no points: one line', async () => {
    const p = file('two.csv', 'x,y\n10,10\n20,20\n');
    const r = await run(['analyze', p, '--pattern', 'points', '--size', '100x100', '--out', join(dir, 'o-two')]);
    expect(r.code).toBe(0);
    const s = JSON.parse(readFileSync(join(dir, 'o-two', 'two.summary.json'), 'utf8'));
    expect(s.cells.count).toBe(2);
    expect(s.randomness.warnings.join(' ')).toMatch(/2 cells cannot be compared with random seeding/);
    const e = file('none.csv', 'x,y\n');
    const r0 = await run(['analyze', e, '--pattern', 'points', '--size', '100x100', '--out', join(dir, 'o-none')]);
    expect(r0.code).toBe(1);
    expect(r0.err).not.toMatch(/Unexpected error/);
  });

  it('two bodies in an image: measured, without a verdict', async () => {
    const w = 80;
    const data = new Uint8Array(w * w).fill(30);
    for (let y = 0; y < w; y++) for (let x = 0; x < w; x++) if (Math.hypot(x - 20, y - 40) < 10 || Math.hypot(x - 60, y - 40) < 10) data[y * w + x] = 220;
    const p = file('two-bodies.png', encodePng({ width: w, height: w, data, channels: 1, bitDepth: 8 }));
    const r = await run(['analyze', p, '--pattern', 'bodies', '--out', join(dir, 'o-2b')]);
    // Two cells still get their table and summary; only the statistics that need more cells are left out.
    expect(r.code).toBe(0);
    const s = JSON.parse(readFileSync(join(dir, 'o-2b', 'two-bodies.summary.json'), 'utf8'));
    expect(s.cells.count).toBe(2);
    expect(s.randomness.verdict).toBeNull();
    expect(readFileSync(join(dir, 'o-2b', 'two-bodies.cells.csv'), 'utf8').trim().split('\n')).toHaveLength(3);
  });

  it('a missing output folder is created', async () => {
    const out = join(dir, 'new', 'deeper');
    const r = await run(['analyze', good, '--out', out]);
    expect(r.code).toBe(0);
    for (const f of ['good.cells.csv', 'good.summary.json', 'good.cells.geojson', 'good.overlay.svg', 'good.labels.png', 'settings.json', 'summary.csv']) {
      expect(existsSync(join(out, f))).toBe(true);
    }
  });

  it('an unwritable output folder (a path through a file) is a clear error', async () => {
    const blocker = file('blocker', 'x');
    const r = await run(['analyze', good, '--out', join(blocker, 'sub')]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/Cannot write to the output folder .*choose another with --out/);
    expect(r.err).not.toMatch(/\n\s+at /);
  });

  it('a missing input file and a bad option', async () => {
    const r = await run(['analyze', join(dir, 'nope.png'), good, '--out', join(dir, 'o-miss')]);
    expect(r.code).toBe(1);
    expectOneLine(r.err, 'nope.png', /does not exist; check the path/);
    const r2 = await run(['analyze', good, '--um-per-px', '-3']);
    expect(r2.code).toBe(1);
    expect(r2.err).toMatch(/--um-per-px must be a positive number/);
    const r3 = await run(['analyze', good, '--colour', 'red']);
    expect(r3.err).toMatch(/Unknown option --colour/);
  });
});

// Every summary.json these runs wrote follows docs/summary.schema.json (or, for a failed input, its own schema).
afterAll(() => {
  expect(expectValidSummaryTree(dir)).toBeGreaterThan(0);
});
