/**
 * Kinetics of an image series: one threshold for the whole series, the transformed fraction and the domains
 * of every frame, the JMAK fits, the interpretation, and the final frame as a tessellation.
 */
import { phaseComponents, phaseMask } from '../cv/phase';
import { SeriesError, TessellabError } from '../errors';
import { resolveSettings, type Settings, type SettingsInput } from '../settings';
import type { GreyImage, LabelImage, Progress, Rect } from '../types';
import { avramiFrames, fitAvrami, fitJmakNonlinear, type JmakFit } from './fit';
import { avramiPoint, jmak, JMAK_CONVENTION } from './jmak';
import { interpret } from './interpret';
import { histogram256, otsu } from './threshold';
import { DomainTracker, type DomainRecord } from './track';
import type { KineticsFrame, KineticsPlots, KineticsResult, PhaseChoice } from './types';

export interface SeriesOptions {
  onProgress?: Progress;
  /** The analysed rectangle (px); wins over settings.field; null or absent = the settings' field or the whole image. */
  field?: Rect | null;
  /** Fit even when the fraction decreases between frames (the frames are named in the warnings). */
  allowDecreasing?: boolean;
  /** Unit of the times, for labels (default 's'). */
  timeUnit?: string;
  /** Source of each frame (file name, or file[page]), for the table. */
  sources?: string[];
}

/** The final frame as a tessellation of domains, for the walls analysis and the randomness comparison. */
export interface FinalMosaic {
  /** Domains of the final frame, numbered 1..count, in field coordinates; 0 = untransformed. */
  labels: LabelImage;
  /** Offset of the field in the image (px): image x = field x + x0. */
  x0: number;
  y0: number;
  /** Nucleus estimates in image px (centroid of each domain where it first appeared) with that frame's time. */
  nuclei: { x: number; y: number; time: number; frame: number; area: number }[];
  /** The mosaic drawn as a walls image: domains light (200), walls between domains and untransformed dark (40). */
  wallsImage: GreyImage;
  /** Whether the last frame reached settings.kinetics.fitMax. */
  complete: boolean;
}

/** A fraction may fall by this much between frames (noise at the threshold) before it counts as decreasing. */
export const DECREASE_TOLERANCE = 0.005;
/** Frames at or below this, or at or above 1 minus this, count as untransformed or fully transformed. */
const EMPTY_FRACTION = 0.001;
/**
 * Below this Otsu effectiveness the last frame is taken as one phase and the first frame joins it. A single
 * Gaussian mode gives 2/π ≈ 0.64; two phases 130 grey levels apart with noise sd 6 stay above it down to
 * a minority of about 0.7 %.
 */
const MIN_EFFECTIVENESS = 0.75;
const CURVE_POINTS = 101;

function fieldOf(img: GreyImage, field: Rect | null): Rect {
  if (!field) return { x0: 0, y0: 0, x1: img.width, y1: img.height };
  const r = { x0: Math.round(field.x0), y0: Math.round(field.y0), x1: Math.round(field.x1), y1: Math.round(field.y1) };
  if (r.x0 < 0 || r.y0 < 0 || r.x1 > img.width || r.y1 > img.height || r.x1 - r.x0 < 2 || r.y1 - r.y0 < 2) {
    throw new SeriesError(`The field ${r.x0},${r.y0}–${r.x1},${r.y1} px does not fit the ${img.width} x ${img.height} px frames; draw it inside the image.`);
  }
  return r;
}

/** The field of a frame as 8-bit values (16-bit scaled by 255/65535, the same for every frame). */
function field8(img: GreyImage, r: Rect): Uint8Array {
  const w = r.x1 - r.x0;
  const h = r.y1 - r.y0;
  const out = new Uint8Array(w * h);
  const src = img.data;
  const s = img.bitDepth === 16 ? 255 / 65535 : 1;
  for (let y = 0; y < h; y++) {
    const row = (y + r.y0) * img.width + r.x0;
    for (let x = 0; x < w; x++) out[y * w + x] = s === 1 ? src[row + x]! : Math.round(src[row + x]! * s);
  }
  return out;
}

