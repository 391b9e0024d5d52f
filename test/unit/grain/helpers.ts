import type { LabelImage } from '../../../src/core/types';

/** A label image from a function of the pixel; labels must come out as 1..count (0 = wall). */
export function makeLabels(width: number, height: number, fn: (x: number, y: number) => number): LabelImage {
  const labels = new Int32Array(width * height);
  let count = 0;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const l = fn(x, y);
      labels[y * width + x] = l;
      if (l > count) count = l;
    }
  }
  return { width, height, labels, count };
}

/** A grid of square grains of side `side` px, numbered row by row from 1. */
export function squareGrid(width: number, height: number, side: number): LabelImage {
  const cols = Math.ceil(width / side);
  return makeLabels(width, height, (x, y) => Math.floor(y / side) * cols + Math.floor(x / side) + 1);
}
