/**
 * Cell outlines traced many at a time in a shared atlas must equal each cell traced on its own, and a
 * hand-drawn rectangle's outline runs through its corner pixels' centres.
 */
import { describe, expect, it } from 'vitest';
import { cellOutlines } from '../../../src/core/cv/contours';
import { loadCv } from '../../../src/core/cv/index';
import { analyze } from '../../../src/core/analyze';
import { synthesize } from '../../../src/core/synth/index';
import type { LabelImage } from '../../../src/core/types';

const polygon = (p: { offsets: Int32Array; coords: Float64Array }, i: number) => Array.from(p.coords.subarray(2 * p.offsets[i]!, 2 * p.offsets[i + 1]!));

describe('cell outlines', () => {
  it('a rectangle: four vertices at the centres of its corner pixels (Suzuki & Abe border following; derived)', async () => {
    const { cv } = await loadCv();
    const w = 20;
    const labels = new Int32Array(w * w);
    for (let y = 4; y < 9; y++) for (let x = 3; x < 15; x++) labels[y * w + x] = 1;
    const p = cellOutlines(cv, { width: w, height: w, labels, count: 1 });
    const pts = polygon(p, 0);
    const xs = pts.filter((_, k) => k % 2 === 0);
    const ys = pts.filter((_, k) => k % 2 === 1);
    expect(pts.length).toBe(8);
    expect([Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)]).toEqual([3.5, 14.5, 4.5, 8.5]);
  });

  it('2 000 cells packed into several atlas batches give the same outlines as cells traced alone', async () => {
    const { cv } = await loadCv();
    const r = synthesize({ pattern: 'walls', cells: 2000, width: 2000, height: 2000, order: 'random', seed: 31 });
    const a = await analyze({ kind: 'image', image: r.image }, { reference: { replicates: 0 } });
    const lab = a.labels!;
    const all = cellOutlines(cv, lab);
    // Bounding boxes (with margins) cover far more than one 2048² atlas, so several batches were used.
    for (const cell of [1, 2, 137, 999, 1500, lab.count - 1, lab.count]) {
      let x0 = lab.width;
      let y0 = lab.height;
      let x1 = -1;
      let y1 = -1;
      for (let i = 0; i < lab.labels.length; i++) {
        if (lab.labels[i] !== cell) continue;
        const x = i % lab.width;
        const y = (i - x) / lab.width;
        x0 = Math.min(x0, x);
        y0 = Math.min(y0, y);
        x1 = Math.max(x1, x);
        y1 = Math.max(y1, y);
      }
      const cw = x1 - x0 + 1;
      const ch = y1 - y0 + 1;
      const alone: LabelImage = { width: cw, height: ch, labels: new Int32Array(cw * ch), count: 1 };
      for (let y = 0; y < ch; y++) for (let x = 0; x < cw; x++) if (lab.labels[(y + y0) * lab.width + x + x0] === cell) alone.labels[y * cw + x] = 1;
      const one = cellOutlines(cv, alone, x0, y0);
      expect(polygon(all, cell - 1)).toEqual(polygon(one, 0));
    }
  });
});