function validate(frames: GreyImage[], times: number[]): void {
  if (!Array.isArray(frames) || frames.length < 3) {
    throw new SeriesError(`The series has ${frames?.length ?? 0} frame${frames?.length === 1 ? '' : 's'}; kinetics needs at least 3 frames with their times.`);
  }
  if (!Array.isArray(times) || times.length !== frames.length) {
    throw new SeriesError(`There are ${times?.length ?? 0} times for ${frames.length} frames; give one time per frame.`);
  }
  times.forEach((t, i) => {
    if (typeof t !== 'number' || !Number.isFinite(t)) throw new SeriesError(`The time of frame ${i + 1} is missing or not a number; give one number per frame.`);
  });
  const bad: string[] = [];
  for (let i = 1; i < times.length; i++) if (!(times[i]! > times[i - 1]!)) bad.push(`frame ${i + 1} (t = ${times[i]}) after frame ${i} (t = ${times[i - 1]})`);
  if (bad.length) throw new SeriesError(`Times must increase from frame to frame: ${bad.slice(0, 3).join('; ')}${bad.length > 3 ? '; …' : ''}. Sort the frames by time or fix the times.`);
  const { width, height } = frames[0]!;
  frames.forEach((f, i) => {
    if (f.width !== width || f.height !== height) {
      throw new SeriesError(`Frame ${i + 1} is ${f.width} x ${f.height} px but frame 1 is ${width} x ${height} px; all frames of a series must have the same size.`);
    }
  });
}

function choosePhase(fields: Uint8Array[], s: Settings, warnings: string[]): PhaseChoice {
  const ks = s.kinetics;
  let threshold: number;
  let source: PhaseChoice['source'];
  if (ks.threshold === 'manual') {
    threshold = ks.manualThreshold;
    source = 'manual';
  } else {
    const last = histogram256(fields[fields.length - 1]!);
    const o = otsu(last);
    if (o.effectiveness >= MIN_EFFECTIVENESS) {
      threshold = o.threshold;
      source = 'otsu-last-frame';
    } else {
      // A (nearly) complete last frame has one mode; the first frame supplies the untransformed phase.
      const first = histogram256(fields[0]!);
      const nl = fields[fields.length - 1]!.length;
      const nf = fields[0]!.length;
      const pooled = new Float64Array(256);
      for (let i = 0; i < 256; i++) pooled[i] = last[i]! / nl + first[i]! / nf;
      threshold = otsu(pooled).threshold;
      source = 'otsu-first-and-last-frames';
      warnings.push(`The last frame looks like one phase (Otsu effectiveness ${o.effectiveness.toFixed(2)}), so the threshold ${threshold} was chosen on the first and last frames together.`);
    }
  }
  let phase: 'bright' | 'dark';
  if (ks.phase !== 'auto') phase = ks.phase;
  else {
    const above = (d: Uint8Array): number => {
      let c = 0;
      for (let i = 0; i < d.length; i++) if (d[i]! > threshold) c++;
      return c / d.length;
    };
    phase = above(fields[fields.length - 1]!) >= above(fields[0]!) ? 'bright' : 'dark';
  }
  return { threshold, source, phase };
}

function linspace(a: number, b: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}

/**
 * Analyses an image series and also returns the final frame as a domain mosaic (not JSON-sized: a label
 * image). See analyzeSeries for the result.
 */
