/**
 * The radially summed power spectrum of an 8-bit image, on opencv.js's DFT (cv.dft). Used by the size
 * hint (src/core/segment/size.ts). Every Mat is freed in a `finally` (withMats).
 */
import type { CV } from './index';
import { withMats } from './mats';

/** The largest side (px) of the square-ish window the spectrum is taken over; a larger image gives its centre. */
export const SPECTRUM_WINDOW_PX = 512;

/**
 * Power summed over rings of the 2-D spectrum: ring k holds the frequencies whose radius, in cycles per
 * window of side K = max(window width, window height), rounds to k; so ring k is the wavelength K / k px.
 * The window is the centred part of the image of at most SPECTRUM_WINDOW_PX a side, mean removed and
 * tapered by a Hann window in both directions (so the image's border makes no spectrum of its own; trade).
 *
 * @param img8 8-bit grey values, row-major, width × height
 * @returns ring power (index k = 0 .. K/2) and K
 */
export function radialPowerSpectrum(cv: CV, img8: Uint8Array, width: number, height: number): { power: Float64Array; sidePx: number } {
  const W = Math.min(width, SPECTRUM_WINDOW_PX);
  const H = Math.min(height, SPECTRUM_WINDOW_PX);
  const x0 = (width - W) >> 1;
  const y0 = (height - H) >> 1;
  const K = Math.max(W, H);
  return withMats((track) => {
    const m = track(new cv.Mat(H, W, cv.CV_32F));
    const d = m.data32F as Float32Array;
    let mean = 0;
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) mean += img8[(y + y0) * width + x + x0]!;
    mean /= W * H;
    const hx = new Float64Array(W);
    for (let x = 0; x < W; x++) hx[x] = 0.5 - 0.5 * Math.cos((2 * Math.PI * (x + 0.5)) / W);
    for (let y = 0; y < H; y++) {
      const hy = 0.5 - 0.5 * Math.cos((2 * Math.PI * (y + 0.5)) / H);
      for (let x = 0; x < W; x++) d[y * W + x] = (img8[(y + y0) * width + x + x0]! - mean) * hx[x]! * hy;
    }
    const f = track(new cv.Mat());
    cv.dft(m, f, cv.DFT_COMPLEX_OUTPUT, 0);
    const c = f.data32F as Float32Array;
    const half = K >> 1;
    const power = new Float64Array(half + 1);
    for (let v = 0; v < H; v++) {
      const fv = (v <= H / 2 ? v : v - H) / H;
      for (let u = 0; u < W; u++) {
        const fu = (u <= W / 2 ? u : u - W) / W;
        const k = Math.round(Math.sqrt(fu * fu + fv * fv) * K);
        if (k > half) continue;
        const re = c[2 * (v * W + u)]!;
        const im = c[2 * (v * W + u) + 1]!;
        power[k]! += re * re + im * im;
      }
    }
    return { power, sidePx: K };
  });
}
