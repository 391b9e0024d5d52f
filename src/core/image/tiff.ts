import { fromArrayBuffer } from 'geotiff';
import type { GeoTIFF, GeoTIFFImage } from 'geotiff';
import { ImageDecodeError, ImageTooLargeError, TessellabError, UnsupportedFormatError } from '../errors';
import { checkDimensions, namePrefix } from './limits';
import type { InterleavedImage } from './grey';
import { readOmePixelSize } from './ome';
import { BlockError, boundedPool } from './tiffCodecs';

/**
 * The most pages (IFDs) read from one TIFF: a time series of a few thousand frames fits, a chain of IFDs
 * that never ends (or loops back on itself) does not.
 */
export const MAX_TIFF_PAGES = 10000;

/** The most pixels of all pages of one TIFF together (one billion: 1 to 2 GB of grey samples). */
export const MAX_TIFF_TOTAL_PIXELS = 1e9;

/** A decoded TIFF before conversion to grey: one raster per page (IFD). */
export interface TiffRaster {
  pages: InterleavedImage[];
  /** Whether any page is RGB or palette colour. */
  colour: boolean;
  /** µm per pixel in x: OME-XML PhysicalSizeX if present, else the resolution tags, else null. */
  umPerPx: number | null;
  /** µm per pixel in y from the same source; null when unknown. */
  umPerPxY: number | null;
  /** Where the sizes come from: 'microscope' (OME-XML PhysicalSizeX/Y) or 'resolution' (XResolution/YResolution). */
  pixelSizeKind: 'microscope' | 'resolution';
}

/** TIFF compression codes (TIFF 6.0 tag 259 and registered extensions) that the decoder reads. */
const SUPPORTED_COMPRESSION = new Set([1, 5, 8, 32946, 32773]);

/**
 * The most bytes one stored byte can decode to, by compression: none 1; LZW at most 4096 bytes from one
 * code of at least 9 bits (a table entry is never longer than the table); Deflate 1032 (a 258-byte match
 * coded in two bits, RFC 1951); PackBits 64 (two bytes repeat one 128 times).
 */
const MAX_EXPANSION: Record<number, number> = { 1: 1, 5: (4096 * 8) / 9, 8: 1032, 32946: 1032, 32773: 64 };

const COMPRESSION_NAMES: Record<number, string> = {
  2: 'CCITT modified Huffman', 3: 'CCITT Group 3', 4: 'CCITT Group 4', 6: 'old-style JPEG', 7: 'JPEG',
  34712: 'JPEG 2000', 34887: 'LERC', 34925: 'LZMA', 50000: 'Zstandard', 50001: 'WebP', 50002: 'JPEG XL',
};

type TagValue = number | string | ArrayLike<number> | undefined;

function first(v: TagValue, fallback: number): number {
  if (v === undefined) return fallback;
  if (typeof v === 'number') return v;
  if (typeof v === 'string') return fallback;
  return v.length > 0 ? Number(v[0]) : fallback;
}

function list(v: TagValue): number[] {
  if (v === undefined || typeof v === 'string') return [];
  if (typeof v === 'number') return [v];
  return Array.from(v, Number);
}

/** A RATIONAL tag as geotiff returns it ([numerator, denominator]) to a number, or null. */
function rational(v: TagValue): number | null {
  const a = list(v);
  if (a.length === 1) return a[0]!;
  if (a.length >= 2 && a[1] !== 0) return a[0]! / a[1]!;
  return null;
}

/** What one IFD says, read before any pixel is decoded. */
interface PageInfo {
  image: GeoTIFFImage;
  width: number;
  height: number;
  bits: number;
  photometric: number;
  samplesPerPixel: number;
}

async function tag(image: GeoTIFFImage, name: string): Promise<TagValue> {
  // Names are geotiff's tag names; the cast keeps its template types out of this small helper.
  return (await image.getFileDirectory().loadValue(name as never)) as TagValue;
}

