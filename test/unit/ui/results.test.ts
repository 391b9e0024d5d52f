/**
 * The Results card (src/ui/results.ts) read from real summaries of the project's pipeline: a sheet of
 * hard-core seeds (more regular than random by construction; the generator's truth), a calibrated grain
 * image (ASTM E112 G given) and pure noise (not rated, with the reason). The density is checked against
 * the count over the field's area worked out here from the image size (derived).
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../../src/core/analyze';
import { synthesize } from '../../../src/core/synth/index';
import { noise } from '../../helpers/noise';
import { resultsCard } from '../../../src/ui/results';


describe('the Results card', () => {
  it('a regular sheet: its count, the density per 100 × 100 px, the verdict and the statistic behind it', async () => {
    const s = synthesize({ pattern: 'walls', cells: 300, width: 600, height: 450, order: 'regular', seed: 3, window: true });
    const a = await analyze({ kind: 'image', image: s.image }, { pattern: 'walls', reference: { replicates: 39 } });
    const c = resultsCard(a.summary);
    expect(c.count).toBe(a.summary.cells.count);
    expect(c.calibrated).toBe(false);
    // derived: cells over the field's area (the whole image, 600 × 450 px) per 10⁴ px².
    expect(c.density.value).toBeCloseTo((c.count / (600 * 450)) * 1e4, 9);
    expect(c.density.unit).toBe('cells per 100 × 100 px');
    // Hard-core seeds are more regular than random seeding (the generator's truth).
    expect(c.rating).toBe('rated');
    expect(c.verdict).toBe('more regular than random');
    expect(c.basis).not.toBeNull();
    const b = c.basis!;
    const row = a.summary.randomness.tests.find((t) => t.name === a.summary.randomness.basis.strongest)!;
    expect(b.value).toBe(row.statistic);
    expect(b.z).toBeCloseTo((row.statistic! - row.referenceMean!) / row.referenceSd!, 12);
    // More regular: μ₂ and the area CV lie below random seeding's mean, Clark–Evans R above it.
    const key = row.key;
    expect(key === 'clarkEvansR' ? b.z! > 0 : b.z! < 0).toBe(true);
    expect(c.grain).toEqual({ note: 'needs the pixel size' });
    expect(c.next.some((n) => /Scale panel/.test(n))).toBe(true);
  });

  it('a calibrated grain image: the density per mm² and G', async () => {
    const s = synthesize({ pattern: 'walls', cells: 200, width: 500, height: 400, order: 'random', seed: 4 });
    const a = await analyze({ kind: 'image', image: s.image }, { pattern: 'walls', umPerPx: 0.5, reference: { replicates: 19 } });
    const c = resultsCard(a.summary);
    // derived: 500 × 400 px at 0.5 µm/px is 0.05 mm².
    expect(c.density.value).toBeCloseTo(c.count / 0.05, 6);
    expect(c.density.unit).toBe('cells per mm²');
    expect(c.grain && 'G' in c.grain ? c.grain.G : null).toBe((a.summary.grainSize as { G: number }).G);
  });

  it('pure noise: not rated, with the quality check\'s reason, and no statistic behind a verdict', async () => {
    const a = await analyze({ kind: 'image', image: noise(300, 240, 5) }, { pattern: 'walls', reference: { replicates: 19 } });
    const c = resultsCard(a.summary);
    expect(a.summary.quality.ok).toBe(false);
    expect(c.rating).toBe('not rated');
    expect(c.verdict).toBe('not rated');
    expect(c.reason).toBe(a.summary.quality.warnings[0]);
    expect(c.basis).toBeNull();
    expect(c.next[0]).toMatch(/Detect panel/);
  });
});
