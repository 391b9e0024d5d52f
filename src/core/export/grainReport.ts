/**
 * A printable one-page grain size report: self-contained HTML (inline CSS and SVG, no network references)
 * that prints cleanly to PDF from a browser. Pure: values in, text out.
 */
import { formatG } from '../grain/formulas';
import { GRAIN_COLOURS, LAYER_COLOURS, legendFigure } from './palette';
import type { GBin, GrainSizeResult, TestFigure, TestPattern } from '../grain/types';

export interface GrainReportInput {
  /** Image name shown in the title. */
  name: string;
  result: GrainSizeResult;
  /** Pixel size (µm/px) used. */
  umPerPx: number;
  /** Image size (px). */
  width: number;
  height: number;
  /** The image as a PNG data URL, drawn under the test figures; omitted = no picture. */
  imagePngDataUrl?: string;
}

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}
function num(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  return Number(v.toPrecision(digits)).toString();
}
function gStr(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '–' : formatG(v);
}
function interval(ci: [number, number] | null): string {
  return ci ? `${formatG(ci[0])} to ${formatG(ci[1])}` : '–';
}

function figureSvg(f: TestFigure, k: number): string {
  if (f.shape === 'circle') return `<circle cx="${f.cx * k}" cy="${f.cy * k}" r="${f.r * k}" class="fig"/>`;
  return `<rect x="${f.x0 * k}" y="${f.y0 * k}" width="${(f.x1 - f.x0) * k}" height="${(f.y1 - f.y0) * k}" class="fig"/>`;
}
function patternSvg(p: TestPattern, k: number): string {
  if (p.kind === 'circle') return `<circle cx="${p.cx * k}" cy="${p.cy * k}" r="${p.r * k}" class="line"/>`;
  return `<line x1="${p.x0 * k}" y1="${p.y0 * k}" x2="${p.x1 * k}" y2="${p.y1 * k}" class="line"/>`;
}

/** The image with the planimetric figure, its grain marks (1 filled, ½ ring, ¼ small ring) and the test lines. */
function imageSvg(input: GrainReportInput, maxW: number, maxH: number): string {
  const { result: r, width, height } = input;
  const k = Math.min(maxW / width, maxH / height);
  const W = Math.round(width * k);
  const H = Math.round(height * k);
  const parts: string[] = [];
  if (input.imagePngDataUrl) parts.push(`<image href="${esc(input.imagePngDataUrl)}" x="0" y="0" width="${W}" height="${H}" preserveAspectRatio="none"/>`);
  else parts.push(`<rect x="0" y="0" width="${W}" height="${H}" class="noimg"/>`);
  const f = r.field;
  parts.push(`<rect x="${f.x0 * k}" y="${f.y0 * k}" width="${(f.x1 - f.x0) * k}" height="${(f.y1 - f.y0) * k}" class="field"/>`);
  if (r.intercept) for (const pat of r.intercept.patterns) for (const l of pat.lines) parts.push(patternSvg(l.pattern, k));
  if (r.planimetric) {
    parts.push(figureSvg(r.planimetric.count.figure, k));
    for (const m of r.planimetric.count.marks) {
      const cls = m.weight >= 1 ? 'm1' : m.weight >= 0.5 ? 'm2' : 'm4';
      parts.push(`<circle cx="${(m.x * k).toFixed(1)}" cy="${(m.y * k).toFixed(1)}" r="${m.weight >= 1 ? 1.6 : 2}" class="${cls}"/>`);
    }
  }
  return `<svg class="img" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="image with test figures">${parts.join('')}</svg>`;
}

