/**
 * One image (or point set) in the list, as the page holds it: its name, settings, edit history, status and
 * the worker's result; and the small helpers the Scale panel uses to read typed lengths.
 */
import { defaultSettings, type Settings } from '../../core/settings';
import type { EditOp } from '../../core/edit/labels';
import type { AnalysisResult, GrainResult, PreviewResult } from '../../../workers/protocol';
import { calibrated } from '../../app/calibration';
import type { EntryStatus, StoredEntry } from '../../storage/db';

/** The largest image the web app opens, in pixels (the command line allows more). */
export const WEB_MAX_PIXELS = 64_000_000;

export type Mode = 'restore' | 'segment' | 'measure';

/** The notice of an entry whose run was cancelled. */
export const CANCELLED_NOTICE = 'Cancelled. Change a setting or press Analyse to run it again.';

let nextId = 0;
export function newId(): string {
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
  /** A frame of a kinetics series: opened for the series, never analysed on its own. */
  frame = $state(false);
  /** File bytes until the worker has opened them. */
  bytes: Uint8Array | null = null;
  /** The page's storing of the bytes (true once they are in the session store), done before anything else. */
  stored: Promise<boolean> | null = null;
  /** A result made ahead of time for this image (the demo's, packed), tried before analysing it. */
  packed: Uint8Array | null = null;
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
      status: this.status === 'done' || this.status === 'error' || this.status === 'frame' ? this.status : 'queued',
      error: this.error, width: this.width, height: this.height, umPerPxFromFile: this.umPerPxFromFile,
      count: this.count, fromMosaic: this.fromMosaic, frame: this.frame,
    };
  }
}
