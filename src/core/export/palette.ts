/**
 * The one palette of the overlay: the Bench, the Bench's reduced bitmap, overlay.svg, the overlay PNG and
 * the grain size report all draw each layer in the colour given here, and their legends read this list.
 * The colours are the Okabe–Ito set (Okabe & Ito 2002, "Color Universal Design"), told apart by colour-
 * blind readers; layers that share a hue are never shown together (the grain size view shows only what
 * the rating counted).
 */

export interface PaletteItem {
  /** #RRGGBB */
  colour: string;
  /** The name on screen and in legends (docs/names.md). */
  label: string;
  /** Drawn dashed. */
  dashed?: boolean;
}

/** The cell layers. */
export const LAYER_COLOURS = {
  outlines: { colour: '#F0E442', label: 'Outlines' },
  voronoi: { colour: '#56B4E9', label: 'Voronoi' },
  delaunay: { colour: '#CC79A7', label: 'Delaunay' },
  centroids: { colour: '#D55E00', label: 'Centroids' },
  gap: { colour: '#009E73', label: 'Largest gap', dashed: true },
  selection: { colour: '#E69F00', label: 'Selected cells' },
  field: { colour: '#0072B2', label: 'Field', dashed: true },
} as const satisfies Record<string, PaletteItem>;

/** The grain size rating's audit: what the rating counted. */
export const GRAIN_COLOURS = {
  figure: { colour: '#D55E00', label: 'Test figure' },
  lines: { colour: '#56B4E9', label: 'Test lines' },
  whole: { colour: '#009E73', label: 'Grain counted whole' },
  part: { colour: '#E69F00', label: 'Grain counted in part' },
  crossings: { colour: '#CC79A7', label: 'Boundary crossings' },
} as const satisfies Record<string, PaletteItem>;

export type LayerKey = keyof typeof LAYER_COLOURS;

/** #RRGGBB with an alpha, as rgba() for a canvas. */
export function rgba(hex: string, alpha = 1): string {
  const n = parseInt(hex.slice(1), 16);
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`;
}

/** #RRGGBB as [r, g, b]. */
export function rgb(hex: string): [number, number, number] {
  const n = parseInt(hex.slice(1), 16);
  return [(n >> 16) & 255, (n >> 8) & 255, n & 255];
}

/** The width and height (px) of a legend of these items with text `size` px high. */
export function legendBox(items: readonly PaletteItem[], size: number): { w: number; h: number } {
  return {
    w: Math.round(size * 2.4 + size * 0.62 * Math.max(...items.map((i) => i.label.length))),
    h: Math.round(size * 1.5) * items.length + Math.round(size * 0.6),
  };
}

/** A legend as SVG: a box of swatches and names at (x, y), its text `size` px high. */
export function legendSvg(items: readonly PaletteItem[], x: number, y: number, size: number): string {
  const row = Math.round(size * 1.5);
  const { w, h } = legendBox(items, size);
  const parts = [`<g id="legend" font-family="sans-serif" font-size="${size}">`, `<rect x="${x}" y="${y}" width="${w}" height="${h}" fill="#ffffff" fill-opacity="0.85" stroke="#000000" stroke-width="0.5"/>`];
  items.forEach((it, i) => {
    const cy = y + Math.round(size * 0.3) + row * i + row / 2;
    parts.push(`<line x1="${x + size * 0.4}" y1="${cy}" x2="${x + size * 1.8}" y2="${cy}" stroke="${it.colour}" stroke-width="${Math.max(2, size / 5)}"${it.dashed ? ' stroke-dasharray="3 2"' : ''}/>`);
    parts.push(`<text x="${x + size * 2.2}" y="${cy + size * 0.35}" fill="#000000">${it.label}</text>`);
  });
  parts.push('</g>\n');
  return parts.join('');
}

/** A legend as a standalone SVG element (for a report). */
export function legendFigure(items: readonly PaletteItem[], size: number): string {
  const { w, h } = legendBox(items, size);
  return `<svg width="${w + 1}" height="${h + 1}" viewBox="0 0 ${w + 1} ${h + 1}" role="img" aria-label="legend">${legendSvg(items, 0.5, 0.5, size).trim()}</svg>`;
}
