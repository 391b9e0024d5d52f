/**
 * An analysis packed into bytes and back, so that a result made ahead of time (the demo's, at build time,
 * by the same pipeline) can be shown before the engine has loaded. The plain parts go as JSON, every typed
 * array into one binary block, and the whole is gzipped. Pure: no DOM, no file system (Web Crypto for the
 * image's digest, which Node and browsers both have).
 */
import { gunzipSync, gzipSync } from 'fflate';
import type { Analysis } from '../core/analysis.types';
import { resolveSettings, type Settings, type SettingsInput } from '../core/settings';
import type { GreyImage } from '../core/types';
import { calibrated } from './calibration';

/** What a packed analysis was made from: the image (name, size, digest of its grey pixels). */
export interface SnapshotSource {
  name: string;
  width: number;
  height: number;
  /** SHA-256 (hex) of the grey image's pixel bytes. */
  greySha256: string;
}

const MAGIC = 'tessellab-analysis';
const VERSION = 1;

type Typed = Int8Array | Uint8Array | Uint8ClampedArray | Int16Array | Uint16Array | Int32Array | Uint32Array | Float32Array | Float64Array;
const TYPED: Record<string, new (b: ArrayBuffer, o: number, n: number) => Typed> = {
  Int8Array, Uint8Array, Uint8ClampedArray, Int16Array, Uint16Array, Int32Array, Uint32Array, Float32Array, Float64Array,
};

/** SHA-256 (hex) of a grey image's pixel bytes. */
export async function greyDigest(img: GreyImage): Promise<string> {
  const d = img.data;
  const bytes = new Uint8Array(d.buffer, d.byteOffset, d.byteLength);
  const h = new Uint8Array(await crypto.subtle.digest('SHA-256', bytes.slice()));
  return Array.from(h, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Packs an analysis with its source into gzipped bytes. */
export function packAnalysis(a: Analysis, source: SnapshotSource): Uint8Array {
  const blocks: Typed[] = [];
  let size = 0;
  const json = JSON.stringify({ magic: MAGIC, version: VERSION, source, analysis: a }, function (this: unknown, _k, v: unknown) {
    if (typeof v === 'number' && !Number.isFinite(v)) return { $num: String(v) };
    if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
      const t = v as Typed;
      const name = t.constructor.name;
      if (!(name in TYPED)) throw new Error(`packAnalysis: cannot pack a ${name}`);
      size = Math.ceil(size / 8) * 8;
      const ref = { $typed: name, offset: size, length: t.length };
      blocks.push(t);
      size += t.byteLength;
      return ref;
    }
    if (v instanceof Map || v instanceof Set) throw new Error('packAnalysis: maps and sets are not packed');
    return v;
  });
  const head = new TextEncoder().encode(json);
  const start = Math.ceil((8 + head.length) / 8) * 8;
  const out = new Uint8Array(start + size);
  const view = new DataView(out.buffer);
  view.setUint32(0, head.length, true);
  out.set(head, 8);
  let off = 0;
  for (const t of blocks) {
    off = Math.ceil(off / 8) * 8;
    out.set(new Uint8Array(t.buffer, t.byteOffset, t.byteLength), start + off);
    off += t.byteLength;
  }
  return gzipSync(out, { level: 6 });
}

/**
 * The analysis and its source from packed bytes.
 * @throws Error when the bytes are not a packed analysis of this version
 */
export function unpackAnalysis(bytes: Uint8Array): { analysis: Analysis; source: SnapshotSource } {
  if (bytes.length < 2 || bytes[0] !== 0x1f || bytes[1] !== 0x8b) throw new Error('not a packed analysis (no gzip header)');
  const raw = gunzipSync(bytes);
  const view = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
  const n = view.getUint32(0, true);
  const start = Math.ceil((8 + n) / 8) * 8;
  // One aligned copy of the binary block, which every typed array views.
  const body = raw.slice(start).buffer;
  const parsed = JSON.parse(new TextDecoder().decode(raw.subarray(8, 8 + n)), (_k, v: unknown) => {
    if (v && typeof v === 'object' && '$num' in v) return Number((v as { $num: string }).$num);
    if (v && typeof v === 'object' && '$typed' in v) {
      const r = v as { $typed: string; offset: number; length: number };
      const C = TYPED[r.$typed];
      if (!C) throw new Error(`not a packed analysis (unknown array ${r.$typed})`);
      const per = (C as unknown as { BYTES_PER_ELEMENT: number }).BYTES_PER_ELEMENT;
      return new C(body.slice(r.offset, r.offset + r.length * per), 0, r.length);
    }
    return v;
  }) as { magic: string; version: number; source: SnapshotSource; analysis: Analysis };
  if (parsed.magic !== MAGIC || parsed.version !== VERSION) throw new Error('not a packed analysis of this version');
  return { analysis: parsed.analysis, source: parsed.source };
}

/**
 * Whether a packed analysis is what analysing `image` (named `name`, with the file's pixel size) with these
 * settings would give: the same image, pixel for pixel, and the same settings once the pixel size is chosen.
 */
export async function snapshotMatches(
  packed: { analysis: Analysis; source: SnapshotSource },
  name: string,
  image: GreyImage,
  fileUmPerPx: number | null,
  settings: SettingsInput | Settings,
): Promise<boolean> {
  const s = packed.source;
  if (s.name !== name || s.width !== image.width || s.height !== image.height) return false;
  const want = calibrated(resolveSettings(settings as SettingsInput), fileUmPerPx).settings;
  if (JSON.stringify(want) !== JSON.stringify(packed.analysis.settings)) return false;
  return (await greyDigest(image)) === s.greySha256;
}
