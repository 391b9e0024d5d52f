/**
 * How many CPUs this process may use, as a batch job on a shared machine or a cluster node sees it: not the
 * machine's core count, but the smaller of
 *
 * - its CPU affinity: `os.availableParallelism()`, which on Linux is the number of CPUs in the process's
 *   affinity mask (libuv's uv_available_parallelism calls sched_getaffinity; `taskset`, `numactl`, Slurm's
 *   task/affinity and cgroup cpusets all set that mask), elsewhere the core count;
 * - its CPU quota (Linux cgroups, as container runtimes and Slurm set it): cgroup v2 `cpu.max` ("quota
 *   period", or "max" for none), cgroup v1 `cpu.cfs_quota_us` / `cpu.cfs_period_us` (-1 for none), read
 *   for the process's own cgroup (from /proc/self/cgroup, under the mount point found in
 *   /proc/self/mountinfo) and each of its ancestors, the tightest one winning. A quota of 1.5 CPUs
 *   counts as 2 threads: over a batch, two threads throttled to 1.5 CPUs still do more than one.
 *
 * The parsers are pure and take the files' text; {@link allowedCpus} reads them.
 */
import { readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { posix } from 'node:path';

/** CPUs in a Linux CPU list such as "0-3,8,10-11" (7); null when the text is not such a list. */
export function parseCpuList(text: string): number | null {
  const t = text.trim();
  if (t === '') return null;
  let n = 0;
  for (const part of t.split(',')) {
    const m = /^(\d+)(?:-(\d+))?$/.exec(part.trim());
    if (!m) return null;
    const a = Number(m[1]);
    const b = m[2] === undefined ? a : Number(m[2]);
    if (b < a) return null;
    n += b - a + 1;
  }
  return n;
}

/** CPUs granted by a cgroup v2 `cpu.max` ("150000 100000" -> 1.5); null for "max" (no quota) or bad text. */
export function parseCpuMax(text: string): number | null {
  const [quota, period] = text.trim().split(/\s+/);
  if (quota === undefined || quota === 'max') return null;
  return ratio(quota, period ?? '100000');
}

/** CPUs granted by cgroup v1 `cpu.cfs_quota_us` and `cpu.cfs_period_us`; null for -1 (no quota) or bad text. */
export function parseCfsQuota(quotaText: string, periodText: string): number | null {
  return ratio(quotaText.trim(), periodText.trim());
}

function ratio(quota: string, period: string): number | null {
  const q = Number(quota);
  const p = Number(period);
  if (!/^\d+$/.test(quota) || !/^\d+$/.test(period) || q <= 0 || p <= 0) return null;
  return q / p;
}

/** The process's cgroup paths from /proc/self/cgroup: the v2 one ("0::/path") and the v1 one of the cpu controller. */
export function parseProcCgroup(text: string): { v2: string | null; v1cpu: string | null } {
  let v2: string | null = null;
  let v1cpu: string | null = null;
  for (const line of text.split('\n')) {
    const m = /^(\d+):([^:]*):(.*)$/.exec(line.trim());
    if (!m) continue;
    if (m[1] === '0' && m[2] === '') v2 = m[3]!;
    else if (m[2]!.split(',').includes('cpu')) v1cpu = m[3]!;
  }
  return { v2, v1cpu };
}

export interface CgroupMount {
  /** Where the hierarchy is mounted. */
  mountPoint: string;
  /** The cgroup path that the mount point shows (a container sees its own cgroup as "/"). */
  root: string;
}

/** The cgroup2 mount and the cgroup v1 mount of the cpu controller, from /proc/self/mountinfo. */
export function parseMountInfo(text: string): { v2: CgroupMount | null; v1cpu: CgroupMount | null } {
  let v2: CgroupMount | null = null;
  let v1cpu: CgroupMount | null = null;
  for (const line of text.split('\n')) {
    const sep = line.indexOf(' - ');
    if (sep < 0) continue;
    const before = line.slice(0, sep).split(' ');
    const [fsType, , superOptions = ''] = line.slice(sep + 3).split(' ');
    const root = unescapeMount(before[3] ?? '/');
    const mountPoint = unescapeMount(before[4] ?? '');
    if (fsType === 'cgroup2' && !v2) v2 = { mountPoint, root };
    else if (fsType === 'cgroup' && !v1cpu && superOptions.split(',').includes('cpu')) v1cpu = { mountPoint, root };
  }
  return { v2, v1cpu };
}

/** mountinfo writes space, tab, newline and backslash in paths as octal escapes. */
function unescapeMount(s: string): string {
  return s.replace(/\\([0-7]{3})/g, (_, o: string) => String.fromCharCode(parseInt(o, 8)));
}

/**
 * The folders to read a quota from: the process's cgroup under the mount point and each ancestor up to the
 * mount point itself (a limit on a parent binds its children).
 */
export function cgroupDirs(mount: CgroupMount, cgroupPath: string): string[] {
  let rel = cgroupPath;
  if (mount.root !== '/') rel = cgroupPath.startsWith(`${mount.root}/`) ? cgroupPath.slice(mount.root.length) : '/';
  const dirs: string[] = [];
  let p = posix.normalize(`/${rel}`);
  for (;;) {
    dirs.push(p === '/' ? mount.mountPoint : posix.join(mount.mountPoint, p));
    if (p === '/') break;
    p = posix.dirname(p);
  }
  return dirs;
}

/** Reads a file's text, or null when it cannot be read. */
export type ReadText = (path: string) => string | null;

const readText: ReadText = (path) => {
  try {
    return readFileSync(path, 'utf8');
  } catch {
    return null;
  }
};

/** The tightest CPU quota over the process's cgroups (v2, else v1), or null when there is none or it cannot be read. */
export function cgroupCpuQuota(read: ReadText = readText): number | null {
  const cg = read('/proc/self/cgroup');
  const mi = read('/proc/self/mountinfo');
  if (cg === null || mi === null) return null;
  const paths = parseProcCgroup(cg);
  const mounts = parseMountInfo(mi);
  let best: number | null = null;
  const take = (q: number | null) => {
    if (q !== null && (best === null || q < best)) best = q;
  };
  if (mounts.v2 && paths.v2 !== null) {
    for (const d of cgroupDirs(mounts.v2, paths.v2)) {
      const t = read(`${d}/cpu.max`);
      if (t !== null) take(parseCpuMax(t));
    }
  }
  if (best === null && mounts.v1cpu && paths.v1cpu !== null) {
    for (const d of cgroupDirs(mounts.v1cpu, paths.v1cpu)) {
      const q = read(`${d}/cpu.cfs_quota_us`);
      const p = read(`${d}/cpu.cfs_period_us`);
      if (q !== null && p !== null) take(parseCfsQuota(q, p));
    }
  }
  return best;
}

export interface AllowedCpus {
  /** Whole CPUs the process may use: at least 1. */
  count: number;
  /** CPUs in the affinity mask. */
  affinity: number;
  /** CPUs of the cgroup quota, or null for none. */
  quota: number | null;
}

/** The CPUs this process may use: the affinity mask, limited by a cgroup CPU quota (rounded up), at least 1. */
export function allowedCpus(affinity = availableParallelism(), quota: number | null = process.platform === 'linux' ? cgroupCpuQuota() : null): AllowedCpus {
  const a = Math.max(1, Math.floor(affinity));
  const count = quota === null ? a : Math.max(1, Math.min(a, Math.ceil(quota - 1e-9)));
  return { count, affinity: a, quota };
}