export async function analyzeSeriesDetailed(
  frames: GreyImage[],
  times: number[],
  settingsIn: SettingsInput | Settings,
  opts: SeriesOptions = {},
): Promise<{ result: KineticsResult; mosaic: FinalMosaic }> {
  const s = resolveSettings(settingsIn as SettingsInput);
  validate(frames, times);
  const ks = s.kinetics;
  const warnings: string[] = [];
  const timeUnit = opts.timeUnit ?? 's';
  const field = fieldOf(frames[0]!, opts.field !== undefined && opts.field !== null ? opts.field : s.field);
  const w = field.x1 - field.x0;
  const h = field.y1 - field.y0;
  const A = w * h;
  const fields = frames.map((f) => field8(f, field));
  const phase = choosePhase(fields, s, warnings);
  const minArea = s.minCellAreaPx >= 0 ? Math.max(1, Math.round(s.minCellAreaPx)) : 3;
  const L = s.umPerPx ?? 1;
  const tracker = new DomainTracker(w, h, minArea);
  const rows: KineticsFrame[] = [];
  const fractions: number[] = [];
  for (let j = 0; j < frames.length; j++) {
    opts.onProgress?.(`frame ${j + 1} of ${frames.length}`, j / frames.length);
    const mask = await phaseMask(fields[j]!, w, h, phase.threshold, phase.phase === 'bright');
    const cc = await phaseComponents(mask, w, h);
    let on = 0;
    for (let p = 0; p < A; p++) on += mask[p]!;
    const tr = tracker.step(mask, cc);
    let domains = 0;
    let domainArea = 0;
    for (let c = 0; c < cc.count; c++) {
      if (cc.area[c]! >= minArea) {
        domains++;
        domainArea += cc.area[c]!;
      }
    }
    const f = on / A;
    fractions.push(f);
    rows.push({
      frame: j + 1,
      source: opts.sources?.[j] ?? '',
      time: times[j]!,
      fraction: f,
      domains,
      meanDomainArea: domains ? (domainArea / domains) * L * L : null,
      newDomains: tr.newDomains,
    });
  }
  opts.onProgress?.('fit', 1);

  const thr = `threshold ${phase.threshold} (${phase.phase} phase)`;
  if (fractions.every((f) => f <= EMPTY_FRACTION)) {
    throw new SeriesError(`Every frame is untransformed (f = 0) at ${thr}; set the threshold or the phase (bright or dark) so the new phase is counted.`);
  }
  if (fractions.every((f) => f >= 1 - EMPTY_FRACTION)) {
    throw new SeriesError(`Every frame is fully transformed (f = 1) at ${thr}; set the threshold or the phase, or add frames from before the transformation ended.`);
  }
  if (fractions.every((f) => f <= EMPTY_FRACTION || f >= 1 - EMPTY_FRACTION)) {
    throw new SeriesError(`Every frame is either untransformed or fully transformed at ${thr}; no frame shows the transformation under way. Add frames in between.`);
  }
  const drops: string[] = [];
  for (let j = 1; j < fractions.length; j++) {
    if (fractions[j]! < fractions[j - 1]! - DECREASE_TOLERANCE) drops.push(`frame ${j + 1} (f = ${fractions[j]!.toFixed(3)}) after frame ${j} (f = ${fractions[j - 1]!.toFixed(3)})`);
  }
  if (drops.length) {
    const msg = `The transformed fraction decreases: ${drops.slice(0, 3).join('; ')}${drops.length > 3 ? `; and ${drops.length - 3} more` : ''}`;
    if (!opts.allowDecreasing) throw new SeriesError(`${msg}. Check the threshold, the phase and the frame order, or allow decreasing fractions to fit anyway.`);
    warnings.push(`${msg}; fitted anyway as asked.`);
  }
  const usable = avramiFrames(times, fractions, ks.fitMin, ks.fitMax);
  if (usable.length < 3) {
    throw new SeriesError(
      `Only ${usable.length} of ${frames.length} frames have ${ks.fitMin} < f < ${ks.fitMax}${usable.length ? ` (frame ${usable.map((i) => i + 1).join(', ')})` : ''}; the fit needs at least 3: add frames during the transformation or widen kinetics.fitMin / fitMax.`,
    );
  }

  const avramiPlot = fitAvrami(times, fractions, { fitMin: ks.fitMin, fitMax: ks.fitMax });
  let nonlinear: JmakFit | null = null;
  try {
    nonlinear = fitJmakNonlinear(times, fractions, { incubation: ks.incubation, fitMin: ks.fitMin, fitMax: ks.fitMax });
    if (!nonlinear.converged) warnings.push(`The nonlinear fit did not converge in ${nonlinear.iterations} iterations; its values are the last iterate.`);
  } catch (e) {
    if (!(e instanceof TessellabError)) throw e;
    warnings.push(`The nonlinear fit failed: ${e.message}`);
  }
  let headline = avramiPlot;
  if (ks.fitMethod === 'nonlinear') {
    if (nonlinear && nonlinear.converged) headline = nonlinear;
    else warnings.push('The Avrami plot fit is reported because the nonlinear fit did not succeed.');
  }
  const interpretation = interpret({ fit: headline, times, fractions, tracks: tracker.frames, fieldAreaPx: A, umPerPx: s.umPerPx, timeUnit, minAreaPx: minArea });

  const tMin = Math.min(0, times[0]!);
  const tc = linspace(tMin, times[times.length - 1]!, CURVE_POINTS);
  const ap = { frame: [] as number[], x: [] as number[], y: [] as number[], used: [] as boolean[] };
  const usedSet = new Set(avramiPlot.frames);
  for (let j = 0; j < times.length; j++) {
    const pt = avramiPoint(times[j]!, fractions[j]!);
    if (!pt) continue;
    ap.frame.push(j + 1);
    ap.x.push(pt.x);
    ap.y.push(pt.y);
    ap.used.push(usedSet.has(j));
  }
  const ux = avramiPlot.frames.map((j) => Math.log(times[j]!));
  const lx: [number, number] = [Math.min(...ux), Math.max(...ux)];
  const plots: KineticsPlots = {
    fraction: { t: times.slice(), f: fractions.slice() },
    curves: {
      t: tc,
      nonlinear: nonlinear ? tc.map((t) => jmak(t, nonlinear!.n, nonlinear!.k, nonlinear!.t0)) : null,
      avramiPlot: tc.map((t) => jmak(t, avramiPlot.n, avramiPlot.k, 0)),
    },
    avrami: { ...ap, line: { x: lx, y: [Math.log(avramiPlot.k) + avramiPlot.n * lx[0], Math.log(avramiPlot.k) + avramiPlot.n * lx[1]] } },
    residuals: { frame: headline.frames.map((j) => j + 1), t: headline.frames.map((j) => times[j]!), value: headline.residuals.slice() },
    domains: { t: times.slice(), count: rows.map((r) => r.domains), meanArea: rows.map((r) => r.meanDomainArea) },
  };
  const mosaic = buildMosaic(tracker.labels, w, h, tracker.domains, times, field, fractions[fractions.length - 1]! >= ks.fitMax);
  const result: KineticsResult = {
    convention: JMAK_CONVENTION,
    timeUnit,
    lengthUnit: s.umPerPx === null ? 'px' : 'µm',
    areaUnit: s.umPerPx === null ? 'px²' : 'µm²',
    field,
    phase,
    minDomainAreaPx: minArea,
    frames: rows,
    avrami: headline,
    fit: { method: headline.method, avramiPlot, nonlinear },
    interpretation,
    final: { domains: mosaic.labels.count, fraction: fractions[fractions.length - 1]!, complete: mosaic.complete },
    plots,
    warnings,
    settings: { kinetics: { ...ks }, umPerPx: s.umPerPx, minCellAreaPx: s.minCellAreaPx, field: s.field },
  };
  opts.onProgress?.('done', 1);
  return { result, mosaic };
}

