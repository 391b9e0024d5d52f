/**
 * The worker's records in the session store (src/storage/db.ts): each image's bytes, its last result and
 * its base labels (before edits), so that a reload or a restarted worker finds them again.
 */
import type { Analysis } from '../src/core/analysis.types';
import type { LabelImage } from '../src/core/types';
import { openSessionDb, saveImage } from '../src/storage/db';

export const storeImage = saveImage;

/** The stored copy of an image, or null when there is none. */
export async function storedImage(id: string): Promise<{ name: string; bytes: Uint8Array } | null> {
  const rec = await (await openSessionDb()).get('images', id);
  return rec ? { name: rec.name, bytes: rec.bytes } : null;
}

export async function storeResult(id: string, analysis: Analysis): Promise<void> {
  await (await openSessionDb()).put('results', { id, analysis });
}

export async function storedResult(id: string): Promise<Analysis | null> {
  return (await (await openSessionDb()).get('results', id))?.analysis ?? null;
}

export async function storeBase(id: string, labels: LabelImage): Promise<void> {
  await (await openSessionDb()).put('base', { id, labels });
}

export async function storedBase(id: string): Promise<LabelImage | null> {
  return (await (await openSessionDb()).get('base', id))?.labels ?? null;
}

/** Deletes every record of an image. */
export async function forgetStored(id: string): Promise<void> {
  const db = await openSessionDb();
  await Promise.all([db.delete('images', id), db.delete('results', id), db.delete('base', id)]);
}
