/** Output files of the command line: the folder is created if missing; an unwritable one is a clear error. */
import { access, constants, mkdir, writeFile } from 'node:fs/promises';
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

export async function writeOut(dir: string, name: string, data: string | Uint8Array): Promise<void> {
  try {
    await writeFile(join(dir, name), data);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new SettingsError(`Cannot write ${join(dir, name)} (${code ?? 'error'}); check the folder's permissions or free space.`);
  }
}
