/** Micrometres per one unit of length, for the length units an OME-XML PhysicalSize may carry. */
const UM_PER_UNIT: Record<string, number> = {
  '\u00c5': 1e-4, '\u212b': 1e-4, pm: 1e-6, nm: 1e-3,
  '\u00b5m': 1, '\u03bcm': 1, um: 1, micron: 1, microns: 1, micrometer: 1, micrometre: 1,
  mm: 1e3, cm: 1e4, dm: 1e5, m: 1e6,
};

/** The character of a numeric character reference, or the reference as written when it names none. */
function codePoint(ref: string, n: number): string {
  return Number.isInteger(n) && n >= 0 && n <= 0x10ffff ? String.fromCodePoint(n) : ref;
}

function decodeXmlEntities(s: string): string {
  return s
    .replace(/&#x([0-9a-f]+);/gi, (ref, h: string) => codePoint(ref, parseInt(h, 16)))
    .replace(/&#([0-9]+);/g, (ref, d: string) => codePoint(ref, parseInt(d, 10)))
    .replace(/&amp;/g, '&');
}

function attribute(tag: string, attr: string): string | null {
  const m = new RegExp(`\\s${attr}\\s*=\\s*(?:"([^"]*)"|'([^']*)')`).exec(tag);
  if (!m) return null;
  return decodeXmlEntities((m[1] ?? m[2]!).trim());
}

/** The physical pixel size an OME-XML document gives, in µm, for x and y (null where absent or unreadable). */
export interface OmePixelSize {
  xUm: number | null;
  yUm: number | null;
}

function sizeUm(tag: string, axis: 'X' | 'Y'): number | null {
  const value = attribute(tag, `PhysicalSize${axis}`);
  if (value === null) return null;
  const v = Number(value);
  if (!Number.isFinite(v) || v <= 0) return null;
  // The OME schema's default unit for PhysicalSizeX/Y is the micrometre.
  const unit = attribute(tag, `PhysicalSize${axis}Unit`) ?? '\u00b5m';
  const factor = UM_PER_UNIT[unit];
  return factor === undefined ? null : v * factor;
}

/**
 * Reads the physical pixel size from OME-XML (as stored in a TIFF ImageDescription): the `PhysicalSizeX`,
 * `PhysicalSizeY` attributes of the first `Pixels` element and their `PhysicalSizeXUnit` / `PhysicalSizeYUnit`
 * (default µm per the OME Data Model schema, Open Microscopy Environment, 2016; Goldberg et al. 2005,
 * "The Open Microscopy Environment (OME) Data Model and XML file", Genome Biology 6:R47).
 * Units understood: Å, pm, nm, µm (micro sign or Greek mu, or "um"), mm, cm, dm, m; any other unit gives null.
 * The XML is matched with regular expressions (no DOM: this runs in workers and Node alike).
 *
 * @param description - the ImageDescription text
 * @returns µm per pixel in x and y, or null when the text is not OME-XML or carries no usable size
 */
export function readOmePixelSize(description: string): OmePixelSize | null {
  if (!/<OME[\s>]/.test(description)) return null;
  const pixels = /<(?:[A-Za-z_][\w.-]*:)?Pixels\b[^>]*>/.exec(description);
  if (!pixels) return null;
  const tag = pixels[0];
  return { xUm: sizeUm(tag, 'X'), yUm: sizeUm(tag, 'Y') };
}
