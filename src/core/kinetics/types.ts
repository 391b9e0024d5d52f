/** Result types of the kinetics of an image series. Everything here is plain JSON (numbers, strings, arrays). */
import type { KineticsSettings } from '../settings';
import type { Rect } from '../types';
import type { JmakFit } from './fit';

/** One frame of the series. */
export interface KineticsFrame {
  /** 1-based frame number. */
  frame: number;
  /** Where the frame came from (file name, or file[page]); empty when not given. */
  source: string;
  time: number;
  /** Area fraction of the transformed phase in the field, 0..1. */
  fraction: number;
  /** Connected domains of the transformed phase (regions smaller than the minimum area left out). */
  domains: number;
  /** Mean area of those domains, in areaUnit; null with no domain. */
  meanDomainArea: number | null;
  /** Domains seen for the first time in this frame (nucleus estimates). */
  newDomains: number;
}

/** How the transformed phase was separated. */
export interface PhaseChoice {
  /** Threshold on the 0..255 scale (16-bit frames are scaled by 255/65535). */
  threshold: number;
  /** 'otsu-last-frame', 'otsu-first-and-last-frames' (the last frame alone was one-phase), or 'manual'. */
  source: 'otsu-last-frame' | 'otsu-first-and-last-frames' | 'manual';
  /** Which phase is counted as transformed: pixels above the threshold ('bright') or at and below it ('dark'). */
  phase: 'bright' | 'dark';
}

export interface Estimate {
  value: number;
  unit: string;
  /** 1-based frames the estimate comes from. */
  frames: number[];
  note: string;
}

export interface KCheck {
  /** The k that the measured nucleation and growth predict (time⁻ⁿ). */
  kPredicted: number;
  /** Fitted k divided by kPredicted; a check only when the fitted n is near the model's n. */
  ratio: number;
  formula: string;
}

/** What n and the domain counts say about nucleation and growth, with the assumptions behind it. */
export interface KineticsInterpretation {
  assumptions: string[];
  /** 'site-saturation' (n ≈ 2), 'constant-rate' (n ≈ 3), 'decreasing-rate' (2 < n < 3), or 'other'. */
  mechanism: 'site-saturation' | 'constant-rate' | 'decreasing-rate' | 'other';
  statement: string;
  /** Nucleus density λ from the domain count of the early frames (per length unit²). */
  nucleusDensity: Estimate | null;
  /** Nucleation rate I from the new domains of the early frames, per untransformed area and time. */
  nucleationRate: Estimate | null;
  /** Radial growth speed v of isolated domains (length unit per time unit), the median over domains. */
  growthSpeed: (Estimate & { domains: number; quartiles: [number, number] }) | null;
  /** k = πλv² (site saturation) and k = πIv²/3 (constant rate) against the fitted k. */
  checks: { siteSaturation: KCheck | null; constantRate: KCheck | null };
}

export interface KineticsPlots {
  /** Measured fraction against time. */
  fraction: { t: number[]; f: number[] };
  /** The fitted curves sampled from the first to the last time. */
  curves: { t: number[]; nonlinear: number[] | null; avramiPlot: number[] };
  /** Avrami plot: x = ln(t − t0), y = ln(−ln(1 − f)) for frames where defined; `used` marks the fitted ones. */
  avrami: { frame: number[]; x: number[]; y: number[]; used: boolean[]; line: { x: [number, number]; y: [number, number] } };
  /** Residuals of the reported fit (in f for the nonlinear fit, in y for the Avrami plot). */
  residuals: { frame: number[]; t: number[]; value: number[] };
  /** Domain count and mean domain area against time. */
  domains: { t: number[]; count: number[]; meanArea: (number | null)[] };
}

export interface KineticsResult {
  /** The JMAK convention every k here uses. */
  convention: string;
  timeUnit: string;
  lengthUnit: 'px' | 'µm';
  areaUnit: 'px²' | 'µm²';
  field: Rect;
  phase: PhaseChoice;
  /** Minimum area (px) of a counted domain. */
  minDomainAreaPx: number;
  frames: KineticsFrame[];
  /** The reported fit (by settings.kinetics.fitMethod; the Avrami plot when the nonlinear fit fails). */
  avrami: JmakFit;
  fit: { method: JmakFit['method']; avramiPlot: JmakFit; nonlinear: JmakFit | null };
  interpretation: KineticsInterpretation;
  /** The last frame as a tessellation: number of domains and whether the transformation completed. */
  final: { domains: number; fraction: number; complete: boolean };
  plots: KineticsPlots;
  /** Things the user should know (decreasing fractions that were allowed, a fallback threshold, ...). */
  warnings: string[];
  settings: { kinetics: KineticsSettings; umPerPx: number | null; minCellAreaPx: number; field: Rect | null };
}
