/**
 * The web app's state: the list of images (entries), the selection, the Bench's layers and tools, and the
 * session kept in IndexedDB. Work for the worker goes through the job queue (jobs.svelte.ts); an entry is
 * entry.svelte.ts; the Kinetics panel's state is kinetics.svelte.ts. Components read and call this; they
 * hold no state of their own beyond what they draw.
 */
import { resolveSettings, type Settings } from '../../core/settings';
import type { EditOp } from '../../core/edit/labels';
import type { Rect } from '../../core/types';
import { KineticsState } from './kinetics.svelte';
import { Bridge, errorKind, errorMessage } from '../bridge';
import {
  deleteEntry, loadEntries, loadSession, saveEntry, saveImage, saveSession, type Layers, type StoredEntry, type StoredKinetics,
} from '../../storage/db';
import { Entry, newId, type Mode } from './entry.svelte';
import { JobQueue } from './jobs.svelte';
import { panelOf, type PanelName, type Tool } from './panels';

export { Entry, WEB_MAX_PIXELS, parseBarLength, parsePixelSize } from './entry.svelte';
export { PANELS, type PanelName, type Tool } from './panels';

/** What the demo loader gives: the demo image, its settings and its result made ahead of time. */
export type DemoLoader = () => Promise<{ name: string; bytes: Uint8Array; umPerPx: number | null; settings?: Partial<Settings>; result?: Uint8Array | null } | null>;

export class AppState {
  entries = $state<Entry[]>([]);
  selectedId = $state<string | null>(null);
  /** Selected cells (ids of the current result of the selected entry). */
  selectedCells = $state.raw<number[]>([]);
  hoverCell = $state<number | null>(null);
  layers = $state<Layers>({ outlines: true, centroids: true, voronoi: true, delaunay: false, ids: false, gap: false });
  tool = $state<Tool>('pan');
  panel = $state<PanelName>('results');
  theme = $state<'light' | 'dark' | null>(null);
  helpOpen = $state(false);
  cvStatus = $state<'idle' | 'loading' | 'ready' | 'error'>('idle');
  cvFraction = $state(0);
  /** A page-wide message (worker restarted, storage unavailable). */
  banner = $state<string | null>(null);
  /** The last scale line drawn on the Bench (px), waiting for its length. */
  scaleLine = $state.raw<{ x0: number; y0: number; x1: number; y1: number } | null>(null);
  /** Message about the current edit (shown in the Cells panel). */
  editMessage = $state<string | null>(null);
  /** Asks the Bench to centre on a cell. */
  focusRequest = $state.raw<{ cell: number; n: number } | null>(null);
  ready = $state(false);
  demoAdded = false;

  readonly bridge: Bridge;
  /** The Kinetics panel's choices and last run. */
  readonly kinetics: KineticsState;
  /** The work waiting for the worker, one entry at a time. */
  readonly queue: JobQueue;
  private saveTimer: ReturnType<typeof setTimeout> | null = null;

  constructor(makeWorker: () => Worker) {
    this.bridge = new Bridge(makeWorker, {
      onCrash: (m) => { this.banner = m; this.cvStatus = 'idle'; },
      onCvProgress: (f) => { this.cvFraction = f; if (f >= 1) this.cvStatus = 'ready'; },
    });
    this.kinetics = new KineticsState(this);
    this.queue = new JobQueue(this);
  }

  get selected(): Entry | null {
    return this.entries.find((e) => e.id === this.selectedId) ?? null;
  }

  /** Fetches the demo image (the app's own), kept for an entry whose stored copy was never written. */
  private demoLoader: DemoLoader | null = null;

