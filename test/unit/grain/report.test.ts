import { describe, expect, it } from 'vitest';
import { grainReportHtml } from '../../../src/core/export/grainReport';
import { grainSize, formatG } from '../../../src/core/grain/index';
import { defaultSettings } from '../../../src/core/settings';
import { makeLabels } from './helpers';

// A brick tiling of 12 × 9 px grains in a 240 × 180 field, 2 µm/px.
const lab = makeLabels(240, 180, (x, y) => Math.floor(y / 9) * 20 + Math.floor(x / 12) + 1);
const result = grainSize({ labels: lab, umPerPx: 2, field: { x0: 0, y0: 0, x1: 240, y1: 180 }, pattern: 'walls', settings: defaultSettings() });
const png = 'data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAAAAAA6fptVAAAACklEQVR4nGNgAAAAAgABSK+kcQAAAABJRU5ErkJggg==';

describe('printable grain size report', () => {
  const html = grainReportHtml({ name: 'steel <A>.png', result, umPerPx: 2, width: 240, height: 180, imagePngDataUrl: png });

  it('holds the image, calibration, methods, counts, G with its interval and the histogram', () => {
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toContain('steel &lt;A&gt;.png');
    expect(html).toContain(png);
    expect(html).toContain('2 µm/px');
    expect(html).toContain('240 × 180 px');
    expect(html).toContain(`<b>${formatG(result.planimetric!.G)}</b>`);
    expect(html).toContain(`<b>${formatG(result.intercept!.G)}</b>`);
    expect(html).toContain(`${formatG(result.ci95![0])} to ${formatG(result.ci95![1])}`);
    expect(html).toContain(`${result.planimetric!.count.inside} inside, ${result.planimetric!.count.cut} cut`);
    expect(html).toContain('aria-label="histogram of G per grain"');
    // One mark per counted grain.
    expect((html.match(/class="m[124]"/g) ?? []).length).toBe(result.planimetric!.count.marks.length);
  });

  it('carries the cautions', () => {
    expect(html).toMatch(/stage micrometer/);
    expect(html).toMatch(/not a certified grain size rating/);
    expect(html).toMatch(/ASTM E112 \/ ASTM E1382/);
    expect(html).toMatch(/local procedures/);
  });

  it('is self-contained and prints cleanly: inline CSS with print rules, no network references', () => {
    expect(html).toContain('@media print');
    expect(html).toContain('@page');
    expect(html).not.toMatch(/https?:\/\//);
    expect(html).not.toMatch(/<script|<link/);
  });

  it('without an image or a rating it still renders and says why', () => {
    const none = { ...result, planimetric: null, intercept: null, meanArea: null, G: null, Greported: null, method: null, ci95: null, relativeAccuracyPct: null, iso643: null, warnings: ['Planimetric: test'] };
    const h = grainReportHtml({ name: 'x', result: none, umPerPx: 2, width: 240, height: 180 });
    expect(h).toContain('No grain size rating could be made');
    expect(h).toContain('Planimetric: test');
    expect(h).toMatch(/stage micrometer/);
  });
});
