/**
 * The pixel size of an analysis and where it came from, one rule for the command line, the worker and the
 * page: the settings' value (the user's) wins, else the file's tags, else none. Light: no pipeline imports.
 */
import { resolvePixelSize, type ResolvedPixelSize } from '../core/image/calibration';
import type { Settings } from '../core/settings';

/** Where a pixel size came from: 'user' (settings, typed or measured), 'file' (the image's tags), 'none'. */
export type CalibrationSource = ResolvedPixelSize['source'];

/**
 * Settings with the pixel size an analysis uses, and where it came from: the settings' value wins (the
 * user's), else the file's, else none (results in px).
 *
 * @param fileUmPerPx µm/px read from the file, or null
 * @param fileNotice why a pixel size the file gives is not used (OpenedImage.calibrationNotice); kept in
 *   `notice` unless the user's value is used
 * @throws CalibrationError when the settings' value is given but not a finite number above 0
 */
export function calibrated(
  settings: Settings,
  fileUmPerPx: number | null,
  fileNotice?: string,
): { settings: Settings; source: CalibrationSource; notice?: string } {
  const px = resolvePixelSize(settings.umPerPx, fileUmPerPx);
  const notice = px.source !== 'user' && fileNotice ? { notice: fileNotice } : {};
  return { settings: { ...settings, umPerPx: px.umPerPx }, source: px.source, ...notice };
}
