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

/** The pixel size a file's tags give, before it is accepted as a calibration. */
export interface FilePixelSizeTags {
  /** µm per pixel in x, or null when the file gives none. */
  xUm: number | null;
  /** µm per pixel in y, or null when the file gives none. */
  yUm: number | null;
  /**
   * 'microscope': a microscope's own metadata (OME-XML PhysicalSizeX/Y); 'resolution': dots per length
   * (TIFF XResolution/YResolution, PNG pHYs), which editors and cameras also write for screens and printers.
   */
  kind: 'microscope' | 'resolution';
}

/** The file's pixel size as a calibration: the value used, or null with a notice saying why it is not used. */
export interface FilePixelSize {
  umPerPx: number | null;
  /** One sentence for the user when the file gives a pixel size that is not used; null otherwise. */
  notice: string | null;
}

/** Micrometres in one inch (international inch, 25.4 mm exactly). */
const UM_PER_INCH = 25400;

/** The highest dots per inch taken as a screen, print or scanner setting (scanners' common top setting). */
export const SCREEN_DPI_MAX = 4800;

/**
 * The screen or print resolution a pixel size stands for, in whole dots per inch, or null when it is not one.
 * A round resolution is a whole number of dots per inch up to {@link SCREEN_DPI_MAX} that is a multiple of 12
 * or of 25: 72, 96, 144, 192 (screens), 75, 100, 150, 200, 300, 600, 1200 ... (printers and scanners). The
 * whole number is matched within 0.02 dpi, because a PNG stores whole pixels per metre (72 dpi is 2835 px/m,
 * 72.009 dpi). A microscope's round pixel sizes are not such values (10 µm/px is 2540 dpi, 0.5 µm/px is
 * 50 800 dpi); the ones that are lie at 127 µm/px and coarser.
 */
export function screenDpi(umPerPx: number): number | null {
  if (!(umPerPx > 0) || !Number.isFinite(umPerPx)) return null;
  const dpi = UM_PER_INCH / umPerPx;
  const n = Math.round(dpi);
  if (n < 1 || n > SCREEN_DPI_MAX || Math.abs(dpi - n) > 0.02) return null;
  return n % 12 === 0 || n % 25 === 0 ? n : null;
}

/** How much x and y pixel sizes may differ (relative) and still count as square: 1 %. */
const SQUARE_TOLERANCE = 0.01;

/**
 * Decides whether a file's pixel size is a calibration; the one place where this is decided, for every format.
 * - Pixels whose x and y sizes differ by more than 1 % are refused: every area and length would be off along y.
 * - Dots per length at a round screen or print resolution ({@link screenDpi}), with no microscope metadata,
 *   are not a calibration: no pixel size (results in px), with a notice saying how to confirm it.
 * - Otherwise the x size is used (its plausible band is checked by {@link resolvePixelSize}).
 *
 * @param tags - what the file's tags give, or null when it gives nothing
 * @param name - file name, put at the start of the error message
 * @throws CalibrationError when the pixels are not square
 */
export function filePixelSize(tags: FilePixelSizeTags | null, name?: string): FilePixelSize {
  const x = tags?.xUm ?? null;
  if (tags === null || x === null) return { umPerPx: null, notice: null };
  const y = tags.yUm;
  if (y !== null && y > 0 && Math.abs(x / y - 1) > SQUARE_TOLERANCE) {
    throw new CalibrationError(
      `${name ? `${name}: ` : ''}the file's pixels are not square (${sig(x)} µm wide, ${sig(y)} µm high); resample the image to square pixels (the same size in x and y) and save it again.`,
    );
  }
  const dpi = tags.kind === 'resolution' ? screenDpi(x) : null;
  if (dpi !== null) {
    return {
      umPerPx: null,
      notice: `The file's resolution of ${dpi} dpi (${sig(x)} µm per pixel) is a screen or print setting, not a calibration, so results are in px; if it is the true pixel size, confirm it with --um-per-px ${sig(x)} (in the app: the Scale panel).`,
    };
  }
  return { umPerPx: x, notice: null };
}

/** Four significant digits, for messages. */
function sig(v: number): string {
  return String(Number(v.toPrecision(4)));
}