async function inspectPage(image: GeoTIFFImage, bytes: Uint8Array, index: number, maxPixels: number, name?: string): Promise<PageInfo> {
  const p = namePrefix(name);
  const page = index > 0 ? ` (page ${index + 1})` : '';
  const width = image.getWidth();
  const height = image.getHeight();
  checkDimensions(width, height, maxPixels, name);

  const compression = first(await tag(image, 'Compression'), 1);
  if (!SUPPORTED_COMPRESSION.has(compression)) {
    const label = COMPRESSION_NAMES[compression] ? ` (${COMPRESSION_NAMES[compression]})` : '';
    throw new UnsupportedFormatError(
      `${p}TIFF compression ${compression}${label}${page} is not supported; re-save as uncompressed, LZW or Deflate TIFF`,
    );
  }
  const samplesPerPixel = first(await tag(image, 'SamplesPerPixel'), 1);
  const bitsList = list(await tag(image, 'BitsPerSample'));
  const bits = bitsList.length > 0 ? bitsList[0] : 1;
  const formats = list(await tag(image, 'SampleFormat'));
  const sampleFormat = formats.length > 0 ? formats[0] : 1;
  if (sampleFormat === 3) {
    throw new UnsupportedFormatError(
      `${p}${bits}-bit floating-point TIFF samples${page} are not supported; convert the image to 8- or 16-bit integer first`,
    );
  }
  if (bits === 32 || bits === 64) {
    throw new UnsupportedFormatError(`${p}${bits}-bit TIFF samples${page} are not supported; convert the image to 16-bit first`);
  }
  if (sampleFormat === 2) {
    throw new UnsupportedFormatError(`${p}signed-integer TIFF samples${page} are not supported; convert the image to unsigned 8- or 16-bit first`);
  }
  if ((bits !== 8 && bits !== 16) || bitsList.some((b) => b !== bits)) {
    throw new UnsupportedFormatError(`${p}TIFF with ${bitsList.join('/')} bits per sample${page} is not supported; re-save as 8- or 16-bit`);
  }
  const photometric = first(await tag(image, 'PhotometricInterpretation'), samplesPerPixel >= 3 ? 2 : 1);
  if (photometric > 3) {
    throw new UnsupportedFormatError(
      `${p}TIFF photometric interpretation ${photometric}${page} (e.g. CMYK, YCbCr, Lab) is not supported; re-save as grey or RGB`,
    );
  }
  if (photometric === 2 && samplesPerPixel < 3) {
    throw new ImageDecodeError(`${p}the TIFF says RGB but has ${samplesPerPixel} sample per pixel${page}; re-save it`);
  }

  // Strips or tiles must lie inside the file; geotiff would otherwise read past the end.
  const tiled = image.getFileDirectory().hasTag('TileOffsets');
  if (tiled) {
    // A tile is decoded whole; one far larger than the page (65536 x 65536 on a 16 x 16 page) is a bomb.
    const tw = first(await tag(image, 'TileWidth'), 0);
    const th = first(await tag(image, 'TileLength'), 0);
    if (!(tw > 0 && th > 0) || tw * th > Math.max(4 * width * height, 1024 * 1024)) {
      throw new ImageDecodeError(`${p}the TIFF's tiles (${tw} x ${th} px) do not fit its ${width} x ${height} px page${page}; the file is damaged: re-save it`);
    }
  }
  const offsets = list(await tag(image, tiled ? 'TileOffsets' : 'StripOffsets'));
  const counts = list(await tag(image, tiled ? 'TileByteCounts' : 'StripByteCounts'));
  if (offsets.length === 0 || counts.length !== offsets.length) {
    throw new ImageDecodeError(`${p}the TIFF has no readable ${tiled ? 'tile' : 'strip'} table${page}; re-save it`);
  }
  let stored = 0;
  for (let i = 0; i < offsets.length; i++) {
    if (offsets[i]! + counts[i]! > bytes.length) {
      throw new ImageDecodeError(`${p}the TIFF file is truncated (its image data ends after the file does)${page}; copy or export it again`);
    }
    stored += counts[i]!;
  }
  // The page's raster is allocated before its strips are decoded: a few stored bytes must not promise
  // 100 megapixels. No compression read here expands more than MAX_EXPANSION says.
  const needed = (width * height * samplesPerPixel * bits) / 8;
  if (stored * MAX_EXPANSION[compression]! < needed) {
    throw new ImageDecodeError(
      `${p}the TIFF's image data${page} (${stored} bytes) is too short for the ${width} x ${height} px its header gives; the file is damaged or cut short: copy or export it again`,
    );
  }
  return { image, width, height, bits, photometric, samplesPerPixel };
}

