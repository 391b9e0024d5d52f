/**
 * The one owner of the analysis worker. Starts it lazily, cancels (at once, by terminating it when asked),
 * lets the latest request per image win, restarts it after a crash and re-opens the images it had.
 * The page talks to the worker only through this class.
 */
import * as Comlink from 'comlink';
import type {
  AnalysisResult, AnalyzeRequest, ExportFile, GrainResult, ExportKind, KineticsFinal, KineticsRequest, KineticsRun, OpenResult, VectorLayerRequest, PreviewResult, ProgressFn, WorkerApi,
} from '../../workers/protocol';
import type { SettingsInput } from '../core/settings';
import { isWireError } from '../app/wire';

/**
 * A failed worker call, or a request the bridge itself gave up. `kind` says what happened, and the page
 * reacts to it: a core error's kind from the worker ('Cancelled', 'Csv', 'ImageDecode', ... as in
 * src/core/errors.ts, or 'Unexpected'), or the bridge's own 'Superseded', 'Cancelled', 'WorkerCrashed',
 * 'Missing'. The message is one line for a person.
 */
export class WorkerError extends Error {
  readonly kind: string;
  constructor(kind: string, message: string) {
    super(message);
    this.kind = kind;
    this.name = `${kind}Error`;
  }
}

/** Raised for a request that a newer one for the same image replaced; the caller ignores it. */
export class SupersededError extends WorkerError {
  constructor() { super('Superseded', 'A newer request replaced this one.'); }
}
/** Raised for requests cut short by cancel() (the same kind as a cancel inside the worker). */
export class CancelledRunError extends WorkerError {
  constructor() { super('Cancelled', 'The analysis was cancelled.'); }
}
/** Raised for requests that were running when the worker failed. */
export class WorkerCrashedError extends WorkerError {
  constructor(detail: string) {
    super('WorkerCrashed', `The analysis worker stopped (${detail}); it has been restarted and your earlier results are kept. Run the analysis again.`);
  }
}

/**
 * What a worker call rejected with, as an Error: a wire error becomes a {@link WorkerError} of its kind;
 * anything else (a message port failure) one of kind 'Unexpected'.
 */
export function fromWorker(e: unknown): Error {
  if (e instanceof WorkerError) return e;
  if (isWireError(e)) return new WorkerError(e.kind, e.message);
  return new WorkerError('Unexpected', e instanceof Error ? e.message : String(e));
}

/** The kind of a failure ('Unexpected' for anything that is not a {@link WorkerError}). */
export function errorKind(e: unknown): string {
  return e instanceof WorkerError ? e.kind : 'Unexpected';
}

