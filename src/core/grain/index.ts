/**
 * Grain size per ASTM E112 (planimetric and intercept procedures) and from the segmented grain areas
 * (ASTM E1382 style), with the standard's field-to-field statistics and the ISO 643 index beside it.
 * Results are plain JSON and carry the audit marks (test figures, counted grains, intersections) that the
 * Grain size panel draws on the Bench.
 */
import type { GrainSizeSummary } from '../summary';
import { CalibrationError, SettingsError, TessellabError } from '../errors';
import { checkUserPixelSize } from '../image/calibration';
import type { PatternKind, Settings } from '../settings';
import type { LabelImage, Rect } from '../types';
import { checkLabelsAndField } from './check';
import { centredFigure, checkFigureInField, quadrants } from './figure';
import { gFromMeanArea, gFromMeanIntercept, gFromNA, G_MAX, G_MIN, isoFromAstm, isPlausibleG, roundG } from './formulas';
import { interceptCount, testPatterns } from './intercept';
import { fieldCensus, type FieldCensus } from './census';
import { jeffriesCountOf, wholePixelFigure } from './jeffries';
import { duplexCheck, gHistogram, insideGrainsOf, milesLantuejoulWeight } from './meanArea';
import { precision, type Precision } from './precision';
import type { GrainSizeResult, InterceptPatternResult, InterceptResult, MeanAreaResult, PlanimetricResult, TestFigure } from './types';

export * from './formulas';
export * from './types';
export { precision, type Precision } from './precision';
export { jeffriesCount, type JeffriesOptions } from './jeffries';
export { interceptCount, testPatterns, patternLength } from './intercept';
export { centredFigure, figureArea, figureContains, quadrants } from './figure';
export { insideGrains, milesLantuejoulWeight, gHistogram, duplexCheck, type DuplexCheck, type InsideGrains } from './meanArea';

/** Fewest grains inside a planimetric field, and fewest intersections per intercept pattern, the standard recommends. */
export const MIN_GRAINS_PER_FIELD = 50;
export const MIN_INTERSECTIONS_PER_PATTERN = 50;
/** Relative accuracy the standard regards as acceptable (%). */
export const ACCEPTABLE_RA_PCT = 10;

/** The cautions printed with every rating. */
export const GRAIN_CAUTIONS: readonly string[] = [
  'Calibrate the pixel size with a stage micrometer at the magnification used; G depends on it directly.',
  'This is an aid to rating, not a certified grain size rating.',
  'Follow ASTM E112 / ASTM E1382 (or ISO 643) and your local procedures for specimen preparation, etching, field selection and reporting.',
];

export interface GrainSizeInput {
  labels: LabelImage;
  /** Micrometres per pixel; null = uncalibrated (G cannot be given). */
  umPerPx: number | null;
  field: Rect;
  pattern: PatternKind;
  settings: Settings;
}

/** G interval from a relative half-width: G + k·log₂(1 ∓ RA/100), k = 1 for N_A, 2 for N_L. */
function gInterval(G: number, p: Precision, k: number): [number, number] | null {
  if (p.relativeAccuracyPct === null) return null;
  const r = p.relativeAccuracyPct / 100;
  if (r >= 1) return null;
  return [G + k * Math.log2(1 - r), G + k * Math.log2(1 + r)];
}

function plausibility(G: number, what: string, umPerPx: number, warnings: string[]): void {
  if (!isPlausibleG(G)) {
    warnings.push(
      `${what}: G = ${G.toFixed(1)} lies outside the range of the standard (00 to ${G_MAX}); check the pixel size (${umPerPx} µm/px) in the Scale panel.`,
    );
  }
}

/** The planimetric test figures: the one centred in the field, then one in each quadrant (whole px). */
function planimetricFigures(field: Rect, settings: Settings): TestFigure[] {
  const g = settings.grain;
  return [field, ...quadrants(field)].map((r) => wholePixelFigure(centredFigure(r, g.testShape, g.testSizeFraction)));
}

