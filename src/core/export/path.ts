/**
 * Overlay drawing into anything with moveTo / lineTo (a canvas 2D context, an SVG path builder, a test
 * recorder), so one renderer serves the Bench, the SVG export and the tests.
 */
import type { Tessellation } from '../tessellate/types';

export interface PathSink {
  moveTo(x: number, y: number): void;
  lineTo(x: number, y: number): void;
  closePath(): void;
}

/** Closed polygons in CSR form (offsets per polygon, interleaved coordinates). */
export function drawPolygons(sink: PathSink, offsets: Int32Array, coords: Float64Array, only?: (i: number) => boolean): void {
  for (let i = 0; i + 1 < offsets.length; i++) {
    if (only && !only(i)) continue;
    const a = offsets[i]!;
    const b = offsets[i + 1]!;
    if (b - a < 2) continue;
    sink.moveTo(coords[2 * a]!, coords[2 * a + 1]!);
    for (let k = a + 1; k < b; k++) sink.lineTo(coords[2 * k]!, coords[2 * k + 1]!);
    sink.closePath();
  }
}

/** Voronoi cells of the tessellation (clipped polygons). */
export function drawVoronoi(sink: PathSink, t: Tessellation): void {
  drawPolygons(sink, t.polygonOffsets, t.polygonCoords);
}

/** Delaunay edges, each drawn once. */
export function drawDelaunay(sink: PathSink, t: Tessellation): void {
  const tri = t.triangles;
  const p = t.points;
  const n = p.length / 2;
  const done = new Set<number>();
  for (let i = 0; i < tri.length; i += 3) {
    for (let k = 0; k < 3; k++) {
      const a = tri[i + k]!;
      const b = tri[i + ((k + 1) % 3)]!;
      const key = a < b ? a * n + b : b * n + a;
      if (done.has(key)) continue;
      done.add(key);
      sink.moveTo(p[2 * a]!, p[2 * a + 1]!);
      sink.lineTo(p[2 * b]!, p[2 * b + 1]!);
    }
  }
}

/** Small crosses at the centroids, half-size r. */
export function drawCentroids(sink: PathSink, points: Float64Array, r = 2): void {
  for (let i = 0; i < points.length; i += 2) {
    const x = points[i]!;
    const y = points[i + 1]!;
    sink.moveTo(x - r, y);
    sink.lineTo(x + r, y);
    sink.moveTo(x, y - r);
    sink.lineTo(x, y + r);
  }
}

/**
 * Builds an SVG path `d` string, coordinates rounded to 0.01 px. The commands are joined a few thousand
 * at a time, so that a million cells leave thousands of strings alive rather than millions.
 */
export class SvgPath implements PathSink {
  private parts: string[] = [];
  private chunk: string[] = [];
  private add(command: string): void {
    if (this.chunk.push(command) >= 4096) {
      this.parts.push(this.chunk.join(''));
      this.chunk = [];
    }
  }
  moveTo(x: number, y: number): void {
    this.add(`M${r2(x)} ${r2(y)}`);
  }
  lineTo(x: number, y: number): void {
    this.add(`L${r2(x)} ${r2(y)}`);
  }
  closePath(): void {
    this.add('Z');
  }
  /** The path data in the batches joined so far, then the rest. */
  pieces(): string[] {
    return [...this.parts, this.chunk.join('')];
  }
  toString(): string {
    return this.pieces().join('');
  }
}

/**
 * String(Math.round(v * 100) / 100), written from the whole number of hundredths: the decimal with at most
 * two fraction digits is the shortest that reads back as that double (the quotient of two exact integers
 * is correctly rounded, and any other decimal of as few digits lies at least 0.01 away), which is what
 * String gives (ECMA-262 Number::toString), so the text is the same, several times faster.
 * Values of 2^53 hundredths (9·10^13 px) and more, or not finite, go through String.
 */
export function r2(v: number): string {
  const k = Math.round(v * 100);
  if (!Number.isSafeInteger(k)) return String(k / 100);
  if (k === 0) return '0';
  const a = k < 0 ? -k : k;
  const whole = Math.floor(a / 100);
  const frac = a - whole * 100;
  const sign = k < 0 ? '-' : '';
  if (frac === 0) return sign + whole;
  if (frac % 10 === 0) return `${sign}${whole}.${frac / 10}`;
  return `${sign}${whole}.${frac < 10 ? '0' : ''}${frac}`;
}
