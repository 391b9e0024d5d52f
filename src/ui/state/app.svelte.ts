/**
 * The web app's state: the list of images (entries), the selection, the Bench's layers and tools, and the
 * job queue that sends work to the worker through the bridge. Components read and call this; they hold no
 * state of their own beyond what they draw.
 */
import { defaultSettings, resolveSettings, type Settings } from '../../core/settings';
import type { EditOp } from '../../core/edit/labels';
import type { Rect } from '../../core/types';
import type { AnalysisResult, GrainResult, PreviewResult } from '../../../workers/protocol';
import { KineticsState } from './kinetics.svelte';
import { Bridge, errorKind, errorMessage } from '../bridge';
import { calibrated } from '../../app/calibration';
import {
  deleteEntry, loadEntries, loadSession, saveEntry, saveSession, type EntryStatus, type Layers, type StoredEntry,
} from '../../storage/db';

/** The largest image the web app opens, in pixels (the command line allows more). */
export const WEB_MAX_PIXELS = 64_000_000;

export type Tool = 'pan' | 'scale' | 'field' | 'split';
export type PanelName = 'scale' | 'detect' | 'cells' | 'randomness' | 'grain' | 'kinetics' | 'export';
export const PANELS: { name: PanelName; label: string; key: string }[] = [
  { name: 'scale', label: 'Scale', key: '1' },
  { name: 'detect', label: 'Detect', key: '2' },
  { name: 'cells', label: 'Cells', key: '3' },
  { name: 'randomness', label: 'Randomness', key: '4' },
  { name: 'grain', label: 'Grain size', key: '5' },
  { name: 'kinetics', label: 'Kinetics', key: '6' },
  { name: 'export', label: 'Export', key: '7' },
];

type Mode = 'restore' | 'segment' | 'measure';

/** The notice of an entry whose run was cancelled. */
const CANCELLED_NOTICE = 'Cancelled. Change a setting or press Analyse to run it again.';

let nextId = 0;
function newId(): string {
  return `${Date.now().toString(36)}-${(nextId++).toString(36)}-${Math.random().toString(36).slice(2, 8)}`;
}

/**
 * A positive length as typed (a decimal comma allowed): the number, or an error message for the Scale
 * panel naming the quantity and its unit.
 */
function parsePositive(text: string, name: string, unit: string): { value: number } | { error: string } {
  const t = text.trim().replace(',', '.');
  if (t === '') return { error: `Type a ${name} in ${unit}, e.g. 0.5.` };
  const v = Number(t);
  if (!Number.isFinite(v)) return { error: `"${text}" is not a number; type the ${name} in ${unit}, e.g. 0.5.` };
  if (v <= 0) return { error: `The ${name} must be above 0 ${unit}; got ${v}.` };
  return { value: v };
}

/** Pixel size as typed: a positive finite number, or an error message for the Scale panel. */
export function parsePixelSize(text: string): { value: number } | { error: string } {
  return parsePositive(text, 'pixel size', 'µm per pixel');
}

/** Length of a scale bar as typed (µm): a positive finite number, or an error message for the Scale panel. */
export function parseBarLength(text: string): { value: number } | { error: string } {
  return parsePositive(text, 'scale bar length', 'µm');
}

/** One image (or point set) in the list. */
export class Entry {
  readonly id: string;
  name = $state('');
  kind = $state<'image' | 'points'>('image');
  order = 0;
  status = $state<EntryStatus>('queued');
  stage = $state('');
  fraction = $state(0);
  /** What went wrong with this entry (shown beside it); earlier results stay. */
  error = $state<string | null>(null);
  /** A note that is not an error (e.g. edits cleared by a new detection). */
  notice = $state<string | null>(null);
  /** Whether the notice is the one of a cancelled run (the list then offers to analyse again). */
  get cancelled(): boolean {
    return this.notice === CANCELLED_NOTICE;
  }
  width = $state(0);
  height = $state(0);
  umPerPxFromFile = $state<number | null>(null);
  /** Pages in the file (a multi-page TIFF can be a kinetics series); 1 until opened. */
  pages = $state(1);
  settings = $state<Settings>(defaultSettings());
  ops = $state.raw<EditOp[]>([]);
  redo = $state.raw<EditOp[]>([]);
  bitmap = $state.raw<ImageBitmap | null>(null);
  thumb = $state.raw<ImageBitmap | null>(null);
  result = $state.raw<AnalysisResult | null>(null);
  preview = $state.raw<PreviewResult | null>(null);
  /** Grain size of `result` (computed when the Grain size panel asks), or its error. */
  grain = $state.raw<{ of: AnalysisResult; value: GrainResult | null; error: string | null } | null>(null);
  storedCount = $state<number | null>(null);
  /** The cells are a kinetics series' final mosaic: they are measured, edited and exported, never segmented again. */
  fromMosaic = false;
  /** File bytes until the worker has stored them. */
  bytes: Uint8Array | null = null;
  opened = false;
  /** The opening in progress, shared by everyone who needs the file open. */
  opening: Promise<void> | null = null;

