/**
 * Bodies that hold up, on hand-drawn images whose answer is known by construction: concavity depth of an
 * outline, cusps of a gap among discs, a convex body never cut, touching discs still split, the polarity of
 * dark touching bodies that form the largest connected region, a lighter band of background, and a dark halo
 * round a bright body.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { concavityDepth, holeCusps } from '../../../src/core/cv/concavity';
import { loadCv, type CV } from '../../../src/core/cv/index';
import { connectedComponents } from '../../../src/core/cv/kernels';
import { bodyPolarity, segmentBodies } from '../../../src/core/segment/bodies';
import { resolveSettings } from '../../../src/core/settings';
import type { GreyImage } from '../../../src/core/types';

let cv: CV;
beforeAll(async () => {
  ({ cv } = await loadCv());
});

/** A w x h image of level `bg` with discs [cx, cy, r, level] painted in order (pixel centres inside). */
function discs(w: number, h: number, bg: (x: number, y: number) => number, list: number[][]): GreyImage {
  const data = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let v = bg(x, y);
      for (const [cx, cy, r, level] of list) if (Math.hypot(x + 0.5 - cx!, y + 0.5 - cy!) <= r!) v = level!;
      data[y * w + x] = Math.max(0, Math.min(255, Math.round(v)));
    }
  }
  return { width: w, height: h, data, bitDepth: 8 };
}

const mask = (img: GreyImage, level: number): Uint8Array => Uint8Array.from(img.data, (v) => (v > level ? 1 : 0));
const bodies = (img: GreyImage, settings = {}) => segmentBodies(cv, img, resolveSettings({ pattern: 'bodies', ...settings }));
/** Centroids of the labels, sorted by x then y (rounded to 0.1 px). */
function centroids(r: ReturnType<typeof bodies>): number[][] {
  const { labels, count, width } = r.labels;
  const s = Array.from({ length: count + 1 }, () => [0, 0, 0]);
  for (let i = 0; i < labels.length; i++) {
    const c = s[labels[i]!]!;
    c[0]! += i % width;
    c[1]! += Math.floor(i / width);
    c[2]!++;
  }
  return s.slice(1).map(([x, y, n]) => [x! / n! + 0.5, y! / n! + 0.5, n!]);
}

describe('concavity of an outline', () => {
  it('the neck of two overlapping discs is as deep as R − √(R² − d²/4); a lone disc has no concavity deeper than a pixel (derived)', () => {
    const R = 20;
    const d = 30;
    const img = discs(120, 80, () => 0, [[40, 40, R, 255], [40 + d, 40, R, 255]]);
    const depth = concavityDepth(cv, mask(img, 128), 120, 80);
    const expected = R - Math.sqrt(R * R - (d * d) / 4); // 6.77 px
    let deepest = 0;
    for (const v of depth) deepest = Math.max(deepest, v);
    // Digitised outlines through pixel centres: within a pixel of the continuous figure.
    expect(Math.abs(deepest - expected)).toBeLessThan(1);
    const lone = concavityDepth(cv, mask(discs(80, 80, () => 0, [[40, 40, R, 255]]), 128), 80, 80);
    expect(Math.max(...lone)).toBeLessThan(1);
  });

  it('a gap among three touching discs has cusps at its three necks; a round hole has none (derived: corner angles)', () => {
    const w = 140;
    const r = 25;
    // Three discs of radius 25 whose centres form an equilateral triangle of side 2r: tangent pairwise.
    const c = [[70, 40], [70 - r, 40 + r * Math.sqrt(3)], [70 + r, 40 + r * Math.sqrt(3)]];
    const img = discs(w, w, () => 0, c.map(([x, y]) => [x!, y!, r + 0.6, 255]));
    const hole = Uint8Array.from(mask(img, 128), (v) => 1 - v);
    // Keep only the enclosed gap (not the outside).
    const cx = 70;
    const cy = 40 + (r * Math.sqrt(3)) / 1.5;
    for (let i = 0; i < hole.length; i++) if (Math.hypot((i % w) - cx, Math.floor(i / w) - cy) > 12) hole[i] = 0;
    const cusp = holeCusps(cv, hole, w, w, 100);
    // The necks: the discs (drawn 0.6 px larger, so that they overlap and enclose the gap) cross on the gap's
    // side at √(25.6² − 25²) = 5.5 px from the midpoint of their centres, towards the gap's centre; a
    // cusp narrower than a pixel ends short of that point, hence 3 px.
    for (const [a, b] of [[0, 1], [1, 2], [0, 2]] as const) {
      const mx = (c[a]![0]! + c[b]![0]!) / 2;
      const my = (c[a]![1]! + c[b]![1]!) / 2;
      const off = Math.sqrt((r + 0.6) ** 2 - r * r);
      const len = Math.hypot(cx - mx, cy - my);
      const nx = mx + ((cx - mx) / len) * off;
      const ny = my + ((cy - my) / len) * off;
      let near = Infinity;
      for (let i = 0; i < cusp.length; i++) if (cusp[i]) near = Math.min(near, Math.hypot((i % w) + 0.5 - nx, Math.floor(i / w) + 0.5 - ny));
      expect(near).toBeLessThan(3);
    }
    const round = Uint8Array.from(discs(60, 60, () => 0, [[30, 30, 8, 255]]).data, (v) => (v > 128 ? 1 : 0));
    expect(holeCusps(cv, round, 60, 60, 100).includes(1)).toBe(false);
  });
});

