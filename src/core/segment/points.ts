/**
 * Points pattern: centroids (or events) read from a CSV of x, y. No image needed.
 */
import Papa from 'papaparse';
import { CsvError } from '../errors';
import { parseDecimal } from '../numbers';

/**
 * The largest coordinate of a point, in px or µm: a billion, beyond the side of any image or mosaic. A
 * coordinate past it is a slip or a damaged file, and past about 1e15 doubles cannot tell neighbouring
 * points apart any more.
 */
export const MAX_COORDINATE = 1e9;

export interface PointsCsv {
  /** Interleaved x, y, in the units of the file (each coincident point once, unless kept). */
  points: Float64Array;
  count: number;
  /** Names of the x and y columns used ('' when the file has no header). */
  xColumn: string;
  yColumn: string;
  /** Lines dropped because they repeat an earlier line's x and y exactly (0 when duplicates are kept). */
  duplicates: number;
  /** What a user should be told about the file (the duplicates merged), one sentence each; empty when nothing. */
  warnings: string[];
}

/** The points with coincident ones merged, and how many were dropped. */
export interface MergedPoints {
  /** Interleaved x, y: each distinct point once, in order of first appearance. */
  points: Float64Array;
  /** Points dropped (repeats of an earlier point). */
  duplicates: number;
  /** 0-based index of the first repeat, or -1. */
  firstDuplicate: number;
}

/**
 * Merges coincident points (exactly equal x and y) into their first occurrence. Coincident seeds have no
 * tessellation (two seeds, one cell); a point set measured twice at a spot is one point.
 *
 * @param points interleaved x, y
 */
export function mergeCoincidentPoints(points: Float64Array): MergedPoints {
  const n = points.length >> 1;
  const seen = new Map<number, number | number[]>();
  const keep = new Uint8Array(n);
  let duplicates = 0;
  let firstDuplicate = -1;
  for (let i = 0; i < n; i++) {
    const x = points[2 * i]! + 0; // −0 and 0 are the same point
    const y = points[2 * i + 1]! + 0;
    // Buckets by x (most sets have few repeated x), then the y values seen with it.
    const ys = seen.get(x);
    let dup = false;
    if (ys === undefined) seen.set(x, y);
    else if (typeof ys === 'number') {
      if (ys === y) dup = true;
      else seen.set(x, [ys, y]);
    } else if (ys.includes(y)) dup = true;
    else ys.push(y);
    if (dup) {
      duplicates++;
      if (firstDuplicate < 0) firstDuplicate = i;
    } else keep[i] = 1;
  }
  if (duplicates === 0) return { points, duplicates, firstDuplicate };
  const out = new Float64Array(2 * (n - duplicates));
  for (let i = 0, k = 0; i < n; i++) if (keep[i]) (out[k++] = points[2 * i]!), (out[k++] = points[2 * i + 1]!);
  return { points: out, duplicates, firstDuplicate };
}

const X_NAMES = ['x', 'x_px', 'x_um', 'cx', 'centroid_x', 'xpos', 'x (px)', 'x (um)', 'x (µm)'];
const Y_NAMES = ['y', 'y_px', 'y_um', 'cy', 'centroid_y', 'ypos', 'y (px)', 'y (um)', 'y (µm)'];

/**
 * Parses a CSV of points. With a header, the x and y columns are found by name (x, x_px, x_um, ...);
 * without one, the first two columns are x and y. Blank lines are skipped. Every other line must hold
 * two numbers in decimal notation within ±{@link MAX_COORDINATE}, or a CsvError names the line. Lines that
 * repeat an earlier line's x and y are merged into it, with a warning that says how many (coincident points
 * cannot be tessellated), unless `duplicates: 'keep'` (events, where two at one spot are two events).
 *
 * @param text the file's text
 * @param opts.name file name for messages
 * @param opts.duplicates 'merge' (default) or 'keep'
 */
