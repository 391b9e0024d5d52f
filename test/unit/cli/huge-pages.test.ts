/**
 * The command line's memory setting: glibc.malloc.hugetlb=1 added to GLIBC_TUNABLES on Linux, other
 * tunables kept, an explicit choice respected (the tunable and its syntax as in the glibc 2.35 release notes
 * and the libc-alpha patch series "malloc: Add madvise support for Transparent Huge Pages", 2021: a value
 * other than 0 makes malloc advise huge pages; tunables are separated by colons); and the launcher that
 * starts itself again with it passes on the work's output and exit code.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { wantsHugePages, withHugePages } from '../../../src/node/hugePages';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');

describe('huge pages for the command line', () => {
  it('are wanted on Linux unless GLIBC_TUNABLES already sets glibc.malloc.hugetlb', () => {
    expect(wantsHugePages({}, 'linux')).toBe(true);
    expect(wantsHugePages({ GLIBC_TUNABLES: 'glibc.mem.tagging=0' }, 'linux')).toBe(true);
    expect(wantsHugePages({ GLIBC_TUNABLES: 'glibc.malloc.hugetlb=0' }, 'linux')).toBe(false);
    expect(wantsHugePages({ GLIBC_TUNABLES: 'glibc.mem.tagging=0:glibc.malloc.hugetlb=1' }, 'linux')).toBe(false);
    // A different tunable whose name only starts alike is not the same one.
    expect(wantsHugePages({ GLIBC_TUNABLES: 'glibc.malloc.hugetlbx=1' }, 'linux')).toBe(true);
    expect(wantsHugePages({}, 'darwin')).toBe(false);
    expect(wantsHugePages({}, 'win32')).toBe(false);
  });

  it('are added to the other tunables, which are kept, and replace an earlier value', () => {
    expect(withHugePages({ PATH: '/bin' })).toEqual({ PATH: '/bin', GLIBC_TUNABLES: 'glibc.malloc.hugetlb=1' });
    expect(withHugePages({ GLIBC_TUNABLES: 'glibc.mem.tagging=0' }).GLIBC_TUNABLES).toBe('glibc.mem.tagging=0:glibc.malloc.hugetlb=1');
    expect(withHugePages({ GLIBC_TUNABLES: 'glibc.malloc.hugetlb=2:glibc.mem.tagging=0' }).GLIBC_TUNABLES).toBe('glibc.mem.tagging=0:glibc.malloc.hugetlb=1');
    expect(withHugePages({ GLIBC_TUNABLES: '' }).GLIBC_TUNABLES).toBe('glibc.malloc.hugetlb=1');
  });

  it('the launcher passes on the output and the exit code of the command line it starts', async () => {
    const run = (args: string[], env: NodeJS.ProcessEnv) =>
      new Promise<{ code: number; out: string; err: string }>((done) => {
        execFile(process.execPath, [join(ROOT, 'bin/tessellab.mjs'), ...args], { cwd: ROOT, env }, (e, out, err) => done({ code: e ? Number(e.code) : 0, out, err }));
      });
    for (const env of [{ ...process.env, GLIBC_TUNABLES: undefined }, { ...process.env, GLIBC_TUNABLES: 'glibc.malloc.hugetlb=0' }]) {
      const help = await run(['--help'], env);
      expect(help.code).toBe(0);
      expect(help.out).toContain('tessellab analyze');
      // The batch summary (with the error in its row) goes to a scratch folder, not the checkout.
      const bad = await run(['analyze', join(ROOT, 'no-such-image.png'), '--out', mkdtempSync(join(tmpdir(), 'tessellab-huge-'))], env);
      expect(bad.code).toBe(1);
      expect(bad.err).toContain('does not exist');
    }
  });
});
