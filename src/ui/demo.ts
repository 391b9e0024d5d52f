/**
 * The demo shown on first visit: an image from sample-images/ (made by the project's own generator),
 * with the pixel size and pattern its manifest gives.
 */
import type { Settings } from '../core/settings';

const urls = import.meta.glob('../../sample-images/*.{png,tif,tiff,jpg,jpeg,csv}', { query: '?url', import: 'default', eager: true }) as Record<string, string>;
const manifests = import.meta.glob('../../sample-images/manifest.json', { import: 'default', eager: true }) as Record<string, unknown>;

export interface DemoImage { name: string; url: string; umPerPx: number | null; settings?: Partial<Settings> }

type ManifestItem = Record<string, unknown>;

function items(): ManifestItem[] {
  const m = Object.values(manifests)[0] as unknown;
  if (Array.isArray(m)) return m as ManifestItem[];
  if (m && typeof m === 'object') {
    const o = m as Record<string, unknown>;
    for (const k of ['images', 'files', 'samples', 'entries']) if (Array.isArray(o[k])) return o[k] as ManifestItem[];
  }
  return [];
}

function demoName(): string | null {
  const m = Object.values(manifests)[0] as Record<string, unknown> | undefined;
  return m && typeof m.demo === 'string' ? m.demo : null;
}

function num(v: unknown): number | null {
  return typeof v === 'number' && Number.isFinite(v) && v > 0 ? v : null;
}

/** The sample images with their manifest data, the demo first. */
export function sampleImages(): DemoImage[] {
  const byName = new Map<string, string>();
  for (const [path, url] of Object.entries(urls)) byName.set(path.split('/').pop() as string, url);
  const out: DemoImage[] = [];
  for (const it of items()) {
    const file = String(it.file ?? it.name ?? it.path ?? '').split('/').pop() as string;
    const url = byName.get(file);
    if (!url) continue;
    const fromCommand = /--pattern\s+(walls|bodies)/.exec(String(it.command ?? ''))?.[1];
    const p = it.pattern ?? fromCommand;
    const pattern = p === 'walls' || p === 'bodies' || p === 'points' ? p : undefined;
    const settings = (it.settings && typeof it.settings === 'object' ? (it.settings as Partial<Settings>) : pattern ? ({ pattern } as Partial<Settings>) : undefined);
    const d: DemoImage = { name: file, url, umPerPx: num(it.umPerPx) ?? num(it.um_per_px) ?? num(it.pixelSizeUm), settings };
    if (it.demo === true || demoName() === file) out.unshift(d); else out.push(d);
  }
  for (const [name, url] of byName) if (!out.some((d) => d.name === name) && !name.endsWith('.csv')) out.push({ name, url, umPerPx: null });
  return out;
}

export interface LoadedSample { name: string; bytes: Uint8Array; umPerPx: number | null; settings?: Partial<Settings> }

/** Fetches a sample image by name (same origin), or the demo when no name is given. */
export async function loadDemo(name?: string): Promise<LoadedSample | null> {
  const all = sampleImages();
  const d = name ? all.find((x) => x.name === name) : all[0];
  if (!d) return null;
  const res = await fetch(d.url);
  if (!res.ok) throw new Error(`${d.name}: HTTP ${res.status}`);
  return { name: d.name, bytes: new Uint8Array(await res.arrayBuffer()), umPerPx: d.umPerPx, settings: d.settings };
}
