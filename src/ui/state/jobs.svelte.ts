/**
 * The queue of work the page sends to the worker, one entry at a time: open the file, then restore its
 * stored result, take a result made ahead of time (the demo's), or analyse it (segment, or re-measure
 * the kept labels). The latest request per entry wins. The engine (opencv.js) is loaded only when a job
 * needs it or the queue is idle, so that stored and ahead-of-time results reach the screen first.
 */
import { resolveSettings, type Settings } from '../../core/settings';
import type { AnalysisResult } from '../../../workers/protocol';
import { errorKind, errorMessage, type Bridge } from '../bridge';
import { CANCELLED_NOTICE, WEB_MAX_PIXELS, type Entry, type Mode } from './entry.svelte';

interface Job { mode: Mode; onFail?: () => void }

/** What the queue needs of the app. */
export interface QueueHost {
  readonly bridge: Bridge;
  readonly entries: Entry[];
  /** Starts loading the engine (once). */
  warmUp(): void;
  /** Records an entry (after its bytes are stored). */
  save(e: Entry): void;
  /** Where a failed edit's message goes. */
  editMessage: string | null;
  /** The demo's bytes when `name` is the demo's (a reload before they were stored), else null. */
  demoBytes(name: string): Promise<Uint8Array | null>;
}

export class JobQueue {
  private jobs = new Map<string, Job>();
  private active: string | null = null;
  private idle: (() => void)[] = [];

  constructor(private readonly host: QueueHost) {}

  /** Queues work for an entry; `front` puts it first (the person is waiting for it). */
  request(e: Entry, mode: Mode, onFail?: () => void, front = false): void {
    const prev = this.jobs.get(e.id);
    if (prev && prev.mode === 'segment' && mode !== 'segment') mode = 'segment';
    if (front) this.jobs.delete(e.id);
    this.jobs.set(e.id, { mode, onFail });
    if (front) {
      const rest = [...this.jobs].filter(([k]) => k !== e.id);
      this.jobs = new Map([[e.id, { mode, onFail }], ...rest]);
    }
    if (this.active === e.id) this.host.bridge.analyzeCancel(e.id);
    else if (e.status !== 'done' && e.status !== 'error') e.status = 'queued';
    void this.pump();
  }

  /** Drops an entry's waiting job. */
  drop(id: string): void {
    this.jobs.delete(id);
  }

  /** Drops every waiting job (Cancel). */
  clear(): void {
    this.jobs.clear();
  }

  /** Resolves once nothing is queued or running. */
  whenIdle(): Promise<void> {
    if (!this.active && this.jobs.size === 0) return Promise.resolve();
    return new Promise((ok) => this.idle.push(ok));
  }

  private async pump(): Promise<void> {
    if (this.active) return;
    const next = this.jobs.entries().next();
    if (next.done) {
      // Nothing waits: load the engine now, while the person looks at the results.
      this.host.warmUp();
      for (const f of this.idle.splice(0)) f();
      return;
    }
    const [id, job] = next.value;
    this.jobs.delete(id);
    const e = this.host.entries.find((x) => x.id === id);
    if (!e || e.frame) { void this.pump(); return; }
    if (job.mode !== 'restore' && !(job.mode === 'segment' && e.packed)) this.host.warmUp();
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
      if (!e.opened || !this.host.bridge.isOpen(e.id)) {
        e.status = 'opening';
        e.stage = 'Reading the file';
        await this.openEntry(e);
      }
      if (mode === 'restore') {
        e.stage = 'Restoring the result';
        const r = await this.host.bridge.restore(e.id);
        if (r) { this.accept(e, r); return; }
        // A mosaic's labels are kept by the worker: measure them again rather than segment the frame.
        mode = e.fromMosaic ? 'measure' : 'segment';
      }
      const settings = resolveSettings($state.snapshot(e.settings) as Settings);
      if (mode === 'segment' && e.packed && e.ops.length === 0) {
        const packed = e.packed;
        e.packed = null;
        e.stage = 'Reading the stored result';
        const r = await this.host.bridge.adopt(e.id, packed, settings);
        if (r) { this.accept(e, r); return; }
        this.host.warmUp();
      }
      e.status = 'analysing';
      e.stage = 'Starting';
      e.fraction = 0;
      // The entry's own pixel size (or none): the worker falls back to the file's and records which it used.
      const r = await this.host.bridge.analyze(
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
        this.host.editMessage = msg;
        e.status = 'done';
      } else {
        e.status = hadResult ? 'done' : 'error';
        e.error = msg;
      }
    } finally {
      this.host.save(e);
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
    const bridge = this.host.bridge;
    if (e.opened && bridge.isOpen(e.id)) return Promise.resolve();
    if (e.opening) return e.opening;
    const p = (async () => {
      const first = !e.opened;
      // The page stores the bytes when the image is added; the worker then need not store them again.
      const stored = e.stored ? await e.stored : false;
      let r: Awaited<ReturnType<Bridge['open']>>;
      try {
        r = await bridge.open(e.id, e.name, e.bytes, WEB_MAX_PIXELS, stored);
      } catch (err) {
        // A reload before the demo's bytes were stored: the demo is the app's own, fetch it again.
        const again = e.bytes ? null : await this.host.demoBytes(e.name);
        if (!again) throw err;
        r = await bridge.open(e.id, e.name, again, WEB_MAX_PIXELS);
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
}
