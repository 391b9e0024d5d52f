/**
 * State of the Kinetics panel: which images (or pages of one multi-page TIFF) make the series, where the
 * times come from, the threshold and fit choices, and the last run. The run itself happens in the worker
 * (the core's analyzeSeries); a failed run shows its message while the earlier result stays.
 */
import { resolveSettings, type Settings, type SettingsInput } from '../../core/settings';
import type { KineticsRun, KineticsTimes } from '../../../workers/protocol';
import type { AppState } from './app.svelte';
import { errorMessage } from '../bridge';
import type { StoredKinetics } from '../../storage/db';

export type SeriesSource = 'images' | 'pages';
export type TimesKind = 'list' | 'names' | 'csv';


export class KineticsState {
  source = $state<SeriesSource>('images');
  /** Entries chosen as frames (source 'images'); the series follows the order of the image list. */
  chosen = $state<string[]>([]);
  /** The multi-page file whose pages are the frames (source 'pages'). */
  pagesOf = $state<string | null>(null);
  timesKind = $state<TimesKind>('list');
  timesText = $state('');
  csvText = $state('');
  csvName = $state<string | null>(null);
  timeUnit = $state('s');
  manualThreshold = $state(false);
  threshold = $state(128);
  phase = $state<Settings['kinetics']['phase']>('auto');
  fitMin = $state(0.02);
  fitMax = $state(0.98);
  incubation = $state(false);
  method = $state<Settings['kinetics']['fitMethod']>('nonlinear');
  allowDecreasing = $state(false);

  running = $state(false);
  stage = $state('');
  fraction = $state(0);
  /** What is wrong with the last request (shown in the panel; the earlier result stays). */
  error = $state<string | null>(null);
  run = $state.raw<KineticsRun | null>(null);
  finalBusy = $state(false);
  finalMessage = $state<string | null>(null);
  finalError = $state<string | null>(null);

  /** The last series is being run again after a reload. */
  restoring = $state(false);

  constructor(private readonly app: AppState) {}

  /** The choices and whether a series was run, for the session store. */
  toStored(): StoredKinetics {
    return {
      source: this.source, chosen: [...this.chosen], pagesOf: this.pagesOf, timesKind: this.timesKind, timesText: this.timesText,
      csvText: this.csvText, csvName: this.csvName, timeUnit: this.timeUnit, manualThreshold: this.manualThreshold, threshold: this.threshold,
      phase: this.phase, fitMin: this.fitMin, fitMax: this.fitMax, incubation: this.incubation, method: this.method,
      allowDecreasing: this.allowDecreasing, ran: this.run !== null,
    };
  }

  /** The choices of an earlier session (the images they name must be in the list). */
  restore(k: StoredKinetics): void {
    const have = new Set(this.app.entries.map((e) => e.id));
    this.source = k.source;
    this.chosen = k.chosen.filter((id) => have.has(id));
    this.pagesOf = k.pagesOf && have.has(k.pagesOf) ? k.pagesOf : null;
    this.timesKind = k.timesKind;
    this.timesText = k.timesText;
    this.csvText = k.csvText;
    this.csvName = k.csvName;
    this.timeUnit = k.timeUnit;
    this.manualThreshold = k.manualThreshold;
    this.threshold = k.threshold;
    this.phase = k.phase;
    this.fitMin = k.fitMin;
    this.fitMax = k.fitMax;
    this.incubation = k.incubation;
    this.method = k.method;
    this.allowDecreasing = k.allowDecreasing;
  }

  /** Runs the last series again after a reload (the same frames, times and settings give the same result). */
  async rerun(): Promise<void> {
    if (this.run || this.running || this.ids().length === 0) return;
    this.restoring = true;
    try {
      await this.analyse();
    } finally {
      this.restoring = false;
    }
  }

  /** Adds frames of the series from files: stored and opened for the series, not analysed on their own, and ticked. */
  async addFrames(files: Iterable<File>): Promise<void> {
    const added = await this.app.addFiles(files, true);
    this.source = 'images';
    this.chosen = [...new Set([...this.chosen, ...added.map((e) => e.id)])];
    this.app.persistSession();
  }

