/**
 * Reading a tissue mask from a file's bytes, as the command line does (`--mask FILE.png`): a grey or binary
 * image of the analysed image's size whose nonzero pixels mark the tissue. Pure: bytes in, bytes out.
 */
import { SettingsError } from '../core/errors';

/** A decoded mask file: one byte per pixel, 1 = tissue, 0 = not. */
export interface OpenedMask {
  name: string;
  width: number;
  height: number;
  data: Uint8Array;
}

/**
 * Decodes a mask file (PNG; JPEG and TIFF decode too, but a lossy JPEG's noise would count as tissue).
 * @throws the decoder's typed errors for a file that is not an image; SettingsError for a mask without tissue
 */
export async function openMask(name: string, bytes: Uint8Array): Promise<OpenedMask> {
  const { decodeImage } = await import('../core/image/decode');
  const page = (await decodeImage(bytes, { name })).pages[0]!;
  const data = new Uint8Array(page.width * page.height);
  let tissue = 0;
  for (let i = 0; i < data.length; i++) if (page.data[i] !== 0) (data[i] = 1), tissue++;
  if (!tissue) throw new SettingsError(`The mask ${name} marks no tissue (every pixel is 0); mark the tissue with nonzero (white) pixels.`);
  return { name, width: page.width, height: page.height, data };
}

/**
 * The mask's pixels for an image of `width` x `height` px.
 * @throws SettingsError when the sizes differ
 */
export function maskFor(mask: OpenedMask, width: number, height: number): Uint8Array {
  if (mask.width !== width || mask.height !== height) {
    throw new SettingsError(`The mask ${mask.name} is ${mask.width} x ${mask.height} px but the image is ${width} x ${height} px; give a mask of the image's size.`);
  }
  return mask.data;
}
