/**
 * The sample images' manifest (sample-images/manifest.json) read into a list, the demo first: each image's
 * file name, pixel size and settings. Pure, so that the build's precomputed demo result (scripts/
 * make-demo-result.ts) reads the demo's settings exactly as the page does.
 */
import type { Settings } from '../core/settings';

export interface SampleItem { name: string; umPerPx: number | null; settings?: Partial<Settings> }

type ManifestItem = Record<string, unknown>;

function items(m: unknown): ManifestItem[] {
  if (Array.isArray(m)) return m as ManifestItem[];
  if (m && typeof m === 'object') {
    const o = m as Record<string, unknown>;
    for (const k of ['images', 'files', 'samples', 'entries']) if (Array.isArray(o[k])) return o[k] as ManifestItem[];
  }
  return [];
}

function num(v: unknown): number | null {
  return typeof v === 'number' && Number.isFinite(v) && v > 0 ? v : null;
}

/** The manifest's images, the demo first (its `demo` name, or an item marked `demo: true`). */
export function manifestSamples(manifest: unknown): SampleItem[] {
  const demo = manifest && typeof manifest === 'object' && typeof (manifest as { demo?: unknown }).demo === 'string' ? (manifest as { demo: string }).demo : null;
  const out: SampleItem[] = [];
  for (const it of items(manifest)) {
    const file = String(it.file ?? it.name ?? it.path ?? '').split('/').pop() as string;
    if (!file) continue;
    const fromCommand = /--pattern\s+(walls|bodies)/.exec(String(it.command ?? ''))?.[1];
    const p = it.pattern ?? fromCommand;
    const pattern = p === 'walls' || p === 'bodies' || p === 'points' ? p : undefined;
    const settings = (it.settings && typeof it.settings === 'object' ? (it.settings as Partial<Settings>) : pattern ? ({ pattern } as Partial<Settings>) : undefined);
    const d: SampleItem = { name: file, umPerPx: num(it.umPerPx) ?? num(it.um_per_px) ?? num(it.pixelSizeUm), settings };
    if (it.demo === true || demo === file) out.unshift(d); else out.push(d);
  }
  return out;
}

/** The file name of the precomputed demo result in the built app (beside index.html; vite.config.ts writes it). */
export const DEMO_RESULT_FILE = 'demo-result.bin';