function planimetric(input: GrainSizeInput, census: FieldCensus, figures: readonly TestFigure[], mmPerPx: number, warnings: string[]): PlanimetricResult | null {
  const { labels, settings } = input;
  const g = settings.grain;
  const unbiased = g.unbiasedCorrection;
  const shapeWord = g.testShape === 'circle' ? 'circle' : 'rectangle';
  try {
    const count = jeffriesCountOf(labels, census, figures[0]!, { unbiased });
    const areaMm2 = count.areaPx2 * mmPerPx * mmPerPx;
    if (!(count.count > 0)) {
      warnings.push(`Planimetric: no grains counted in the test ${shapeWord}; the figure is too small for these grains: enlarge it (grain.testSizeFraction) or the field.`);
      return null;
    }
    const NA = count.count / areaMm2;
    const G = gFromNA(NA);
    if (count.inside < MIN_GRAINS_PER_FIELD) {
      warnings.push(
        `Planimetric: only ${count.inside} grains lie wholly inside the test ${shapeWord}; ASTM E112 asks for at least ${MIN_GRAINS_PER_FIELD} per field: use a lower magnification, a larger figure or more fields.`,
      );
    }
    plausibility(G, 'Planimetric', input.umPerPx!, warnings);
    const placements = figures.slice(1).map((f) => {
      const c = jeffriesCountOf(labels, census, f, { unbiased });
      const na = c.count / (c.areaPx2 * mmPerPx * mmPerPx);
      return { figure: c.figure, count: c.count, NA_per_mm2: na, G: na > 0 ? gFromNA(na) : null };
    });
    const prec = precision(placements.map((p) => p.NA_per_mm2));
    const method = `planimetric (Jeffries), test ${shapeWord}${unbiased && g.testShape === 'circle' ? ', unbiased correction (−1)' : ''}`;
    return { method, count, NA_per_mm2: NA, G, Greported: roundG(G), iso643: isoFromAstm(G), placements, precision: prec, ci95: gInterval(G, prec, 1) };
  } catch (e) {
    if (e instanceof TessellabError) {
      warnings.push(`Planimetric: ${e.message}`);
      return null;
    }
    throw e;
  }
}

function intercept(input: GrainSizeInput, mmPerPx: number, warnings: string[]): InterceptResult | null {
  const { labels, field, settings } = input;
  const g = settings.grain;
  const patterns = testPatterns(field, g.lineAngles, g.linesPerAngle, g.circles);
  if (patterns.length === 0) {
    warnings.push('Intercept: the field is too small to hold test lines; draw a larger field.');
    return null;
  }
  const count = interceptCount(labels, field, patterns);
  if (count.P === 0) {
    warnings.push('Intercept: no grain boundary crosses the test lines; the grains are larger than the field: use a lower magnification.');
    return null;
  }
  const groups = new Map<string, InterceptPatternResult>();
  for (const line of count.lines) {
    const p = line.pattern;
    const name = p.kind === 'circle' ? 'circles' : `${p.angleDeg}°`;
    let gr = groups.get(name);
    if (!gr) {
      gr = { name, angleDeg: p.kind === 'line' ? p.angleDeg : null, P: 0, N: 0, lengthMm: 0, NL_per_mm: 0, meanIntercept_um: null, G: null, lines: [] };
      groups.set(name, gr);
    }
    gr.P += line.P;
    gr.N += line.N;
    gr.lengthMm += line.lengthPx * mmPerPx;
    gr.lines.push(line);
  }
  const pats = [...groups.values()];
  for (const gr of pats) {
    gr.NL_per_mm = gr.P / gr.lengthMm;
    if (gr.P > 0) {
      gr.meanIntercept_um = (1000 * gr.lengthMm) / gr.P;
      gr.G = gFromMeanIntercept(gr.lengthMm / gr.P);
    }
  }
  const few = pats.filter((p) => p.P < MIN_INTERSECTIONS_PER_PATTERN);
  if (few.length > 0) {
    warnings.push(
      `Intercept: ${few.map((p) => `${p.name} ${p.P}`).join(', ')} intersections; ASTM E112 recommends about ${MIN_INTERSECTIONS_PER_PATTERN} per test pattern: use more lines (grain.linesPerAngle), a lower magnification or more fields.`,
    );
  }
  const lengthMm = count.lengthPx * mmPerPx;
  const NL = count.P / lengthMm;
  const lmm = lengthMm / count.P;
  const G = gFromMeanIntercept(lmm);
  plausibility(G, 'Intercept', input.umPerPx!, warnings);
  const mod180 = (a: number) => ((a % 180) + 180) % 180;
  const at = (deg: number) => {
    let P = 0;
    let L = 0;
    for (const p of pats) if (p.angleDeg !== null && mod180(p.angleDeg) === deg) {
      P += p.P;
      L += p.lengthMm;
    }
    return P > 0 ? (1000 * L) / P : null;
  };
  const l0 = at(0);
  const l90 = at(90);
  const anisotropy = l0 !== null && l90 !== null ? { ratio: l0 / l90, l0_um: l0, l90_um: l90 } : null;
  const prec = precision(pats.filter((p) => p.lengthMm > 0).map((p) => p.NL_per_mm));
  return {
    method: `intercept (Heyn), ${g.lineAngles.length} line angles × ${g.linesPerAngle} lines${g.circles > 0 ? ` and ${g.circles} circles` : ''}`,
    P: count.P,
    N: count.N,
    lengthMm,
    NL_per_mm: NL,
    meanIntercept_um: 1000 * lmm,
    G,
    Greported: roundG(G),
    iso643: isoFromAstm(G),
    patterns: pats,
    anisotropy,
    precision: prec,
    ci95: gInterval(G, prec, 2),
  };
}

