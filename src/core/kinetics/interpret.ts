/**
 * What a JMAK fit of planar growth says about nucleation and growth, checked against the domains themselves:
 * the nucleus density or rate from the early frames and the radial growth speed of isolated domains.
 */
import type { JmakFit } from './fit';
import type { FrameTrack } from './track';
import type { Estimate, KCheck, KineticsInterpretation } from './types';

/** Frames up to this fraction count as early: domains are still mostly apart. */
export const EARLY_MAX_FRACTION = 0.1;
/** Domains smaller than this (px) are not used for the growth speed: their radius is too coarse. */
const MIN_SPEED_AREA_PX = 12;

export const ASSUMPTIONS = [
  'Growth is planar (2-D) and isotropic with a constant radial speed (interface-controlled).',
  'Nuclei are placed at random (Poisson) in the untransformed matrix; impingement is hard (domains stop where they meet).',
  'The field is large against the domains and represents the sample; the time origin t = 0 is the start of the transformation (or t0 when fitted).',
  'The threshold separates the phases the same way in every frame.',
];

export interface InterpretInput {
  fit: JmakFit;
  times: number[];
  fractions: number[];
  tracks: FrameTrack[];
  /** Field area in px². */
  fieldAreaPx: number;
  umPerPx: number | null;
  timeUnit: string;
  minAreaPx: number;
}

function quantile(sorted: number[], q: number): number {
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}

/**
 * Interprets the fitted exponent for planar growth (n ≈ 2: nuclei all present from the start, site
 * saturation; n ≈ 3: a constant nucleation rate; between: a rate that falls with time) and checks k against
 * k = πλv² (site saturation) and k = πIv²/3 (constant rate) with λ, I and v measured on the domains
 * (derived from the JMAK law: Avrami 1939, 1940; docs/check-values.md §4).
 * λ = domains seen by the last early frame (f ≤ 0.1) per field area; I = new domains per untransformed
 * area and time over the early frames, Σ ΔN / Σ A·(1 − f̄)·Δt; v = median over isolated domains of the slope
 * of r = √(area/π) against t.
 */
