/**
 * The size hint: the typical cell diameter (px) read from the image itself, which sets the scale of the
 * walls segmentation's automatic settings (smoothing, marker dynamic, smallest cell).
 *
 * A cellular pattern repeats at about its cell spacing, so the power of its spectrum, summed over rings of
 * equal frequency, peaks at a wavelength near that spacing (the structure factor's first peak; trade). For a
 * tiling, the ring of the peak is taken on the prepared (flattened) image; the wavelength λ of the peak is
 * turned into the equivalent-circle diameter of a cell by D = 1.15 λ: a hexagonal tiling of centre spacing a
 * has its first spectral peak at λ = (√3/2) a and cells of equivalent diameter a·√(2√3/π) = 1.05 a, so
 * D/λ = 1.21 (derived); for Poisson–Voronoi tilings the peak sits nearer the mean spacing and the ratio is
 * lower; 1.15 lies between (calibrated on the project's generated tilings, whose true diameter the tests
 * compare against).
 */
import type { CV } from '../cv/index';
import { radialPowerSpectrum } from '../cv/spectrum';

/** D = SPACING_TO_DIAMETER × the wavelength of the spectral peak (see above). */
export const SPACING_TO_DIAMETER = 1.15;

/** The smallest wavelength (px) searched: cells under about 3 px across cannot be segmented anyway. */
const MIN_WAVELENGTH_PX = 2.5;
/** The largest wavelength searched, as a fraction of the spectrum window's side: a third (three cells across at least). */
const MAX_WAVELENGTH_FRACTION = 1 / 3;

/**
 * The typical cell diameter (px, equivalent circle) of a prepared 8-bit walls image.
 * @returns the diameter, and the wavelength of the spectral peak it came from
 */
export function estimateCellDiameter(cv: CV, prepared: Uint8Array, width: number, height: number): { diameterPx: number; wavelengthPx: number } {
  const { power, sidePx: K } = radialPowerSpectrum(cv, prepared, width, height);
  const kLo = Math.ceil(1 / MAX_WAVELENGTH_FRACTION);
  const kHi = Math.min(power.length - 2, Math.floor(K / MIN_WAVELENGTH_PX));
  // Ring powers smoothed over three rings (a ring's count of frequencies grows with k, so single rings are noisy).
  let best = -1;
  let bk = -1;
  const sm = (k: number): number => (power[k - 1]! + power[k]! + power[k + 1]!) / 3;
  for (let k = kLo; k <= kHi; k++) {
    const v = sm(k);
    if (v > best) (best = v), (bk = k);
  }
  if (bk < 0) return { diameterPx: Math.min(width, height), wavelengthPx: Math.min(width, height) };
  // Parabolic refinement of the peak ring (trade).
  let kk = bk;
  if (bk > kLo && bk < kHi) {
    const a = sm(bk - 1);
    const c = sm(bk + 1);
    const den = a - 2 * best + c;
    if (den < 0) kk = bk + (0.5 * (a - c)) / den;
  }
  const wavelengthPx = K / kk;
  return { diameterPx: SPACING_TO_DIAMETER * wavelengthPx, wavelengthPx };
}