  constructor(id: string, name: string) {
    this.id = id;
    this.name = name;
  }

  /** Cell count of the current result (or of the stored one before it is restored). */
  get count(): number | null {
    const a = this.result?.analysis;
    if (a) return a.tessellation.points.length / 2;
    return this.storedCount;
  }

  /** The settings sent to the worker: a plain copy, the file's pixel size used when none was typed. */
  effectiveSettings(): Settings {
    return calibrated($state.snapshot(this.settings) as Settings, this.umPerPxFromFile).settings;
  }

  toStored(): StoredEntry {
    return {
      id: this.id, name: this.name, kind: this.kind, order: this.order,
      settings: $state.snapshot(this.settings) as Settings, ops: this.ops, redo: this.redo,
      status: this.status === 'done' || this.status === 'error' ? this.status : 'queued',
      error: this.error, width: this.width, height: this.height, umPerPxFromFile: this.umPerPxFromFile,
      count: this.count, fromMosaic: this.fromMosaic,
    };
  }
}

interface Job { mode: Mode; onFail?: () => void }

export class AppState {
  entries = $state<Entry[]>([]);
  selectedId = $state<string | null>(null);
  /** Selected cells (ids of the current result of the selected entry). */
  selectedCells = $state.raw<number[]>([]);
  hoverCell = $state<number | null>(null);
  layers = $state<Layers>({ outlines: true, centroids: true, voronoi: true, delaunay: false, ids: false, gap: false });
  tool = $state<Tool>('pan');
  panel = $state<PanelName>('detect');
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
  private jobs = new Map<string, Job>();
  private active: string | null = null;
  private saveTimer: ReturnType<typeof setTimeout> | null = null;

  constructor(makeWorker: () => Worker) {
    this.bridge = new Bridge(makeWorker, {
      onCrash: (m) => { this.banner = m; this.cvStatus = 'idle'; },
      onCvProgress: (f) => { this.cvFraction = f; if (f >= 1) this.cvStatus = 'ready'; },
    });
    this.kinetics = new KineticsState(this);
  }

  get selected(): Entry | null {
    return this.entries.find((e) => e.id === this.selectedId) ?? null;
  }

  /** Fetches the demo image (the app's own), kept for an entry whose stored copy was never written. */
  private demoLoader: (() => Promise<{ name: string; bytes: Uint8Array } | null>) | null = null;

