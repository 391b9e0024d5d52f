/**
 * Helpers for the image tests: read a fixture made by test/fixtures/images/make.sh and recompute the pattern
 * it was made from. The fixture files were written by ImageMagick and libtiff (general-purpose reference
 * implementations of PNG, JPEG and TIFF), so decoding them checks our readers against those writers.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const DIR = fileURLToPath(new URL('../../fixtures/images/', import.meta.url));

export const W = 40;
export const H = 24;

export function fixture(name: string): Uint8Array {
  return new Uint8Array(readFileSync(DIR + name));
}

function pattern(f: (x: number, y: number) => number, Arr: Uint8ArrayConstructor | Uint16ArrayConstructor) {
  const out = new Arr(W * H);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) out[y * W + x] = f(x, y);
  return out;
}

/** grey8(x, y) = 4x + 3y + 10 + 10k (page k of multipage.tif; k = 0 elsewhere). */
export const grey8 = (k = 0) => pattern((x, y) => 4 * x + 3 * y + 10 + 10 * k, Uint8Array) as Uint8Array;
/** grey16(x, y) = (1637x + 2719y + 1) mod 65536. */
export const grey16 = () => pattern((x, y) => (1637 * x + 2719 * y + 1) % 65536, Uint16Array) as Uint16Array;
/** rgb8(x, y) = (6x, 10y, 3x + 4y + 20), interleaved RGB. */
export function rgb8(): Uint8Array {
  const out = new Uint8Array(W * H * 3);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = 3 * (y * W + x);
      out[i] = 6 * x;
      out[i + 1] = 10 * y;
      out[i + 2] = 3 * x + 4 * y + 20;
    }
  }
  return out;
}

/** rgbpal(x, y) = (6x, 10 (y mod 4), 3x + 20), interleaved RGB (160 colours). */
export function rgbpal(): Uint8Array {
  const out = new Uint8Array(W * H * 3);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = 3 * (y * W + x);
      out[i] = 6 * x;
      out[i + 1] = 10 * (y % 4);
      out[i + 2] = 3 * x + 20;
    }
  }
  return out;
}

/** Largest absolute difference between two equal-length arrays. */
export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} vs ${b.length}`);
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]! - b[i]!));
  return m;
}
