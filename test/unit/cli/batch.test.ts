/**
 * The command line in a batch (docs/batches.md): inputs from a list file or standard input, shards that are
 * disjoint and together complete, --skip-existing keeping complete results and redoing the rest, inputs with
 * the same stem kept apart, a failed input recorded as a result, the same bytes whatever the number of
 * threads, and merge making summary.csv from the folders. Images from the project's generator.
 */
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { main } from '../../../src/cli/main';
import { summaryTableColumns } from '../../../src/core/export/summaryTable';
import { encodePng } from '../../../src/core/image/encode';
import { synthesize } from '../../../src/core/synth/index';
import { expectValidFailedSummary } from '../../helpers/summary-schema';

let dir: string;
let settings: string;
const images: string[] = [];

async function run(args: string[], stdin?: string): Promise<{ code: number; err: string; out: string }> {
  let err = '';
  let out = '';
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => ((out += String(s)), true));
  if (stdin !== undefined) vi.spyOn(process, 'stdin', 'get').mockReturnValue(Readable.from([Buffer.from(stdin)]) as unknown as typeof process.stdin);
  try {
    const code = await main(args);
    return { code, err, out };
  } finally {
    vi.restoreAllMocks();
  }
}

function image(path: string, seed: number): string {
  const r = synthesize({ pattern: 'walls', cells: 90, width: 260, height: 200, order: 'random', seed });
  writeFileSync(path, encodePng({ width: 260, height: 200, data: r.image.data, channels: 1, bitDepth: 8 }));
  return path;
}

const summaryOf = (out: string, name: string) => JSON.parse(readFileSync(join(out, `${name}.summary.json`), 'utf8')) as Record<string, any>;
const csvRows = (file: string) => readFileSync(file, 'utf8').trimEnd().split('\r\n').slice(1);
const column = (row: string, name: string) => row.split(',')[summaryTableColumns().indexOf(name)];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'tessellab-batch-'));
  // Fewer replicates than the default keep the tests short; everything else is the default.
  settings = join(dir, 'settings.json');
  writeFileSync(settings, JSON.stringify({ reference: { replicates: 19 } }));
  mkdirSync(join(dir, 'in'));
  for (let i = 0; i < 4; i++) images.push(image(join(dir, 'in', `img${i}.png`), 10 + i));
  images.push(join(dir, 'in', 'broken.png'));
  writeFileSync(images[4]!, readFileSync(images[0]!).subarray(0, 1500));
});
afterEach(() => vi.restoreAllMocks());

