/**
 * The priority-flood watershed against a plain statement of its rule: repeatedly take, among the pixels
 * waiting in the queue, the one of lowest level that waited longest (a FIFO per level, a pushed pixel
 * waiting at max(its level, the level being flooded)); it gives each free 4-neighbour, left, right, up,
 * down in turn, its label. (Meyer 1991; Beucher & Meyer 1993; the rule as the module documents it, derived.)
 * The reference below keeps one sorted list and is slow on purpose; the module's bucket queue must give
 * the very same labels, with and without a mask and a level table.
 */
import { describe, expect, it } from 'vitest';
import { floodFromMarkers } from '../../../src/core/segment/flood';
import { mulberry32 } from '../../../src/core/random';

function reference(labels: Int32Array, relief: Uint8Array, w: number, h: number, allowed?: Uint8Array, levels?: Uint8Array): void {
  const lv = (p: number) => (levels ? levels[relief[p]!]! : relief[p]!);
  const free = new Uint8Array(w * h);
  for (let p = 0; p < w * h; p++) free[p] = labels[p] === 0 && (!allowed || allowed[p] !== 0) ? 1 : 0;
  const queue: { p: number; level: number; order: number }[] = [];
  let order = 0;
  for (let p = 0; p < w * h; p++) {
    if (labels[p]! <= 0) continue;
    const x = p % w;
    const y = (p / w) | 0;
    if ((x > 0 && labels[p - 1] === 0) || (x < w - 1 && labels[p + 1] === 0) || (y > 0 && labels[p - w] === 0) || (y < h - 1 && labels[p + w] === 0)) {
      queue.push({ p, level: lv(p), order: order++ });
    }
  }
  while (queue.length) {
    let best = 0;
    for (let k = 1; k < queue.length; k++) {
      const a = queue[k]!;
      const b = queue[best]!;
      if (a.level < b.level || (a.level === b.level && a.order < b.order)) best = k;
    }
    const { p, level } = queue.splice(best, 1)[0]!;
    const x = p % w;
    for (const q of [x > 0 ? p - 1 : -1, x < w - 1 ? p + 1 : -1, p >= w ? p - w : -1, p < w * (h - 1) ? p + w : -1]) {
      if (q < 0 || !free[q]) continue;
      free[q] = 0;
      labels[q] = labels[p]!;
      queue.push({ p: q, level: Math.max(level, lv(q)), order: order++ });
    }
  }
}

describe('floodFromMarkers', () => {
  for (let trial = 0; trial < 12; trial++) {
    const withMask = trial % 3 === 1;
    const withLevels = trial % 3 === 2;
    it(`random relief and markers, trial ${trial}${withMask ? ', with a mask' : ''}${withLevels ? ', with an inverting level table' : ''}: same labels as the plain rule`, () => {
      const rnd = mulberry32(100 + trial);
      const w = 17 + trial;
      const h = 13 + (trial % 5);
      // Few grey levels, so that plateaus and ties are common.
      const relief = Uint8Array.from({ length: w * h }, () => Math.floor(rnd() * 6) * 40);
      const labels = new Int32Array(w * h);
      for (let m = 1; m <= 6; m++) labels[Math.floor(rnd() * w * h)] = m;
      const allowed = withMask ? Uint8Array.from({ length: w * h }, () => (rnd() < 0.8 ? 1 : 0)) : undefined;
      const levels = withLevels ? Uint8Array.from({ length: 256 }, (_, v) => 255 - v) : undefined;
      const expected = labels.slice();
      reference(expected, relief, w, h, allowed, levels);
      floodFromMarkers(labels, relief, w, h, { allowed, levels });
      expect(Array.from(labels)).toEqual(Array.from(expected));
      if (!withMask) expect(labels.every((l) => l > 0)).toBe(true);
    });
  }
});
