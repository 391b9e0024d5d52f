/**
 * Inflating zlib data (RFC 1950 / 1951) with a bound on the output: PNG image data and TIFF Deflate strips
 * say in their headers how many bytes they decode to, and a "decompression bomb" (a small file whose data
 * inflates to gigabytes) is stopped as soon as its output passes that promise, before the rest is inflated.
 */
import { Unzlib } from 'fflate';

/** Compressed bytes handed to the inflater at a time: Deflate expands at most about 1032 : 1, so one step
 * makes at most about 16 MiB before the bound is checked again. */
const STEP = 16 * 1024;

class Overflow extends Error {}

/**
 * The result of a bounded inflation: the bytes (when kept), their count, or `overflow` when the output
 * passed the limit (inflation stopped there), or `error` with the inflater's reason for a damaged stream.
 */
export type Inflated =
  | { ok: true; bytes: Uint8Array | null; length: number }
  | { ok: false; overflow: true }
  | { ok: false; overflow: false; error: string };

/**
 * Inflates zlib data given in one or more pieces (PNG's IDAT chunks), stopping once the output passes `limit`
 * bytes.
 *
 * @param parts the zlib stream, in order
 * @param limit the most bytes the output may have
 * @param keep whether to return the bytes (TIFF strips) or only count them (a check before another decoder)
 */
export function inflateBounded(parts: readonly Uint8Array[], limit: number, keep: boolean): Inflated {
  const chunks: Uint8Array[] = [];
  let length = 0;
  let done = false;
  const z = new Unzlib((chunk, final) => {
    length += chunk.length;
    if (length > limit) throw new Overflow();
    if (keep && chunk.length > 0) chunks.push(chunk);
    if (final) done = true;
  });
  try {
    for (const part of parts) {
      for (let at = 0; at < part.length && !done; at += STEP) z.push(part.subarray(at, Math.min(part.length, at + STEP)), false);
      if (done) break;
    }
    if (!done) z.push(new Uint8Array(0), true);
  } catch (e) {
    if (e instanceof Overflow) return { ok: false, overflow: true };
    return { ok: false, overflow: false, error: e instanceof Error ? e.message : String(e) };
  }
  if (!keep) return { ok: true, bytes: null, length };
  if (chunks.length === 1) return { ok: true, bytes: chunks[0]!, length };
  const out = new Uint8Array(length);
  let at = 0;
  for (const c of chunks) { out.set(c, at); at += c.length; }
  return { ok: true, bytes: out, length };
}