async function readPage(info: PageInfo, name?: string, index = 0): Promise<{ raster: InterleavedImage; colour: boolean }> {
  const p = namePrefix(name);
  const { image, width, height, bits, photometric } = info;
  const bitDepth = bits as 8 | 16;
  const samples = photometric === 2 ? [0, 1, 2] : [0];
  let data: Uint8Array | Uint16Array;
  try {
    const r = await image.readRasters({ samples, interleave: true, pool: boundedPool(image.getFileDirectory().hasTag('TileOffsets') ? null : height) as never });
    data = r as unknown as Uint8Array | Uint16Array;
  } catch (e) {
    if (e instanceof BlockError && e.overflow) {
      throw new ImageDecodeError(
        `${p}page ${index + 1} of the TIFF decodes to more than the ${width} x ${height} px its header gives; the file is damaged or made to exhaust memory: re-save it`,
      );
    }
    const why = e instanceof Error ? e.message.replace(/\s+/g, ' ') : String(e);
    throw new ImageDecodeError(`${p}page ${index + 1} of the TIFF could not be decoded (${why}); re-save it as uncompressed or LZW TIFF`);
  }
  if (!(data instanceof Uint8Array || data instanceof Uint16Array) || data.length !== width * height * samples.length) {
    throw new ImageDecodeError(`${p}page ${index + 1} of the TIFF decoded to the wrong number of samples; re-save it`);
  }
  if (photometric === 0) {
    // WhiteIsZero: 0 is white, so invert to the usual black-is-zero.
    const max = bits === 16 ? 65535 : 255;
    for (let i = 0; i < data.length; i++) data[i] = max - data[i]!;
  }
  if (photometric === 3) {
    const map = list(await tag(image, 'ColorMap'));
    const n = 1 << bits;
    if (map.length !== 3 * n) {
      throw new ImageDecodeError(`${p}the TIFF palette has ${map.length} entries instead of ${3 * n}; re-save it as grey or RGB`);
    }
    // ColorMap holds 16-bit R, then G, then B values; 8-bit RGB is enough for a palette of at most 65536.
    const rgb = new Uint8Array(width * height * 3);
    let colour = false;
    for (let i = 0; i < data.length; i++) {
      const k = data[i]!;
      const r = Math.round(map[k]! / 257), g = Math.round(map[n + k]! / 257), b = Math.round(map[2 * n + k]! / 257);
      rgb[3 * i] = r; rgb[3 * i + 1] = g; rgb[3 * i + 2] = b;
      if (r !== g || g !== b) colour = true;
    }
    return { raster: { width, height, data: rgb, channels: 3, bitDepth: 8 }, colour };
  }
  return {
    raster: { width, height, data, channels: photometric === 2 ? 3 : 1, bitDepth },
    colour: photometric === 2,
  };
}

const UM_PER_RESOLUTION_UNIT: Record<number, number> = { 2: 25400, 3: 10000 };

/**
 * Pixel size from the TIFF 6.0 resolution tags (Adobe 1992, "TIFF Revision 6.0", section 8): XResolution and
 * YResolution are pixels per ResolutionUnit; unit 2 = inch (25 400 µm), 3 = centimetre (10 000 µm).
 * Unit 1 (no absolute unit) gives null. An absent ResolutionUnit also gives null: TIFF 6.0 defaults it to
 * inch, but a file that does not name its unit rarely carries a real calibration (editors write 72 dpi).
 */
async function resolutionUm(image: GeoTIFFImage): Promise<{ x: number | null; y: number | null }> {
  const unitTag = await tag(image, 'ResolutionUnit');
  const umPerUnit = unitTag === undefined ? undefined : UM_PER_RESOLUTION_UNIT[first(unitTag, 1)];
  if (umPerUnit === undefined) return { x: null, y: null };
  const xr = rational(await tag(image, 'XResolution'));
  const yr = rational(await tag(image, 'YResolution'));
  return {
    x: xr !== null && xr > 0 && Number.isFinite(xr) ? umPerUnit / xr : null,
    y: yr !== null && yr > 0 && Number.isFinite(yr) ? umPerUnit / yr : null,
  };
}