/** Bar chart of the per-grain G histogram (grain counts per bin). */
function histogramSvg(bins: readonly GBin[]): string {
  if (bins.length === 0) return '<p>No grains wholly inside the field: no histogram.</p>';
  const W = 300;
  const H = 150;
  const pad = { l: 34, r: 8, t: 8, b: 30 };
  const maxC = Math.max(...bins.map((b) => b.count));
  const bw = (W - pad.l - pad.r) / bins.length;
  const parts: string[] = [];
  bins.forEach((b, i) => {
    const h = maxC > 0 ? ((H - pad.t - pad.b) * b.count) / maxC : 0;
    parts.push(`<rect x="${(pad.l + i * bw).toFixed(1)}" y="${(H - pad.b - h).toFixed(1)}" width="${Math.max(0.5, bw - 1).toFixed(1)}" height="${h.toFixed(1)}" class="bar"><title>G ${b.g0} to ${b.g1}: ${b.count} grains</title></rect>`);
  });
  const step = Math.max(1, Math.ceil(bins.length / 8));
  for (let i = 0; i < bins.length; i += step) {
    parts.push(`<text x="${(pad.l + i * bw).toFixed(1)}" y="${H - pad.b + 12}" class="tick">${bins[i]!.g0}</text>`);
  }
  parts.push(`<line x1="${pad.l}" y1="${H - pad.b}" x2="${W - pad.r}" y2="${H - pad.b}" class="axis"/>`);
  parts.push(`<line x1="${pad.l}" y1="${pad.t}" x2="${pad.l}" y2="${H - pad.b}" class="axis"/>`);
  parts.push(`<text x="${pad.l - 4}" y="${pad.t + 8}" class="tick" text-anchor="end">${maxC}</text>`);
  parts.push(`<text x="${(W + pad.l) / 2}" y="${H - 4}" class="lab" text-anchor="middle">G of each grain (mean-area form)</text>`);
  parts.push(`<text x="10" y="${(H - pad.b) / 2}" class="lab" transform="rotate(-90 10 ${(H - pad.b) / 2})" text-anchor="middle">grains</text>`);
  return `<svg class="hist" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="histogram of G per grain">${parts.join('')}</svg>`;
}

const CSS = `
*{box-sizing:border-box}
body{font:10pt/1.35 system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;color:#111;margin:12mm;max-width:186mm}
h1{font-size:15pt;margin:0 0 2mm}
h2{font-size:11pt;margin:4mm 0 1.5mm;border-bottom:1px solid #999}
table{border-collapse:collapse;width:100%;font-size:9pt}
th,td{border:1px solid #bbb;padding:1mm 1.5mm;text-align:left;vertical-align:top}
th{background:#eee}
.row{display:flex;gap:5mm;align-items:flex-start}
.headline{font-size:13pt;font-weight:600;margin:1mm 0 2mm}
.img{border:1px solid #999;background:#fff;flex:none}
.fig{fill:none;stroke:${GRAIN_COLOURS.figure.colour};stroke-width:1.2}
.field{fill:none;stroke:${LAYER_COLOURS.field.colour};stroke-dasharray:4 3;stroke-width:0.8}
.line{fill:none;stroke:${GRAIN_COLOURS.lines.colour};stroke-width:0.6;opacity:0.8}
.m1{fill:${GRAIN_COLOURS.whole.colour}}
.m2{fill:none;stroke:${GRAIN_COLOURS.whole.colour};stroke-width:0.9}
.m4{fill:none;stroke:${GRAIN_COLOURS.part.colour};stroke-width:0.9}
.noimg{fill:#f4f4f4}
.bar{fill:#446}
.axis{stroke:#333;stroke-width:1}
.tick{font-size:8px;fill:#333}
.lab{font-size:9px;fill:#333}
ul{margin:1mm 0;padding-left:5mm}
.warn li{color:#8a4b00}
.caution{border:1px solid #c00;padding:2mm 3mm;margin-top:3mm;font-size:9pt}
.small{font-size:8pt;color:#444}
@page{size:A4;margin:10mm}
@media print{body{margin:0;max-width:none;font-size:8.5pt}h1{font-size:13pt}.headline{font-size:11pt}h2{font-size:10pt;margin-top:2.5mm;break-after:avoid}table{font-size:8pt}th,td{padding:0.6mm 1.2mm}.small{font-size:7pt}.caution{font-size:8pt;margin-top:2mm}table,.row,.caution{break-inside:avoid}}
`;

/**
 * A one-page HTML grain size report: the image with the test figures and counted grains, the calibration,
 * each method with its counts, G (to 0.1) with its 95 % interval and relative accuracy, the ISO 643 index,
 * the per-grain G histogram, warnings, and the cautions (calibrate with a stage micrometer; an aid, not a
 * certified rating; follow ASTM E112/E1382 and local procedures).
 *
 * @param input image name, the grain size result, pixel size (µm/px), image size (px), optional PNG data URL
 * @returns a complete HTML document with inline CSS and SVG and no network references
 */
