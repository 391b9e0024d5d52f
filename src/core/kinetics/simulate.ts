/**
 * A simulated planar transformation rendered as an image series, for tests and demo data: circular domains
 * of the new phase grow at a constant radial speed from random nuclei on a periodic (toroidal) field, so
 * the field has no edge and the expected fraction is exactly the JMAK law.
 */
import { SettingsError } from '../errors';
import { mulberry32, normal } from '../random';
import type { GreyImage } from '../types';

const NOISE_TABLE = 1 << 16;

export type GrowthMode = 'site-saturation' | 'constant-rate';

export interface GrowthOptions {
  /** Field size in px. */
  width: number;
  height: number;
  /** 'site-saturation': all nuclei present at t = 0; 'constant-rate': nuclei appear at a constant rate. */
  mode: GrowthMode;
  /** Nuclei per px² (site saturation). */
  density?: number;
  /** Nuclei per px² per time unit (constant rate). */
  rate?: number;
  /** Radial growth speed in px per time unit. */
  speed: number;
  /** Frame times (time unit), increasing. */
  times: number[];
  seed: number;
  /** Grey levels (0..255) of the untransformed matrix and of the domains, and the noise sd. */
  matrixLevel?: number;
  domainLevel?: number;
  noiseSd?: number;
}

export interface Nucleus {
  /** Position in px (continuous, pixel centres at +0.5). */
  x: number;
  y: number;
  /** Time the nucleus appears (time unit). */
  t: number;
}

export interface GrowthTruth {
  mode: GrowthMode;
  /** Expected Avrami exponent and rate of f = 1 − exp(−k·tⁿ): n = 2, k = πλv² or n = 3, k = πIv²/3. */
  n: number;
  k: number;
  density: number | null;
  rate: number | null;
  speed: number;
  /** Every nucleus drawn, including those that appear inside already transformed regions. */
  nuclei: Nucleus[];
  /** The JMAK fraction expected at each frame time. */
  expectedFraction: number[];
  /** The fraction of pixels painted as transformed in each frame (before noise). */
  renderedFraction: number[];
}

/**
 * Renders the frames of a simulated planar transformation. A pixel is transformed at time t when its centre
 * lies within v·(t − tᵢ) of some nucleus i with tᵢ < t (distances taken on the torus). Nuclei that appear
 * inside an already transformed region are drawn too: their discs stay inside the region that covers them,
 * which is why the expected fraction is exactly 1 − exp(−k·tⁿ) (Kolmogorov 1937; Avrami 1939).
 * Site saturation: N = round(λ·W·H) nuclei placed uniformly, so λ is exact. Constant rate: N = round(I·W·H·T)
 * nuclei up to the last frame time T with stratified appearance times ((j + u)/N)·T, so the number that
 * has appeared by any t is I·W·H·t to within one nucleus.
 * Expected: n = 2, k = πλv² (site saturation); n = 3, k = πIv²/3 (constant rate) (derived; docs/check-values.md §4).
 *
 * @returns 8-bit frames (bright domains on a dark matrix with Gaussian noise) and the truth behind them
 */
export function simulateGrowth(opts: GrowthOptions): { frames: GreyImage[]; truth: GrowthTruth } {
  const { width: W, height: H, mode, speed: v, times, seed } = opts;
  if (!Number.isInteger(W) || !Number.isInteger(H) || W < 8 || H < 8) throw new SettingsError('The simulated field must be at least 8 x 8 px (whole numbers).');
  if (!(v > 0)) throw new SettingsError('The growth speed must be a positive number of px per time unit.');
  if (times.length === 0 || times.some((t, i) => !Number.isFinite(t) || t < 0 || (i > 0 && t <= times[i - 1]!))) {
    throw new SettingsError('The frame times must be non-negative and increasing.');
  }
  const matrix = opts.matrixLevel ?? 60;
  const domain = opts.domainLevel ?? 190;
  const sd = opts.noiseSd ?? 6;
  const rng = mulberry32(seed);
  const nuclei: Nucleus[] = [];
  let n: number;
  let k: number;
  if (mode === 'site-saturation') {
    const lambda = opts.density;
    if (!(lambda !== undefined && lambda > 0)) throw new SettingsError('Site saturation needs a positive density (nuclei per px²).');
    const N = Math.round(lambda * W * H);
    for (let j = 0; j < N; j++) nuclei.push({ x: rng() * W, y: rng() * H, t: 0 });
    n = 2;
    k = Math.PI * lambda * v * v;
  } else {
    const I = opts.rate;
    if (!(I !== undefined && I > 0)) throw new SettingsError('A constant nucleation rate must be a positive number (nuclei per px² per time unit).');
    const T = times[times.length - 1]!;
    const N = Math.round(I * W * H * T);
    for (let j = 0; j < N; j++) {
      const t = ((j + rng()) / N) * T;
      nuclei.push({ x: rng() * W, y: rng() * H, t });
    }
    n = 3;
    k = (Math.PI * I * v * v) / 3;
  }
  const frames: GreyImage[] = [];
  const renderedFraction: number[] = [];
  const mask = new Uint8Array(W * H);
  // Noise comes from a table of normal deviates picked at random: one uniform draw per pixel keeps the
  // series quick to render, and the grey levels still have the chosen sd.
  const table = new Float64Array(NOISE_TABLE);
  for (let i = 0; i < NOISE_TABLE; i++) table[i] = sd * normal(rng);
  for (const t of times) {
    mask.fill(0);
    for (const nu of nuclei) if (nu.t < t) paintDisc(mask, W, H, nu.x, nu.y, v * (t - nu.t));
    let painted = 0;
    const data = new Uint8Array(W * H);
    for (let i = 0; i < W * H; i++) {
      painted += mask[i]!;
      const g = (mask[i] ? domain : matrix) + table[(rng() * NOISE_TABLE) | 0]!;
      data[i] = g < 0 ? 0 : g > 255 ? 255 : Math.round(g);
    }
    renderedFraction.push(painted / (W * H));
    frames.push({ width: W, height: H, data, bitDepth: 8 });
  }
  return {
    frames,
    truth: {
      mode,
      n,
      k,
      density: mode === 'site-saturation' ? opts.density! : null,
      rate: mode === 'constant-rate' ? opts.rate! : null,
      speed: v,
      nuclei,
      expectedFraction: times.map((t) => -Math.expm1(-k * Math.pow(t, n))),
      renderedFraction,
    },
  };
}

/** Sets to 1 every pixel whose centre lies within r of (cx, cy) on the W × H torus. */
function paintDisc(mask: Uint8Array, W: number, H: number, cx: number, cy: number, r: number): void {
  if (!(r > 0)) return;
  const y0 = Math.ceil(cy - r - 0.5);
  const y1 = Math.floor(cy + r - 0.5);
  for (let py = y0; py <= y1; py++) {
    const dy = py + 0.5 - cy;
    const hw = Math.sqrt(Math.max(r * r - dy * dy, 0));
    let x0 = Math.ceil(cx - hw - 0.5);
    let x1 = Math.floor(cx + hw - 0.5);
    if (x1 < x0) continue;
    if (x1 - x0 >= W) {
      x0 = 0;
      x1 = W - 1;
    }
    const row = (((py % H) + H) % H) * W;
    const a = ((x0 % W) + W) % W;
    const len = x1 - x0 + 1;
    if (a + len <= W) mask.fill(1, row + a, row + a + len);
    else {
      mask.fill(1, row + a, row + W);
      mask.fill(1, row, row + a + len - W);
    }
  }
}
