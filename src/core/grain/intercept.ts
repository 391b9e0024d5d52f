/** The intercept (Heyn) count: boundary intersections along test lines and circles on a label image. */
import { SettingsError } from '../errors';
import type { LabelImage, Rect } from '../types';
import { checkLabelsAndField } from './check';
import type { Crossing, InterceptCount, PatternCount, TestPattern } from './types';

/** Spacing of the samples taken along a test line (px). */
const STEP_PX = 0.25;

/**
 * Test lines and circles laid over the field.
 *
 * For each angle θ (degrees, counter-clockwise from the +x axis as seen on screen, so the direction is
 * (cos θ, −sin θ) in image coordinates with y down), `linesPerAngle` parallel lines spaced evenly across the
 * field's width in the normal direction, at offsets (i + ½)/k of it, each clipped to the field. Then
 * `circles` concentric circles about the field's centre with radii R·i/k, i = 1..k, R = min(w, h)/2 − ½.
 *
 * @param field the field (px)
 * @param angles line angles (degrees)
 * @param linesPerAngle parallel lines per angle (≥ 1)
 * @param circles number of concentric circles (≥ 0)
 */
export function testPatterns(field: Rect, angles: readonly number[], linesPerAngle: number, circles: number): TestPattern[] {
  const out: TestPattern[] = [];
  const w = field.x1 - field.x0;
  const h = field.y1 - field.y0;
  const cx = (field.x0 + field.x1) / 2;
  const cy = (field.y0 + field.y1) / 2;
  const inset = 1e-6;
  const bx0 = field.x0 + inset;
  const bx1 = field.x1 - inset;
  const by0 = field.y0 + inset;
  const by1 = field.y1 - inset;
  for (const angleDeg of angles) {
    const th = (angleDeg * Math.PI) / 180;
    const dx = Math.cos(th);
    const dy = -Math.sin(th);
    const nx = -dy;
    const ny = dx;
    const half = (Math.abs(w * nx) + Math.abs(h * ny)) / 2;
    for (let i = 0; i < linesPerAngle; i++) {
      const o = -half + ((i + 0.5) * 2 * half) / linesPerAngle;
      const px = cx + o * nx;
      const py = cy + o * ny;
      // Liang–Barsky clipping of p + t·d to the field.
      let t0 = -Infinity;
      let t1 = Infinity;
      const clip = (p: number, d: number, lo: number, hi: number): boolean => {
        if (Math.abs(d) < 1e-12) return p >= lo && p <= hi;
        let a = (lo - p) / d;
        let b = (hi - p) / d;
        if (a > b) [a, b] = [b, a];
        t0 = Math.max(t0, a);
        t1 = Math.min(t1, b);
        return t0 <= t1;
      };
      if (!clip(px, dx, bx0, bx1) || !clip(py, dy, by0, by1)) continue;
      if (t1 - t0 < 1) continue;
      out.push({ kind: 'line', angleDeg, x0: px + t0 * dx, y0: py + t0 * dy, x1: px + t1 * dx, y1: py + t1 * dy });
    }
  }
  const R = Math.min(w, h) / 2 - 0.5;
  for (let i = 1; i <= circles; i++) {
    const r = (R * i) / circles;
    if (r >= 1) out.push({ kind: 'circle', cx, cy, r });
  }
  return out;
}

/** Length of a test pattern (px). */
export function patternLength(p: TestPattern): number {
  return p.kind === 'line' ? Math.hypot(p.x1 - p.x0, p.y1 - p.y0) : 2 * Math.PI * p.r;
}

function checkPatternInField(p: TestPattern, field: Rect): void {
  const e = 1e-6;
  const inF = (x: number, y: number) => x >= field.x0 - e && x <= field.x1 + e && y >= field.y0 - e && y <= field.y1 + e;
  if (p.kind === 'line') {
    if (![p.x0, p.y0, p.x1, p.y1].every(Number.isFinite) || !inF(p.x0, p.y0) || !inF(p.x1, p.y1)) {
      throw new SettingsError('A test line reaches outside the field; keep test lines inside the field (or draw a larger field).');
    }
  } else if (!(p.r > 0) || !inF(p.cx - p.r, p.cy - p.r) || !inF(p.cx + p.r, p.cy + p.r)) {
    throw new SettingsError(`A test circle of radius ${p.r.toFixed(1)} px is larger than the field or reaches outside it; use a smaller circle.`);
  }
}