  /** Restores the stored session, or adds the demo on a first visit. */
  async init(demo: () => Promise<{ name: string; bytes: Uint8Array; umPerPx: number | null; settings?: Partial<Settings> } | null>): Promise<void> {
    this.demoLoader = demo;
    this.warmUp();
    let stored: StoredEntry[] = [];
    try {
      const s = await loadSession();
      if (s) {
        this.layers = s.layers;
        this.theme = s.theme;
        this.panel = (s.panel as PanelName) ?? 'detect';
        this.demoAdded = s.demoAdded;
        this.selectedId = s.selectedId;
      }
      stored = await loadEntries();
    } catch {
      this.banner = 'This browser does not let Tessellab keep the session (IndexedDB is unavailable); results are lost on reload.';
    }
    for (const r of stored) {
      const e = new Entry(r.id, r.name);
      e.kind = r.kind; e.order = r.order; e.settings = r.settings; e.ops = r.ops; e.redo = r.redo;
      e.width = r.width; e.height = r.height; e.umPerPxFromFile = r.umPerPxFromFile; e.storedCount = r.count; e.fromMosaic = r.fromMosaic ?? false;
      e.status = r.status === 'error' ? 'error' : 'queued';
      e.error = r.error;
      this.entries.push(e);
      if (r.status !== 'error' || r.width > 0) this.request(e, 'restore');
    }
    if (!this.entries.some((e) => e.id === this.selectedId)) this.selectedId = this.entries[0]?.id ?? null;
    if (!this.demoAdded && this.entries.length === 0) {
      try {
        const d = await demo();
        if (d) {
          this.demoAdded = true;
          const e = this.addBytes(d.name, d.bytes);
          if (d.settings) Object.assign(e.settings, d.settings);
        }
      } catch (err) {
        this.banner = `The demo image could not be loaded (${err instanceof Error ? err.message : String(err)}); drop your own images to start.`;
      }
    }
    this.ready = true;
    this.persistSession();
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
  async addFiles(files: Iterable<File>): Promise<void> {
    for (const f of files) {
      const bytes = new Uint8Array(await f.arrayBuffer());
      this.addBytes(f.name || 'pasted image', bytes);
    }
  }

  addBytes(name: string, bytes: Uint8Array): Entry {
    const e = new Entry(newId(), name);
    e.bytes = bytes;
    e.order = this.entries.length ? Math.max(...this.entries.map((x) => x.order)) + 1 : 0;
    // New images start from the settings of the one on the Bench, so a batch is analysed alike.
    const from = this.selected;
    if (from) {
      const s = $state.snapshot(from.settings) as Settings;
      s.field = null;
      // The pixel size is per image: its own tags, or what the person sets ("Use this scale for all images").
      s.umPerPx = null;
      e.settings = s;
    }
    if (/\.(csv|txt)$/i.test(name)) { e.kind = 'points'; e.settings.pattern = 'points'; }
    this.entries.push(e);
    if (!this.selectedId || this.entries.length === 1) this.selectedId = e.id;
    this.request(e, 'segment');
    this.save(e);
    this.persistSession();
    return this.entries[this.entries.length - 1];
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
    const e = new Entry(id, name);
    e.bytes = bytes;
    e.fromMosaic = true;
    e.order = this.entries.length ? Math.max(...this.entries.map((x) => x.order)) + 1 : 0;
    Object.assign(e.settings, settings);
    this.entries.push(e);
    this.request(e, 'measure');
    this.save(e);
    this.persistSession();
    return this.entries[this.entries.length - 1];
  }

  select(id: string): void {
    if (this.selectedId === id) return;
    this.selectedId = id;
    this.selectedCells = [];
    this.hoverCell = null;
    this.scaleLine = null;
    this.editMessage = null;
    this.persistSession();
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
    const [e] = this.entries.splice(i, 1);
    this.jobs.delete(id);
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
    const op = e.ops[e.ops.length - 1];
    e.ops = e.ops.slice(0, -1);
    e.redo = [...e.redo, op];
    this.selectedCells = [];
    this.request(e, 'measure', undefined, true);
    this.save(e);
  }

  redoEdit(): void {
    const e = this.selected;
    if (!e || e.redo.length === 0) return;
    const op = e.redo[e.redo.length - 1];
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
      if (e === from || e.kind !== from.kind) continue;
      const s = $state.snapshot(from.settings) as Settings;
      s.umPerPx = e.settings.umPerPx;
      s.field = e.settings.field;
      e.settings = s;
      this.changed(e, 'segment');
    }
  }

  /** Stops all work at once (the worker is terminated and restarts on the next request). */
  cancel(): void {
    this.jobs.clear();
    this.bridge.cancelAll();
    this.cvStatus = 'idle';
  }

  get busy(): boolean {
    return this.entries.some((e) => e.status === 'opening' || e.status === 'analysing');
  }

  setField(e: Entry, r: Rect | null): void {
    e.settings.field = r;
    this.changed(e, 'segment');
  }

  private request(e: Entry, mode: Mode, onFail?: () => void, front = false): void {
    const prev = this.jobs.get(e.id);
    if (prev && prev.mode === 'segment' && mode !== 'segment') mode = 'segment';
    if (front) this.jobs.delete(e.id);
    this.jobs.set(e.id, { mode, onFail });
    if (front) {
      const rest = [...this.jobs].filter(([k]) => k !== e.id);
      this.jobs = new Map([[e.id, { mode, onFail }], ...rest]);
    }
    if (this.active === e.id) this.bridge.analyzeCancel(e.id);
    else if (e.status !== 'done' && e.status !== 'error') e.status = 'queued';
    void this.pump();
  }

  private async pump(): Promise<void> {
    if (this.active) return;
    const next = this.jobs.entries().next();
    if (next.done) return;
    const [id, job] = next.value;
    this.jobs.delete(id);
    const e = this.entries.find((x) => x.id === id);
    if (!e) { void this.pump(); return; }
    this.active = id;
    try {
      await this.run(e, job);
    } finally {
      this.active = null;
      void this.pump();
    }
  }