  /**
   * Restores the stored session, or adds the demo on a first visit. The engine is not loaded yet: stored
   * results, and the demo's result made ahead of time, come first (see the job queue).
   */
  async init(demo: DemoLoader): Promise<void> {
    this.demoLoader = demo;
    let stored: StoredEntry[] = [];
    let kinetics: StoredKinetics | undefined;
    try {
      const s = await loadSession();
      if (s) {
        this.layers = s.layers;
        this.theme = s.theme;
        this.panel = panelOf(s.panel);
        this.demoAdded = s.demoAdded;
        this.selectedId = s.selectedId;
        kinetics = s.kinetics;
      }
      stored = await loadEntries();
    } catch {
      this.banner = 'This browser does not let Tessellab keep the session (IndexedDB is unavailable); results are lost on reload.';
    }
    for (const r of stored) {
      const e = new Entry(r.id, r.name);
      e.kind = r.kind; e.order = r.order; e.settings = r.settings; e.ops = r.ops; e.redo = r.redo;
      e.width = r.width; e.height = r.height; e.umPerPxFromFile = r.umPerPxFromFile; e.storedCount = r.count; e.fromMosaic = r.fromMosaic ?? false;
      e.frame = r.frame ?? false;
      e.status = e.frame ? 'frame' : r.status === 'error' ? 'error' : 'queued';
      e.error = r.error;
      this.entries.push(e);
      if (!e.frame && (r.status !== 'error' || r.width > 0)) this.request(e, 'restore');
    }
    if (kinetics) this.kinetics.restore(kinetics);
    if (!this.entries.some((e) => e.id === this.selectedId)) this.selectedId = this.entries[0]?.id ?? null;
    if (!this.demoAdded && this.entries.length === 0) {
      try {
        const d = await demo();
        if (d) {
          this.demoAdded = true;
          this.addBytes(d.name, d.bytes, d.settings, d.result ?? null);
        }
      } catch (err) {
        this.banner = `The demo image could not be loaded (${err instanceof Error ? err.message : String(err)}); drop your own images to start.`;
      }
    }
    this.ready = true;
    this.persistSession();
    // The last kinetics series is run again once the images are back (its frames are stored).
    if (kinetics?.ran) void this.queue.whenIdle().then(() => this.kinetics.rerun());
  }

  warmUp(): void {
    if (this.cvStatus === 'loading' || this.cvStatus === 'ready') return;
    this.cvStatus = 'loading';
    this.bridge.warmUp().then(
      () => { this.cvStatus = 'ready'; },
      (e: unknown) => { this.cvStatus = errorKind(e) === 'Cancelled' ? 'idle' : 'error'; },
    );
  }

  /** Adds files (dropped, picked or pasted); each becomes an entry and is analysed in turn. */
  async addFiles(files: Iterable<File>, asFrames = false): Promise<Entry[]> {
    const out: Entry[] = [];
    for (const f of files) {
      const bytes = new Uint8Array(await f.arrayBuffer());
      out.push(asFrames ? this.addFrame(f.name || 'pasted image', bytes) : this.addBytes(f.name || 'pasted image', bytes));
    }
    return out;
  }

  /** A new entry whose bytes are being stored, before anything else happens to it (a reload then finds them). */
  private newEntry(id: string, name: string, bytes: Uint8Array): Entry {
    const e = new Entry(id, name);
    e.bytes = bytes;
    e.stored = saveImage(id, name, bytes).then(() => true, () => false);
    e.order = this.entries.length ? Math.max(...this.entries.map((x) => x.order)) + 1 : 0;
    return e;
  }

  /** Adds a frame of a kinetics series: kept and opened for the series, not analysed on its own. */
  addFrame(name: string, bytes: Uint8Array): Entry {
    const e = this.newEntry(newId(), name, bytes);
    e.frame = true;
    e.status = 'frame';
    this.entries.push(e);
    this.save(e);
    this.persistSession();
    return this.entries[this.entries.length - 1]!;
  }

  /** Analyses a frame of a series as an image of its own. */
  unframe(e: Entry): void {
    if (!e.frame) return;
    e.frame = false;
    e.status = 'queued';
    this.request(e, 'segment', undefined, true);
    this.save(e);
  }

  /**
   * Adds an image (with settings of its own, e.g. a sample's; else those of the image on the Bench) and
   * analyses it; `packed` is a result made ahead of time for it, taken when it fits.
   */
  addBytes(name: string, bytes: Uint8Array, settings?: Partial<Settings>, packed: Uint8Array | null = null): Entry {
    const e = this.newEntry(newId(), name, bytes);
    e.packed = packed;
    // New images start from the settings of the one on the Bench, so a batch is analysed alike.
    const from = this.selected;
    if (from) {
      const s = $state.snapshot(from.settings) as Settings;
      s.field = null;
      // The pixel size is per image: its own tags, or what the person sets ("Use this scale for all images").
      s.umPerPx = null;
      e.settings = s;
    }
    if (settings) Object.assign(e.settings, settings);
    if (/\.(csv|txt)$/i.test(name)) { e.kind = 'points'; e.settings.pattern = 'points'; }
    this.entries.push(e);
    if (!this.selectedId || this.entries.length === 1) this.selectedId = e.id;
    this.request(e, 'segment');
    this.save(e);
    this.persistSession();
    return this.entries[this.entries.length - 1]!;
  }

