import type { DecodedImage, GreyImage } from '../types';
import { filePixelSize } from './calibration';
import { toGrey } from './grey';
import { decodeJpegRaster } from './jpeg';
import { MAX_PIXELS } from './limits';
import { decodePngRaster } from './png';
import { detectFormat } from './sniff';
import { decodeTiffRaster } from './tiff';

export { MAX_PIXELS } from './limits';

/** Options of {@link decodeImage}. */
export interface DecodeOptions {
  /** File name, put at the start of every error message. */
  name?: string;
  /** Limit on width x height of one page, in pixels; default {@link MAX_PIXELS} (100 megapixels). */
  maxPixels?: number;
}

/**
 * Decodes a PNG, JPEG or TIFF file into grey pages, detecting the format from the bytes' magic numbers
 * (never from the file name).
 *
 * - PNG (fast-png): grey, grey + alpha, RGB, RGBA at 8 or 16 bit, palette, 1/2/4-bit grey (scaled to 0..255).
 *   Pixel size from the pHYs chunk when its unit is the metre: µm/px = 10^6 / (pixels per metre).
 * - JPEG (jpeg-js): 8-bit grey or colour (baseline or progressive), turned upright by its EXIF Orientation tag.
 * - TIFF (geotiff): 8 or 16 bit unsigned, grey / RGB / palette, every page (IFD) one entry of `pages`, strips
 *   or tiles, uncompressed / LZW / Deflate / PackBits. Pixel size from OME-XML PhysicalSizeX in the
 *   ImageDescription when present, else from XResolution with ResolutionUnit 2 (inch) or 3 (cm).
 *
 * Colour becomes grey with the ITU-R BT.601 luma weights ({@link toGrey}); alpha is ignored. 16-bit samples
 * stay 16-bit (Uint16Array, bitDepth 16).
 * The header's width x height is checked before any pixel is decoded, so an oversized file allocates nothing.
 *
 * Whether the file's pixel size is a calibration is decided by {@link filePixelSize}: a round screen or print
 * resolution (72, 96, 300 dpi ...) without microscope metadata gives `umPerPx` null and a `pixelSizeNotice`;
 * x and y sizes that differ by more than 1 % (non-square pixels) are refused.
 *
 * @param bytes - the whole file
 * @param opts - `name` for messages; `maxPixels` to lower or raise the size limit
 * @returns the grey pages, the format, whether the file was colour, and the pixel size in µm (or null)
 * @throws ImageDecodeError - empty, text, unrecognised, truncated or damaged file
 * @throws UnsupportedFormatError - another image format, or a TIFF/JPEG/PNG variant not read (the message
 *   names it, e.g. the TIFF compression code, float or 32-bit samples)
 * @throws ImageTooSmallError - a side below 16 px
 * @throws ImageTooLargeError - width x height above the limit
 * @throws CalibrationError - the file's pixels are not square
 */
export async function decodeImage(bytes: Uint8Array, opts: DecodeOptions = {}): Promise<DecodedImage> {
  const { name } = opts;
  const maxPixels = opts.maxPixels ?? MAX_PIXELS;
  const format = detectFormat(bytes, name);
  if (format === 'png') {
    const r = decodePngRaster(bytes, maxPixels, name);
    const px = filePixelSize({ xUm: r.umPerPx, yUm: r.umPerPxY, kind: 'resolution' }, name);
    return { format, pages: [toGrey(r.image)], wasColour: r.colour, ...withNotice(px) };
  }
  if (format === 'jpeg') {
    const r = decodeJpegRaster(bytes, maxPixels, name);
    return { format, pages: [toGrey(r.image)], umPerPx: null, wasColour: r.colour };
  }
  const r = await decodeTiffRaster(bytes, maxPixels, name);
  const px = filePixelSize({ xUm: r.umPerPx, yUm: r.umPerPxY, kind: r.pixelSizeKind }, name);
  const pages: GreyImage[] = r.pages.map(toGrey);
  return { format, pages, wasColour: r.colour, ...withNotice(px) };
}

function withNotice(px: ReturnType<typeof filePixelSize>): Pick<DecodedImage, 'umPerPx' | 'pixelSizeNotice'> {
  return px.notice === null ? { umPerPx: px.umPerPx } : { umPerPx: px.umPerPx, pixelSizeNotice: px.notice };
}
