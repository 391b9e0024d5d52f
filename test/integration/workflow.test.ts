/**
 * The Snakemake workflow (workflow/Snakefile) run by Snakemake itself (Debian's snakemake package, installed
 * by .ci/run) with its local executor, on six small images from the project's generator of which one is
 * corrupt: exit 0, a summary.csv with six rows (the corrupt one with its reason), five complete result sets,
 * the jobs' shards disjoint and together complete, and a second run with nothing to do. The Slurm profile
 * (workflow/profiles/slurm) is checked with Snakemake's dry run (-n), which reads it and plans the jobs
 * without submitting any.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { summaryTableColumns } from '../../src/core/export/summaryTable';
import { encodePng } from '../../src/core/image/encode';
import { synthesize } from '../../src/core/synth/index';
import { expectValidFailedSummary, expectValidSummary } from '../helpers/summary-schema';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

function snakemakeVersion(): string | null {
  try {
    return execFileSync('snakemake', ['--version']).toString().trim();
  } catch {
    return null;
  }
}
const version = snakemakeVersion();
if (!version) process.stderr.write('workflow tests skipped: snakemake is not installed (Debian: apt-get install snakemake; .ci/run does it)\n');

let dir: string;
let images: string;
let settings: string;
const names = ['cells-a', 'cells-b', 'cells-c', 'cells-d', 'cells-e'];

function snakemake(args: string[]): { code: number; out: string } {
  const r = spawnSync('snakemake', ['-s', join(ROOT, 'workflow/Snakefile'), '--directory', dir, ...args], { cwd: dir, encoding: 'utf8' });
  return { code: r.status ?? -1, out: `${r.stdout}\n${r.stderr}` };
}

describe.skipIf(!version)(`the Snakemake workflow (snakemake ${version ?? 'not installed'})`, () => {
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'tessellab-workflow-'));
    images = join(dir, 'images');
    mkdirSync(join(images, 'plate2'), { recursive: true });
    names.forEach((n, i) => {
      const r = synthesize({ pattern: 'walls', cells: 90, width: 260, height: 200, order: 'random', seed: 70 + i });
      writeFileSync(join(images, i < 3 ? '' : 'plate2', `${n}.png`), encodePng({ width: 260, height: 200, data: r.image.data, channels: 1, bitDepth: 8 }));
    });
    // The sixth image: a PNG cut short, as a copy interrupted by a full disk leaves it.
    writeFileSync(join(images, 'plate2', 'corrupt.png'), readFileSync(join(images, 'cells-a.png')).subarray(0, 900));
    settings = join(dir, 'settings.json');
    writeFileSync(settings, JSON.stringify({ reference: { replicates: 19 } }));
  });

  it('six images, one corrupt, in jobs of two: exit 0, six rows, five complete result sets, shards disjoint and complete', () => {
    const out = join(dir, 'out');
    const r = snakemake(['--cores', '2', '--config', `images=${images}`, `out=${out}`, `settings=${settings}`, 'chunk=2', 'threads=1']);
    expect(r.code, r.out).toBe(0);
    const lines = readFileSync(join(out, 'summary.csv'), 'utf8').trimEnd().split('\r\n');
    expect(lines[0]).toBe(summaryTableColumns().join(','));
    expect(lines).toHaveLength(7);
    const col = (line: string, name: string) => line.split(',')[summaryTableColumns().indexOf(name)];
    const corrupt = lines.find((l) => l.startsWith('corrupt.png,'))!;
    expect(col(corrupt, 'status')).toBe('failed');
    expect(col(corrupt, 'error.kind')).toBe('ImageDecode');
    expect(corrupt).toMatch(/truncated/);
    for (const n of names) {
      const row = lines.find((l) => l.startsWith(`${n}.png,`))!;
      expect(col(row, 'status')).toBe('analysed');
      for (const kind of ['cells.csv', 'cells.geojson', 'overlay.svg', 'labels.png', 'summary.json']) expect(existsSync(join(out, `${n}.${kind}`)), `${n}.${kind}`).toBe(true);
      // summary.json is the Summary with the file's provenance and the settings beside it.
      const file = JSON.parse(readFileSync(join(out, `${n}.summary.json`), 'utf8'));
      expectValidSummary(file, `${n}.summary.json`);
      const { image, input, version: v, settings: s } = file;
      expect([image, typeof input, typeof v, typeof s]).toEqual([`${n}.png`, 'string', 'string', 'object']);
    }
    expectValidFailedSummary(JSON.parse(readFileSync(join(out, 'corrupt.summary.json'), 'utf8')), 'corrupt.summary.json');
    // Three jobs (six images in jobs of two); each image read by exactly one of them.
    const logs = readdirSync(join(out, '.tessellab', 'logs')).filter((f) => f.startsWith('shard-'));
    expect(logs.sort()).toEqual(['shard-1-of-3.log', 'shard-2-of-3.log', 'shard-3-of-3.log']);
    const read = logs.flatMap((f) => [...readFileSync(join(out, '.tessellab', 'logs', f), 'utf8').matchAll(/^\[\d+\/\d+\] (.*): reading$/gm)].map((m) => m[1]!));
    expect(read.sort()).toEqual([...names.map((n, i) => join(images, i < 3 ? '' : 'plate2', `${n}.png`)), join(images, 'plate2', 'corrupt.png')].sort());
    // Run again: nothing to do.
    const again = snakemake(['--cores', '2', '--config', `images=${images}`, `out=${out}`, `settings=${settings}`, 'chunk=2', 'threads=1']);
    expect(again.code, again.out).toBe(0);
    expect(again.out).toMatch(/Nothing to be done/);
  });

  it('the Slurm profile: a dry run reads it and plans one job per chunk and the merge', () => {
    const r = snakemake(['--profile', join(ROOT, 'workflow/profiles/slurm'), '-n', '--cores', '64', '--config', `images=${images}`, `out=${join(dir, 'out-slurm')}`, 'chunk=4', 'threads=3']);
    expect(r.code, r.out).toBe(0);
    expect(r.out).toMatch(/^analyze\s+2\s/m);
    expect(r.out).toMatch(/^merge\s+1\s/m);
    expect(r.out).toContain('--shard 2/2 --skip-existing --threads 3');
    expect(r.out).toMatch(/resources: mem_mb=4000.*runtime=120/);
    expect(existsSync(join(dir, 'out-slurm', 'summary.csv'))).toBe(false);
  });

  it('a missing images folder stops the workflow with a sentence saying so', () => {
    const r = snakemake(['--cores', '1', '-n', '--config', `images=${join(dir, 'nowhere')}`, `out=${join(dir, 'o')}`]);
    expect(r.code).not.toBe(0);
    expect(r.out).toContain(`The images folder ${join(dir, 'nowhere')} does not exist; check images=DIR.`);
  });
});