/** Position (px) of sample i of ns along a pattern: at t = (i + ½)/ns of its length. */
function samplePos(p: TestPattern, i: number, ns: number): [number, number] {
  const t = (i + 0.5) / ns;
  if (p.kind === 'line') return [p.x0 + t * (p.x1 - p.x0), p.y0 + t * (p.y1 - p.y0)];
  const a = 2 * Math.PI * t;
  return [p.cx + p.r * Math.cos(a), p.cy + p.r * Math.sin(a)];
}

interface Run {
  label: number;
  start: number;
  end: number;
}

/**
 * The runs of equal labels along a pattern: samples at the positions of {@link samplePos}, each taking the
 * label of its nearest pixel (clamped to the field); run r covers samples [start, end).
 */
function sampleRuns(labels: LabelImage, field: Rect, p: TestPattern): { runs: Run[]; ns: number; stepPx: number } {
  const len = patternLength(p);
  const ns = Math.max(2, Math.ceil(len / STEP_PX));
  const w = labels.width;
  const L = labels.labels;
  const fx0 = field.x0;
  const fy0 = field.y0;
  const fx1 = field.x1 - 1;
  const fy1 = field.y1 - 1;
  const runs: Run[] = [];
  let cur = 0;
  let s = 0;
  // The same arithmetic as samplePos.
  const line = p.kind === 'line';
  const x0 = line ? p.x0 : p.cx;
  const y0 = line ? p.y0 : p.cy;
  const dx = line ? p.x1 - p.x0 : 0;
  const dy = line ? p.y1 - p.y0 : 0;
  const r = line ? 0 : p.r;
  const twoPi = 2 * Math.PI;
  for (let i = 0; i < ns; i++) {
    let fx: number;
    let fy: number;
    if (line) {
      const t = (i + 0.5) / ns;
      fx = x0 + t * dx;
      fy = y0 + t * dy;
    } else {
      const a = twoPi * ((i + 0.5) / ns);
      fx = x0 + r * Math.cos(a);
      fy = y0 + r * Math.sin(a);
    }
    const ix = Math.min(fx1, Math.max(fx0, Math.floor(fx)));
    const iy = Math.min(fy1, Math.max(fy0, Math.floor(fy)));
    const l = L[iy * w + ix]!;
    if (i === 0) cur = l;
    else if (l !== cur) {
      runs.push({ label: cur, start: s, end: i });
      cur = l;
      s = i;
    }
  }
  runs.push({ label: cur, start: s, end: ns });
  return { runs, ns, stepPx: len / ns };
}

/** Whether a grain other than the `known` ones lies in the pixels around (x, y) within `half` px (square). */
function thirdGrainNear(labels: LabelImage, field: Rect, x: number, y: number, half: number, known: readonly number[]): boolean {
  const w = labels.width;
  const xa = Math.max(field.x0, Math.floor(x - half));
  const xb = Math.min(field.x1 - 1, Math.floor(x + half));
  const ya = Math.max(field.y0, Math.floor(y - half));
  const yb = Math.min(field.y1 - 1, Math.floor(y + half));
  for (let yy = ya; yy <= yb; yy++) {
    for (let xx = xa; xx <= xb; xx++) {
      const l = labels.labels[yy * w + xx]!;
      if (l > 0 && !known.includes(l)) return true;
    }
  }
  return false;
}

/**
 * Counts boundary intersections on one test line or circle.
 *
 * The pattern is sampled every ¼ px; the labels along it form runs. Runs of wall (label 0) and runs shorter
 * than `tauPx` are not grain segments but parts of a boundary region between two grain segments. Between
 * consecutive grain segments A and B:
 * - A ≠ B: one intersection; 1.5 when a third grain lies in the boundary region or within ½ px (plus half
 *   the wall run) of the crossing point — the line passes through a triple point;
 * - A = B: a tangent hit (the line touches a boundary and returns to the same grain), counted 1.
 * Counting rules: intersections P with triple points 1.5 and tangent hits 1 (ASTM E112, intercept
 * procedure). Intercepts N are the grain segments, each end segment of a straight line counting ½ (ASTM
 * E112); this equals the number of boundary regions passed.
 */
