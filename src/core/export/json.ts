/** JSON writers: summary.json and settings.json, two-space indented, keys in a stable order. */
import type { SummaryFile } from '../summary';
import type { Analysis } from '../analysis.types';
import type { Settings } from '../settings';

/** summary.json: the analysis summary with the settings used beside it. */
export function summaryJson(analysis: Analysis, extra: Pick<SummaryFile, 'image' | 'input' | 'version'> = {}): string {
  const file: SummaryFile = { ...analysis.summary, ...extra, settings: analysis.settings };
  return JSON.stringify(file, replacer, 2) + '\n';
}

/** settings.json: every setting used. */
export function settingsJson(settings: Settings): string {
  return JSON.stringify(settings, null, 2) + '\n';
}

/**
 * Non-finite numbers become null; others keep 12 significant digits, far beyond any measurement's
 * precision, so that the last-bit differences between JavaScript engines' maths libraries (Monte Carlo
 * sums in Node and in a browser) do not change the file.
 */
function replacer(_k: string, v: unknown): unknown {
  if (typeof v === 'number') return Number.isFinite(v) ? (Number.isInteger(v) ? v : Number(v.toPrecision(12))) : null;
  if (ArrayBuffer.isView(v) && !(v instanceof DataView)) return Array.from(v as unknown as ArrayLike<number>);
  return v;
}
