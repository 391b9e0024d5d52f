/** The one threshold of a series: Otsu's method on a 256-bin histogram, with its effectiveness measure. */

/** 256-bin histogram of 8-bit values. */
export function histogram256(data: Uint8Array): Float64Array {
  const h = new Float64Array(256);
  for (let i = 0; i < data.length; i++) h[data[i]!] = h[data[i]!]! + 1;
  return h;
}

/**
 * Otsu's threshold: the T that maximises the between-class variance σ_B²(T) = w₀w₁(μ₀ − μ₁)² of the classes
 * {≤ T} and {> T}, and the effectiveness η = σ_B²(T)/σ_T² (1 for two spikes, small for one mode)
 * (Otsu 1979, "A threshold selection method from gray-level histograms", IEEE Trans. SMC 9:62).
 *
 * @param hist counts per grey level 0..255 (any non-negative weights)
 */
export function otsu(hist: Float64Array): { threshold: number; effectiveness: number } {
  let total = 0;
  let sum = 0;
  for (let i = 0; i < 256; i++) {
    total += hist[i]!;
    sum += i * hist[i]!;
  }
  if (!(total > 0)) return { threshold: 0, effectiveness: 0 };
  const mean = sum / total;
  let varT = 0;
  for (let i = 0; i < 256; i++) varT += hist[i]! * (i - mean) ** 2;
  varT /= total;
  let w0 = 0;
  let s0 = 0;
  let best = -1;
  let threshold = 0;
  for (let t = 0; t < 255; t++) {
    w0 += hist[t]!;
    s0 += t * hist[t]!;
    const w1 = total - w0;
    if (w0 === 0 || w1 === 0) continue;
    const m0 = s0 / w0;
    const m1 = (sum - s0) / w1;
    const sb = (w0 / total) * (w1 / total) * (m0 - m1) ** 2;
    if (sb > best) {
      best = sb;
      threshold = t;
    }
  }
  return { threshold, effectiveness: varT > 0 && best > 0 ? best / varT : 0 };
}
