import { CalibrationError } from '../errors';

/**
 * The plausible pixel sizes of a micrograph, in µm per pixel. The finest, 1e-5 µm/px (10 pm), is finer than
 * the sampling of atomic-resolution electron micrographs; the coarsest, 1e4 µm/px (1 cm), is coarser than a
 * photograph of a foam or a crack pattern a metre across. Light microscopes sit between about 0.05 and
 * 50 µm/px. Inside this band every area, length and grain size number stays a finite, ordinary number for
 * any image the decoders accept; outside it a value is a typing slip or a damaged file, and areas overflow to
 * infinity or underflow to zero (the band is stated in the README and in docs/check-values.md).
 */
export const UM_PER_PX_MIN = 1e-5;
export const UM_PER_PX_MAX = 1e4;

/** The band of {@link UM_PER_PX_MIN}..{@link UM_PER_PX_MAX} in words, for messages. */
export const PIXEL_SIZE_BAND = '1e-5 to 1e4 µm/px';

/** Whether a value is a pixel size inside the plausible band (a finite number from 1e-5 to 1e4 µm/px). */
export function plausiblePixelSize(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v >= UM_PER_PX_MIN && v <= UM_PER_PX_MAX;
}

/**
 * Checks a pixel size that a person gave (typed, measured on a scale bar, in settings or on the command line).
 *
 * @param v - the value, µm per px
 * @param where - how the person gives it, for the message (e.g. "--um-per-px or the Scale panel")
 * @throws CalibrationError naming the value, the plausible band and what to do
 */
export function checkUserPixelSize(v: unknown, where = 'the Scale panel or --um-per-px'): asserts v is number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
    throw new CalibrationError(`The pixel size ${typeof v === 'number' ? String(v) : JSON.stringify(v)} µm/px is not a positive number; give a positive number of µm per pixel from ${PIXEL_SIZE_BAND} in ${where}, or leave it empty for results in px.`);
  }
  if (!plausiblePixelSize(v)) {
    throw new CalibrationError(
      `The pixel size ${String(v)} µm/px is outside the plausible range for light and electron micrographs (${PIXEL_SIZE_BAND}); check the value and its unit (µm per pixel) in ${where}.`,
    );
  }
}

/** Which pixel size an analysis uses and where it came from. */
export interface ResolvedPixelSize {
  /** Micrometres per pixel, or null when neither the user nor the file gives one (results stay in pixels). */
  umPerPx: number | null;
  /** 'user' (typed or measured on a scale bar), 'file' (read from the image file), or 'none'. */
  source: 'user' | 'file' | 'none';
}

/**
 * Chooses the pixel size: the user's value wins over the file's, because a person who types or measures a
 * pixel size knows something the file may have wrong (scanners and editors often write a default 72 or 96 dpi).
 * A file value outside the plausible band ({@link plausiblePixelSize}: not a finite number from 1e-5 to
 * 1e4 µm/px) counts as absent, so results stay in px; a user value that is given but outside the band is an
 * error, never silently replaced by the file's.
 *
 * @param userUmPerPx - the user's pixel size in µm/px, or null / undefined when not given
 * @param fileUmPerPx - the pixel size read from the file in µm/px (DecodedImage.umPerPx), or null
 * @returns the pixel size used, in µm/px, and which source it came from
 * @throws CalibrationError when the user's value is given (not null / undefined) but is not a number in the band
 */
export function resolvePixelSize(
  userUmPerPx: number | null | undefined,
  fileUmPerPx: number | null,
): ResolvedPixelSize {
  if (userUmPerPx !== null && userUmPerPx !== undefined) {
    checkUserPixelSize(userUmPerPx);
    return { umPerPx: userUmPerPx, source: 'user' };
  }
  if (plausiblePixelSize(fileUmPerPx)) return { umPerPx: fileUmPerPx, source: 'file' };
  return { umPerPx: null, source: 'none' };
}
