/** JSON writers: summary.json and settings.json, two-space indented, keys in a stable order. */
import type { Analysis } from '../analysis.types';
import type { Settings } from '../settings';

/** summary.json: the analysis summary with the settings used beside it. */
export function summaryJson(analysis: Analysis, extra: Record<string, unknown> = {}): string {
  return JSON.stringify({ ...analysis.summary, ...extra, settings: analysis.settings }, replacer, 2) + '\n';
}

/** settings.json: every setting used. */
export function settingsJson(settings: Settings): string {
  return JSON.stringify(settings, null, 2) + '\n';
}

function replacer(_k: string, v: unknown): unknown {
  if (typeof v === 'number' && !Number.isFinite(v)) return null;
  if (ArrayBuffer.isView(v) && !(v instanceof DataView)) return Array.from(v as unknown as ArrayLike<number>);
  return v;
}
