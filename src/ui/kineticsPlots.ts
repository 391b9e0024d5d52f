/**
 * Plot data of the Kinetics panel: f(t) with the fitted JMAK curve, and the Avrami plot with its fitted
 * line. Pure: the core's KineticsResult (its `plots`) in, plotly traces and layouts out.
 */
import type { KineticsResult } from '../core/kinetics/types';

export interface Figure { key: 'fraction' | 'avrami'; traces: Record<string, unknown>[]; layout: Record<string, unknown> }

// Okabe–Ito colours: measured blue, fitted vermillion; distinguishable with any common colour-vision deficiency.
const OBS = '#0072B2', FIT = '#D55E00';

function layout(title: string, x: string, y: string, c: { text: string; grid: string }): Record<string, unknown> {
  return {
    title: { text: title, font: { size: 13 } }, margin: { l: 55, r: 10, t: 30, b: 95 }, height: 290,
    paper_bgcolor: 'rgba(0,0,0,0)', plot_bgcolor: 'rgba(0,0,0,0)', font: { color: c.text, size: 11 },
    xaxis: { title: { text: x }, gridcolor: c.grid, zerolinecolor: c.grid }, yaxis: { title: { text: y }, gridcolor: c.grid, zerolinecolor: c.grid },
    legend: { orientation: 'h', y: -0.42, yanchor: 'top' }, showlegend: true,
  };
}

/**
 * The two figures of a kinetics result. f(t): the measured fraction per frame (frames inside the fit range
 * filled, the others open) and the reported fit's curve f = 1 − exp(−k·(t − t0)ⁿ). Avrami plot:
 * y = ln(−ln(1 − f)) against x = ln(t − t0), with the straight-line fit over the fit range.
 *
 * @param r the result of analyzeSeries
 * @param colours text and grid colours of the current theme
 */
export function kineticsFigures(r: KineticsResult, colours: { text: string; grid: string }): Figure[] {
  const p = r.plots;
  const a = r.avrami;
  const used = new Set(a.frames);
  const unit = r.timeUnit;
  const curve = a.method === 'nonlinear' && p.curves.nonlinear ? p.curves.nonlinear : p.curves.avramiPlot;
  const inFit = { t: [] as number[], f: [] as number[], text: [] as string[] };
  const outFit = { t: [] as number[], f: [] as number[], text: [] as string[] };
  p.fraction.t.forEach((t, i) => {
    const dst = used.has(i) ? inFit : outFit;
    dst.t.push(t); dst.f.push(p.fraction.f[i]!); dst.text.push(`frame ${i + 1}`);
  });
  const fitName = `${a.method === 'nonlinear' ? 'nonlinear fit' : 'Avrami plot fit'}: n = ${a.n.toPrecision(3)}, k = ${a.k.toPrecision(3)}`;
  const fraction: Figure = {
    key: 'fraction',
    traces: [
      { type: 'scatter', mode: 'markers', x: inFit.t, y: inFit.f, text: inFit.text, name: 'measured (fitted)', marker: { color: OBS, size: 7 } },
      { type: 'scatter', mode: 'markers', x: outFit.t, y: outFit.f, text: outFit.text, name: 'measured (outside the fit range)', marker: { color: OBS, size: 7, symbol: 'circle-open' } },
      { type: 'scatter', mode: 'lines', x: p.curves.t, y: curve, name: fitName, line: { color: FIT, width: 2 } },
    ],
    layout: layout(`Transformed fraction f(t) (t½ = ${a.tHalf.toPrecision(3)} ${unit})`, `t (${unit})`, 'f', colours),
  };
  const ax = { used: { x: [] as number[], y: [] as number[], text: [] as string[] }, other: { x: [] as number[], y: [] as number[], text: [] as string[] } };
  p.avrami.x.forEach((x, i) => {
    const dst = p.avrami.used[i] ? ax.used : ax.other;
    dst.x.push(x); dst.y.push(p.avrami.y[i]!); dst.text.push(`frame ${p.avrami.frame[i]}`);
  });
  const lp = r.fit.avramiPlot;
  const avrami: Figure = {
    key: 'avrami',
    traces: [
      { type: 'scatter', mode: 'markers', x: ax.used.x, y: ax.used.y, text: ax.used.text, name: 'frames in the fit range', marker: { color: OBS, size: 7 } },
      { type: 'scatter', mode: 'markers', x: ax.other.x, y: ax.other.y, text: ax.other.text, name: 'other frames', marker: { color: OBS, size: 7, symbol: 'circle-open' } },
      { type: 'scatter', mode: 'lines', x: p.avrami.line.x, y: p.avrami.line.y, name: `straight line: slope n = ${lp.n.toPrecision(3)}`, line: { color: FIT, width: 2 } },
    ],
    layout: layout('Avrami plot', `ln(t / ${unit})`, 'ln(−ln(1 − f))', colours),
  };
  return [fraction, avrami];
}