describe('tessellab analyze in a batch', () => {
  it('reads its inputs from a list file and from standard input ("-")', async () => {
    const list = join(dir, 'list.txt');
    writeFileSync(list, `${images[0]}\r\n\n${images[1]}\n`);
    const a = await run(['analyze', '--files-from', list, '--settings', settings, '--out', join(dir, 'o-list')]);
    expect(a.code).toBe(0);
    expect(csvRows(join(dir, 'o-list', 'summary.csv')).map((r) => column(r, 'image'))).toEqual(['img0.png', 'img1.png']);
    const b = await run(['analyze', '--files-from', '-', images[2]!, '--settings', settings, '--out', join(dir, 'o-stdin')], `${images[3]}\n`);
    expect(b.code).toBe(0);
    expect(csvRows(join(dir, 'o-stdin', 'summary.csv')).map((r) => column(r, 'input'))).toEqual([images[2], images[3]]);
  });

  it('shards 1/2 and 2/2 into one folder are disjoint and together complete; merge makes the table of all', async () => {
    const out = join(dir, 'o-shards');
    const list = join(dir, 'all.txt');
    writeFileSync(list, [...images].reverse().join('\n'));
    const done: string[][] = [];
    for (const shard of ['1/2', '2/2']) {
      const r = await run(['analyze', '--files-from', list, '--shard', shard, '--settings', settings, '--out', out]);
      expect(r.err).toContain(`Shard ${shard}: `);
      done.push([...r.err.matchAll(/^\[\d+\/\d+\] (.*): reading$/gm)].map((m) => m[1]!));
      expect(existsSync(join(out, 'summary.csv'))).toBe(false); // a shard's table would list only its own inputs
    }
    expect(done[0]!.filter((p) => done[1]!.includes(p))).toEqual([]);
    expect([...done[0]!, ...done[1]!].sort()).toEqual([...images].sort());
    const m = await run(['merge', out, '--out', join(out, 'summary.csv')]);
    expect(m.code).toBe(0);
    expect(m.err).toContain('5 inputs (4 analysed, 1 failed)');
    const rows = csvRows(join(out, 'summary.csv'));
    expect(rows.map((r) => column(r, 'input'))).toEqual([...images].sort());
    const broken = rows.find((r) => column(r, 'image') === 'broken.png')!;
    expect(column(broken, 'status')).toBe('failed');
    expect(column(broken, 'error.kind')).toBe('ImageDecode');
    for (const r of rows.filter((x) => x !== broken)) expect([column(r, 'status'), column(r, 'calibration.source'), column(r, 'version')]).toEqual(['analysed', 'none', '0.1.0']);
  });

  it('--skip-existing keeps complete results untouched and redoes a failed input, a missing file and other settings', async () => {
    const out = join(dir, 'o-skip');
    const first = await run(['analyze', ...images, '--settings', settings, '--out', out]);
    expect(first.code).toBe(1);
    const before = Object.fromEntries(readdirSync(out).map((f) => [f, statSync(join(out, f)).mtimeMs]));
    const again = await run(['analyze', ...images, '--settings', settings, '--out', out, '--skip-existing']);
    expect(again.code).toBe(1); // the broken input fails again
    expect(again.err.match(/kept \(complete results already in the output folder\)/g)).toHaveLength(4);
    expect(again.err).toMatch(/broken\.png: analysing again: it failed last time/);
    for (const f of readdirSync(out).filter((x) => x.startsWith('img'))) expect(statSync(join(out, f)).mtimeMs, f).toBe(before[f]);
    expect(csvRows(join(out, 'summary.csv'))).toHaveLength(5);
    // A set with a file missing is analysed again, and so is every image when the settings change.
    const { rmSync } = await import('node:fs');
    rmSync(join(out, 'img2.overlay.svg'));
    const third = await run(['analyze', ...images.slice(0, 4), '--settings', settings, '--out', out, '--skip-existing']);
    expect(third.err).toMatch(/img2\.png: analysing again: img2\.overlay\.svg is missing/);
    expect(existsSync(join(out, 'img2.overlay.svg'))).toBe(true);
    const fourth = await run(['analyze', images[0]!, '--settings', settings, '--um-per-px', '0.5', '--out', out, '--skip-existing']);
    expect(fourth.err).toMatch(/img0\.png: analysing again: its results were made with other settings/);
    expect(summaryOf(out, 'img0').umPerPx).toBe(0.5);
  });

  it('a.png, a.tif and sub/a.png in one run: three result sets, none overwritten, said on stderr', async () => {
    const d = join(dir, 'same');
    mkdirSync(join(d, 'sub'), { recursive: true });
    const paths = [image(join(d, 'a.png'), 31), join(d, 'a.tif'), image(join(d, 'sub', 'a.png'), 33)];
    writeFileSync(paths[1]!, readFileSync(image(join(d, 'tmp.png'), 32)));
    const out = join(dir, 'o-same');
    const r = await run(['analyze', ...paths, '--settings', settings, '--out', out]);
    expect(r.err).toContain(`${paths[1]}: its name is also that of ${paths[0]}; its files are named a-2.*`);
    expect(r.err).toContain(`${paths[2]}: its name is also that of ${paths[0]}; its files are named a-3.*`);
    const inputs = ['a', 'a-2', 'a-3'].map((n) => summaryOf(out, n).input);
    expect(inputs).toEqual([paths[0], paths[1], paths[2]]);
    for (const n of ['a', 'a-3']) expect(existsSync(join(out, `${n}.cells.csv`))).toBe(true);
    // Three different images: three different cell tables.
    expect(new Set(['a', 'a-3'].map((n) => readFileSync(join(out, `${n}.cells.csv`), 'utf8'))).size).toBe(2);
  });

  it('a failed input is a result: a summary.json with its input and reason, no stale files of an earlier analysis, exit 1', async () => {
    const out = join(dir, 'o-fail');
    const p = image(join(dir, 'later-broken.png'), 40);
    expect((await run(['analyze', p, '--settings', settings, '--out', out])).code).toBe(0);
    expect(existsSync(join(out, 'later-broken.cells.csv'))).toBe(true);
    writeFileSync(p, 'not an image at all\n');
    const r = await run(['analyze', p, '--settings', settings, '--out', out]);
    expect(r.code).toBe(1);
    const s = summaryOf(out, 'later-broken');
    expectValidFailedSummary(s, 'later-broken.summary.json');
    expect(s).toMatchObject({ tessellab: 2, image: 'later-broken.png', input: p, version: '0.1.0', error: { kind: expect.any(String) } });
    expect(s.error.message).toMatch(/text file/i);
    for (const f of ['cells.csv', 'cells.geojson', 'overlay.svg', 'labels.png']) expect(existsSync(join(out, `later-broken.${f}`)), f).toBe(false);
    const missing = await run(['analyze', join(dir, 'nope.png'), '--out', out]);
    expect(missing.code).toBe(1);
    expect(summaryOf(out, 'nope').error).toEqual({ kind: 'Missing', message: `${join(dir, 'nope.png')} does not exist; check the path.` });
  });

  it('--threads 1 and --threads 3 write the same bytes (each replicate has its own seed); a bad count is refused', async () => {
    const outs = ['1', '3'].map((t) => join(dir, `o-threads-${t}`));
    for (const [i, t] of ['1', '3'].entries()) expect((await run(['analyze', images[0]!, '--threads', t, '--settings', settings, '--out', outs[i]!])).code).toBe(0);
    for (const f of ['img0.summary.json', 'img0.cells.csv', 'img0.labels.png']) expect(readFileSync(join(outs[1]!, f)).equals(readFileSync(join(outs[0]!, f))), f).toBe(true);
    const bad = await run(['analyze', images[0]!, '--threads', '0', '--out', outs[0]!]);
    expect(bad.code).toBe(1);
    expect(bad.err).toMatch(/--threads must be a positive whole number; got "0"/);
  });
});