function buildMosaic(lab: Int32Array, w: number, h: number, domains: DomainRecord[], times: number[], field: Rect, complete: boolean): FinalMosaic {
  const remap = new Int32Array(domains.length + 1);
  const area: number[] = [];
  let count = 0;
  const labels = new Int32Array(w * h);
  for (let p = 0; p < w * h; p++) {
    const id = lab[p]!;
    if (!id) continue;
    if (!remap[id]) {
      remap[id] = ++count;
      area.push(0);
    }
    labels[p] = remap[id]!;
    area[remap[id]! - 1]!++;
  }
  const nuclei: FinalMosaic['nuclei'] = new Array(count);
  for (let id = 1; id <= domains.length; id++) {
    const r = remap[id]!;
    if (!r) continue;
    const d = domains[id - 1]!;
    nuclei[r - 1] = { x: d.x + field.x0, y: d.y + field.y0, time: times[d.firstFrame]!, frame: d.firstFrame + 1, area: area[r - 1]! };
  }
  const wall = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const p = y * w + x;
      const id = labels[p]!;
      let isWall = id === 0;
      // A 3 x 3 neighbourhood makes the walls two pixels wide, enough for a walls segmentation to close them.
      for (let dy = -1; dy <= 1 && !isWall; dy++) {
        const yy = y + dy;
        if (yy < 0 || yy >= h) continue;
        for (let dx = -1; dx <= 1; dx++) {
          const xx = x + dx;
          if (xx < 0 || xx >= w) continue;
          const o = labels[yy * w + xx]!;
          if (o !== 0 && o !== id) {
            isWall = true;
            break;
          }
        }
      }
      wall[p] = isWall ? 40 : 200;
    }
  }
  return {
    labels: { width: w, height: h, labels, count },
    x0: field.x0,
    y0: field.y0,
    nuclei,
    wallsImage: { width: w, height: h, data: wall, bitDepth: 8 },
    complete,
  };
}

