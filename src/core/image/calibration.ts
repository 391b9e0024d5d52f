import { CalibrationError } from '../errors';

/** Which pixel size an analysis uses and where it came from. */
export interface ResolvedPixelSize {
  /** Micrometres per pixel, or null when neither the user nor the file gives one (results stay in pixels). */
  umPerPx: number | null;
  /** 'user' (typed or measured on a scale bar), 'file' (read from the image file), or 'none'. */
  source: 'user' | 'file' | 'none';
}

function usable(v: number | null | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v > 0;
}

/**
 * Chooses the pixel size: the user's value wins over the file's, because a person who types or measures a
 * pixel size knows something the file may have wrong (scanners and editors often write a default 72 or 96 dpi).
 * A file value that is not a finite positive number counts as absent; a user value that is given but not a
 * finite positive number is an error, never silently replaced by the file's.
 *
 * @param userUmPerPx - the user's pixel size in µm/px, or null / undefined when not given
 * @param fileUmPerPx - the pixel size read from the file in µm/px (DecodedImage.umPerPx), or null
 * @returns the pixel size used, in µm/px, and which source it came from
 * @throws CalibrationError when the user's value is given (not null / undefined) but is not a finite number > 0
 */
export function resolvePixelSize(
  userUmPerPx: number | null | undefined,
  fileUmPerPx: number | null,
): ResolvedPixelSize {
  if (userUmPerPx !== null && userUmPerPx !== undefined && !usable(userUmPerPx)) {
    throw new CalibrationError(
      `the pixel size ${String(userUmPerPx)} µm/px is not a positive number; type a value above 0 or leave it empty`,
    );
  }
  if (usable(userUmPerPx)) return { umPerPx: userUmPerPx, source: 'user' };
  if (usable(fileUmPerPx)) return { umPerPx: fileUmPerPx, source: 'file' };
  return { umPerPx: null, source: 'none' };
}