export function interpret(inp: InterpretInput): KineticsInterpretation {
  const { fit, times, fractions, tracks, umPerPx, timeUnit } = inp;
  const L = umPerPx ?? 1;
  const lu = umPerPx === null ? 'px' : 'µm';
  const area = inp.fieldAreaPx * L * L;
  const early: number[] = [];
  for (let j = 0; j < times.length && fractions[j]! <= EARLY_MAX_FRACTION; j++) early.push(j);
  const cumulative: number[] = [];
  let cum = 0;
  // Domains that touch the border when they appear count one half (Saltykov's rule for a rectangle's sides).
  for (const tr of tracks) cumulative.push((cum += tr.newInside + (tr.newDomains - tr.newInside) / 2));

  let nucleusDensity: Estimate | null = null;
  let nucleationRate: Estimate | null = null;
  const seen = early.filter((j) => cumulative[j]! > 0);
  if (seen.length > 0) {
    const last = seen[seen.length - 1]!;
    const first = seen[0]!;
    nucleusDensity = {
      value: cumulative[last]! / area,
      unit: `${lu}⁻²`,
      frames: seen.map((j) => j + 1),
      note: `${cumulative[last]} domains (those touching the border when they appeared count ½) seen by frame ${last + 1} (f = ${fractions[last]!.toFixed(3)}); the count went from ${cumulative[first]} in frame ${first + 1}. A steady count means the nuclei were all there from the start.`,
    };
    let born = 0;
    let exposure = 0;
    for (const j of early) {
      const t0 = j === 0 ? 0 : times[j - 1]!;
      const f0 = j === 0 ? 0 : fractions[j - 1]!;
      const dt = times[j]! - t0;
      if (!(dt > 0)) continue;
      born += tracks[j]!.newInside + (tracks[j]!.newDomains - tracks[j]!.newInside) / 2;
      exposure += area * (1 - (f0 + fractions[j]!) / 2) * dt;
    }
    if (exposure > 0 && early.length >= 2) {
      nucleationRate = {
        value: born / exposure,
        unit: `${lu}⁻²·${timeUnit}⁻¹`,
        frames: early.map((j) => j + 1),
        note: `${born} new domains over the untransformed area and time of frames ${early[0]! + 1}–${early[early.length - 1]! + 1}; new nuclei that touch a domain before they are seen are missed, so this is a lower bound.`,
      };
    }
  }

  const slopes: number[] = [];
  const nDom = tracks.length ? tracks[tracks.length - 1]!.area.length - 1 : 0;
  for (let id = 1; id <= nDom; id++) {
    const ts: number[] = [];
    const rs: number[] = [];
    for (let j = 0; j < tracks.length; j++) {
      const tr = tracks[j]!;
      if (id < tr.area.length && tr.isolated[id] && tr.area[id]! >= Math.max(MIN_SPEED_AREA_PX, inp.minAreaPx)) {
        ts.push(times[j]!);
        rs.push(Math.sqrt(tr.area[id]! / Math.PI));
      }
    }
    if (ts.length < 2) continue;
    const tm = ts.reduce((a, b) => a + b, 0) / ts.length;
    const rm = rs.reduce((a, b) => a + b, 0) / rs.length;
    let sxx = 0;
    let sxy = 0;
    for (let i = 0; i < ts.length; i++) {
      sxx += (ts[i]! - tm) ** 2;
      sxy += (ts[i]! - tm) * (rs[i]! - rm);
    }
    if (sxx > 0) slopes.push((sxy / sxx) * L);
  }
  slopes.sort((a, b) => a - b);
  const growthSpeed =
    slopes.length > 0
      ? {
          value: quantile(slopes, 0.5),
          unit: `${lu}/${timeUnit}`,
          frames: [] as number[],
          note: `median over ${slopes.length} domains that grew alone (not touching another domain or the field border) in at least two frames; radius = √(area/π).`,
          domains: slopes.length,
          quartiles: [quantile(slopes, 0.25), quantile(slopes, 0.75)] as [number, number],
        }
      : null;

  const check = (kPredicted: number, formula: string): KCheck | null =>
    Number.isFinite(kPredicted) && kPredicted > 0 ? { kPredicted, ratio: fit.k / kPredicted, formula } : null;
  const v = growthSpeed?.value;
  const checks = {
    siteSaturation: nucleusDensity && v !== undefined ? check(Math.PI * nucleusDensity.value * v * v, 'k = π·λ·v²') : null,
    constantRate: nucleationRate && v !== undefined ? check((Math.PI * nucleationRate.value * v * v) / 3, 'k = π·I·v²/3') : null,
  };

  const n = fit.n;
  const ci = fit.ci95.n ? ` (95 % interval ${fit.ci95.n[0].toFixed(2)}–${fit.ci95.n[1].toFixed(2)})` : '';
  let mechanism: KineticsInterpretation['mechanism'];
  let statement: string;
  if (Math.abs(n - 2) <= 0.3) {
    mechanism = 'site-saturation';
    statement = `n = ${n.toFixed(2)}${ci} is near 2: for planar growth this fits nuclei all present from the start (site saturation), k = πλv².`;
  } else if (Math.abs(n - 3) <= 0.3) {
    mechanism = 'constant-rate';
    statement = `n = ${n.toFixed(2)}${ci} is near 3: for planar growth this fits a constant nucleation rate, k = πIv²/3.`;
  } else if (n > 2 && n < 3) {
    mechanism = 'decreasing-rate';
    statement = `n = ${n.toFixed(2)}${ci} lies between 2 and 3: for planar growth this fits a nucleation rate that falls with time (sites used up).`;
  } else if (n < 2) {
    mechanism = 'other';
    statement = `n = ${n.toFixed(2)}${ci} is below 2: planar interface-controlled growth does not give this; growth in one dimension, diffusion-controlled growth, or nucleation on lines and boundaries can.`;
  } else {
    mechanism = 'other';
    statement = `n = ${n.toFixed(2)}${ci} is above 3: a nucleation rate that rises with time, or growth in three dimensions seen in projection, can give this.`;
  }
  if (seen.length >= 2) {
    const a = cumulative[seen[0]!]!;
    const b = cumulative[seen[seen.length - 1]!]!;
    statement += b > 1.5 * a ? ` The domain count rises over the early frames (${a} → ${b}), as continued nucleation does.` : ` The domain count stays near ${b} over the early frames, as with nuclei present from the start.`;
  }
  const ref = mechanism === 'constant-rate' ? checks.constantRate : mechanism === 'site-saturation' ? checks.siteSaturation : null;
  if (ref) statement += ` From the domains, ${ref.formula} = ${ref.kPredicted.toPrecision(3)}; the fitted k is ${ref.ratio.toFixed(2)} times that.`;
  return { assumptions: ASSUMPTIONS, mechanism, statement, nucleusDensity, nucleationRate, growthSpeed, checks };
}