function meanArea(input: GrainSizeInput, census: FieldCensus, mmPerPx: number, warnings: string[]): MeanAreaResult | null {
  const { field } = input;
  const ig = insideGrainsOf(census);
  const n = ig.labels.length;
  if (n === 0) {
    warnings.push('Mean area: no grain lies wholly inside the field; the grains are too large for it: use a lower magnification.');
    return null;
  }
  if (n < MIN_GRAINS_PER_FIELD) {
    warnings.push(`Mean area: only ${n} grains lie wholly inside the field (fewer than ${MIN_GRAINS_PER_FIELD}); the mean area is imprecise.`);
  }
  // Walls between grains belong to the grains' share of the field; spreading them keeps N_A·Ā = 1.
  const spread = 1 / (1 - Math.min(0.99, ig.wallFraction));
  const mm2 = ig.areaPx2.map((a) => a * spread * mmPerPx * mmPerPx);
  const W1 = field.x1 - field.x0;
  const W2 = field.y1 - field.y0;
  let sw = 0;
  let swa = 0;
  let sa = 0;
  mm2.forEach((a, i) => {
    const wt = milesLantuejoulWeight(W1, W2, ig.bboxW[i]!, ig.bboxH[i]!);
    sw += wt;
    swa += wt * a;
    sa += a;
  });
  const mean = sa / n;
  const meanW = swa / sw;
  const G = gFromMeanArea(meanW);
  plausibility(G, 'Mean area', input.umPerPx!, warnings);
  const gi = mm2.map(gFromMeanArea);
  const gMean = gi.reduce((s, v) => s + v, 0) / n;
  const gSd = n > 1 ? Math.sqrt(gi.reduce((s, v) => s + (v - gMean) ** 2, 0) / (n - 1)) : 0;
  const dup = duplexCheck(gi, mm2);
  if (dup.duplex) warnings.push(`Mean area: ${dup.note}`);
  return {
    method: 'mean grain area of the grains wholly inside the field, Miles–Lantuéjoul weighted (ASTM E1382 form)',
    grains: n,
    wallFraction: ig.wallFraction,
    meanArea_um2: mean * 1e6,
    meanAreaWeighted_um2: meanW * 1e6,
    G,
    Greported: roundG(G),
    G_unweighted: gFromMeanArea(mean),
    iso643: isoFromAstm(G),
    gMean,
    gSd,
    histogram: gHistogram(mm2),
    duplex: dup.duplex,
    duplexNote: dup.note,
  };
}

