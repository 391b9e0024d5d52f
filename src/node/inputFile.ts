/**
 * Reading an input file of the command line: only a regular file is read, and only up to a size that an
 * image or a points file can have. /dev/zero, /dev/urandom, a named pipe (FIFO), a socket or a terminal would
 * otherwise be read for ever, or block the whole batch waiting for a writer.
 */
import { constants } from 'node:fs';
import { open } from 'node:fs/promises';
import { MissingError, SettingsError } from '../core/errors';

/** The largest input file read, in bytes (2 GiB less one: also the most one read of Node's gives). */
export const MAX_INPUT_BYTES = 2 ** 31 - 1;

/**
 * The bytes of an input file. The file is opened without blocking (a FIFO without a writer would block a
 * plain open), checked to be a regular file of at most {@link MAX_INPUT_BYTES}, and read to the size it had
 * when opened.
 *
 * @param path the file's path
 * @param name the name put at the start of every message (default: the path)
 * @throws SettingsError, one line naming the file: missing, a folder, not a regular file, too large, unreadable
 */
export async function readInputFile(path: string, name = path): Promise<Uint8Array> {
  let fh;
  try {
    fh = await open(path, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new MissingError(`${name} does not exist; check the path.`);
    throw new SettingsError(
      code === 'EISDIR' ? `${name} is a folder, not an image.`
          : code === 'EACCES' || code === 'EPERM' ? `${name} cannot be read (permission denied); check the file's permissions.`
            : `${name} cannot be read (${code ?? 'error'}); check the path.`,
    );
  }
  try {
    const st = await fh.stat();
    if (st.isDirectory()) throw new SettingsError(`${name} is a folder, not an image.`);
    if (!st.isFile()) {
      const kind = st.isFIFO() ? 'a pipe' : st.isCharacterDevice() || st.isBlockDevice() ? 'a device' : st.isSocket() ? 'a socket' : 'not a regular file';
      throw new SettingsError(`${name} is ${kind}, not a file; save the image to a file and give that file.`);
    }
    if (st.size > MAX_INPUT_BYTES) {
      throw new SettingsError(`${name} is ${(st.size / 2 ** 30).toFixed(1)} GiB, more than the ${MAX_INPUT_BYTES / 2 ** 30 | 0} GiB read from one file; crop or split it first.`);
    }
    const bytes = new Uint8Array(st.size);
    let at = 0;
    while (at < bytes.length) {
      const { bytesRead } = await fh.read(bytes, at, bytes.length - at, at);
      if (bytesRead === 0) break;
      at += bytesRead;
    }
    return at === bytes.length ? bytes : bytes.subarray(0, at);
  } catch (e) {
    if (e instanceof SettingsError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new SettingsError(`${name} cannot be read (${code ?? 'error'}); check the file.`);
  } finally {
    await fh.close();
  }
}