describe('splitting touching bodies', () => {
  it('a convex body with a dark bar of texture across it stays whole; two touching discs are still two', () => {
    // A disc of radius 45 with a dark bar (30 x 4 px) across its middle: the distance transform has a peak
    // above and one below the bar, with a dynamic far above the split floor, so a watershed cuts the disc in
    // two along the bar; the cut's ends are on the disc's convex rim, so it is refused.
    const w = 260;
    const h = 120;
    const img = discs(w, h, () => 30, [[60, 60, 45, 200]]);
    for (let y = 58; y < 62; y++) for (let x = 45; x < 75; x++) img.data[y * w + x] = 30;
    // Two discs of radius 30 whose centres are 50 px apart: a neck 2·√(30² − 25²) = 33 px wide, 13.4 px deep.
    for (let y = 0; y < h; y++) {
      for (let x = 130; x < w; x++) {
        if (Math.hypot(x + 0.5 - 165, y + 0.5 - 60) <= 30 || Math.hypot(x + 0.5 - 215, y + 0.5 - 60) <= 30) img.data[y * w + x] = 200;
      }
    }
    const r = bodies(img);
    const c = centroids(r);
    expect(r.labels.count).toBe(3);
    // The textured disc is one body, the bar a hole it alone surrounds, filled: its area is π·45² = 6362 px²
    // (digitised, within 1 %).
    const big = c.find(([x]) => x! < 120)!;
    expect(Math.abs(big[2]! - Math.PI * 45 * 45) / (Math.PI * 45 * 45)).toBeLessThan(0.01);
    expect(Math.abs(big[0]! - 60)).toBeLessThan(1);
    // The touching pair is cut at its neck, x = 190.
    const right = c.filter(([x]) => x! > 120).map(([x]) => x!).sort((a, b) => a - b);
    expect(right.length).toBe(2);
    expect(Math.abs(right[0]! - 165)).toBeLessThan(2);
    expect(Math.abs(right[1]! - 215)).toBeLessThan(2);
  });
});

describe('polarity', () => {
  it('dark touching bodies that form the largest connected region are still the bodies: the background holds the border', () => {
    // 24 dark discs (radius 19.6, centres 38 px apart in rows offset by half a step: each overlaps its six
    // neighbours by about a pixel) in the middle of a light field with a light margin all round. The cluster is
    // one connected region larger than the margin's; "the class with the largest connected region is the
    // background" would take the discs for the background.
    const list: number[][] = [];
    for (let row = 0; row < 4; row++) for (let col = 0; col < 6; col++) list.push([28 + col * 38 + (row % 2) * 19, 28 + row * 33, 19.6, 40]);
    const w = 265;
    const h = 155;
    const img = discs(w, h, () => 210, list);
    const bright = mask(img, 128);
    const biggest = (m: Uint8Array): number => Math.max(...connectedComponents(cv, m, w, h, 8).areas.subarray(1));
    expect(biggest(Uint8Array.from(bright, (v) => 1 - v))).toBeGreaterThan(biggest(bright));
    expect(bodyPolarity(cv, bright, w, h)).toEqual({ polarity: 'dark', cue: 'border' });
    const r = bodies(img);
    expect(r.polarity).toBe('dark');
    expect(r.labels.count).toBe(24);
  });

  it('a lighter band across the background makes no bodies, and the bodies on it are found whole', () => {
    // Background 40 with a band that adds up to 90 at the top edge and fades over 40 px; 4 x 6 discs of
    // level 170 above the local background (additive, like a backdrop lighter in one part).
    const list: number[][] = [];
    for (let row = 0; row < 4; row++) for (let col = 0; col < 6; col++) list.push([40 + col * 60, 30 + row * 62, 20, 0]);
    const band = (y: number): number => 40 + 90 * Math.exp(-y / 40);
    const w = 380;
    const h = 260;
    const img = discs(w, h, (_, y) => band(y), []);
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        for (const [cx, cy, rr] of list) if (Math.hypot(x + 0.5 - cx!, y + 0.5 - cy!) <= rr!) img.data[y * w + x] = Math.min(255, Math.round(band(y) + 130));
      }
    }
    const r = bodies(img);
    expect(r.labels.count).toBe(24);
    const c = centroids(r);
    for (const [cx, cy, rr] of list) {
      const near = c.find(([x, y]) => Math.hypot(x! - cx!, y! - cy!) < 2);
      expect(near, `disc at (${cx}, ${cy})`).toBeDefined();
      expect(Math.abs(near![2]! - Math.PI * rr! * rr!) / (Math.PI * rr! * rr!)).toBeLessThan(0.06);
    }
  });

  it('a bright body inside a dark halo is the body, not the halo', () => {
    // Grey background 120, a dark halo (level 20, radius 50) round a bright disc (230, radius 30): three
    // phases. The dark ring is the odd one out on the image's two-class split, but it encloses the disc.
    const img = discs(240, 200, () => 120, [[120, 100, 50, 20], [120, 100, 30, 230]]);
    const r = bodies(img);
    expect(r.polarity).toBe('bright');
    expect(r.labels.count).toBe(1);
    const [c] = centroids(r);
    expect(Math.hypot(c![0]! - 120, c![1]! - 100)).toBeLessThan(1);
    expect(Math.abs(c![2]! - Math.PI * 900) / (Math.PI * 900)).toBeLessThan(0.05);
  });
});
