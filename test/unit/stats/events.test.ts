import { describe, it, expect } from 'vitest';
import { assignEvents, assignEventsDetailed, eventsDensity, eventsDispersion, parseEventsCsv } from '../../../src/core/stats/events';
import { tessellate } from '../../../src/core/tessellate';
import { seedPoints } from '../../../src/core/synth/seeds';
import { mulberry32 } from '../../../src/core/random';
import { CsvError, TooFewCellsError } from '../../../src/core/errors';
import type { LabelImage } from '../../../src/core/types';

describe('assigning events to cells', () => {
  // Three seeds; hand-computed nearest seeds for each event below.
  const t = tessellate(Float64Array.from([2, 5, 10, 4, 18, 6]), { x0: 0, y0: 0, x1: 20, y1: 10 });
  it('without labels: the Voronoi cell of the nearest centroid; outside the field: none', () => {
    const a = assignEventsDetailed(Float64Array.from([1, 1, 7, 5, 9.9, 9, 19, 1, 25, 5]), null, t);
    expect(Array.from(a.cell)).toEqual([0, 1, 1, 2, -1]);
    expect(Array.from(a.counts)).toEqual([1, 2, 1]);
    expect(a.outside).toBe(1);
  });
  it('with labels: the labelled cell; on a wall pixel, the nearest centroid', () => {
    const W = 20, H = 10;
    const labels = new Int32Array(W * H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) labels[y * W + x] = x < 8 ? 1 : x === 8 ? 0 : x < 15 ? 2 : 3;
    const img: LabelImage = { width: W, height: H, labels, count: 3 };
    // (6.5, 5) lies in label 1 although nearer to centroid 2; (8.5, 5) is on the wall, nearest centroid 2.
    const a = assignEventsDetailed(Float64Array.from([6.5, 5, 8.5, 5, 16, 2]), img, t);
    expect(Array.from(a.cell)).toEqual([0, 1, 2]);
    expect(a.nearest).toBe(1);
    expect(Array.from(assignEvents(Float64Array.from([6.5, 5]), img, t))).toEqual([1, 0, 0]);
  });
  it('per-cell density is count / area', () => {
    const d = eventsDensity(Int32Array.from([2, 0]), Float64Array.from([4, 5]));
    expect(Array.from(d)).toEqual([0.5, 0]);
  });
});

describe('dispersion of events over cells (index of dispersion, chi-square; Cochran 1954, pub, memory)', () => {
  const W = 400, H = 400;
  const t = tessellate(seedPoints(300, W, H, 'random', 1), { x0: 0, y0: 0, x1: W, y1: H });
  it('uniform random events: the test rejects at 0.05 in about 5 % of sets (at most 5 of 40 here)', () => {
    let rejected = 0;
    for (let s = 0; s < 40; s++) {
      const rng = mulberry32(100 + s);
      const ev = new Float64Array(2 * 3000);
      for (let i = 0; i < 3000; i++) { ev[2 * i] = rng() * W; ev[2 * i + 1] = rng() * H; }
      const d = eventsDispersion(assignEvents(ev, null, t), t.area);
      expect(d.events).toBe(3000);
      if (d.p < 0.05) rejected++;
    }
    expect(rejected).toBeLessThanOrEqual(5);
  });
  it('events clumped into a few cells: over-dispersed', () => {
    const counts = new Int32Array(300);
    for (let i = 0; i < 10; i++) counts[i * 7] = 300;
    const d = eventsDispersion(counts, t.area);
    expect(d.index).toBeGreaterThan(5);
    expect(d.pOver).toBeLessThan(1e-6);
  });
  it('events in exact proportion to area: under-dispersed', () => {
    const counts = Int32Array.from(t.area, (a) => Math.round(a / 10));
    const d = eventsDispersion(counts, t.area);
    expect(d.index).toBeLessThan(0.2);
    expect(d.pUnder).toBeLessThan(1e-6);
  });
  it('bad input: fewer than 2 cells; no events at all', () => {
    expect(() => eventsDispersion(Int32Array.from([3]), Float64Array.from([1]))).toThrow(TooFewCellsError);
    expect(Number.isNaN(eventsDispersion(new Int32Array(5), Float64Array.from([1, 1, 1, 1, 1])).statistic)).toBe(true);
  });
  it('an events CSV with a bad line names the line', () => {
    expect(Array.from(parseEventsCsv('x,y\n1,2\n3,4\n'))).toEqual([1, 2, 3, 4]);
    expect(() => parseEventsCsv('x,y\n1,2\n3,abc\n', 'spots.csv')).toThrow(CsvError);
    expect(() => parseEventsCsv('x,y\n1,2\n3,abc\n', 'spots.csv')).toThrow(/spots\.csv: line 3/);
  });
});

describe('analyseEvents', () => {
  it('counts, density and test together; events off the field are reported, not lost silently', async () => {
    const { analyseEvents } = await import('../../../src/core/stats/events');
    const t = tessellate(seedPoints(50, 100, 100, 'random', 3), { x0: 0, y0: 0, x1: 100, y1: 100 });
    const rng = mulberry32(9);
    const ev: number[] = [];
    for (let i = 0; i < 400; i++) ev.push(rng() * 100, rng() * 100);
    ev.push(150, 50);
    const r = analyseEvents(Float64Array.from(ev), null, t, t.area);
    expect(r.counts.reduce((a, b) => a + b, 0)).toBe(400);
    expect(r.outside).toBe(1);
    expect(r.warnings.join(' ')).toMatch(/1 of 401 events lie outside the field/);
    expect(r.dispersion!.events).toBe(400);
    expect(r.density[0]).toBeCloseTo(r.counts[0]! / t.area[0]!, 12);
  });
});
