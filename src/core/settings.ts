/**
 * The one source of truth for analysis settings: a plain, versioned JSON object with defaults.
 * The settings used are written beside every result (settings.json), so any figure can be reproduced.
 */
import { SettingsError } from './errors';
import { checkUserPixelSize } from './image/calibration';
import type { Rect } from './types';

export const SETTINGS_VERSION = 1;

export type PatternKind = 'walls' | 'bodies' | 'points';
export type ThresholdMethod = 'otsu' | 'adaptive' | 'manual';
export type EdgeRule = 'exclude' | 'weight';

export interface WallsSettings {
  /** 'auto' detects whether the walls are darker or lighter than the cells. */
  polarity: 'auto' | 'dark' | 'light';
  /** Radius (px) of the background estimate used to flatten uneven illumination; 0 = off, -1 = auto. */
  flattenRadiusPx: number;
  /** Gaussian smoothing sigma (px) before thresholding; 0 = off. */
  smoothSigmaPx: number;
  threshold: ThresholdMethod;
  /** Threshold on the 0..255 scale after normalisation, used when threshold = 'manual'. */
  manualThreshold: number;
  /** Block size (px, odd) for adaptive thresholding. */
  adaptiveBlockPx: number;
  /** Cell interiors are eroded by this many px before they seed the watershed (splits cells joined by gaps in a wall). */
  seedErodePx: number;
  /**
   * The size hint: the typical cell diameter (px, equivalent circle); -1 = auto, read from the image (the
   * peak of its radially summed power spectrum, src/core/segment/size.ts). It sets the marker dynamic and
   * the smallest cell area when those are on auto.
   */
  cellDiameterPx: number;
  /**
   * A cell interior joined to another through a gap in a wall is split at its distance-transform maxima that
   * stand this many px above the saddle between them; -1 = auto (an eighth of the cell diameter), 0 = never split.
   */
  markerDynamicPx: number;
}

export interface BodiesSettings {
  /** 'auto': bodies are the minority phase; 'bright' or 'dark' forces it. */
  polarity: 'auto' | 'bright' | 'dark';
  smoothSigmaPx: number;
  threshold: ThresholdMethod;
  manualThreshold: number;
  adaptiveBlockPx: number;
  fillHoles: boolean;
  /** Split touching bodies by distance-transform markers and watershed. */
  splitTouching: boolean;
  /**
   * How readily touching bodies are split (0..1): a distance-transform peak becomes a body when it stands
   * (1 − splitSensitivity)·R/2 above the saddle to a higher one, R the median body radius.
   */
  splitSensitivity: number;
}

export interface PointsSettings {
  /** Units of x, y in a points CSV. */
  units: 'px' | 'um';
}

export interface ReferenceSettings {
  /** Monte Carlo replicates of the random-seeding reference. */
  replicates: number;
  seed: number;
  /** Significance level of the verdict. */
  alpha: number;
}

export interface GrainSettings {
  /** Planimetric test figure: a circle or a rectangle centred in the field. */
  testShape: 'circle' | 'rectangle';
  /** Size of the test figure as a fraction of the largest that fits the field (0..1]. */
  testSizeFraction: number;
  /** Subtract one from the Jeffries count (the unbiased correction). */
  unbiasedCorrection: boolean;
  /** Angles (degrees) of the parallel test-line sets of the intercept method. */
  lineAngles: number[];
  /** Number of parallel lines per angle. */
  linesPerAngle: number;
  /** Number of concentric test circles of the intercept method. */
  circles: number;
}

export interface KineticsSettings {
  /** How the transformed phase is separated: Otsu on the reference frame, or a manual threshold (0..255). */
  threshold: 'otsu' | 'manual';
  manualThreshold: number;
  /** Which phase is transformed: the brighter or the darker one; 'auto' = the one that grows. */
  phase: 'auto' | 'bright' | 'dark';
  /** Frames with fraction in (fitMin, fitMax) enter the Avrami plot fit. */
  fitMin: number;
  fitMax: number;
  /** Fit an incubation time t0 in the nonlinear fit. */
  incubation: boolean;
  /** Which fit gives the reported n, k, t½: least squares on f directly, or the straight line of the Avrami plot. */
  fitMethod: 'nonlinear' | 'avrami-plot';
}

