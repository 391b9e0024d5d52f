/** Test images without any cell structure. */
import type { GreyImage } from '../../src/core/types';

/** White noise: the sum of four uniforms per pixel (a seeded Park–Miller sequence), no structure at all. */
export function noise(W: number, H: number, seed: number): GreyImage {
  let s = seed;
  const rnd = () => ((s = (s * 16807) % 2147483647) / 2147483647);
  const data = new Uint8Array(W * H);
  for (let i = 0; i < data.length; i++) {
    let g = 0;
    for (let k = 0; k < 4; k++) g += rnd();
    data[i] = Math.max(0, Math.min(255, Math.round(128 + (g - 2) * 110)));
  }
  return { width: W, height: H, data, bitDepth: 8 };
}