export function parsePointsCsv(text: string, opts: { name?: string; duplicates?: 'merge' | 'keep' } = {}): PointsCsv {
  const where = opts.name ? `${opts.name}: ` : '';
  if (text.trim().length === 0) throw new CsvError(`${where}the points file is empty; it needs one x,y pair per line.`);
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy', delimitersToGuess: [',', '\t', ';', ' '] });
  const rows = parsed.data;
  if (rows.length === 0) throw new CsvError(`${where}the points file has no rows; it needs one x,y pair per line.`);
  const first = rows[0]!.map((c) => c.trim());
  const headerLike = first.some((c) => c !== '' && !Number.isFinite(Number(c)));
  let xi = 0;
  let yi = 1;
  let start = 0;
  let xColumn = '';
  let yColumn = '';
  if (headerLike) {
    const lower = first.map((c) => c.toLowerCase());
    xi = lower.findIndex((c) => X_NAMES.includes(c));
    yi = lower.findIndex((c) => Y_NAMES.includes(c));
    if (xi < 0 || yi < 0) {
      throw new CsvError(`${where}line 1 is a header without x and y columns (found: ${shown(first.join(', '))}); name them x and y, or remove the header.`);
    }
    xColumn = first[xi]!;
    yColumn = first[yi]!;
    start = 1;
  }
  const n = rows.length - start;
  if (n === 0) throw new CsvError(`${where}the points file has a header but no points.`);
  const points = new Float64Array(2 * n);
  // Papa reports rows without their original line numbers when blank lines are skipped; recover them.
  const lineOf = lineNumbers(text);
  for (let r = start; r < rows.length; r++) {
    const row = rows[r]!;
    const line = lineOf[r] ?? r + 1;
    const xs = row[xi]?.trim() ?? '';
    const ys = row[yi]?.trim() ?? '';
    if (xs === '' || ys === '') throw new CsvError(`${where}line ${line} is missing ${xs === '' ? 'x' : 'y'}; every line needs x and y.`);
    const x = parseDecimal(xs);
    const y = parseDecimal(ys);
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      throw new CsvError(`${where}line ${line} has a value that is not a number (${JSON.stringify(shown(Number.isFinite(x) ? ys : xs))}) in decimal notation; fix or remove that line.`);
    }
    if (Math.abs(x) > MAX_COORDINATE || Math.abs(y) > MAX_COORDINATE) {
      throw new CsvError(`${where}line ${line} has a coordinate (${Math.abs(x) > MAX_COORDINATE ? xs : ys}) beyond ±${MAX_COORDINATE.toExponential()}, far outside any image; check the units of the file or fix that line.`);
    }
    points[2 * (r - start)] = x;
    points[2 * (r - start) + 1] = y;
  }
  if (opts.duplicates === 'keep') return { points, count: n, xColumn, yColumn, duplicates: 0, warnings: [] };
  const merged = mergeCoincidentPoints(points);
  const warnings: string[] = [];
  if (merged.duplicates > 0) {
    const d = merged.duplicates;
    const line = lineOf[start + merged.firstDuplicate] ?? start + merged.firstDuplicate + 1;
    warnings.push(
      `${where}${d} duplicated point${d === 1 ? '' : 's'} (the same x and y as an earlier line, first at line ${line}) merged; ${n - d} distinct points of ${n} are analysed.`,
    );
  }
  return { points: merged.points, count: n - merged.duplicates, xColumn, yColumn, duplicates: merged.duplicates, warnings };
}

/** Text from a file, fit for a one-line message: control characters as spaces, at most 80 characters. */
function shown(text: string): string {
  // eslint-disable-next-line no-control-regex
  const flat = text.replace(/[\u0000-\u001f\u007f]+/g, ' ');
  return flat.length > 80 ? `${flat.slice(0, 77)}...` : flat;
}

/** 1-based line numbers of the non-blank lines of a text. */
function lineNumbers(text: string): number[] {
  const out: number[] = [];
  const lines = text.split(/\r\n|\n|\r/);
  for (let i = 0; i < lines.length; i++) if (lines[i]!.trim() !== '') out.push(i + 1);
  return out;
}
