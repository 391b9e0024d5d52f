/**
 * `--skip-existing`: whether an input's complete results are already in the output folder. Complete means
 * its `<name>.summary.json` is there (written last of the set, so its presence says the others were
 * written before it), records an analysis (not a failure) of the same input with the same settings, and
 * the other files of the set are there too.
 */
import { access, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Settings } from '../core/settings';
import { isFailedSummary } from '../core/export/summaryTable';

/** The files of an analysed input besides its summary.json (labels.png only for a segmented pattern). */
export function resultFiles(name: string, pattern: string): string[] {
  const files = [`${name}.cells.csv`, `${name}.cells.geojson`, `${name}.overlay.svg`];
  if (pattern !== 'points') files.push(`${name}.labels.png`);
  return files;
}

/** Numbers to 12 significant digits (as summary.json stores them), keys sorted: for comparing settings. */
function canonical(v: unknown): unknown {
  if (typeof v === 'number') return Number.isFinite(v) ? Number(v.toPrecision(12)) : null;
  if (Array.isArray(v) || ArrayBuffer.isView(v)) return Array.from(v as ArrayLike<unknown>, canonical);
  if (v !== null && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    return Object.fromEntries(Object.keys(o).sort().filter((k) => o[k] !== undefined).map((k) => [k, canonical(o[k])]));
  }
  return v;
}

/**
 * Whether stored settings are those of this run: every setting equal but the pixel size, which must equal
 * the run's when the user gave one, and must not have been the user's when the run has none (the file's own
 * calibration may differ from image to image).
 */
export function sameSettings(stored: unknown, calibrationSource: unknown, run: Settings): boolean {
  if (stored === null || typeof stored !== 'object') return false;
  const { umPerPx: storedUm, ...storedRest } = stored as Record<string, unknown>;
  const { umPerPx: runUm, ...runRest } = run;
  if (JSON.stringify(canonical(storedRest)) !== JSON.stringify(canonical(runRest))) return false;
  if (runUm !== null) return canonical(storedUm) === canonical(runUm);
  return calibrationSource !== 'user';
}

export type Existing =
  /** Complete results of this input: its parsed summary.json. */
  | { complete: true; summary: Record<string, unknown> }
  /** Nothing usable; `why` is set when there are results but they cannot be kept. */
  | { complete: false; why: string | null };

/** Looks for the complete results of `input` under `name` in `dir` (see the module's comment). */
export async function existingResults(dir: string, name: string, input: string, settings: Settings): Promise<Existing> {
  let text: string;
  try {
    text = await readFile(join(dir, `${name}.summary.json`), 'utf8');
  } catch {
    return { complete: false, why: null };
  }
  let s: Record<string, unknown>;
  try {
    s = JSON.parse(text) as Record<string, unknown>;
  } catch {
    return { complete: false, why: 'its summary.json is not valid JSON' };
  }
  if (s.input !== input) return { complete: false, why: typeof s.input === 'string' ? `the results named ${name} are those of ${s.input}` : 'its summary.json does not say which input it is from' };
  if (isFailedSummary(s)) return { complete: false, why: 'it failed last time' };
  const calibration = s.calibration as Record<string, unknown> | undefined;
  if (!sameSettings(s.settings, calibration?.source, settings)) return { complete: false, why: 'its results were made with other settings' };
  for (const f of resultFiles(name, String(s.pattern))) {
    try {
      await access(join(dir, f));
    } catch {
      return { complete: false, why: `${f} is missing` };
    }
  }
  return { complete: true, summary: s };
}