  /** The entries of the series, in order. */
  ids(): string[] {
    if (this.source === 'pages') return this.pagesOf && this.app.entries.some((e) => e.id === this.pagesOf) ? [this.pagesOf] : [];
    return this.app.entries.filter((e) => e.kind === 'image' && this.chosen.includes(e.id)).map((e) => e.id);
  }

  toggle(id: string, on: boolean): void {
    this.chosen = on ? [...new Set([...this.chosen, id])] : this.chosen.filter((x) => x !== id);
  }

  times(): KineticsTimes {
    if (this.timesKind === 'list') return { kind: 'list', text: this.timesText };
    if (this.timesKind === 'csv') return { kind: 'csv', text: this.csvText };
    return { kind: 'names' };
  }

  /** The settings of the run: the first frame's pixel size, field and minimum area, with the panel's kinetics choices. */
  settings(): Settings {
    const first = this.app.entries.find((e) => e.id === this.ids()[0]);
    const base = first ? first.effectiveSettings() : undefined;
    const input: SettingsInput = {
      umPerPx: base?.umPerPx ?? null,
      field: base?.field ?? null,
      minCellAreaPx: base?.minCellAreaPx ?? -1,
      kinetics: {
        threshold: this.manualThreshold ? 'manual' : 'otsu', manualThreshold: this.threshold, phase: this.phase,
        fitMin: this.fitMin, fitMax: this.fitMax, incubation: this.incubation, fitMethod: this.method,
      },
    };
    return resolveSettings(input);
  }

  /** Runs the series in the worker. */
  async analyse(): Promise<void> {
    this.error = null;
    const ids = this.ids();
    if (ids.length === 0) {
      this.error = this.source === 'pages' ? 'Choose the multi-page TIFF whose pages are the frames.' : 'Tick at least three images of the series in the list above.';
      return;
    }
    if (this.timesKind === 'csv' && !this.csvText.trim()) { this.error = 'Choose a CSV of file,time lines, or type the times.'; return; }
    let settings: Settings;
    try { settings = this.settings(); } catch (err) { this.error = errorMessage(err); return; }
    this.running = true;
    this.stage = 'Starting';
    this.fraction = 0;
    try {
      for (const id of ids) {
        const e = this.app.entries.find((x) => x.id === id);
        if (e) await this.app.openEntry(e);
      }
      const r = await this.app.bridge.kinetics(
        { ids, times: this.times(), timeUnit: this.timeUnit.trim() || 's', settings, allowDecreasing: this.allowDecreasing },
        (stage, f) => { this.stage = stage; this.fraction = f; },
      );
      for (const b of this.run?.thumbs ?? []) b.close();
      this.run = r;
      this.finalMessage = null;
      this.finalError = null;
      if (!this.manualThreshold) this.threshold = r.result.phase.threshold;
      this.app.persistSession();
    } catch (err) {
      this.error = errorMessage(err);
    } finally {
      this.running = false;
      this.stage = '';
    }
  }

  /** Adds the final mosaic of the last run as a walls entry, measured on the mosaic's labels, and selects it. */
  async analyseFinal(): Promise<void> {
    const r = this.run;
    if (!r) return;
    this.finalBusy = true;
    this.finalError = null;
    try {
      const id = this.app.newEntryId();
      const fin = await this.app.bridge.kineticsFinal(id);
      const lastSource = r.result.frames[r.result.frames.length - 1]?.source || 'series';
      const name = `${lastSource.replace(/\.[^.[\]]+(\[\d+\])?$/, '$1').replace(/[[\]]/g, '_')}.final-mosaic.png`;
      const e = this.app.addPrepared(id, name, fin.bytes, fin.settings as Partial<Settings>);
      this.app.select(e.id);
      this.finalMessage = `Added ${name}: ${fin.domains} domains${fin.complete ? '' : ' (the last frame has not reached the fit range\'s upper end, so the mosaic has gaps)'}; its Randomness panel compares them with random seeding.`;
    } catch (err) {
      this.finalError = errorMessage(err);
    } finally {
      this.finalBusy = false;
    }
  }
}
