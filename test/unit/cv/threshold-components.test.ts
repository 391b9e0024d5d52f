/**
 * thresholdComponents does inside opencv.js what thresholdMask, erodeMask and connectedComponents do in
 * turn with the masks in JavaScript: it must give the very same level, class count and labels (derived:
 * the same opencv.js operations on the same pixels), with the dropped components set to 0.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { connectedComponents, erodeMask, otsuThreshold, thresholdComponents, thresholdMask, type MaskThreshold } from '../../../src/core/cv/kernels';
import { loadCv, type CV } from '../../../src/core/cv/index';
import { synthesize } from '../../../src/core/synth/index';
import { prepareGrey } from '../../../src/core/cv/kernels';

let cv: CV;
beforeAll(async () => {
  ({ cv } = await loadCv());
});

function separately(img: Uint8Array, w: number, h: number, method: MaskThreshold, picked: 'bright' | 'dark', erodePx: number, conn: 4 | 8) {
  const level = method.kind === 'otsu' ? otsuThreshold(cv, img, w, h) : method.kind === 'global' ? method.level : -1;
  const bright = method.kind === 'adaptive' ? thresholdMask(cv, img, w, h, method) : thresholdMask(cv, img, w, h, { kind: 'global', level });
  let brightCount = 0;
  for (const v of bright) brightCount += v;
  const mask = picked === 'dark' ? bright.map((v) => 1 - v) : bright;
  const cc = connectedComponents(cv, erodePx > 0 ? erodeMask(cv, mask, w, h, erodePx) : mask, w, h, conn);
  return { level, brightCount, ...cc };
}

describe('thresholdComponents', () => {
  const { image } = synthesize({ pattern: 'walls', cells: 120, width: 300, height: 240, order: 'random', seed: 4, noise: 8 });
  const w = image.width;
  const h = image.height;
  const img = () => prepareGrey(cv, image, { flattenRadiusPx: 40, smoothSigmaPx: 0.7 });
  // The last entry: the fewest components the case must give for the comparison to mean something (the
  // dark class of this image is its wall network, one piece and some specks).
  const cases: [string, MaskThreshold, 'bright' | 'dark', number, 4 | 8, number][] = [
    ['Otsu, bright class, 4-connected', { kind: 'otsu' }, 'bright', 0, 4, 100],
    ['Otsu, bright class, eroded by 1 px', { kind: 'otsu' }, 'bright', 1, 4, 100],
    ['Otsu, dark class', { kind: 'otsu' }, 'dark', 0, 4, 1],
    ['a manual level, 8-connected, eroded by 2 px', { kind: 'global', level: 140 }, 'bright', 2, 8, 20],
    ['adaptive (local mean over 31 px), dark class', { kind: 'adaptive', blockPx: 31 }, 'dark', 0, 4, 20],
  ];
  for (const [name, method, picked, erodePx, conn, fewest] of cases) {
    it(`${name}: same level, bright count, areas and labels as the separate kernels`, () => {
      const ref = separately(img(), w, h, method, picked, erodePx, conn);
      let seenCount = -1;
      const got = thresholdComponents(cv, img(), w, h, method, (nb) => ((seenCount = nb), picked), erodePx, conn, (areas, count) => {
        const keep = new Uint8Array(count + 1);
        // Drop every third component to check the dropping too.
        for (let l = 1; l <= count; l++) keep[l] = l % 3 === 0 ? 0 : 1;
        expect(Array.from(areas)).toEqual(Array.from(ref.areas));
        return keep;
      });
      expect(got.level).toBe(ref.level);
      expect(seenCount).toBe(ref.brightCount);
      expect(got.brightCount).toBe(ref.brightCount);
      expect(got.count).toBe(ref.count);
      expect(got.count).toBeGreaterThanOrEqual(fewest);
      let mismatches = 0;
      for (let i = 0; i < w * h; i++) {
        const l = ref.labels[i]!;
        if (got.labels[i] !== (l % 3 === 0 ? 0 : l)) mismatches++;
      }
      expect(mismatches).toBe(0);
    });
  }

  it('an error thrown by the selection leaves no Mat behind and reaches the caller', () => {
    expect(() => thresholdComponents(cv, img(), w, h, { kind: 'otsu' }, () => 'bright', 0, 4, () => { throw new Error('stop here'); })).toThrow('stop here');
    // The heap is still usable: the same call succeeds afterwards.
    expect(thresholdComponents(cv, img(), w, h, { kind: 'otsu' }, () => 'bright', 0, 4, (_a, n) => new Uint8Array(n + 1).fill(1)).count).toBeGreaterThan(20);
  });
});
