/**
 * Kill while writing: the command line is killed (SIGKILL, which no program can catch) at several moments of
 * its write phase, each time over a folder that holds the complete results of an earlier run with other
 * settings. Every file left in the folder must be whole: byte for byte the earlier run's file or the new
 * run's, never a part of one. A rerun with --skip-existing then completes the batch: the folder equals that
 * of an uninterrupted run. The moments are the creation of the k-th temporary file, seen through the file
 * system's change notifications (fs.watch); no timing is assumed or asserted.
 */
import { spawn } from 'node:child_process';
import { cpSync, mkdtempSync, readdirSync, readFileSync, watch, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { main } from '../../../src/cli/main';
import { encodePng } from '../../../src/core/image/encode';
import { synthesize } from '../../../src/core/synth/index';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
const isTemporary = (f: string) => f.startsWith('.') && f.endsWith('.tmp');

let dir: string;
let inputs: string[];
let oldDir: string;
let newDir: string;
let newSettings: string;

async function inProcess(args: string[]): Promise<number> {
  const e = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
  try {
    return await main(args);
  } finally {
    e.mockRestore();
  }
}

const files = (d: string) => readdirSync(d).filter((f) => !isTemporary(f)).sort();

/**
 * Runs the command line as its own process into `out` and sends it `signal` when the `k`-th temporary
 * file appears. Resolves with how the process ended and the temporary files it had started.
 */
function killAt(k: number, out: string, signal: NodeJS.Signals = 'SIGKILL'): Promise<{ signal: NodeJS.Signals | null; code: number | null; started: number }> {
  return new Promise((done, fail) => {
    const seen = new Set<string>();
    // GLIBC_TUNABLES set: the launcher runs the command line in its own process (no second start), so the
    // process killed is the one writing.
    const child = spawn(process.execPath, [join(ROOT, 'bin/tessellab.mjs'), 'analyze', ...inputs, '--settings', newSettings, '--threads', '1', '--out', out], {
      cwd: ROOT,
      env: { ...process.env, GLIBC_TUNABLES: 'glibc.malloc.hugetlb=0' },
      stdio: 'ignore',
    });
    const watcher = watch(out, (_event, name) => {
      if (!name || !isTemporary(name) || seen.has(name)) return;
      seen.add(name);
      if (seen.size === k) child.kill(signal);
    });
    child.on('error', fail);
    child.on('exit', (code, signal) => {
      watcher.close();
      done({ signal, code, started: seen.size });
    });
  });
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'tessellab-kill-'));
  inputs = [0, 1].map((i) => {
    const r = synthesize({ pattern: 'walls', cells: 500, width: 800, height: 600, order: 'random', seed: 60 + i });
    const p = join(dir, `frame${i}.png`);
    writeFileSync(p, encodePng({ width: 800, height: 600, data: r.image.data, channels: 1, bitDepth: 8 }));
    return p;
  });
  const oldSettings = join(dir, 'old.json');
  newSettings = join(dir, 'new.json');
  writeFileSync(oldSettings, JSON.stringify({ reference: { replicates: 19 }, walls: { smoothSigmaPx: 1.2 } }));
  writeFileSync(newSettings, JSON.stringify({ reference: { replicates: 19 } }));
  oldDir = join(dir, 'old');
  newDir = join(dir, 'new');
  expect(await inProcess(['analyze', ...inputs, '--settings', oldSettings, '--out', oldDir])).toBe(0);
  expect(await inProcess(['analyze', ...inputs, '--settings', newSettings, '--out', newDir])).toBe(0);
});

describe('a kill while writing', () => {
  it('the earlier and the new run differ in every file (so "old or new" tells them apart)', () => {
    expect(files(oldDir)).toEqual(files(newDir));
    expect(files(newDir)).toHaveLength(12);
    const same = files(newDir).filter((f) => readFileSync(join(oldDir, f)).equals(readFileSync(join(newDir, f))));
    expect(same).toEqual([]);
  });

  // Image 0's set is written by the 1st to 5th temporary files (cells.csv, geojson, svg, labels, summary.json
  // last), image 1's by the 6th to 10th; the kill lands at the k-th one's creation or soon after.
  for (const k of [1, 2, 3, 5, 7]) {
    it(`killed when write ${k} of 12 starts: every file is the old one or the new one, and a rerun completes the batch`, async () => {
      const out = join(dir, `killed-${k}`);
      cpSync(oldDir, out, { recursive: true });
      const r = await killAt(k, out);
      expect(r.started).toBeGreaterThanOrEqual(k);
      if (k <= 5) expect(r.signal).toBe('SIGKILL'); // image 1 is still to be analysed: the kill landed in the run
      const left = readdirSync(out);
      let fresh = 0;
      for (const f of left.filter((x) => !isTemporary(x))) {
        const bytes = readFileSync(join(out, f));
        const isOld = bytes.equals(readFileSync(join(oldDir, f)));
        const isNew = bytes.equals(readFileSync(join(newDir, f)));
        expect(isOld || isNew, `${f} is neither the earlier file nor the new one`).toBe(true);
        if (isNew && !isOld) fresh++;
      }
      // A set being replaced has no summary.json until its new one lands, so --skip-existing redoes it.
      expect(await inProcess(['analyze', ...inputs, '--settings', newSettings, '--threads', '1', '--skip-existing', '--out', out])).toBe(0);
      expect(files(out)).toEqual(files(newDir));
      for (const f of files(newDir)) expect(readFileSync(join(out, f)).equals(readFileSync(join(newDir, f))), f).toBe(true);
      process.stdout.write(`kill at write ${k}: ${r.signal ?? `exit ${r.code}`}, ${fresh} new files, ${left.filter(isTemporary).length} temporary left\n`);
    });
  }

  it('stopped by SIGTERM (a scheduler\'s time limit) while writing: exit 143, no temporary file left, every file whole', async () => {
    const out = join(dir, 'terminated');
    cpSync(oldDir, out, { recursive: true });
    const r = await killAt(2, out, 'SIGTERM');
    expect(r.code).toBe(128 + 15);
    expect(readdirSync(out).filter(isTemporary)).toEqual([]);
    for (const f of files(out)) {
      const bytes = readFileSync(join(out, f));
      expect(bytes.equals(readFileSync(join(oldDir, f))) || bytes.equals(readFileSync(join(newDir, f))), f).toBe(true);
    }
  });
});
