/**
 * Output files of the command line. The folder is created if missing; an unwritable one is a clear error.
 *
 * Every file is written whole or not at all: its bytes go to a temporary name in the same folder
 * (`.NAME.HOST.PID.N.tmp`, hidden), are flushed to the disk, and the file is then renamed over NAME, which
 * replaces it in one step on POSIX file systems. A process killed at any moment leaves NAME as it was
 * before or as it is after, never half written; at worst a temporary file is left, which a stop by
 * SIGINT, SIGTERM or SIGHUP removes ({@link removeUnfinished}) and which is otherwise safe to delete.
 */
import { access, constants, mkdir, open, rename, unlink } from 'node:fs/promises';
import { unlinkSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { SettingsError } from '../core/errors';

export async function ensureOutDir(dir: string): Promise<void> {
  try {
    await mkdir(dir, { recursive: true });
    await access(dir, constants.W_OK);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new SettingsError(`Cannot write to the output folder ${dir} (${code ?? 'error'}); choose another with --out.`);
  }
}

/** Temporary files being written now, removed if the process is stopped by a signal. */
const unfinished = new Set<string>();
let counter = 0;

/** A temporary name beside `name`, unique to this host, process and write. */
function temporaryName(name: string): string {
  const host = hostname().replace(/[^\w-]/g, '').slice(0, 32) || 'host';
  return `.${name.slice(0, 120)}.${host}.${process.pid}.${counter++}.tmp`;
}

/** Writes `data` to dir/name atomically (see the module's comment). */
export async function writeOut(dir: string, name: string, data: string | Uint8Array): Promise<void> {
  const tmp = join(dir, temporaryName(name));
  unfinished.add(tmp);
  try {
    const fh = await open(tmp, 'wx');
    try {
      await fh.writeFile(data);
      await fh.sync();
    } finally {
      await fh.close();
    }
    await rename(tmp, join(dir, name));
  } catch (e) {
    await unlink(tmp).catch(() => undefined);
    const code = (e as NodeJS.ErrnoException).code;
    throw new SettingsError(`Cannot write ${join(dir, name)} (${code ?? 'error'}); check the folder's permissions or free space.`);
  } finally {
    unfinished.delete(tmp);
  }
}

/** Removes dir/name if it is there. */
export async function removeOut(dir: string, name: string): Promise<void> {
  try {
    await unlink(join(dir, name));
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code !== 'ENOENT') throw new SettingsError(`Cannot remove the earlier ${join(dir, name)} (${code ?? 'error'}); check the folder's permissions.`);
  }
}

/** Removes the temporary files of writes still under way (synchronously: called as the process stops). */
export function removeUnfinished(): void {
  for (const t of unfinished) {
    try {
      unlinkSync(t);
    } catch {
      // already renamed or never created
    }
  }
  unfinished.clear();
}

const SIGNALS = { SIGINT: 2, SIGTERM: 15, SIGHUP: 1 } as const;

/**
 * While `work` runs, a stop by SIGINT, SIGTERM or SIGHUP (Ctrl-C, a scheduler's time limit) removes the
 * temporary files of unfinished writes and ends the process with 128 + the signal's number.
 */
export async function withCleanStop<T>(work: () => Promise<T>): Promise<T> {
  const handlers = Object.entries(SIGNALS).map(([sig, n]) => {
    const h = () => {
      removeUnfinished();
      process.stderr.write(`tessellab: stopped by ${sig}; the files written so far are whole, the rest were not started.\n`);
      process.exit(128 + n);
    };
    process.on(sig, h);
    return [sig, h] as const;
  });
  try {
    return await work();
  } finally {
    for (const [sig, h] of handlers) process.off(sig, h);
  }
}
