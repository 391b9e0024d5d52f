/** A small in-memory cache of random-seeding references, keyed by everything a reference depends on. */
import type { Reference, ReferenceOptions } from './montecarlo';

/** How many references the cache keeps (least recently used dropped first; each is a few hundred kB). */
export const REFERENCE_CACHE_SIZE = 8;
const cache = new Map<string, Reference>();

/** Empties the reference cache (for memory, or to time a cold run). */
export function clearReferenceCache(): void {
  cache.clear();
}

function cacheKey(o: ReferenceOptions): string {
  const f = o.field;
  const minArea = o.minCellAreaPx && o.minCellAreaPx > 0 ? o.minCellAreaPx : 0;
  const key = [o.cells, f.x0, f.y0, f.x1, f.y1, o.replicates, o.seed, o.edgeRule, minArea, o.layout ?? 'seeds', o.density ?? null];
  return JSON.stringify(o.mask ? [...key, o.mask.key] : key);
}

/** The cached reference for these options (reported to onProgress as done), or null. */
export function cachedReferenceFor(opts: ReferenceOptions): Reference | null {
  const key = cacheKey(opts);
  const hit = cache.get(key);
  if (!hit) return null;
  cache.delete(key);
  cache.set(key, hit);
  opts.onProgress?.(1);
  return hit;
}

/** Freezes a reference drawn for these options and keeps it in the cache; returns it. */
export function rememberReference(opts: ReferenceOptions, ref: Reference): Reference {
  Object.freeze(ref.options.field);
  Object.freeze(ref.options);
  Object.freeze(ref.warnings);
  Object.freeze(ref);
  cache.set(cacheKey(opts), ref);
  while (cache.size > REFERENCE_CACHE_SIZE) cache.delete(cache.keys().next().value!);
  return ref;
}

