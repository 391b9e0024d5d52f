/**
 * Inputs that are not files: /dev/zero (endless zeros), a named pipe (FIFO) with no writer, a folder. Each
 * is refused at once with one line naming it, before a byte is read; a regular file is read whole.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { main } from '../../../src/cli/main';
import { SettingsError } from '../../../src/core/errors';
import { readInputFile } from '../../../src/node/inputFile';

const dir = mkdtempSync(join(tmpdir(), 'tessellab-input-'));
const fifo = join(dir, 'frames.fifo');
const haveFifo = (() => {
  try {
    execFileSync('mkfifo', [fifo]);
    return true;
  } catch {
    return false;
  }
})();

afterEach(() => vi.restoreAllMocks());

describe('readInputFile', () => {
  it('reads a regular file whole', async () => {
    const f = join(dir, 'a.csv');
    writeFileSync(f, 'x,y\n1,2\n');
    expect(new TextDecoder().decode(await readInputFile(f))).toBe('x,y\n1,2\n');
  });

  it.skipIf(!existsSync('/dev/zero'))('/dev/zero is refused as a device, not read', async () => {
    await expect(readInputFile('/dev/zero', 'zero.png')).rejects.toThrow(SettingsError);
    await expect(readInputFile('/dev/zero', 'zero.png')).rejects.toThrow('zero.png is a device, not a file; save the image to a file and give that file.');
  });

  it.skipIf(!haveFifo)('a named pipe without a writer is refused at once, not waited on', async () => {
    await expect(readInputFile(fifo, 'frames.fifo')).rejects.toThrow('frames.fifo is a pipe, not a file; save the image to a file and give that file.');
  });

  it('a folder and a missing file', async () => {
    await expect(readInputFile(dir, 'dir')).rejects.toThrow('dir is a folder, not an image.');
    await expect(readInputFile(join(dir, 'none.png'), 'none.png')).rejects.toThrow('none.png does not exist; check the path.');
  });
});

describe('tessellab kinetics with /dev/zero or a pipe among the frames', () => {
  it.skipIf(!existsSync('/dev/zero') || !haveFifo)('one line and exit 1, nothing read', async () => {
    for (const input of ['/dev/zero', fifo]) {
      let err = '';
      vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
      const code = await main(['kinetics', input, input, input, '--times', '1,2,3', '--out', join(dir, 'k')]);
      vi.restoreAllMocks();
      expect(code).toBe(1);
      const failures = err.split('\n').filter((l) => l.startsWith('tessellab kinetics:'));
      expect(failures).toEqual([`tessellab kinetics: ${input} is ${input === fifo ? 'a pipe' : 'a device'}, not a file; save the image to a file and give that file.`]);
    }
  });
});

describe('tessellab analyze with /dev/zero or a pipe in a batch', () => {
  it.skipIf(!existsSync('/dev/zero') || !haveFifo)('each refused in one line, the good image still analysed', async () => {
    let err = '';
    vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
    vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
    const out = join(dir, 'a');
    const code = await main(['analyze', '/dev/zero', fifo, 'sample-images/tissue-regular.png', '--settings', '/dev/zero', '--out', out]).catch((e: unknown) => e);
    vi.restoreAllMocks();
    // The settings file itself is /dev/zero: refused before any image, in one line.
    expect(code).toBe(1);
    expect(err).toMatch(/the settings file \/dev\/zero is a device, not a file/);
    err = '';
    vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
    vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
    const code2 = await main(['analyze', '/dev/zero', fifo, 'sample-images/tissue-regular.png', '--out', out]);
    vi.restoreAllMocks();
    expect(code2).toBe(1);
    expect(err).toMatch(/zero: .*is a device, not a file|\/dev\/zero is a device, not a file/);
    expect(err).toMatch(/frames\.fifo is a pipe, not a file|frames\.fifo: .*pipe/);
    expect(existsSync(join(out, 'tissue-regular.summary.json'))).toBe(true);
  });
});