function countOne(labels: LabelImage, field: Rect, p: TestPattern, tauPx: number): PatternCount {
  const { runs, ns, stepPx } = sampleRuns(labels, field, p);
  const closed = p.kind === 'circle';
  if (closed && runs.length > 1 && runs[0]!.label === runs[runs.length - 1]!.label) {
    const last = runs.pop()!;
    runs[0] = { label: last.label, start: last.start - ns, end: runs[0]!.end };
  }
  const isLong = (r: Run, i: number): boolean => {
    if (r.label <= 0) return false;
    if (!closed && (i === 0 || i === runs.length - 1)) return true;
    return (r.end - r.start) * stepPx >= tauPx;
  };
  const longIdx: number[] = [];
  runs.forEach((r, i) => {
    if (isLong(r, i)) longIdx.push(i);
  });
  const crossings: Crossing[] = [];
  const nPairs = closed ? (longIdx.length === 1 && runs.length === 1 ? 0 : longIdx.length) : longIdx.length - 1;
  const posAt = (k: number): [number, number] => {
    const n = ns;
    const i = Math.floor(k);
    const f = k - i;
    const i0 = ((i % n) + n) % n;
    const i1 = (i0 + 1) % n;
    const [x0, y0] = samplePos(p, i0, n);
    if (!closed && i1 === 0) return [x0, y0];
    const [x1, y1] = samplePos(p, i1, n);
    return [x0 + f * (x1 - x0), y0 + f * (y1 - y0)];
  };
  for (let k = 0; k < nPairs; k++) {
    const ia = longIdx[k]!;
    const ib = longIdx[(k + 1) % longIdx.length]!;
    const A = runs[ia]!;
    const B = runs[ib]!;
    // Samples of the boundary region between the two grain segments: from A's last to B's first.
    const from = A.end - 1;
    let to = B.start;
    if (to <= from) to += ns;
    const [x, y] = posAt((from + to) / 2);
    if (A.label === B.label) {
      crossings.push({ x, y, weight: 1, kind: 'tangent' });
      continue;
    }
    let third = false;
    let wallLen = 0;
    for (let j = (ia + 1) % runs.length; j !== ib; j = (j + 1) % runs.length) {
      const r = runs[j]!;
      if (r.label === 0) wallLen += (r.end - r.start) * stepPx;
      else if (r.label !== A.label && r.label !== B.label) third = true;
    }
    if (!third) {
      // A grain the line visits just before A or just after B is a resolved neighbour crossing, not a triple point.
      const before = closed || k > 0 ? runs[longIdx[(k - 1 + longIdx.length) % longIdx.length]!]!.label : -1;
      const after = closed || k + 2 < longIdx.length ? runs[longIdx[(k + 2) % longIdx.length]!]!.label : -1;
      third = thirdGrainNear(labels, field, x, y, 0.5 + wallLen / 2, [A.label, B.label, before, after]);
    }
    crossings.push(third ? { x, y, weight: 1.5, kind: 'triple' } : { x, y, weight: 1, kind: 'cross' });
  }
  let P = 0;
  for (const c of crossings) P += c.weight;
  return { pattern: p, lengthPx: patternLength(p), P, N: crossings.length, crossings };
}

/**
 * Counts grain-boundary intersections P and intercepts N along test lines and circles (the Heyn intercept
 * procedure of ASTM E112) on a label image. Boundaries are where the grain label changes along the line;
 * wall pixels (label 0) belong to the boundary between the grains on either side. See the rules above:
 * a crossing counts 1, a pass through a triple point 1.5, a tangent hit 1.
 *
 * N_L = P/L and ℓ̄ = L/P follow by dividing by the calibrated length.
 *
 * @param labels label image (0 wall, 1..count grains)
 * @param field analysed rectangle (whole px)
 * @param patterns test lines and circles (px), inside the field (e.g. from {@link testPatterns})
 * @param tauPx grain segments shorter than this (px) are treated as part of a boundary; default 2 (a digitised boundary is a staircase that a slanted line can cross several times within a pixel or two)
 * @returns per pattern P, N, length (px) and the crossing points with their weights; totals
 */
export function interceptCount(labels: LabelImage, field: Rect, patterns: readonly TestPattern[], tauPx = 2): InterceptCount {
  checkLabelsAndField(labels, field);
  if (!(tauPx >= 0)) throw new SettingsError(`The shortest grain segment must be 0 px or more; got ${tauPx}.`);
  for (const p of patterns) checkPatternInField(p, field);
  const lines = patterns.map((p) => countOne(labels, field, p, tauPx));
  let P = 0;
  let N = 0;
  let lengthPx = 0;
  for (const l of lines) {
    P += l.P;
    N += l.N;
    lengthPx += l.lengthPx;
  }
  return { lines, P, N, lengthPx };
}