  /** A fresh entry id (for an entry whose labels the worker prepares before it is added). */
  newEntryId(): string {
    return newId();
  }

  /**
   * Adds an image whose labels the worker already holds under `id` (the final mosaic of a kinetics series)
   * and measures those labels rather than segmenting the image.
   */
  addPrepared(id: string, name: string, bytes: Uint8Array, settings: Partial<Settings>): Entry {
    const e = this.newEntry(id, name, bytes);
    e.fromMosaic = true;
    Object.assign(e.settings, settings);
    this.entries.push(e);
    this.request(e, 'measure');
    this.save(e);
    this.persistSession();
    return this.entries[this.entries.length - 1]!;
  }

  select(id: string): void {
    if (this.selectedId === id) return;
    this.selectedId = id;
    this.selectedCells = [];
    this.hoverCell = null;
    this.scaleLine = null;
    this.editMessage = null;
    this.persistSession();
    // A frame is not analysed, but the Bench shows its image.
    const e = this.selected;
    if (e?.frame && !e.opened) void this.queue.openEntry(e).catch((err: unknown) => { e.error = errorMessage(err); });
  }

  /** Selects a cell; additive keeps the earlier selection (for merging two). */
  selectCell(cell: number | null, additive = false, focus = false): void {
    if (cell === null) { this.selectedCells = []; return; }
    if (additive) {
      const s = this.selectedCells.includes(cell) ? this.selectedCells.filter((c) => c !== cell) : [...this.selectedCells, cell];
      this.selectedCells = s.slice(-2);
    } else this.selectedCells = [cell];
    if (focus) this.focusRequest = { cell, n: (this.focusRequest?.n ?? 0) + 1 };
  }

  async removeEntry(id: string): Promise<void> {
    const i = this.entries.findIndex((e) => e.id === id);
    if (i < 0) return;
    const e = this.entries.splice(i, 1)[0]!;
    this.queue.drop(id);
    e.bitmap?.close();
    if (this.selectedId === id) this.selectedId = this.entries[Math.min(i, this.entries.length - 1)]?.id ?? null;
    await deleteEntry(id).catch(() => undefined);
    await this.bridge.forget(id).catch(() => undefined);
    this.persistSession();
  }

  /** Settings changed: segment again (clears edits) or only re-measure (scale). */
  changed(e: Entry, what: 'segment' | 'measure'): void {
    if (what === 'segment' && e.fromMosaic) {
      // Segmenting the frame again would replace the mosaic the series grew: keep it, say so.
      e.notice = 'These cells are the final mosaic of the kinetics series, so detection settings do not change them: edit cells in the Cells panel, or run the series again with other settings.';
      what = 'measure';
    }
    if (what === 'segment' && e.ops.length) {
      e.notice = `${e.ops.length} edit${e.ops.length > 1 ? 's were' : ' was'} cleared by the new detection.`;
      e.ops = [];
      e.redo = [];
    }
    if (e.status === 'error' && !e.opened) return;
    this.request(e, e.result || what === 'segment' ? what : 'segment', undefined, true);
    this.save(e);
  }

  /** Live preview while a slider moves (downscaled; the full run follows on release). */
  async previewNow(e: Entry): Promise<void> {
    if (!e.opened || e.kind !== 'image') return;
    let s: Settings;
    try { s = resolveSettings(e.effectiveSettings()); } catch { return; }
    const r = await this.bridge.preview(e.id, s);
    if (r) { e.preview?.outlines?.close(); e.preview = r; }
  }

