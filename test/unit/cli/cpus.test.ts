/**
 * The CPUs a process may use (src/node/cpus.ts), checked against the formats of the Linux interfaces it reads
 * and against outside tools on this machine:
 * - CPU lists ("0-3,8") as in cpuset(7) "FORMATS" (the List format);
 * - cgroup v2 `cpu.max` ("$MAX $PERIOD", "max" for no limit, default "max 100000") as in the kernel's
 *   Documentation/admin-guide/cgroup-v2.rst; cgroup v1 `cpu.cfs_quota_us` (-1 for none) and
 *   `cpu.cfs_period_us` as in Documentation/scheduler/sched-bwc.rst; /proc/self/cgroup
 *   ("hierarchy-ID:controller-list:cgroup-path", "0::/path" for v2) as in cgroups(7); /proc/self/mountinfo
 *   fields as in proc(5) — all recalled from memory of those documents;
 * - the affinity against GNU coreutils' `nproc` (which counts sched_getaffinity's CPUs), and under
 *   util-linux's `taskset -c 0`, which pins a process to one CPU.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import {
  allowedCpus, cgroupCpuQuota, cgroupDirs, parseCfsQuota, parseCpuList, parseCpuMax, parseMountInfo, parseProcCgroup,
} from '../../../src/node/cpus';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');

describe('parsers of the Linux CPU interfaces', () => {
  it('CPU lists', () => {
    expect(parseCpuList('0-3,8,10-11\n')).toBe(7);
    expect(parseCpuList('5')).toBe(1);
    expect(parseCpuList('0-1')).toBe(2);
    expect(parseCpuList('')).toBeNull();
    expect(parseCpuList('3-1')).toBeNull();
    expect(parseCpuList('ff')).toBeNull();
  });

  it('cgroup v2 cpu.max and cgroup v1 CFS quota', () => {
    expect(parseCpuMax('max 100000\n')).toBeNull();
    expect(parseCpuMax('200000 100000\n')).toBe(2);
    expect(parseCpuMax('150000 100000')).toBe(1.5);
    expect(parseCpuMax('50000')).toBe(0.5); // the period defaults to 100000
    expect(parseCpuMax('garbage')).toBeNull();
    expect(parseCfsQuota('-1\n', '100000\n')).toBeNull();
    expect(parseCfsQuota('400000\n', '100000\n')).toBe(4);
    expect(parseCfsQuota('25000', '50000')).toBe(0.5);
  });

  it('/proc/self/cgroup: the v2 path and the v1 path of the cpu controller', () => {
    expect(parseProcCgroup('0::/user.slice/job_42/step_0\n')).toEqual({ v2: '/user.slice/job_42/step_0', v1cpu: null });
    expect(parseProcCgroup('12:pids:/\n4:cpu,cpuacct:/slurm/uid_1/job_7\n1:name=systemd:/\n')).toEqual({ v2: null, v1cpu: '/slurm/uid_1/job_7' });
    expect(parseProcCgroup('4:cpuacct:/a\n3:cpuset:/b\n')).toEqual({ v2: null, v1cpu: null });
  });

  it('/proc/self/mountinfo: the cgroup2 mount and the v1 cpu mount, with octal escapes', () => {
    const text = [
      '22 1 0:21 / /sys rw,nosuid - sysfs sysfs rw',
      '30 22 0:27 / /sys/fs/cgroup rw - tmpfs tmpfs rw,mode=755',
      '31 30 0:28 /docker/abc /sys/fs/cgroup/cpu,cpuacct rw,relatime - cgroup cgroup rw,cpu,cpuacct',
      '35 30 0:32 / /sys/fs/cgroup/cpuset rw - cgroup cgroup rw,cpuset',
      '40 22 0:40 / /mnt/with\\040space rw shared:1 - cgroup2 cgroup2 rw',
    ].join('\n');
    expect(parseMountInfo(text)).toEqual({
      v2: { mountPoint: '/mnt/with space', root: '/' },
      v1cpu: { mountPoint: '/sys/fs/cgroup/cpu,cpuacct', root: '/docker/abc' },
    });
  });

  it('a cgroup and its ancestors under the mount point', () => {
    expect(cgroupDirs({ mountPoint: '/sys/fs/cgroup', root: '/' }, '/a/b')).toEqual(['/sys/fs/cgroup/a/b', '/sys/fs/cgroup/a', '/sys/fs/cgroup']);
    // A container that sees its own cgroup as the mount's root.
    expect(cgroupDirs({ mountPoint: '/sys/fs/cgroup/cpu', root: '/docker/abc' }, '/docker/abc')).toEqual(['/sys/fs/cgroup/cpu']);
    expect(cgroupDirs({ mountPoint: '/sys/fs/cgroup/cpu', root: '/docker/abc' }, '/docker/abc/x')).toEqual(['/sys/fs/cgroup/cpu/x', '/sys/fs/cgroup/cpu']);
    expect(cgroupDirs({ mountPoint: '/sys/fs/cgroup', root: '/' }, '/')).toEqual(['/sys/fs/cgroup']);
  });

  it('the tightest quota over the cgroup and its ancestors (v2), as a Slurm job step would have it', () => {
    const files: Record<string, string> = {
      '/proc/self/cgroup': '0::/system.slice/slurmstepd.scope/job_9/step_0\n',
      '/proc/self/mountinfo': '30 22 0:27 / /sys/fs/cgroup rw - cgroup2 cgroup2 rw\n',
      '/sys/fs/cgroup/system.slice/slurmstepd.scope/job_9/step_0/cpu.max': 'max 100000\n',
      '/sys/fs/cgroup/system.slice/slurmstepd.scope/job_9/cpu.max': '300000 100000\n',
      '/sys/fs/cgroup/system.slice/cpu.max': '800000 100000\n',
    };
    expect(cgroupCpuQuota((p) => files[p] ?? null)).toBe(3);
    expect(cgroupCpuQuota((p) => (p.endsWith('cpu.max') ? 'max 100000' : files[p] ?? null))).toBeNull();
    expect(cgroupCpuQuota((p) => (p === '/sys/fs/cgroup/cpu.max' ? '200000 100000' : files[p] ?? null))).toBe(2);
    expect(cgroupCpuQuota(() => null)).toBeNull();
  });

  it('affinity limited by the quota, rounded up, at least one', () => {
    expect(allowedCpus(16, null)).toEqual({ count: 16, affinity: 16, quota: null });
    expect(allowedCpus(16, 4)).toMatchObject({ count: 4 });
    expect(allowedCpus(16, 1.5)).toMatchObject({ count: 2 });
    expect(allowedCpus(2, 8)).toMatchObject({ count: 2 });
    expect(allowedCpus(4, 0.2)).toMatchObject({ count: 1 });
  });
});

describe.runIf(process.platform === 'linux')('on this machine', () => {
  it('the affinity is what nproc counts', () => {
    const nproc = Number(execFileSync('nproc', { env: { ...process.env, OMP_NUM_THREADS: '', OMP_THREAD_LIMIT: '' } }).toString().trim());
    expect(allowedCpus().affinity).toBe(nproc);
  });

  it.runIf(existsSync('/usr/bin/taskset'))('a process pinned to one CPU with taskset may use one', () => {
    const script = `import('${resolve(ROOT, 'src/node/cpus.ts')}').then((m) => console.log(m.allowedCpus().count))`;
    const out = execFileSync('taskset', ['-c', '0', process.execPath, '--import', 'tsx', '-e', script], { cwd: ROOT }).toString().trim();
    expect(out).toBe('1');
  });
});
