/**
 * The quality check before the verdict (stats/quality.ts): a segmentation of pure noise is not rated, with
 * the reason, and its numbers are still written; the demo images pass. The thresholds are the project's
 * own (trade), placed between what noise and what real cell patterns give.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import { decodeImage } from '../../src/core/image/decode';
import { assessQuality, MAX_AREA_CV, MIN_MEDIAN_SOLIDITY } from '../../src/core/stats/quality';
import { noise } from '../helpers/noise';
import { expectValidAnalysisSummary } from '../helpers/summary-schema';


describe('quality check', () => {
  it('fails on ragged cells, notes a long tail of giant areas, passes convex cells of even size', () => {
    expect(assessQuality(new Float64Array(50).fill(0.95), 0.5).ok).toBe(true);
    const ragged = assessQuality(new Float64Array(50).fill(MIN_MEDIAN_SOLIDITY - 0.05), 0.5);
    expect(ragged.ok).toBe(false);
    expect(ragged.warnings[0]).toMatch(/ragged.*Check the overlay/);
    const giants = assessQuality(new Float64Array(50).fill(0.95), MAX_AREA_CV + 0.5);
    expect(giants.ok).toBe(true);
    expect(giants.warnings[0]).toMatch(/long tail of giants/);
    // A points pattern has no solidity; its notices are kept without failing it.
    expect(assessQuality(null, 0.5, ['3 duplicated points were merged.'])).toMatchObject({ ok: true, warnings: ['3 duplicated points were merged.'] });
  });

  for (const pattern of ['walls', 'bodies'] as const) {
    it(`pure noise as ${pattern}: not rated, with the reason, and every number still written`, async () => {
      const a = await analyze({ kind: 'image', image: noise(400, 300, 11) }, { pattern, reference: { replicates: 19 } });
      expectValidAnalysisSummary(a, `noise ${pattern}`);
      expect(a.summary.quality.ok).toBe(false);
      expect(a.summary.randomness.verdict).toBeNull();
      expect(a.summary.randomness.verdictText).toMatch(/^Not rated: /);
      expect(a.summary.cells.count).toBeGreaterThan(10);
      expect(a.summary.randomness.tests.find((t) => t.key === 'mu2')!.statistic).not.toBeNull();
    });
  }

  for (const [file, pattern] of [['foam-random.png', 'walls'], ['grains-calibrated.png', 'walls'], ['bodies-touching.png', 'bodies']] as const) {
    it(`${file}: passes`, async () => {
      const img = await decodeImage(new Uint8Array(readFileSync(`sample-images/${file}`)), { name: file });
      const a = await analyze({ kind: 'image', image: img.pages[0]! }, { pattern, reference: { replicates: 19 } });
      expect(a.summary.quality.ok, a.summary.quality.warnings.join(' ')).toBe(true);
      expect(a.summary.randomness.verdict).not.toBeNull();
    });
  }
});
