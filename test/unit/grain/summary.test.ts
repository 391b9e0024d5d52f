import type { Summary } from '../../../src/core/summary';
import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { summaryCsv } from '../../../src/core/export/index';
import { grainSize, grainSizeSummary, gFromNA } from '../../../src/core/grain/index';
import { defaultSettings } from '../../../src/core/settings';
import { squareGrid } from './helpers';

// 10 px squares at 1 µm/px: 10⁴ grains per mm², G = 3.321928·4 − 2.954 = 10.33 (derived from the ASTM E112 formula).
const lab = squareGrid(300, 300, 10);
const field = { x0: 0, y0: 0, x1: 300, y1: 300 };

describe('summary.json grainSize and summary.csv columns', () => {
  it('carry the keys other tools read, G to 0.1', () => {
    const r = grainSize({ labels: lab, umPerPx: 1, field, pattern: 'walls', settings: defaultSettings() });
    const s = grainSizeSummary(r) as Record<string, any>;
    expect(Math.abs(r.planimetric!.NA_per_mm2 - 1e4) / 1e4).toBeLessThan(0.02);
    expect(s.planimetric.G).toBe(Math.round(r.planimetric!.G * 10) / 10);
    expect(Math.abs(s.planimetric.G - gFromNA(1e4))).toBeLessThan(0.1);
    for (const k of ['G', 'ci95', 'relativeAccuracyPct', 'iso643', 'method', 'warnings', 'cautions']) expect(s).toHaveProperty(k);
    expect(s.intercept).toHaveProperty('G');
    expect(s.intercept).toHaveProperty('meanIntercept_um');
    expect(s.meanArea).toHaveProperty('G');
    // A square grid: every grain inside the field is 100 µm², Ā = 1e-4 mm² gives G = 10.33 exactly (derived).
    expect(r.meanArea!.G).toBeCloseTo(-3.3223 * Math.log10(1e-4) - 2.955, 9);
    // summary.csv (the writer the command line and the app use) carries the same G figures as summary.json.
    const csv = summaryCsv([{ name: 'grid.png', summary: { grainSize: s } as unknown as Summary }]);
    const rows = Papa.parse<Record<string, string>>(csv.trim(), { header: true }).data;
    expect(rows).toHaveLength(1);
    const row = rows[0]!;
    expect(row.image).toBe('grid.png');
    expect(Number(row['grainSize.planimetric.G'])).toBe(s.planimetric.G);
    expect(Number(row['grainSize.intercept.G'])).toBe(s.intercept.G);
    expect(Number(row['grainSize.iso643'])).toBe(s.iso643);
    // G 10.33 from Ā = 100 µm² (derived above), to 0.1 as summary.json gives it.
    expect(row['grainSize.meanArea.G']).toBe('10.3');
  });

  it('the unbiased correction setting is applied and stated (Li & Zhou 2011; pub, read in text)', () => {
    const s = defaultSettings();
    const a = grainSize({ labels: lab, umPerPx: 1, field, pattern: 'walls', settings: s });
    s.grain.unbiasedCorrection = true;
    const b = grainSize({ labels: lab, umPerPx: 1, field, pattern: 'walls', settings: s });
    expect(b.planimetric!.count.count).toBe(a.planimetric!.count.count - 1);
    expect(b.method).toMatch(/unbiased correction/);
  });
});