  /** Applies a label edit to the selected entry and re-measures; a failed edit is rolled back. */
  edit(op: EditOp): void {
    const e = this.selected;
    if (!e || !e.result?.overlay.runs) return;
    this.editMessage = null;
    const before = e.ops;
    const beforeRedo = e.redo;
    e.ops = [...e.ops, op];
    e.redo = [];
    this.selectedCells = [];
    this.request(e, 'measure', () => { e.ops = before; e.redo = beforeRedo; }, true);
    this.save(e);
  }

  undo(): void {
    const e = this.selected;
    if (!e || e.ops.length === 0) return;
    const op = e.ops[e.ops.length - 1]!;
    e.ops = e.ops.slice(0, -1);
    e.redo = [...e.redo, op];
    this.selectedCells = [];
    this.request(e, 'measure', undefined, true);
    this.save(e);
  }

  redoEdit(): void {
    const e = this.selected;
    if (!e || e.redo.length === 0) return;
    const op = e.redo[e.redo.length - 1]!;
    e.redo = e.redo.slice(0, -1);
    e.ops = [...e.ops, op];
    this.selectedCells = [];
    this.request(e, 'measure', undefined, true);
    this.save(e);
  }

  /** Re-analyses every entry with the selected entry's detection settings (its own pixel size kept). */
  applyToAll(): void {
    const from = this.selected;
    if (!from) return;
    for (const e of this.entries) {
      if (e === from || e.kind !== from.kind || e.frame) continue;
      const s = $state.snapshot(from.settings) as Settings;
      s.umPerPx = e.settings.umPerPx;
      s.field = e.settings.field;
      e.settings = s;
      this.changed(e, 'segment');
    }
  }

  /** Stops all work at once (the worker is terminated and restarts on the next request). */
  cancel(): void {
    this.queue.clear();
    this.bridge.cancelAll();
    this.cvStatus = 'idle';
  }

  get busy(): boolean {
    return this.entries.some((e) => e.status === 'opening' || e.status === 'analysing') || this.kinetics.running;
  }

  private request(e: Entry, mode: Mode, onFail?: () => void, front = false): void {
    this.queue.request(e, mode, onFail, front);
  }

  /** Opens an entry's file in the worker (once), e.g. a frame for the Kinetics panel. */
  openEntry(e: Entry): Promise<void> {
    return this.queue.openEntry(e);
  }

  /** The demo image's bytes when `name` is the demo's, else null (also when it cannot be fetched). */
  async demoBytes(name: string): Promise<Uint8Array | null> {
    try {
      const d = await this.demoLoader?.();
      return d && d.name === name ? d.bytes : null;
    } catch {
      return null;
    }
  }

  setField(e: Entry, r: Rect | null): void {
    e.settings.field = r;
    this.changed(e, 'segment');
  }

  /** Computes the grain size of an entry's current result once (the Grain size panel calls it). */
  async rateGrains(e: Entry): Promise<void> {
    const r = e.result;
    if (!r || e.grain?.of === r) return;
    e.grain = { of: r, value: null, error: null };
    try {
      const g = await this.bridge.grain(e.id);
      if (e.result === r) e.grain = { of: r, value: g, error: null };
    } catch (err) {
      if (e.result === r) e.grain = { of: r, value: null, error: errorMessage(err) };
    }
  }

  /** Re-runs the analysis of an entry (after an error or a cancel). */
  retry(e: Entry): void {
    e.error = null;
    e.notice = null;
    this.request(e, e.result || e.fromMosaic ? 'measure' : 'segment', undefined, true);
  }

  /** Records an entry in the session store, always after its bytes (a reload never finds one without the other). */
  save(e: Entry): void {
    const write = (): void => {
      if (!this.entries.includes(e)) return;
      saveEntry(e.toStored()).catch(() => {
        this.banner = 'The session could not be saved (storage full or blocked); results stay on screen until you reload.';
      });
    };
    if (e.stored) void e.stored.then(write); else write();
  }

  persistSession(): void {
    if (this.saveTimer) clearTimeout(this.saveTimer);
    this.saveTimer = setTimeout(() => {
      saveSession({
        key: 'session', selectedId: this.selectedId, layers: $state.snapshot(this.layers) as Layers,
        theme: this.theme, panel: this.panel, demoAdded: this.demoAdded, kinetics: this.kinetics.toStored(),
      }).catch(() => undefined);
    }, 200);
  }
}