/**
 * Decodes every page of a TIFF with geotiff: 8- or 16-bit unsigned samples, grey (BlackIsZero or WhiteIsZero),
 * RGB (extra samples such as alpha are ignored) or palette; strips or tiles; chunky or planar; uncompressed,
 * LZW (5), Deflate (8, 32946) or PackBits (32773), with or without a horizontal predictor.
 * All page headers are checked ({@link checkDimensions}, compression, sample format, data inside the file)
 * before any page's pixels are decoded.
 *
 * @param bytes - the whole file
 * @param maxPixels - limit on width x height of each page
 * @param name - file name for messages
 */
export async function decodeTiffRaster(bytes: Uint8Array, maxPixels: number, name?: string): Promise<TiffRaster> {
  const p = namePrefix(name);
  const buffer = (bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength
    ? bytes.buffer
    : bytes.slice().buffer) as ArrayBuffer;
  const infos: PageInfo[] = [];
  let tiff: GeoTIFF;
  try {
    tiff = await fromArrayBuffer(buffer);
    // The chain of IFDs is walked here rather than counted by geotiff, which follows a chain that loops back
    // on itself for ever: each IFD is read once, at most MAX_TIFF_PAGES of them.
    const seen = new Set<number>([tiff.firstIFDOffset]);
    let total = 0;
    for (let i = 0; ; i++) {
      const image = await tiff.getImage(i);
      const info = await inspectPage(image, bytes, i, maxPixels, name);
      infos.push(info);
      total += info.width * info.height;
      if (total > MAX_TIFF_TOTAL_PIXELS) {
        throw new ImageTooLargeError(`${p}the first ${i + 1} pages of the TIFF hold more than ${MAX_TIFF_TOTAL_PIXELS / 1e6} megapixels together, more than is read from one file; split the series into several files`);
      }
      const next = image.getFileDirectory().nextIFDByteOffset;
      if (!next) break;
      if (seen.has(next)) {
        throw new ImageDecodeError(`${p}the TIFF's list of pages loops back on itself after page ${i + 1} (the file is damaged); re-save it`);
      }
      if (next >= bytes.length) {
        throw new ImageDecodeError(`${p}the TIFF file is truncated (page ${i + 2} would start after the end of the file); copy or export it again`);
      }
      if (i + 1 >= MAX_TIFF_PAGES) {
        throw new ImageTooLargeError(`${p}the TIFF has more than ${MAX_TIFF_PAGES} pages, more than is read from one file; split the series into several files`);
      }
      seen.add(next);
    }
  } catch (e) {
    if (e instanceof TessellabError) throw e;
    const why = e instanceof Error ? e.message.replace(/\s+/g, ' ') : String(e);
    throw new ImageDecodeError(`${p}the TIFF file is truncated or damaged (${why}); copy or export it again`);
  }
  const pages: InterleavedImage[] = [];
  let colour = false;
  for (let i = 0; i < infos.length; i++) {
    const { raster, colour: c } = await readPage(infos[i]!, name, i);
    pages.push(raster);
    colour ||= c;
  }

  return { pages, colour, ...(await pixelSize(infos[0]!.image)) };
}

/**
 * The pixel size a page's tags give: OME-XML PhysicalSizeX/Y in the ImageDescription when present, else the
 * resolution tags. Damaged tags give no pixel size rather than an error: the pixels are still good.
 */
async function pixelSize(image: GeoTIFFImage): Promise<Pick<TiffRaster, 'umPerPx' | 'umPerPxY' | 'pixelSizeKind'>> {
  try {
    const description = await tag(image, 'ImageDescription');
    const ome = typeof description === 'string' ? readOmePixelSize(description) : null;
    if (ome && ome.xUm !== null) return { umPerPx: ome.xUm, umPerPxY: ome.yUm, pixelSizeKind: 'microscope' };
    const res = await resolutionUm(image);
    return { umPerPx: res.x, umPerPxY: res.y, pixelSizeKind: 'resolution' };
  } catch {
    return { umPerPx: null, umPerPxY: null, pixelSizeKind: 'resolution' };
  }
}
