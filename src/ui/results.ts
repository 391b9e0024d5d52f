/**
 * The Results card's content, read from an analysis's summary (src/core/summary.ts) and nothing else: the
 * cell count, the density with its unit, the verdict with the statistic behind it and how far that
 * statistic lies from random seeding's mean in random seeding's standard deviations, the grain size number
 * when the image is calibrated, and what to do next. Pure, so that it is tested in Node.
 */
import type { Summary } from '../core/summary';

/** The statistic a verdict rests on, as the summary's tests table gives it. */
export interface VerdictBasis {
  label: string;
  value: number;
  referenceMean: number;
  referenceSd: number;
  /** (value − reference mean) / reference sd: the effect size in random seeding's standard deviations. */
  z: number | null;
  /** The statistic's own Monte Carlo p-value. */
  pValue: number | null;
}

export interface ResultsCard {
  count: number;
  interior: number;
  inStatistics: number;
  /** Cells per mm² (calibrated) or per 100 × 100 px (uncalibrated). */
  density: { value: number; unit: string };
  calibrated: boolean;
  /** 'rated': a verdict; 'not rated': the quality check failed; 'no verdict': the reference or the cells were missing. */
  rating: 'rated' | 'not rated' | 'no verdict';
  /** The verdict's words, or "not rated" / "no verdict". */
  verdict: string;
  /** Why there is no verdict (the quality check's first reason, or the summary's sentence), else null. */
  reason: string | null;
  /** Further notices of the quality check. */
  notices: string[];
  basis: VerdictBasis | null;
  /** The combined test's p-value, α and replicates. */
  combined: { pValue: number | null; alpha: number; replicates: number | null; test: string } | null;
  /** Grain size number (walls, calibrated), its method and interval; or why there is none. */
  grain: { G: number; method: string | null; ci95: [number | null, number | null] | null } | { note: string } | null;
  next: string[];
}

const finite = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/** The Results card of a summary. */
export function resultsCard(s: Summary): ResultsCard {
  const calibrated = s.umPerPx !== null;
  // densityPerArea is per µm² (calibrated) or per px²: per mm² reads better, per 10⁴ px² likewise.
  const density = calibrated ? { value: s.cells.densityPerArea * 1e6, unit: 'cells per mm²' } : { value: s.cells.densityPerArea * 1e4, unit: 'cells per 100 × 100 px' };
  const r = s.randomness;
  const q = s.quality;
  let rating: ResultsCard['rating'];
  let verdict: string;
  let reason: string | null = null;
  if (!q.ok) {
    rating = 'not rated';
    verdict = 'not rated';
    reason = q.warnings[0] ?? 'the segmentation failed the quality check';
  } else if (r.verdict) {
    rating = 'rated';
    verdict = r.verdict;
  } else {
    rating = 'no verdict';
    verdict = 'no verdict';
    reason = r.verdictText.replace(/^No verdict:\s*/, '');
  }
  const notices = q.ok ? q.warnings : q.warnings.slice(1);
  let basis: VerdictBasis | null = null;
  const row = r.basis.strongest ? r.tests.find((t) => t.name === r.basis.strongest) : undefined;
  if (rating === 'rated' && row && finite(row.statistic) && finite(row.referenceMean) && finite(row.referenceSd)) {
    basis = {
      label: row.name, value: row.statistic, referenceMean: row.referenceMean, referenceSd: row.referenceSd,
      z: row.referenceSd > 0 ? (row.statistic - row.referenceMean) / row.referenceSd : null, pValue: row.pValue,
    };
  }
  const combined = rating === 'rated' ? { pValue: r.basis.pValue, alpha: r.alpha, replicates: r.reference?.replicates ?? null, test: r.basis.test } : null;

  let grain: ResultsCard['grain'] = null;
  const g = s.grainSize;
  if (s.pattern === 'walls') {
    if (g && 'method' in g && finite(g.G)) grain = { G: g.G, method: g.method, ci95: g.ci95 };
    else if (!calibrated) grain = { note: 'needs the pixel size' };
    else if (g && 'error' in g) grain = { note: g.error };
  }

  const next: string[] = [];
  if (rating === 'not rated') next.push('Check the outlines on the Bench, then change the detection in the Detect panel (or choose the other pattern kind).');
  else next.push('Check the outlines on the Bench: merged or split cells change every figure. Fix them in the Cells panel (merge, split, remove).');
  if (!calibrated) next.push('Calibrate in the Scale panel for lengths and areas in µm' + (s.pattern === 'walls' ? ' and a grain size number.' : '.'));
  if (rating === 'rated') next.push('See every statistic, its plot and its p-value in the Randomness panel.');
  if (s.pattern === 'walls' && grain && 'G' in grain) next.push('See the grain size rating and its printable report in the Grain size panel.');
  next.push('Save the cell table, the summary and the overlay in the Export panel.');
  return {
    count: s.cells.count, interior: s.cells.interior, inStatistics: s.cells.inStatistics, density, calibrated,
    rating, verdict, reason, notices, basis, combined, grain, next,
  };
}

/** A number with `d` significant digits, or '–'. */
export function sig(v: number | null | undefined, d = 3): string {
  return finite(v) ? String(Number(v.toPrecision(d))) : '–';
}

/** A p-value as the tests table writes it. */
export function pText(p: number | null | undefined): string {
  if (!finite(p)) return '–';
  return p < 0.001 ? '< 0.001' : p.toFixed(3);
}
