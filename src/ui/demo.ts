/**
 * The demo shown on first visit: an image from sample-images/ (made by the project's own generator),
 * with the pixel size and pattern its manifest gives, and the demo's result precomputed at build time by
 * the same pipeline (scripts/make-demo-result.ts), shown before the engine has loaded.
 */
import type { Settings } from '../core/settings';
import { DEMO_RESULT_FILE, manifestSamples } from './samples';

const urls = import.meta.glob('../../sample-images/*.{png,tif,tiff,jpg,jpeg,csv}', { query: '?url', import: 'default', eager: true }) as Record<string, string>;
const manifests = import.meta.glob('../../sample-images/manifest.json', { import: 'default', eager: true }) as Record<string, unknown>;

export interface DemoImage { name: string; url: string; umPerPx: number | null; settings?: Partial<Settings> }

/** The sample images with their manifest data, the demo first. */
export function sampleImages(): DemoImage[] {
  const byName = new Map<string, string>();
  for (const [path, url] of Object.entries(urls)) byName.set(path.split('/').pop() as string, url);
  const out: DemoImage[] = [];
  for (const it of manifestSamples(Object.values(manifests)[0])) {
    const url = byName.get(it.name);
    if (url) out.push({ ...it, url });
  }
  for (const [name, url] of byName) if (!out.some((d) => d.name === name) && !name.endsWith('.csv')) out.push({ name, url, umPerPx: null });
  return out;
}

export interface LoadedSample {
  name: string;
  bytes: Uint8Array;
  umPerPx: number | null;
  settings?: Partial<Settings>;
  /** The demo's precomputed result (packed, src/app/snapshot.ts), or null where the build has none. */
  result?: Uint8Array | null;
}

/** The demo's precomputed result, or null (the development server has none; the worker checks it fits). */
async function demoResult(): Promise<Uint8Array | null> {
  try {
    const res = await fetch(new URL(DEMO_RESULT_FILE, document.baseURI));
    if (!res.ok) return null;
    const b = new Uint8Array(await res.arrayBuffer());
    return b.length > 2 && b[0] === 0x1f && b[1] === 0x8b ? b : null;
  } catch {
    return null;
  }
}

/** Fetches a sample image by name (same origin), or the demo, with its precomputed result, when no name is given. */
export async function loadDemo(name?: string): Promise<LoadedSample | null> {
  const all = sampleImages();
  const d = name ? all.find((x) => x.name === name) : all[0];
  if (!d) return null;
  const [res, result] = await Promise.all([fetch(d.url), name ? Promise.resolve(null) : demoResult()]);
  if (!res.ok) throw new Error(`${d.name}: HTTP ${res.status}`);
  return { name: d.name, bytes: new Uint8Array(await res.arrayBuffer()), umPerPx: d.umPerPx, settings: d.settings, result };
}
