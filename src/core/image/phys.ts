/**
 * Writes the pixel size into a PNG as a pHYs chunk (PNG 1.2 specification, section 4.2.4.2: pixels per
 * unit, unit 1 = metre), so that calibrated images carry their calibration.
 */

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** CRC-32 of the PNG specification (ISO 3309 polynomial). */
export function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (let i = 0; i < bytes.length; i++) c = CRC_TABLE[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/**
 * A copy of `png` with a pHYs chunk after IHDR giving `umPerPx` µm per pixel in x and y
 * (pixels per metre = round(10⁶ / umPerPx)).
 */
export function withPixelSize(png: Uint8Array, umPerPx: number): Uint8Array {
  if (!(umPerPx > 0) || !Number.isFinite(umPerPx)) throw new RangeError(`withPixelSize: pixel size must be positive; got ${umPerPx}`);
  const ppm = Math.round(1e6 / umPerPx);
  const chunk = new Uint8Array(4 + 4 + 9 + 4);
  const dv = new DataView(chunk.buffer);
  dv.setUint32(0, 9);
  chunk.set([0x70, 0x48, 0x59, 0x73], 4); // "pHYs"
  dv.setUint32(8, ppm);
  dv.setUint32(12, ppm);
  chunk[16] = 1;
  dv.setUint32(17, crc32(chunk.subarray(4, 17)));
  // IHDR is always first: 8-byte signature + 4 length + 4 type + 13 data + 4 crc = 33 bytes.
  const out = new Uint8Array(png.length + chunk.length);
  out.set(png.subarray(0, 33), 0);
  out.set(chunk, 33);
  out.set(png.subarray(33), 33 + chunk.length);
  return out;
}