/**
 * Rates the grain size of one segmented walls image by three methods:
 * - planimetric (Jeffries) in a test circle or rectangle centred in the field, G = 3.321928·log₁₀ N_A − 2.954,
 *   with N_A from {@link jeffriesCount}; spread from four placements in the field's quadrants;
 * - intercept (Heyn) on parallel lines at several angles and concentric circles, G = −6.643856·log₁₀ ℓ̄ − 3.288,
 *   with P from {@link interceptCount}; spread over the pattern placements (each angle set, the circles);
 * - mean area of the grains wholly inside the field, Miles–Lantuéjoul weighted, G = −3.3223·log₁₀ Ā − 2.955,
 *   with the per-grain G histogram and a check for two populations.
 * (ASTM E112, Standard Test Methods for Determining Average Grain Size; ASTM E1382.)
 *
 * The headline G is the planimetric one when it could be made (else intercept, else mean area), with its
 * 95 % interval G + k·log₂(1 ∓ %RA/100) from the field-to-field statistics ({@link precision}).
 *
 * @param input labels (0 wall, 1..count grains), pixel size (µm/px), field (whole px), pattern, settings
 *   (settings.grain: testShape, testSizeFraction, unbiasedCorrection, lineAngles, linesPerAngle, circles)
 * @throws CalibrationError without a pixel size; SettingsError for a pattern other than walls or a field
 *   outside the image; NoCellsError for an empty label image. Per-method problems (too few grains, a test
 *   figure that does not fit, an implausible G) go into `warnings` while the other methods still report.
 */
export function grainSize(input: GrainSizeInput): GrainSizeResult {
  const { umPerPx, pattern, field } = input;
  if (umPerPx === null || umPerPx === undefined) {
    throw new CalibrationError(
      'Grain size needs the pixel size: set it in the Scale panel (type it or draw a line on a scale bar) or pass --um-per-px; calibrate it with a stage micrometer.',
    );
  }
  // Inside the plausible band every area and G below is a finite, ordinary number.
  checkUserPixelSize(umPerPx, 'the Scale panel or with --um-per-px');
  if (pattern !== 'walls') {
    throw new SettingsError(
      `Grain size (ASTM E112) rates a walls pattern (grains separated by boundaries); this is a ${pattern} pattern: set the pattern to walls in the Detect panel or with --pattern walls.`,
    );
  }
  checkLabelsAndField(input.labels, field);
  const mmPerPx = umPerPx / 1000;
  const warnings: string[] = [];
  // One pass over the labels serves the planimetric figures (those that fit the field; the others fail
  // in planimetric with their message) and the mean-area method.
  const figures = planimetricFigures(field, input.settings);
  const fits = (f: TestFigure): boolean => {
    try {
      checkFigureInField(f, field);
      return true;
    } catch (e) {
      if (e instanceof TessellabError) return false;
      throw e;
    }
  };
  const census = fieldCensus(input.labels, field, figures.map((f) => (fits(f) ? f : null)));
  const plan = planimetric(input, census, figures, mmPerPx, warnings);
  const inter = intercept(input, mmPerPx, warnings);
  const area = meanArea(input, census, mmPerPx, warnings);
  const head = plan ?? inter;
  let G: number | null = head ? head.G : area ? area.G : null;
  const method = head ? head.method : area ? area.method : null;
  const prec = head ? head.precision : null;
  const ci95 = head ? head.ci95 : null;
  if (prec && prec.relativeAccuracyPct !== null && prec.relativeAccuracyPct > ACCEPTABLE_RA_PCT) {
    warnings.push(
      `Relative accuracy ${prec.relativeAccuracyPct.toFixed(1)} % (${prec.n} placements) is worse than the ${ACCEPTABLE_RA_PCT} % ASTM E112 regards as acceptable: measure more fields.`,
    );
  }
  if (G !== null && !Number.isFinite(G)) G = null;
  const notes: string[] = [
    'A pixel counts as inside a test figure when its centre does; a grain touching the field border is counted as cut (it may continue beyond the field).',
    'Intersections: a crossing counts 1, a pass through a triple point 1.5, a tangent hit 1; grain segments shorter than 2 px are part of the boundary (a digitised boundary is a staircase).',
    'The 95 % interval of G is G + log₂(1 ∓ %RA/100) for the planimetric method and G + 2·log₂(1 ∓ %RA/100) for the intercept method, %RA = 100·t·s/(√n·x̄) over the test placements.',
    'Per-grain G uses the mean-area form on each grain; wall pixels are shared out over the grains.',
  ];
  if (plan && inter) {
    notes.push(`Planimetric and intercept G differ by ${(inter.G - plan.G).toFixed(2)}; on equiaxed grains the two agree within a few tenths.`);
  }
  return {
    umPerPx,
    field,
    fieldAreaMm2: (field.x1 - field.x0) * (field.y1 - field.y0) * mmPerPx * mmPerPx,
    planimetric: plan,
    intercept: inter,
    meanArea: area,
    G,
    Greported: G === null ? null : roundG(G),
    method,
    ci95,
    relativeAccuracyPct: prec ? prec.relativeAccuracyPct : null,
    iso643: G === null ? null : isoFromAstm(G),
    warnings,
    cautions: [...GRAIN_CAUTIONS],
    notes,
  };
}