export interface Settings {
  version: typeof SETTINGS_VERSION;
  pattern: PatternKind;
  /** Micrometres per pixel; null = uncalibrated (results in px). A value here wins over the file's tags. */
  umPerPx: number | null;
  /** The analysed rectangle in px; null = the whole image. */
  field: Rect | null;
  /** Cells smaller than this (px²) are dropped as noise; -1 = auto (from the image size and wall width). */
  minCellAreaPx: number;
  edgeRule: EdgeRule;
  walls: WallsSettings;
  bodies: BodiesSettings;
  points: PointsSettings;
  reference: ReferenceSettings;
  grain: GrainSettings;
  kinetics: KineticsSettings;
}

export function defaultSettings(): Settings {
  return {
    version: SETTINGS_VERSION,
    pattern: 'walls',
    umPerPx: null,
    field: null,
    minCellAreaPx: -1,
    edgeRule: 'exclude',
    walls: {
      polarity: 'auto',
      flattenRadiusPx: -1,
      smoothSigmaPx: 0.7,
      threshold: 'otsu',
      manualThreshold: 128,
      adaptiveBlockPx: 51,
      seedErodePx: 0,
      cellDiameterPx: -1,
      markerDynamicPx: -1,
    },
    bodies: {
      polarity: 'auto',
      smoothSigmaPx: 1,
      threshold: 'otsu',
      manualThreshold: 128,
      adaptiveBlockPx: 51,
      fillHoles: true,
      splitTouching: true,
      splitSensitivity: 0.85,
    },
    points: { units: 'px' },
    reference: { replicates: 199, seed: 1, alpha: 0.05 },
    grain: {
      testShape: 'circle',
      testSizeFraction: 1,
      unbiasedCorrection: false,
      lineAngles: [0, 45, 90, 135],
      linesPerAngle: 5,
      circles: 3,
    },
    kinetics: { threshold: 'otsu', manualThreshold: 128, phase: 'auto', fitMin: 0.02, fitMax: 0.98, incubation: false, fitMethod: 'nonlinear' },
  };
}

type DeepPartial<T> = { [K in keyof T]?: T[K] extends object | null ? DeepPartial<NonNullable<T[K]>> | T[K] : T[K] };
export type SettingsInput = DeepPartial<Settings>;

