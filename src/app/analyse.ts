/**
 * Analysing an opened file, as the command line and the web app's worker both do: the pixel size chosen
 * (settings, else the file's tags, else none) and recorded with its source, then the core's pipeline;
 * and re-measuring kept labels (after edits) the same way. Pure: no file system, no DOM.
 */
import { analyze, cropImage, reanalyzeLabels, resolveField, type AnalyzeOptions } from '../core/analyze';
import type { Analysis } from '../core/analysis.types';
import { applyEdits, type EditOp } from '../core/edit/labels';
import { resolveSettings, type Settings, type SettingsInput } from '../core/settings';
import type { LabelImage } from '../core/types';
import { calibrated } from './calibration';
import type { OpenedFile } from './open';

/** Options of an analysis; the calibration source is the application layer's to set. */
export type RunOptions = Omit<AnalyzeOptions, 'calibrationSource' | 'calibrationNotice'>;

/**
 * Analyses an opened file: an image with the pixel size of {@link calibrated} (its source goes into the
 * summary), a point set with the settings' pixel size (points files carry none) in its field.
 */
export async function analyseFile(file: OpenedFile, settings: SettingsInput | Settings, opts: RunOptions = {}): Promise<Analysis> {
  const s = resolveSettings(settings as SettingsInput);
  if (file.kind === 'points') {
    return analyze({ kind: 'points', points: file.points, width: file.width, height: file.height, name: file.name }, s, opts);
  }
  const c = calibrated(s, file.umPerPxFromFile, file.calibrationNotice);
  return analyze({ kind: 'image', image: file.image, name: file.name }, c.settings, { ...opts, calibrationSource: c.source, calibrationNotice: c.notice });
}

/**
 * Measures kept labels again, after `ops` are applied to them (merge, split, remove), as
 * {@link analyseFile} would have measured them: the same pixel size and source, the image cropped to the
 * settings' field.
 *
 * @param labels labels of the settings' field (what an earlier analysis of `file` segmented)
 */
export async function remeasure(
  file: OpenedFile,
  labels: LabelImage,
  ops: readonly EditOp[],
  settings: SettingsInput | Settings,
  opts: RunOptions = {},
): Promise<Analysis> {
  const s = resolveSettings(settings as SettingsInput);
  const edited = applyEdits(labels, ops);
  const size = { width: file.width, height: file.height };
  if (file.kind === 'points') return reanalyzeLabels(edited, null, s, size, opts);
  const c = calibrated(s, file.umPerPxFromFile, file.calibrationNotice);
  const crop = cropImage(file.image, resolveField(c.settings.field, file.width, file.height));
  return reanalyzeLabels(edited, crop, c.settings, size, { ...opts, calibrationSource: c.source, calibrationNotice: c.notice });
}