describe('tessellab merge', () => {
  it('skips files that are not one input\'s summary.json, says so for an unreadable one and exits 1, refuses an empty folder', async () => {
    const d = join(dir, 'm');
    mkdirSync(d);
    expect((await run(['analyze', images[1]!, '--settings', settings, '--out', d])).code).toBe(0);
    writeFileSync(join(d, 'final.summary.json'), JSON.stringify({ summary: {}, complete: true }));
    let r = await run(['merge', d, '--out', join(d, 'merged.csv')]);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/final\.summary\.json is not the summary\.json of one input; skipped/);
    expect(csvRows(join(d, 'merged.csv'))).toHaveLength(1);
    writeFileSync(join(d, 'cut.summary.json'), '{"tessellab": 2, "wid');
    r = await run(['merge', d, '--out', '-']);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/cut\.summary\.json is not valid JSON; its input has no row/);
    expect(r.out.split('\r\n')[0]).toBe(summaryTableColumns().join(','));
    const empty = join(dir, 'm-empty');
    mkdirSync(empty);
    r = await run(['merge', empty, '--out', join(empty, 's.csv')]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/No \*\.summary\.json in .*run `tessellab analyze --out DIR` first/);
    r = await run(['merge', d]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/Say where summary\.csv goes with --out/);
  });
});

