import 'fake-indexeddb/auto';
import { describe, it, expect } from 'vitest';
import { loadEntries, saveEntry, deleteEntry, loadSession, saveSession, type StoredEntry } from '../../../src/storage/db';
import { defaultSettings } from '../../../src/core/settings';

function entry(id: string, order: number): StoredEntry {
  return { id, name: `${id}.png`, kind: 'image', order, settings: defaultSettings(), ops: [{ kind: 'remove', cell: 3 }], redo: [], status: 'done', error: null, width: 10, height: 20, umPerPxFromFile: 0.5, count: 42 };
}

describe('session store', () => {
  it('keeps entries in list order with their settings and edit history', async () => {
    await saveEntry(entry('b', 2));
    await saveEntry(entry('a', 1));
    const all = await loadEntries();
    expect(all.map((e) => e.id)).toEqual(['a', 'b']);
    // The whole record comes back as it was stored: settings, edit history and all.
    expect(all[0]).toEqual(entry('a', 1));
    expect(all[1]).toEqual(entry('b', 2));
    await deleteEntry('a');
    expect((await loadEntries()).map((e) => e.id)).toEqual(['b']);
  });
  it('keeps the session record', async () => {
    expect(await loadSession()).toBeNull();
    await saveSession({ key: 'session', selectedId: 'b', layers: { outlines: true, centroids: false, voronoi: true, delaunay: false, ids: false, gap: true }, theme: 'dark', panel: 'cells', demoAdded: true });
    expect((await loadSession())?.layers.gap).toBe(true);
  });
});
