/**
 * Grain size numbers of ASTM E112 and ISO 643 from the counted quantities, and back.
 * All lengths in mm, areas in mm², counts per mm or per mm², at 1× (true size on the specimen).
 */

/** Lowest and highest G the standard's table covers: 00 (written for G = −1) to 14. */
export const G_MIN = -1;
export const G_MAX = 14;

/**
 * ASTM grain size number from the number of grains per mm² (planimetric method).
 *
 * G = 3.321928·log₁₀ N_A − 2.954. This follows from the definition N_AE = 2^(G−1) grains per in² at 100×:
 * one in² at 100× is 645.16/10⁴ mm² of specimen, so N_A = 15.500·2^(G−1) and log₂ 15.5 − 1 = 2.954.
 * (ASTM E112, Standard Test Methods for Determining Average Grain Size.)
 *
 * @param NA_per_mm2 grains per mm² at 1× (> 0)
 * @returns G (not rounded)
 */
export function gFromNA(NA_per_mm2: number): number {
  return 3.321928 * Math.log10(NA_per_mm2) - 2.954;
}

/** Inverse of {@link gFromNA}: grains per mm² at grain size number G. */
export function naFromG(G: number): number {
  return 10 ** ((G + 2.954) / 3.321928);
}

/**
 * ASTM grain size number from the mean lineal intercept length (intercept method).
 *
 * G = −6.643856·log₁₀ ℓ̄ − 3.288 = 6.643856·log₁₀ N_L − 3.288, ℓ̄ = 1/N_L in mm.
 * (ASTM E112, Standard Test Methods for Determining Average Grain Size.)
 *
 * @param l_mm mean lineal intercept ℓ̄ in mm (> 0)
 */
export function gFromMeanIntercept(l_mm: number): number {
  return -6.643856 * Math.log10(l_mm) - 3.288;
}

/** Inverse of {@link gFromMeanIntercept}: mean lineal intercept (mm) at grain size number G. */
export function meanInterceptFromG(G: number): number {
  return 10 ** (-(G + 3.288) / 6.643856);
}

/**
 * ASTM grain size number from the mean grain area of individually measured grains.
 *
 * G = −3.3223·log₁₀ Ā − 2.955, Ā in mm².
 * (ASTM E1382, Standard Test Methods for Determining Average Grain Size Using Semiautomatic and Automatic
 * Image Analysis.)
 *
 * @param A_mm2 mean grain area Ā in mm² (> 0)
 */
export function gFromMeanArea(A_mm2: number): number {
  return -3.3223 * Math.log10(A_mm2) - 2.955;
}

/** Inverse of {@link gFromMeanArea}: mean grain area (mm²) at grain size number G. */
export function meanAreaFromG(G: number): number {
  return 10 ** (-(G + 2.955) / 3.3223);
}

/**
 * ISO 643 grain size index for the same grain count as ASTM number G.
 *
 * ISO 643 defines m = 8·2^G_ISO grains per mm², ASTM E112 N_A = 15.500·2^(G−1) = 7.75·2^G, so for the
 * same N_A: G_ISO = G − log₂(8/7.75) = G − 0.046. (ISO 643, Steels — Micrographic determination of the
 * apparent grain size.)
 *
 * @param G ASTM grain size number
 */
export function isoFromAstm(G: number): number {
  return G - Math.log2(8 / 7.75);
}

/** G rounded to 0.1, the precision the standard reports. */
export function roundG(G: number): number {
  return Math.round(G * 10) / 10;
}

/** Whether G lies in the range of the standard's table, 00 (−1) to 14. */
export function isPlausibleG(G: number): boolean {
  return Number.isFinite(G) && G >= G_MIN - 0.05 && G <= G_MAX + 0.05;
}

/** G as the standard writes it, to 0.1: "00" for −1, otherwise the number ("7.2"). */
export function formatG(G: number): string {
  const r = roundG(G);
  if (r === -1) return '00';
  return (Object.is(r, -0) ? 0 : r).toFixed(1);
}
