/**
 * The Randomness panel's plots as plotly traces, built only from what the core returns
 * (Analysis.randomness, stats/randomness.ts): no statistic is computed here. Pure, so the traces can be
 * tested without a browser.
 */
import type { RandomnessResult, TestRow } from '../core/stats/randomness';

/** Okabe–Ito colours: observed blue, reference vermillion; distinguishable with any common colour-vision deficiency. */
export const OBSERVED_COLOUR = '#0072B2';
export const REFERENCE_COLOUR = '#D55E00';

export type Trace = Record<string, unknown>;

/** One plot: its key (for the element), its traces, and the words of its title and axes. */
export interface PlotSpec {
  key: 'area' | 'sides' | 'lewis' | 'aboav' | 'pair';
  traces: Trace[];
  title: string;
  x: string;
  y: string;
}

/** A number as the panel shows it (3 significant figures), or an en dash. */
export function formatNumber(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '–' : String(Number(v.toPrecision(3)));
}

/** "published 1.78" or "Monte Carlo 0.57": the comparison value of a test row, with what kind of value it is. */
export function comparisonText(row: TestRow | undefined): string {
  const p = row?.published;
  if (!p) return '';
  return `${p.status === 'monte carlo' ? 'Monte Carlo' : 'published'} ${formatNumber(p.value)}`;
}

const row = (r: RandomnessResult, key: string): TestRow | undefined => r.tests.find((t) => t.key === key);

/**
 * The plots of one result. Lengths of the L-function are shown in µm when `umPerPx` is given, else px.
 * @param text colour of text and reference lines (the theme's)
 */
export function randomnessPlots(r: RandomnessResult, umPerPx: number | null, text: string): PlotSpec[] {
  const R = r.reference?.replicates ?? 0;
  const env = `random-seeding envelope (${R} replicates in this field)`;
  const obsName = `observed (${r.interiorCells} cells in the statistics)`;
  const band = (x: number[], lo: (number | null)[], hi: (number | null)[], scale = 1): Trace[] => [
    { type: 'scatter', mode: 'lines', x, y: lo.map((v) => (v === null ? null : v * scale)), line: { width: 0 }, showlegend: false, hoverinfo: 'skip' },
    { type: 'scatter', mode: 'lines', x, y: hi.map((v) => (v === null ? null : v * scale)), line: { width: 0 }, fill: 'tonexty', fillcolor: 'rgba(213,94,0,0.18)', name: env },
  ];
  const plots: PlotSpec[] = [];

  const h = r.areas.histogram;
  const hx = h.y0.map((v) => v + h.binWidth / 2);
  const cvRow = row(r, 'areaCv');
  plots.push({
    key: 'area',
    traces: [
      { type: 'bar', x: hx, y: h.observed, name: obsName, marker: { color: OBSERVED_COLOUR }, width: h.binWidth * 0.95 },
      ...(R ? [...band(hx, h.lo, h.hi), { type: 'scatter', mode: 'lines', x: hx, y: h.mean, name: 'random seeding, mean', line: { color: REFERENCE_COLOUR, width: 1.5 } }] : []),
      { type: 'scatter', mode: 'lines', x: hx, y: h.published, name: 'published law (gamma, shape 7/2)', line: { color: text, width: 1, dash: 'dot' } },
    ],
    title: `Cell area (CV ${formatNumber(r.areas.cv)}; random seeding ${formatNumber(cvRow?.referenceMean ?? cvRow?.published?.value)})`,
    x: 'area / mean area',
    y: 'density',
  });

  const sd = r.sides;
  const keep = sd.n.map((_, i) => sd.observed[i]! > 0 || (sd.reference[i] ?? sd.published[i] ?? 0) > 0.001);
  const pick = <T>(v: T[]): T[] => v.filter((_, i) => keep[i]);
  const mu2Row = row(r, 'mu2');
  plots.push({
    key: 'sides',
    traces: [
      { type: 'bar', x: pick(sd.n), y: pick(sd.observed), name: obsName, marker: { color: OBSERVED_COLOUR } },
      ...(R ? [{
        type: 'scatter', mode: 'markers', x: pick(sd.n), y: pick(sd.reference), name: env, marker: { color: REFERENCE_COLOUR, symbol: 'diamond', size: 8 },
        error_y: {
          type: 'data', symmetric: false, color: REFERENCE_COLOUR,
          array: pick(sd.n.map((_, i) => (sd.referenceHi[i] ?? 0) - (sd.reference[i] ?? 0))),
          arrayminus: pick(sd.n.map((_, i) => (sd.reference[i] ?? 0) - (sd.referenceLo[i] ?? 0))),
        },
      }] : []),
      { type: 'scatter', mode: 'lines', x: pick(sd.n), y: pick(sd.published), name: 'published p(n)', line: { color: text, width: 1, dash: 'dot' } },
    ],
    title: `Sides (μ₂ ${formatNumber(sd.mu2)}; random seeding ${formatNumber(mu2Row?.referenceMean ?? mu2Row?.published?.value)})`,
    x: 'number of sides n',
    y: 'fraction of cells',
  });

  /** A law of the side classes: the observed class means beside the reference's pooled class means. */
  type ClassLawJson = { n: number[]; observed: number[]; count: number[]; reference: { n: number[]; value: (number | null)[] } };
  const law = (key: 'lewis' | 'aboav', l: ClassLawJson, title: string, y: string): PlotSpec => ({
    key,
    traces: [
      { type: 'scatter', mode: 'lines+markers', x: l.n, y: l.observed, name: 'observed', line: { color: OBSERVED_COLOUR }, text: l.count.map((c) => `${c} cells`) },
      { type: 'scatter', mode: 'lines+markers', x: l.reference.n, y: l.reference.value, name: 'random seeding, mean of replicates', line: { color: REFERENCE_COLOUR, dash: 'dash' } },
    ],
    title,
    x: 'number of sides n',
    y,
  });
  plots.push(
    law('lewis', r.lewis, `Lewis's law (slope ${formatNumber(r.lewis.fit.slope)}; random seeding ${formatNumber(r.lewis.reference.slopeMean)})`, 'mean area / mean area of all'),
    law('aboav', r.aboavWeaire, `Aboav–Weaire (a ${formatNumber(r.aboavWeaire.a)}; random seeding ${formatNumber(r.aboavWeaire.reference.aMean)})`, 'mean sides of the neighbours'),
  );

  // The core returns L(r) − r already (stats/pattern.ts lFunction): only the unit is changed here.
  const L = r.lFunction;
  const k = umPerPx ?? 1;
  const unit = umPerPx ? 'µm' : 'px';
  const rx = L.rPx.map((v) => v * k);
  plots.push({
    key: 'pair',
    traces: [
      ...(R ? band(rx, L.lo, L.hi, k) : []),
      { type: 'scatter', mode: 'lines', x: rx, y: L.observed.map((v) => (v === null ? null : v * k)), name: 'observed (centroids)', line: { color: OBSERVED_COLOUR, width: 2 } },
    ],
    title: `Pair correlation, as L(r) − r (maximum deviation p ${formatNumber(L.pValue)})`,
    x: `r (${unit})`,
    y: `L(r) − r (${unit})`,
  });
  return plots;
}