function isObj(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Keys that reach an object's prototype in JavaScript: never a setting, refused wherever they appear. */
const FORBIDDEN_KEYS = new Set(['__proto__', 'constructor', 'prototype']);

/** The keys of the rectangle `field`. */
const FIELD_KEYS = ['x0', 'y0', 'x1', 'y1'];

/**
 * Overlays `over` on `base` (the defaults) in place. Only a key the defaults have as their own is taken
 * (`in` would also find `toString`, `constructor` and the rest of the prototype); prototype keys and unknown
 * keys are collected for one message, a group given as something other than an object is refused at once.
 */
function merge(base: Record<string, unknown>, over: Record<string, unknown>, path: string, unknown: string[], forbidden: string[]): void {
  for (const k of Object.keys(over)) {
    const v = over[k];
    const name = `${path}${k}`;
    if (FORBIDDEN_KEYS.has(k)) { forbidden.push(name); continue; }
    if (v === undefined) continue; // not a value (JSON has none): as if the key were absent
    if (!Object.hasOwn(base, k)) { unknown.push(name); continue; }
    const b = base[k];
    if (k === 'field' && path === '') {
      if (isObj(v)) for (const fk of Object.keys(v)) if (FORBIDDEN_KEYS.has(fk)) forbidden.push(`field.${fk}`); else if (!FIELD_KEYS.includes(fk)) unknown.push(`field.${fk}`);
      base[k] = isObj(v) ? Object.fromEntries(FIELD_KEYS.filter((fk) => Object.hasOwn(v, fk)).map((fk) => [fk, v[fk]])) : v;
    } else if (isObj(b)) {
      if (!isObj(v)) {
        throw new SettingsError(`Setting ${name} must be a group of settings in braces ({ ... }); got ${JSON.stringify(v)}: fix it or remove it to use the defaults.`);
      }
      merge(b, v, `${name}.`, unknown, forbidden);
    } else base[k] = v;
  }
}

function num(v: unknown, name: string, lo: number, hi: number): void {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < lo || v > hi) {
    throw new SettingsError(`Setting ${name} must be a number from ${lo} to ${hi}; got ${JSON.stringify(v)}.`);
  }
}
function whole(v: unknown, name: string, lo: number, hi: number): void {
  if (typeof v !== 'number' || !Number.isInteger(v) || v < lo || v > hi) {
    throw new SettingsError(`Setting ${name} must be a whole number from ${lo} to ${hi}; got ${JSON.stringify(v)}.`);
  }
}
function oneOf(v: unknown, name: string, options: readonly string[]): void {
  if (typeof v !== 'string' || !options.includes(v)) {
    throw new SettingsError(`Setting ${name} must be one of ${options.join(', ')}; got ${JSON.stringify(v)}.`);
  }
}

/** The most replicates of the random-seeding reference (9999, the usual ceiling of a Monte Carlo test). */
export const MAX_REPLICATES = 9999;

/** Setting names in quotes, joined: "a", "b" and "c". */
function list(names: string[]): string {
  const q = names.map((n) => `"${n}"`);
  return q.length === 1 ? q[0]! : `${q.slice(0, -1).join(', ')} and ${q[q.length - 1]}`;
}