const r1 = (v: number | null | undefined): number | null => (v === null || v === undefined || !Number.isFinite(v) ? null : roundG(v));
const sig = (v: number | null | undefined, d = 5): number | null => (v === null || v === undefined || !Number.isFinite(v) ? null : Number(v.toPrecision(d)));

/**
 * The `grainSize` object of summary.json: G values to 0.1 (as the standard reports them), counts and
 * densities to 5 significant digits, the interval, relative accuracy, ISO 643 index, warnings and cautions.
 * Audit marks are left out (they are in the full result).
 */
export function grainSizeSummary(r: GrainSizeResult): GrainSizeSummary {
  const p = r.planimetric;
  const i = r.intercept;
  const a = r.meanArea;
  return {
    G: r1(r.G),
    method: r.method,
    ci95: r.ci95 ? [r1(r.ci95[0]), r1(r.ci95[1])] : null,
    relativeAccuracyPct: sig(r.relativeAccuracyPct, 3),
    iso643: r1(r.iso643),
    umPerPx: r.umPerPx,
    fieldArea_mm2: sig(r.fieldAreaMm2),
    planimetric: p
      ? {
          G: r1(p.G),
          NA_per_mm2: sig(p.NA_per_mm2),
          count: p.count.count,
          inside: p.count.inside,
          cut: p.count.cut,
          corner: p.count.corner,
          rule: p.count.rule,
          testShape: p.count.figure.shape,
          testArea_mm2: sig(p.count.areaPx2 * (r.umPerPx / 1000) ** 2),
          ci95: p.ci95 ? [r1(p.ci95[0]), r1(p.ci95[1])] : null,
          relativeAccuracyPct: sig(p.precision.relativeAccuracyPct, 3),
          placements: p.precision.n,
          iso643: r1(p.iso643),
        }
      : null,
    intercept: i
      ? {
          G: r1(i.G),
          meanIntercept_um: sig(i.meanIntercept_um),
          NL_per_mm: sig(i.NL_per_mm),
          P: i.P,
          N: i.N,
          lineLength_mm: sig(i.lengthMm),
          anisotropy: i.anisotropy ? sig(i.anisotropy.ratio, 3) : null,
          ci95: i.ci95 ? [r1(i.ci95[0]), r1(i.ci95[1])] : null,
          relativeAccuracyPct: sig(i.precision.relativeAccuracyPct, 3),
          placements: i.precision.n,
          iso643: r1(i.iso643),
        }
      : null,
    meanArea: a
      ? {
          G: r1(a.G),
          G_unweighted: r1(a.G_unweighted),
          grains: a.grains,
          meanArea_um2: sig(a.meanArea_um2),
          meanAreaWeighted_um2: sig(a.meanAreaWeighted_um2),
          gSd: sig(a.gSd, 3),
          duplex: a.duplex,
          iso643: r1(a.iso643),
        }
      : null,
    warnings: r.warnings,
    cautions: r.cautions,
  };
}