export function grainReportHtml(input: GrainReportInput): string {
  const { name, result: r, umPerPx, width, height } = input;
  const f = r.field;
  const fw = f.x1 - f.x0;
  const fh = f.y1 - f.y0;
  const rows: string[] = [];
  const p = r.planimetric;
  if (p) {
    const c = p.count;
    rows.push(
      `<tr><td>${esc(p.method)}</td><td>${c.inside} inside, ${c.cut} cut${c.figure.shape === 'rectangle' ? `, ${c.corner} at corners` : ''}; N = ${num(c.count, 6)}<br><span class="small">${esc(c.rule)}</span></td><td>N<sub>A</sub> = ${num(p.NA_per_mm2)} mm⁻²</td><td><b>${gStr(p.G)}</b></td><td>${interval(p.ci95)}</td><td>${num(p.precision.relativeAccuracyPct, 3)} % (n = ${p.precision.n})</td><td>${gStr(p.iso643)}</td></tr>`,
    );
  }
  const i = r.intercept;
  if (i) {
    rows.push(
      `<tr><td>${esc(i.method)}</td><td>P = ${num(i.P, 6)} on ${num(i.lengthMm)} mm; N = ${i.N}</td><td>ℓ̄ = ${num(i.meanIntercept_um)} µm; N<sub>L</sub> = ${num(i.NL_per_mm)} mm⁻¹${i.anisotropy ? `<br>ℓ̄(0°)/ℓ̄(90°) = ${num(i.anisotropy.ratio, 3)}` : ''}</td><td><b>${gStr(i.G)}</b></td><td>${interval(i.ci95)}</td><td>${num(i.precision.relativeAccuracyPct, 3)} % (n = ${i.precision.n})</td><td>${gStr(i.iso643)}</td></tr>`,
    );
  }
  const a = r.meanArea;
  if (a) {
    rows.push(
      `<tr><td>${esc(a.method)}</td><td>${a.grains} grains wholly inside the field</td><td>Ā = ${num(a.meanAreaWeighted_um2)} µm² (unweighted ${num(a.meanArea_um2)} µm²)</td><td><b>${gStr(a.G)}</b></td><td>–</td><td>–</td><td>${gStr(a.iso643)}</td></tr>`,
    );
  }
  const headline = r.G !== null ? `G ${formatG(r.G)}${r.ci95 ? ` (95 % interval ${interval(r.ci95)})` : ''} — ${esc(r.method ?? '')}; ISO 643 index ${gStr(r.iso643)}` : 'No grain size rating could be made (see the warnings).';
  const warn = r.warnings.length > 0 ? `<h2>Warnings</h2><ul class="warn">${r.warnings.map((w) => `<li>${esc(w)}</li>`).join('')}</ul>` : '';
  const dup = a ? `<p class="small">${esc(a.duplexNote)} Per-grain G: mean ${num(a.gMean, 3)}, standard deviation ${num(a.gSd, 3)}.</p>` : '';
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>Grain size report: ${esc(name)}</title><style>${CSS}</style></head>
<body>
<h1>Grain size report: ${esc(name)}</h1>
<p class="headline">${headline}</p>
<div class="row">
${imageSvg(input, 300, 220)}
<div>
<h2>Calibration and field</h2>
<table>
<tr><th>Pixel size</th><td>${num(umPerPx, 6)} µm/px</td></tr>
<tr><th>Image</th><td>${width} × ${height} px</td></tr>
<tr><th>Field</th><td>${fw} × ${fh} px = ${num((fw * umPerPx) / 1000)} × ${num((fh * umPerPx) / 1000)} mm (${num(r.fieldAreaMm2)} mm²)</td></tr>
</table>
<p class="small">Marks: filled dot = grain counted whole, ring = half, orange ring = quarter (rectangle corner).</p>
${legendFigure([GRAIN_COLOURS.figure, GRAIN_COLOURS.lines, GRAIN_COLOURS.whole, GRAIN_COLOURS.part, LAYER_COLOURS.field], 10)}
</div>
</div>
<h2>Results (ASTM E112 / E1382)</h2>
<table>
<tr><th>Method</th><th>Counts</th><th>Measure</th><th>G</th><th>95 % interval of G</th><th>Relative accuracy</th><th>ISO 643</th></tr>
${rows.join('\n')}
</table>
<div class="row">
<div><h2>Distribution of G per grain</h2>${a ? histogramSvg(a.histogram) : '<p>No grains wholly inside the field.</p>'}${dup}</div>
<div>${warn}<h2>Notes</h2><ul class="small">${r.notes.map((n) => `<li>${esc(n)}</li>`).join('')}</ul></div>
</div>
<div class="caution"><b>Cautions.</b><ul>${r.cautions.map((c) => `<li>${esc(c)}</li>`).join('')}</ul></div>
</body></html>
`;
}