/** Defaults overlaid with `input`, validated. Throws SettingsError naming the bad setting. */
export function resolveSettings(input: SettingsInput = {}): Settings {
  const s = defaultSettings();
  if (!isObj(input)) {
    throw new SettingsError(`The settings must be one JSON object in braces ({ "pattern": "walls", ... }); got ${Array.isArray(input) ? 'a list' : JSON.stringify(input)}: fix the settings file.`);
  }
  if (input.version !== undefined && input.version !== SETTINGS_VERSION) {
    throw new SettingsError(`Settings version ${String(input.version)} is not supported; this Tessellab reads version ${SETTINGS_VERSION}.`);
  }
  const unknown: string[] = [];
  const forbidden: string[] = [];
  merge(s as unknown as Record<string, unknown>, input as Record<string, unknown>, '', unknown, forbidden);
  if (forbidden.length > 0) {
    throw new SettingsError(`The settings hold ${list(forbidden)}, which ${forbidden.length === 1 ? 'is' : 'are'} never a setting; remove ${forbidden.length === 1 ? 'it' : 'them'}.`);
  }
  if (unknown.length > 0) {
    throw new SettingsError(`Unknown setting${unknown.length === 1 ? '' : 's'} ${list(unknown)}; remove ${unknown.length === 1 ? 'it' : 'them'} or check the spelling.`);
  }
  oneOf(s.pattern, 'pattern', ['walls', 'bodies', 'points']);
  if (s.umPerPx !== null) checkUserPixelSize(s.umPerPx, 'the settings (umPerPx), the Scale panel or --um-per-px');
  if (s.field !== null) {
    const f = s.field;
    if (!isObj(f) || ![f.x0, f.y0, f.x1, f.y1].every((v) => typeof v === 'number' && Number.isFinite(v)) || f.x1 <= f.x0 || f.y1 <= f.y0) {
      throw new SettingsError('Setting field must be {x0, y0, x1, y1} in px with x1 > x0 and y1 > y0.');
    }
  }
  num(s.minCellAreaPx, 'minCellAreaPx', -1, 1e9);
  oneOf(s.edgeRule, 'edgeRule', ['exclude', 'weight']);
  oneOf(s.walls.polarity, 'walls.polarity', ['auto', 'dark', 'light']);
  num(s.walls.flattenRadiusPx, 'walls.flattenRadiusPx', -1, 10000);
  num(s.walls.smoothSigmaPx, 'walls.smoothSigmaPx', 0, 50);
  oneOf(s.walls.threshold, 'walls.threshold', ['otsu', 'adaptive', 'manual']);
  num(s.walls.manualThreshold, 'walls.manualThreshold', 0, 255);
  num(s.walls.adaptiveBlockPx, 'walls.adaptiveBlockPx', 3, 2001);
  num(s.walls.seedErodePx, 'walls.seedErodePx', 0, 50);
  if (s.walls.cellDiameterPx !== -1) num(s.walls.cellDiameterPx, 'walls.cellDiameterPx (-1 = auto, or a diameter in px)', 2, 100000);
  if (s.walls.markerDynamicPx !== -1) num(s.walls.markerDynamicPx, 'walls.markerDynamicPx (-1 = auto, 0 = never split)', 0, 100000);
  oneOf(s.bodies.polarity, 'bodies.polarity', ['auto', 'bright', 'dark']);
  num(s.bodies.smoothSigmaPx, 'bodies.smoothSigmaPx', 0, 50);
  oneOf(s.bodies.threshold, 'bodies.threshold', ['otsu', 'adaptive', 'manual']);
  num(s.bodies.manualThreshold, 'bodies.manualThreshold', 0, 255);
  num(s.bodies.adaptiveBlockPx, 'bodies.adaptiveBlockPx', 3, 2001);
  num(s.bodies.splitSensitivity, 'bodies.splitSensitivity', 0, 1);
  oneOf(s.points.units, 'points.units', ['px', 'um']);
  whole(s.reference.replicates, 'reference.replicates', 0, MAX_REPLICATES);
  whole(s.reference.seed, 'reference.seed', 0, 2 ** 32 - 1);
  num(s.reference.alpha, 'reference.alpha', 1e-6, 0.5);
  oneOf(s.grain.testShape, 'grain.testShape', ['circle', 'rectangle']);
  num(s.grain.testSizeFraction, 'grain.testSizeFraction', 0.05, 1);
  if (typeof s.grain.unbiasedCorrection !== 'boolean') throw new SettingsError('Setting grain.unbiasedCorrection must be true or false.');
  if (!Array.isArray(s.grain.lineAngles) || s.grain.lineAngles.length === 0) throw new SettingsError('Setting grain.lineAngles must be a non-empty list of angles in degrees.');
  s.grain.lineAngles.forEach((a, i) => num(a, `grain.lineAngles[${i}]`, -360, 360));
  whole(s.grain.linesPerAngle, 'grain.linesPerAngle', 1, 1000);
  whole(s.grain.circles, 'grain.circles', 0, 100);
  oneOf(s.kinetics.threshold, 'kinetics.threshold', ['otsu', 'manual']);
  num(s.kinetics.manualThreshold, 'kinetics.manualThreshold', 0, 255);
  oneOf(s.kinetics.phase, 'kinetics.phase', ['auto', 'bright', 'dark']);
  num(s.kinetics.fitMin, 'kinetics.fitMin', 0, 1);
  num(s.kinetics.fitMax, 'kinetics.fitMax', 0, 1);
  if (typeof s.kinetics.incubation !== 'boolean') throw new SettingsError('Setting kinetics.incubation must be true or false.');
  oneOf(s.kinetics.fitMethod, 'kinetics.fitMethod', ['nonlinear', 'avrami-plot']);
  if (s.kinetics.fitMin >= s.kinetics.fitMax) throw new SettingsError('Setting kinetics.fitMin must be below kinetics.fitMax.');
  return s;
}