  private async run(e: Entry, job: Job): Promise<void> {
    let mode = job.mode;
    const hadResult = e.result !== null;
    try {
      if (!e.opened || !this.bridge.isOpen(e.id)) {
        e.status = 'opening';
        e.stage = 'Reading the file';
        await this.openEntry(e);
      }
      if (mode === 'restore') {
        e.stage = 'Restoring the result';
        const r = await this.bridge.restore(e.id);
        if (r) { this.accept(e, r); return; }
        // A mosaic's labels are kept by the worker: measure them again rather than segment the frame.
        mode = e.fromMosaic ? 'measure' : 'segment';
      }
      e.status = 'analysing';
      e.stage = 'Starting';
      e.fraction = 0;
      // The entry's own pixel size (or none): the worker falls back to the file's and records which it used.
      const settings = resolveSettings($state.snapshot(e.settings) as Settings);
      const r = await this.bridge.analyze(
        { id: e.id, settings, ops: e.ops, reuseLabels: mode === 'measure' },
        (stage, fraction) => { e.stage = stage; e.fraction = fraction; },
      );
      this.accept(e, r);
      if (mode !== 'measure') e.preview = null;
    } catch (err) {
      const kind = errorKind(err);
      if (kind === 'Superseded') return;
      job.onFail?.();
      const msg = errorMessage(err);
      if (kind === 'Cancelled') {
        e.status = e.result ? 'done' : 'queued';
        e.notice = CANCELLED_NOTICE;
        e.stage = '';
      } else if (job.onFail && e.result) {
        // A failed edit: the earlier result stays, the message goes beside the edit buttons.
        this.editMessage = msg;
        e.status = 'done';
      } else {
        e.status = hadResult ? 'done' : 'error';
        e.error = msg;
      }
    } finally {
      this.save(e);
    }
  }

  private accept(e: Entry, r: AnalysisResult): void {
    e.result?.overlay.outlines?.close();
    e.result?.overlay.outlinesThumb?.close();
    e.result = r;
    e.status = 'done';
    e.error = null;
    e.stage = '';
    e.fraction = 1;
    e.storedCount = r.analysis.tessellation.points.length / 2;
  }

  /**
   * Opens an entry's file in the worker (once: a second caller waits for the same opening), e.g. for the
   * Kinetics panel, which needs the frames before their own analyses have come up in the queue.
   */
  openEntry(e: Entry): Promise<void> {
    if (e.opened && this.bridge.isOpen(e.id)) return Promise.resolve();
    if (e.opening) return e.opening;
    const p = (async () => {
      const first = !e.opened;
      let r: Awaited<ReturnType<Bridge['open']>>;
      try {
        r = await this.bridge.open(e.id, e.name, e.bytes, WEB_MAX_PIXELS);
      } catch (err) {
        // A reload before the worker had stored the demo's bytes: the demo is the app's own, fetch it again.
        const again = e.bytes ? null : await this.demoBytes(e.name);
        if (!again) throw err;
        r = await this.bridge.open(e.id, e.name, again, WEB_MAX_PIXELS);
      }
      e.bytes = null;
      e.opened = true;
      e.kind = r.kind;
      e.width = r.width;
      e.height = r.height;
      e.umPerPxFromFile = r.umPerPxFromFile;
      e.pages = r.pages;
      if (r.bitmap) { e.bitmap?.close(); e.bitmap = r.bitmap; e.thumb?.close(); e.thumb = r.thumb; } else if (first) e.bitmap = null;
      if (r.kind === 'points') e.settings.pattern = 'points';
      e.error = null;
    })();
    e.opening = p;
    void p.then(() => { e.opening = null; }, () => { e.opening = null; });
    return p;
  }

  /** The demo image's bytes when `name` is the demo's, else null (also when it cannot be fetched). */
  private async demoBytes(name: string): Promise<Uint8Array | null> {
    try {
      const d = await this.demoLoader?.();
      return d && d.name === name ? d.bytes : null;
    } catch {
      return null;
    }
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

  save(e: Entry): void {
    if (!this.entries.includes(e)) return;
    saveEntry(e.toStored()).catch(() => {
      this.banner = 'The session could not be saved (storage full or blocked); results stay on screen until you reload.';
    });
  }

  persistSession(): void {
    if (this.saveTimer) clearTimeout(this.saveTimer);
    this.saveTimer = setTimeout(() => {
      saveSession({
        key: 'session', selectedId: this.selectedId, layers: $state.snapshot(this.layers) as Layers,
        theme: this.theme, panel: this.panel, demoAdded: this.demoAdded,
      }).catch(() => undefined);
    }, 200);
  }
}
