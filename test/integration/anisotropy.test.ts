/**
 * Aligned, elongated cells: the spacing statistics (Clark–Evans, the L-function) assume an isotropic
 * pattern, so they are computed in the frame where the mean cell is round. Generated patterns whose answer is
 * known by construction: a running-bond brick wall with jitter (each interior brick touches six others, all
 * of one size: more regular than random, derived), and random seeding stretched 3:1 (an affine image of a
 * random pattern is random in the stretched field: consistent with random seeding, derived).
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import { anisotropy } from '../../src/core/stats/anisotropy';
import { synthesize } from '../../src/core/synth/index';
import { mulberry32 } from '../../src/core/random';
import type { GreyImage } from '../../src/core/types';

/** A brick wall in running bond: bricks w × h px, dark joints of `joint` px, joint positions jittered. */
function bricks(W: number, H: number, w: number, h: number, joint: number, seed: number): GreyImage {
  const rng = mulberry32(seed);
  const data = new Uint8Array(W * H).fill(190);
  const dark = (x: number, y: number) => { if (x >= 0 && y >= 0 && x < W && y < H) data[y * W + x] = 50; };
  const rows: number[] = [];
  for (let y = 0; y < H; y += h) rows.push(Math.round(y + (rng() - 0.5) * 4));
  rows.forEach((y0, r) => {
    for (let t = 0; t < joint; t++) for (let x = 0; x < W; x++) dark(x, y0 + t);
    const y1 = r + 1 < rows.length ? rows[r + 1]! : H;
    const offset = r % 2 ? w / 2 : 0;
    for (let x = -offset; x < W; x += w) {
      const xj = Math.round(x + (rng() - 0.5) * 0.15 * w);
      for (let y = y0; y < y1; y++) for (let t = 0; t < joint; t++) dark(xj + t, y);
    }
  });
  for (let i = 0; i < data.length; i++) data[i] = Math.max(0, Math.min(255, data[i]! + Math.round((rng() - 0.5) * 20)));
  return { width: W, height: H, data, bitDepth: 8 };
}

/** An image stretched k times along x (nearest neighbour). */
function stretchX(img: GreyImage, k: number): GreyImage {
  const W = img.width * k;
  const data = new Uint8Array(W * img.height);
  for (let y = 0; y < img.height; y++) for (let x = 0; x < W; x++) data[y * W + x] = img.data[y * img.width + Math.floor(x / k)]!;
  return { width: W, height: img.height, data, bitDepth: 8 };
}

describe('anisotropy of the cells', () => {
  it('measures aligned cells as aligned and round cells as not (shape tensors of known ellipses, derived)', () => {
    const n = 200;
    const ones = new Float64Array(n).fill(1);
    const aligned = anisotropy(new Float64Array(n).fill(3), ones, new Float64Array(n).fill(0), () => true, 0.05);
    expect(aligned.orientationOrder).toBeCloseTo(1, 12);
    expect(aligned.meanAspect).toBeCloseTo(3, 9);
    expect(aligned.spacing).toBe('stretched');
    // Along x: x shrinks by 3^(-1/2), y grows by 3^(1/2); the mean cell becomes round, areas are kept.
    expect(aligned.stretch!.sx).toBeCloseTo(1 / Math.sqrt(3), 9);
    expect(aligned.stretch!.sx * aligned.stretch!.sy).toBeCloseTo(1, 12);
    const vertical = anisotropy(new Float64Array(n).fill(2), ones, new Float64Array(n).fill(90), () => true, 0.05);
    expect(vertical.directionDeg).toBeCloseTo(90, 9);
    expect(vertical.stretch!.sy).toBeCloseTo(1 / Math.sqrt(2), 9);
    const diagonal = anisotropy(new Float64Array(n).fill(2), ones, new Float64Array(n).fill(45), () => true, 0.05);
    expect(diagonal.spacing).toBe('left out');
    // Elongated cells pointing every way: no common direction, a round mean cell.
    const random = anisotropy(new Float64Array(n).fill(3), ones, Float64Array.from({ length: n }, (_, i) => -90 + (180 * i) / n), () => true, 0.05);
    expect(random.orientationOrder!).toBeLessThan(1e-9);
    expect(random.meanAspect!).toBeCloseTo(1, 9);
    expect(random.spacing).toBe('none');
  });

  it('a running-bond brick wall reads "more regular than random", with μ₂ reading "more regular"', async () => {
    const a = await analyze({ kind: 'image', image: bricks(900, 600, 60, 20, 3, 4) }, { pattern: 'walls', reference: { replicates: 99 } });
    const s = a.summary;
    expect(s.anisotropy!.spacing).toBe('stretched');
    expect(s.anisotropy!.meanAspect!).toBeGreaterThan(2);
    expect(s.randomness.tests.find((t) => t.key === 'mu2')!.reading).toBe('more regular');
    expect(s.randomness.verdict, s.randomness.verdictText).toBe('more regular than random');
  });

  it('random seeding stretched 3:1 reads "consistent with random seeding" in at least 2 of 3 seeds', async () => {
    let consistent = 0;
    const seen: string[] = [];
    for (const seed of [31, 32, 33]) {
      const img = synthesize({ pattern: 'walls', cells: 250, width: 300, height: 600, order: 'random', seed, window: true }).image;
      const a = await analyze({ kind: 'image', image: stretchX(img, 3) }, { pattern: 'walls', reference: { replicates: 99 } });
      expect(a.summary.anisotropy!.spacing).toBe('stretched');
      seen.push(`${seed}: ${a.summary.randomness.verdictText}`);
      if (a.summary.randomness.verdict === 'consistent with random seeding') consistent++;
    }
    expect(consistent, seen.join('\n')).toBeGreaterThanOrEqual(2);
  });
});
