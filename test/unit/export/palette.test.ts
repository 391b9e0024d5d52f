/**
 * The one overlay palette (src/core/export/palette.ts): every colour is one of the Okabe–Ito set (Okabe &
 * Ito 2002, "Color Universal Design"; the eight values recalled from memory), the layers shown together
 * have distinct colours, and overlay.svg strokes each layer in its palette colour under a legend of the
 * same names.
 */
import { describe, expect, it } from 'vitest';
import { GRAIN_COLOURS, LAYER_COLOURS, legendBox, rgb } from '../../../src/core/export/palette';
import { overlaySvg } from '../../../src/core/export/geometry';
import { analyze } from '../../../src/core/analyze';

// Okabe & Ito (2002): black, orange, sky blue, bluish green, yellow, blue, vermilion, reddish purple (recalled).
const OKABE_ITO = ['#000000', '#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7'];

describe('the overlay palette', () => {
  it('uses only the colour-blind-safe set, with distinct colours for the layers shown together', () => {
    for (const it of [...Object.values(LAYER_COLOURS), ...Object.values(GRAIN_COLOURS)]) expect(OKABE_ITO).toContain(it.colour);
    const cells = Object.values(LAYER_COLOURS).map((x) => x.colour);
    expect(new Set(cells).size).toBe(cells.length);
    const grain = [LAYER_COLOURS.outlines, LAYER_COLOURS.field, ...Object.values(GRAIN_COLOURS)].map((x) => x.colour);
    expect(new Set(grain).size).toBe(grain.length);
    expect(rgb('#F0E442')).toEqual([240, 228, 66]);
  });

  it('overlay.svg strokes each layer in its colour and carries a legend of those layers', async () => {
    const pts = new Float64Array([20, 20, 60, 25, 100, 30, 30, 70, 70, 75, 110, 80, 25, 110, 65, 115, 105, 110, 50, 50, 90, 55, 45, 95]);
    const a = await analyze({ kind: 'points', points: pts, width: 130, height: 130 }, { pattern: 'points', reference: { replicates: 0 } });
    const svg = overlaySvg(a, null);
    expect(svg).toMatch(new RegExp(`id="voronoi"[^>]*stroke="${LAYER_COLOURS.voronoi.colour}"`));
    expect(svg).toMatch(new RegExp(`id="centroids"[^>]*stroke="${LAYER_COLOURS.centroids.colour}"`));
    // No outlines for a points pattern: the legend names what is drawn, and nothing else.
    expect(svg).not.toContain('>Outlines</text>');
    expect(svg).toContain('>Voronoi</text>');
    expect(svg).toContain('>Centroids</text>');
    const box = legendBox([LAYER_COLOURS.voronoi, LAYER_COLOURS.centroids], 8);
    const x = Number(/<g id="legend"[^>]*>\s*<rect x="([\d.]+)"/.exec(svg)?.[1]);
    expect(x + box.w).toBeLessThanOrEqual(130);
  });
});
