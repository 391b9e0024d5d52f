/**
 * The session store in IndexedDB, shared by the page and the worker (so it lives outside both). The page
 * keeps the light records (entries: names, settings, edit history, status; the session: selection, layers,
 * theme); the worker keeps the heavy ones (image bytes, results, base labels), so large structured clones
 * never run on the page.
 */
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { Analysis } from '../core/analysis.types';
import type { LabelImage } from '../core/types';
import type { Settings } from '../core/settings';
import type { EditOp } from '../core/edit/labels';

export const DB_NAME = 'tessellab';
export const DB_VERSION = 1;

/** Where an entry stands. */
export type EntryStatus = 'queued' | 'opening' | 'analysing' | 'done' | 'error' | 'frame';

/** The page's record of one image in the list. */
export interface StoredEntry {
  id: string;
  name: string;
  kind: 'image' | 'points';
  /** Position in the list. */
  order: number;
  settings: Settings;
  ops: EditOp[];
  redo: EditOp[];
  status: EntryStatus;
  error: string | null;
  width: number;
  height: number;
  umPerPxFromFile: number | null;
  /** Cell count of the last result (shown in the list before the result is restored). */
  count: number | null;
  /** The cells are a kinetics series' final mosaic (kept as they are: never segmented again). */
  fromMosaic?: boolean;
  /** A frame of a kinetics series, not analysed on its own. */
  frame?: boolean;
}

/** Layers of the Bench. */
export interface Layers {
  outlines: boolean;
  centroids: boolean;
  voronoi: boolean;
  delaunay: boolean;
  ids: boolean;
  gap: boolean;
}

export interface StoredSession {
  key: 'session';
  selectedId: string | null;
  layers: Layers;
  theme: 'light' | 'dark' | null;
  panel: string;
  /** True once the demo has been added, so that removing it is respected after a reload. */
  demoAdded: boolean;
  /** The Kinetics panel's choices, and whether a series had been run (it is run again after a reload). */
  kinetics?: StoredKinetics;
}

/** The Kinetics panel's choices as stored with the session. */
export interface StoredKinetics {
  source: 'images' | 'pages';
  chosen: string[];
  pagesOf: string | null;
  timesKind: 'list' | 'names' | 'csv';
  timesText: string;
  csvText: string;
  csvName: string | null;
  timeUnit: string;
  manualThreshold: boolean;
  threshold: number;
  phase: 'auto' | 'bright' | 'dark';
  fitMin: number;
  fitMax: number;
  incubation: boolean;
  method: 'nonlinear' | 'avrami-plot';
  allowDecreasing: boolean;
  ran: boolean;
}

export interface TessellabDb extends DBSchema {
  entries: { key: string; value: StoredEntry };
  session: { key: string; value: StoredSession };
  images: { key: string; value: { id: string; name: string; bytes: Uint8Array } };
  results: { key: string; value: { id: string; analysis: Analysis } };
  base: { key: string; value: { id: string; labels: LabelImage } };
}

let dbPromise: Promise<IDBPDatabase<TessellabDb>> | null = null;

/** Opens (once per realm) the session database, creating its stores on first use. */
export function openSessionDb(): Promise<IDBPDatabase<TessellabDb>> {
  if (!dbPromise) {
    dbPromise = openDB<TessellabDb>(DB_NAME, DB_VERSION, {
      upgrade(db) {
        db.createObjectStore('entries', { keyPath: 'id' });
        db.createObjectStore('session', { keyPath: 'key' });
        db.createObjectStore('images', { keyPath: 'id' });
        db.createObjectStore('results', { keyPath: 'id' });
        db.createObjectStore('base', { keyPath: 'id' });
      },
    });
  }
  return dbPromise;
}

/** Forgets the cached connection (tests open a fresh fake database each time). */
export function resetSessionDbForTests(): void {
  dbPromise = null;
}

/** All stored entries in list order. */
export async function loadEntries(): Promise<StoredEntry[]> {
  const db = await openSessionDb();
  const all = await db.getAll('entries');
  return all.sort((a, b) => a.order - b.order);
}

export async function saveEntry(e: StoredEntry): Promise<void> {
  const db = await openSessionDb();
  await db.put('entries', e);
}

export async function deleteEntry(id: string): Promise<void> {
  const db = await openSessionDb();
  await db.delete('entries', id);
}

export async function loadSession(): Promise<StoredSession | null> {
  const db = await openSessionDb();
  return (await db.get('session', 'session')) ?? null;
}

export async function saveSession(s: StoredSession): Promise<void> {
  const db = await openSessionDb();
  await db.put('session', s);
}

/**
 * Stores an image's bytes (the page does it when the image is added, before anything else happens to it,
 * so that a reload never finds an entry without its file; the worker when it is given bytes to open).
 */
export async function saveImage(id: string, name: string, bytes: Uint8Array): Promise<void> {
  const db = await openSessionDb();
  await db.put('images', { id, name, bytes });
}