/** The one-line message of a failure. */
export function errorMessage(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

export interface BridgeEvents {
  /** The worker failed and was restarted. */
  onCrash?: (message: string) => void;
  /** opencv.js loading: 0..1, then 'ready'. */
  onCvProgress?: (fraction: number) => void;
}

interface Pending { reject: (e: Error) => void }

/** Opening records so a restarted worker can re-open an image from its stored copy. */
interface OpenRecord { name: string; maxPixels: number }

export class Bridge {
  private worker: Worker | null = null;
  private api: Comlink.Remote<WorkerApi> | null = null;
  private pending = new Set<Pending>();
  /** Images open in the current worker instance. */
  private openIn = new Set<string>();
  private records = new Map<string, OpenRecord>();
  private tokens = new Map<string, number>();
  private previewBusy = false;
  private previewNext: { id: string; settings: SettingsInput; maxSide: number; resolve: (r: PreviewResult | null) => void } | null = null;
  private generation = 0;

  constructor(private readonly makeWorker: () => Worker, private readonly events: BridgeEvents = {}) {}

  private start(): Comlink.Remote<WorkerApi> {
    if (this.api) return this.api;
    const w = this.makeWorker();
    const gen = ++this.generation;
    w.addEventListener('error', (ev) => {
      ev.preventDefault();
      if (gen === this.generation) this.fail(ev.message || 'an error in the worker');
    });
    w.addEventListener('messageerror', () => { if (gen === this.generation) this.fail('a message could not be read'); });
    this.worker = w;
    this.api = Comlink.wrap<WorkerApi>(w);
    return this.api;
  }

  private stop(): void {
    this.api?.[Comlink.releaseProxy]();
    this.worker?.terminate();
    this.worker = null;
    this.api = null;
    this.openIn.clear();
    this.generation++;
  }

  private fail(detail: string): void {
    this.stop();
    const err = new WorkerCrashedError(detail);
    for (const p of this.pending) p.reject(err);
    this.pending.clear();
    this.events.onCrash?.(err.message);
  }

  /** Runs one worker call; a crash or cancel rejects it even if the worker never answers. */
  private call<T>(fn: (api: Comlink.Remote<WorkerApi>) => Promise<T>): Promise<T> {
    const api = this.start();
    return new Promise<T>((resolve, reject) => {
      const p: Pending = { reject };
      this.pending.add(p);
      fn(api).then(
        (v) => { if (this.pending.delete(p)) resolve(v); },
        (e: unknown) => { if (this.pending.delete(p)) reject(fromWorker(e)); },
      );
    });
  }

  /** Starts the worker and loads opencv.js in the background. */
  warmUp(): Promise<void> {
    const cb = this.events.onCvProgress;
    return this.call((api) => api.warmUp(cb ? Comlink.proxy((_s: string, f: number) => cb(f)) : undefined));
  }

  /**
   * Decodes an image in the worker (bytes are copied; null re-opens the stored copy; `stored` says the
   * page has stored the bytes already).
   */
  async open(id: string, name: string, bytes: Uint8Array | null, maxPixels: number, stored = false): Promise<OpenResult> {
    this.records.set(id, { name, maxPixels });
    const r = await this.call((api) => api.open(id, name, bytes, maxPixels, stored));
    this.openIn.add(id);
    return r;
  }

  private async ensureOpen(id: string): Promise<void> {
    if (this.openIn.has(id)) return;
    const rec = this.records.get(id);
    if (!rec) throw new WorkerError('Missing', 'This image was never opened; add it again.');
    const r = await this.call((api) => api.open(id, rec.name, null, rec.maxPixels));
    r.bitmap?.close();
    r.thumb?.close();
    this.openIn.add(id);
  }

  /** Whether the worker currently has this image open (false after a restart). */
  isOpen(id: string): boolean {
    return this.openIn.has(id);
  }

  /**
   * Analyses an image. A later call for the same image supersedes this one (it rejects with
   * SupersededError and the worker is told to stop it at the next stage).
   */
  async analyze(req: AnalyzeRequest, onProgress?: ProgressFn): Promise<AnalysisResult> {
    const token = (this.tokens.get(req.id) ?? 0) + 1;
    if (token > 1 && this.api) void this.api.cancel(req.id);
    this.tokens.set(req.id, token);
    await this.ensureOpen(req.id);
    const r = await this.call((api) => api.analyze(req, onProgress ? Comlink.proxy(onProgress) : undefined));
    if (this.tokens.get(req.id) !== token) throw new SupersededError();
    return r;
  }

  /**
   * The live preview: at most one runs at a time; while it runs, only the newest request waits, and the
   * ones it replaced resolve to null.
   */
  preview(id: string, settings: SettingsInput, maxSide = 768): Promise<PreviewResult | null> {
    return new Promise((resolve) => {
      if (this.previewBusy) {
        this.previewNext?.resolve(null);
        this.previewNext = { id, settings, maxSide, resolve };
        return;
      }
      this.runPreview(id, settings, maxSide, resolve);
    });
  }

  private runPreview(id: string, settings: SettingsInput, maxSide: number, resolve: (r: PreviewResult | null) => void): void {
    this.previewBusy = true;
    const done = (r: PreviewResult | null): void => {
      this.previewBusy = false;
      const next = this.previewNext;
      this.previewNext = null;
      if (next) {
        r?.outlines?.close();
        resolve(null);
        this.runPreview(next.id, next.settings, next.maxSide, next.resolve);
      } else resolve(r);
    };
    this.ensureOpen(id)
      .then(() => this.call((api) => api.preview(id, settings, maxSide)))
      .then(done, () => done(null));
  }

  /** A result made ahead of time, taken when it fits the opened image and the settings (else null). */
  async adopt(id: string, packed: Uint8Array, settings: SettingsInput): Promise<AnalysisResult | null> {
    await this.ensureOpen(id);
    return this.call((api) => api.adopt(id, packed, settings));
  }

  /** The stored result of an earlier session (the image is opened from its stored copy first). */
  async restore(id: string): Promise<AnalysisResult | null> {
    await this.ensureOpen(id);
    return this.call((api) => api.restore(id));
  }

  async grain(id: string): Promise<GrainResult> {
    await this.ensureOpen(id);
    return this.call((api) => api.grain(id));
  }

  /** The vector layers of the current result as one reduced bitmap (null when the worker has no result for it). */
  async vectorLayers(id: string, req: VectorLayerRequest): Promise<ImageBitmap | null> {
    if (!this.openIn.has(id)) return null;
    return this.call((api) => api.vectorLayers(id, req));
  }

  /** Kinetics of a series of opened images (each is re-opened from its stored copy after a restart). */
  async kinetics(req: KineticsRequest, onProgress?: ProgressFn): Promise<KineticsRun> {
    for (const id of req.ids) await this.ensureOpen(id);
    return this.call((api) => api.kinetics(req, onProgress ? Comlink.proxy(onProgress) : undefined));
  }

  /** The final frame of the last kinetics run, prepared as the entry `id` (its labels stored in the worker). */
  async kineticsFinal(id: string): Promise<KineticsFinal> {
    return this.call((api) => api.kineticsFinal(id));
  }

  async exportFiles(id: string, kinds: ExportKind[]): Promise<ExportFile[]> {
    return this.call((api) => api.exportFiles(id, kinds));
  }

  async exportZip(ids: string[], kinds: ExportKind[]): Promise<Uint8Array> {
    for (const id of ids) await this.ensureOpen(id).catch(() => undefined);
    return this.call((api) => api.exportZip(ids, kinds));
  }

  async forget(id: string): Promise<void> {
    this.records.delete(id);
    this.openIn.delete(id);
    await this.call((api) => api.forget(id));
  }

  /** Asks the worker to stop a running analysis of `id` at its next stage (the job then rejects). */
  analyzeCancel(id: string): void {
    if (this.api) void this.api.cancel(id);
  }

  /** Stops everything at once: terminates the worker; running requests reject with CancelledRunError. */
  cancelAll(): void {
    const had = this.pending.size > 0;
    this.stop();
    const err = new CancelledRunError();
    for (const p of this.pending) p.reject(err);
    this.pending.clear();
    if (had) this.previewBusy = false;
  }

  /** Makes the worker fail (for the crash-recovery test). */
  crashForTest(): void {
    void this.start().crash();
  }
}
