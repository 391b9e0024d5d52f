/**
 * EXIF orientation of a JPEG (Exif 2.3, CIPA DC-008, tag 0x0112 in IFD0 of the APP1 "Exif" segment): how
 * the stored rows and columns are to be turned to show the picture upright, as viewers show it.
 */
import type { InterleavedImage } from './grey';

/**
 * The Orientation value of an APP1 segment's data (from after the length field), 1..8, or 1 when the
 * segment is not Exif, has no Orientation tag, or gives a value outside 1..8 (damaged tags leave the image as
 * stored: the pixels are still good).
 */
export function exifOrientation(seg: Uint8Array): number {
  // "Exif\0\0", then a TIFF header: byte order II or MM, 42, offset of IFD0.
  if (seg.length < 14 || String.fromCharCode(...seg.subarray(0, 6)) !== 'Exif\0\0') return 1;
  const t = seg.subarray(6);
  const v = new DataView(t.buffer, t.byteOffset, t.byteLength);
  const le = t[0] === 0x49 && t[1] === 0x49;
  if (!le && !(t[0] === 0x4d && t[1] === 0x4d)) return 1;
  if (v.getUint16(2, le) !== 42) return 1;
  const ifd = v.getUint32(4, le);
  if (ifd + 2 > t.length) return 1;
  const n = v.getUint16(ifd, le);
  for (let i = 0; i < n; i++) {
    const at = ifd + 2 + 12 * i;
    if (at + 12 > t.length) return 1;
    if (v.getUint16(at, le) !== 0x0112) continue;
    if (v.getUint16(at + 2, le) !== 3) return 1; // SHORT
    const o = v.getUint16(at + 8, le);
    return o >= 1 && o <= 8 ? o : 1;
  }
  return 1;
}

/**
 * The image turned upright for an EXIF orientation: 2 mirror left-right, 3 turn 180°, 4 mirror top-bottom,
 * 5 mirror about the main diagonal, 6 turn 90° clockwise, 7 mirror about the other diagonal, 8 turn 90°
 * anticlockwise. Orientations 5 to 8 swap width and height. Orientation 1 returns the image itself.
 */
export function orientUpright(img: InterleavedImage, orientation: number): InterleavedImage {
  if (orientation < 2 || orientation > 8) return img;
  const { width: w, height: h, channels: c } = img;
  const swap = orientation >= 5;
  const W = swap ? h : w;
  const H = swap ? w : h;
  // Stored (x, y) of the upright pixel (X, Y).
  const src: (X: number, Y: number) => number = {
    2: (X: number, Y: number) => Y * w + (w - 1 - X),
    3: (X: number, Y: number) => (h - 1 - Y) * w + (w - 1 - X),
    4: (X: number, Y: number) => (h - 1 - Y) * w + X,
    5: (X: number, Y: number) => X * w + Y,
    6: (X: number, Y: number) => (h - 1 - X) * w + Y,
    7: (X: number, Y: number) => (h - 1 - X) * w + (w - 1 - Y),
    8: (X: number, Y: number) => X * w + (w - 1 - Y),
  }[orientation as 2 | 3 | 4 | 5 | 6 | 7 | 8];
  const data = new (img.data.constructor as new (n: number) => typeof img.data)(img.data.length);
  for (let Y = 0; Y < H; Y++) {
    for (let X = 0; X < W; X++) {
      const from = src(X, Y) * c;
      const to = (Y * W + X) * c;
      for (let k = 0; k < c; k++) data[to + k] = img.data[from + k]!;
    }
  }
  return { ...img, width: W, height: H, data };
}