/**
 * The kinetics of an image series. One field and one threshold serve every frame, so the fractions are
 * comparable: Otsu on the last frame by default (on the first and last frames together when the last is a
 * single phase), or settings.kinetics.manualThreshold; the transformed phase is the one that grows unless
 * settings.kinetics.phase says which. Per frame: the area fraction f of the transformed phase, the number and
 * mean area of its 4-connected domains. Then the JMAK fits f = 1 − exp(−k·(t − t0)ⁿ) (Avrami plot over
 * fitMin < f < fitMax, and nonlinear least squares on f with an optional incubation time), the
 * interpretation for planar growth, and plot data. Everything returned is plain JSON.
 *
 * @param frames the series, in time order, all of one size (8- or 16-bit)
 * @param times one time per frame, strictly increasing (opts.timeUnit, default s)
 * @param settings Settings or a partial input; settings.kinetics, umPerPx, field and minCellAreaPx are used
 * @throws SeriesError for fewer than three frames or usable frames, missing or non-increasing times, frames of
 *   different sizes, a decreasing fraction (unless opts.allowDecreasing), or f = 0 or 1 in every frame
 */
export async function analyzeSeries(
  frames: GreyImage[],
  times: number[],
  settings: SettingsInput | Settings,
  opts: SeriesOptions = {},
): Promise<KineticsResult> {
  return (await analyzeSeriesDetailed(frames, times, settings, opts)).result;
}

/**
 * The final frame of a series as a tessellation: the domain label image (domains grown from their first
 * appearance, so walls lie where neighbouring domains met), the nucleus estimates, and a walls image of the
 * mosaic that the walls analysis can read. For nuclei all present from the start and equal speeds this
 * mosaic is the Voronoi tessellation of the nuclei (docs/check-values.md §4); with nucleation over time it is the
 * Johnson–Mehl tessellation (Johnson & Mehl 1939).
 */
export async function finalMosaic(
  frames: GreyImage[],
  times: number[],
  settings: SettingsInput | Settings,
  opts: SeriesOptions = {},
): Promise<FinalMosaic> {
  return (await analyzeSeriesDetailed(frames, times, settings, opts)).mosaic;
}
